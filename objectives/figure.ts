/** Figures to maximise: the squared envelope overlap of a transition, or an intersubband oscillator strength. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import type { Objective } from './types.js';
import { findTransition } from '../engine/solve.js';
import { transitionStates } from './common.js';

const schema = z.object({
  maximize: z.enum(['overlap', 'oscillator_strength']).describe('Figure to maximise'),
  transition: z.string().describe('e1-hh1 for an overlap, e1-e2 for an oscillator strength'),
  weight: z.number().positive().optional().describe('Relative weight in the loss (default 0.1: targets come first)'),
}).strict();
export type FigureTarget = z.infer<typeof schema>;

export const figureObjective: Objective<FigureTarget> = {
  kind: 'maximize',
  description: 'maximise a transition\'s overlap² or an intersubband oscillator strength',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: (t) => t.transition.split('-'),
  examples: [{ maximize: 'overlap', transition: 'e1-hh1' }, { maximize: 'oscillator_strength', transition: 'e1-e2', weight: 0.2 }],
  check: (t, field, geometry) => {
    const [, b] = transitionStates(t.transition, `${field}.transition`);
    if (t.maximize === 'oscillator_strength' && geometry === 'wire') throw new InputError('bad-value', `${field}.maximize: oscillator strengths are computed for layer stacks only, got one on a wire spec; maximise the overlap or target the e1-e2 energy instead`, `${field}.maximize`);
    if (t.maximize === 'oscillator_strength' && !b.startsWith('e')) throw new InputError('bad-value', `${field}.transition: an oscillator strength is for an intersubband transition such as e1-e2, got "${t.transition}"`, `${field}.transition`);
  },
  evaluate: (t, r) => {
    const tr = findTransition(r, t.transition);
    const value = tr ? (t.maximize === 'overlap' ? tr.overlap2 : (tr.oscillator_strength ?? 0)) : 0;
    return {
      label: `${t.transition} ${t.maximize === 'overlap' ? 'overlap²' : 'oscillator strength'}`,
      role: 'figure',
      achieved: tr ? value : null,
      goal: null,
      unit: '',
      residual: 1 - Math.min(Math.max(value, 0), 1),
      weight: t.weight ?? 0.1,
      satisfied: true,
    };
  },
};
