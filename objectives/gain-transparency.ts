/**
 * Gain-transparency targets: the injected sheet density (n = p) at which the peak material gain of
 * one polarisation reaches zero — from the gain spectra of the multiband subbands, not the
 * quasi-Fermi-level condition of the band edge alone — at most a value.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { transparencyDensity } from '../engine/optics/figures.js';
import { sheetDensityOf } from '../engine/optics/schema.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, weight } from './common.js';
import { candidateOptics, checkSpectrumTarget, polarisation, spectrumKeys } from './gain-common.js';

const schema = z.object({
  gain_transparency: polarisation.describe('Polarisation whose peak gain defines transparency: TE or TM'),
  at_most: quantity.describe('Upper limit of the transparency sheet density, e.g. "1.5e12 cm-2"'),
  ...spectrumKeys,
  weight,
}).strict();
export type GainTransparencyTarget = z.infer<typeof schema>;

export const gainTransparencyObjective: Objective<GainTransparencyTarget> = {
  kind: 'gain_transparency',
  description: 'the sheet density (n = p) at which the TE or TM peak material gain reaches zero, at most a value in cm⁻²',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: () => ['electron', 'heavy_hole', 'light_hole'],
  examples: [{ gain_transparency: 'TE', at_most: '1.5e12 cm-2' }],
  check: (t, field, geometry) => {
    checkSpectrumTarget(t, field, geometry, 'gain_transparency');
    if (!(sheetDensityOf(t.at_most, `${field}.at_most`) > 0)) throw new InputError('bad-value', `${field}.at_most: must be positive`, `${field}.at_most`);
  },
  evaluate: (t, r) => {
    const limit = sheetDensityOf(t.at_most, 'at_most');
    const ctx = candidateOptics(r, t);
    const n = ctx ? transparencyDensity(ctx.engine, t.gain_transparency === 'TE' ? 'te' : 'tm') : NaN;
    const label = `${t.gain_transparency} transparency density`;
    if (!Number.isFinite(n)) return { label, role: 'target', achieved: null, goal: limit, unit: 'cm⁻²', residual: 1 + MISSING_STATE_PENALTY, weight: t.weight ?? 1, satisfied: false };
    // Continuous: zero once met, one window per 10 % over the limit (in log density).
    const over = Math.max(0, Math.log(n / limit) / Math.log(1.1));
    return { label, role: 'target', achieved: n, goal: limit, unit: 'cm⁻²', residual: over, weight: t.weight ?? 1, satisfied: n <= limit };
  },
};
