/**
 * Geometric multigrid V-cycle used as the preconditioner of the eigen-solver.
 *
 * Method (W. L. Briggs, V. E. Henson, S. F. McCormick, A Multigrid Tutorial, 2nd ed., SIAM 2000):
 * vertex-centred coarsening by two in each direction, bilinear interpolation P, restriction Pᵀ,
 * Galerkin coarse operators A_c = Pᵀ A P (which stay 9-point and keep the mass contrast of
 * the heterostructure without re-discretising it), one forward Gauss–Seidel sweep before and one
 * backward sweep after the coarse correction so the cycle is a symmetric positive-definite
 * operator, and an exact banded Cholesky solve on the coarsest grid.
 */
import type { Stencil9 } from './operator.js';

interface Level {
  readonly op: Stencil9;
  /** Work vectors of this level's size: residual. */
  readonly r: Float64Array;
  /** Interpolation weights from the next coarser level, along x and y. */
  readonly ax: Axis;
  readonly ay: Axis;
}

interface Coarsest {
  readonly op: Stencil9;
  /** Banded Cholesky factor (lower, row-major band of width bw + 1) in the short-axis-first order. */
  readonly factor: Float64Array;
  readonly bw: number;
  readonly order: Int32Array;
  readonly work: Float64Array;
}

/** A V-cycle approximating A⁻¹ for a symmetric positive-definite stencil operator A. */
export interface MultigridPreconditioner {
  readonly levels: number;
  /** x ≈ A⁻¹ b by one V-cycle from x = 0 (x is overwritten). */
  readonly apply: (b: Float64Array, x: Float64Array) => void;
}

/** 1-D bilinear-interpolation weight of coarse node C for fine index f (coarse node C sits at fine 2C + 1). */
const coarseOf = (f: number, nc: number, out: number[], w: number[]): number => {
  let count = 0;
  if (f % 2 === 1) {
    const c = (f - 1) / 2;
    if (c < nc) {
      out[count] = c;
      w[count++] = 1;
    }
  } else {
    for (const c of [f / 2 - 1, f / 2]) {
      if (c >= 0 && c < nc) {
        out[count] = c;
        w[count++] = 0.5;
      }
    }
  }
  return count;
};

/** Galerkin coarse operator Pᵀ A P for bilinear P (closes on 9 points, see the module comment). */
function galerkin(op: Stencil9): Stencil9 {
  const { nx, ny, coef } = op;
  const ncx = Math.floor(nx / 2);
  const ncy = Math.floor(ny / 2);
  const out = new Float64Array(9 * ncx * ncy);
  const cxs = [0, 0];
  const wxs = [0, 0];
  const cys = [0, 0];
  const wys = [0, 0];
  for (let J = 0; J < ncy; J++) {
    for (let I = 0; I < ncx; I++) {
      const row = 9 * (I + ncx * J);
      for (let b = -1; b <= 1; b++) {
        const fy = 2 * J + 1 + b;
        if (fy >= ny) continue;
        const wyf = b === 0 ? 1 : 0.5;
        for (let a = -1; a <= 1; a++) {
          const fx = 2 * I + 1 + a;
          if (fx >= nx) continue;
          const wf = wyf * (a === 0 ? 1 : 0.5);
          const fc = 9 * (fx + nx * fy);
          for (let s = 0; s < 9; s++) {
            const val = coef[fc + s];
            if (val === 0) continue;
            const gx = fx + (s % 3) - 1;
            const gy = fy + Math.floor(s / 3) - 1;
            if (gx < 0 || gx >= nx || gy < 0 || gy >= ny) continue;
            const nxw = coarseOf(gx, ncx, cxs, wxs);
            const nyw = coarseOf(gy, ncy, cys, wys);
            for (let q = 0; q < nyw; q++) {
              for (let p = 0; p < nxw; p++) {
                const t = 3 * (cys[q] - J + 1) + (cxs[p] - I + 1);
                out[row + t] += wf * val * wxs[p] * wys[q];
              }
            }
          }
        }
      }
    }
  }
  return { nx: ncx, ny: ncy, coef: out, fivePoint: false };
}

/** r ← Pᵀ fine (restriction) onto the coarse grid of size ncx × ncy. */
function restrict(fine: Float64Array, nx: number, ny: number, coarse: Float64Array, ncx: number, ncy: number): void {
  for (let J = 0; J < ncy; J++) {
    for (let I = 0; I < ncx; I++) {
      let s = 0;
      for (let b = -1; b <= 1; b++) {
        const fy = 2 * J + 1 + b;
        if (fy >= ny) continue;
        const wy = b === 0 ? 1 : 0.5;
        const base = nx * fy;
        const fx = 2 * I + 1;
        let t = fine[base + fx];
        t += 0.5 * fine[base + fx - 1];
        if (fx + 1 < nx) t += 0.5 * fine[base + fx + 1];
        s += wy * t;
      }
      coarse[I + ncx * J] = s;
    }
  }
}

/** Bilinear weights along one axis: fine index f takes w0·coarse[c0] + w1·coarse[c1] (absent partners have weight 0). */
interface Axis {
  readonly c0: Int32Array;
  readonly c1: Int32Array;
  readonly w0: Float64Array;
  readonly w1: Float64Array;
}

function axisWeights(n: number, nc: number): Axis {
  const axis = { c0: new Int32Array(n), c1: new Int32Array(n), w0: new Float64Array(n), w1: new Float64Array(n) };
  const cs = [0, 0];
  const ws = [0, 0];
  for (let f = 0; f < n; f++) {
    const count = coarseOf(f, nc, cs, ws);
    if (count > 0) {
      axis.c0[f] = cs[0];
      axis.w0[f] = ws[0];
    }
    if (count > 1) {
      axis.c1[f] = cs[1];
      axis.w1[f] = ws[1];
    }
  }
  return axis;
}

/** fine ← fine + P coarse: bilinear interpolation from the grid of coarse nodes at fine indices 2I + 1. */
function prolongAdd(coarse: Float64Array, ncx: number, ax: Axis, ay: Axis, fine: Float64Array, nx: number, ny: number): void {
  const { c0: xc0, c1: xc1, w0: xw0, w1: xw1 } = ax;
  for (let fy = 0; fy < ny; fy++) {
    const r0 = ncx * ay.c0[fy];
    const r1 = ncx * ay.c1[fy];
    const v0 = ay.w0[fy];
    const v1 = ay.w1[fy];
    const row = nx * fy;
    for (let fx = 0; fx < nx; fx++) {
      const a = xc0[fx];
      const b = xc1[fx];
      fine[row + fx] += v0 * (xw0[fx] * coarse[r0 + a] + xw1[fx] * coarse[r0 + b]) + v1 * (xw0[fx] * coarse[r1 + a] + xw1[fx] * coarse[r1 + b]);
    }
  }
}

/** Gauss–Seidel update of node (i, j) of A x = b, skipping neighbours outside the grid. */
function relaxAt(op: Stencil9, b: Float64Array, x: Float64Array, i: number, j: number): void {
  const { nx, ny, coef } = op;
  const k = i + nx * j;
  const c = 9 * k;
  let s = b[k];
  const hasW = i > 0;
  const hasE = i < nx - 1;
  if (hasW) s -= coef[c + 3] * x[k - 1];
  if (hasE) s -= coef[c + 5] * x[k + 1];
  if (j > 0) {
    const d = k - nx;
    s -= coef[c + 1] * x[d];
    if (hasW) s -= coef[c] * x[d - 1];
    if (hasE) s -= coef[c + 2] * x[d + 1];
  }
  if (j < ny - 1) {
    const u = k + nx;
    s -= coef[c + 7] * x[u];
    if (hasW) s -= coef[c + 6] * x[u - 1];
    if (hasE) s -= coef[c + 8] * x[u + 1];
  }
  x[k] = s / coef[c + 4];
}

/** Gauss–Seidel update of an interior node k (all eight neighbours inside the grid). */
function relaxInterior(coef: Float64Array, nx: number, five: boolean, b: Float64Array, x: Float64Array, k: number): void {
  const c = 9 * k;
  let s = b[k] - coef[c + 3] * x[k - 1] - coef[c + 5] * x[k + 1] - coef[c + 1] * x[k - nx] - coef[c + 7] * x[k + nx];
  if (!five) s -= coef[c] * x[k - nx - 1] + coef[c + 2] * x[k - nx + 1] + coef[c + 6] * x[k + nx - 1] + coef[c + 8] * x[k + nx + 1];
  x[k] = s / coef[c + 4];
}

/** One backward (reverse lexicographic) Gauss–Seidel sweep on A x = b; border nodes take the checked path. */
function gaussSeidelBackward(op: Stencil9, b: Float64Array, x: Float64Array): void {
  const { nx, ny, coef, fivePoint } = op;
  for (let j = ny - 1; j >= 0; j--) {
    if (j === 0 || j === ny - 1 || nx < 3) {
      for (let i = nx - 1; i >= 0; i--) relaxAt(op, b, x, i, j);
      continue;
    }
    const row = nx * j;
    relaxAt(op, b, x, nx - 1, j);
    for (let k = row + nx - 2; k > row; k--) relaxInterior(coef, nx, fivePoint, b, x, k);
    relaxAt(op, b, x, 0, j);
  }
}

/**
 * The first forward sweep of a cycle, from x = 0, and the residual r = b − A x it leaves.
 * Nodes after k in lexicographic order are still zero when k is relaxed, so only the west and
 * south couplings (and the south diagonals of a 9-point operator) enter the update; afterwards
 * each node's own equation holds except for those later neighbours, so r_k = −Σ_later a_kl x_l.
 * Same result as x = 0, a forward Gauss–Seidel sweep and r = b − A x, at about half the work.
 */
function forwardFromZero(op: Stencil9, b: Float64Array, x: Float64Array, r: Float64Array): void {
  const { nx, ny, coef, fivePoint } = op;
  x.fill(0);
  for (let j = 0; j < ny; j++) {
    if (j === 0 || j === ny - 1 || nx < 3) {
      for (let i = 0; i < nx; i++) relaxAt(op, b, x, i, j);
      continue;
    }
    const row = nx * j;
    relaxAt(op, b, x, 0, j);
    if (fivePoint) {
      for (let k = row + 1; k < row + nx - 1; k++) {
        const c = 9 * k;
        x[k] = (b[k] - coef[c + 3] * x[k - 1] - coef[c + 1] * x[k - nx]) / coef[c + 4];
      }
    } else {
      for (let k = row + 1; k < row + nx - 1; k++) {
        const c = 9 * k;
        const d = k - nx;
        x[k] = (b[k] - coef[c + 3] * x[k - 1] - coef[c] * x[d - 1] - coef[c + 1] * x[d] - coef[c + 2] * x[d + 1]) / coef[c + 4];
      }
    }
    relaxAt(op, b, x, nx - 1, j);
  }
  for (let j = 0; j < ny; j++) {
    const hasN = j < ny - 1;
    if (fivePoint && hasN) {
      const row = nx * j;
      for (let k = row; k < row + nx - 1; k++) r[k] = -(coef[9 * k + 5] * x[k + 1] + coef[9 * k + 7] * x[k + nx]);
      const k = row + nx - 1;
      r[k] = -coef[9 * k + 7] * x[k + nx];
      continue;
    }
    if (hasN && nx >= 3) {
      const row = nx * j;
      for (let k = row + 1; k < row + nx - 1; k++) {
        const c = 9 * k;
        const u = k + nx;
        r[k] = -(coef[c + 5] * x[k + 1] + coef[c + 6] * x[u - 1] + coef[c + 7] * x[u] + coef[c + 8] * x[u + 1]);
      }
      r[row] = -(coef[9 * row + 5] * x[row + 1] + coef[9 * row + 7] * x[row + nx] + coef[9 * row + 8] * x[row + nx + 1]);
      const k = row + nx - 1;
      r[k] = -(coef[9 * k + 6] * x[k + nx - 1] + coef[9 * k + 7] * x[k + nx]);
      continue;
    }
    for (let i = 0; i < nx; i++) {
      const k = i + nx * j;
      const c = 9 * k;
      const hasE = i < nx - 1;
      let s = hasE ? coef[c + 5] * x[k + 1] : 0;
      if (hasN) {
        const u = k + nx;
        s += coef[c + 7] * x[u];
        if (!fivePoint) {
          if (i > 0) s += coef[c + 6] * x[u - 1];
          if (hasE) s += coef[c + 8] * x[u + 1];
        }
      }
      r[k] = -s;
    }
  }
}

/** Banded Cholesky of the coarsest operator, ordered along its shorter axis first to keep the band narrow. */
function factorCoarsest(op: Stencil9): Coarsest {
  const { nx, ny, coef } = op;
  const n = nx * ny;
  const xFast = nx <= ny;
  const short = xFast ? nx : ny;
  const bw = short + 1;
  // order[p] = grid index of position p; pos[k] = position of grid index k.
  const order = new Int32Array(n);
  const pos = new Int32Array(n);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const p = xFast ? i + nx * j : j + ny * i;
      order[p] = i + nx * j;
      pos[i + nx * j] = p;
    }
  }
  const w = bw + 1;
  // L stored as band: L[p][p - q] at factor[p * w + (p - q)], 0 ≤ p − q ≤ bw.
  const factor = new Float64Array(n * w);
  for (let k = 0; k < n; k++) {
    const i = k % nx;
    const j = (k - i) / nx;
    for (let s = 0; s < 9; s++) {
      const gi = i + (s % 3) - 1;
      const gj = j + Math.floor(s / 3) - 1;
      if (gi < 0 || gi >= nx || gj < 0 || gj >= ny) continue;
      const p = pos[k];
      const q = pos[gi + nx * gj];
      if (q <= p) factor[p * w + (p - q)] += coef[9 * k + s];
    }
  }
  for (let p = 0; p < n; p++) {
    for (let q = Math.max(0, p - bw); q <= p; q++) {
      let s = factor[p * w + (p - q)];
      for (let r = Math.max(0, p - bw, q - bw); r < q; r++) s -= factor[p * w + (p - r)] * factor[q * w + (q - r)];
      factor[p * w + (p - q)] = p === q ? Math.sqrt(s) : s / factor[q * w];
    }
  }
  return { op, factor, bw, order, work: new Float64Array(n) };
}

function solveCoarsest(c: Coarsest, b: Float64Array, x: Float64Array): void {
  const { factor, bw, order, work } = c;
  const n = order.length;
  const w = bw + 1;
  for (let p = 0; p < n; p++) {
    let s = b[order[p]];
    for (let r = Math.max(0, p - bw); r < p; r++) s -= factor[p * w + (p - r)] * work[r];
    work[p] = s / factor[p * w];
  }
  for (let p = n - 1; p >= 0; p--) {
    let s = work[p];
    for (let r = p + 1; r <= Math.min(n - 1, p + bw); r++) s -= factor[r * w + (r - p)] * work[r];
    work[p] = s / factor[p * w];
  }
  for (let p = 0; p < n; p++) x[order[p]] = work[p];
}

/**
 * Builds the V-cycle hierarchy of a symmetric positive-definite stencil operator: coarsen while
 * both sides keep at least 4 nodes and the grid has more than 100 nodes.
 */
export function buildMultigrid(op: Stencil9): MultigridPreconditioner {
  const levels: Level[] = [];
  let current = op;
  while (Math.min(current.nx, current.ny) >= 4 && current.nx * current.ny > 100) {
    const coarse = galerkin(current);
    levels.push({
      op: current,
      r: new Float64Array(current.nx * current.ny),
      ax: axisWeights(current.nx, coarse.nx),
      ay: axisWeights(current.ny, coarse.ny),
    });
    current = coarse;
  }
  const coarsest = factorCoarsest(current);
  const xs = [...levels.map((l) => new Float64Array(l.op.nx * l.op.ny)), new Float64Array(current.nx * current.ny)];
  const bs = [...xs.map((x) => new Float64Array(x.length))];

  const cycle = (depth: number, b: Float64Array, x: Float64Array): void => {
    if (depth === levels.length) {
      solveCoarsest(coarsest, b, x);
      return;
    }
    const { op: a, r, ax, ay } = levels[depth];
    forwardFromZero(a, b, x, r);
    const next = depth + 1 < levels.length ? levels[depth + 1].op : coarsest.op;
    const bc = bs[depth + 1];
    const xc = xs[depth + 1];
    restrict(r, a.nx, a.ny, bc, next.nx, next.ny);
    cycle(depth + 1, bc, xc);
    prolongAdd(xc, next.nx, ax, ay, x, a.nx, a.ny);
    gaussSeidelBackward(a, b, x);
  };

  return { levels: levels.length + 1, apply: (b, x) => cycle(0, b, x) };
}
