/** `wellsmith design SPEC`: ranked, growable designs for the spec's targets. */
import { readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { stateRegions, stateWells } from '../../objectives/wells.js';
import { defaultDesignOptions, design, type Design, type DesignResult } from '../design/search.js';
import { evaluateDesign, isWireSolve, prepareDesign, valuesOf } from '../design/problem.js';
import { wireJson } from '../wire/describe.js';
import { designSpecText } from '../design/write.js';
import { loadSpecFile } from '../input/load.js';
import type { Spec } from '../input/schema.js';
import { InputError } from '../errors.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { csvLine, fixed, sig, table, toJson, withUnit } from '../text.js';
import { ensureFolder, writeFileAtomic } from './output.js';
import { LOG_INTERVAL_MS, noteLongWork, PROGRESS_DELAY_MS, progressBar, progressLog } from './progress.js';
import { targetsSummary } from './targets.js';
import { solveJson } from './solve.js';
import { describeRobust, robustJson } from './tolerance.js';
import { robustRank } from '../tolerance/robust.js';
import { DEFAULT_TOLERANCE } from '../tolerance/analyse.js';

export interface DesignArgs {
  readonly spec: string;
  /** Starts and evaluations per start; when absent, the defaults for the spec's geometry (defaultDesignOptions). */
  readonly starts?: number | undefined;
  readonly seed: number;
  readonly top: number;
  readonly workers: number;
  readonly step: number;
  readonly evaluations?: number | undefined;
  readonly out: string | undefined;
  readonly json: boolean;
  /** Re-rank the top designs by Monte Carlo growth yield (ROBUST_SAMPLES samples each). */
  readonly robust?: boolean;
}

/** Least time (ms) between two bar updates from a start's evaluations. */
const STEP_REDRAW_MS = 100;

/** Monte Carlo samples per design for --robust: yield to about ±3 % (binomial σ at 50 %). */
export const ROBUST_SAMPLES = 200;

/** The close of `design --help`: every target kind with its keys and an example. */
export const targetHelp = (): string => `Target kinds (under "targets:" in the spec; "wellsmith targets KIND" shows every key of one):\n${targetsSummary()}`;

const variableCell = (v: Design['variables'][number]): string =>
  v.kind === 'fraction' ? v.value.toFixed(3) : v.kind === 'strain' ? `${v.value.toFixed(2)} %` : `${fixed(v.nm, 3)} nm / ${fixed(v.ml, 1)} ML`;

const achievedCell = (e: Design['evaluations'][number]): string => (e.achieved === null ? 'missing' : withUnit(e.achieved, e.unit));

/** A target's cell: achieved value and residual; a figure's value; a constraint's verdict. */
function evaluationCell(e: Design['evaluations'][number]): string {
  if (e.role === 'figure') return achievedCell(e);
  if (e.role === 'constraint') return e.satisfied ? 'holds' : `violated (${achievedCell(e)})`;
  return `${achievedCell(e)} (${e.residual >= 0 ? '+' : ''}${e.residual.toFixed(2)})${e.satisfied ? '' : ' ✗'}`;
}

/** Design JSON: the spec's variables, the resolved stack (or wire) and the same transitions[] shape as solve. */
export function designJson(r: DesignResult): unknown {
  return {
    status: r.status,
    message: r.message,
    seed: r.seed,
    starts: r.starts,
    evaluations: r.evaluations,
    failures: r.failures,
    designs: r.designs.map((d) => ({
      rank: d.rank,
      loss: d.loss,
      satisfied: d.satisfied,
      variables: d.variables,
      targets: d.evaluations,
      critical_thickness_margin: d.criticalMargin,
      preferences: d.preferences,
      start: d.start,
      ...((isWireSolve(d.result) ? wireJson(d.result, false) : solveJson(d.result, false)) as object),
      // States of a multi-well stack by the well they live in, and every state's region (objectives/wells.ts).
      ...(isWireSolve(d.result) ? {} : { state_wells: stateWells(d.result), state_regions: stateRegions(d.result) }),
    })),
  };
}

export function describeDesign(r: DesignResult, spec: Spec): string {
  const first = r.designs[0];
  if (!first) return `status: ${r.status}: ${r.message}`;
  // A wire's strain is not modelled, so it has no critical-thickness margin to show.
  const margin = !isWireSolve(first.result);
  const header = ['rank', ...first.variables.map((v) => (v.kind === 'length' ? `${v.name} (nm / ML)` : v.name)),
    ...first.evaluations.map((e) => e.label), 'loss', ...(margin ? ['h_c margin'] : []), ...first.preferences.map((p) => `${p.label}${p.unit ? ` (${p.unit})` : ''}`)];
  const rows = r.designs.map((d) => [String(d.rank), ...d.variables.map((v) => `${variableCell(v)}${v.atBound ? ` (${v.atBound} bound)` : ''}`),
    ...d.evaluations.map(evaluationCell),
    sig(d.loss, 3), ...(margin ? [`${fixed(d.criticalMargin * 100, 0)} %`] : []), ...d.preferences.map((p) => sig(p.value, 4))]);
  const order = first.preferences.length ? `; designs meeting every target ranked by ${first.preferences.map((p) => p.label).join(', then ')} (lexicographic, within each one's tie), then loss` : '';
  const lines = [spec.title ? `${spec.title}\n` : '', `Designs (${r.starts} starts, seed ${r.seed}, ${r.evaluations} solves${r.failures ? `, ${r.failures} failed candidates` : ''}); residuals in window half-widths, |r| ≤ 1 meets the target${order}`, table(header, rows)];
  if (r.status !== 'ok') {
    const bound = first.variables.filter((v) => v.atBound).map((v) => `${v.name} at its ${v.atBound} bound`);
    const missed = first.evaluations.filter((e) => !e.satisfied).map((e) => `${e.label}: closest ${achievedCell(e)} (goal ${withUnit(e.goal, e.unit)})`);
    lines.push('', `status: ${r.status}: ${r.message}`, ...missed.map((m) => `  ${m}`), ...(bound.length ? [`  ${bound.join('; ')}: widen that bound or change the materials`] : []));
  }
  return lines.join('\n');
}

function writeOutputs(dir: string, r: DesignResult, spec: Spec, args: DesignArgs): void {
  const rows = [csvLine(['rank', 'loss', 'satisfied', ...(r.designs[0]?.variables.flatMap((v) => (v.kind !== 'length' ? [v.name] : [`${v.name}_nm`, `${v.name}_ML`])) ?? []),
    ...(r.designs[0]?.evaluations.flatMap((e) => [`${e.label} (${e.unit || '-'})`, `${e.label} residual`]) ?? []), 'critical_thickness_margin', 'file'])];
  for (const d of r.designs) {
    const file = `design-${d.rank}.yaml`;
    writeFileAtomic(join(dir, file), designSpecText(spec, d.values, `Design ${d.rank} of "${spec.title ?? args.spec}" by wellsmith design (seed ${r.seed}, ${r.starts} starts)\nloss ${d.loss}; every target ${d.satisfied ? 'met' : 'NOT met'}. Solve it with: wellsmith solve ${file}`));
    rows.push(csvLine([d.rank, d.loss, d.satisfied ? 'yes' : 'no', ...d.variables.flatMap((v) => (v.kind !== 'length' ? [v.value] : [v.nm ?? NaN, v.ml ?? NaN])),
      ...d.evaluations.flatMap((e) => [e.achieved ?? NaN, e.residual]), d.criticalMargin, file]));
  }
  writeFileAtomic(join(dir, 'ranking.csv'), `${rows.join('\n')}\n`);
  // Designs of an earlier, longer ranking in the same folder would read as part of this one.
  for (const name of readdirSync(dir)) {
    const m = /^design-(\d+)\.yaml$/.exec(name);
    if (m && Number(m[1]) > r.designs.length) rmSync(join(dir, name), { force: true });
  }
}

/** Evaluations (at most) and milliseconds (about) spent timing the spec before a design. */
const TIMING_EVALUATIONS = 25;
const TIMING_MS = 200;

/**
 * Seconds one search evaluation of the spec takes here: a candidate at the middle of the bounds,
 * solved up to TIMING_EVALUATIONS times within about TIMING_MS, the fastest taken. The code is
 * still warming up then (a well's second solve took 20× its steady time, which made a note
 * predict 6 min for an 8 s design), so this stays an upper estimate, only a closer one.
 */
function evaluationSeconds(spec: Spec): number {
  const problem = prepareDesign(spec);
  const centre = valuesOf(problem.variables, problem.variables.map((v) => (v.from + v.to) / 2));
  const began = performance.now();
  let fastest = Infinity;
  for (let k = 0; k < TIMING_EVALUATIONS && (k < 2 || performance.now() - began < TIMING_MS); k++) {
    const t0 = performance.now();
    evaluateDesign(problem, centre);
    fastest = Math.min(fastest, performance.now() - t0);
  }
  return fastest / 1000;
}

export async function runDesign(args: DesignArgs): Promise<Outcome> {
  let locate: ((f: string) => number | undefined) | undefined;
  const bar = progressBar('design');
  // A log file gets a line per finished start of a run past the delay, no more than one per interval (a short design adds none).
  const log = progressLog('design', { delayMs: PROGRESS_DELAY_MS, intervalMs: LOG_INTERVAL_MS });
  try {
    for (const [name, v, min, max] of [['--starts', args.starts, 1, 100_000], ['--top', args.top, 1, 10_000], ['--workers', args.workers, 1, 1024], ['--evaluations', args.evaluations, 10, 1_000_000]] as const) {
      if (v !== undefined && (!Number.isInteger(v) || v < min || v > max)) throw new InputError('bad-value', `${name}: must be a whole number from ${min} to ${max}, got ${v}`);
    }
    if (!Number.isSafeInteger(args.seed) || args.seed < 0) throw new InputError('bad-value', `--seed: must be a whole number ≥ 0, got ${args.seed}`);
    if (!(args.step > 0 && args.step <= 0.1)) throw new InputError('bad-value', `--step: the composition step must lie in (0, 0.1], got ${args.step}`);
    const loaded = loadSpecFile(args.spec);
    locate = loaded.locate;
    if (args.robust && loaded.spec.wire !== undefined) throw new InputError('bad-value', '--robust: growth-yield ranking perturbs the layers of a stack and a wire spec has none; drop --robust for this spec');
    if (args.out !== undefined) ensureFolder(args.out, '--out');
    let best = Infinity;
    const defaults = defaultDesignOptions(loaded.spec);
    const starts = args.starts ?? defaults.starts;
    const evaluations = args.evaluations ?? defaults.maxEvaluations;
    const each = evaluationSeconds(loaded.spec);
    noteLongWork('this design', (each * starts * evaluations) / Math.min(args.workers, starts), `${starts} starts × up to ${evaluations} evaluations at ${each.toPrecision(2)} s each on ${Math.min(args.workers, starts)} worker${args.workers > 1 ? 's' : ''}; fewer --starts or --evaluations take less`);
    // While this thread runs a start itself (every start of a one-worker run, the first start of
    // any), timers cannot fire: the bar is kept current from its evaluations instead, at most one
    // redraw per STEP_REDRAW_MS (a well's evaluation takes a fraction of a millisecond).
    let finished = 0;
    let stepping = -1;
    let steps = 0;
    let redrawn = 0;
    const bestText = (): string => (Number.isFinite(best) ? ` · best loss ${sig(best, 3)}` : '');
    const result = await design(loaded.spec, {
      starts, seed: args.seed, top: args.top, workers: args.workers, compositionStep: args.step, maxEvaluations: evaluations,
      onProgress: (done, total, last) => {
        finished = done;
        if (last.type === 'design-start') best = Math.min(best, last.snapped.loss);
        bar.update(done, total, `best loss ${sig(best, 3)}`);
        log.finished(done, total, `start ${done}/${total} done · best loss ${sig(best, 3)} · ${total - done} to go`);
      },
      onStep: (task) => {
        if (task !== stepping) {
          stepping = task;
          steps = 0;
        }
        steps++;
        const now = Date.now();
        if (now - redrawn < STEP_REDRAW_MS) return;
        redrawn = now;
        bar.update(finished, starts, `start ${task + 1}: ${steps} of up to ${evaluations} evaluations${bestText()}`);
      },
      onSolve: (done, total) => bar.update(finished, starts, `ranking: full solve of design ${done + 1} of ${total}${bestText()}`),
    });
    const robust = args.robust ? await robustRank(loaded.spec, result, { ...DEFAULT_TOLERANCE, samples: ROBUST_SAMPLES, seed: args.seed, workers: args.workers, islands: false }) : undefined;
    bar.stop();
    if (args.out !== undefined) writeOutputs(args.out, result, loaded.spec, args);
    const text = robust ? `${describeDesign(result, loaded.spec)}\n\n${describeRobust(robust)}` : describeDesign(result, loaded.spec);
    const json = { ...(designJson(result) as object), ...(robust ? { robust: robustJson(robust) } : {}), warnings: loaded.warnings };
    return success(`${args.json ? toJson(json) : text}\n`, result.status === 'ok' ? EXIT.ok : EXIT.physics, loaded.warnings);
  } catch (e) {
    bar.stop();
    return failure(e, locate);
  }
}
