/** The ensemble of a multi-well stack's lines: every well's own line (e1-hh1…) within a spread, as a grower sees the wells' lines overlap. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { bandOfLabel } from '../engine/solve.js';
import { HC_EV_NM } from '../engine/constants.js';
import { isUnitless, parseEnergy, parseLength } from '../engine/input/units.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, transitionStates, weight } from './common.js';
import { localise, wellLine } from './wells.js';

const schema = z.object({
  ensemble: z.string().describe('Transition read in every well, e.g. e1-hh1'),
  at_most: quantity.describe('Largest spread (highest minus lowest line) over the wells: a wavelength ("4 nm") or an energy ("3 meV")'),
  weight,
}).strict();
export type EnsembleTarget = z.infer<typeof schema>;

/** The limit and how to express lines in its unit (nm of wavelength or meV). */
function limitOf(t: EnsembleTarget, field: string): { value: number; unit: 'nm' | 'meV'; of: (eV: number) => number } {
  // A spread may be a wavelength or an energy: a number alone says neither.
  if (isUnitless(t.at_most)) throw new InputError('bad-value', `${field}.at_most: ${JSON.stringify(t.at_most)} has no unit, and a spread may be a wavelength or an energy; write e.g. "4 nm" or "3 meV"`, `${field}.at_most`);
  const e = parseEnergy(t.at_most);
  if (typeof e === 'number') {
    if (!(e > 0)) throw new InputError('bad-value', `${field}.at_most: must be positive, got ${JSON.stringify(t.at_most)}`, `${field}.at_most`);
    return { value: e * 1000, unit: 'meV', of: (x) => x * 1000 };
  }
  const l = parseLength(t.at_most);
  if (typeof l === 'string' || 'ml' in l || !(l.nm > 0)) throw new InputError('bad-value', `${field}.at_most: expected a positive spread in meV or nm, e.g. "3 meV" or "4 nm", got ${JSON.stringify(t.at_most)}`, `${field}.at_most`);
  return { value: l.nm, unit: 'nm', of: (x) => HC_EV_NM / x };
}

export const ensembleObjective: Objective<EnsembleTarget> = {
  kind: 'ensemble',
  description: 'the spread (highest − lowest) of every well\'s own line (e1-hh1…) at most a value in meV or nm',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: (t) => t.ensemble.split('-').map((l) => bandOfLabel(l)?.band ?? l),
  examples: [{ ensemble: 'e1-hh1', at_most: '4 nm' }],
  check: (t, field, geometry) => {
    if (geometry === 'wire') throw new InputError('bad-value', `${field}.ensemble: a wire has no wells of a stack; use this target on a layer stack`, `${field}.ensemble`);
    transitionStates(t.ensemble, `${field}.ensemble`);
    limitOf(t, field);
  },
  evaluate: (t, r) => {
    const limit = limitOf(t, 'target');
    const ws = localise(r);
    const lines = ws ? ws.wells.map((_, k) => wellLine(r, ws, k, t.ensemble)) : [];
    const found = lines.filter((x): x is number => x !== undefined).map(limit.of);
    const missing = found.length === 0 || found.length < lines.length;
    const spread = found.length ? Math.max(...found) - Math.min(...found) : 0;
    // 10 % of the limit per unit of residual beyond it, as spacing scores a shortfall.
    const over = Math.max(0, spread - limit.value) / (0.1 * limit.value);
    return {
      label: `${t.ensemble} ensemble spread`,
      role: 'target',
      achieved: missing ? null : spread,
      goal: limit.value,
      unit: limit.unit,
      residual: missing ? over + MISSING_STATE_PENALTY : over === 0 ? 0 : 1 + over,
      weight: t.weight ?? 1,
      satisfied: !missing && over === 0,
    };
  },
};
