/**
 * Peak-gain targets: the material gain of one polarisation, at its peak over the spectrum, at least
 * a value at an injected density (a laser's threshold gain, an amplifier's design gain).
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { gainPeak } from '../engine/optics/figures.js';
import { parseGain } from '../engine/optics/schema.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, weight } from './common.js';
import { candidateOptics, checkSpectrumTarget, densityKeys, polarisation, populationOf, spectrumKeys } from './gain-common.js';

const schema = z.object({
  peak_gain: polarisation.describe('Polarisation whose peak material gain is bounded: TE or TM'),
  ...densityKeys,
  at_least: quantity.describe('Lower limit of the peak material gain, e.g. "1500 cm-1"'),
  ...spectrumKeys,
  weight,
}).strict();
export type PeakGainTarget = z.infer<typeof schema>;

/** A shortfall of this share of the limit costs one window. */
const WINDOW_SHARE = 0.1;

export const peakGainObjective: Objective<PeakGainTarget> = {
  kind: 'peak_gain',
  description: 'the TE or TM peak material gain at an injected density at least a value in cm⁻¹',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: () => ['electron', 'heavy_hole', 'light_hole'],
  examples: [{ peak_gain: 'TE', at_least: '1500 cm-1', density: '3e12 cm-2' }],
  check: (t, field, geometry) => {
    checkSpectrumTarget(t, field, geometry, 'peak_gain');
    if (!(parseGain(t.at_least, `${field}.at_least`) > 0)) throw new InputError('bad-value', `${field}.at_least: must be a positive gain, got ${JSON.stringify(t.at_least)}`, `${field}.at_least`);
  },
  evaluate: (t, r) => {
    const limit = parseGain(t.at_least, 'at_least');
    const ctx = candidateOptics(r, t);
    const label = `${t.peak_gain} peak gain at ${t.density}`;
    if (!ctx) return { label, role: 'target', achieved: null, goal: limit, unit: 'cm⁻¹', residual: 1 / WINDOW_SHARE + MISSING_STATE_PENALTY, weight: t.weight ?? 1, satisfied: false };
    const g = gainPeak(ctx.engine, ctx.engine.binSums(ctx.engine.levels(populationOf(t))), t.peak_gain === 'TE' ? 'te' : 'tm').gain_per_cm;
    // Continuous: zero once met, one window per 10 % short of the limit.
    const short = Math.max(0, limit - g) / (WINDOW_SHARE * limit);
    return { label, role: 'target', achieved: g, goal: limit, unit: 'cm⁻¹', residual: short, weight: t.weight ?? 1, satisfied: g >= limit };
  },
};
