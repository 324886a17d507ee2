/**
 * Inverse design: many bounded Nelder–Mead starts from a seeded Latin hypercube, run on the
 * worker pool, each snapped to a growable lattice point; then near-duplicates merged, designs
 * ranked (targets met first, then the spec's preferences, then loss, ties by start index), the top
 * K re-solved in full. Same spec and seed give the same
 * ranked designs for any worker count, because every start is deterministic and results are
 * ordered by start index before ranking.
 */
import { type Evaluation } from '../../objectives/types.js';
import { runTasks, type PoolOptions } from '../pool.js';
import type { Spec } from '../input/schema.js';
import type { VariableInfo } from '../structure.js';
import { scoreTargets } from '../../objectives/index.js';
import { fullSolve, isWireSolve, prepareDesign, type DesignProblem, type DesignSolve } from './problem.js';
import { comparePreferences, criticalMargin, preferenceValues } from './preferences.js';
import { nearDuplicates, stackFingerprint, wireFingerprint, type Fingerprint } from './duplicates.js';
import { buildStructure } from '../structure.js';
import { buildWireStructure } from '../wire/structure.js';
import type { StartOutcome, StartTask } from './start.js';
import { startPoints } from './starts.js';

export interface DesignOptions {
  readonly starts: number;
  readonly seed: number;
  readonly top: number;
  readonly workers: number;
  /** Grower's composition step for alloy fractions. */
  readonly compositionStep: number;
  /** Nelder–Mead evaluation budget per start. */
  readonly maxEvaluations: number;
  readonly onProgress?: PoolOptions['onProgress'];
  /** Called after each Nelder–Mead evaluation of a start this thread runs, with the start's index (PoolOptions.onStep). */
  readonly onStep?: PoolOptions['onStep'];
  /** Called before each full solve of the ranking, with the solves done and the designs to solve (a wire's take seconds each on its fine grid). */
  readonly onSolve?: (done: number, total: number) => void;
}

export const DEFAULT_DESIGN_OPTIONS: Omit<DesignOptions, 'workers'> = { starts: 16, seed: 1, top: 5, compositionStep: 0.001, maxEvaluations: 300 };

/**
 * Defaults for a wire spec. A coarse wire solve costs about 0.1 s (problem.ts): 8 starts × 60
 * evaluations (plus 2^d snapping points each) came to 462 solves and 17.5 s on 2 workers for
 * runs/wire-spacing.yaml (two size variables), where the stack defaults (16 × 300) would take
 * about ten times as long.
 */
export const DEFAULT_WIRE_DESIGN_OPTIONS: Omit<DesignOptions, 'workers'> = { ...DEFAULT_DESIGN_OPTIONS, starts: 8, maxEvaluations: 60 };

/** The default options for a spec: wire specs get the smaller wire budget. */
export const defaultDesignOptions = (spec: Spec): Omit<DesignOptions, 'workers'> => (spec.wire === undefined ? DEFAULT_DESIGN_OPTIONS : DEFAULT_WIRE_DESIGN_OPTIONS);

export interface DesignVariable {
  readonly name: string;
  readonly kind: 'length' | 'fraction' | 'strain';
  /** Value in the variable's own unit (nm, ML, % or fraction). */
  readonly value: number;
  readonly unit: 'nm' | 'ML' | '%' | '';
  /** For lengths: thickness in nm and in monolayers of the first layer (or wire part) it sizes. */
  readonly nm?: number;
  readonly ml?: number;
  /** 'lower' or 'upper' when the value sits on its bound. */
  readonly atBound: 'lower' | 'upper' | null;
}

export interface Design {
  readonly rank: number;
  readonly loss: number;
  readonly satisfied: boolean;
  readonly variables: readonly DesignVariable[];
  readonly values: Readonly<Record<string, number>>;
  readonly evaluations: readonly Evaluation[];
  /** Smallest 1 − t/h_c over strained layers and runs of them (preferences.ts criticalMargin; 1 = unstrained or far below; < 0 = above critical); NaN for a wire, whose strain is not modelled. */
  readonly criticalMargin: number;
  /** The spec's preferences evaluated on the full solve, in their order. */
  readonly preferences: readonly { readonly label: string; readonly value: number; readonly unit: string }[];
  /** The start that found it. */
  readonly start: number;
  /** The full solve with the spec's own settings (a SolveResult, or a WireSolveResult for a wire spec). */
  readonly result: DesignSolve;
}

export type DesignStatus = 'ok' | 'infeasible' | 'no-finite-value';

export const DESIGN_MESSAGES: Readonly<Record<DesignStatus, string>> = {
  ok: 'the best design meets every target and constraint',
  infeasible: 'no design inside the bounds meets every target; the closest is shown',
  'no-finite-value': 'no candidate could be evaluated',
};

export interface DesignResult {
  readonly status: DesignStatus;
  readonly message: string;
  readonly designs: readonly Design[];
  readonly seed: number;
  readonly starts: number;
  /** Total objective evaluations over all starts (work done). */
  readonly evaluations: number;
  /** Candidates that failed numerically (each logged as infeasible, none fatal). */
  readonly failures: number;
}

function atBound(v: VariableInfo, value: number): DesignVariable['atBound'] {
  const tol = 1e-6 * (v.to - v.from) + (v.kind === 'length' ? 0.5 * 0.3 : 0.0005);
  return value - v.from <= tol ? 'lower' : v.to - value <= tol ? 'upper' : null;
}

/** Length in nm and monolayers of what a length variable sizes: the first stack layer, or the first wire dimension, set by it. */
function sizeOf(result: DesignSolve, name: string): { nm: number; ml: number } | undefined {
  if (!isWireSolve(result)) {
    const layer = result.structure.layers.find((l) => l.thicknessVariable === name);
    return layer ? { nm: layer.thickness_nm, ml: layer.monolayers } : undefined;
  }
  const d = result.structure.lengthVariables[name];
  return d ? { nm: d.nm, ml: d.nm / d.monolayer_nm } : undefined;
}

function describeVariables(variables: readonly VariableInfo[], values: Readonly<Record<string, number>>, result: DesignSolve): DesignVariable[] {
  return variables.map((v) => {
    const value = values[v.name]!;
    const base = { name: v.name, kind: v.kind, value, unit: v.unit, atBound: atBound(v, value) };
    const size = v.kind === 'length' ? sizeOf(result, v.name) : undefined;
    return size ? { ...base, ...size } : base;
  });
}

/** The pool tasks of a design run: one Nelder–Mead start per Latin-hypercube point (deterministic in the seed). */
export function designTasks(spec: Spec, options: Pick<DesignOptions, 'starts' | 'seed' | 'maxEvaluations' | 'compositionStep'>): StartTask[] {
  const problem = prepareDesign(spec);
  const bounds = problem.variables.map((v) => [v.from, v.to] as const);
  const x0s = startPoints('latin-hypercube', options.starts, bounds, options.seed);
  return x0s.map((x0, index) => ({ type: 'design-start', spec, index, x0, maxEvaluations: options.maxEvaluations, compositionStep: options.compositionStep }));
}

/** Ranked, growable designs for a spec's targets. */
export async function design(spec: Spec, options: DesignOptions): Promise<DesignResult> {
  const tasks = designTasks(spec, options);
  const outcomes = (await runTasks(tasks, { workers: options.workers, onProgress: options.onProgress, onStep: options.onStep })) as StartOutcome[];
  return rankDesigns(spec, outcomes, options);
}

/**
 * Ranking of finished starts (from one run, or gathered across a resumed campaign): drop
 * unevaluable designs, take them by search score (the loss, or with preferences the preferred
 * among those meeting the targets) then start index, skip near-duplicates of designs already
 * kept (duplicates.ts), re-solve the top K in full, and order those: designs meeting every target
 * first, by the preferences (lexicographic with ties), then by loss, then by start index.
 */
export function rankDesigns(spec: Spec, outcomes: readonly StartOutcome[], options: Pick<DesignOptions, 'top' | 'seed' | 'starts' | 'onSolve'> & { readonly compositionStep?: number }): DesignResult {
  const problem = prepareDesign(spec);
  const step = options.compositionStep ?? DEFAULT_DESIGN_OPTIONS.compositionStep;
  const evaluations = outcomes.reduce((a, o) => a + o.evaluations, 0);
  const failures = outcomes.reduce((a, o) => a + o.failures, 0);
  const score = (o: StartOutcome): number => o.snapped.score ?? o.snapped.loss;
  const ordered = [...outcomes].filter((o) => Number.isFinite(o.snapped.loss)).sort((a, b) => score(a) - score(b) || a.index - b.index);
  const kept: { o: StartOutcome; print: Fingerprint }[] = [];
  for (const o of ordered) {
    if (kept.length >= options.top) break;
    const print = fingerprintOf(problem, o.snapped.values);
    if (kept.some((k) => nearDuplicates(k.print, print, step))) continue;
    kept.push({ o, print });
  }

  const prefs = problem.preferences;
  const solved = kept.map(({ o }, k) => {
    options.onSolve?.(k, kept.length);
    const result = fullSolve(problem, o.snapped.values);
    const scored = scoreTargets(problem.targets, result);
    return { o, result, scored, prefs: isWireSolve(result) ? [] : preferenceValues(prefs, result) };
  });
  // A wire search scores on coarse settings, so the full solves may reorder the designs; for a stack without preferences this sort keeps the order.
  solved.sort((a, b) => Number(b.scored.satisfied) - Number(a.scored.satisfied)
    || (a.scored.satisfied ? comparePreferences(prefs, a.prefs, b.prefs) : 0)
    || a.scored.loss - b.scored.loss || a.o.index - b.o.index);
  const designs = solved.map(({ o, result, scored, prefs: values }, k): Design => ({
    rank: k + 1,
    loss: scored.loss,
    satisfied: scored.satisfied,
    variables: describeVariables(problem.variables, o.snapped.values, result),
    values: o.snapped.values,
    evaluations: scored.evaluations,
    criticalMargin: isWireSolve(result) ? NaN : criticalMargin(result.structure),
    preferences: prefs.map((p, i) => ({ label: p.label, value: values[i] ?? NaN, unit: p.unit })),
    start: o.index,
    result,
  }));
  const status: DesignStatus = designs.length === 0 ? 'no-finite-value' : designs[0]!.satisfied ? 'ok' : 'infeasible';
  return { status, message: DESIGN_MESSAGES[status], designs, seed: options.seed, starts: options.starts, evaluations, failures };
}

/** The near-duplicate fingerprint of a design's structure (stack or wire), built without solving. */
function fingerprintOf(problem: DesignProblem, values: Readonly<Record<string, number>>): Fingerprint {
  return problem.geometry === 'stack' ? stackFingerprint(buildStructure(problem.spec, values)) : wireFingerprint(buildWireStructure(problem.spec, values));
}
