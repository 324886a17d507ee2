/**
 * The benchmark harness: time a function by repetition, report the median, and compare with a
 * reference measured in the same run. Wall times from `performance.now()`; the median is robust to
 * the odd slow run caused by garbage collection or other processes on the machine.
 */
import { spawnSync } from 'node:child_process';
import { fixed, table } from '../../engine/text.js';

/** How often a benchmark runs: `warmup` untimed calls, then timed calls until both minimums are met or `maxRuns` is reached. */
export interface RepeatPolicy {
  readonly warmup: number;
  readonly minRuns: number;
  readonly maxRuns: number;
  readonly minTime_ms: number;
}

export const DEFAULT_POLICY: RepeatPolicy = { warmup: 5, minRuns: 10, maxRuns: 10_000, minTime_ms: 1000 };
/** For workloads of a second or more: one warm-up, three timed runs. */
export const HEAVY_POLICY: RepeatPolicy = { warmup: 1, minRuns: 3, maxRuns: 3, minTime_ms: 0 };

/** A timed workload; it returns the numbers it computed so that a NaN can fail the run. */
export type Workload = () => readonly number[] | Promise<readonly number[]>;

export interface Measurement {
  readonly median_ms: number;
  readonly runs: number;
  /** Output of the last run. */
  readonly values: readonly number[];
}

/** A reference measured in the same run, named for the report. */
export interface Reference {
  readonly name: string;
  readonly median_ms: number;
  /** Something to say about it on stderr (grid used, agreement reached). */
  readonly note?: string;
  /**
   * Ours / reference measured by the entry itself in interleaved pairs (the median of the pairs'
   * ratios), when it measures so: pairs share the machine's state, which a shared VM's slow drifts
   * change between two separate series. Otherwise the ratio is the two medians'.
   */
  readonly ratio?: number;
}

export interface Prepared {
  readonly run: Workload;
  readonly policy?: RepeatPolicy;
  /** The reference, or a reason it cannot be measured here (e.g. no python3/scipy): the entry then runs without a ratio. */
  readonly reference?: (ours: Measurement) => Promise<Reference | { readonly skipped: string }>;
}

export interface BenchEntry {
  readonly name: string;
  /** The goal, for the human table: its text and whether a row meets it. */
  readonly target?: { readonly text: string; readonly met: (row: BenchRow) => boolean };
  /** Builds the inputs once (not timed). */
  readonly prepare: () => Prepared | Promise<Prepared>;
}

/** One line of `--json` output. `ratio` = ours / reference. */
export interface BenchRow {
  readonly name: string;
  readonly median_ms: number;
  readonly runs: number;
  readonly ratio?: number;
  readonly reference?: string;
}

export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const k = s.length >> 1;
  return s.length === 0 ? NaN : s.length % 2 === 1 ? s[k]! : 0.5 * (s[k - 1]! + s[k]!);
}

/** Times a workload under a repeat policy. */
export async function measure(run: Workload, policy: RepeatPolicy = DEFAULT_POLICY): Promise<Measurement> {
  // Synchronous workloads are not awaited, so no microtask lands inside their timing.
  const call = async (): Promise<readonly number[]> => {
    const out = run();
    return out instanceof Promise ? await out : out;
  };
  for (let i = 0; i < policy.warmup; i++) await call();
  const times: number[] = [];
  let values: readonly number[] = [];
  const start = performance.now();
  while (times.length < policy.maxRuns && (times.length < policy.minRuns || performance.now() - start < policy.minTime_ms)) {
    const t0 = performance.now();
    const out = run();
    values = out instanceof Promise ? await out : out;
    times.push(performance.now() - t0);
  }
  return { median_ms: median(times), runs: times.length, values };
}

/** A benchmark that produced NaN; the run exits 1. */
export class BenchNaNError extends Error {
  override readonly name = 'BenchNaNError';
}

/** Runs one entry: prepare, time, reference; NaN in the output or the timings throws {@link BenchNaNError}. */
export async function runEntry(entry: BenchEntry, note: (line: string) => void): Promise<BenchRow> {
  const prepared = await entry.prepare();
  const ours = await measure(prepared.run, prepared.policy);
  const bad = ours.values.findIndex((v) => Number.isNaN(v));
  if (bad >= 0 || Number.isNaN(ours.median_ms)) {
    throw new BenchNaNError(`benchmark "${entry.name}": output ${bad >= 0 ? `value ${bad}` : 'median'} is NaN (values ${JSON.stringify(ours.values.slice(0, 8))}); fix the workload before timing it`);
  }
  const row: BenchRow = { name: entry.name, median_ms: ours.median_ms, runs: ours.runs };
  if (!prepared.reference) return row;
  const ref = await prepared.reference(ours);
  if ('skipped' in ref) {
    note(`${entry.name}: reference skipped (${ref.skipped})`);
    return row;
  }
  if (!(ref.median_ms > 0)) {
    throw new BenchNaNError(`benchmark "${entry.name}": reference "${ref.name}" median is ${ref.median_ms} ms; expected a positive time`);
  }
  if (ref.note) note(`${entry.name}: ${ref.note}`);
  return { ...row, ratio: ref.ratio ?? ours.median_ms / ref.median_ms, reference: ref.name };
}

let pythonChecked: string | null | undefined;

/** Why python3 with numpy and scipy cannot run here, or null when it can (checked once). */
export function pythonUnavailable(): string | null {
  if (pythonChecked === undefined) {
    const r = spawnSync('python3', ['-c', 'import numpy, scipy'], { encoding: 'utf8' });
    pythonChecked = r.error ? `python3 not found (${r.error.message})` : r.status !== 0 ? `python3 lacks numpy/scipy: ${r.stderr.trim().split('\n').pop()}` : null;
  }
  return pythonChecked;
}

/** Runs a python script and parses the JSON it prints; throws with its stderr if it fails. */
export function runPythonJson(script: string, args: readonly string[], input?: string): unknown {
  const r = spawnSync('python3', [script, ...args], { encoding: 'utf8', input, maxBuffer: 64 << 20 });
  if (r.error || r.status !== 0) {
    throw new Error(`python3 ${script} ${args.join(' ')} failed (${r.error?.message ?? `exit ${r.status}`}): ${r.stderr.trim()}`);
  }
  return JSON.parse(r.stdout) as unknown;
}

/** The human table: name, median, runs, ratio and reference, target and whether it is met. */
export function formatTable(rows: readonly BenchRow[], entries: readonly BenchEntry[]): string {
  const lines = rows.map((r) => {
    const target = entries.find((e) => e.name === r.name)?.target;
    return [
      r.name,
      fixed(r.median_ms, r.median_ms < 10 ? 4 : 1),
      String(r.runs),
      r.ratio === undefined ? '–' : fixed(r.ratio, 3),
      r.reference ?? '',
      target ? `${target.text}: ${target.met(r) ? 'met' : 'MISSED'}` : '',
    ];
  });
  return table(['benchmark', 'median ms', 'runs', 'ratio', 'reference (ratio = ours / reference)', 'target'], lines);
}
