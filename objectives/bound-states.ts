/** The exact number of bound states in a band. */
import { z } from 'zod';
import type { Objective } from './types.js';
import { weight } from './common.js';

const schema = z.object({
  bound_states: z.enum(['electron', 'heavy_hole', 'light_hole']).describe('Band whose bound states are counted'),
  count: z.number().int().nonnegative().describe('Required number of bound states'),
  weight,
}).strict();
export type BoundStatesTarget = z.infer<typeof schema>;

export const boundStatesObjective: Objective<BoundStatesTarget> = {
  kind: 'bound_states',
  description: 'exactly this many bound states in a band (electron, heavy_hole, light_hole)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: (t) => [t.bound_states],
  examples: [{ bound_states: 'electron', count: 2 }],
  check: () => undefined,
  evaluate: (t, r) => {
    const n = r.bands[t.bound_states].states.filter((s) => s.bound).length;
    // One state off is two windows off: only the exact count lies inside |residual| ≤ 1.
    const residual = 2 * (n - t.count);
    return { label: `${t.bound_states} bound states`, role: 'target', achieved: n, goal: t.count, unit: 'states', residual, weight: t.weight ?? 1, satisfied: n === t.count };
  },
};
