/**
 * Constraints a grower imposes: every strained layer thinner than its Matthews–Blakeslee critical
 * thickness, direct-gap layers where asked, and a limit on the total thickness. Zero residual when
 * they hold; the violation, scaled so that a 10 % breach costs as much as missing a window.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { parseLength } from '../engine/spec/units.js';
import type { Objective } from './types.js';
import { quantity } from './common.js';

const schema = z.object({
  constraint: z.enum(['critical_thickness', 'direct_gap', 'total_thickness']),
  layers: z.array(z.number().int().nonnegative()).optional().describe('direct_gap: indices (from 0) of the layers that must be direct; default all'),
  at_most: quantity.optional().describe('total_thickness: the upper limit, e.g. "300 nm"'),
}).strict();
export type ConstraintTarget = z.infer<typeof schema>;

const BREACH_SCALE = 10;

export const constraintObjective: Objective<ConstraintTarget> = {
  kind: 'constraint',
  description: 'critical_thickness (each strained layer below Matthews–Blakeslee), direct_gap (layers with Γ lowest), total_thickness (at_most)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: () => [],
  check: (t, field, geometry) => {
    if (geometry === 'wire') {
      throw new InputError('bad-value', `${field}.constraint: ${t.constraint} reads the layers of a stack and a wire spec has none (its strain is not modelled as layers); drop this constraint or bound the wire's variables instead`, `${field}.constraint`);
    }
    if (t.constraint === 'total_thickness') {
      const l = t.at_most === undefined ? 'is required for total_thickness' : parseLength(t.at_most);
      if (typeof l === 'string' || 'ml' in l || !(l.nm > 0)) throw new InputError('bad-value', `${field}.at_most: ${typeof l === 'string' ? l : 'give a positive length in nm'}`, `${field}.at_most`);
    }
  },
  evaluate: (t, r) => {
    const { layers, total_nm } = r.structure;
    // check() refuses constraints on wires, so a result without layers here is a caller's bug.
    if (layers === undefined || total_nm === undefined) throw new Error(`constraint ${t.constraint}: the solve result has no layers (a wire); compile the targets with geometry "wire" to refuse it`);
    if (t.constraint === 'critical_thickness') {
      let worst = -Infinity;
      for (const l of layers) worst = Math.max(worst, l.thickness_nm / l.material.criticalThickness_nm - 1);
      return { label: 'below critical thickness', role: 'constraint', achieved: worst, goal: 0, unit: '', residual: Math.max(0, worst) * BREACH_SCALE, weight: 1, satisfied: worst <= 0 };
    }
    if (t.constraint === 'direct_gap') {
      const chosen = t.layers ? layers.filter((l) => t.layers!.includes(l.index)) : layers;
      let deficit = 0;
      for (const l of chosen) deficit = Math.max(deficit, l.material.EgG - Math.min(l.material.EgX, l.material.EgL));
      return { label: 'direct gap', role: 'constraint', achieved: deficit * 1000, goal: 0, unit: 'meV', residual: deficit > 0 ? 1 + deficit / 0.01 : 0, weight: 1, satisfied: deficit <= 0 };
    }
    const limit = (parseLength(t.at_most!) as { nm: number }).nm;
    const excess = total_nm / limit - 1;
    return { label: 'total thickness limit', role: 'constraint', achieved: total_nm, goal: limit, unit: 'nm', residual: Math.max(0, excess) * BREACH_SCALE, weight: 1, satisfied: excess <= 0 };
  },
};
