import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { sampleCrossSection, solveCrossSection, solveCrossSectionConverged, type CrossSectionGrid } from '../../engine/solver2d.js';
import { applyStencil, buildOperator, massesAt } from '../../engine/solver2d/operator.js';
import fixture from '../reference/solver2d/anisotropic_wire.json' with { type: 'json' };
import { expectClose, gridOf } from './helpers.js';

type Case = (typeof fixture.cases)['anisotropic'];

/** The fixture's grid: a node rectangle of well material in a barrier, with the case's masses along x and y and its α. */
function fixtureGrid(c: Case): CrossSectionGrid {
  const g = fixture.grid;
  const inside = (i: number, j: number): boolean => i >= g.well_i[0]! && i < g.well_i[1]! && j >= g.well_j[0]! && j < g.well_j[1]!;
  const pick = (pair: readonly number[], i: number, j: number): number => (inside(i, j) ? pair[0]! : pair[1]!);
  const base = gridOf(g.nx, g.ny, g.dx_nm, g.dy_nm, (i, j) => ({ V: inside(i, j) ? c.V_well_eV : c.V_barrier_eV, mass: pick(c.mass_x, i, j) }));
  const field = (pair: readonly number[]): Float64Array => Float64Array.from({ length: g.nx * g.ny }, (_, k) => pick(pair, k % g.nx, Math.floor(k / g.nx)));
  return { ...base, massY: field(c.mass_y), ...(c.alpha_per_eV.some((a) => a !== 0) ? { alpha: field(c.alpha_per_eV) } : {}) };
}

describe('diagonal mass tensor and non-parabolic masses (fixture test/reference/solver2d/anisotropic_wire.py: dense eigh, fixed-point iteration)', () => {
  it('anisotropic parabolic well: the 4 lowest levels equal dense diagonalisation within 1e-9 eV', () => {
    const r = solveCrossSection(fixtureGrid(fixture.cases.anisotropic), 4);
    expect(r.status).toBe('converged');
    fixture.cases.anisotropic.energies_eV.forEach((e, k) => expectClose(r.energies[k]!, e, 1e-9, `anisotropic level ${k + 1}`));
  });

  it('non-parabolic well: each level solves E = λ_k(H(E)) within the certified 1e-5 eV of the fixed-point iteration', () => {
    const r = solveCrossSection(fixtureGrid(fixture.cases.nonparabolic), 4);
    expect(r.status).toBe('converged');
    fixture.cases.nonparabolic.energies_eV.forEach((e, k) => expectClose(r.energies[k]!, e, 1e-5, `non-parabolic level ${k + 1}`));
  });

  it('non-parabolic well, one state asked for: the same certified ground level (a lone state was returned at its band-edge masses, 0.1 meV high)', () => {
    const r = solveCrossSection(fixtureGrid(fixture.cases.nonparabolic), 1);
    expect(r.status).toBe('converged');
    expectClose(r.energies[0]!, fixture.cases.nonparabolic.energies_eV[0]!, 1e-5, 'non-parabolic level 1 alone');
  });
});

describe('uniform anisotropic box (closed form)', () => {
  const MX = 0.11;
  const MY = 0.35;

  it('discrete levels equal 2c(1 − cos(pπ/(nx+1)))/(m_x dx²) + 2c(1 − cos(qπ/(ny+1)))/(m_y dy²), dense and LOBPCG paths', () => {
    // Closed form of the 5-point Dirichlet operator with constant coefficients (common practice): sin-product eigenvectors.
    for (const [nx, ny, count] of [[7, 5, 4], [31, 23, 6]] as const) {
      const dx = 0.4;
      const dy = 0.3;
      const levels: number[] = [];
      for (let p = 1; p <= nx; p++) for (let q = 1; q <= ny; q++) {
        levels.push(2 * HBAR2_OVER_2M0 * ((1 - Math.cos((p * Math.PI) / (nx + 1))) / (MX * dx ** 2) + (1 - Math.cos((q * Math.PI) / (ny + 1))) / (MY * dy ** 2)));
      }
      levels.sort((a, b) => a - b);
      const g = gridOf(nx, ny, dx, dy, () => ({ V: 0, mass: MX }));
      const r = solveCrossSection({ ...g, massY: new Float64Array(nx * ny).fill(MY) }, count, { tolerance_eV: 1e-9 });
      r.energies.forEach((e, k) => expectClose(e, levels[k]!, 1e-9, `${nx}×${ny} anisotropic box level ${k + 1}`));
    }
  });

  it('10 nm × 14 nm: Richardson-extrapolated levels within 0.05 meV of ħ²π²/2 (p²/(m_x Lx²) + q²/(m_y Ly²))', () => {
    const exact: number[] = [];
    for (let p = 1; p <= 4; p++) for (let q = 1; q <= 4; q++) exact.push(HBAR2_OVER_2M0 * Math.PI ** 2 * (p * p / (MX * 100) + (q * q) / (MY * 196)));
    exact.sort((a, b) => a - b);
    const r = solveCrossSectionConverged((h) => sampleCrossSection({ x0_nm: 0, y0_nm: 0, width_nm: 10, height_nm: 14 }, h, () => ({ V: 0, mass: MX, massY: MY })), 4, { h_nm: 0.5 });
    r.energies.forEach((e, k) => expectClose(e, exact[k]!, 5e-5, `anisotropic box level ${k + 1}`));
  });
});

/** Random small cross-sections with position-dependent masses along x and y and α (fast-check). */
const anisotropicGrid = fc
  .record({
    nx: fc.integer({ min: 3, max: 9 }),
    ny: fc.integer({ min: 3, max: 9 }),
    h: fc.double({ min: 0.3, max: 1, noNaN: true }),
    seed: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 324, maxLength: 324 }),
  })
  .map(({ nx, ny, h, seed }): CrossSectionGrid => {
    const n = nx * ny;
    const at = (k: number, s: number): number => seed[(4 * k + s) % seed.length]!;
    const base = gridOf(nx, ny, h, 0.8 * h, (i, j) => ({ V: 0.3 * at(i + nx * j, 0), mass: 0.05 + 0.3 * at(i + nx * j, 1) }));
    return { ...base, massY: Float64Array.from({ length: n }, (_, k) => 0.05 + 0.4 * at(k, 2)), alpha: Float64Array.from({ length: n }, (_, k) => at(k, 3)) };
  });

describe('operator with position-dependent anisotropic masses (properties)', () => {
  it('is symmetric: xᵀ(Ay) = yᵀ(Ax) at any energy, within 1e-12 relative (definition of a Hermitian operator)', () => {
    fc.assert(fc.property(anisotropicGrid, fc.double({ min: 0, max: 0.3, noNaN: true }), (g, energy) => {
      const op = buildOperator(g, 0, energy);
      const n = g.nx * g.ny;
      const x = Float64Array.from({ length: n }, (_, k) => Math.sin(1.7 * k + 0.3));
      const y = Float64Array.from({ length: n }, (_, k) => Math.cos(0.9 * k * k + 1.1));
      const ax = new Float64Array(n);
      const ay = new Float64Array(n);
      applyStencil(op, x, ax);
      applyStencil(op, y, ay);
      let xay = 0;
      let yax = 0;
      let scale = 0;
      for (let k = 0; k < n; k++) {
        xay += x[k]! * ay[k]!;
        yax += y[k]! * ax[k]!;
        scale += Math.abs(x[k]! * ay[k]!);
      }
      expectClose(xay, yax, 1e-12 * scale, `${g.nx}×${g.ny} grid at E = ${energy} eV`);
    }), { numRuns: 40, seed: 21 });
  });

  it('turning the grid by 90° and swapping m_x and m_y leaves the spectrum unchanged within 1e-9 eV (the tensor turns with the shape)', () => {
    fc.assert(fc.property(anisotropicGrid, (g) => {
      const { nx, ny } = g;
      // Node (i, j) of the turned grid is node (j, i) of the original: x and y, and their masses, trade places.
      const turn = (a: Float64Array): Float64Array => Float64Array.from({ length: nx * ny }, (_, k) => a[Math.floor(k / ny) + nx * (k % ny)]!);
      const turned: CrossSectionGrid = { nx: ny, ny: nx, dx_nm: g.dy_nm, dy_nm: g.dx_nm, x0_nm: g.dy_nm, y0_nm: g.dx_nm, V: turn(g.V), mass: turn(g.massY!), massY: turn(g.mass) };
      const { alpha: _alpha, ...parabolic } = g;
      const a = solveCrossSection(parabolic, 3, { tolerance_eV: 1e-10 }).energies;
      const b = solveCrossSection(turned, 3, { tolerance_eV: 1e-10 }).energies;
      a.forEach((e, k) => expectClose(b[k]!, e, 1e-9, `${nx}×${ny} turned, level ${k + 1}`));
    }), { numRuns: 20, seed: 22 });
  });
});

describe('sampling a non-parabolic mass', () => {
  it('a cell across an interface takes m(E) equal to the cell average of m_i(1 + α_i(E − V_i)) at every energy (definition)', () => {
    // Cell-centred: node 1 sits at x = 0.25 nm with the cell [0, 0.5] nm and subsamples at 0.0625, 0.1875, 0.3125, 0.4375 nm: the interface at 0.375 nm leaves three in four on its left.
    const material = (x: number) => (x < 0.375 ? { V: 0, mass: 0.067, alpha: 0.7 } : { V: 0.3, mass: 0.092, alpha: 0.55 });
    const g = sampleCrossSection({ x0_nm: -0.5, y0_nm: 0, width_nm: 2, height_nm: 1 }, 0.5, (x) => material(x));
    for (const E of [0, 0.1, 0.25]) {
      const m = massesAt(g, E).x;
      const left = material(0);
      const right = material(1);
      const expected = 0.75 * left.mass * (1 + left.alpha * (E - left.V)) + 0.25 * right.mass * (1 + right.alpha * (E - right.V));
      expectClose(m[1]!, expected, 1e-15, `node 1 at E = ${E} eV`);
    }
  });
});
