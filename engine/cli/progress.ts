/**
 * What a long command shows while it works, on stderr only (stdout stays for results): a progress
 * bar when stderr is a terminal, drawn once the work has taken PROGRESS_DELAY_MS (a quick command
 * never flashes one); when stderr is not a terminal (a log file, a batch system), one timestamped
 * line per finished unit of work, so the log tells where an overnight run is; and an up-front note,
 * on any stderr, when the predicted work takes minutes.
 */
import { createRequire } from 'node:module';
import type cliProgressModule from 'cli-progress';

// Loaded only for a terminal: piped and CI runs never pay its start-up time.
const load = (): typeof cliProgressModule => createRequire(import.meta.url)('cli-progress') as typeof cliProgressModule;

/** Work shorter than this (ms) draws no bar. */
export const PROGRESS_DELAY_MS = 2000;

export interface Progress {
  readonly update: (done: number, total: number, note: string) => void;
  readonly stop: () => void;
}

export function progressBar(label: string, delayMs = PROGRESS_DELAY_MS): Progress {
  if (!process.stderr.isTTY) return { update: () => undefined, stop: () => undefined };
  const created = Date.now();
  let bar: cliProgressModule.SingleBar | undefined;
  let last: { done: number; total: number; note: string } | undefined;
  // A timer draws the bar once the delay has passed even when no update comes (the pool's first
  // tasks can run for a while); updates keep it current after that.
  const start = (): void => {
    if (bar || !last) return;
    const cliProgress = load();
    // Time counts from the start of the work, not from the bar's first drawing 2 s later, and the
    // remaining time is only estimated once something is done (cli-progress prints "INF" before).
    const time = (t: number, options: cliProgressModule.Options): string => cliProgress.Format.TimeFormat(Math.round(t), options, 1);
    bar = new cliProgress.SingleBar({
      stream: process.stderr,
      format: (options, params, payload: { note?: string }) => {
        const elapsed = (Date.now() - created) / 1000;
        const eta = params.value > 0 ? time((elapsed * (params.total - params.value)) / params.value, options) : '–';
        return `${label} [${cliProgress.Format.BarFormat(params.progress, options)}] ${params.value}/${params.total} · ${time(elapsed, options)} · eta ${eta} · ${payload.note ?? ''}`;
      },
      hideCursor: true,
      clearOnComplete: true,
    }, cliProgress.Presets.shades_classic);
    bar.start(last.total, last.done, { note: last.note });
  };
  const timer = setTimeout(start, delayMs);
  timer.unref();
  return {
    update: (done, total, note) => {
      last = { done, total, note };
      if (!bar && Date.now() - created >= delayMs) start();
      if (bar) {
        bar.setTotal(total);
        bar.update(done, { note });
      }
    },
    stop: () => {
      clearTimeout(timer);
      bar?.stop();
    },
  };
}

/** Least time (ms) between two log lines of a command that finishes many small units (design starts). */
export const LOG_INTERVAL_MS = 10_000;

export interface ProgressLog {
  /** Unit `done` of `total` has finished; `text` says which and how it went. */
  readonly finished: (done: number, total: number, text: string) => void;
}

/** An ISO 8601 UTC time to the second, "2026-12-03T13:40:12Z". */
export const isoSecond = (t: Date): string => t.toISOString().replace(/\.\d{3}Z$/, 'Z');

/**
 * When stderr is not a terminal, writes "TIME LABEL: TEXT" (TIME ISO 8601 UTC) for finished units
 * of work: none before the work has run `delayMs`, then at most one per `intervalMs`, and always
 * the last unit once any line was due. On a terminal it writes nothing (the bar shows progress).
 */
export function progressLog(label: string, { delayMs = 0, intervalMs = 0 }: { readonly delayMs?: number; readonly intervalMs?: number } = {}): ProgressLog {
  if (process.stderr.isTTY) return { finished: () => undefined };
  const created = Date.now();
  let last = -Infinity;
  return {
    finished: (done, total, text) => {
      const now = Date.now();
      if (now - created < delayMs || (now - last < intervalMs && done < total)) return;
      last = now;
      process.stderr.write(`${isoSecond(new Date(now))} ${label}: ${text}\n`);
    },
  };
}

/**
 * Progress of a command with one counter (solve, tolerance): the bar on a terminal; otherwise, once
 * the work has run past PROGRESS_DELAY_MS, a time-stamped line at most every LOG_INTERVAL_MS and
 * the last, so a log file of a long run tells where it is.
 */
export function progressShown(label: string): Progress {
  const bar = progressBar(label);
  const log = progressLog(label, { delayMs: PROGRESS_DELAY_MS, intervalMs: LOG_INTERVAL_MS });
  return {
    update: (done, total, note) => { bar.update(done, total, note); log.finished(done, total, `${done}/${total} ${note}`); },
    stop: bar.stop,
  };
}

/** Predicted work longer than this (s) gets a note before it starts. */
export const LONG_WORK_S = 60;

/** "about 3 min" / "about 1.5 h" for a duration in seconds. */
export const durationText = (s: number): string => (s < 90 ? `about ${Math.round(s)} s` : s < 5400 ? `about ${Math.round(s / 60)} min` : `about ${(s / 3600).toFixed(1)} h`);

/**
 * Writes "wellsmith: note: …" to stderr at once when `seconds` exceeds LONG_WORK_S, before the work
 * it predicts; `how` says what the prediction rests on and how to shorten it.
 */
export function noteLongWork(what: string, seconds: number, how: string): void {
  if (seconds > LONG_WORK_S) process.stderr.write(`wellsmith: note: ${what} is predicted to take ${durationText(seconds)} (${how})\n`);
}
