/**
 * Stored designs (store formats 2 and 3): compressed, without sampled arrays, each well under 20 KB; a
 * report recomputes what a target needs from the spec and the design's values (the same
 * deterministic solve as the search's, so it scores identically); a format-1 store (plain JSON
 * text with wavefunctions) is still read, and is marked with the current format once written to.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadCampaignFile } from '../../engine/campaign/campaign.js';
import { runCampaign } from '../../engine/campaign/run.js';
import { design, DEFAULT_DESIGN_OPTIONS } from '../../engine/design/search.js';
import { readCampaign } from '../../engine/report/campaign-read.js';
import { RunStore, STORE_FILE, STORE_FORMAT, storedResult } from '../../engine/store/store.js';
import { loadSpecFile } from '../../engine/input/load.js';
import { ROOT, tempDir } from './helpers.js';

/** One job of the intersubband detector (its oscillator-strength target reads wavefunctions). */
const OPTIONS = { starts: 2, top: 2, seed: 5, evaluations: 15 };
let out: string;

beforeAll(async () => {
  const dir = tempDir('compact');
  const file = join(dir, 'qwip.yaml');
  writeFileSync(file, `title: one detector job\nspec: ${JSON.stringify(join(ROOT, 'runs/qwip-9um.yaml'))}\ndesign: ${JSON.stringify(OPTIONS)}\n`);
  out = join(dir, 'run');
  const store = RunStore.open(out);
  try {
    await runCampaign(loadCampaignFile(file), store, { workers: 1, shard: { index: 1, count: 1 } });
  } finally {
    store.close();
  }
});

describe('compact stored designs', () => {
  it('are compressed, hold no wavefunctions and take under 20 KB each', () => {
    const store = RunStore.open(out, { readonly: true });
    try {
      const designs = store.designs();
      expect(designs.length).toBe(2);
      for (const d of designs) {
        expect(Buffer.isBuffer(d.result_json)).toBe(true);
        expect((d.result_json as Buffer).length, 'stored bytes').toBeLessThan(20_000);
        const r = storedResult(d);
        expect(r.wavefunctions).toBeUndefined();
        expect(Object.keys(r)).toEqual(expect.arrayContaining(['structure', 'settings', 'bands', 'transitions']));
      }
      store.verify();
    } finally {
      store.close();
    }
  });

  it('a report scores a wavefunction target on the re-solved design exactly as the search did', async () => {
    const { spec } = loadSpecFile(join(ROOT, 'runs/qwip-9um.yaml'));
    const direct = await design(spec, { ...DEFAULT_DESIGN_OPTIONS, starts: OPTIONS.starts, top: OPTIONS.top, seed: OPTIONS.seed, maxEvaluations: OPTIONS.evaluations, workers: 1 });
    const job = readCampaign(out).jobs[0]!;
    expect(job.targets.map((t) => [t.label, t.achieved])).toEqual(direct.designs[0]!.evaluations.map((t) => [t.label, t.achieved]));
    // The oscillator strength is there and finite: it came from wavefunctions the store does not hold.
    expect(job.targets.some((t) => /oscillator/.test(t.label) && Number.isFinite(t.achieved))).toBe(true);
  });

  it('a format-1 store (JSON text with wavefunctions) is read, and marked with the current format once opened for writing', () => {
    const copy = join(tempDir('format1'), 'run');
    const store = RunStore.open(out, { readonly: true });
    const rows = store.designs();
    store.close();
    const fresh = RunStore.open(copy);
    fresh.close();
    // Rebuild the copy by hand as an older tool wrote it: the same rows, result_json as plain text.
    const w = new Database(join(copy, STORE_FILE));
    const src = new Database(join(out, STORE_FILE), { readonly: true });
    for (const table of ['jobs', 'starts']) {
      for (const row of src.prepare(`SELECT * FROM ${table}`).all() as Record<string, unknown>[]) {
        const cols = Object.keys(row);
        w.prepare(`INSERT INTO ${table} (${cols.join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`).run(...cols.map((c) => row[c]));
      }
    }
    for (const [k, v] of src.prepare('SELECT key, value FROM meta').all().map((r) => [(r as { key: string }).key, (r as { value: string }).value])) {
      w.prepare('INSERT OR REPLACE INTO meta (key, value) VALUES (?, ?)').run(k, k === 'format' ? '1' : v);
    }
    for (const d of rows) {
      const text = JSON.stringify({ ...storedResult(d), wavefunctions: { z_nm: { 0: 0 }, psi: {} } });
      w.prepare('INSERT INTO designs (job, rank, loss, satisfied, start, values_json, result_json) VALUES (?, ?, ?, ?, ?, ?, ?)').run(d.job, d.rank, d.loss, d.satisfied, d.start, d.values_json, text);
    }
    src.close();
    w.close();
    const report = readCampaign(copy);
    expect(report.jobs[0]!.targets.length).toBeGreaterThan(0);
    const reader = RunStore.open(copy, { readonly: true });
    expect(reader.meta('format')).toBe('1');
    reader.verify();
    reader.close();
    RunStore.open(copy).close();
    const after = RunStore.open(copy, { readonly: true });
    expect(after.meta('format')).toBe(String(STORE_FORMAT));
    after.close();
  });
});
