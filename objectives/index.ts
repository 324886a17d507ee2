/**
 * The registry of target kinds. A spec's `targets:` entries are dispatched by their key
 * (transition, subband_edge, spacing, bound_states, at_barrier_edge, splitting, ensemble, strain,
 * transparency, maximize, constraint),
 * validated by that kind's schema, and combined by weights into one loss Σ w·r².
 */
import { InputError } from '../engine/errors.js';
import { bandOfLabel } from '../engine/solve.js';
import type { BandName } from '../engine/profile.js';
import type { Evaluation, Geometry, Objective, TargetSource } from './types.js';
import { transitionObjective } from './transition.js';
import { subbandEdgeObjective } from './subband-edge.js';
import { spacingObjective } from './spacing.js';
import { boundStatesObjective } from './bound-states.js';
import { barrierEdgeObjective } from './barrier-edge.js';
import { figureObjective } from './figure.js';
import { constraintObjective } from './constraints.js';
import { ensembleObjective } from './ensemble.js';
import { splittingObjective } from './splitting.js';
import { strainObjective } from './strain.js';
import { transparencyObjective } from './transparency.js';

/** Type-erased entry: the objective only ever sees targets its own schema has parsed. */
const entry = <T>(key: string, objective: Objective<T>): { readonly key: string; readonly objective: Objective<unknown> } =>
  ({ key, objective: objective as unknown as Objective<unknown> });

/** Dispatch order matters: `maximize` entries also carry a `transition` key. */
export const OBJECTIVES: readonly { readonly key: string; readonly objective: Objective<unknown> }[] = [
  entry('maximize', figureObjective),
  entry('constraint', constraintObjective),
  entry('subband_edge', subbandEdgeObjective),
  entry('spacing', spacingObjective),
  entry('bound_states', boundStatesObjective),
  entry('at_barrier_edge', barrierEdgeObjective),
  entry('splitting', splittingObjective),
  entry('ensemble', ensembleObjective),
  entry('strain', strainObjective),
  entry('transparency', transparencyObjective),
  entry('transition', transitionObjective),
];

export interface CompiledTarget {
  readonly objective: Objective<unknown>;
  readonly target: unknown;
  /** "targets[2]" */
  readonly field: string;
}

/** Validates a spec's targets for a layer stack or a wire (default: stack); every error names the target's field. */
export function compileTargets(raw: readonly Record<string, unknown>[] | undefined, geometry: Geometry = 'stack'): CompiledTarget[] {
  return (raw ?? []).map((entry, i) => {
    const field = `targets[${i}]`;
    const hit = OBJECTIVES.find((o) => o.key in entry);
    if (!hit) throw new InputError('schema', `${field}: unknown target kind with keys ${Object.keys(entry).join(', ') || '(none)'}; use one of ${OBJECTIVES.map((o) => o.key).join(', ')}`, field);
    const objective = hit.objective;
    const parsed = objective.schema.safeParse(entry, { reportInput: true });
    if (!parsed.success) {
      const issue = parsed.error.issues[0]!;
      const key = issue.code === 'unrecognized_keys' ? issue.keys[0] : issue.path.join('.');
      const f = key ? `${field}.${key}` : field;
      const what = issue.code === 'unrecognized_keys' ? `unknown key for a ${objective.kind} target; allowed keys are in schema/spec.schema.json and "wellsmith design --help"` : issue.message;
      throw new InputError('schema', `${f}: ${what}`, f);
    }
    try {
      objective.check(parsed.data, field, geometry);
    } catch (e) {
      if (e instanceof InputError && e.field === undefined) throw new InputError(e.code, `${field}: ${e.message}`, field);
      throw e;
    }
    return { objective, target: parsed.data, field };
  });
}

export interface Scored {
  readonly evaluations: readonly Evaluation[];
  /** Σ weight · residual². */
  readonly loss: number;
  /** Every target inside its window and every constraint held. */
  readonly satisfied: boolean;
}

export function scoreTargets(targets: readonly CompiledTarget[], result: TargetSource): Scored {
  const evaluations = targets.map((t) => t.objective.evaluate(t.target, result));
  let loss = 0;
  for (const e of evaluations) loss += e.weight * e.residual * e.residual;
  return { evaluations, loss, satisfied: evaluations.every((e) => e.satisfied) };
}

/**
 * How many states of each band the targets read (a band absent from the map: all of them), so a
 * search solves e1 and hh1 only when that is all an e1-hh1 target needs.
 */
export function statesNeeded(targets: readonly CompiledTarget[]): Partial<Record<BandName, number>> {
  const out: Partial<Record<BandName, number>> = { electron: 0, heavy_hole: 0, light_hole: 0 };
  const all = new Set<string>();
  for (const t of targets) {
    for (const label of t.objective.statesNeeded(t.target)) {
      const b = bandOfLabel(label);
      if (!b) all.add(label);
      else out[b.band] = Math.max(out[b.band]!, b.index);
    }
  }
  for (const band of all) delete out[band as BandName];
  return out;
}

export const needsWavefunctions = (targets: readonly CompiledTarget[]): boolean => targets.some((t) => t.objective.needsWavefunctions(t.target));

/** One line per target kind, for --help and reports. */
export const describeObjectives = (): string => OBJECTIVES.map((o) => `  ${o.key.padEnd(16)} ${o.objective.description}`).join('\n');
