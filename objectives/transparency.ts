/**
 * Transparency density: the injected sheet density (n = p) at which the quasi-Fermi separation
 * reaches the band-edge transition, the Bernard–Duraffourg condition for gain (M. G. A. Bernard and
 * G. Duraffourg, Phys. Status Solidi 1, 699 (1961), from memory), given per well of a multi-well
 * stack (the total divided by the number of wells) or for the whole stack.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { quasiFermiLevels } from '../engine/observables/carriers.js';
import { parseSheetDensity } from '../engine/input/units.js';
import { MISSING_STATE_PENALTY, type Objective, type TargetSource } from './types.js';
import { quantity, unitNotes, weight } from './common.js';
import { wellsOf } from './wells.js';

const schema = z.object({
  transparency: z.enum(['per_well', 'total']).describe('per_well: the density each well carries at transparency (total / number of wells); total: the whole stack\'s'),
  at_most: quantity.describe('Upper limit, e.g. "1.5e12 cm-2"'),
  weight,
}).strict();
export type TransparencyTarget = z.infer<typeof schema>;

function limitOf(raw: string | number, field: string): number {
  const n = parseSheetDensity(raw);
  if (typeof n === 'string') throw new InputError('bad-value', `${field}: ${n}`, field);
  return n;
}

/** Search range of the density (cm⁻²) and bisection steps in log n (2⁻⁴⁰ of 10 decades: far below any window). */
const N_MIN = 1e6;
const N_MAX = 1e16;
const STEPS = 40;

/**
 * Transparency sheet density (cm⁻²) of the bound subbands, by bisection in log n on the
 * monotonic quasi-Fermi separation; NaN without electron or hole states, with unknown in-plane
 * masses or at T = 0. Above N_MAX it returns N_MAX.
 */
export function transparencyDensity(r: TargetSource): number {
  const T = r.structure.temperature_K;
  const e = r.bands.electron.states.map((s) => ({ energy: s.energy_eV, mass: s.mass_inplane ?? NaN }));
  const h = [...r.bands.heavy_hole.states, ...r.bands.light_hole.states].map((s) => ({ energy: -s.energy_eV, mass: s.mass_inplane ?? NaN }));
  if (e.length === 0 || h.length === 0 || !(T > 0) || [...e, ...h].some((s) => !(s.mass > 0))) return NaN;
  const edge = e[0]!.energy + Math.min(...h.map((s) => s.energy));
  const above = (n: number): boolean => quasiFermiLevels({ electronSubbands: e, holeSubbands: h, sheetDensity_cm2: n, temperature_K: T }).separation_eV >= edge;
  let lo = Math.log(N_MIN);
  let hi = Math.log(N_MAX);
  if (!above(N_MAX)) return N_MAX;
  for (let k = 0; k < STEPS; k++) {
    const mid = (lo + hi) / 2;
    if (above(Math.exp(mid))) hi = mid;
    else lo = mid;
  }
  return Math.exp(hi);
}

export const transparencyObjective: Objective<TransparencyTarget> = {
  kind: 'transparency',
  description: 'the transparency sheet density (quasi-Fermi separation = band-edge line), per well or total, at most a value in cm⁻²',
  schema,
  // In-plane masses come from the wavefunctions; every bound subband holds carriers.
  needsWavefunctions: () => true,
  statesNeeded: () => ['electron', 'heavy_hole', 'light_hole'],
  examples: [{ transparency: 'per_well', at_most: '1.5e12 cm-2' }],
  check: (t, field, geometry) => {
    if (geometry === 'wire') throw new InputError('bad-value', `${field}.transparency: a wire's carriers are per length, not per area; use this target on a layer stack`, `${field}.transparency`);
    if (!(limitOf(t.at_most, `${field}.at_most`) > 0)) throw new InputError('bad-value', `${field}.at_most: must be positive`, `${field}.at_most`);
  },
  warnings: (t, field) => unitNotes([[t.at_most, `${field}.at_most`, 'cm-2']]),
  evaluate: (t, r) => {
    const limit = limitOf(t.at_most, 'at_most');
    const wells = t.transparency === 'per_well' && r.structure.layers ? Math.max(1, wellsOf(r.structure.layers).length) : 1;
    const n = transparencyDensity(r) / wells;
    const missing = !Number.isFinite(n);
    // Residual in decades beyond the limit, scaled so that 10 % over costs one window.
    const over = missing ? 0 : Math.max(0, Math.log(n / limit) / Math.log(1.1));
    return {
      label: `transparency density ${t.transparency === 'per_well' ? 'per well' : 'total'}`,
      role: 'target',
      achieved: missing ? null : n,
      goal: limit,
      unit: 'cm⁻²',
      residual: missing ? 1 + MISSING_STATE_PENALTY : over === 0 ? 0 : 1 + over,
      weight: t.weight ?? 1,
      satisfied: !missing && over === 0,
    };
  },
};
