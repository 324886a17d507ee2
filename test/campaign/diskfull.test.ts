/**
 * A full disk is the machine's trouble, not a job's: the campaign stops with exit 2 and one line
 * (no stack), the job it was running stays queued, and once there is room the same command
 * resumes to a store equal to that of an uninterrupted run (determinism of each start; common
 * practice for resumable runs). Run for real: a file-size limit (`ulimit -f`) in a child process,
 * and, where this process may mount one, a tmpfs too small for the store. Failed jobs count in the
 * exit code until they are retried with --retry-failed.
 */
import { spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { STORE_FILE } from '../../engine/store/store.js';
import { referenceRunSized, snapshotOf, spawnCli, tempDir, tinyCampaign, TINY_JOBS, type Snapshot } from './helpers.js';

const args = (file: string, out: string, more: Record<string, unknown> = {}) => ({ file, out, workers: 1, shard: undefined, export: undefined, slurm: undefined, ...more });

let dir: string;
let file: string;
let reference: Snapshot;
/**
 * Bytes the reference run's files reached. Its write-ahead log grows with every stored start until
 * the store is closed, so a limit at half of it cuts the run midway.
 */
let bytes: { db: number; wal: number; shm: number };

beforeAll(async () => {
  dir = tempDir('diskfull');
  file = tinyCampaign(dir);
  ({ snapshot: reference, bytes } = await referenceRunSized(file, join(dir, 'reference')));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const states = (s: Snapshot): string[] => s.jobs.map((j) => (j as { state: string }).state);

/** The stopped run: exit 2, one line (beyond the job log) naming the store's trouble and how to resume, no failed job, fewer starts than the whole run. */
function expectStopped(run: { code: number | null; stderr: string }, out: string, trouble: RegExp): void {
  expect(run.code, run.stderr).toBe(2);
  expect(run.stderr).toMatch(trouble);
  expect(run.stderr).toMatch(/Resume with: wellsmith campaign /);
  expect(run.stderr, 'a stack trace').not.toMatch(/internal error|\n\s+at /);
  // Besides the log lines of the jobs finished before the disk filled (stderr is a pipe here: log.test.ts).
  expect(run.stderr.trim().split('\n').filter((l) => !/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ campaign: job \d+\/3 done /.test(l))).toHaveLength(1);
  const cut = snapshotOf(out);
  expect(states(cut), 'no job may be failed by the environment').not.toContain('failed');
  expect(cut.starts.length, 'the limit must cut the run').toBeLessThan(reference.starts.length);
}

describe('a full disk loses nothing', () => {
  it('file-size limit (ulimit -f) in a child: exit 2, job left queued, resumed run equal to the uninterrupted one', async () => {
    const out = join(dir, 'ulimit');
    // A file-size limit applies to each file: the log is the one that grows.
    const limitKiB = Math.floor(bytes.wal / 1024 / 2);
    const run = await spawnCli(['campaign', file, '--out', out, '--workers', '1'], { shell: `ulimit -f ${limitKiB}` });
    expectStopped(run, out, /run store ".*": (a disk I\/O error occurred|the disk is full|a file-size limit was reached) \(/);
    const resumed = await runCampaignCommand(args(file, out));
    expect(resumed.code, resumed.stderr).toBe(0);
    expect(snapshotOf(out)).toEqual(reference);
  });

  const root = process.getuid?.() === 0;
  const mountable = root && spawnSync('sh', ['-c', 'command -v mount && command -v umount']).status === 0;
  it.runIf(mountable)('full tmpfs: exit 2 (disk is full), resumed after the file system grows, equal to the uninterrupted run', async (ctx) => {
    const mnt = join(dir, 'tmpfs');
    mkdirSync(mnt);
    // Room for the store, its shared-memory index, the lock file and half of the log.
    const size = Math.ceil((bytes.db + bytes.shm + 4096 + bytes.wal / 2) / 4096) * 4096;
    const mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', `size=${size}`, 'tmpfs', mnt], { encoding: 'utf8' });
    // A container may forbid mounts even to root: then only the file-size limit above runs.
    if (mounted.status !== 0) ctx.skip(`cannot mount a tmpfs here: ${mounted.stderr.trim()}`);
    try {
      const out = join(mnt, 'run');
      const run = await spawnCli(['campaign', file, '--out', out, '--workers', '1']);
      expectStopped(run, out, /run store ".*": the disk is full \((SQLITE_FULL|ENOSPC)\)/);
      expect(spawnSync('mount', ['-o', `remount,size=${16 * 1024 * 1024}`, mnt]).status).toBe(0);
      const resumed = await runCampaignCommand(args(file, out));
      expect(resumed.code, resumed.stderr).toBe(0);
      expect(snapshotOf(out)).toEqual(reference);
    } finally {
      spawnSync('umount', [mnt]);
    }
  });
});

describe('failed jobs', () => {
  it('count in the exit code on every later run, and --retry-failed runs them again', async () => {
    // A store as the disk-full defect left them: a job marked failed ("disk I/O error"), its designs missing, its starts kept.
    const out = join(dir, 'failed');
    cpSync(join(dir, 'reference'), out, { recursive: true });
    const db = new Database(join(out, STORE_FILE));
    db.prepare("UPDATE jobs SET state = 'failed', status = 'failed', message = 'internal error: disk I/O error', parameter_set = NULL, evaluations = NULL, failures = NULL WHERE name = ?").run(TINY_JOBS[0]);
    db.prepare('DELETE FROM designs WHERE job = ?').run(TINY_JOBS[0]);
    db.close();

    const first = await runCampaignCommand(args(file, out));
    expect(first.code, 'a failed job in the store is a failure of the campaign').toBe(1);
    expect(first.stdout).toMatch(/failed: wavelength=1480nm: internal error: disk I\/O error/);
    expect(first.stdout).toMatch(/--retry-failed/);
    const again = await runCampaignCommand(args(file, out));
    expect(again.code, 'still failed on a rerun that had nothing to do').toBe(1);

    const retried = await runCampaignCommand(args(file, out, { retryFailed: true }));
    expect(retried.code, retried.stdout + retried.stderr).toBe(0);
    expect(retried.stdout).toMatch(/1 failed job retried/);
    expect(snapshotOf(out)).toEqual(reference);
  });
});
