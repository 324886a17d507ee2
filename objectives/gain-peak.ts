/**
 * Gain-peak targets: the photon energy (or wavelength) at which the material gain of one
 * polarisation peaks at an injected density, within a window. A laser lases near its gain peak, not
 * at the e1-hh1 line: band filling moves the peak above the line by tens of meV at working densities.
 */
import { z } from 'zod';
import { gainPeak } from '../engine/optics/figures.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, transitionEnergy, unitNotes, weight } from './common.js';
import { candidateOptics, checkSpectrumTarget, densityKeys, photonWindow, polarisation, populationOf, spectrumKeys } from './gain-common.js';

const schema = z.object({
  gain_peak: polarisation.describe('Polarisation whose material-gain peak is targeted: TE or TM'),
  ...densityKeys,
  energy: quantity.optional().describe('Goal as a photon energy ("1.27 eV")'),
  wavelength: quantity.optional().describe('Goal as a wavelength ("976 nm")'),
  within: quantity.describe('Half-width of the window, in the goal\'s kind of unit ("2 nm", "3 meV")'),
  ...spectrumKeys,
  weight,
}).strict();
export type GainPeakTarget = z.infer<typeof schema>;

export const gainPeakObjective: Objective<GainPeakTarget> = {
  kind: 'gain_peak',
  description: 'the photon energy or wavelength of the TE or TM material-gain peak at an injected density, within a window',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: () => ['electron', 'heavy_hole', 'light_hole'],
  examples: [
    { gain_peak: 'TE', wavelength: '976 nm', within: '2 nm', density: '3e12 cm-2' },
    { gain_peak: 'TM', wavelength: '1550 nm', within: '5 nm', density: '3e12 cm-2', lineshape: 'lorentzian', intraband_time: '0.1 ps' },
  ],
  check: (t, field, geometry) => {
    checkSpectrumTarget(t, field, geometry, 'gain_peak');
    photonWindow(t, field);
  },
  warnings: (t, field) => unitNotes([[t.within, `${field}.within`, photonWindow(t, field).scale.unit]]),
  evaluate: (t, r) => {
    const w = photonWindow(t, 'target');
    const pol = t.gain_peak === 'TE' ? 'te' : 'tm';
    const ctx = candidateOptics(r, t);
    const label = `${t.gain_peak} gain peak ${w.key} at ${t.density}`;
    const goal = w.scale.fromEv(w.scale.goal_eV);
    if (!ctx) {
      // No bound pair: the band-edge line (missing states at their continuum edges) stands in, with a penalty.
      const e = transitionEnergy(r, 'e1-hh1').energy;
      const residual = (w.scale.fromEv(e) - goal) / w.within;
      return { label, role: 'target', achieved: null, goal, unit: w.scale.unit, residual: Math.sign(residual || 1) * (Math.abs(residual) + MISSING_STATE_PENALTY), weight: t.weight ?? 1, satisfied: false };
    }
    const p = populationOf(t);
    const peak = gainPeak(ctx.engine, ctx.engine.binSums(ctx.engine.levels(p)), pol);
    const achieved = w.scale.fromEv(peak.energy_eV);
    const residual = (achieved - goal) / w.within;
    // Below transparency there is no peak (the largest value is absorption's tail): scored as missing.
    const gain = peak.gain_per_cm > 0;
    return {
      label, role: 'target',
      achieved: gain ? achieved : null, goal, unit: w.scale.unit,
      residual: gain ? residual : Math.sign(residual || 1) * (Math.abs(residual) + MISSING_STATE_PENALTY),
      weight: t.weight ?? 1,
      satisfied: gain && Math.abs(residual) <= 1,
    };
  },
};
