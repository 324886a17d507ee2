/** `wellsmith report INPUT`: a self-contained HTML report, and optionally the growth sheet as CSV. */
import { basename, dirname, extname, join } from 'node:path';
import { bandDiagramSvg, buildReport, growthCsv, isRunStorePath, loadReportInput, toleranceReport, type ReportInput } from '../report/index.js';
import { nominalVariables } from '../structure.js';
import { DEFAULT_TOLERANCE, MAX_SAMPLES } from '../tolerance/analyse.js';
import { WIRE_TOLERANCE_MESSAGE } from '../tolerance/measure.js';
import { loadSpecFile } from '../input/load.js';
import { solve } from '../solve.js';
import { runSolve, type SolveArgs } from './solve.js';
import { InputError } from '../errors.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { checkOutputFile, writeFileAtomic } from './output.js';
import { progressShown } from './progress.js';

export interface ReportArgs {
  readonly input: string;
  readonly out: string | undefined;
  readonly growthSheet: string | undefined;
  /** Add the growth-tolerance section (spec inputs only). */
  readonly tolerance: boolean;
  /** Monte Carlo samples of the tolerance section. */
  readonly samples: number;
  readonly workers: number;
}

/** Exit code of a report: 1 when the physics it reports was not satisfiable. */
function exitOf(input: ReportInput): number {
  switch (input.kind) {
    case 'solve': return input.result.status === 'ok' ? EXIT.ok : EXIT.physics;
    case 'design': return input.status !== 'no-finite-value' ? EXIT.ok : EXIT.physics;
    case 'tolerance': return input.report.result.status === 'ok' ? EXIT.ok : EXIT.physics;
    case 'wire': return input.result.status === 'ok' ? EXIT.ok : EXIT.physics;
    case 'campaign': return input.report.jobs.some((j) => j.state === 'done') ? EXIT.ok : EXIT.physics;
  }
}

/**
 * The input with the tolerance section's analysis added: spec inputs with targets only (only a
 * spec's input is scored; a recorded result has no spec to perturb).
 */
async function withTolerance(input: ReportInput, args: ReportArgs): Promise<ReportInput> {
  if (input.kind === 'wire') throw new InputError('bad-value', `--tolerance: ${WIRE_TOLERANCE_MESSAGE}`, 'tolerance');
  if (input.kind !== 'solve' || input.scored === null) {
    throw new InputError('bad-value', `--tolerance: ${args.input} is not a spec with targets; give such a spec or a design-N.yaml written by "wellsmith design --out" (report "wellsmith tolerance --json" output without --tolerance)`, 'tolerance');
  }
  if (!Number.isInteger(args.samples) || args.samples < 0 || args.samples > MAX_SAMPLES) throw new InputError('bad-value', `--samples: must be a whole number from 0 to ${MAX_SAMPLES}, got ${args.samples}; e.g. --samples 500`);
  if (!Number.isInteger(args.workers) || args.workers < 1) throw new InputError('bad-value', `--workers: must be a whole number ≥ 1, got ${args.workers}`);
  const spec = loadSpecFile(args.input).spec;
  const bar = progressShown('tolerance');
  try {
    const onProgress = (done: number, total: number): void => bar.update(done, total, 'sample batches');
    return { ...input, tolerance: await toleranceReport(spec, nominalVariables(spec), { ...DEFAULT_TOLERANCE, samples: args.samples, workers: args.workers, onProgress }) };
  } finally {
    bar.stop();
  }
}

/**
 * Default output: inside a campaign's run folder, RUN/report.html (beside its campaign.sqlite when
 * that file is given); for a file, INPUT with its extension replaced by .html, beside it.
 */
export function defaultReportPath(input: string): string {
  const trimmed = input.replace(/[\\/]+$/, '');
  if (isRunStorePath(trimmed)) return trimmed.toLowerCase().endsWith('.sqlite') ? join(dirname(trimmed), 'report.html') : join(trimmed, 'report.html');
  return join(dirname(trimmed), `${basename(trimmed, extname(trimmed))}.html`);
}

export async function runReport(args: ReportArgs): Promise<Outcome> {
  try {
    const out = args.out ?? defaultReportPath(args.input);
    checkOutputFile(out, '--out');
    if (args.growthSheet !== undefined) checkOutputFile(args.growthSheet, '--growth-sheet');
    const loaded = loadReportInput(args.input);
    const input = args.tolerance ? await withTolerance(loaded, args) : loaded;
    if (args.growthSheet !== undefined) {
      if (input.kind !== 'solve' || input.growth === null) {
        throw new InputError('schema', `--growth-sheet: ${args.input} has no "growth: { rates: … }" section; add the cells' rates to the spec (e.g. GaAs: 1.0 µm/h)`, 'growth');
      }
      writeFileAtomic(args.growthSheet, growthCsv(input.growth));
    }
    writeFileAtomic(out, await buildReport(input));
    const warnings = input.kind === 'solve' || input.kind === 'wire' ? input.warnings ?? [] : [];
    return success(`report written to ${out}${args.growthSheet ? `; growth sheet to ${args.growthSheet}` : ''}\n`, exitOf(input), warnings);
  } catch (e) {
    return failure(e);
  }
}

/**
 * `wellsmith solve SPEC --plot FILE.svg`: the solve command's output, plus the band diagram with
 * states written atomically to FILE.svg (not for wire specs, whose cross-section this plot cannot show).
 */
export async function runSolvePlot(args: SolveArgs, plot: string): Promise<Outcome> {
  const outcome = runSolve(args);
  if (outcome.code === EXIT.input || outcome.code === EXIT.bug) return outcome;
  let locate: ((f: string) => number | undefined) | undefined;
  try {
    if (extname(plot).toLowerCase() !== '.svg') throw new InputError('bad-value', `--plot: the band diagram is written as SVG, got "${plot}"; give a file name ending in .svg`);
    const loaded = loadSpecFile(args.spec);
    locate = loaded.locate;
    if (loaded.spec.wire !== undefined) throw new InputError('schema', `--plot: ${args.spec} describes a wire; the band diagram is drawn for layer stacks only (report draws the wire's maps)`, 'wire');
    checkOutputFile(plot, '--plot');
    const result = solve(loaded.spec);
    writeFileAtomic(plot, await bandDiagramSvg(result));
    return { ...outcome, stderr: `${outcome.stderr}band diagram written to ${plot}\n` };
  } catch (e) {
    return failure(e, locate);
  }
}
