/**
 * The report's pictures, checked on their data: where each state lives (well or guide) against the
 * band edges, the two-panel band diagram's ranges and labels, the DOS envelope's L, histogram titles
 * by role, wire outlines on the shape, and where a campaign's report goes by default.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { join } from 'node:path';
import { loadSpecFile, parseSpecText } from '../../engine/input/load.js';
import { solve, BANDS, type SolveResult } from '../../engine/solve.js';
import { stateRegions } from '../../objectives/wells.js';
import { bandDiagramSpec, confiningRange, dosSpec, spreadLabels } from '../../engine/report/plots.js';
import { histogramSpec } from '../../engine/report/tolerance.js';
import { materialOutline } from '../../engine/report/wire.js';
import { solveWire } from '../../engine/wire/solve.js';
import { describeSolve } from '../../engine/cli/solve.js';
import { defaultReportPath } from '../../engine/cli/report.js';
import { STORE_FILE } from '../../engine/store/store.js';
import { DETECTOR_SPEC, WELL_SPEC, WIRE_SPEC } from './well-spec.js';
import { mkdirSync, writeFileSync } from 'node:fs';
import { tempDir } from '../campaign/helpers.js';

type Layer = Record<string, unknown> & { data?: { values: Record<string, unknown>[] }; mark?: { type: string }; encoding?: { y?: { scale?: { domain?: number[] } } } };
const panels = (r: SolveResult): Layer[][] => (bandDiagramSpec(r) as unknown as { vconcat: { layer: Layer[] }[] }).vconcat.map((p) => p.layer);

describe('where states live', () => {
  it('pump well: a state lives in the well exactly when it lies below the GaAs guide\'s edge (band edges, an independent criterion)', () => {
    const r = solve(loadSpecFile('runs/pump-976.yaml').spec);
    const regions = stateRegions(r)!;
    const guide = r.structure.layers[1]!.bands[0]!;
    const edge = { electron: guide.Ec, heavy_hole: guide.Ehh, light_hole: guide.Elh } as const;
    for (const b of BANDS) {
      r.bands[b].states.forEach((s, k) => {
        const inWell = b === 'electron' ? s.energy_eV < edge[b] : s.energy_eV > edge[b];
        expect(regions[b][k]!.region, `${s.label} at ${s.energy_eV} eV (guide edge ${edge[b]} eV)`).toBe(inWell ? 'well' : 'guide');
      });
    }
    // The terminal table shows the well's few states first, the guide's apart.
    const text = describeSolve(r);
    const wells = text.slice(text.indexOf('States of the wells'), text.indexOf('States of the guiding'));
    expect(wells.match(/^(electron|heavy hole|light hole)\s+\S+/gm)?.map((l) => l.split(/\s+/).pop())).toEqual(['e1', 'hh1', 'hh2', 'hh3', 'lh1']);
  });

  it('detector: e2 ten meV below the barrier edge is the well\'s, its tail in the barriers notwithstanding', () => {
    const r = solve(parseSpecText(DETECTOR_SPEC).spec);
    expect(stateRegions(r)!.electron.map((x) => x.region)).toEqual(['well', 'well']);
  });
});

describe('band diagram', () => {
  it('two panels, each holding its bands\' extremum, continuum edge and every drawn level; the detector\'s e2 stands clear of the edge', () => {
    const r = solve(parseSpecText(DETECTOR_SPEC).spec);
    const [cb, vb] = panels(r);
    const domainOf = (layers: Layer[]): number[] => layers.find((l) => l.mark?.type === 'line')!.encoding!.y!.scale!.domain!;
    const [lo, hi] = domainOf(cb!);
    const barrier = r.bands.electron.barrier_eV;
    for (const E of [r.bands.electron.edge_eV, barrier, ...r.bands.electron.states.map((s) => s.energy_eV)]) expect(E > lo! && E < hi!, `${E} in [${lo}, ${hi}]`).toBe(true);
    const [vlo, vhi] = domainOf(vb!);
    for (const b of ['heavy_hole', 'light_hole'] as const) for (const E of [r.bands[b].edge_eV, r.bands[b].barrier_eV]) expect(E > vlo! && E < vhi!).toBe(true);
    // Every point drawn (edges, continuum, |ψ|² curves, leaders) inside its panel: e2 at the barrier
    // edge draws its curve above the edge, which an earlier diagram cut off at the panel's top.
    for (const [layers, [a, b]] of [[cb!, [lo!, hi!]], [vb!, [vlo!, vhi!]]] as const) {
      const drawn = layers.filter((l) => l.mark?.type === 'line').flatMap((l) => l.data!.values.map((v) => v.E as number));
      const outside = drawn.filter((E) => !(E >= a && E <= b));
      expect(outside, `points outside [${a}, ${b}] eV`).toEqual([]);
    }
    // 230 px tall: e2 at 9.5 meV below the edge is about 7 px from it (the earlier full-range diagram put it 2 px away).
    const px = (230 * (barrier - r.bands.electron.states[1]!.energy_eV)) / (hi! - lo!);
    expect(px, `e2 to barrier edge: ${px.toFixed(1)} px`).toBeGreaterThan(5);
    console.log(`detector band diagram: e2 ${((barrier - r.bands.electron.states[1]!.energy_eV) * 1000).toFixed(1)} meV below the edge = ${px.toFixed(1)} px; electron panel ${lo!.toFixed(3)}–${hi!.toFixed(3)} eV`);
  });

  it('thick claddings do not squeeze the well: the z range is the confining layers and a margin', () => {
    const spec = parseSpecText(WELL_SPEC.replace(/thickness: 10 nm/g, 'thickness: 200 nm')).spec;
    const range = confiningRange(solve(spec));
    expect(range.to - range.from, `range ${range.from}–${range.to} nm of 408 nm`).toBeLessThan(30);
    expect(range.from < 200 && range.to > 208).toBe(true);
  });

  it('labels are spread at least one gap apart, inside the panel, in the order of their levels (property)', () => {
    fc.assert(fc.property(fc.array(fc.double({ min: -50, max: 280, noNaN: true }), { minLength: 1, maxLength: 12 }), (want) => {
      const y = spreadLabels(want, 13, 230);
      const order = want.map((w, i) => ({ w, i })).sort((a, b) => a.w - b.w).map((o) => y[o.i]!);
      for (let k = 1; k < order.length; k++) expect(order[k]! - order[k - 1]!).toBeGreaterThanOrEqual(13 - 1e-9);
      for (const v of y) expect(v >= 6.5 - 1e-9 && v <= 230 - 6.5 + 1e-9).toBe(true);
    }));
  });
});

describe('figure labels', () => {
  it('the DOS panels name the L of their bulk envelope (the 8 nm well)', () => {
    const spec = dosSpec(solve(parseSpecText(WELL_SPEC).spec)) as unknown as { data: { values: { panel: string }[] } };
    expect([...new Set(spec.data.values.map((v) => v.panel))]).toEqual(['electron (Ec): L = 8.0 nm', 'heavy hole (Ehh): L = 8.0 nm', 'light hole (Elh): L = 8.0 nm']);
  });

  it('histograms are titled for what they are: a target, a constraint, a maximised figure', () => {
    const title = (role: 'target' | 'constraint' | 'figure'): { text: string; subtitle: string } => (histogramSpec('q', 'nm', [1, 2, 3], null, 2, 0.5, { role, missing: 2, held: 3 }, 0) as unknown as { title: { text: string; subtitle: string } }).title;
    expect(title('target').text).toBe('target: q');
    expect(title('constraint')).toEqual({ text: 'constraint: q', subtitle: 'yield 50.0 % · 3 samples (+ 2 where it does not exist, counted as failures) · held in 3 of 5 samples · goal 0.00 nm' });
    expect(title('figure').subtitle).toMatch(/no window: the search makes it as large as it can/);
  });

  it('wire |ψ|² maps carry the outline of the 8 × 5 nm rectangle, on its edges within half a grid step', () => {
    const r = solveWire(parseSpecText(WIRE_SPEC).spec);
    const g = r.maps.grid;
    const outline = materialOutline(r);
    expect(outline.length).toBeGreaterThan(0);
    for (const s of outline) {
      const onX = [s.x, s.x2].every((x) => Math.abs(Math.abs(x) - 4) <= g.dx_nm / 2 + 1e-9);
      const onY = [s.y, s.y2].every((y) => Math.abs(Math.abs(y) - 2.5) <= g.dy_nm / 2 + 1e-9);
      expect(onX || onY, `segment ${JSON.stringify(s)}`).toBe(true);
    }
  });

  it('a campaign\'s report goes inside its run folder by default; a file\'s beside it', () => {
    const dir = tempDir('report-path');
    const run = join(dir, 'c.run');
    mkdirSync(run);
    writeFileSync(join(run, STORE_FILE), '');
    expect(defaultReportPath(run)).toBe(join(run, 'report.html'));
    expect(defaultReportPath(`${run}/`)).toBe(join(run, 'report.html'));
    expect(defaultReportPath(join(run, STORE_FILE))).toBe(join(run, 'report.html'));
    expect(defaultReportPath(join(dir, 'well.yaml'))).toBe(join(dir, 'well.html'));
  });
});
