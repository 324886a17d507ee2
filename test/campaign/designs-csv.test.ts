/**
 * designs.csv carries the achieved value and the goal of every target of every design, one pair of
 * columns per target headed by its label and unit, for jobs whose target lists differ too. The
 * achieved wavelength is checked against the design solved afresh: λ = hc / (E(e1) − E(hh1)) with
 * hc = 1239.84198 eV·nm (CODATA 2018); the critical-thickness figure against the well's own
 * t / h_c − 1 from the resolved structure (a single strained well between lattice-matched
 * barriers: the well is the only strained layer).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadCampaignFile } from '../../engine/campaign/campaign.js';
import { designsCsv } from '../../engine/campaign/export.js';
import { runCampaign } from '../../engine/campaign/run.js';
import type { Spec } from '../../engine/input/schema.js';
import { findState, solveStructure } from '../../engine/solve.js';
import { RunStore } from '../../engine/store/store.js';
import { buildStructure } from '../../engine/structure.js';
import { ROOT, tempDir } from './helpers.js';

/** Rows of a CSV whose cells hold no commas or quotes (checked: a quoted cell would fail the header match). */
const rowsOf = (csv: string): string[][] => csv.trimEnd().split('\n').map((l) => l.split(','));

describe('designs.csv', () => {
  it('has the achieved value and goal of every target, each job\'s own targets, and values that match the design solved again', async () => {
    const dir = tempDir('designs-csv');
    const file = join(dir, 'c.yaml');
    // Job 1 keeps the spec's critical-thickness constraint; job 2 swaps it for a second e1-hh1 target (a label job 1 also has).
    writeFileSync(file, [
      `spec: ${JSON.stringify(join(ROOT, 'runs/telecom-1550-inp.yaml'))}`,
      'design: { starts: 3, top: 2, seed: 5, evaluations: 30 }',
      'sweep:',
      "  targets[1]: [{ constraint: critical_thickness }, { transition: e1-hh1, wavelength: 1560 nm, within: 50 nm }]",
      '',
    ].join('\n'));
    const campaign = loadCampaignFile(file);
    const store = RunStore.open(join(dir, 'run'));
    let csv: string;
    try {
      const summary = await runCampaign(campaign, store, { workers: 1, shard: { index: 1, count: 1 } });
      expect(summary.failed).toEqual([]);
      csv = designsCsv(store);
    } finally {
      store.close();
    }
    const [header, ...rows] = rowsOf(csv);
    expect(header).toEqual(['job_index', 'job', 'rank', 'loss', 'satisfied', 'w', 'x',
      'e1-hh1 wavelength (nm)', 'e1-hh1 wavelength goal (nm)',
      'below critical thickness (t/h_c − 1)', 'below critical thickness goal (t/h_c − 1)',
      'e1-hh1 wavelength (nm) #2', 'e1-hh1 wavelength goal (nm) #2',
      'start', 'job_status', 'spec_hash']);
    expect(rows.map((r) => r[1])).toEqual(['targets=#1', 'targets=#1', 'targets=#2', 'targets=#2']);
    const col = (name: string): number => header!.indexOf(name);
    for (const r of rows) {
      const job = campaign.jobs[Number(r[0])]!;
      const values = { w: Number(r[col('w')]), x: Number(r[col('x')]) };
      const structure = buildStructure(job.spec as Spec, values);
      const solved = solveStructure(structure);
      const lambda = 1239.84198 / (findState(solved, 'e1')!.energy_eV - findState(solved, 'hh1')!.energy_eV);
      const achieved = Number(r[col('e1-hh1 wavelength (nm)')]);
      expect(Math.abs(achieved - lambda), `${r[1]} rank ${r[2]}: csv ${achieved} nm, hc/ΔE ${lambda} nm`).toBeLessThan(1e-6 * lambda);
      expect(r[col('e1-hh1 wavelength goal (nm)')]).toBe('1550');
      const hc = r[col('below critical thickness (t/h_c − 1)')]!;
      const second = r[col('e1-hh1 wavelength (nm) #2')]!;
      if (r[1] === 'targets=#1') {
        const well = structure.layers[1]!;
        const ratio = well.thickness_nm / well.material.criticalThickness_nm - 1;
        expect(Math.abs(Number(hc) - ratio), `${r[1]} rank ${r[2]}: csv ${hc}, t/h_c − 1 ${ratio}`).toBeLessThan(1e-9);
        expect(r[col('below critical thickness goal (t/h_c − 1)')]).toBe('0');
        expect([second, r[col('e1-hh1 wavelength goal (nm) #2')]], 'a target this job lacks is an empty cell').toEqual(['', '']);
        expect(r[col('satisfied')]).toBe(Math.abs(achieved - 1550) <= 5 && ratio <= 0 ? 'yes' : 'no');
      } else {
        expect(hc).toBe('');
        expect(Number(second)).toBe(achieved);
        expect(r[col('e1-hh1 wavelength goal (nm) #2')]).toBe('1560');
        expect(r[col('satisfied')]).toBe(Math.abs(achieved - 1550) <= 5 && Math.abs(achieved - 1560) <= 50 ? 'yes' : 'no');
      }
    }
  }, 60_000);
});
