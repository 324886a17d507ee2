import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { loadSpecFile } from '../../engine/input/load.js';
import { solveWire } from '../../engine/wire/solve.js';
import { spacingObjective } from '../../objectives/spacing.js';
import type { SolveResult } from '../../engine/solve.js';
import { KB_EV_PER_K } from '../../engine/constants.js';

describe('wellsmith solve on a wire spec (in-process)', () => {
  it('prints the well-shaped JSON with a 1-D DOS, and the maps with --maps', async () => {
    const o = await cli(['solve', 'runs/wire-rect-gaas.yaml', '--json', '--maps']);
    expect(o.code, o.stderr).toBe(0);
    const r = JSON.parse(o.stdout);
    for (const band of ['electron', 'heavy_hole', 'light_hole']) {
      expect(r.bands[band].states.length, band).toBeGreaterThan(0);
      for (const s of r.bands[band].states) expect(Object.keys(s)).toEqual(expect.arrayContaining(['label', 'energy_eV', 'confinement_meV', 'bound']));
    }
    const t = r.transitions.find((x: { label: string }) => x.label === 'e1-hh1');
    expect(Object.keys(t)).toEqual(expect.arrayContaining(['label', 'energy_eV', 'wavelength_nm', 'overlap2']));
    // Common practice: a GaAs wire of ~10 × 6 nm in AlGaAs emits above the GaAs gap (1.42 eV at 300 K), below 1.7 eV.
    expect(t.energy_eV > 1.42 && t.energy_eV < 1.7, `e1-hh1 ${t.energy_eV} eV`).toBe(true);
    expect(r.dos.dimension).toBe(1);
    expect(r.maps.psi2.electron[0]).toHaveLength(r.maps.grid.nx * r.maps.grid.ny);
    // Σ|ψ|² dx dy = 1 on the map grid (normalisation, common practice).
    const sum = r.maps.psi2.electron[0].reduce((a: number, v: number) => a + v, 0) * r.maps.grid.dx_nm * r.maps.grid.dy_nm;
    expect(Math.abs(sum - 1), `Σ|ψ|² dx dy = ${sum}, expected 1, tolerance 1e-9`).toBeLessThan(1e-9);
  });

  it('a wire result feeds the spacing objective: e1-e2 of the scenario exceeds 3 kT at 300 K', () => {
    const r = solveWire(loadSpecFile('runs/wire-rect-gaas.yaml').spec);
    // The objective reads only bands[…].states[].energy_eV, bands[…].barrier_eV and structure.temperature_K, which a wire result carries.
    const e = spacingObjective.evaluate({ spacing: 'e1-e2', at_least: '3 kT' }, r as unknown as SolveResult);
    const [e1, e2] = r.bands.electron.states;
    const expected = (e2!.energy_eV - e1!.energy_eV) * 1000;
    expect(Math.abs(e.achieved! - expected), `achieved ${e.achieved} meV, expected ${expected} meV`).toBeLessThan(1e-9);
    expect(e.goal! - 3 * KB_EV_PER_K * 300 * 1000, 'goal is 3 kT at 300 K in meV').toBeCloseTo(0, 9);
    expect(e.satisfied, `e1-e2 = ${e.achieved} meV vs 3 kT = ${e.goal} meV`).toBe(true);
  });

  it('bad wire input exits 2 with one line naming the field and its line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'wellsmith-wire-'));
    const cases: [string, RegExp][] = [
      ['wire:\n  barrier: Al0.3Ga0.7As\n  shape:\n    kind: circle\n    material: GaAs\n    radius: -3 nm\n', /^wellsmith: wire\.shape\.radius: .*\(line 6\)/],
      ['wire:\n  barrier: Al0.3Ga0.7As\n  shape: { kind: rectangle, material: Unobtainium, width: 5 nm, height: 5 nm }\n', /^wellsmith: wire\.shape\.material: .*\(line 3\)/],
      ['wire:\n  barrier: Al0.3Ga0.7As\n  shape: { kind: rectangle, material: GaAs, width: w, height: 5 nm }\n', /^wellsmith: wire\.shape\.width: unknown variable "w"/],
      ['title: nothing\n', /^wellsmith: stack: is required/],
    ];
    for (const [k, [text, pattern]] of cases.entries()) {
      const path = join(dir, `bad-${k}.yaml`);
      writeFileSync(path, text);
      const o = await cli(['solve', path]);
      expect(o.code, `${text} -> ${o.stderr}`).toBe(2);
      expect(o.stderr.trim().split('\n'), o.stderr).toHaveLength(1);
      expect(o.stderr, text).toMatch(pattern);
    }
  });
});
