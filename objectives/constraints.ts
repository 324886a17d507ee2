/**
 * Constraints a grower imposes: every strained layer, and every run of strained layers taken
 * together, thinner than its Matthews–Blakeslee critical thickness (materials/strain-balance.ts),
 * the strain of a compensated stack balanced (zero net stress within a tolerance), direct-gap
 * layers where asked, and a limit on the total thickness. Zero residual when they hold; the
 * violation, scaled so that a 10 % breach costs as much as missing a window.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { parseLength, splitQuantity } from '../engine/input/units.js';
import { netStrain, worstStrainRun, type StrainLayer } from '../materials/strain-balance.js';
import type { Objective, TargetLayer } from './types.js';
import { quantity, unitNotes } from './common.js';

const schema = z.object({
  constraint: z.enum(['critical_thickness', 'direct_gap', 'total_thickness', 'strain_balance']).describe('Which constraint: critical_thickness, strain_balance, direct_gap or total_thickness'),
  within: quantity.optional().describe('strain_balance: largest |net strain| of the stack, e.g. "0.05 %" (default 0.05 %)'),
  layers: z.array(z.number().int().nonnegative()).optional().describe('direct_gap: indices (from 0) of the layers that must be direct; default all'),
  at_most: quantity.optional().describe('total_thickness: the upper limit, e.g. "300 nm"'),
}).strict();
export type ConstraintTarget = z.infer<typeof schema>;

const BREACH_SCALE = 10;

/** Default tolerance of strain_balance (%): a residual strain a grower calls balanced (common practice is ±0.05–0.1 %). */
const DEFAULT_BALANCE_PERCENT = 0.05;

function balancePercent(raw: string | number | undefined, field: string): number {
  if (raw === undefined) return DEFAULT_BALANCE_PERCENT;
  const q = splitQuantity(raw);
  if (!q || q.unit !== '%' || !(q.value > 0)) throw new InputError('bad-value', `${field}: expected a positive strain in %, e.g. "0.05 %", got ${JSON.stringify(raw)}`, field);
  return q.value;
}

/**
 * The layers as strain checks read them, and the substrate's lattice constant (nm) recovered from
 * any strained-on layer (a_s = a (1 + ε∥)); null for a stack without a substrate.
 */
export function strainView(layers: readonly TargetLayer[], substrate: string | null | undefined): { layers: StrainLayer[]; aSubstrate_nm: number } | null {
  if (!substrate) return null;
  const ref = layers.find((l) => Number.isFinite(l.material.a_nm) && Number.isFinite(l.material.C11));
  if (!ref) return null;
  return {
    layers: layers.map((l) => ({ thickness_nm: l.thickness_nm, a_nm: l.material.a_nm, C11: l.material.C11, C12: l.material.C12 })),
    aSubstrate_nm: ref.material.a_nm * (1 + ref.material.strain_par),
  };
}

export const constraintObjective: Objective<ConstraintTarget> = {
  kind: 'constraint',
  description: 'critical_thickness (each strained layer and each run of them below Matthews–Blakeslee), strain_balance (net strain of the stack within "within", Ekins-Daukes zero stress), direct_gap (layers with Γ lowest), total_thickness (at_most)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: () => [],
  examples: [{ constraint: 'critical_thickness' }, { constraint: 'strain_balance', within: '0.05 %' }, { constraint: 'direct_gap', layers: [1, 2] }, { constraint: 'total_thickness', at_most: '300 nm' }],
  check: (t, field, geometry, context) => {
    const count = context?.labels?.length;
    const beyond = t.layers?.find((i) => count !== undefined && i >= count);
    if (beyond !== undefined) throw new InputError('bad-value', `${field}.layers: layer index ${beyond} is beyond the stack (${count} layers, counted from 0); give indices from 0 to ${count! - 1}`, `${field}.layers`);
    if (geometry === 'wire') {
      throw new InputError('bad-value', `${field}.constraint: ${t.constraint} reads the layers of a stack and a wire spec has none (its strain is not modelled as layers); drop this constraint or bound the wire's variables instead`, `${field}.constraint`);
    }
    if (t.constraint === 'strain_balance') balancePercent(t.within, `${field}.within`);
    if (t.within !== undefined && t.constraint !== 'strain_balance') throw new InputError('bad-value', `${field}.within: only strain_balance takes a tolerance; remove it`, `${field}.within`);
    if (t.constraint === 'total_thickness') {
      const l = t.at_most === undefined ? 'is required for total_thickness' : parseLength(t.at_most);
      if (typeof l === 'string' || 'ml' in l || !(l.nm > 0)) throw new InputError('bad-value', `${field}.at_most: ${typeof l === 'string' ? l : 'give a positive length in nm'}`, `${field}.at_most`);
    }
  },
  warnings: (t, field) => unitNotes([[t.at_most, `${field}.at_most`, 'nm']]),
  evaluate: (t, r) => {
    const { layers, total_nm } = r.structure;
    // check() refuses constraints on wires, so a result without layers here is a caller's bug.
    if (layers === undefined || total_nm === undefined) throw new Error(`constraint ${t.constraint}: the solve result has no layers (a wire); compile the targets with geometry "wire" to refuse it`);
    if (t.constraint === 'critical_thickness') {
      // Each layer alone, and every run of strained layers as one equivalent layer (materials/strain-balance.ts).
      let worst = -Infinity;
      for (const l of layers) worst = Math.max(worst, l.thickness_nm / l.material.criticalThickness_nm - 1);
      const view = strainView(layers, r.structure.substrate);
      const run = view ? worstStrainRun(view.layers, view.aSubstrate_nm) : null;
      if (run) worst = Math.max(worst, run.ratio - 1);
      return { label: 'below critical thickness', role: 'constraint', achieved: worst, goal: 0, unit: 't/h_c − 1', residual: Math.max(0, worst) * BREACH_SCALE, weight: 1, satisfied: worst <= 0 };
    }
    if (t.constraint === 'strain_balance') {
      const limit = balancePercent(t.within, 'within');
      const view = strainView(layers, r.structure.substrate);
      // Only the strained layers' span is averaged: unstrained claddings would dilute the residual.
      const strained = view ? view.layers.filter((l) => Math.abs(l.a_nm - view.aSubstrate_nm) > 1e-6 * view.aSubstrate_nm) : [];
      const net = view && strained.length ? netStrain(view.layers.slice(view.layers.indexOf(strained[0]!), view.layers.lastIndexOf(strained.at(-1)!) + 1), view.aSubstrate_nm) * 100 : 0;
      const excess = Math.abs(net) / limit - 1;
      return { label: 'strain balance', role: 'constraint', achieved: net, goal: 0, unit: '%', residual: Math.max(0, excess) * BREACH_SCALE, weight: 1, satisfied: excess <= 0 };
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
