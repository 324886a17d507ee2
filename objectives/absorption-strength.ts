/** Absorption-strength targets: the peak absorption per pass of a doped stack (in its coupling geometry) at least a value. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, weight } from './common.js';
import { absorptionOf, fractionOf } from './absorption-common.js';

const schema = z.object({
  absorption_strength: z.object({
    at_least: quantity.describe('Lowest peak absorption per pass: "0.8 %" or 0.008'),
  }).strict().describe('Peak absorption per pass through the stack, in the geometry of absorption.coupling'),
  weight,
}).strict();
export type AbsorptionStrengthTarget = z.infer<typeof schema>;

export const absorptionStrengthObjective: Objective<AbsorptionStrengthTarget> = {
  kind: 'absorption_strength',
  description: 'the peak absorption per pass of a doped stack (absorption.coupling geometry) at least a value (% or fraction)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: () => ['electron'],
  examples: [{ absorption_strength: { at_least: '1 %' } }],
  check: (t, field, geometry) => {
    if (geometry === 'wire') throw new InputError('bad-value', `${field}.absorption_strength: the absorption of a doped layer stack; a wire has none here`, `${field}.absorption_strength`);
    fractionOf(t.absorption_strength.at_least, `${field}.absorption_strength.at_least`);
  },
  evaluate: (t, r) => {
    const goal = fractionOf(t.absorption_strength.at_least, 'at_least') * 100;
    const a = absorptionOf(r);
    const value = a ? a.peak_absorption * 100 : null;
    // 10 % of the limit per unit of residual below it.
    const short = value === null || value >= goal ? 0 : (goal - value) / (0.1 * goal);
    return {
      label: 'peak absorption per pass', role: 'target', achieved: value, goal, unit: '%',
      residual: value === null ? 1 + MISSING_STATE_PENALTY : short === 0 ? 0 : 1 + short,
      weight: t.weight ?? 1, satisfied: value !== null && short === 0,
    };
  },
};
