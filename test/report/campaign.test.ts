import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { campaignPlotSpec, readCampaign } from '../../engine/report/index.js';
import { STORE_FILE } from '../../engine/store/store.js';
import { referenceRun, ROOT, tempDir } from '../campaign/helpers.js';

const TITLE = '<script>alert(1)</script> & "sweep"';
const GOALS = [1480, 1550, 1600];

/** A campaign file over the telecom scenario: the sweep axis given, a small search per job. */
function campaignFile(dir: string, sweep: string): string {
  const file = join(dir, 'c.yaml');
  writeFileSync(file, [
    `title: ${JSON.stringify(TITLE)}`,
    `spec: ${JSON.stringify(join(ROOT, 'runs/telecom-1550-inp.yaml'))}`,
    'design: { starts: 2, top: 1, seed: 3, evaluations: 20 }',
    'sweep:',
    sweep,
    '',
  ].join('\n'));
  return file;
}

/** Data values of the plotted points: the layer (or single view) whose mark is "point". */
function pointsOf(spec: unknown): Record<string, unknown>[] {
  const s = spec as { mark?: { type: string }; data?: { values: Record<string, unknown>[] }; layer?: { mark: { type: string }; data: { values: Record<string, unknown>[] } }[] };
  const view = s.layer ? s.layer.find((l) => l.mark.type === 'point') : s;
  return view?.data?.values ?? [];
}

/** Symbols vega draws for a point mark: one <path> each, described as a "point" (legend swatches are not). */
/** Points drawn in the sweep section's plot (the design-curve sections below it draw their own). */
const svgPointCount = (html: string): number => {
  const start = html.indexOf('<section id="sweep">');
  const end = html.indexOf('</section>', start);
  return (html.slice(start, end).match(/aria-roledescription="point"/g) ?? []).length;
};

describe('campaign report', () => {
  let wavelengthRun = '';
  let seedRun = '';
  beforeAll(async () => {
    const dir = tempDir('report-campaign');
    wavelengthRun = join(dir, 'wl.run');
    await referenceRun(campaignFile(dir, `  targets[0].wavelength: [${GOALS.map((g) => `'${g} nm'`).join(', ')}]`), wavelengthRun);
    const dir2 = tempDir('report-campaign-seed');
    seedRun = join(dir2, 'seed.run');
    await referenceRun(campaignFile(dir2, '  design.seed: [1, 2]'), seedRun);
  }, 60_000);

  it('plots achieved versus the swept wavelength goal, one point per done job, without touching the store', async () => {
    const store = join(wavelengthRun, STORE_FILE);
    const before = readFileSync(store);
    const out = join(wavelengthRun, '..', 'wl.html');
    const r = await cli(['report', wavelengthRun, '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    // The store is only read (task requirement): byte-identical afterwards.
    expect(readFileSync(store).equals(before), 'campaign.sqlite changed while reporting').toBe(true);

    const report = readCampaign(wavelengthRun);
    const done = report.jobs.filter((j) => j.state === 'done');
    expect(done.length).toBe(GOALS.length);
    const points = pointsOf(campaignPlotSpec(report).spec);
    expect(points.length, `points ${JSON.stringify(points)}, expected one per done job (${done.length})`).toBe(done.length);
    // The goals are the swept values of the campaign file; the window is the spec's "within: 5 nm".
    expect(points.map((p) => p.goal)).toEqual(GOALS);
    for (const p of points) {
      const w = p.halfWidth as number;
      expect(Math.abs(w - 5), `job ${String(p.job)}: window half-width got ${w}, expected 5 nm (runs/telecom-1550-inp.yaml), tolerance 1e-6`).toBeLessThan(1e-6);
      const met = Math.abs((p.achieved as number) - (p.goal as number)) <= 5;
      expect(p.met, `job ${String(p.job)}: achieved ${String(p.achieved)}, goal ${String(p.goal)}, colour class`).toBe(met ? 'target met' : 'target missed');
    }

    const html = readFileSync(out, 'utf8');
    expect(svgPointCount(html), 'points drawn in the SVG').toBe(done.length);
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;sweep&quot;');
    expect(html).not.toMatch(/<script/i);
    expect(html).toContain('achieved (nm)');
    expect(html).toContain(`campaign hash ${report.hash}`);
    expect(html).toContain(report.toolVersion);
  }, 30_000);

  it('plots the best loss per job when the sweep is not over a transition goal', async () => {
    const out = join(seedRun, '..', 'seed.html');
    const r = await cli(['report', join(seedRun, STORE_FILE), '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const report = readCampaign(seedRun);
    const points = pointsOf(campaignPlotSpec(report).spec);
    expect(points.map((p) => p.loss), 'losses plotted, expected the rank-1 losses in job order').toEqual(report.jobs.map((j) => j.loss));
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('Best loss per job');
    expect(svgPointCount(html)).toBe(2);
  }, 30_000);

  it('refuses a foreign file with the store\'s message and exit 2, leaving it untouched', async () => {
    const dir = tempDir('report-foreign');
    const file = join(dir, 'campaign.sqlite');
    writeFileSync(file, 'name,loss\nnot a database\n');
    const r = await cli(['report', file, '--out', join(dir, 'x.html')]);
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/not an SQLite database/);
    expect(readFileSync(file, 'utf8')).toBe('name,loss\nnot a database\n');
  });
});
