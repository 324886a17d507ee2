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
 * Masses along x and y at each node at energy E (m0): m·(1 + α(E − V)) with the grid's
 * non-parabolicity, the band-edge masses when `energy` is undefined or the grid is parabolic.
 */
export function massesAt(grid: CrossSectionGrid, energy?: number): { readonly x: Float64Array; readonly y: Float64Array } {
  const { mass, V, alpha } = grid;
  const massY = grid.massY ?? mass;
  if (alpha === undefined || energy === undefined) return { x: mass, y: massY };
  const x = new Float64Array(mass.length);
  const y = grid.massY === undefined ? x : new Float64Array(mass.length);
  for (let k = 0; k < mass.length; k++) {
    const f = 1 + alpha[k] * (energy - V[k]);
    x[k] = mass[k] * f;
    if (y !== x) y[k] = massY[k] * f;
  }
  return { x, y };
}

/**
 * The 5-point finite-difference form of −(ħ²/2m0) ∇·(M⁻¹ ∇ψ) + (V − shift) ψ (eV), with the
 * diagonal mass tensor M = diag(m_x, m_y) of each node taken at `energy` (see massesAt).
 *
 * The flux between neighbouring nodes along x uses 1/m_edge = 2/(m_x,a + m_x,b), the harmonic
 * mean of 1/m_x (the inverse of the arithmetic mean of the masses), and likewise along y with
 * m_y. Why: for a sharp interface midway between the nodes, continuity of ψ and of the normal
 * flux ψ′/m makes the jump ψ_b − ψ_a = (h/2)(m_a + m_b)·(ψ′/m), so this is the exact flux of the
 * piecewise-linear solution and the scheme stays second order; the arithmetic mean of 1/m would
 * be first order at such an interface. A diagonal tensor only couples x-differences to m_x and
 * y-differences to m_y, so each face keeps this one-dimensional argument. The wall coupling uses
 * the node's own mass and the wall's distance δ (grid.wall_nm): (h/δ)·c/m, the flux of ψ falling
 * linearly to zero over δ (c/m for a wall one spacing away, 2c/m half a spacing away). The result
 * is symmetric and, with shift ≤ min V, positive definite.
 * Units: grid in nm, eV, m0; shift and energy in eV.
 */
export function buildOperator(grid: CrossSectionGrid, shift: number, energy?: number): Stencil9 {
  const { nx, ny, V } = grid;
  const { x: mx, y: my } = massesAt(grid, energy);
  const cx = HBAR2_OVER_2M0 / (grid.dx_nm * grid.dx_nm);
  const cy = HBAR2_OVER_2M0 / (grid.dy_nm * grid.dy_nm);
  const wx = grid.wall_nm ? grid.dx_nm / grid.wall_nm[0] : 1;
  const wy = grid.wall_nm ? grid.dy_nm / grid.wall_nm[1] : 1;
  const coef = new Float64Array(9 * nx * ny);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = i + nx * j;
      const a = mx[k];
      const b = my[k];
      const west = i > 0 ? (2 * cx) / (a + mx[k - 1]) : (wx * cx) / a;
      const east = i < nx - 1 ? (2 * cx) / (a + mx[k + 1]) : (wx * cx) / a;
      const south = j > 0 ? (2 * cy) / (b + my[k - nx]) : (wy * cy) / b;
      const north = j < ny - 1 ? (2 * cy) / (b + my[k + nx]) : (wy * cy) / b;
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

/**
 * uᵀH(E)u of the operator of buildOperator (shift 0) and its derivative in E, in one pass over
 * the faces: Σ_faces w(E)(u_a − u_b)² + Σ_walls w(E) u² + Σ V u² with w = 2c/(m_a(E) + m_b(E)) ((h/δ)·c/m at a wall),
 * dw/dE = −2c(m_a α_a + m_b α_b)/(m_a(E) + m_b(E))² (m the band-edge masses). The derivative is
 * ≤ 0 for α ≥ 0: heavier masses at higher energy lower the kinetic term. Units: eV, eV/eV.
 */
export function energyForm(grid: CrossSectionGrid, u: Float64Array, energy: number): { readonly value: number; readonly slope: number } {
  const { nx, ny, V, mass } = grid;
  const massY = grid.massY ?? mass;
  const alpha = grid.alpha;
  const cx = HBAR2_OVER_2M0 / (grid.dx_nm * grid.dx_nm);
  const cy = HBAR2_OVER_2M0 / (grid.dy_nm * grid.dy_nm);
  const wx = grid.wall_nm ? grid.dx_nm / grid.wall_nm[0] : 1;
  const wy = grid.wall_nm ? grid.dy_nm / grid.wall_nm[1] : 1;
  let value = 0;
  let slope = 0;
  // One face (or a wall, of factor `wall`, when b < 0) of coupling c between nodes a and b, masses from `m`.
  const face = (m: Float64Array, c: number, a: number, b: number, wall: number): void => {
    const fa = alpha === undefined ? 1 : 1 + alpha[a] * (energy - V[a]);
    const da = alpha === undefined ? 0 : m[a] * alpha[a];
    if (b < 0) {
      const ma = m[a] * fa;
      value += ((wall * c) / ma) * u[a] * u[a];
      slope -= ((wall * c * da) / (ma * ma)) * u[a] * u[a];
      return;
    }
    const fb = alpha === undefined ? 1 : 1 + alpha[b] * (energy - V[b]);
    const db = alpha === undefined ? 0 : m[b] * alpha[b];
    const sum = m[a] * fa + m[b] * fb;
    const d = u[a] - u[b];
    value += ((2 * c) / sum) * d * d;
    slope -= ((2 * c * (da + db)) / (sum * sum)) * d * d;
  };
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = i + nx * j;
      value += V[k] * u[k] * u[k];
      face(mass, cx, k, i > 0 ? k - 1 : -1, wx);
      if (i === nx - 1) face(mass, cx, k, -1, wx);
      face(massY, cy, k, j > 0 ? k - nx : -1, wy);
      if (j === ny - 1) face(massY, cy, k, -1, wy);
    }
  }
  return { value, slope };
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

/**
 * ys[k] = A xs[k] for every k (each ys[k] overwritten), as applyStencil gives it: the interior
 * of a 5-point operator is swept for four vectors at once, so each coefficient is loaded once for
 * four products.
 */
export function applyStencilColumns(op: Stencil9, xs: readonly Float64Array[], ys: readonly Float64Array[]): void {
  let g = 0;
  if (op.fivePoint && op.nx >= 3) for (; g + 4 <= xs.length; g += 4) applyFour(op, xs.slice(g, g + 4), ys.slice(g, g + 4));
  for (; g < xs.length; g++) applyStencil(op, xs[g], ys[g]);
}

/** Four columns of applyStencilColumns on a 5-point operator with nx ≥ 3. */
function applyFour(op: Stencil9, xs: readonly Float64Array[], ys: readonly Float64Array[]): void {
  const { nx, ny, coef } = op;
  const [x0, x1, x2, x3] = xs;
  const [y0, y1, y2, y3] = ys;
  for (let j = 0; j < ny; j++) {
    const row = nx * j;
    const edge = j === 0 || j === ny - 1;
    for (let c = 0; c < 4; c++) {
      if (edge) for (let i = 0; i < nx; i++) ys[c][row + i] = stencilAt(op, xs[c], i, j);
      else {
        ys[c][row] = stencilAt(op, xs[c], 0, j);
        ys[c][row + nx - 1] = stencilAt(op, xs[c], nx - 1, j);
      }
    }
    if (edge) continue;
    for (let k = row + 1; k < row + nx - 1; k++) {
      const c = 9 * k;
      const a4 = coef[c + 4];
      const a3 = coef[c + 3];
      const a5 = coef[c + 5];
      const a1 = coef[c + 1];
      const a7 = coef[c + 7];
      y0[k] = a4 * x0[k] + a3 * x0[k - 1] + a5 * x0[k + 1] + a1 * x0[k - nx] + a7 * x0[k + nx];
      y1[k] = a4 * x1[k] + a3 * x1[k - 1] + a5 * x1[k + 1] + a1 * x1[k - nx] + a7 * x1[k + nx];
      y2[k] = a4 * x2[k] + a3 * x2[k - 1] + a5 * x2[k + 1] + a1 * x2[k - nx] + a7 * x2[k + nx];
      y3[k] = a4 * x3[k] + a3 * x3[k - 1] + a5 * x3[k + 1] + a1 * x3[k - nx] + a7 * x3[k + nx];
    }
  }
}
