/** Transition targets: an interband (e_i–hh_j, e_i–lh_j) or intersubband (e_i–e_j) line at an energy, wavelength or wavenumber, within a window. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { MISSING_STATE_PENALTY, type Objective, type TargetSource } from './types.js';
import { bandOfLabel } from '../engine/solve.js';
import { findWell, localise, wellLine } from './wells.js';
import { excitonBinding, PHOTON_UNITS, photonScale, quantity, transitionEnergy, transitionStates, unitNotes, weight, windowIn } from './common.js';

const schema = z.object({
  transition: z.string().describe('e1-hh1, e1-lh1, e1-e2 …'),
  energy: quantity.optional().describe('Goal as a photon energy ("1.27 eV", "120 meV")'),
  wavelength: quantity.optional().describe('Goal as a wavelength ("976 nm", "9 µm")'),
  wavenumber: quantity.optional().describe('Goal as a wavenumber ("1100 cm-1")'),
  within: quantity.describe('Half-width of the acceptance window, in the goal\'s kind of unit'),
  well: z.union([z.string().min(1), z.number().int().positive()]).optional().describe('Only this well\'s own states (a stack of several wells): its label, e.g. "well[3]", or its number counted from the substrate side'),
  exciton: z.boolean().optional().describe('Target the exciton line (the subband edge minus the exciton binding estimate), as photoluminescence and absorption show it; interband lines of layer stacks only'),
  weight,
}).strict();
export type TransitionTarget = z.infer<typeof schema>;

function goalOf(t: TransitionTarget, field: string): { key: 'energy' | 'wavelength' | 'wavenumber'; raw: string | number } {
  const keys = (['energy', 'wavelength', 'wavenumber'] as const).filter((k) => t[k] !== undefined);
  if (keys.length !== 1) throw new InputError('bad-value', `${field}: give exactly one of energy, wavelength or wavenumber for transition ${t.transition}, got ${keys.length === 0 ? 'none' : keys.join(' and ')}`, field);
  return { key: keys[0]!, raw: t[keys[0]!]! };
}

/**
 * A well's own line (wellLine), or, when the stack has no such well or state, the whole stack's
 * line scored as missing (so the loss stays continuous and still prefers designs where it exists).
 */
function ownLine(r: TargetSource, well: string | number, transition: string): { energy: number; missing: boolean } {
  const ws = localise(r);
  const k = ws ? findWell(ws, well) : undefined;
  const e = ws && k !== undefined ? wellLine(r, ws, k, transition) : undefined;
  return e === undefined ? { energy: transitionEnergy(r, transition).energy, missing: true } : { energy: e, missing: false };
}

export const transitionObjective: Objective<TransitionTarget> = {
  kind: 'transition',
  description: 'a transition line (e1-hh1, e1-lh1, e1-e2…) at an energy, wavelength or wavenumber, within a window',
  schema,
  needsWavefunctions: (t) => t.exciton === true || t.well !== undefined,
  // A well's e1 may be any electron state of the stack, so a well's line reads whole bands.
  statesNeeded: (t) => (t.well === undefined ? t.transition.split('-') : t.transition.split('-').map((l) => bandOfLabel(l)!.band)),
  examples: [
    { transition: 'e1-hh1', wavelength: '976 nm', within: '2 nm' },
    { transition: 'e1-e2', energy: '120 meV', within: '5 meV' },
    { transition: 'e1-hh1', wavelength: '1550 nm', within: '5 nm', well: 'well[3]' },
  ],
  check: (t, field, geometry, context) => {
    const [, upper] = transitionStates(t.transition, `${field}.transition`);
    if (typeof t.well === 'string' && context?.labels && !context.labels.includes(t.well)) {
      throw new InputError('bad-value', `${field}.well: no layer is labelled "${t.well}" (labels: ${[...new Set(context.labels)].slice(0, 8).join(', ')}${context.labels.length > 8 ? ', …' : ''}); name a well by its label, e.g. "well[3]", or by its number from the substrate side`, `${field}.well`);
    }
    if (t.well !== undefined && (geometry === 'wire' || t.exciton)) {
      throw new InputError('bad-value', `${field}.well: ${geometry === 'wire' ? 'a wire has no wells of a stack' : 'the exciton estimate is for the lowest pair of the whole stack'}; remove "well" or ${geometry === 'wire' ? 'use a layer stack' : '"exciton"'}`, `${field}.well`);
    }
    if (t.exciton && (geometry === 'wire' || upper.startsWith('e'))) {
      throw new InputError('bad-value', `${field}.exciton: the exciton estimate covers interband lines of layer stacks, got ${t.transition} on a ${geometry === 'wire' ? 'wire' : 'single band'}; remove "exciton" or target an e-hh or e-lh line of a well`, `${field}.exciton`);
    }
    const g = goalOf(t, field);
    windowIn(t.within, photonScale(g.raw, `${field}.${g.key}`, g.key).unit, `${field}.within`);
  },
  warnings: (t, field) => {
    const g = goalOf(t, field);
    const unit = photonScale(g.raw, `${field}.${g.key}`, g.key).unit;
    return unitNotes([[g.raw, `${field}.${g.key}`, PHOTON_UNITS[g.key]], [t.within, `${field}.within`, unit]]);
  },
  evaluate: (t, r) => {
    const g = goalOf(t, 'target');
    const scale = photonScale(g.raw, g.key, g.key);
    const within = windowIn(t.within, scale.unit, 'target.within');
    const bare = t.well === undefined ? transitionEnergy(r, t.transition) : ownLine(r, t.well, t.transition);
    // A binding that could not be estimated (a custom material without a permittivity) counts as missing.
    const binding = t.exciton ? excitonBinding(r, t.transition) : 0;
    const e = { energy: bare.energy - (Number.isFinite(binding) ? binding : 0), missing: bare.missing || !Number.isFinite(binding) };
    const achieved = scale.fromEv(e.energy);
    const goal = scale.fromEv(scale.goal_eV);
    const residual = (achieved - goal) / within;
    return {
      label: `${t.transition}${t.exciton ? ' exciton' : ''}${t.well === undefined ? '' : ` of ${typeof t.well === 'number' ? `well ${t.well}` : t.well}`} ${g.key}`,
      role: 'target',
      achieved: e.missing ? null : achieved,
      goal,
      unit: scale.unit,
      residual: e.missing ? Math.sign(residual || 1) * (Math.abs(residual) + MISSING_STATE_PENALTY) : residual,
      weight: t.weight ?? 1,
      satisfied: !e.missing && Math.abs(residual) <= 1,
    };
  },
};
