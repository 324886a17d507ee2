/**
 * One start of a design search, the unit of work sent to the pool: a bounded Nelder–Mead run
 * from x0, then the snap of its optimum to whole monolayers and the composition step. Plain data
 * in, plain data out, so the result does not depend on which worker ran it.
 */
import type { Spec } from '../input/schema.js';
import { minimize, type NelderMeadStatus } from './neldermead.js';
import { evaluateDesign, prepareDesign, valuesOf } from './problem.js';
import { snapToLattice } from './snap.js';

export interface StartTask {
  readonly type: 'design-start';
  readonly spec: Spec;
  readonly index: number;
  readonly x0: readonly number[];
  readonly maxEvaluations: number;
  readonly compositionStep: number;
}

export interface StartOutcome {
  readonly type: 'design-start';
  readonly index: number;
  /** The continuous optimum of this start. */
  readonly x: readonly number[];
  readonly loss: number;
  readonly status: NelderMeadStatus;
  readonly iterations: number;
  /** Objective evaluations: the simplex's plus the lattice points tried while snapping. */
  readonly evaluations: number;
  /** Candidates that failed numerically (counted, not fatal). */
  readonly failures: number;
  /** The growable design of this start: variable values (nm, ML, % or fraction), its loss and search score (absent in runs stored before preferences: the loss). */
  readonly snapped: { readonly values: Readonly<Record<string, number>>; readonly loss: number; readonly score?: number };
}

/**
 * NM stopping rule: simplex spread below 1e-3 in every variable (nm or fraction: under the
 * monolayer and composition lattices the design is snapped to) and 1e-6 in the loss (a thousandth
 * of a window, squared); or a loss of 1e-6 reached, since the loss (Σ w·r²) cannot go below 0.
 * A target met to a thousandth of its window is a whole valley of designs (a width traded against a
 * composition): refining along it only moves the start's design along the valley, and the snap to
 * the lattice moves it further than that. Measured: the 976 nm scenario's 16 starts took 1408
 * evaluations without the stop value and 754 with it, with the same best design.
 */
const X_TOLERANCE = 1e-3;
const F_TOLERANCE = 1e-6;

/**
 * Runs one start. `onEvaluation`, if given, is called after each Nelder–Mead evaluation on the
 * thread running the start (the command line's progress bar while this thread is busy); it sees
 * nothing and changes nothing computed.
 */
export function runStart(task: StartTask, onEvaluation?: () => void): StartOutcome {
  const problem = prepareDesign(task.spec);
  let failures = 0;
  const bounds = problem.variables.map((v) => [v.from, v.to] as const);
  const nm = minimize((x) => {
    const e = evaluateDesign(problem, valuesOf(problem.variables, x));
    if (!e.ok) failures++;
    onEvaluation?.();
    return e.score;
    // With preferences a met target is only the start: the search goes on along the preferred direction.
  }, task.x0, { bounds, maxEvaluations: task.maxEvaluations, xTolerance: X_TOLERANCE, fTolerance: F_TOLERANCE, stopValue: problem.preferences.length ? -Infinity : F_TOLERANCE });
  const snapped = snapToLattice(problem, nm.x, { compositionStep: task.compositionStep });
  if (!snapped.evaluated.ok) failures++;
  return {
    type: 'design-start',
    index: task.index,
    x: nm.x,
    loss: nm.f,
    status: nm.status,
    iterations: nm.iterations,
    evaluations: nm.evaluations + snapped.evaluations,
    failures,
    snapped: { values: snapped.values, loss: snapped.evaluated.loss, score: snapped.evaluated.score },
  };
}
