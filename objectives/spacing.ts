/** Subband-spacing targets: the gap between two subbands of one band at least (or at most) a value, which may be given in kT. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { bandOfLabel } from '../engine/solve.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { checkStateLabel, energyOrKT, quantity, stateEnergy, unitNotes, weight } from './common.js';

const schema = z.object({
  spacing: z.string().describe('Two states of one band, e.g. e1-e2'),
  at_least: quantity.optional().describe('Lower limit, e.g. "75 meV" or "3 kT"'),
  at_most: quantity.optional().describe('Upper limit'),
  weight,
}).strict();
export type SpacingTarget = z.infer<typeof schema>;

const statesOf = (t: SpacingTarget): [string, string] => t.spacing.split('-') as [string, string];

export const spacingObjective: Objective<SpacingTarget> = {
  kind: 'spacing',
  description: 'the spacing between two subbands of one band at least and/or at most a value (meV or n kT)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: (t) => t.spacing.split('-'),
  examples: [{ spacing: 'e1-e2', at_least: '3 kT' }, { spacing: 'hh1-hh2', at_least: '40 meV', at_most: '60 meV' }],
  check: (t, field) => {
    const parts = t.spacing.split('-');
    if (parts.length !== 2) throw new InputError('bad-value', `${field}.spacing: expected two states such as e1-e2, got "${t.spacing}"`, `${field}.spacing`);
    for (const p of parts) checkStateLabel(p, `${field}.spacing`);
    if (bandOfLabel(parts[0]!)!.band !== bandOfLabel(parts[1]!)!.band) throw new InputError('bad-value', `${field}.spacing: both states must be of one band, got "${t.spacing}"`, `${field}.spacing`);
    if (t.at_least === undefined && t.at_most === undefined) throw new InputError('bad-value', `${field}: give at_least and/or at_most for spacing ${t.spacing}`, field);
    if (t.at_least !== undefined) energyOrKT(t.at_least, 300, `${field}.at_least`);
    if (t.at_most !== undefined) energyOrKT(t.at_most, 300, `${field}.at_most`);
  },
  warnings: (t, field) => unitNotes([[t.at_least, `${field}.at_least`, 'eV'], [t.at_most, `${field}.at_most`, 'eV']]),
  evaluate: (t, r) => {
    const T = r.structure.temperature_K;
    const [a, b] = statesOf(t);
    const ea = stateEnergy(r, a);
    const eb = stateEnergy(r, b);
    const value = Math.abs(eb.energy - ea.energy) * 1000;
    const lo = t.at_least === undefined ? -Infinity : energyOrKT(t.at_least, T, 'at_least') * 1000;
    const hi = t.at_most === undefined ? Infinity : energyOrKT(t.at_most, T, 'at_most') * 1000;
    // The scale of the residual: 10 % of the limit, so a 10 % shortfall costs as much as a window's width.
    const scale = Math.max(0.1 * (Number.isFinite(lo) ? Math.abs(lo) : Math.abs(hi)), 1);
    const short = value < lo ? (lo - value) / scale : value > hi ? (value - hi) / scale : 0;
    const missing = ea.missing || eb.missing;
    return {
      label: `${t.spacing} spacing`,
      role: 'target',
      achieved: missing ? null : value,
      goal: Number.isFinite(lo) ? lo : hi,
      unit: 'meV',
      residual: missing ? short + MISSING_STATE_PENALTY : short === 0 ? 0 : 1 + short,
      weight: t.weight ?? 1,
      satisfied: !missing && short === 0,
    };
  },
};
