/**
 * A kill while a run store is being created leaves a complete store or none: every later
 * `campaign` and `merge` accepts the folder. A child process creates stores back to back (as
 * campaign and as merge do) and is SIGKILLed at a random moment, so the kill lands inside a
 * creation; every folder it touched must then open, and the folder it was killed in must hold no
 * partial file and run the campaign to the end.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { runMerge } from '../../engine/cli/merge.js';
import { RunStore, STORE_FILE } from '../../engine/store/store.js';
import { ROOT, tempDir, tinyCampaign } from './helpers.js';

const CREATOR = join(ROOT, 'test/campaign/store-creator.ts');
const dirs: string[] = [];
afterAll(() => { for (const d of dirs) rmSync(d, { recursive: true, force: true }); });

/** Starts the creator in a fresh folder and SIGKILLs it `delayMs` after its second store appears; returns the run folders, oldest first. */
async function killDuringCreation(how: 'campaign' | 'merge', delayMs: number): Promise<string[]> {
  const parent = tempDir(`create-${how}`);
  dirs.push(parent);
  const child = spawn(process.execPath, ['--import', 'tsx', CREATOR, parent, how], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (d: Buffer) => { stderr += d.toString(); });
  const ended = new Promise<NodeJS.Signals | null>((resolve) => child.on('exit', (_code, signal) => resolve(signal)));
  const deadline = Date.now() + 20_000;
  while (!existsSync(join(parent, 'run-1'))) {
    if (Date.now() > deadline || child.exitCode !== null) throw new Error(`the store creator did not get going: ${stderr}`);
    await new Promise((r) => setTimeout(r, 2));
  }
  await new Promise((r) => setTimeout(r, delayMs));
  child.kill('SIGKILL');
  expect(await ended, `the creator ended by itself: ${stderr}`).toBe('SIGKILL');
  const runs = readdirSync(parent).filter((f) => f.startsWith('run-'));
  return runs.sort((a, b) => Number(a.slice(4)) - Number(b.slice(4))).map((f) => join(parent, f));
}

describe('a kill during store creation', () => {
  it.each([
    ['campaign', 7], ['campaign', 41], ['merge', 11], ['merge', 53],
  ] as const)('%s creating stores, killed %i ms in: every folder opens, the last holds a whole store or none', async (how, delay) => {
    const runs = await killDuringCreation(how, delay);
    expect(runs.length).toBeGreaterThanOrEqual(2);
    for (const run of runs) {
      const store = RunStore.open(run);
      try {
        expect(store.jobs(), run).toEqual([]);
      } finally {
        store.close();
      }
    }
    const last = runs[runs.length - 1]!;
    // Only the store (and its log) remain once it is opened again: no temporary or lock file.
    expect(readdirSync(last).filter((f) => !/^campaign\.sqlite(-wal|-shm)?$/.test(f)), last).toEqual([]);
    if (how === 'merge') {
      const again = runMerge({ out: last, dirs: [] });
      expect(again.code, again.stderr).toBe(0);
    }
  }, 30_000);

  it('the campaign then runs to the end in the folder it was killed in', async () => {
    const runs = await killDuringCreation('campaign', 17);
    const last = runs[runs.length - 1]!;
    const r = await runCampaignCommand({ file: tinyCampaign(tempDir('create-file')), out: last, workers: 1, shard: undefined, export: undefined, slurm: undefined });
    expect(r.code, r.stderr).toBe(0);
    expect(existsSync(join(last, STORE_FILE))).toBe(true);
  }, 30_000);
});
