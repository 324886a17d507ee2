/**
 * Thick claddings under a field (issue 12 item 6): a 10 nm GaAs well between 200 nm Al0.3Ga0.7As
 * claddings at 50 kV/cm, a normal modulator, ended with exit 2 (`profile.left.alpha: makes the mass …
 * non-positive`): across such a stack the field puts the states eV below the uphill cladding's edge,
 * where the two-band mass m(1 + α(E − V)) is negative. A valid structure is never bad input: the
 * solve returns states (bound or resonances), whatever the field up to 200 kV/cm, the cladding
 * width and the mass model.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { runSolve } from '../../../engine/cli/solve.js';
import { EXIT } from '../../../engine/cli/exit.js';
import { BANDS, settingsOf, solveStructure, type SolveResult } from '../../../engine/solve.js';
import { parseSpecText } from '../../../engine/input/load.js';
import { buildStructure } from '../../../engine/structure.js';

const specText = (well: string, w: number, barrier: string, clad: number, F: number, nonparabolic: boolean): string => `
substrate: GaAs
temperature: 300 K
field: ${F} kV/cm
solver: { nonparabolic: ${nonparabolic} }
stack:
  - { material: ${barrier}, thickness: ${clad} nm }
  - { material: ${well}, thickness: ${w} nm }
  - { material: ${barrier}, thickness: ${clad} nm }
`;

/** What every result must satisfy: finite energies, bound states below the open edge with zero width, resonances above it with a finite width. */
function checkResult(r: SolveResult, what: string): void {
  expect(r.status, what).toBe('ok');
  expect(r.bands.electron.states.length, `${what}: electron states`).toBeGreaterThan(0);
  for (const band of BANDS) {
    const b = r.bands[band];
    const sign = band === 'electron' ? 1 : -1;
    for (const s of b.states) {
      expect(Number.isFinite(s.energy_eV), `${what} ${s.label}: energy`).toBe(true);
      expect(s.width_meV >= 0 && Number.isFinite(s.width_meV), `${what} ${s.label}: width ${s.width_meV}`).toBe(true);
      expect(sign * (s.energy_eV - b.barrier_eV) < 0, `${what} ${s.label}: bound iff below the open edge`).toBe(s.bound);
      if (s.bound) expect(s.width_meV).toBe(0);
    }
  }
}

describe('thick claddings under a field', () => {
  it('the issue\'s modulator (10 nm GaAs, 2 × 200 nm Al0.3Ga0.7As, 50 kV/cm) solves from the command line with exit 0', () => {
    const dir = mkdtempSync(join(tmpdir(), 'wellsmith-field-'));
    try {
      const file = join(dir, 'modulator.yaml');
      writeFileSync(file, specText('GaAs', 10, 'Al0.3Ga0.7As', 200, 50, true));
      const out = runSolve({ spec: file, json: true, wavefunctions: false, maps: false });
      expect(out.code, out.stderr).toBe(EXIT.ok);
      const e1 = JSON.parse(out.stdout).bands.electron.states[0];
      // Every state leaks into the downhill contact, 1 eV below the well: e1 is a resonance, and
      // its width is far below any measurable scale (about 1e-18 eV behind a 40 nm tilted barrier).
      expect(e1.bound).toBe(false);
      expect(e1.width_meV).toBeGreaterThan(0);
      expect(e1.width_meV).toBeLessThan(1e-9);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it.each([200, 300])('%s nm claddings: fields 0–200 kV/cm with and without non-parabolicity return states', (clad) => {
    for (const nonparabolic of [true, false]) {
      for (const F of [0, 20, 100, 200]) {
        const spec = parseSpecText(specText('GaAs', 10, 'Al0.3Ga0.7As', clad, F, nonparabolic)).spec;
        const r = solveStructure(buildStructure(spec, {}), settingsOf(spec), { wavefunctions: false });
        checkResult(r, `${clad} nm, ${F} kV/cm, nonparabolic ${nonparabolic}`);
      }
    }
  });

  it('random wells, claddings ≥ 200 nm and fields to 200 kV/cm return states (property)', () => {
    const arb = fc.record({
      well: fc.constantFrom('GaAs', 'In0.15Ga0.85As', 'Al0.1Ga0.9As'),
      w: fc.integer({ min: 30, max: 150 }).map((t) => t / 10),
      x: fc.integer({ min: 20, max: 45 }).map((t) => t / 100),
      clad: fc.integer({ min: 200, max: 300 }),
      F: fc.integer({ min: -200, max: 200 }),
      nonparabolic: fc.boolean(),
    });
    fc.assert(fc.property(arb, ({ well, w, x, clad, F, nonparabolic }) => {
      const barrier = `Al${x}Ga${Number((1 - x).toFixed(2))}As`;
      const spec = parseSpecText(specText(well, w, barrier, clad, F, nonparabolic)).spec;
      const r = solveStructure(buildStructure(spec, {}), settingsOf(spec), { wavefunctions: false, states: { electron: 2, heavy_hole: 2, light_hole: 1 } });
      checkResult(r, `${w} nm ${well} / ${barrier} / ${clad} nm, ${F} kV/cm, nonparabolic ${nonparabolic}`);
    }), { numRuns: 8, seed: 6 });
  });
});
