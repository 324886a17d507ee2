/**
 * The run store refuses what it cannot own and never overwrites it: a corrupted file, an SQLite
 * database of another program, a store of a newer format. Exit code 2 through the CLI commands.
 * State rules (common practice for resumable runs): a finished job is never rewritten, a `running`
 * job left by a crash is re-queued.
 */
import { readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { runMerge } from '../../engine/cli/merge.js';
import { RunStore, STORE_FILE, STORE_FORMAT } from '../../engine/store/store.js';
import { tempDir, tinyCampaign } from './helpers.js';

const args = (file: string, out: string) => ({ file, out, workers: 1, shard: undefined, export: undefined, slurm: undefined });

function badStore(kind: 'garbage' | 'truncated' | 'foreign' | 'newer'): string {
  const dir = tempDir(`store-${kind}`);
  const path = join(dir, STORE_FILE);
  if (kind === 'garbage') writeFileSync(path, 'these are not the bytes of a database\n'.repeat(50));
  if (kind === 'foreign' || kind === 'newer' || kind === 'truncated') {
    const db = new Database(path);
    if (kind === 'foreign') db.exec('CREATE TABLE photos (id INTEGER PRIMARY KEY, name TEXT); INSERT INTO photos (name) VALUES (\'cat\')');
    else db.exec(`CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT); INSERT INTO meta VALUES ('application', 'wellsmith-campaign-store'), ('format', '${STORE_FORMAT + 1}'); CREATE TABLE jobs (name TEXT)`);
    db.close();
    // A truncated database: the header survives, the pages after it are cut off.
    if (kind === 'truncated') writeFileSync(path, readFileSync(path).subarray(0, 100));
  }
  return dir;
}

describe('run store refuses files it does not own and leaves them untouched', () => {
  it.each([
    ['garbage', /is not an SQLite database/],
    ['truncated', /cannot be read as a wellsmith run store|not a wellsmith run store/],
    ['foreign', /is an SQLite database but not a wellsmith run store/],
    ['newer', new RegExp(`store format ${STORE_FORMAT + 1}, newer than this wellsmith understands`)],
  ] as const)('%s file: exit 2, clear message, bytes unchanged (campaign and merge)', async (kind, message) => {
    const dir = badStore(kind);
    const path = join(dir, STORE_FILE);
    const before = readFileSync(path);
    const campaign = tinyCampaign(tempDir('store-campaign'));
    const run = await runCampaignCommand(args(campaign, dir));
    expect(run.code, run.stderr).toBe(2);
    expect(run.stderr).toMatch(message);
    expect(run.stderr).toMatch(/left untouched/);
    const merged = runMerge({ out: dir, dirs: [badStore('garbage')] });
    expect(merged.code, merged.stderr).toBe(2);
    const into = runMerge({ out: dir, dirs: [] });
    expect(into.code, into.stderr).toBe(2);
    expect(readFileSync(path).equals(before), 'the refused file was modified').toBe(true);
  });
});

describe('job states', () => {
  const job = { name: 'a', index: 0, kind: 'design', hash: 'h1', spec: {}, options: {}, seed: 1 };

  it('re-queues a running job left by a crash and never rewrites a finished one', () => {
    const dir = tempDir('store-states');
    mkdirSync(dir, { recursive: true });
    const s = RunStore.open(dir);
    s.enqueue([job]);
    s.markRunning('a');
    s.close();
    const t = RunStore.open(dir);
    expect(t.requeueStale()).toBe(1);
    expect(t.job('a')!.state).toBe('queued');
    t.markRunning('a');
    t.finishJob('a', { status: 'ok', message: 'fine', designs: [], seed: 1, starts: 0, evaluations: 0, failures: 0 });
    expect(() => t.finishJob('a', { status: 'infeasible', message: 'again', designs: [], seed: 1, starts: 0, evaluations: 0, failures: 0 })).toThrow(/not running/);
    t.failJob('a', 'late failure');
    expect(t.requeueStale()).toBe(0);
    expect(t.job('a')).toMatchObject({ state: 'done', status: 'ok', attempts: 2 });
    expect(() => t.enqueue([{ ...job, hash: 'h2' }])).toThrow(/spec hash h1.*h2.*new --out folder/);
    t.close();
  });
});
