/**
 * Polarisation-ratio targets: the ratio of the TE and TM peak material gains at an injected density
 * (TE/TM or TM/TE) at least, at most, or at a value — for polarisation-insensitive amplifiers
 * (ratio 1) or TM-gain (tensile-strained) wells.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { gainPeak } from '../engine/optics/figures.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, weight } from './common.js';
import { candidateOptics, checkSpectrumTarget, densityKeys, populationOf, spectrumKeys } from './gain-common.js';

const schema = z.object({
  polarisation_ratio: z.enum(['TE/TM', 'TM/TE']).describe('Which peak gain is divided by which'),
  ...densityKeys,
  at_least: z.number().positive().optional().describe('Lower limit of the ratio'),
  at_most: z.number().positive().optional().describe('Upper limit of the ratio'),
  value: z.number().positive().optional().describe('Goal of the ratio, with "within"'),
  within: z.number().positive().optional().describe('Half-width of the window around "value"'),
  ...spectrumKeys,
  weight,
}).strict();
export type PolarisationRatioTarget = z.infer<typeof schema>;

/** A one-sided miss of this share of the limit costs one window. */
const WINDOW_SHARE = 0.1;

function goalOf(t: PolarisationRatioTarget, field: string): { readonly kind: 'at_least' | 'at_most' | 'value'; readonly v: number; readonly within: number } {
  const kinds = (['at_least', 'at_most', 'value'] as const).filter((k) => t[k] !== undefined);
  if (kinds.length !== 1) throw new InputError('bad-value', `${field}: give exactly one of at_least, at_most or value, got ${kinds.length === 0 ? 'none' : kinds.join(' and ')}`, field);
  const kind = kinds[0]!;
  if (kind === 'value' && t.within === undefined) throw new InputError('bad-value', `${field}.within: a ratio "value" needs a window, e.g. within: 0.1`, `${field}.within`);
  if (kind !== 'value' && t.within !== undefined) throw new InputError('bad-value', `${field}.within: only "value" takes a window; remove it`, `${field}.within`);
  const v = t[kind]!;
  return { kind, v, within: kind === 'value' ? t.within! : WINDOW_SHARE * v };
}

export const polarisationRatioObjective: Objective<PolarisationRatioTarget> = {
  kind: 'polarisation_ratio',
  description: 'the ratio of TE and TM peak material gains (TE/TM or TM/TE) at an injected density: at_least, at_most, or value within a window',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: () => ['electron', 'heavy_hole', 'light_hole'],
  examples: [
    { polarisation_ratio: 'TE/TM', value: 1, within: 0.1, density: '2e12 cm-2' },
    { polarisation_ratio: 'TM/TE', at_least: 2, density: '3e12 cm-2' },
  ],
  check: (t, field, geometry) => {
    checkSpectrumTarget(t, field, geometry, 'polarisation_ratio');
    goalOf(t, field);
  },
  evaluate: (t, r) => {
    const g = goalOf(t, 'target');
    const ctx = candidateOptics(r, t);
    const label = `${t.polarisation_ratio} peak-gain ratio at ${t.density}`;
    const missing = { label, role: 'target' as const, achieved: null, goal: g.v, unit: '', residual: 1 + MISSING_STATE_PENALTY, weight: t.weight ?? 1, satisfied: false };
    if (!ctx) return missing;
    const sums = ctx.engine.binSums(ctx.engine.levels(populationOf(t)));
    const te = gainPeak(ctx.engine, sums, 'te').gain_per_cm;
    const tm = gainPeak(ctx.engine, sums, 'tm').gain_per_cm;
    const [num, den] = t.polarisation_ratio === 'TE/TM' ? [te, tm] : [tm, te];
    if (!(num > 0) && !(den > 0)) return missing;
    // No gain in the denominator's polarisation: the ratio is unbounded.
    const ratio = den > 0 ? num / den : Infinity;
    const finite = Number.isFinite(ratio);
    const residual = g.kind === 'at_least' ? (finite ? Math.max(0, g.v - ratio) / g.within : 0)
      : g.kind === 'at_most' ? (finite ? Math.max(0, ratio - g.v) / g.within : 1 + MISSING_STATE_PENALTY)
        : finite ? (ratio - g.v) / g.within : 1 + MISSING_STATE_PENALTY;
    const satisfied = g.kind === 'at_least' ? ratio >= g.v : g.kind === 'at_most' ? ratio <= g.v : Math.abs(residual) <= 1;
    return { label, role: 'target', achieved: finite ? ratio : null, goal: g.v, unit: '', residual, weight: t.weight ?? 1, satisfied };
  },
};
