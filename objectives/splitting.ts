/** Splitting of two states of different bands, e.g. hh1–lh1: the valence-band splitting that strain and confinement set (positive when the first lies higher). */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { bandOfLabel } from '../engine/solve.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { checkStateLabel, energyOrKT, quantity, stateEnergy, unitNotes, weight } from './common.js';

const schema = z.object({
  splitting: z.string().describe('Two states of different bands, e.g. hh1-lh1: the first one\'s energy minus the second\'s'),
  at_least: quantity.optional().describe('Lower limit, e.g. "40 meV" or "2 kT" (negative for the second state on top)'),
  at_most: quantity.optional().describe('Upper limit'),
  weight,
}).strict();
export type SplittingTarget = z.infer<typeof schema>;

export const splittingObjective: Objective<SplittingTarget> = {
  kind: 'splitting',
  description: 'the splitting E(a) − E(b) of two states of different bands (hh1-lh1…) at least and/or at most a value (meV or n kT)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: (t) => t.splitting.split('-'),
  examples: [{ splitting: 'hh1-lh1', at_least: '40 meV' }],
  check: (t, field) => {
    const parts = t.splitting.split('-');
    if (parts.length !== 2) throw new InputError('bad-value', `${field}.splitting: expected two states such as hh1-lh1, got "${t.splitting}"`, `${field}.splitting`);
    for (const p of parts) checkStateLabel(p, `${field}.splitting`);
    if (bandOfLabel(parts[0]!)!.band === bandOfLabel(parts[1]!)!.band) throw new InputError('bad-value', `${field}.splitting: both states are of one band, got "${t.splitting}"; use a spacing target for them`, `${field}.splitting`);
    if (t.at_least === undefined && t.at_most === undefined) throw new InputError('bad-value', `${field}: give at_least and/or at_most for splitting ${t.splitting}`, field);
    const lo = t.at_least === undefined ? -Infinity : energyOrKT(t.at_least, 300, `${field}.at_least`);
    const hi = t.at_most === undefined ? Infinity : energyOrKT(t.at_most, 300, `${field}.at_most`);
    if (!(lo <= hi)) throw new InputError('bad-value', `${field}: at_least must not exceed at_most, got ${JSON.stringify(t.at_least)} and ${JSON.stringify(t.at_most)}`, field);
  },
  warnings: (t, field) => unitNotes([[t.at_least, `${field}.at_least`, 'eV'], [t.at_most, `${field}.at_most`, 'eV']]),
  evaluate: (t, r) => {
    const T = r.structure.temperature_K;
    const [a, b] = t.splitting.split('-') as [string, string];
    const ea = stateEnergy(r, a);
    const eb = stateEnergy(r, b);
    const value = (ea.energy - eb.energy) * 1000;
    const lo = t.at_least === undefined ? -Infinity : energyOrKT(t.at_least, T, 'at_least') * 1000;
    const hi = t.at_most === undefined ? Infinity : energyOrKT(t.at_most, T, 'at_most') * 1000;
    // Residual scale: 10 % of the limit (at least 1 meV), as spacing.
    const scale = Math.max(0.1 * Math.abs(Number.isFinite(lo) ? lo : hi), 1);
    const short = value < lo ? (lo - value) / scale : value > hi ? (value - hi) / scale : 0;
    const missing = ea.missing || eb.missing;
    return {
      label: `${t.splitting} splitting`,
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
