/**
 * A design problem: the spec's free variables and compiled targets, and the evaluation of one
 * candidate (variable values -> structure -> solve -> scored targets). Numerical trouble in one
 * candidate makes that candidate infeasible (loss +Infinity) and is counted; it never stops a search.
 */
import { InputError } from '../errors.js';
import { compileTargets, scoreTargets, needsWavefunctions, statesNeeded, type CompiledTarget, type Scored } from '../../objectives/index.js';
import type { BandName } from '../profile.js';
import { solveStructure, settingsOf, type SolveResult, type SolverSettings } from '../solve.js';
import { buildStructure, variablesOf, type VariableInfo } from '../structure.js';
import type { Spec } from '../spec/schema.js';

export interface DesignProblem {
  readonly spec: Spec;
  readonly variables: readonly VariableInfo[];
  readonly targets: readonly CompiledTarget[];
  readonly settings: SolverSettings;
  /** Whether targets read overlaps or oscillator strengths (wavefunctions are then sampled during the search). */
  readonly wavefunctions: boolean;
  /** States per band the targets read (absent band: all). */
  readonly states: Partial<Record<BandName, number>>;
}

export function prepareDesign(spec: Spec): DesignProblem {
  const variables = variablesOf(spec);
  if (variables.length === 0) throw new InputError('bad-value', 'vary: a design needs at least one free variable with bounds, e.g. vary: { w: { from: 4 nm, to: 10 nm } }', 'vary');
  const targets = compileTargets(spec.targets);
  if (!targets.some((t) => t.objective.kind !== 'constraint')) throw new InputError('bad-value', 'targets: a design needs at least one target, e.g. - { transition: e1-hh1, wavelength: 976 nm, within: 2 nm }', 'targets');
  // Resolve once at the centre of the box so that bad materials or variable references fail here, as input errors, not as infeasible candidates.
  buildStructure(spec, valuesOf(variables, variables.map((v) => (v.from + v.to) / 2)));
  return { spec, variables, targets, settings: settingsOf(spec), wavefunctions: needsWavefunctions(targets), states: statesNeeded(targets) };
}

export const valuesOf = (variables: readonly VariableInfo[], x: readonly number[]): Record<string, number> =>
  Object.fromEntries(variables.map((v, i) => [v.name, x[i]!]));

export type Evaluated =
  | { readonly ok: true; readonly loss: number; readonly scored: Scored; readonly result: SolveResult }
  | { readonly ok: false; readonly loss: number; readonly error: string };

export function evaluateDesign(problem: DesignProblem, values: Readonly<Record<string, number>>): Evaluated {
  try {
    const result = solveStructure(buildStructure(problem.spec, values), problem.settings, { wavefunctions: problem.wavefunctions, states: problem.states });
    const scored = scoreTargets(problem.targets, result);
    return Number.isFinite(scored.loss) ? { ok: true, loss: scored.loss, scored, result } : { ok: false, loss: Infinity, error: 'loss is not finite' };
  } catch (e) {
    return { ok: false, loss: Infinity, error: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
  }
}
