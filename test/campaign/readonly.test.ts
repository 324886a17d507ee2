/**
 * Read-only and archived run stores: what needs no writing works (resuming a finished campaign,
 * `report`, `merge` from it), even in a read-only folder without the store's -wal/-shm files; what
 * needs writing says "read-only" and exits 2; a forged SQLite file carrying our meta row is refused
 * with exit 2. The CLI runs as a child that cannot write there: file modes for a normal user, and
 * for root (whom modes do not stop) the child runs as the unprivileged user "nobody".
 */
import type { SpawnOptions } from 'node:child_process';
import { chmodSync, cpSync, existsSync, mkdirSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { STORE_FILE, STORE_FORMAT } from '../../engine/store/store.js';
import { referenceRun, snapshotOf, spawnCli, tempDir, tinyCampaign, type Snapshot } from './helpers.js';

const asReader: SpawnOptions = process.getuid?.() === 0 ? { uid: 65534, gid: 65534 } : {};

let dir: string;
let file: string;
let finished: string;
let reference: Snapshot;

beforeAll(async () => {
  dir = tempDir('readonly');
  chmodSync(dir, 0o755);
  file = tinyCampaign(dir);
  finished = join(dir, 'finished');
  reference = await referenceRun(file, finished);
  // An archived store: closed cleanly, so no -wal or -shm file beside it.
  expect(readdirSync(finished)).toEqual([STORE_FILE]);
});
afterAll(() => {
  for (const d of readdirSync(dir)) chmodSync(join(dir, d), 0o755);
  rmSync(dir, { recursive: true, force: true });
});

/** A copy of `from` whose folder and store cannot be written (the folder stays writable with `folder: false`). */
function readOnlyCopy(from: string, name: string, { folder = true } = {}): string {
  const to = join(dir, name);
  cpSync(from, to, { recursive: true });
  for (const f of readdirSync(to)) chmodSync(join(to, f), 0o444);
  chmodSync(to, folder ? 0o555 : 0o777);
  return to;
}

/** A folder anyone may write, for the outputs of the child. */
function writableFolder(name: string): string {
  const to = join(dir, name);
  mkdirSync(to, { mode: 0o777 });
  chmodSync(to, 0o777);
  return to;
}

describe('read-only run stores', () => {
  it('resuming a finished campaign in a read-only folder: exit 0 with its table, nothing written', async () => {
    const ro = readOnlyCopy(finished, 'ro-finished');
    const r = await spawnCli(['campaign', file, '--out', ro, '--workers', '1'], { spawn: asReader });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/3 jobs, 3 already finished, 0 run now/);
    expect(readdirSync(ro)).toEqual([STORE_FILE]);
  });

  it('report and merge read a store in a read-only folder without its -wal/-shm files', async () => {
    const ro = readOnlyCopy(finished, 'ro-archive');
    const out = writableFolder('outputs');
    const [report, merge] = await Promise.all([
      spawnCli(['report', ro, '--out', join(out, 'report.html')], { spawn: asReader }),
      spawnCli(['merge', join(out, 'merged'), ro], { spawn: asReader }),
    ]);
    expect(report.code, report.stderr).toBe(0);
    expect(existsSync(join(out, 'report.html'))).toBe(true);
    expect(merge.code, merge.stderr).toBe(0);
    expect(snapshotOf(join(out, 'merged'))).toEqual(reference);
    expect(readdirSync(ro)).toEqual([STORE_FILE]);
  });

  it('a campaign that needs writing to a read-only store says so and exits 2 (folder or file read-only)', async () => {
    // Jobs queued, none run yet.
    const queued = join(dir, 'queued');
    cpSync(finished, queued, { recursive: true });
    const db = new Database(join(queued, STORE_FILE));
    db.exec("DELETE FROM designs; DELETE FROM starts; UPDATE jobs SET state = 'queued', status = NULL, message = NULL, finished_at = NULL");
    db.close();
    for (const [name, folder] of [['ro-queued', true], ['ro-file', false]] as const) {
      const ro = readOnlyCopy(queued, name, { folder });
      const r = await spawnCli(['campaign', file, '--out', ro, '--workers', '1'], { spawn: asReader });
      expect(r.code, `${name}: ${r.stderr}`).toBe(2);
      expect(r.stderr).toMatch(/run store ".*": it is read-only here \(SQLITE_READONLY[A-Z_]*\) while starting job "wavelength=1480nm"; .*copy the run folder somewhere writable/);
      expect(r.stderr, 'a stack trace').not.toMatch(/internal error|\n\s+at /);
    }
  });

  it('a forged SQLite file with our meta row: exit 2, never a stack', async () => {
    const forged = join(dir, 'forged');
    mkdirSync(forged);
    const db = new Database(join(forged, STORE_FILE));
    db.exec(`CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT); INSERT INTO meta VALUES ('application', 'wellsmith-campaign-store'), ('format', '${STORE_FORMAT}'); CREATE TABLE jobs (name TEXT)`);
    db.close();
    const r = await runCampaignCommand({ file, out: forged, workers: 1, shard: undefined, export: undefined, slurm: undefined });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/claims to be a wellsmith run store but its table "jobs" lacks the columns idx, kind, hash/);
  });
});
