/**
 * What a spec's schema cannot see, checked when the spec is read, before any work: a declared
 * variable that nothing uses (a design would search a direction that changes nothing) and a target
 * that can never be evaluated (a malformed label, a state beyond the solver's limit, a layer label
 * no layer has) are input errors; a spec that is valid but may not mean what its writer meant (a
 * number without a unit, an absolute energy no state can reach) gets warnings, which commands
 * print on stderr and list under "warnings" in --json.
 */
import { InputError } from '../errors.js';
import { compileTargets } from '../../objectives/index.js';
import type { TargetContext } from '../../objectives/types.js';
import type { BandName } from '../profile.js';
import { buildStructure, expandStack, variablesOf } from '../structure.js';
import { buildWireStructure, DEFAULT_WIRE_SETTINGS } from '../wire/structure.js';
import { repeatOf, type Spec, type StackEntry } from './schema.js';
import { unitlessNote } from './units.js';

const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;
/** Keys whose text names a material or a shape, never a variable. */
const NOT_VARIABLES = new Set(['material', 'barrier', 'kind', 'label', 'per_period']);

/** Every name-like text under `value` except under NOT_VARIABLES keys: the variables a stack entry or wire refers to. */
function namesIn(value: unknown, out: Set<string>): void {
  if (typeof value === 'string') {
    if (NAME.test(value.trim())) out.add(value.trim());
  } else if (Array.isArray(value)) {
    for (const v of value) namesIn(v, out);
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) if (!NOT_VARIABLES.has(k)) namesIn(v, out);
  }
}

/** The vary names the layers (or the wire) of a spec refer to. */
export function usedVariables(spec: Spec): Set<string> {
  const out = new Set<string>();
  namesIn(spec.stack, out);
  namesIn(spec.wire, out);
  return out;
}

/** Layer labels as buildStructure resolves them ("well[3]", "layer 2"), from the stack written out. */
const layerLabels = (spec: Spec): string[] => expandStack(spec).map((l, i) => l.label ?? `layer ${i + 1}`);

/** The checking context of a spec's targets (no band extrema: those need the structure). */
export function targetContext(spec: Spec): TargetContext {
  if (spec.wire !== undefined) return { geometry: 'wire', maxStates: spec.wire.states ?? DEFAULT_WIRE_SETTINGS.states };
  return { geometry: 'stack', labels: layerLabels(spec), maxStates: spec.solver?.max_states ?? Infinity };
}

/** Throws InputError, naming the field, for what would make any solve or search of the spec pointless (see the file comment). */
export function checkSpec(spec: Spec): void {
  const used = usedVariables(spec);
  for (const name of Object.keys(spec.vary ?? {})) {
    if (!used.has(name)) {
      const where = spec.wire !== undefined ? 'no wire dimension' : 'no layer';
      throw new InputError('unknown-variable', `vary.${name}: declared but never used: ${where} names it, so it cannot change anything; use it (e.g. ${spec.wire !== undefined ? `width: ${name}` : `thickness: ${name}, or In: ${name}`}) or remove it`, `vary.${name}`);
    }
  }
  compileTargets(spec.targets, targetContext(spec).geometry, targetContext(spec));
}

/** Variable values to look at a spec before any solve: each one's nominal value, else the middle of its bounds. */
function lookValues(spec: Spec): Record<string, number> {
  return Object.fromEntries(variablesOf(spec).map((v) => [v.name, v.value ?? (v.from + v.to) / 2]));
}

/**
 * Per band: its extremum and continuum edge (eV) at the nominal values, for warnings about goals
 * no state can reach; undefined when the structure cannot be built (its error shows at the solve).
 */
function bandExtrema(spec: Spec): TargetContext['bands'] {
  try {
    const values = lookValues(spec);
    const samples: { Ec: number; Ehh: number; Elh: number }[][] = spec.wire !== undefined
      ? buildWireStructure(spec, values).materials.map((m) => [m.bands])
      : buildStructure(spec, values).layers.map((l) => [...l.bands]);
    const outer = [samples[0]!, samples[samples.length - 1]!].flat();
    const bands = {} as Record<BandName, { edge_eV: number; barrier_eV: number }>;
    for (const [band, key, sign] of [['electron', 'Ec', 1], ['heavy_hole', 'Ehh', -1], ['light_hole', 'Elh', -1]] as const) {
      const all = samples.flat().map((b) => sign * b[key]);
      // A wire's barrier is its first material; a stack's continuum starts at the lower of its two outer layers.
      const barrier = spec.wire !== undefined ? sign * samples[0]![0]![key] : Math.min(...outer.map((b) => sign * b[key]));
      bands[band] = { edge_eV: sign * Math.min(...all), barrier_eV: sign * barrier };
    }
    return bands;
  } catch {
    return undefined;
  }
}

/** The written stack's quantities without a unit: thickness (nm) of every layer as written (a repeat's layer once). */
function stackNotes(entries: readonly StackEntry[], base: string, out: { field: string; raw: string | number }[]): void {
  entries.forEach((entry, i) => {
    const field = `${base}[${i}]`;
    const block = repeatOf(entry);
    if (block) stackNotes(block.repeat, `${field}.repeat`, out);
    else if (unitlessNote(entry.thickness, 'nm')) out.push({ field: `${field}.thickness`, raw: entry.thickness! });
  });
}

/** Wire keys that are lengths (nm) or energies (eV) when written without a unit. */
const WIRE_LENGTHS = new Set(['width', 'height', 'radius', 'thickness', 'length', 'x', 'y', 'grid', 'margin']);
const WIRE_ENERGIES = new Set(['tolerance', 'broadening']);

function wireNotes(value: unknown, field: string, out: string[]): void {
  if (Array.isArray(value)) value.forEach((v, i) => wireNotes(v, `${field}[${i}]`, out));
  else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      const f = `${field}.${k}`;
      const unit = WIRE_LENGTHS.has(k) ? 'nm' : WIRE_ENERGIES.has(k) ? 'eV' : null;
      const note = unit && (typeof v === 'number' || typeof v === 'string') ? unitlessNote(v, unit) : null;
      if (note) out.push(`${f}: ${note}`);
      else wireNotes(v, f, out);
    }
  }
}

/** Layers named in one thickness note before "and N more". */
const NAMED_LAYERS = 3;

/**
 * Warnings about a valid spec (see the file comment), each "field: what (line N)". Numbers without
 * a unit are read in their key's default unit (engine/input/units.ts unitlessNote); thicknesses are
 * gathered into one note.
 */
export function specWarnings(spec: Spec, locate: (field: string) => number | undefined = () => undefined): string[] {
  const at = (field: string, note: string): string => { const line = locate(field); return `${field}: ${note}${line ? ` (line ${line})` : ''}`; };
  const out: string[] = [];
  for (const [raw, field, unit] of [[spec.temperature, 'temperature', 'K'], [spec.field, 'field', 'kV/cm'], [spec.solver?.slice, 'solver.slice', 'nm'], [spec.carriers?.sheet_density, 'carriers.sheet_density', 'cm-2']] as const) {
    const note = unitlessNote(raw, unit);
    if (note) out.push(at(field, note));
  }
  for (const [name, m] of Object.entries(spec.materials ?? {})) {
    for (const [key, unit] of [['Ec', 'eV'], ['Ev', 'eV'], ['lattice', 'nm']] as const) {
      const note = unitlessNote(m[key], unit);
      if (note) out.push(at(`materials.${name}.${key}`, note));
    }
  }
  const thick: { field: string; raw: string | number }[] = [];
  stackNotes(spec.stack, 'stack', thick);
  if (thick.length > 0) {
    const first = thick[0]!;
    const line = locate(first.field);
    const named = thick.slice(0, NAMED_LAYERS).map((t) => t.field).join(', ');
    out.push(`${named}${thick.length > NAMED_LAYERS ? ` and ${thick.length - NAMED_LAYERS} more` : ''}: thickness${thick.length > 1 ? 'es' : ''} without a unit (${JSON.stringify(first.raw)}…) read as nm; write "${first.raw} nm" (or Å, ML) to say so${line ? ` (line ${line})` : ''}`);
  }
  const wire: string[] = [];
  if (spec.wire !== undefined) wireNotes(spec.wire, 'wire', wire);
  out.push(...wire.map((w) => { const field = w.slice(0, w.indexOf(':')); const line = locate(field); return `${w}${line ? ` (line ${line})` : ''}`; }));
  const targets = compileTargets(spec.targets, targetContext(spec).geometry, targetContext(spec));
  if (targets.some((t) => t.objective.warnings)) {
    const context = { ...targetContext(spec), bands: bandExtrema(spec) };
    for (const t of targets) {
      for (const note of t.objective.warnings?.(t.target, t.field, context) ?? []) {
        const field = note.slice(0, note.indexOf(':'));
        const line = locate(field) ?? locate(t.field);
        out.push(`${note}${line ? ` (line ${line})` : ''}`);
      }
    }
  }
  return out;
}
