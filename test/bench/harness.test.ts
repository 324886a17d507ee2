import { describe, expect, it } from 'vitest';
import { BenchNaNError, formatTable, measure, median, runEntry, type BenchEntry } from './harness.js';

const quiet = (): void => undefined;

describe('median', () => {
  // Definition of the sample median (common practice): middle value, or mean of the two middle values.
  it.each([
    [[3, 1, 2], 2],
    [[4, 1, 3, 2], 2.5],
    [[5], 5],
  ])('median(%j) = %d', (xs, expected) => {
    const got = median(xs);
    expect(got, `input ${JSON.stringify(xs)}, got ${got}, expected ${expected}, tolerance 0`).toBe(expected);
  });

  it('is NaN for no samples, so an empty measurement fails the run', () => {
    expect(Number.isNaN(median([])), 'median([]) should be NaN').toBe(true);
  });
});

describe('measure', () => {
  it('runs the warm-up and then exactly maxRuns when the time minimum cannot be met first', async () => {
    let calls = 0;
    const m = await measure(() => [++calls], { warmup: 2, minRuns: 1, maxRuns: 7, minTime_ms: 60_000 });
    expect(m.runs, `runs: got ${m.runs}, expected 7`).toBe(7);
    expect(calls, `calls: got ${calls}, expected 2 warm-up + 7 timed`).toBe(9);
    expect(m.values, 'values are those of the last run').toEqual([9]);
  });

  it('stops at minRuns once the time minimum is met', async () => {
    const m = await measure(() => [1], { warmup: 0, minRuns: 4, maxRuns: 1000, minTime_ms: 0 });
    expect(m.runs, `runs: got ${m.runs}, expected 4`).toBe(4);
  });

  it('times an asynchronous workload to its completion', async () => {
    const wait_ms = 20;
    const m = await measure(() => new Promise((resolve) => setTimeout(() => resolve([0]), wait_ms)), { warmup: 0, minRuns: 3, maxRuns: 3, minTime_ms: 0 });
    // setTimeout fires no earlier than its delay (Node.js timers documentation), less 1 ms of clock rounding.
    expect(m.median_ms, `median: got ${m.median_ms} ms, expected ≥ ${wait_ms - 1} ms`).toBeGreaterThanOrEqual(wait_ms - 1);
  });
});

describe('runEntry', () => {
  const policy = { warmup: 0, minRuns: 2, maxRuns: 2, minTime_ms: 0 };

  it('fails a benchmark whose output holds NaN', async () => {
    const entry: BenchEntry = { name: 'nan', prepare: () => ({ policy, run: () => [1, NaN] }) };
    await expect(runEntry(entry, quiet)).rejects.toBeInstanceOf(BenchNaNError);
  });

  it('reports ratio = ours / reference and names the reference', async () => {
    const entry: BenchEntry = {
      name: 'with reference',
      prepare: () => ({ policy, run: () => [1], reference: async (ours) => ({ name: 'half of ours', median_ms: ours.median_ms / 2 }) }),
    };
    const row = await runEntry(entry, quiet);
    expect(row.reference).toBe('half of ours');
    expect(row.ratio, `ratio: got ${row.ratio}, expected 2, tolerance 1e-12`).toBeCloseTo(2, 12);
  });

  it('reports the ratio a reference measured in interleaved pairs instead of the two medians\' ratio', async () => {
    const entry: BenchEntry = {
      name: 'paired',
      prepare: () => ({ policy, run: () => [1], reference: async (ours) => ({ name: 'paired', median_ms: ours.median_ms / 2, ratio: 1.9 }) }),
    };
    const row = await runEntry(entry, quiet);
    expect(row.ratio, 'the paired ratio').toBe(1.9);
  });

  it('runs without a ratio and says why when the reference is skipped', async () => {
    const notes: string[] = [];
    const entry: BenchEntry = { name: 'skipped', prepare: () => ({ policy, run: () => [1], reference: async () => ({ skipped: 'no python3' }) }) };
    const row = await runEntry(entry, (l) => notes.push(l));
    expect(row.ratio, 'no ratio without a reference').toBeUndefined();
    expect(notes.join('\n')).toContain('no python3');
  });
});

describe('formatTable', () => {
  it('shows each row and whether its target is met', () => {
    const entries: BenchEntry[] = [{ name: 'fast', target: { text: '< 1 ms', met: (r) => r.median_ms < 1 }, prepare: () => ({ run: () => [1] }) }];
    const text = formatTable([{ name: 'fast', median_ms: 2, runs: 5 }], entries);
    expect(text, text).toMatch(/fast\s+2\.0000\s+5/);
    expect(text, text).toContain('< 1 ms: MISSED');
  });
});
