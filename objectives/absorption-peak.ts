/** Absorption-peak targets: the peak of a doped stack's intersubband absorption (with its depolarisation shift) at a wavelength, energy or wavenumber, within a window. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { photonScale, quantity, unitNotes, weight, windowIn } from './common.js';
import { absorptionOf } from './absorption-common.js';

const schema = z.object({
  absorption_peak: quantity.describe('Goal of the absorption peak: a wavelength ("9 µm"), an energy ("140 meV") or a wavenumber ("1100 cm-1")'),
  within: quantity.describe('Half-width of the window, in the goal\'s kind of unit'),
  weight,
}).strict();
export type AbsorptionPeakTarget = z.infer<typeof schema>;

export const absorptionPeakObjective: Objective<AbsorptionPeakTarget> = {
  kind: 'absorption_peak',
  description: 'the peak of a doped stack\'s intersubband absorption (depolarisation-shifted) at a wavelength, energy or wavenumber, within a window',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: () => ['electron'],
  examples: [{ absorption_peak: '9 µm', within: '0.2 µm' }],
  check: (t, field, geometry) => {
    if (geometry === 'wire') throw new InputError('bad-value', `${field}.absorption_peak: the absorption of a doped layer stack; a wire has none here`, `${field}.absorption_peak`);
    const scale = photonScale(t.absorption_peak, `${field}.absorption_peak`);
    windowIn(t.within, scale.unit, `${field}.within`);
  },
  warnings: (t, field) => unitNotes([[t.within, `${field}.within`, photonScale(t.absorption_peak, `${field}.absorption_peak`).unit]]),
  evaluate: (t, r) => {
    const scale = photonScale(t.absorption_peak, 'absorption_peak');
    const within = windowIn(t.within, scale.unit, 'within');
    const goal = scale.fromEv(scale.goal_eV);
    const a = absorptionOf(r);
    const achieved = a ? scale.fromEv(a.peak_eV) : null;
    // No absorption (no populated subband, or no doping): scored as a window and a penalty away.
    const residual = achieved === null ? 1 + MISSING_STATE_PENALTY : (achieved - goal) / within;
    return { label: 'absorption peak', role: 'target', achieved, goal, unit: scale.unit, residual, weight: t.weight ?? 1, satisfied: achieved !== null && Math.abs(residual) <= 1 };
  },
};
