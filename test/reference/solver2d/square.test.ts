/**
 * The wire solver at equal accuracy: the lowest six levels of a 10 nm GaAs square in Al0.3Ga0.7As
 * (30 nm box) against the fine-grid continuum answer of square_wire.json (generator square_wire.py
 * beside it: symmetry-reduced finite differences to h = 0.03125 nm, two Richardson steps, its own
 * error below 2e-8 eV). The error estimate of solveCrossSectionConverged must bound the true error
 * without overstating it tenfold, so that two kept grids suffice for 0.1 meV; and the cell-centred
 * grid with its wall half a spacing out has the discrete closed form of a box.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 as C } from '../../../engine/constants.js';
import { sampleCrossSection, solveCrossSection, solveCrossSectionConverged } from '../../../engine/solver2d.js';

const fixture = JSON.parse(readFileSync(new URL('./square_wire.json', import.meta.url), 'utf8')) as {
  problem: { V_well: number; m_well: number; V_barrier: number; m_barrier: number };
  energies_eV: number[];
};
const p = fixture.problem;
const box = { x0_nm: -15, y0_nm: -15, width_nm: 30, height_nm: 30 };
const at = (x: number, y: number) => (Math.abs(x) < 5 && Math.abs(y) < 5 ? { V: p.V_well, mass: p.m_well } : { V: p.V_barrier, mass: p.m_barrier });

describe('wire levels at a requested accuracy', () => {
  for (const [h, tol] of [[0.5, 1e-4], [1, 5e-4]] as const) {
    it(`h = ${h} nm, ${tol * 1e3} meV: within the tolerance of the continuum answer, the estimate bounds the true error within 10×`, () => {
      const r = solveCrossSectionConverged((g) => sampleCrossSection(box, g, at), 6, { h_nm: h, tolerance_eV: tol });
      const err = Math.max(...r.energies.map((e, k) => Math.abs(e - fixture.energies_eV[k]!)));
      expect(r.extrapolated).toBe(true);
      expect(err, `true error ${err} eV, tolerance ${tol}`).toBeLessThan(tol);
      expect(r.errorEstimate_eV, `estimate ${r.errorEstimate_eV} against true error ${err}`).toBeGreaterThanOrEqual(err);
      expect(r.errorEstimate_eV, `estimate ${r.errorEstimate_eV} against true error ${err}`).toBeLessThan(10 * err);
      // Two kept grids (h and h/2; 2h only for the estimate): the finest has 30/(h/2) cells a side.
      expect(r.gridSize).toEqual([60 / h, 60 / h]);
    });
  }

  it('a cell-centred box (wall half a spacing out) has the discrete closed form (2C/m)[(1 − cos(pπ/nx))/dx² + (1 − cos(qπ/ny))/dy²]', () => {
    const m = 0.067;
    const g = sampleCrossSection({ x0_nm: 0, y0_nm: 0, width_nm: 10, height_nm: 14 }, 0.5, () => ({ V: 0, mass: m }));
    const levels: number[] = [];
    for (let q = 1; q <= 4; q++) for (let pp = 1; pp <= 4; pp++) levels.push(((2 * C) / m) * ((1 - Math.cos((pp * Math.PI) / g.nx)) / g.dx_nm ** 2 + (1 - Math.cos((q * Math.PI) / g.ny)) / g.dy_nm ** 2));
    levels.sort((a, b) => a - b);
    const got = solveCrossSection(g, 5, { tolerance_eV: 1e-9 }).energies;
    got.forEach((e, k) => expect(Math.abs(e - levels[k]!), `level ${k + 1}: got ${e}, closed form ${levels[k]}`).toBeLessThan(1e-9));
  });
});
