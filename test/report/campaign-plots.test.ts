/**
 * A campaign report's design curves (engine/report/campaign-plots.ts), from a run of the tiny
 * telecom campaign: the sweep value read back from each job's name, every plotted variable equal to
 * the value stored for the job's best design, and every achieved-minus-goal equal to the job's
 * scored target with the spec's own window (±5 nm) drawn around zero.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { readCampaign } from '../../engine/report/campaign-read.js';
import { bestDesigns, campaignDesignSections, jobCoordinates, offsetCurvesSpec, sweepAxes, variableCurvesSpec } from '../../engine/report/campaign-plots.js';
import { RunStore } from '../../engine/store/store.js';
import { referenceRun, ROOT, tempDir, tinyCampaign, TINY_JOBS } from '../campaign/helpers.js';

type Row = { kind: string; row: string; x: number; y?: number; job?: string; lo?: number; hi?: number };
const rowsOf = (spec: unknown): Row[] => (spec as { data: { values: Row[] } }).data.values;

describe('campaign design curves', () => {
  let run = '';
  beforeAll(async () => {
    const dir = tempDir('campaign-plots');
    run = join(dir, 'tiny.run');
    await referenceRun(tinyCampaign(dir), run);
  }, 120_000);

  it('reads the sweep value of each job from its name', () => {
    expect(jobCoordinates('wavelength=1310nm,material=InGaAs')).toEqual([['wavelength', '1310nm'], ['material', 'InGaAs']]);
    expect(jobCoordinates('base')).toBeNull();
    expect(sweepAxes(['material=InP,wavelength=1310nm', 'material=GaAs,wavelength=1550nm'])).toEqual([{ name: 'wavelength', numeric: true, unit: 'nm' }, { name: 'material', numeric: false, unit: '' }]);
    expect(sweepAxes(TINY_JOBS)).toEqual([{ name: 'wavelength', numeric: true, unit: 'nm' }]);
  });

  it('plots each job\'s stored best design and its achieved − goal with the ±5 nm window', async () => {
    const report = readCampaign(run);
    const designs = bestDesigns(run);
    const axes = sweepAxes(report.jobs.map((j) => j.name))!;
    const store = RunStore.open(run, { create: false, readonly: true });
    const stored = new Map(store.designs().filter((d) => d.rank === 1).map((d) => [d.job, JSON.parse(d.values_json) as Record<string, number>]));
    store.close();
    const variables = rowsOf(variableCurvesSpec(report, designs, axes)).filter((r) => r.kind === 'point');
    expect(variables).toHaveLength(TINY_JOBS.length * 2);
    for (const p of variables) {
      const name = p.row.split(' ')[0]!;
      expect(p.y, `${p.job} ${name}`).toBe(stored.get(p.job!)![name]);
      expect(p.x).toBe(Number(/wavelength=(\d+)nm/.exec(p.job!)![1]));
    }
    expect([...new Set(variables.map((p) => p.row))]).toEqual(['w (nm)', 'x (fraction)']);
    const offsets = rowsOf(offsetCurvesSpec(report, axes));
    for (const j of report.jobs) {
      const e = j.targets.find((t) => t.label === 'e1-hh1 wavelength')!;
      const p = offsets.find((r) => r.kind === 'point' && r.job === j.name)!;
      expect(p.y).toBeCloseTo(e.achieved! - e.goal!, 12);
      const band = offsets.find((r) => r.kind === 'band' && r.x === p.x)!;
      // runs/telecom-1550-inp.yaml: within 5 nm.
      expect(band.hi!).toBeCloseTo(5, 9);
      expect(band.lo!).toBeCloseTo(-5, 9);
    }
    const sections = await campaignDesignSections(report, designs);
    expect(sections.map((s) => s.id)).toEqual(['design-curves', 'target-offsets']);
    for (const s of sections) expect(s.html).toMatch(/<svg\b/);
  });

  it('a second sweep axis gets one panel per value: wavelength × temperature, two points per panel and row', async () => {
    const dir = tempDir('campaign-plots-2');
    const file = join(dir, 'two-axes.yaml');
    writeFileSync(file, [
      `spec: ${JSON.stringify(join(ROOT, 'runs/telecom-1550-inp.yaml'))}`,
      'design: { starts: 2, top: 1, seed: 5, evaluations: 20 }',
      'sweep:',
      "  targets[0].wavelength: ['1500 nm', '1560 nm']",
      "  temperature: ['280 K', '320 K']",
      '',
    ].join('\n'));
    const twoRun = join(dir, 'two.run');
    await referenceRun(file, twoRun);
    const report = readCampaign(twoRun);
    const axes = sweepAxes(report.jobs.map((j) => j.name))!;
    expect(axes.map((a) => a.name)).toEqual(['wavelength', 'temperature']);
    for (const spec of [variableCurvesSpec(report, bestDesigns(twoRun), axes), offsetCurvesSpec(report, axes)]) {
      const facet = (spec as unknown as { facet: { column?: { field: string; sort: string[] } } }).facet;
      expect(facet.column?.field).toBe('panel');
      expect(facet.column?.sort).toEqual(['temperature = 280K', 'temperature = 320K']);
      const points = rowsOf(spec).filter((r) => r.kind === 'point') as (Row & { panel: string })[];
      for (const panel of facet.column!.sort) {
        for (const row of new Set(points.map((p) => p.row))) {
          expect(points.filter((p) => p.panel === panel && p.row === row).map((p) => p.x).sort(), `${panel} ${row}`).toEqual([1500, 1560]);
        }
      }
    }
    // `report RUN` without --out writes inside the run folder.
    const o = await cli(['report', twoRun]);
    expect(o.code, o.stderr).toBe(0);
    expect(existsSync(join(twoRun, 'report.html'))).toBe(true);
  }, 120_000);
});
