/**
 * `merge` checks every source whole before it copies anything: a shard with flipped bytes (which
 * SQLite's own integrity check, run here independently, finds damaged) or with a stored JSON text
 * that no longer parses is refused with exit 2 naming that shard, and the target stays as it was
 * (byte for byte, or absent when it did not exist).
 */
import { copyFileSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runMerge } from '../../engine/cli/merge.js';
import { STORE_FILE } from '../../engine/store/store.js';
import { referenceRun, tempDir, tinyCampaign } from './helpers.js';

let dir: string;
let good: string;

beforeAll(async () => {
  dir = tempDir('merge-check');
  good = join(dir, 'good');
  await referenceRun(tinyCampaign(dir), good);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/**
 * A copy of the good store with `n` bytes XOR-ed with nonzero values, past the first page, at
 * positions from a fixed linear congruential sequence; `headers` puts them in the first 8 bytes of
 * pages (b-tree page headers, overflow-chain pointers), which SQLite's integrity check sees.
 */
function flipped(name: string, n: number, headers: boolean): string {
  const out = join(dir, name);
  mkdirSync(out);
  const bytes = readFileSync(join(good, STORE_FILE));
  let x = 12345;
  const next = (): number => (x = (Math.imul(x, 1103515245) + 12345) >>> 0);
  const pages = bytes.length / 4096;
  for (let k = 0; k < n; k++) {
    const at = headers ? 4096 * (1 + (next() % (pages - 1))) + (next() % 8) : 4096 + (next() % (bytes.length - 4096));
    bytes[at] = bytes[at]! ^ (1 + (next() % 255));
  }
  writeFileSync(join(out, STORE_FILE), bytes);
  return out;
}

/** SQLite's integrity check; a file too damaged for the check to run ("malformed") is reported as its error. */
function integrity(store: string): string[] {
  const db = new Database(join(store, STORE_FILE), { readonly: true });
  try {
    return db.prepare('PRAGMA integrity_check').pluck().all() as string[];
  } catch (e) {
    return [(e as Error).message];
  } finally {
    db.close();
  }
}

describe('merge refuses a damaged source', () => {
  it('200 flipped bytes: exit 2 naming the shard, no target created, an existing target unchanged', () => {
    const bad = flipped('flipped', 200, true);
    expect(integrity(bad), 'the fixture must be damaged by SQLite\'s own check').not.toEqual(['ok']);
    const fresh = join(dir, 'fresh');
    const r = runMerge({ out: fresh, dirs: [good, bad] });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toContain(join(bad, STORE_FILE));
    // Where the flips land decides which check meets them first: the opening one or the whole-store one.
    expect(r.stderr).toMatch(/is damaged|cannot be read as a wellsmith run store/);
    expect(existsSync(join(fresh, STORE_FILE)), 'the target was created').toBe(false);

    const target = join(dir, 'target');
    expect(runMerge({ out: target, dirs: [good] }).code).toBe(0);
    const before = readFileSync(join(target, STORE_FILE));
    const again = runMerge({ out: target, dirs: [bad] });
    expect(again.code, again.stderr).toBe(2);
    expect(readFileSync(join(target, STORE_FILE)).equals(before), 'the target changed').toBe(true);
  });

  it('200 bytes flipped anywhere (most in record text, which SQLite does not check): refused', () => {
    const bad = flipped('flipped-text', 200, false);
    const r = runMerge({ out: join(dir, 'fresh-text'), dirs: [bad] });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/is damaged|cannot be read as a wellsmith run store/);
  });

  it('a stored design that is not JSON: pages intact, record named', () => {
    const bad = join(dir, 'bad-json');
    mkdirSync(bad);
    copyFileSync(join(good, STORE_FILE), join(bad, STORE_FILE));
    const db = new Database(join(bad, STORE_FILE));
    db.prepare("UPDATE designs SET result_json = substr(result_json, 1, 40) WHERE job = 'wavelength=1550nm' AND rank = 2").run();
    db.close();
    expect(integrity(bad)).toEqual(['ok']);
    const r = runMerge({ out: join(dir, 'fresh-json'), dirs: [bad] });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/designs\.result_json of wavelength=1550nm rank 2 is not valid JSON/);
  });
});
