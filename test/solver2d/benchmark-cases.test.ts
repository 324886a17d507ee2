import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { solveCrossSection, type CrossSectionGrid } from '../../engine/solver2d.js';
import { lobpcg } from '../../engine/solver2d/lobpcg.js';
import { expectClose } from './helpers.js';

/**
 * The two 120 × 120 cases of test/reference/solver2d/eigsh_bench.py (the speed reference of the
 * wire solver): a 10 nm GaAs-like box, and a 5 nm-radius disc (V = 0, m = 0.067) in a 0.3 eV,
 * m = 0.092 barrier inside a 30 nm box. Besides the answers, the iteration counts are pinned so
 * that a change that slows convergence shows up here.
 */
function benchGrid(kind: 'rect' | 'circle'): CrossSectionGrid {
  const n = 120;
  const side = kind === 'rect' ? 10 : 30;
  const h = side / (n + 1);
  const V = new Float64Array(n * n);
  const mass = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const x = (i + 1) * h - side / 2;
      const y = (j + 1) * h - side / 2;
      const inside = kind === 'rect' || x * x + y * y < 25;
      V[i + n * j] = inside ? 0 : 0.3;
      mass[i + n * j] = inside ? 0.067 : 0.092;
    }
  }
  return { nx: n, ny: n, dx_nm: h, dy_nm: h, x0_nm: h, y0_nm: h, V, mass };
}

/** Largest |Σψaψb dx dy − δab| over the returned states. */
function orthonormalityError(grid: CrossSectionGrid, psi: readonly Float64Array[]): number {
  let worst = 0;
  psi.forEach((a, i) =>
    psi.forEach((b, j) => {
      let s = 0;
      for (let k = 0; k < a.length; k++) s += a[k] * b[k];
      worst = Math.max(worst, Math.abs(s * grid.dx_nm * grid.dy_nm - (i === j ? 1 : 0)));
    }),
  );
  return worst;
}

describe('benchmark cases of the wire solver', () => {
  it('120 × 120 box: the 6 lowest levels equal the discrete closed form within 1e-9 eV, in at most 6 iterations', () => {
    const grid = benchGrid('rect');
    const r = solveCrossSection(grid, 6);
    // Eigenvalues of the 5-point Dirichlet Laplacian on N × N nodes (common practice):
    // E_pq = (ħ²/2m)(4/h²)[sin²(pπ/(2(N+1))) + sin²(qπ/(2(N+1)))].
    const level = (p: number): number => Math.sin((p * Math.PI) / (2 * (grid.nx + 1))) ** 2;
    const c = ((HBAR2_OVER_2M0 / 0.067) * 4) / grid.dx_nm ** 2;
    const expected = [
      [1, 1],
      [1, 2],
      [2, 1],
      [2, 2],
      [1, 3],
      [3, 1],
    ].map(([p, q]) => c * (level(p) + level(q)));
    // Residual 1e-6 eV bounds the energy error by about ‖r‖²/gap ≈ 1e-11 eV; 1e-9 leaves rounding room.
    r.energies.forEach((e, k) => expectClose(e, expected[k], 1e-9, `box 120×120, level ${k + 1}`));
    expect(r.status).toBe('converged');
    expect(r.iterations, `iterations: got ${r.iterations}, pinned at most 6`).toBeLessThanOrEqual(6);
    const err = orthonormalityError(grid, r.psi);
    expect(err, `orthonormality: got ${err}, tolerance 1e-10`).toBeLessThanOrEqual(1e-10);
  });

  it('120 × 120 disc in a barrier: levels equal scipy eigsh on the same matrix within 1e-9 eV, in at most 16 iterations', () => {
    const grid = benchGrid('circle');
    const r = solveCrossSection(grid, 6);
    // Printed by `python3 test/reference/solver2d/eigsh_bench.py circle 120 6` (scipy eigsh,
    // shift-invert at min V), seen 2026-12-02.
    const eigsh = [0.07302781031774119, 0.18134434105611172, 0.18134434105611175, 0.30305787000121504, 0.30448988868489224, 0.3162391074200902];
    r.energies.forEach((e, k) => expectClose(e, eigsh[k], 1e-9, `disc 120×120, level ${k + 1}`));
    expect(r.status).toBe('converged');
    expect(r.iterations, `iterations: got ${r.iterations}, pinned at most 16`).toBeLessThanOrEqual(16);
    const err = orthonormalityError(grid, r.psi);
    expect(err, `orthonormality: got ${err}, tolerance 1e-10`).toBeLessThanOrEqual(1e-10);
  });
});

describe('lobpcg', () => {
  const n = 200;
  // diag(1, 2, …, n): eigenvalues 1 … n with unit vectors (definition).
  const apply = (x: Float64Array, y: Float64Array): void => {
    for (let k = 0; k < n; k++) y[k] = (k + 1) * x[k];
  };
  const precondition = (r: Float64Array, w: Float64Array): void => {
    for (let k = 0; k < n; k++) w[k] = r[k] / (k + 1);
  };
  const smooth = (m: number): Float64Array => Float64Array.from({ length: n }, (_, k) => Math.cos((m + 1) * 0.37 * (k + 1)) / (1 + 0.05 * k));

  it('finds the 3 lowest eigenvalues 1, 2, 3 of diag(1 … 200) within 1e-12 (definition)', () => {
    const r = lobpcg({ apply, precondition, start: [0, 1, 2, 3, 4].map(smooth), count: 3, tolerance: 1e-9, maxIterations: 200 });
    expect(r.converged).toBe(true);
    Array.from(r.values).forEach((v, k) => expectClose(v, k + 1, 1e-12, `diag(1…200), eigenvalue ${k + 1}`));
  });

  it('rejects a rank-deficient start block', () => {
    const v = smooth(0);
    expect(() => lobpcg({ apply, precondition, start: [v, smooth(1), v], count: 2, tolerance: 1e-9, maxIterations: 50 })).toThrow(/rank deficient/);
  });
});
