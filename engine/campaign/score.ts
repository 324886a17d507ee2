/**
 * A stored design scored again against its job's own targets. The store keeps each design's solve
 * result without wavefunctions (store formats 2 and 3), so when a target reads them (overlaps, oscillator
 * strengths) the design is solved again from the job's spec and the design's values: the same
 * deterministic full solve the ranking made, so the evaluations equal those the search reported.
 */
import { InputError } from '../errors.js';
import { fullSolve, prepareDesign, type DesignProblem } from '../design/problem.js';
import type { Spec } from '../input/schema.js';
import type { SolveResult } from '../solve.js';
import { storedResult, type DesignRecord, type JobRecord } from '../store/store.js';
import { compileTargets, needsWavefunctions, scoreTargets, type CompiledTarget, type Scored } from '../../objectives/index.js';

export interface StoredScores {
  /** The job's targets in spec order. */
  readonly targets: readonly CompiledTarget[];
  /** One per design, in the order given. */
  readonly scored: readonly Scored[];
}

/** Scores `designs` of one job against that job's targets; a record that cannot be read is an InputError naming the job. */
export function scoreStoredDesigns(job: Pick<JobRecord, 'name' | 'spec_json'>, designs: readonly Pick<DesignRecord, 'values_json' | 'result_json'>[]): StoredScores {
  try {
    const spec = JSON.parse(job.spec_json) as Spec;
    const targets = compileTargets(spec.targets, spec.wire !== undefined ? 'wire' : 'stack');
    const again = needsWavefunctions(targets);
    let problem: DesignProblem | undefined;
    const scored = designs.map((d) => {
      const stored = storedResult(d) as unknown as SolveResult;
      const result = again && stored.wavefunctions === undefined ? fullSolve(problem ??= prepareDesign(spec), JSON.parse(d.values_json) as Record<string, number>) : stored;
      return scoreTargets(targets, result);
    });
    return { targets, scored };
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError('schema', `run store job "${job.name}": its stored spec or designs are not readable (${e instanceof Error ? e.message : String(e)}); the store is damaged — rerun that job into a fresh folder`);
  }
}
