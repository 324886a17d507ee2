/** `wellsmith report INPUT`: a self-contained HTML report, and optionally the growth sheet as CSV. */
import { basename, dirname, extname, join } from 'node:path';
import { bandDiagramSvg, buildReport, growthCsv, loadReportInput } from '../report/index.js';
import { loadSpecFile } from '../spec/load.js';
import { solve } from '../solve.js';
import { runSolve, type SolveArgs } from './solve.js';
import { InputError } from '../errors.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { writeFileAtomic } from './output.js';

export interface ReportArgs {
  readonly input: string;
  readonly out: string | undefined;
  readonly growthSheet: string | undefined;
}

/** Default output: INPUT with its extension replaced by .html, beside it. */
export const defaultReportPath = (input: string): string => join(dirname(input), `${basename(input, extname(input))}.html`);

export async function runReport(args: ReportArgs): Promise<Outcome> {
  try {
    const input = loadReportInput(args.input);
    const out = args.out ?? defaultReportPath(args.input);
    if (args.growthSheet !== undefined) {
      if (input.kind !== 'solve' || input.growth === null) {
        throw new InputError('schema', `--growth-sheet: ${args.input} has no "growth: { rates: … }" section; add the cells' rates to the spec (e.g. GaAs: 1.0 µm/h)`, 'growth');
      }
      writeFileAtomic(args.growthSheet, growthCsv(input.growth));
    }
    writeFileAtomic(out, await buildReport(input));
    const ok = input.kind === 'solve' ? input.result.status === 'ok' : input.status !== 'no-finite-value';
    return success(`report written to ${out}${args.growthSheet ? `; growth sheet to ${args.growthSheet}` : ''}\n`, ok ? EXIT.ok : EXIT.physics);
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
    const result = solve(loaded.spec);
    if ('maps' in result) throw new InputError('schema', `--plot: ${args.spec} describes a wire; the band diagram is drawn for layer stacks only`, 'wire');
    writeFileAtomic(plot, await bandDiagramSvg(result));
    return { ...outcome, stderr: `${outcome.stderr}band diagram written to ${plot}\n` };
  } catch (e) {
    return failure(e, locate);
  }
}
