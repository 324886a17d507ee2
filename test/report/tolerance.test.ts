import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildReport, histogram, inputFromText, toleranceReport, yieldText, type ReportInput } from '../../engine/report/index.js';
import { parseSpecText } from '../../engine/input/load.js';
import { nominalVariables } from '../../engine/structure.js';
import { DEFAULT_TOLERANCE } from '../../engine/tolerance/analyse.js';
import { cli } from '../../engine/cli/app.js';
import { WELL_SPEC } from './well-spec.js';

// A window of ±1.5 nm around the nominal line (839.3 nm, spread σ ≈ 1 nm under the default growth
// errors, as "wellsmith tolerance" prints them), so that some samples fall outside it.
const TIGHT_SPEC = WELL_SPEC.replace('wavelength: 820 nm, within: 20 nm', 'wavelength: 839 nm, within: 1.5 nm');
const SAMPLES = 120;

async function tightReport(): Promise<ReportInput> {
  const spec = parseSpecText(TIGHT_SPEC, 'tight.yaml').spec;
  const input = inputFromText(TIGHT_SPEC, 'tight.yaml');
  const tolerance = await toleranceReport(spec, nominalVariables(spec), { ...DEFAULT_TOLERANCE, samples: SAMPLES, workers: 1, batch: 60 });
  return { ...input, tolerance } as ReportInput;
}

describe('tolerance section', () => {
  it('histogram counts inside the window reproduce the ToleranceResult yield, which the page prints', async () => {
    const input = await tightReport();
    if (input.kind !== 'solve' || !input.tolerance) throw new Error('expected a solve input with a tolerance analysis');
    const t = input.tolerance;
    const mc = t.result.montecarlo!;
    const window = t.windows[0]!;
    // The spec's own window, 839 ± 1.5 nm, read back from the residuals (r = (λ − goal)/within).
    expect(window.goal, `goal: got ${window.goal}, expected 839`).toBe(839);
    expect(Math.abs(window.halfWidth - 1.5), `half-width: got ${window.halfWidth}, expected 1.5, tolerance 1e-9`).toBeLessThan(1e-9);
    // One target, so a sample meets every target exactly when its wavelength lies in the window.
    const bins = histogram(t.samples!.map((s) => s.values[0]!), 30, window);
    const inside = bins.filter((b) => b.x0 >= window.goal - window.halfWidth - 1e-9 && b.x1 <= window.goal + window.halfWidth + 1e-9).reduce((a, b) => a + b.count, 0);
    expect(inside / SAMPLES, `yield from the histogram ${inside}/${SAMPLES}, ToleranceResult yield ${mc.yield}`).toBe(mc.yield);
    expect(mc.yield > 0 && mc.yield < 1, `the window should cut the distribution, got yield ${mc.yield}`).toBe(true);
    const html = await buildReport(input);
    expect(html).toContain('<section id="tolerance">');
    expect(html).toContain(yieldText(mc.yield));
    // Sensitivity bars and one histogram, besides the band diagram, the valence dispersion and the DOS.
    expect(html.match(/<svg\b/g)?.length).toBe(5);
    expect(html).toContain('impact (window half-widths)');
    expect(html).toContain('e1-hh1 wavelength (nm)');
    expect(html).toContain('Monolayer islands of layer 2 (well)');
  }, 30_000);

  it('histogram keeps every finite value and puts the window edges on bin edges (property)', () => {
    fc.assert(fc.property(
      fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 1, maxLength: 200 }),
      fc.double({ min: -20, max: 20, noNaN: true }), fc.double({ min: 0.1, max: 10, noNaN: true }),
      (values, goal, halfWidth) => {
        const bins = histogram(values, 30, { goal, halfWidth });
        const total = bins.reduce((a, b) => a + b.count, 0);
        const width = bins[0]!.x1 - bins[0]!.x0;
        const k = (goal - halfWidth - bins[0]!.x0) / width;
        return total === values.length && Math.abs(k - Math.round(k)) < 1e-6 && Math.abs((2 * halfWidth) / width - Math.round((2 * halfWidth) / width)) < 1e-6;
      }), { numRuns: 200 });
  });

  it('reports `tolerance --json` output and adds the section with `report --tolerance`', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-report-tol-'));
    const spec = join(dir, 'tight.yaml');
    writeFileSync(spec, TIGHT_SPEC);
    const tol = await cli(['tolerance', spec, '--json', '--samples', '40', '--workers', '1']);
    expect(tol.code, tol.stderr).toBe(0);
    const json = join(dir, 'tolerance.json');
    writeFileSync(json, tol.stdout);
    const fromJson = await cli(['report', json, '--out', join(dir, 'tol.html')]);
    expect(fromJson.code, fromJson.stderr).toBe(0);
    const page = readFileSync(join(dir, 'tol.html'), 'utf8');
    const recorded = JSON.parse(tol.stdout) as { montecarlo: { yield: number } };
    expect(page).toContain(yieldText(recorded.montecarlo.yield));
    expect(page).toContain('<section id="tolerance">');

    const withTol = await cli(['report', spec, '--tolerance', '--samples', '40', '--workers', '1', '--out', join(dir, 'spec.html')]);
    expect(withTol.code, withTol.stderr).toBe(0);
    expect(readFileSync(join(dir, 'spec.html'), 'utf8')).toContain('<section id="tolerance">');

    // A recorded result has no spec to perturb: bad input, exit 2.
    const bad = await cli(['report', json, '--tolerance']);
    expect(bad.code, bad.stderr).toBe(2);
    expect(bad.stderr).toContain('--tolerance');
  }, 30_000);
});
