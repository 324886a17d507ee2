/**
 * A state aligned with the barrier (continuum) edge: the bound-to-quasi-bound rule of intersubband
 * detectors, where the excited state sits at the top of the barrier so that photo-excited carriers
 * escape while the dark current stays low.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { bandOfLabel, findState } from '../engine/solve.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { checkStateLabel, energyOf, quantity, unitNotes, weight } from './common.js';

const schema = z.object({
  at_barrier_edge: z.string().describe('State to place at the barrier edge, e.g. e2'),
  within: quantity.describe('Largest distance below the edge, e.g. "10 meV"'),
  weight,
}).strict();
export type BarrierEdgeTarget = z.infer<typeof schema>;

export const barrierEdgeObjective: Objective<BarrierEdgeTarget> = {
  kind: 'at_barrier_edge',
  description: 'a bound state (e.g. e2) no further than a window below its band\'s barrier edge',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: (t) => [t.at_barrier_edge],
  examples: [{ at_barrier_edge: 'e2', within: '10 meV' }],
  check: (t, field) => {
    checkStateLabel(t.at_barrier_edge, `${field}.at_barrier_edge`);
    if (!(energyOf(t.within, `${field}.within`) > 0)) throw new InputError('bad-value', `${field}.within: must be positive, got ${JSON.stringify(t.within)}`, `${field}.within`);
  },
  warnings: (t, field) => unitNotes([[t.within, `${field}.within`, 'eV']]),
  evaluate: (t, r) => {
    const band = bandOfLabel(t.at_barrier_edge)!.band;
    const within = energyOf(t.within, 'within') * 1000;
    const s = findState(r, t.at_barrier_edge);
    const sign = band === 'electron' ? 1 : -1;
    // Depth below the edge in meV (≥ 0 for a bound state); a missing state has left through the top.
    const depth = s ? sign * (r.bands[band].barrier_eV - s.energy_eV) * 1000 : 0;
    // Aim at the middle of [0, within] below the edge, so |residual| ≤ 1 exactly inside the window;
    // a state pushed into the continuum scores as lying beyond the edge.
    const half = within / 2;
    const residual = s ? (depth - half) / half : -(1 + MISSING_STATE_PENALTY);
    return { label: `${t.at_barrier_edge} below barrier edge`, role: 'target', achieved: s ? depth : null, goal: half, unit: 'meV', residual, weight: t.weight ?? 1, satisfied: s !== undefined && s.bound && depth >= 0 && depth <= within };
  },
};
