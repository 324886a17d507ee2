/**
 * Growth sheet: per layer, material, thickness (nm and monolayers) and the shutter time at the
 * growth rates given in the spec's `growth.rates` section.
 *
 * Model (a molecular-beam grower's, common practice): under group-V overpressure each group-III
 * cell sets a growth rate of its binary, r_i in monolayers per second (one group-III atom per
 * cation site). With several group-III cells open, the rates add and the composition follows:
 *   r = Σ r_i,   x_i = r_i / Σ r_j      (e.g. AlxGa1−xAs: r = r_GaAs + r_AlAs, x = r_AlAs / r).
 * Shutter time t = N / r, with N the layer's thickness in its own (strained) monolayers.
 * A rate given in a length unit (µm/h, nm/s, Å/s, nm/min) is converted to monolayers per second with
 * the binary's relaxed monolayer a/2 at 300 K (where such rates are calibrated), or, for a rate
 * keyed by a layer's own formula or label, with that layer's monolayer.
 * Look-up order per layer: a rate keyed by the layer's label, then by its formula (a cell set
 * calibrated for that alloy), then the sum over its group-III binaries. The composition the cells
 * imply is compared with the layer's; a difference above COMPOSITION_TOLERANCE is reported in the
 * row's note (not an error: the sheet still shows what those rates would grow). Layers with mixed
 * group-V elements, graded layers and custom materials need a rate keyed by label or formula,
 * since their composition is not set by group-III cells alone.
 */
import { InputError } from '../errors.js';
import type { Structure, ResolvedLayer } from '../structure.js';
import { splitQuantity } from '../input/units.js';
import { binaryOf } from '../../materials/index.js';

/** Largest accepted difference between the composition the cells imply and the layer's (fraction). */
export const COMPOSITION_TOLERANCE = 0.005;

/** Length units per second for growth rates, in nm/s. */
const RATE_UNITS: Readonly<Record<string, number>> = {
  'µm/h': 1000 / 3600, 'μm/h': 1000 / 3600, 'um/h': 1000 / 3600,
  'nm/s': 1, 'Å/s': 0.1, 'A/s': 0.1, 'nm/min': 1 / 60,
};

/** A growth rate as written: either monolayers per second or a length per second (nm/s). */
export type GrowthRate = { readonly ml_per_s: number } | { readonly nm_per_s: number };

/** Parses "1.0 µm/h", "0.2 ML/s", "2.5 Å/s"; throws InputError naming `field` otherwise. */
export function parseGrowthRate(input: string | number, field: string): GrowthRate {
  const q = splitQuantity(input);
  const fail = (why: string): never => {
    throw new InputError('bad-value', `${field}: ${why}, got ${JSON.stringify(input)}; write e.g. "1.0 µm/h", "0.2 ML/s" or "2.5 Å/s"`, field);
  };
  if (!q) return fail('expected a growth rate');
  if (!(q.value > 0)) return fail('a growth rate must be positive');
  if (q.unit === 'ML/s' || q.unit === 'ml/s') return { ml_per_s: q.value };
  const scale = RATE_UNITS[q.unit];
  if (scale === undefined) return fail(`unknown rate unit "${q.unit}"`);
  return { nm_per_s: q.value * scale };
}

export interface GrowthRow {
  readonly index: number;
  readonly label: string;
  readonly formula: string;
  readonly thickness_nm: number;
  readonly monolayers: number;
  /** Growth rate of the layer (ML/s), or null when the rates given do not cover it. */
  readonly rate_ml_per_s: number | null;
  /** The same rate as a thickness rate (nm/s) with the layer's monolayer. */
  readonly rate_nm_per_s: number | null;
  /** Shutter time (s), or null with the reason in `note`. */
  readonly time_s: number | null;
  /** Where the rate came from: "label", "formula" or the cells ("AlAs + GaAs"). */
  readonly source: string;
  /** Composition the open cells imply ("Al0.333Ga0.667As"), for cell-summed rates. */
  readonly implied: string | null;
  readonly note: string;
}

export interface GrowthSheet {
  readonly rows: readonly GrowthRow[];
  /** Σ shutter times (s); null when any layer lacks a rate. */
  readonly total_s: number | null;
  /** True when every layer has a time and every implied composition matches. */
  readonly consistent: boolean;
}

const toMlPerS = (r: GrowthRate, monolayer_nm: number): number => ('ml_per_s' in r ? r.ml_per_s : r.nm_per_s / monolayer_nm);

function layerRow(l: ResolvedLayer, rates: ReadonlyMap<string, GrowthRate>): GrowthRow {
  const base = { index: l.index, label: l.label, formula: l.formula, thickness_nm: l.thickness_nm, monolayers: l.monolayers };
  const done = (rate: number, source: string, implied: string | null, note: string): GrowthRow =>
    ({ ...base, rate_ml_per_s: rate, rate_nm_per_s: rate * l.monolayer_nm, time_s: l.monolayers / rate, source, implied, note });
  const missing = (note: string): GrowthRow => ({ ...base, rate_ml_per_s: null, rate_nm_per_s: null, time_s: null, source: '–', implied: null, note });

  const byLabel = l.label ? rates.get(l.label) : undefined;
  if (byLabel) return done(toMlPerS(byLabel, l.monolayer_nm), 'label', null, '');
  const byFormula = rates.get(l.formula);
  if (byFormula) return done(toMlPerS(byFormula, l.monolayer_nm), 'formula', null, '');
  if (l.composition.kind !== 'alloy') return missing(`${l.composition.kind} layer: give a rate keyed by "${l.label || l.formula}"`);
  const { III, V } = l.composition.alloy;
  const groupV = Object.keys(V).filter((el) => V[el]! > 0);
  if (groupV.length !== 1) return missing(`mixed group V (${groupV.join(', ')}): give a rate keyed by "${l.formula}"`);
  const v = groupV[0]!;
  const cells = Object.keys(III).filter((el) => III[el]! > 0).sort();
  const partial: { el: string; ml: number }[] = [];
  const absent: string[] = [];
  for (const el of cells) {
    const name = el + v;
    const r = rates.get(name);
    const bin = binaryOf(el, v);
    if (!r || !bin) absent.push(name);
    else partial.push({ el, ml: toMlPerS(r, bin.a_nm / 2) });
  }
  if (absent.length > 0) return missing(`no rate for ${absent.join(', ')}`);
  const total = partial.reduce((s, p) => s + p.ml, 0);
  const worst = Math.max(...partial.map((p) => Math.abs(p.ml / total - III[p.el]!)));
  const implied = cells.length > 1 ? partial.map((p) => `${p.el}${(p.ml / total).toFixed(3)}`).join('') + v : null;
  const note = worst > COMPOSITION_TOLERANCE
    ? `cells give ${implied}, layer is ${l.formula}: adjust the cells or give a rate for "${l.formula}"`
    : '';
  return done(total, cells.map((el) => el + v).join(' + '), implied, note);
}

/**
 * The growth sheet of a structure at the given rates (keys: binary, formula or layer label;
 * values as in parseGrowthRate).
 *
 * @param s resolved structure (thicknesses nm and ML).
 * @param rates growth rates by key; `field` prefix names them in errors (default "growth.rates").
 */
export function growthSheet(s: Structure, rates: Readonly<Record<string, string | number>>, field = 'growth.rates'): GrowthSheet {
  const parsed = new Map<string, GrowthRate>(Object.entries(rates).map(([k, v]) => [k, parseGrowthRate(v, `${field}.${k}`)]));
  const rows = s.layers.map((l) => layerRow(l, parsed));
  const times = rows.map((r) => r.time_s);
  const total = times.every((t): t is number => t !== null) ? times.reduce((a, b) => a + b, 0) : null;
  return { rows, total_s: total, consistent: total !== null && rows.every((r) => r.note === '') };
}
