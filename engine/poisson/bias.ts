/**
 * Bias of a doped stack: the spec's `bias:` (voltages or fields, one or a list) as the fields at
 * which the stack is solved. A voltage V across the stack of thickness L is the uniform field
 * F = V/L (1 V over 100 nm = 100 kV/cm), in the sense of `field:` (positive raises the electron
 * energy towards the last layer); the contacts beyond the stack stay flat, as for any field
 * (engine/profile.ts), so quasi-bound states are the resonances of engine/resonance.ts. The
 * structure's own charge adds its Hartree potential on top (engine/poisson/poisson.ts).
 * Units: V, kV/cm, nm.
 */
import { InputError } from '../errors.js';
import type { Spec } from '../input/schema.js';
import { parseField, splitQuantity } from '../input/units.js';
import { MAX_FIELD_KV_PER_CM, type Structure } from '../structure.js';
import { biasSchema } from './schema.js';

/** One bias point: the voltage across the stack and the field it makes. */
export interface BiasPoint {
  readonly voltage_V: number;
  readonly field_kV_per_cm: number;
}

/** kV/cm per (V/nm). */
const KV_PER_CM_PER_V_PER_NM = 1e4;

/** The bias point of a field over a stack of `total_nm`. */
export const fieldPoint = (field_kV_per_cm: number, total_nm: number): BiasPoint => ({ field_kV_per_cm, voltage_V: (field_kV_per_cm * total_nm) / KV_PER_CM_PER_V_PER_NM });

/** One written bias: "0.2 V", "-150 mV" (a voltage) or "10 kV/cm" (a field, units of parseField); a bare number is refused. */
function pointOf(raw: string | number, total_nm: number, field: string): BiasPoint {
  const q = splitQuantity(raw);
  if (q && (q.unit === 'V' || q.unit === 'mV')) {
    const V = q.unit === 'V' ? q.value : q.value / 1000;
    return { voltage_V: V, field_kV_per_cm: (V / total_nm) * KV_PER_CM_PER_V_PER_NM };
  }
  if (!q || q.unit === '') throw new InputError('bad-value', `${field}: expected a voltage ("0.2 V", "-150 mV") or a field ("10 kV/cm"), got ${JSON.stringify(raw)}; give the unit`, field);
  const F = parseField(raw);
  if (typeof F === 'string') throw new InputError('bad-value', `${field}: ${F}, or a voltage in V or mV`, field);
  return fieldPoint(F, total_nm);
}

/**
 * The bias points of a spec for its structure: each entry of `bias:`, or the structure's own field
 * when there is none. Throws InputError for a bias beside a field, a malformed entry, or a field
 * beyond ±MAX_FIELD_KV_PER_CM.
 */
export function biasPoints(spec: Spec, structure: Structure): readonly BiasPoint[] {
  const raw = (spec as Record<string, unknown>).bias;
  if (raw === undefined) return [fieldPoint(structure.field_kV_per_cm, structure.total_nm)];
  if (spec.field !== undefined) throw new InputError('bad-value', 'bias: a bias sets the field across the stack; remove "field:" or write the field under "bias:"', 'bias');
  const parsed = biasSchema.safeParse(raw);
  if (!parsed.success) throw new InputError('schema', `bias: ${parsed.error.issues[0]!.message}; give a voltage, a field or a list of them`, 'bias');
  const list = Array.isArray(parsed.data) ? parsed.data : [parsed.data];
  return list.map((entry, k) => {
    const field = Array.isArray(parsed.data) ? `bias[${k}]` : 'bias';
    const p = pointOf(entry, structure.total_nm, field);
    if (!(Math.abs(p.field_kV_per_cm) <= MAX_FIELD_KV_PER_CM)) throw new InputError('bad-value', `${field}: ${JSON.stringify(entry)} makes ${p.field_kV_per_cm.toPrecision(4)} kV/cm across ${structure.total_nm.toPrecision(4)} nm, beyond ±${MAX_FIELD_KV_PER_CM} kV/cm; give a smaller bias`, field);
    return p;
  });
}

/** The structure under a bias point (its field replaced). */
export const atBias = (structure: Structure, point: BiasPoint): Structure => ({ ...structure, field_kV_per_cm: point.field_kV_per_cm });
