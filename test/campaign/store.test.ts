/**
 * The run store refuses what it cannot own and never overwrites it: a corrupted file, an SQLite
 * database of another program, a store of a newer format. Exit code 2 through the CLI commands.
 * State rules (common practice for resumable runs): a finished job is never rewritten, a `running`
 * job left by a crash is re-queued. Stored design results (format 3, packed) read back exactly what
 * was written — the reference is the written value itself, every number compared with Object.is —
 * and a damaged record is refused; a format-2 store (zlib-compressed JSON) is still read.
 */
import { readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { deflateSync } from 'node:zlib';
import Database from 'better-sqlite3';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { runMerge } from '../../engine/cli/merge.js';
import type { DesignResult } from '../../engine/design/search.js';
import { RunStore, STORE_FILE, STORE_FORMAT, storedResult } from '../../engine/store/store.js';
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

/** A finished job holding one design whose solve result is `result` (the store reads nothing else of it). */
const oneDesign = (result: unknown): DesignResult => ({
  status: 'ok', message: 'fine', seed: 1, starts: 1, evaluations: 1, failures: 0,
  designs: [{ rank: 1, loss: 0.5, satisfied: true, start: 0, values: { w: 6 }, variables: [], evaluations: [], criticalMargin: 1, preferences: [], result }],
} as unknown as DesignResult);

/** Stores each result as job `r<k>`'s design and returns the store (open for writing) with the jobs' names. */
function storeResults(dir: string, results: readonly unknown[]): { store: RunStore; names: string[] } {
  const store = RunStore.open(dir);
  const names = results.map((_, k) => `r${k}`);
  store.enqueue(names.map((name, index) => ({ name, index, kind: 'design', hash: `h${index}`, spec: {}, options: {}, seed: 1 })));
  results.forEach((result, k) => {
    store.markRunning(names[k]!);
    store.finishJob(names[k]!, oneDesign(result));
  });
  return { store, names };
}

/** Plain data as solve results hold it, with what JSON text cannot say: NaN, ±Infinity, −0, strings that spell them, a key "__proto__". */
const { value: plain } = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: 'small' },
    fc.double(), fc.integer(), fc.constantFrom('Infinity', 'NaN', '0', ''), fc.string(), fc.boolean(), fc.constant(null),
    fc.array(tie('value'), { maxLength: 6 }),
    fc.dictionary(fc.oneof(fc.string(), fc.constantFrom('__proto__', '0', '10', '2', 'energy_eV')), tie('value'), { maxKeys: 6 }),
  ),
}));

/** `x` with every object as a plain one (fast-check makes some without a prototype), for toEqual. */
const asPlain = (x: unknown): unknown => {
  if (Array.isArray(x)) return x.map(asPlain);
  if (typeof x !== 'object' || x === null) return x;
  const o: Record<string, unknown> = {};
  for (const k of Object.keys(x)) Object.defineProperty(o, k, { value: asPlain((x as Record<string, unknown>)[k]), enumerable: true, writable: true, configurable: true });
  return o;
};

describe('stored design results (format 3)', () => {
  it('read back bit for bit, without the sampled arrays (property)', () => {
    const dir = tempDir('store-exact');
    const results: Record<string, unknown>[] = [];
    fc.assert(fc.property(fc.dictionary(fc.string(), plain, { maxKeys: 8 }), (r) => {
      results.push({ ...asPlain(r) as Record<string, unknown>, wavefunctions: { z_nm: [0, 1], psi: [[0.5, -0.5]] }, maps: [[1]] });
    }), { numRuns: 150, seed: 18 });
    const { store, names } = storeResults(dir, results);
    try {
      names.forEach((name, k) => {
        const { wavefunctions: _w, maps: _m, ...kept } = results[k]!;
        // toEqual compares numbers with Object.is: NaN equals NaN, but −0 differs from 0.
        expect(storedResult(store.designs(name)[0]!), `result ${k}`).toEqual(kept);
      });
      store.verify();
    } finally {
      store.close();
    }
  });

  it('a flipped byte anywhere in a record (its numbers included) is refused by verify, naming the record', () => {
    const dir = tempDir('store-flip');
    const { store } = storeResults(dir, [{ energies_eV: [0.0512, 0.1874, Infinity], label: 'e1' }]);
    const record = store.designs('r0')[0]!.result_json as Buffer;
    store.close();
    expect(record[0], 'the format-3 tag').toBe(3);
    const db = new Database(join(dir, STORE_FILE));
    const put = db.prepare("UPDATE designs SET result_json = ? WHERE job = 'r0'");
    try {
      // The check, the skeleton's length, the skeleton, and twice in the last 24 bytes: the three numbers.
      for (const at of [1, 6, 10, record.length - 20, record.length - 1]) {
        const bad = Buffer.from(record);
        bad[at] = bad[at]! ^ 0x10;
        put.run(bad);
        expect(() => storedResult({ result_json: bad }), `byte ${at}`).toThrow(SyntaxError);
        const reader = RunStore.open(dir, { readonly: true });
        try {
          expect(() => reader.verify(), `byte ${at}`).toThrow(/designs\.result_json of r0 rank 1 is not valid JSON/);
        } finally {
          reader.close();
        }
      }
    } finally {
      db.close();
    }
  });

  it('a format-2 store (zlib-compressed JSON, non-finite numbers as strings) is read, and marked with the current format once opened for writing', () => {
    const dir = tempDir('store-format2');
    const old = { status: 'converged', maxStates: Infinity, bands: { electron: [{ label: 'e1', energy_eV: 0.0512, width_meV: 0 }] } };
    storeResults(dir, [old]).store.close();
    // Rewrite it as a format-2 tool left it: JSON text, Infinity as "Infinity", zlib level 1 (RFC 1950 stream).
    const db = new Database(join(dir, STORE_FILE));
    db.prepare("UPDATE designs SET result_json = ? WHERE job = 'r0'").run(deflateSync(Buffer.from(JSON.stringify({ ...old, maxStates: 'Infinity' })), { level: 1 }));
    db.prepare("UPDATE meta SET value = '2' WHERE key = 'format'").run();
    db.close();
    const reader = RunStore.open(dir, { readonly: true });
    expect(reader.meta('format')).toBe('2');
    expect(storedResult(reader.designs('r0')[0]!)).toEqual(old);
    reader.verify();
    reader.close();
    const writer = RunStore.open(dir);
    writer.enqueue([{ name: 'r1', index: 1, kind: 'design', hash: 'h1', spec: {}, options: {}, seed: 1 }]);
    writer.markRunning('r1');
    writer.finishJob('r1', oneDesign({ ...old, status: 'newer' }));
    writer.close();
    const after = RunStore.open(dir, { readonly: true });
    try {
      expect(after.meta('format')).toBe(String(STORE_FORMAT));
      expect(after.designs().map((d) => storedResult(d)['status'])).toEqual(['converged', 'newer']);
      after.verify();
    } finally {
      after.close();
    }
  });
});
