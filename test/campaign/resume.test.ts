/**
 * Acceptance tests of the run store as a checkpoint: a campaign interrupted by SIGINT and killed
 * with SIGKILL at points fast-check chooses, resumed each time, ends with the same store as an
 * uninterrupted run; the same campaign split into 3 shards and merged (twice) gives it too. The
 * reference is the uninterrupted run of the same campaign (determinism of each start is the
 * property under test; common practice for resumable searches).
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadCampaignFile } from '../../engine/campaign/campaign.js';
import { runCampaign } from '../../engine/campaign/run.js';
import { runMerge } from '../../engine/cli/merge.js';
import { RunStore, STORE_FILE } from '../../engine/store/store.js';
import { MAIN, ROOT, referenceRun, snapshotOf, tempDir, tinyCampaign, type Snapshot } from './helpers.js';

const TOTAL_STARTS = 12;
let file: string;
let reference: Snapshot;

beforeAll(async () => {
  const dir = tempDir('resume');
  file = tinyCampaign(dir);
  reference = await referenceRun(file, join(dir, 'reference'));
  // The reference itself: 3 finished jobs, 4 starts each, top 2 designs each.
  expect(reference.jobs.map((j) => (j as { state: string }).state)).toEqual(['done', 'done', 'done']);
  expect(reference.starts).toHaveLength(TOTAL_STARTS);
  expect(reference.designs).toHaveLength(6);
});

function storedStarts(out: string): number {
  const path = join(out, STORE_FILE);
  if (!existsSync(path)) return 0;
  try {
    const db = new Database(path, { readonly: true, fileMustExist: true });
    try { return db.prepare('SELECT count(*) FROM starts').pluck().get() as number; } finally { db.close(); }
  } catch {
    return 0; // the schema is being created
  }
}

/** `seen`: the starts another connection saw committed when the signal was sent. */
interface Ended { readonly code: number | null; readonly signal: NodeJS.Signals | null; readonly stderr: string; readonly seen: number }

/** Runs the CLI on the campaign; sends `signal` once the store holds `after` starts (never, when undefined). */
function runChild(out: string, after?: number, signal: NodeJS.Signals = 'SIGKILL'): Promise<Ended> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', MAIN, 'campaign', file, '--out', out, '--workers', '1'], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    let seen = 0;
    child.stderr.on('data', (d: Buffer) => { stderr += d.toString(); });
    const timer = after === undefined ? undefined : setInterval(() => {
      seen = storedStarts(out);
      if (seen >= after) { clearInterval(timer); child.kill(signal); }
    }, 25);
    child.on('error', reject);
    child.on('exit', (code, sig) => { clearInterval(timer); resolve({ code, signal: sig, stderr, seen }); });
  });
}

describe('checkpoint and resume', () => {
  it('SIGINT then SIGKILLs at random checkpoints, resumed each time, end equal to the uninterrupted run', async () => {
    await fc.assert(fc.asyncProperty(
      fc.uniqueArray(fc.integer({ min: 1, max: TOTAL_STARTS - 1 }), { minLength: 3, maxLength: 3 }).map((a) => [...a].sort((x, y) => x - y)),
      async (points) => {
        const out = tempDir('crash');
        const stopped = await runChild(out, points[0], 'SIGINT');
        expect(stopped.code, stopped.stderr).toBe(130);
        expect(stopped.stderr).toMatch(/stopped by SIGINT .*Resume with: wellsmith campaign/);
        const afterStop = snapshotOf(out);
        expect(afterStop.jobs.some((j) => (j as { state: string }).state === 'running'), 'a clean stop leaves no running job').toBe(false);
        expect(afterStop.starts.length, `starts stored at the SIGINT (kill point ${points[0]})`).toBeLessThan(TOTAL_STARTS);
        for (const p of points.slice(1)) {
          const killed = await runChild(out, p);
          expect(killed.signal === 'SIGKILL' || killed.code === 0, `run killed at ${p} starts: ${killed.stderr}`).toBe(true);
          // The store's guarantee (WAL, synchronous NORMAL): a kill loses no committed start.
          expect(storedStarts(out), `starts committed before the SIGKILL (${killed.seen}) must survive it`).toBeGreaterThanOrEqual(killed.seen);
        }
        const last = await runChild(out);
        expect(last.code, last.stderr).toBe(0);
        const final = snapshotOf(out);
        expect(final.starts, `kill points ${points.join(', ')}`).toEqual(reference.starts);
        expect(final.designs, `kill points ${points.join(', ')}`).toEqual(reference.designs);
        expect(final.jobs, `kill points ${points.join(', ')}`).toEqual(reference.jobs);
      }), { numRuns: 1 });
  });

  it('three shards merged (twice) equal the unsharded run', async () => {
    const dir = tempDir('shards');
    const campaign = loadCampaignFile(file);
    const dirs = [1, 2, 3].map((i) => join(dir, `shard-${i}`));
    for (const [i, d] of dirs.entries()) {
      const store = RunStore.open(d);
      try {
        const s = await runCampaign(campaign, store, { workers: i === 0 ? 2 : 1, shard: { index: i + 1, count: 3 } });
        expect(s.jobs, `shard ${i + 1}`).toBe(1);
      } finally {
        store.close();
      }
    }
    const out = join(dir, 'merged');
    const first = runMerge({ out, dirs });
    expect(first.code, first.stderr).toBe(0);
    const once = snapshotOf(out);
    expect(once).toEqual(reference);
    const second = runMerge({ out, dirs: [...dirs].reverse() });
    expect(second.code, second.stderr).toBe(0);
    expect(second.stdout).toMatch(/0 jobs and 0 starts added[\s\S]*0 jobs and 0 starts added[\s\S]*0 jobs and 0 starts added/);
    expect(snapshotOf(out)).toEqual(once);
  });
});
