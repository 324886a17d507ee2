/**
 * What a report is made from, detected from the file: a spec (YAML or JSON; solved at its nominal
 * values, targets scored, growth sheet from its `growth` section), or the JSON written by
 * `wellsmith solve --json` or `wellsmith design --json` (re-solved from the recorded structure and
 * solver settings, which reproduces the recorded energies exactly and restores the wavefunctions
 * that --json leaves out), or the JSON of `wellsmith tolerance --json` (its summary only), or a
 * campaign's run store (engine/report/campaign.ts).
 */
import { hasDoping } from '../poisson/doping.js';
import { solveDoped } from '../poisson/doped.js';
import { InputError } from '../errors.js';
import { parseSpecText, readInputText, type LoadedSpec } from '../input/load.js';
import { solve, type SolveResult } from '../solve.js';
import { specFromRecorded } from './recorded.js';
import { compileTargets, scoreTargets, type Scored } from '../../objectives/index.js';
import type { Evaluation } from '../../objectives/types.js';
import type { DesignVariable } from '../design/search.js';
import { growthSheet, type GrowthSheet } from './growth.js';
import { isWireJson, wireFromJson } from './wire.js';
import { solveWire, type WireSolveResult } from '../wire/solve.js';
import { isToleranceJson, toleranceFromJson, type ToleranceReport } from './tolerance.js';
import { isRunStorePath, readCampaign, type CampaignReport } from './campaign-read.js';
import { reviveNumbers } from '../text.js';

/** One ranked design as `design --json` records it. */
export interface RankedDesign {
  readonly rank: number;
  readonly loss: number;
  readonly satisfied: boolean;
  readonly variables: readonly DesignVariable[];
  readonly targets: readonly Evaluation[];
  readonly critical_thickness_margin: number;
}

export type ReportInput =
  | { readonly kind: 'solve'; readonly origin: string; readonly result: SolveResult; readonly scored: Scored | null; readonly growth: GrowthSheet | null; readonly tolerance?: ToleranceReport; readonly warnings?: readonly string[] }
  | { readonly kind: 'tolerance'; readonly origin: string; readonly report: ToleranceReport }
  | { readonly kind: 'wire'; readonly origin: string; readonly result: WireSolveResult; readonly warnings?: readonly string[] }
  | { readonly kind: 'campaign'; readonly origin: string; readonly report: CampaignReport }
  | { readonly kind: 'design'; readonly origin: string; readonly status: string; readonly message: string; readonly seed: number; readonly starts: number; readonly designs: readonly RankedDesign[]; readonly best: SolveResult };


const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Re-solves a recorded result through the spec it records (engine/report/recorded.ts). */
function resolveRecorded(v: Record<string, unknown>, where: string): SolveResult {
  if (!isRecord(v.structure) || !isRecord(v.settings)) {
    throw new InputError('schema', `${where}: a recorded result needs "structure" and "settings", as "wellsmith solve --json" writes them; regenerate the file`);
  }
  const spec = specFromRecorded(v.structure, v.settings, where);
  try {
    return solve(spec, {});
  } catch (e) {
    if (e instanceof InputError) throw new InputError(e.code, `${where}: the recorded structure is not a valid stack: ${e.message}; regenerate the file`, e.field);
    throw e;
  }
}

/** A report input from a spec already loaded. */
export function inputFromSpec(loaded: LoadedSpec): ReportInput {
  if (loaded.spec.wire !== undefined) return { kind: 'wire', origin: loaded.origin, result: solveWire(loaded.spec), warnings: loaded.warnings };
  const result = hasDoping(loaded.spec) ? solveDoped(loaded.spec) : solve(loaded.spec);
  const targets = compileTargets(loaded.spec.targets);
  return {
    kind: 'solve',
    origin: loaded.origin,
    result,
    scored: targets.length > 0 ? scoreTargets(targets, result) : null,
    growth: loaded.spec.growth ? growthSheet(result.structure, loaded.spec.growth.rates) : null,
    warnings: loaded.warnings,
  };
}

/** A report input from file text; `origin` names the file in messages. */
export function inputFromText(text: string, origin: string): ReportInput {
  const trimmed = text.trimStart();
  if (trimmed.startsWith('{')) {
    let value: unknown;
    try {
      // Non-finite numbers are revived only in the tolerance and wire paths, which read them as numbers;
      // a recorded solve is rebuilt from its plain values (text that reads "NaN" stays text).
      value = JSON.parse(text);
      const recordedSolve = isRecord(value) && (Array.isArray(value.designs) || ('structure' in value && 'bands' in value && !('maps' in value)));
      if (!recordedSolve) value = JSON.parse(text, reviveNumbers);
    } catch (e) {
      throw new InputError('schema', `${origin}: not valid JSON (${(e as Error).message}); give a spec, or the output of "wellsmith solve --json", "design --json" or "tolerance --json"`);
    }
    if (isRecord(value) && Array.isArray(value.designs)) {
      const designs = value.designs.filter(isRecord);
      const first = designs[0];
      if (!first) throw new InputError('schema', `${origin}: the design output holds no design (status ${String(value.status)}); nothing to report`);
      return {
        kind: 'design', origin, status: String(value.status), message: String(value.message ?? ''),
        seed: Number(value.seed), starts: Number(value.starts),
        designs: designs as unknown as RankedDesign[],
        best: resolveRecorded(first, `${origin}: designs[0]`),
      };
    }
    if (isWireJson(value)) return { kind: 'wire', origin, result: wireFromJson(value, origin) };
    if (isToleranceJson(value)) return { kind: 'tolerance', origin, report: toleranceFromJson(value, origin) };
    if (isRecord(value) && 'structure' in value && 'bands' in value) {
      return { kind: 'solve', origin, result: resolveRecorded(value, origin), scored: null, growth: null };
    }
  }
  return inputFromSpec(parseSpecText(text, origin));
}

/** Largest report input file (bytes). */
const MAX_REPORT_INPUT_BYTES = 256 * 1048576;

/** Reads a report input: a run folder or its campaign.sqlite (read only), or a file (spec, solve/design/tolerance --json). */
export function loadReportInput(path: string): ReportInput {
  if (isRunStorePath(path)) return { kind: 'campaign', origin: path, report: readCampaign(path) };
  // Recorded outputs with wavefunctions or |ψ|² maps run to tens of MiB.
  return inputFromText(readInputText(path, 'report input (a spec, a --json output, or a campaign run folder)', MAX_REPORT_INPUT_BYTES), path);
}
