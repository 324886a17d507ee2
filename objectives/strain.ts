/** Strain targets: the in-plane mismatch strain of the layers with a label, e.g. the wells at −1 %. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { splitQuantity } from '../engine/input/units.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, weight } from './common.js';

const schema = z.object({
  strain: quantity.describe('Goal in-plane strain ε∥ on the substrate, e.g. "-1 %" (negative: compressive)'),
  layer: z.string().min(1).describe('Label of the layers it applies to; "well" covers every period\'s well[1], well[2]…'),
  within: quantity.describe('Half-width of the window, e.g. "0.05 %"'),
  weight,
}).strict();
export type StrainTarget = z.infer<typeof schema>;

function percentOf(raw: string | number, field: string): number {
  const q = splitQuantity(raw);
  if (!q || q.unit !== '%') throw new InputError('bad-value', `${field}: expected a strain in %, e.g. "-1 %", got ${JSON.stringify(raw)}`, field);
  return q.value;
}

/** Whether a resolved label ("well[3]", "well[2.1]") belongs to the written one ("well"). */
export const labelMatches = (resolved: string, written: string): boolean => resolved === written || (resolved.startsWith(`${written}[`) && resolved.endsWith(']'));

export const strainObjective: Objective<StrainTarget> = {
  kind: 'strain',
  description: 'the in-plane strain of the layers with a label (every period\'s) at a value in %, within a window',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: () => [],
  examples: [{ strain: '-1 %', layer: 'well', within: '0.05 %' }],
  check: (t, field, geometry, context) => {
    if (context?.labels && !context.labels.some((l) => labelMatches(l, t.layer))) {
      throw new InputError('bad-value', `${field}.layer: no layer is labelled "${t.layer}" (labels: ${[...new Set(context.labels.map((l) => l.replace(/\[[\d.]+\]$/, '')))].slice(0, 8).join(', ')}); give the label of the layers whose strain is targeted`, `${field}.layer`);
    }
    if (geometry === 'wire') throw new InputError('bad-value', `${field}.strain: a wire's strain is not modelled as layers; use this target on a layer stack`, `${field}.strain`);
    percentOf(t.strain, `${field}.strain`);
    if (!(percentOf(t.within, `${field}.within`) > 0)) throw new InputError('bad-value', `${field}.within: must be positive, got ${JSON.stringify(t.within)}`, `${field}.within`);
  },
  evaluate: (t, r) => {
    const goal = percentOf(t.strain, 'strain');
    const within = percentOf(t.within, 'within');
    const chosen = (r.structure.layers ?? []).filter((l) => labelMatches(l.label, t.layer));
    // The layer farthest from the goal decides (per-period strains may differ).
    let achieved: number | null = null;
    for (const l of chosen) {
      const v = l.material.strain_par * 100;
      if (achieved === null || Math.abs(v - goal) > Math.abs(achieved - goal)) achieved = v;
    }
    const residual = achieved === null ? 1 + MISSING_STATE_PENALTY : (achieved - goal) / within;
    return { label: `${t.layer} strain`, role: 'target', achieved, goal, unit: '%', residual, weight: t.weight ?? 1, satisfied: achieved !== null && Math.abs(residual) <= 1 };
  },
};
