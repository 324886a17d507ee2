import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildReport, inputFromText } from '../../engine/report/index.js';
import { cli } from '../../engine/cli/app.js';
import { WELL_SPEC } from './well-spec.js';


describe('report', () => {
  it('escapes the title, inlines every plot as SVG and runs no script', async () => {
    const html = await buildReport(inputFromText(WELL_SPEC, 'well.yaml'));
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; well');
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/(src|href)="https?:/);
    // Band diagram, valence dispersion and DOS.
    expect(html.match(/<svg\b/g)?.length).toBe(3);
    for (const id of ['targets', 'structure', 'bands', 'valence', 'states', 'transitions', 'dos', 'growth']) expect(html).toContain(`<section id="${id}">`);
    // Axis titles carry units (common practice).
    expect(html).toContain('z (nm)');
    expect(html).toContain('energy (eV)');
  });

  it('re-solves solve --json output to the recorded energies', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-report-'));
    const spec = join(dir, 'well.yaml');
    (await import('node:fs')).writeFileSync(spec, WELL_SPEC);
    const solved = await cli(['solve', spec, '--json']);
    expect(solved.code, solved.stderr).toBe(0);
    const recorded = JSON.parse(solved.stdout) as { bands: { electron: { states: { energy_eV: number }[] } } };
    const input = inputFromText(solved.stdout, 'solve.json');
    expect(input.kind).toBe('solve');
    if (input.kind !== 'solve') return;
    const got = input.result.bands.electron.states.map((s) => s.energy_eV);
    expect(got, `got ${got}, expected ${recorded.bands.electron.states.map((s) => s.energy_eV)}, tolerance 0 (same solver, same structure)`).toEqual(recorded.bands.electron.states.map((s) => s.energy_eV));
  });

  it('writes report, growth CSV and --plot SVG from the command line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-report-'));
    const spec = join(dir, 'well.yaml');
    (await import('node:fs')).writeFileSync(spec, WELL_SPEC);
    const out = await cli(['report', spec, '--out', join(dir, 'r.html'), '--growth-sheet', join(dir, 'g.csv')]);
    expect(out.code, out.stderr).toBe(0);
    expect(readFileSync(join(dir, 'r.html'), 'utf8')).toContain('<!DOCTYPE html>');
    // Hand calculation: 8 nm of GaAs at 1.0 µm/h (0.277778 nm/s) takes 28.8 s.
    const gaas = readFileSync(join(dir, 'g.csv'), 'utf8').split('\n')[2]!.split(',');
    expect(Math.abs(Number(gaas[8]) - 28.8), `GaAs shutter: got ${gaas[8]}, expected 28.8, tolerance 1e-9`).toBeLessThan(1e-9);
    const plot = await cli(['solve', spec, '--plot', join(dir, 'band.svg')]);
    expect(plot.code, plot.stderr).toBe(0);
    expect(readFileSync(join(dir, 'band.svg'), 'utf8')).toMatch(/^<svg/);
    const bad = await cli(['solve', spec, '--plot', join(dir, 'band.png')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--plot: .*\.svg/);
  });
});
