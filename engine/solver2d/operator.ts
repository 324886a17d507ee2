/**
 * Discrete BenDaniel–Duke operator of a wire cross-section, stored as a 9-point stencil so that the
 * same type serves the fine 5-point operator and the Galerkin coarse operators of the multigrid.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import type { CrossSectionGrid } from './types.js';

/**
 * A symmetric operator on an nx × ny node grid with couplings to the 8 neighbours.
 * Coefficient s of node k sits at coef[9k + s], s = 3(dy + 1) + (dx + 1) for the neighbour at
 * offset (dx, dy); s = 4 is the diagonal. Couplings to nodes outside the grid are zero.
 */
export interface Stencil9 {
  readonly nx: number;
  readonly ny: number;
  readonly coef: Float64Array;
  /** True when the diagonal neighbours' couplings are all zero (the fine 5-point operator). */
  readonly fivePoint: boolean;
}

/**
 * The 5-point finite-difference form of −(ħ²/2m0) ∇·(1/m ∇ψ) + (V − shift) ψ (eV).
 *
 * The flux between neighbouring nodes uses 1/m_edge = 2/(m_a + m_b), the harmonic mean of 1/m
 * (the inverse of the arithmetic mean of the masses). Why: for a sharp interface midway between
 * the nodes, continuity of ψ and of ψ′/m makes the jump ψ_b − ψ_a = (h/2)(m_a + m_b)·(ψ′/m), so
 * this is the exact flux of the piecewise-linear solution and the scheme stays second order; the
 * arithmetic mean of 1/m would be first order at such an interface. The wall coupling uses the
 * node's own mass. The result is symmetric and, with shift ≤ min V, positive definite.
 * Units: grid in nm, eV, m0; shift in eV.
 */
export function buildOperator(grid: CrossSectionGrid, shift: number): Stencil9 {
  const { nx, ny, mass, V } = grid;
  const cx = HBAR2_OVER_2M0 / (grid.dx_nm * grid.dx_nm);
  const cy = HBAR2_OVER_2M0 / (grid.dy_nm * grid.dy_nm);
  const coef = new Float64Array(9 * nx * ny);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = i + nx * j;
      const m = mass[k];
      const west = i > 0 ? (2 * cx) / (m + mass[k - 1]) : cx / m;
      const east = i < nx - 1 ? (2 * cx) / (m + mass[k + 1]) : cx / m;
      const south = j > 0 ? (2 * cy) / (m + mass[k - nx]) : cy / m;
      const north = j < ny - 1 ? (2 * cy) / (m + mass[k + nx]) : cy / m;
      const c = 9 * k;
      if (i > 0) coef[c + 3] = -west;
      if (i < nx - 1) coef[c + 5] = -east;
      if (j > 0) coef[c + 1] = -south;
      if (j < ny - 1) coef[c + 7] = -north;
      coef[c + 4] = west + east + south + north + V[k] - shift;
    }
  }
  return { nx, ny, coef, fivePoint: true };
}

/** (A x)_k at node k = i + nx·j, skipping neighbours outside the grid. */
function stencilAt(op: Stencil9, x: Float64Array, i: number, j: number): number {
  const { nx, ny, coef } = op;
  const k = i + nx * j;
  const c = 9 * k;
  let s = coef[c + 4] * x[k];
  const hasW = i > 0;
  const hasE = i < nx - 1;
  if (hasW) s += coef[c + 3] * x[k - 1];
  if (hasE) s += coef[c + 5] * x[k + 1];
  if (j > 0) {
    const b = k - nx;
    s += coef[c + 1] * x[b];
    if (hasW) s += coef[c] * x[b - 1];
    if (hasE) s += coef[c + 2] * x[b + 1];
  }
  if (j < ny - 1) {
    const t = k + nx;
    s += coef[c + 7] * x[t];
    if (hasW) s += coef[c + 6] * x[t - 1];
    if (hasE) s += coef[c + 8] * x[t + 1];
  }
  return s;
}

/**
 * y = A x for a 9-point stencil operator (y is overwritten). Nodes off the border take a
 * branch-free path (5 terms for a 5-point operator), which is where nearly all the work is.
 */
export function applyStencil(op: Stencil9, x: Float64Array, y: Float64Array): void {
  const { nx, ny, coef } = op;
  for (let j = 0; j < ny; j++) {
    if (j === 0 || j === ny - 1 || nx < 3) {
      for (let i = 0; i < nx; i++) y[i + nx * j] = stencilAt(op, x, i, j);
      continue;
    }
    const row = nx * j;
    y[row] = stencilAt(op, x, 0, j);
    y[row + nx - 1] = stencilAt(op, x, nx - 1, j);
    if (op.fivePoint) {
      for (let k = row + 1; k < row + nx - 1; k++) {
        const c = 9 * k;
        y[k] = coef[c + 4] * x[k] + coef[c + 3] * x[k - 1] + coef[c + 5] * x[k + 1] + coef[c + 1] * x[k - nx] + coef[c + 7] * x[k + nx];
      }
    } else {
      for (let k = row + 1; k < row + nx - 1; k++) {
        const c = 9 * k;
        const b = k - nx;
        const t = k + nx;
        y[k] =
          coef[c + 4] * x[k] + coef[c + 3] * x[k - 1] + coef[c + 5] * x[k + 1] +
          coef[c] * x[b - 1] + coef[c + 1] * x[b] + coef[c + 2] * x[b + 1] +
          coef[c + 6] * x[t - 1] + coef[c + 7] * x[t] + coef[c + 8] * x[t + 1];
      }
    }
  }
}
