/**
 * Geometric multigrid V-cycle used as the preconditioner of the eigen-solver.
 *
 * Method (W. L. Briggs, V. E. Henson, S. F. McCormick, A Multigrid Tutorial, 2nd ed., SIAM 2000):
 * vertex-centred coarsening by two in each direction, bilinear interpolation P, restriction Pᵀ,
 * Galerkin coarse operators A_c = Pᵀ A P (which stay 9-point and keep the mass contrast of
 * the heterostructure without re-discretising it), one forward Gauss–Seidel sweep before and one
 * backward sweep after the coarse correction so the cycle is a symmetric positive-definite
 * operator, and an exact banded Cholesky solve on the coarsest grid.
 *
 * Four vectors go through the cycle together, interleaved node by node (entry LANES·k + lane):
 * each coefficient is loaded once for four updates and the four Gauss–Seidel recurrences overlap
 * (with the smoother multiplying by a stored 1/diagonal, four vectors took 1.9 ms on a 120 × 120
 * grid against 3.3 ms one at a time). A group of fewer than four leaves the other lanes at zero.
 */
import type { Stencil9 } from './operator.js';

/** Vectors that share one pass through the cycle. */
const LANES = 4;

interface Level {
  readonly op: Stencil9;
  /** 1/diagonal of op: the smoother multiplies, as a division in its sequential chain costs several times a multiplication. */
  readonly inv: Float64Array;
  /** Residual after the forward sweep (LANES per node). */
  readonly r: Float64Array;
  /** Interpolation weights from the next coarser level, along x and y. */
  readonly ax: Axis;
  readonly ay: Axis;
  /** The next coarser level's rows interpolated along x (its ny × this nx nodes, LANES per node). */
  readonly rows: Float64Array;
}

interface Coarsest {
  readonly op: Stencil9;
  /** Banded Cholesky factor (lower, row-major band of width bw + 1) in the short-axis-first order. */
  readonly factor: Float64Array;
  readonly bw: number;
  readonly order: Int32Array;
  /** LANES per position. */
  readonly work: Float64Array;
}

/** A V-cycle approximating A⁻¹ for a symmetric positive-definite stencil operator A. */
export interface MultigridPreconditioner {
  readonly levels: number;
  /** x[k] ≈ A⁻¹ b[k] for every k by one V-cycle from zero; x[k] is overwritten and may be b[k]. */
  readonly apply: (b: readonly Float64Array[], x: readonly Float64Array[]) => void;
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

/**
 * Galerkin coarse operator Pᵀ A P for bilinear P (closes on 9 points, see the module comment),
 * one axis at a time as P = P_y ⊗ P_x: first T = P_xᵀ A P_x, coarse along x and still fine along
 * y (ncx × ny nodes, couplings dI, dy ∈ {−1, 0, 1}), then P_yᵀ T P_y. An end of a coupling has at
 * most two parents along the axis at hand (the tables ax, ay), and two short passes cost less than
 * one pass over all parent pairs of both axes.
 */
function galerkin(op: Stencil9, ax: Axis, ay: Axis): Stencil9 {
  const { nx, ny, coef } = op;
  const ncx = Math.floor(nx / 2);
  const ncy = Math.floor(ny / 2);
  // T at 9·(I + ncx·fy) + 3·(dy + 1) + dI + 1.
  const t = new Float64Array(9 * ncx * ny);
  for (let fy = 0; fy < ny; fy++) {
    for (let fx = 0; fx < nx; fx++) {
      const fc = 9 * (fx + nx * fy);
      for (let s = 0; s < 9; s++) {
        const val = coef[fc + s];
        if (val === 0) continue;
        const gx = fx + (s % 3) - 1;
        const dy = ((s / 3) | 0) - 1;
        if (gx < 0 || gx >= nx || fy + dy < 0 || fy + dy >= ny) continue;
        for (let p = 0; p < 2; p++) {
          const wf = p === 0 ? ax.w0[fx] : ax.w1[fx];
          if (wf === 0) continue;
          const i0 = p === 0 ? ax.c0[fx] : ax.c1[fx];
          const base = 9 * (i0 + ncx * fy) + 3 * (dy + 1) + 1 - i0;
          const v = wf * val;
          if (ax.w0[gx] !== 0) t[base + ax.c0[gx]] += v * ax.w0[gx];
          if (ax.w1[gx] !== 0) t[base + ax.c1[gx]] += v * ax.w1[gx];
        }
      }
    }
  }
  const out = new Float64Array(9 * ncx * ncy);
  for (let fy = 0; fy < ny; fy++) {
    for (let i = 0; i < ncx; i++) {
      const tc = 9 * (i + ncx * fy);
      for (let s = 0; s < 9; s++) {
        const val = t[tc + s];
        if (val === 0) continue;
        const gy = fy + ((s / 3) | 0) - 1;
        for (let p = 0; p < 2; p++) {
          const wf = p === 0 ? ay.w0[fy] : ay.w1[fy];
          if (wf === 0) continue;
          const j0 = p === 0 ? ay.c0[fy] : ay.c1[fy];
          const base = 9 * (i + ncx * j0) + (s % 3) + 3 - 3 * j0;
          const v = wf * val;
          if (ay.w0[gy] !== 0) out[base + 3 * ay.c0[gy]] += v * ay.w0[gy];
          if (ay.w1[gy] !== 0) out[base + 3 * ay.c1[gy]] += v * ay.w1[gy];
        }
      }
    }
  }
  return { nx: ncx, ny: ncy, coef: out, fivePoint: false };
}

/** coarse ← Pᵀ fine (restriction) onto the coarse grid of size ncx × ncy, all lanes. */
function restrict(fine: Float64Array, nx: number, ny: number, coarse: Float64Array, ncx: number, ncy: number): void {
  for (let J = 0; J < ncy; J++) {
    for (let I = 0; I < ncx; I++) {
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      const fx = 2 * I + 1;
      const east = fx + 1 < nx;
      for (let b = -1; b <= 1; b++) {
        const fy = 2 * J + 1 + b;
        if (fy >= ny) continue;
        const wy = b === 0 ? 1 : 0.5;
        const o = LANES * (nx * fy + fx);
        let t0 = fine[o] + 0.5 * fine[o - 4];
        let t1 = fine[o + 1] + 0.5 * fine[o - 3];
        let t2 = fine[o + 2] + 0.5 * fine[o - 2];
        let t3 = fine[o + 3] + 0.5 * fine[o - 1];
        if (east) {
          t0 += 0.5 * fine[o + 4];
          t1 += 0.5 * fine[o + 5];
          t2 += 0.5 * fine[o + 6];
          t3 += 0.5 * fine[o + 7];
        }
        s0 += wy * t0;
        s1 += wy * t1;
        s2 += wy * t2;
        s3 += wy * t3;
      }
      const c = LANES * (I + ncx * J);
      coarse[c] = s0;
      coarse[c + 1] = s1;
      coarse[c + 2] = s2;
      coarse[c + 3] = s3;
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

/**
 * fine ← fine + P coarse: bilinear interpolation from the grid of coarse nodes at fine indices
 * 2I + 1, first along x for each coarse row (into `rows`, ncy × nx nodes), then between rows along y.
 */
function prolongAdd(coarse: Float64Array, ncx: number, ncy: number, ax: Axis, ay: Axis, fine: Float64Array, nx: number, ny: number, rows: Float64Array): void {
  const { c0: xc0, c1: xc1, w0: xw0, w1: xw1 } = ax;
  for (let j = 0; j < ncy; j++) {
    for (let fx = 0; fx < nx; fx++) {
      const a = LANES * (ncx * j + xc0[fx]);
      const b = LANES * (ncx * j + xc1[fx]);
      const w0 = xw0[fx];
      const w1 = xw1[fx];
      const o = LANES * (nx * j + fx);
      rows[o] = w0 * coarse[a] + w1 * coarse[b];
      rows[o + 1] = w0 * coarse[a + 1] + w1 * coarse[b + 1];
      rows[o + 2] = w0 * coarse[a + 2] + w1 * coarse[b + 2];
      rows[o + 3] = w0 * coarse[a + 3] + w1 * coarse[b + 3];
    }
  }
  for (let fy = 0; fy < ny; fy++) {
    const r0 = LANES * nx * ay.c0[fy];
    const r1 = LANES * nx * ay.c1[fy];
    const v0 = ay.w0[fy];
    const v1 = ay.w1[fy];
    const row = LANES * nx * fy;
    for (let q = 0; q < LANES * nx; q++) fine[row + q] += v0 * rows[r0 + q] + v1 * rows[r1 + q];
  }
}

/** Gauss–Seidel update of node (i, j) of A x = b in every lane, skipping neighbours outside the grid. */
function relaxAt(op: Stencil9, inv: Float64Array, b: Float64Array, x: Float64Array, i: number, j: number): void {
  const { nx, ny, coef } = op;
  const k = i + nx * j;
  const c = 9 * k;
  const o = LANES * k;
  let s0 = b[o];
  let s1 = b[o + 1];
  let s2 = b[o + 2];
  let s3 = b[o + 3];
  for (let dj = -1; dj <= 1; dj++) {
    if (j + dj < 0 || j + dj >= ny) continue;
    for (let di = -1; di <= 1; di++) {
      if ((di === 0 && dj === 0) || i + di < 0 || i + di >= nx) continue;
      const a = coef[c + 3 * (dj + 1) + di + 1];
      const q = o + LANES * (di + nx * dj);
      s0 -= a * x[q];
      s1 -= a * x[q + 1];
      s2 -= a * x[q + 2];
      s3 -= a * x[q + 3];
    }
  }
  const d = inv[k];
  x[o] = s0 * d;
  x[o + 1] = s1 * d;
  x[o + 2] = s2 * d;
  x[o + 3] = s3 * d;
}

/** One backward (reverse lexicographic) Gauss–Seidel sweep on A x = b; border nodes take the checked path. */
function gaussSeidelBackward(op: Stencil9, inv: Float64Array, b: Float64Array, x: Float64Array): void {
  const { nx, ny, coef, fivePoint } = op;
  const up = LANES * nx;
  for (let j = ny - 1; j >= 0; j--) {
    if (j === 0 || j === ny - 1 || nx < 3) {
      for (let i = nx - 1; i >= 0; i--) relaxAt(op, inv, b, x, i, j);
      continue;
    }
    const row = nx * j;
    relaxAt(op, inv, b, x, nx - 1, j);
    for (let k = row + nx - 2; k > row; k--) {
      const c = 9 * k;
      const o = LANES * k;
      const w = coef[c + 3];
      const e = coef[c + 5];
      const s = coef[c + 1];
      const n = coef[c + 7];
      let s0 = b[o] - w * x[o - 4] - e * x[o + 4] - s * x[o - up] - n * x[o + up];
      let s1 = b[o + 1] - w * x[o - 3] - e * x[o + 5] - s * x[o + 1 - up] - n * x[o + 1 + up];
      let s2 = b[o + 2] - w * x[o - 2] - e * x[o + 6] - s * x[o + 2 - up] - n * x[o + 2 + up];
      let s3 = b[o + 3] - w * x[o - 1] - e * x[o + 7] - s * x[o + 3 - up] - n * x[o + 3 + up];
      if (!fivePoint) {
        const sw = coef[c];
        const se = coef[c + 2];
        const nw = coef[c + 6];
        const ne = coef[c + 8];
        const d = o - up;
        const u = o + up;
        s0 -= sw * x[d - 4] + se * x[d + 4] + nw * x[u - 4] + ne * x[u + 4];
        s1 -= sw * x[d - 3] + se * x[d + 5] + nw * x[u - 3] + ne * x[u + 5];
        s2 -= sw * x[d - 2] + se * x[d + 6] + nw * x[u - 2] + ne * x[u + 6];
        s3 -= sw * x[d - 1] + se * x[d + 7] + nw * x[u - 1] + ne * x[u + 7];
      }
      const iv = inv[k];
      x[o] = s0 * iv;
      x[o + 1] = s1 * iv;
      x[o + 2] = s2 * iv;
      x[o + 3] = s3 * iv;
    }
    relaxAt(op, inv, b, x, 0, j);
  }
}

/**
 * The first forward sweep of a cycle, from x = 0, and the residual r = b − A x it leaves.
 * Nodes after k in lexicographic order are still zero when k is relaxed, so only the west and
 * south couplings (and the south diagonals of a 9-point operator) enter the update; afterwards
 * each node's own equation holds except for those later neighbours, so r_k = −Σ_later a_kl x_l.
 * Same result as x = 0, a forward Gauss–Seidel sweep and r = b − A x, at about half the work.
 */
function forwardFromZero(op: Stencil9, inv: Float64Array, b: Float64Array, x: Float64Array, r: Float64Array): void {
  const { nx, ny, coef, fivePoint } = op;
  const up = LANES * nx;
  x.fill(0);
  for (let j = 0; j < ny; j++) {
    if (j === 0 || j === ny - 1 || nx < 3) {
      for (let i = 0; i < nx; i++) relaxAt(op, inv, b, x, i, j);
      continue;
    }
    const row = nx * j;
    relaxAt(op, inv, b, x, 0, j);
    for (let k = row + 1; k < row + nx - 1; k++) {
      const c = 9 * k;
      const o = LANES * k;
      const w = coef[c + 3];
      const s = coef[c + 1];
      let s0 = b[o] - w * x[o - 4] - s * x[o - up];
      let s1 = b[o + 1] - w * x[o - 3] - s * x[o + 1 - up];
      let s2 = b[o + 2] - w * x[o - 2] - s * x[o + 2 - up];
      let s3 = b[o + 3] - w * x[o - 1] - s * x[o + 3 - up];
      if (!fivePoint) {
        const sw = coef[c];
        const se = coef[c + 2];
        const d = o - up;
        s0 -= sw * x[d - 4] + se * x[d + 4];
        s1 -= sw * x[d - 3] + se * x[d + 5];
        s2 -= sw * x[d - 2] + se * x[d + 6];
        s3 -= sw * x[d - 1] + se * x[d + 7];
      }
      const iv = inv[k];
      x[o] = s0 * iv;
      x[o + 1] = s1 * iv;
      x[o + 2] = s2 * iv;
      x[o + 3] = s3 * iv;
    }
    relaxAt(op, inv, b, x, nx - 1, j);
  }
  // Later neighbours of node (i, j): east, and north-west, north, north-east on the row above.
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = i + nx * j;
      const c = 9 * k;
      const o = LANES * k;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      if (i < nx - 1) {
        const e = coef[c + 5];
        s0 += e * x[o + 4];
        s1 += e * x[o + 5];
        s2 += e * x[o + 6];
        s3 += e * x[o + 7];
      }
      if (j < ny - 1) {
        const u = o + up;
        const n = coef[c + 7];
        s0 += n * x[u];
        s1 += n * x[u + 1];
        s2 += n * x[u + 2];
        s3 += n * x[u + 3];
        if (!fivePoint && i > 0) {
          const nw = coef[c + 6];
          s0 += nw * x[u - 4];
          s1 += nw * x[u - 3];
          s2 += nw * x[u - 2];
          s3 += nw * x[u - 1];
        }
        if (!fivePoint && i < nx - 1) {
          const ne = coef[c + 8];
          s0 += ne * x[u + 4];
          s1 += ne * x[u + 5];
          s2 += ne * x[u + 6];
          s3 += ne * x[u + 7];
        }
      }
      r[o] = -s0;
      r[o + 1] = -s1;
      r[o + 2] = -s2;
      r[o + 3] = -s3;
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
  return { op, factor, bw, order, work: new Float64Array(LANES * n) };
}

function solveCoarsest(c: Coarsest, b: Float64Array, x: Float64Array): void {
  const { factor, bw, order, work } = c;
  const n = order.length;
  const w = bw + 1;
  for (let p = 0; p < n; p++) {
    const o = LANES * order[p];
    let s0 = b[o];
    let s1 = b[o + 1];
    let s2 = b[o + 2];
    let s3 = b[o + 3];
    for (let r = Math.max(0, p - bw); r < p; r++) {
      const f = factor[p * w + (p - r)];
      s0 -= f * work[LANES * r];
      s1 -= f * work[LANES * r + 1];
      s2 -= f * work[LANES * r + 2];
      s3 -= f * work[LANES * r + 3];
    }
    const d = factor[p * w];
    work[LANES * p] = s0 / d;
    work[LANES * p + 1] = s1 / d;
    work[LANES * p + 2] = s2 / d;
    work[LANES * p + 3] = s3 / d;
  }
  for (let p = n - 1; p >= 0; p--) {
    let s0 = work[LANES * p];
    let s1 = work[LANES * p + 1];
    let s2 = work[LANES * p + 2];
    let s3 = work[LANES * p + 3];
    for (let r = p + 1; r <= Math.min(n - 1, p + bw); r++) {
      const f = factor[r * w + (r - p)];
      s0 -= f * work[LANES * r];
      s1 -= f * work[LANES * r + 1];
      s2 -= f * work[LANES * r + 2];
      s3 -= f * work[LANES * r + 3];
    }
    const d = factor[p * w];
    work[LANES * p] = s0 / d;
    work[LANES * p + 1] = s1 / d;
    work[LANES * p + 2] = s2 / d;
    work[LANES * p + 3] = s3 / d;
  }
  for (let p = 0; p < n; p++) {
    const o = LANES * order[p];
    x[o] = work[LANES * p];
    x[o + 1] = work[LANES * p + 1];
    x[o + 2] = work[LANES * p + 2];
    x[o + 3] = work[LANES * p + 3];
  }
}

/** out[LANES·k + v] = column v at k, four columns in one pass. */
function interleave(c0: Float64Array, c1: Float64Array, c2: Float64Array, c3: Float64Array, out: Float64Array): void {
  for (let k = 0; k < c0.length; k++) {
    const o = LANES * k;
    out[o] = c0[k];
    out[o + 1] = c1[k];
    out[o + 2] = c2[k];
    out[o + 3] = c3[k];
  }
}

/** Column v at k = x[LANES·k + v], four columns in one pass. */
function deinterleave(x: Float64Array, c0: Float64Array, c1: Float64Array, c2: Float64Array, c3: Float64Array): void {
  for (let k = 0; k < c0.length; k++) {
    const o = LANES * k;
    c0[k] = x[o];
    c1[k] = x[o + 1];
    c2[k] = x[o + 2];
    c3[k] = x[o + 3];
  }
}

/**
 * Builds the V-cycle hierarchy of a symmetric positive-definite stencil operator: coarsen while
 * both sides keep at least 4 nodes and the grid has more than 100 nodes.
 */
export function buildMultigrid(op: Stencil9): MultigridPreconditioner {
  const levels: Level[] = [];
  let current = op;
  while (Math.min(current.nx, current.ny) >= 4 && current.nx * current.ny > 100) {
    const ax = axisWeights(current.nx, Math.floor(current.nx / 2));
    const ay = axisWeights(current.ny, Math.floor(current.ny / 2));
    const coarse = galerkin(current, ax, ay);
    const n = current.nx * current.ny;
    const inv = new Float64Array(n);
    for (let k = 0; k < n; k++) inv[k] = 1 / current.coef[9 * k + 4];
    levels.push({ op: current, inv, r: new Float64Array(LANES * n), ax, ay, rows: new Float64Array(LANES * coarse.ny * current.nx) });
    current = coarse;
  }
  const coarsest = factorCoarsest(current);
  const xs = [...levels.map((l) => new Float64Array(LANES * l.op.nx * l.op.ny)), new Float64Array(LANES * current.nx * current.ny)];
  const bs = xs.map((x) => new Float64Array(x.length));

  const cycle = (depth: number, b: Float64Array, x: Float64Array): void => {
    if (depth === levels.length) {
      solveCoarsest(coarsest, b, x);
      return;
    }
    const { op: a, inv, r, ax, ay, rows } = levels[depth];
    forwardFromZero(a, inv, b, x, r);
    const next = depth + 1 < levels.length ? levels[depth + 1].op : coarsest.op;
    const bc = bs[depth + 1];
    const xc = xs[depth + 1];
    restrict(r, a.nx, a.ny, bc, next.nx, next.ny);
    cycle(depth + 1, bc, xc);
    prolongAdd(xc, next.nx, next.ny, ax, ay, x, a.nx, a.ny, rows);
    gaussSeidelBackward(a, inv, b, x);
  };

  const n = op.nx * op.ny;
  // A group of fewer than LANES vectors reads zeros into the spare lanes and writes them to scratch.
  const zero = new Float64Array(n);
  const scratch = new Float64Array(n);
  const apply = (b: readonly Float64Array[], x: readonly Float64Array[]): void => {
    const column = (cols: readonly Float64Array[], k: number, spare: Float64Array): Float64Array => (k < cols.length ? cols[k] : spare);
    for (let g = 0; g < b.length; g += LANES) {
      interleave(column(b, g, zero), column(b, g + 1, zero), column(b, g + 2, zero), column(b, g + 3, zero), bs[0]);
      cycle(0, bs[0], xs[0]);
      deinterleave(xs[0], column(x, g, scratch), column(x, g + 1, scratch), column(x, g + 2, scratch), column(x, g + 3, scratch));
    }
  };
  return { levels: levels.length + 1, apply };
}
