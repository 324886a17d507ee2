/**
 * One writer per run folder. A second `campaign` on a folder in use is refused with exit 2 naming
 * the process that holds it, and the first one finishes undisturbed, equal to an uninterrupted
 * run. The lock of a process that is gone (dead pid, pid now held by another process) is taken
 * over; one from another host, which cannot be checked from here, is not (common practice for
 * pid lock files).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { runMerge } from '../../engine/cli/merge.js';
import { RunStore, STORE_FILE } from '../../engine/store/store.js';
import { referenceRun, snapshotOf, spawnCli, tempDir, tinyCampaign, type Snapshot } from './helpers.js';

const LOCK = `${STORE_FILE}.lock`;
const args = (file: string, out: string) => ({ file, out, workers: 1, shard: undefined, export: undefined, slurm: undefined });

let dir: string;
let file: string;
let reference: Snapshot;

beforeAll(async () => {
  dir = tempDir('lock');
  file = tinyCampaign(dir);
  reference = await referenceRun(file, join(dir, 'reference'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A lock file as a process of `host` with `pid` (and process start `start`) would have left it. */
function lockAs(out: string, owner: { pid: number; host: string; start?: string | null }): void {
  mkdirSync(out, { recursive: true });
  writeFileSync(join(out, LOCK), `${JSON.stringify({ boot: null, start: null, ...owner, since: '2025-01-01T00:00:00.000Z' })}\n`);
}

describe('run folder lock', () => {
  it('a second campaign on a folder in use exits 2 naming its holder; the first ends equal to an uninterrupted run', async () => {
    const out = join(dir, 'busy');
    let firstPid = 0;
    let stopped = false;
    const first = spawnCli(['campaign', file, '--out', out, '--workers', '1'], {
      onSpawn: (child) => {
        firstPid = child.pid!;
        // Hold the first run still once it has the folder, so the second surely meets it running.
        const poll = setInterval(() => {
          if (existsSync(join(out, LOCK))) {
            clearInterval(poll);
            child.kill('SIGSTOP');
            stopped = true;
          }
        }, 5);
        child.on('exit', () => clearInterval(poll));
      },
    });
    while (!stopped) await new Promise((r) => setTimeout(r, 10));
    try {
      const second = await spawnCli(['campaign', file, '--out', out, '--workers', '1']);
      expect(second.code, second.stderr).toBe(2);
      expect(second.stderr).toMatch(new RegExp(`run folder ".*busy" is in use by wellsmith process ${firstPid} since .* \\(lock file ".*${LOCK}"\\)`));
      expect(second.stderr.trim().split('\n')).toHaveLength(1);
      const merge = runMerge({ out, dirs: [join(dir, 'reference')] });
      expect(merge.code, 'merge into a folder in use').toBe(2);
      expect(merge.stderr).toMatch(/is in use by wellsmith process/);
    } finally {
      process.kill(firstPid, 'SIGCONT');
    }
    const ended = await first;
    expect(ended.code, ended.stderr).toBe(0);
    expect(snapshotOf(out)).toEqual(reference);
    expect(existsSync(join(out, LOCK)), 'the lock is given back at the end').toBe(false);
  });

  it('takes over the lock of a dead process and of a reused pid', async () => {
    const gone = spawnSync(process.execPath, ['-e', '']).pid!;
    const dead = join(dir, 'dead');
    lockAs(dead, { pid: gone, host: hostname() });
    const r = await runCampaignCommand(args(file, dead));
    expect(r.code, r.stderr).toBe(0);
    expect(snapshotOf(dead)).toEqual(reference);
    // This very pid, but started at another time: another process now has the number.
    const reused = join(dir, 'reused');
    lockAs(reused, { pid: process.pid, host: hostname(), start: '1' });
    RunStore.open(reused).close();
  });

  it('refuses a folder held on another host, and one this process holds already', async () => {
    const remote = join(dir, 'remote');
    lockAs(remote, { pid: 4242, host: 'node17.cluster.example' });
    const before = readFileSync(join(remote, LOCK));
    const r = await runCampaignCommand(args(file, remote));
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/is in use by wellsmith process 4242 on host node17\.cluster\.example .*delete the lock file if that process is gone/);
    expect(readFileSync(join(remote, LOCK)).equals(before)).toBe(true);

    const twice = join(dir, 'twice');
    const held = RunStore.open(twice);
    try {
      expect(() => RunStore.open(twice)).toThrow(new RegExp(`in use by wellsmith process ${process.pid} `));
    } finally {
      held.close();
    }
    RunStore.open(twice).close();
  });
});
