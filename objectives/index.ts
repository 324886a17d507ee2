/**
 * The registry of target kinds. A spec's `targets:` entries are dispatched by their key
 * (transition, subband_edge, spacing, bound_states, at_barrier_edge, splitting, ensemble, strain,
 * transparency, maximize, constraint),
 * validated by that kind's schema, and combined by weights into one loss Σ w·r².
 */
import { InputError } from '../engine/errors.js';
import { bandOfLabel } from '../engine/solve.js';
import type { BandName } from '../engine/profile.js';
import type { Evaluation, Geometry, Objective, TargetContext, TargetSource } from './types.js';
import { describeIssue, fieldName, fieldPath, objectKeys, quote } from '../engine/input/issues.js';
import { didYouMean } from '../engine/input/suggest.js';
import { transitionObjective } from './transition.js';
import { absorptionPeakObjective } from './absorption-peak.js';
import { gainPeakObjective } from './gain-peak.js';
import { peakGainObjective } from './peak-gain.js';
import { gainTransparencyObjective } from './gain-transparency.js';
import { polarisationRatioObjective } from './polarisation-ratio.js';
import { absorptionEdgeObjective } from './absorption-edge.js';
import { absorptionWidthObjective } from './absorption-width.js';
import { absorptionStrengthObjective } from './absorption-strength.js';
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
  entry('absorption_peak', absorptionPeakObjective),
  entry('absorption_width', absorptionWidthObjective),
  entry('absorption_strength', absorptionStrengthObjective),
  entry('gain_peak', gainPeakObjective),
  entry('peak_gain', peakGainObjective),
  entry('gain_transparency', gainTransparencyObjective),
  entry('polarisation_ratio', polarisationRatioObjective),
  entry('absorption_edge', absorptionEdgeObjective),
  entry('transition', transitionObjective),
];

export interface CompiledTarget {
  readonly objective: Objective<unknown>;
  readonly target: unknown;
  /** "targets[2]" */
  readonly field: string;
}

/** The keys a target kind takes, in its schema's order. */
export const targetKeys = (objective: Objective<unknown>): string[] => objectKeys(objective.schema);

/** " (did you mean …?)" for the first key of an entry close to a kind's key (transiton → transition), or ''. */
function kindHint(entry: Readonly<Record<string, unknown>>): string {
  const keys = Object.keys(entry);
  const hint = keys.map((k) => didYouMean(k, OBJECTIVES.map((o) => o.key))).find((h) => h !== '');
  return hint ?? '';
}

/**
 * Validates a spec's targets for a layer stack or a wire (default: stack); every error names the
 * target's field. With a context (engine/input/check.ts) it also refuses targets that read a state
 * beyond the solver's state limit or a layer label no layer has.
 */
export function compileTargets(raw: readonly Record<string, unknown>[] | undefined, geometry: Geometry = 'stack', context?: TargetContext): CompiledTarget[] {
  return (raw ?? []).map((entry, i) => {
    const field = `targets[${i}]`;
    if (entry === null || typeof entry !== 'object' || Array.isArray(entry)) {
      throw new InputError('schema', `${field}: a target is a mapping such as { transition: e1-hh1, wavelength: 976 nm, within: 2 nm }, got ${quote(entry)}; "wellsmith targets" lists every kind`, field);
    }
    const hit = OBJECTIVES.find((o) => o.key in entry);
    if (!hit) {
      throw new InputError('schema', `${field}: no target kind among its keys (${Object.keys(entry).join(', ') || 'none'})${kindHint(entry)}; a target has one of the keys ${OBJECTIVES.map((o) => o.key).join(', ')} ("wellsmith targets" shows each with an example)`, field);
    }
    const objective = hit.objective;
    const parsed = objective.schema.safeParse(entry, { reportInput: true });
    if (!parsed.success) {
      const issue = parsed.error.issues[0]!;
      const keys = targetKeys(objective);
      if (issue.code === 'unrecognized_keys') {
        const key = issue.keys[0] as string;
        const f = `${field}.${key}`;
        throw new InputError('schema', `${f}: unknown key "${key}" for a ${objective.kind} target${didYouMean(key, keys)}; a ${objective.kind} target takes ${keys.join(', ')} ("wellsmith targets ${objective.kind}" shows an example)`, f);
      }
      const described = describeIssue({ ...issue, path: [...fieldPath(field), ...issue.path] } as typeof issue);
      throw new InputError('schema', `${described}; "wellsmith targets ${objective.kind}" shows an example`, fieldName([...fieldPath(field), ...issue.path]));
    }
    try {
      objective.check(parsed.data, field, geometry, context);
    } catch (e) {
      if (e instanceof InputError && e.field === undefined) throw new InputError(e.code, `${field}: ${e.message}`, field);
      throw e;
    }
    if (context?.maxStates !== undefined && Number.isFinite(context.maxStates)) {
      for (const label of objective.statesNeeded(parsed.data)) {
        const b = bandOfLabel(label);
        if (b && b.index > context.maxStates) {
          const limit = geometry === 'wire' ? 'wire.states' : 'solver.max_states';
          throw new InputError('bad-value', `${field}: reads ${label}, but ${limit} is ${context.maxStates}, so it is never solved; raise ${limit} to at least ${b.index} or target a lower state`, field);
        }
      }
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
