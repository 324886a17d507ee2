/**
 * Runs that write to a log file tell where they are: with stderr not a terminal, a campaign writes
 * one line per finished job and a long design one line per finished start (at most one per
 * LOG_INTERVAL_MS, always the last), each opening with an ISO 8601 UTC time; stdout keeps only the
 * results. The time format is ISO 8601's extended form "YYYY-MM-DDThh:mm:ssZ" (common practice);
 * each time is checked to lie within the wall-clock span of the run that wrote it.
 */
import { describe, expect, it } from 'vitest';
import { isoSecond, LOG_INTERVAL_MS, progressLog } from '../../engine/cli/progress.js';
import { spawnCli, tempDir, TINY_JOBS, tinyCampaign } from './helpers.js';
import { captureStderr } from '../e2e/terminal.js';

const ISO_UTC = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/;

/** The log lines of a stderr text (time in ms, the text after the label); every other line must be a "wellsmith: note:" of predicted work. */
function logLines(stderr: string, label: string): { t: number; text: string }[] {
  return stderr.split('\n').filter((l) => l !== '' && !l.startsWith('wellsmith: note: ')).map((l) => {
    const m = new RegExp(`^(\\S+) ${label}: (.*)$`).exec(l);
    expect(m, `not a ${label} log line: ${l}`).not.toBeNull();
    expect(m![1]).toMatch(ISO_UTC);
    const t = Date.parse(m![1]!);
    expect(Number.isFinite(t), m![1]).toBe(true);
    return { t, text: m![2]! };
  });
}

/** Runs f with stderr taken for a pipe (or, with tty, a terminal) and its writes captured. */
const onPipe = (f: () => Promise<void> | void, tty = false): Promise<string> => captureStderr(f, tty);

const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

describe('a log line per finished job when stderr is not a terminal', () => {
  it('campaign: one timestamped line per job, in order, inside the run; stdout holds only the JSON results; a rerun that runs nothing logs nothing', async () => {
    const dir = tempDir('log');
    const file = tinyCampaign(dir);
    const out = `${dir}/run`;
    const before = Math.floor(Date.now() / 1000) * 1000;
    const run = await spawnCli(['campaign', file, '--out', out, '--workers', '1', '--json']);
    const after = Date.now();
    expect(run.code, run.stderr).toBe(0);
    const lines = logLines(run.stderr, 'campaign');
    expect(lines).toHaveLength(TINY_JOBS.length);
    lines.forEach((l, k) => {
      expect(l.text).toMatch(new RegExp(`^job ${k + 1}/3 done \\(${TINY_JOBS[k]}\\) in [\\d.]+ s · ok · best loss \\S+ · ${2 - k} to go$`));
      expect(l.t).toBeGreaterThanOrEqual(before);
      expect(l.t).toBeLessThanOrEqual(after);
      if (k > 0) expect(l.t).toBeGreaterThanOrEqual(lines[k - 1]!.t);
    });
    const results = JSON.parse(run.stdout) as { jobs: { name: string }[] };
    expect(results.jobs.map((j) => j.name)).toEqual(TINY_JOBS);

    const again = await spawnCli(['campaign', file, '--out', out, '--workers', '1', '--json']);
    expect(again.code, again.stderr).toBe(0);
    expect(again.stderr).toBe('');
    expect((JSON.parse(again.stdout) as { jobs: unknown }).jobs).toEqual(results.jobs);
  }, 60_000);

  it('design: a run past the delay logs finished starts, at most one per interval and always the last; stdout is the JSON alone', async () => {
    const before = Math.floor(Date.now() / 1000) * 1000;
    const run = await spawnCli(['design', 'runs/telecom-1550-inp.yaml', '--starts', '500', '--evaluations', '300', '--workers', '1', '--json']);
    const after = Date.now();
    expect(run.code, run.stderr).toBe(0);
    const lines = logLines(run.stderr, 'design');
    expect(lines.length).toBeGreaterThanOrEqual(1);
    expect(lines.length, 'no more than one line per interval, plus the last').toBeLessThanOrEqual(2 + Math.ceil((after - before) / LOG_INTERVAL_MS));
    for (const l of lines) {
      expect(l.text).toMatch(/^start (\d+)\/500 done · best loss \S+ · (\d+) to go$/);
      expect(l.t).toBeGreaterThanOrEqual(before);
      expect(l.t).toBeLessThanOrEqual(after);
    }
    expect(lines[lines.length - 1]!.text).toMatch(/^start 500\/500 done .* · 0 to go$/);
    expect((JSON.parse(run.stdout) as { starts: number }).starts).toBe(500);
  }, 60_000);

  it('progressLog: nothing before the delay, then at most one line per interval, always the last unit; nothing on a terminal', async () => {
    const quick = await onPipe(() => {
      const log = progressLog('design', { delayMs: 200 });
      for (let k = 1; k <= 16; k++) log.finished(k, 16, `start ${k}/16`);
    });
    expect(quick, 'a quick 16-start run adds no line').toBe('');

    const slow = await onPipe(async () => {
      const log = progressLog('design', { delayMs: 30, intervalMs: 150 });
      log.finished(1, 4, 'start 1/4');
      await sleep(60);
      log.finished(2, 4, 'start 2/4');
      log.finished(3, 4, 'start 3/4');
      log.finished(4, 4, 'start 4/4');
    });
    expect(logLines(slow, 'design').map((l) => l.text)).toEqual(['start 2/4', 'start 4/4']);

    const every = await onPipe(() => {
      const log = progressLog('campaign');
      for (let k = 1; k <= 3; k++) log.finished(k, 3, `job ${k}/3`);
    });
    expect(logLines(every, 'campaign').map((l) => l.text)).toEqual(['job 1/3', 'job 2/3', 'job 3/3']);

    expect(await onPipe(() => progressLog('campaign').finished(1, 1, 'job 1/1'), true)).toBe('');
    // 2026-12-03 13:40:12.345 UTC is 1796305212345 ms after the Unix epoch (date -u -d @1796305212).
    expect(isoSecond(new Date(1796305212345))).toBe('2026-12-03T13:40:12Z');
  });
});
