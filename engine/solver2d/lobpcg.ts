/**
 * Locally optimal block preconditioned conjugate gradient (LOBPCG) for the lowest eigenpairs of a
 * symmetric operator: A. V. Knyazev, SIAM J. Sci. Comput. 23, 517 (2001), with soft locking and a
 * Rayleigh–Ritz step on the generalised projected problem (SᵀAS) c = λ (SᵀS) c. Its Gram matrix
 * is factored by a Cholesky that leaves out columns nearly in the span of earlier ones, a guard
 * against the ill-conditioning of [X, W, P] near convergence analysed by U. Hetmaniuk and
 * R. Lehoucq, J. Comput. Phys. 218, 324 (2006).
 *
 * The vectors of [X, W, P] and their images under A sit in contiguous column-major arrays, and
 * the Gram products and linear combinations sweep all columns over one cache-sized block of rows
 * at a time, in 2 × 4 register tiles, so each column is read from memory about once per product
 * instead of once per pair. Each Ritz vector's [W, P] part, which is the next P of an active
 * vector, is formed once and added to its X part, rather than combining all columns again for X.
 * When the problem offers block forms of the operator and the preconditioner (applyBlock,
 * preconditionBlock), each is applied to all the new columns at once. No vector of the problem's
 * length is allocated inside the iteration.
 */
import { symmetricEigen } from './dense.js';

/** Outcome of an LOBPCG run; vectors are orthonormal in the plain Euclidean inner product. */
export interface LobpcgResult {
  readonly values: Float64Array;
  readonly vectors: readonly Float64Array[];
  readonly iterations: number;
  readonly converged: boolean;
  /** The guard vectors of the block after the last step (not converged; a warm start for a nearby operator). */
  readonly guards: readonly Float64Array[];
}

export interface LobpcgProblem {
  /** y = A x. */
  readonly apply: (x: Float64Array, y: Float64Array) => void;
  /** y[k] = A x[k] for several vectors at once, when that can share work between them; used instead of `apply` when given. */
  readonly applyBlock?: (x: readonly Float64Array[], y: readonly Float64Array[]) => void;
  /** w ≈ T r with T symmetric positive definite (a preconditioner). */
  readonly precondition: (r: Float64Array, w: Float64Array) => void;
  /** The same T on several vectors at once, w[k] ≈ T r[k] with w[k] possibly r[k], when it can share work between them; used instead of `precondition` when given. */
  readonly preconditionBlock?: (r: readonly Float64Array[], w: readonly Float64Array[]) => void;
  /** Start block (its size is the block size; at least `count` vectors, linearly independent). */
  readonly start: readonly Float64Array[];
  /** Number of wanted (lowest) eigenpairs; the remaining block vectors are guards. */
  readonly count: number;
  /** Convergence when ‖A x − λ x‖₂ ≤ tolerance for every wanted pair (units of A). */
  readonly tolerance: number;
  readonly maxIterations: number;
}

/**
 * A column is left out of the Rayleigh–Ritz basis when less than this fraction of its squared
 * norm lies outside the span of the columns before it: the Gram matrix then keeps a condition
 * number near 1e8 at worst, and the Ritz vectors stay orthonormal to about 1e-9.
 */
const DEPENDENT = 1e-8;

/**
 * Rows per cache block: the kernels below sweep all columns of the basis over one block of rows
 * before the next, so the 2 × 3b columns of S and AS (≈ 200 kB for b = 8) are read from cache
 * instead of once per output column from memory (measured 3–5× faster at n = 14 400).
 */
const CHUNK = 1024;

/**
 * out[4r + t] += Σ_{k0 ≤ k < k1} a_r[k] b_t[k] for r = 0, 1 and t = 0..3: a 2 × 4 tile of dot
 * products, six loads per eight multiply-adds, eight sums the JIT keeps in registers.
 */
function dot2x4(
  a0: Float64Array,
  a1: Float64Array,
  b0: Float64Array,
  b1: Float64Array,
  b2: Float64Array,
  b3: Float64Array,
  k0: number,
  k1: number,
  out: Float64Array,
): void {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let t0 = 0;
  let t1 = 0;
  let t2 = 0;
  let t3 = 0;
  for (let k = k0; k < k1; k++) {
    const x = a0[k];
    const y = a1[k];
    const u0 = b0[k];
    const u1 = b1[k];
    const u2 = b2[k];
    const u3 = b3[k];
    s0 += x * u0;
    s1 += x * u1;
    s2 += x * u2;
    s3 += x * u3;
    t0 += y * u0;
    t1 += y * u1;
    t2 += y * u2;
    t3 += y * u3;
  }
  out[0] += s0;
  out[1] += s1;
  out[2] += s2;
  out[3] += s3;
  out[4] += t0;
  out[5] += t1;
  out[6] += t2;
  out[7] += t3;
}

/**
 * out0[k] += Σ_s c0[s] src[s][k] and out1[k] += Σ_s c1[s] src[s][k] on rows k0 ≤ k < k1: each
 * group of four sources is read once for both outputs (out1 is a scratch vector, c1 zero, when
 * only one output is wanted).
 */
function combine2(out0: Float64Array, out1: Float64Array, src: readonly Float64Array[], c0: Float64Array, c1: Float64Array, k0: number, k1: number): void {
  const m = src.length;
  for (let s = 0; s < m; s += 4) {
    const last = m - 1;
    const a0 = src[s];
    const a1 = src[Math.min(s + 1, last)];
    const a2 = src[Math.min(s + 2, last)];
    const a3 = src[Math.min(s + 3, last)];
    // Sources past the end repeat the last one with weight zero.
    const p0 = c0[s];
    const p1 = s + 1 < m ? c0[s + 1] : 0;
    const p2 = s + 2 < m ? c0[s + 2] : 0;
    const p3 = s + 3 < m ? c0[s + 3] : 0;
    const q0 = c1[s];
    const q1 = s + 1 < m ? c1[s + 1] : 0;
    const q2 = s + 2 < m ? c1[s + 2] : 0;
    const q3 = s + 3 < m ? c1[s + 3] : 0;
    for (let k = k0; k < k1; k++) {
      const x0 = a0[k];
      const x1 = a1[k];
      const x2 = a2[k];
      const x3 = a3[k];
      out0[k] += p0 * x0 + p1 * x1 + p2 * x2 + p3 * x3;
      out1[k] += q0 * x0 + q1 * x1 + q2 * x2 + q3 * x3;
    }
  }
}

/**
 * outs[k] = Σ_s y[(first + s)·stride + col[k]] src[s] for every k, in one cache-blocked sweep
 * (y row-major with `stride` columns); `spare` is a scratch vector of the same length.
 */
function combineAll(
  outs: readonly Float64Array[],
  src: readonly Float64Array[],
  y: Float64Array,
  stride: number,
  first: number,
  col: readonly number[],
  spare: Float64Array,
): void {
  const m = src.length;
  const c = outs.map((_, k) => {
    const v = new Float64Array(m);
    for (let s = 0; s < m; s++) v[s] = y[(first + s) * stride + col[k]];
    return v;
  });
  for (const o of outs) o.fill(0);
  const n = src[0].length;
  // An odd output pairs with the scratch vector `spare` and zero weights.
  const zero = new Float64Array(m);
  for (let k0 = 0; k0 < n; k0 += CHUNK) {
    const k1 = Math.min(n, k0 + CHUNK);
    for (let k = 0; k < outs.length; k += 2) {
      if (k + 1 < outs.length) combine2(outs[k], outs[k + 1], src, c[k], c[k + 1], k0, k1);
      else combine2(outs[k], spare, src, c[k], zero, k0, k1);
    }
  }
}

/**
 * Adds rows k0 ≤ k < k1 of the 2 × 4 tile (i, i + 1) × (j … j + 3) of Sᵀv to the upper triangle
 * of out (m × m); indices past m repeat the last column and their sums are dropped.
 */
function gramTile(S: readonly Float64Array[], v: readonly Float64Array[], out: Float64Array, tile: Float64Array, i: number, j: number, k0: number, k1: number): void {
  const m = S.length;
  const last = m - 1;
  tile.fill(0);
  dot2x4(S[i], S[Math.min(i + 1, last)], v[j], v[Math.min(j + 1, last)], v[Math.min(j + 2, last)], v[Math.min(j + 3, last)], k0, k1, tile);
  for (let r = 0; r < 2 && i + r < m; r++) {
    for (let t = 0; t < 4 && j + t < m; t++) if (j + t >= i + r) out[(i + r) * m + j + t] += tile[4 * r + t];
  }
}

/**
 * Upper triangle (j ≥ i, j ≥ known) of the m × m matrices g = SᵀS and h = SᵀAS, in one
 * cache-blocked sweep; the leading known × known blocks are left to the caller.
 */
function gramUpper(S: readonly Float64Array[], AS: readonly Float64Array[], known: number, g: Float64Array, h: Float64Array): void {
  const m = S.length;
  const n = S[0].length;
  const tile = new Float64Array(8);
  for (let k0 = 0; k0 < n; k0 += CHUNK) {
    const k1 = Math.min(n, k0 + CHUNK);
    for (let i = 0; i < m; i += 2) {
      for (let j = Math.max(i, known); j < m; j += 4) {
        gramTile(S, S, g, tile, i, j, k0, k1);
        gramTile(S, AS, h, tile, i, j, k0, k1);
      }
    }
  }
}

/**
 * r = Ax − λx from the vector x and its image ax; returns ‖r‖². Hot loops live in small functions
 * like this one: inside the large lobpcg body a deoptimisation leaves them unoptimised for a while,
 * boxing every intermediate double (with this loop and addTo's inline, each of the first ten
 * 120 × 120 solves made 15 MB of garbage; 5 MB without).
 */
function residual(ax: Float64Array, x: Float64Array, lambda: number, r: Float64Array): number {
  let s = 0;
  for (let q = 0; q < x.length; q++) {
    const t = ax[q] - lambda * x[q];
    r[q] = t;
    s += t * t;
  }
  return s;
}

/** x += y. */
function addTo(x: Float64Array, y: Float64Array): void {
  for (let q = 0; q < x.length; q++) x[q] += y[q];
}

/** Column views of a block [X, W, P] and of its image under A. */
interface Block {
  readonly v: readonly Float64Array[];
  readonly av: readonly Float64Array[];
}

/** `cols` column views into one contiguous n × cols array (column-major), and the same for the image. */
function columns(n: number, cols: number): Block {
  const data = new Float64Array(n * cols);
  const image = new Float64Array(n * cols);
  return {
    v: Array.from({ length: cols }, (_, c) => data.subarray(c * n, (c + 1) * n)),
    av: Array.from({ length: cols }, (_, c) => image.subarray(c * n, (c + 1) * n)),
  };
}

/** Lowest `keep` Ritz pairs of the span of the given columns, as coefficients over the columns kept. */
interface Ritz {
  readonly values: Float64Array;
  /** Columns of the block that entered the basis (block column numbers, ascending). */
  readonly kept: readonly number[];
  /** Coefficients, kept.length × keep row-major: Ritz vector k = Σ_s y[s·keep + k] column kept[s]. */
  readonly y: Float64Array;
}

/**
 * Rayleigh–Ritz on the span of block columns `cols`, of which the first known.length are Ritz
 * vectors with values `known`: G = SᵀS and H = SᵀAS by tiled dots, a diagonal scaling to unit
 * diag(G), a Cholesky G = LLᵀ that skips dependent columns, the standard problem
 * L⁻¹HL⁻ᵀ z = λ z by Jacobi, and c = L⁻ᵀ z.
 */
function rayleighRitz(block: Block, cols: readonly number[], keep: number, known: Float64Array): Ritz {
  const m = cols.length;
  const S = cols.map((c) => block.v[c]);
  const AS = cols.map((c) => block.av[c]);
  const g = new Float64Array(m * m);
  const h = new Float64Array(m * m);
  gramUpper(S, AS, known.length, g, h);
  // Leading columns that are Ritz vectors of the last step: XᵀX = I and XᵀAX = Λ to rounding.
  for (let i = 0; i < known.length; i++) {
    g[i * m + i] = 1;
    h[i * m + i] = known[i];
  }
  const d = new Float64Array(m);
  for (let i = 0; i < m; i++) d[i] = g[i * m + i] > 0 ? 1 / Math.sqrt(g[i * m + i]) : 0;
  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      const s = d[i] * d[j];
      g[i * m + j] *= s;
      h[i * m + j] *= s;
      g[j * m + i] = g[i * m + j];
      h[j * m + i] = h[i * m + j];
    }
  }
  // Up-looking Cholesky over the columns kept so far; L is q × q row-major with stride m.
  const kept: number[] = [];
  const L = new Float64Array(m * m);
  const row = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    if (d[j] === 0) continue;
    const q = kept.length;
    let rest = g[j * m + j];
    for (let r = 0; r < q; r++) {
      let s = g[kept[r] * m + j];
      for (let t = 0; t < r; t++) s -= L[r * m + t] * row[t];
      row[r] = s / L[r * m + r];
      rest -= row[r] * row[r];
    }
    if (!(rest > DEPENDENT * g[j * m + j])) continue;
    for (let t = 0; t < q; t++) L[q * m + t] = row[t];
    L[q * m + q] = Math.sqrt(rest);
    kept.push(j);
  }
  const q = kept.length;
  // C = L⁻¹ H L⁻ᵀ: first Z = L⁻¹ H (rows of kept), then C = L⁻¹ Zᵀ (H symmetric).
  const z = new Float64Array(q * q);
  for (let c = 0; c < q; c++) {
    for (let r = 0; r < q; r++) {
      let s = h[kept[r] * m + kept[c]];
      for (let t = 0; t < r; t++) s -= L[r * m + t] * z[t * q + c];
      z[r * q + c] = s / L[r * m + r];
    }
  }
  const cm = new Float64Array(q * q);
  for (let c = 0; c < q; c++) {
    for (let r = 0; r < q; r++) {
      let s = z[c * q + r];
      for (let t = 0; t < r; t++) s -= L[r * m + t] * cm[t * q + c];
      cm[r * q + c] = s / L[r * m + r];
    }
  }
  const eig = symmetricEigen(cm, q);
  const take = Math.min(keep, q);
  const y = new Float64Array(q * take);
  for (let k = 0; k < take; k++) {
    for (let r = q - 1; r >= 0; r--) {
      let s = eig.vectors[r * q + k];
      for (let t = r + 1; t < q; t++) s -= L[t * m + r] * y[t * take + k];
      y[r * take + k] = s / L[r * m + r];
    }
  }
  for (let r = 0; r < q; r++) for (let k = 0; k < take; k++) y[r * take + k] *= d[kept[r]];
  return { values: eig.values.slice(0, take), kept: kept.map((s) => cols[s]), y };
}

/**
 * Lowest `count` eigenpairs of a symmetric operator by LOBPCG.
 *
 * Each iteration: residuals R = AX − XΛ; soft locking keeps converged wanted vectors in X but
 * drops their W and P directions; W = T R for the active vectors and AW by the operator; the
 * Rayleigh–Ritz step on span[X, W, P] (columns nearly dependent on earlier ones left out) gives
 * X ← the lowest Ritz vectors and P ← the [W, P] part of each
 * active Ritz vector (Knyazev's conjugate direction), with AX and AP from the operator.
 */
export function lobpcg(problem: LobpcgProblem): LobpcgResult {
  const { apply, precondition, count, tolerance, maxIterations } = problem;
  const nb = problem.start.length;
  const n = problem.start[0].length;
  // Columns [0, nb) hold X, [nb, 2nb) W, [2nb, 3nb) P. The next X and P are built in a second
  // X/P store while the current one is read; W is shared (10b vectors in all, with images).
  const xp = [columns(n, 2 * nb), columns(n, 2 * nb)];
  const w = columns(n, nb);
  const assemble = (s: Block): Block => ({
    v: [...s.v.slice(0, nb), ...w.v, ...s.v.slice(nb)],
    av: [...s.av.slice(0, nb), ...w.av, ...s.av.slice(nb)],
  });
  let cur = assemble(xp[0]);
  let next = assemble(xp[1]);
  const spare = new Float64Array(n);
  const applyAll = (x: readonly Float64Array[], y: readonly Float64Array[]): void => {
    if (problem.applyBlock) problem.applyBlock(x, y);
    else x.forEach((v, k) => apply(v, y[k]));
  };

  const startCols = Array.from({ length: nb }, (_, k) => k);
  problem.start.forEach((s, k) => cur.v[k].set(s));
  applyAll(cur.v.slice(0, nb), cur.av.slice(0, nb));
  // AX and AP come from the operator, not from combining AS: a 5-point sweep costs less than
  // 3b multiply-adds per node and carries no accumulated rounding.
  const fill = (ritz: Ritz, active: readonly number[]): void => {
    const take = ritz.values.length;
    const S = ritz.kept.map((c) => cur.v[c]);
    const rows = Array.from({ length: take }, (_, k) => k);
    const first = ritz.kept.findIndex((c) => c >= nb);
    if (first < 0 || active.length === 0) {
      combineAll(next.v.slice(0, take), S, ritz.y, take, 0, rows, spare);
      applyAll(next.v.slice(0, take), next.av.slice(0, take));
      return;
    }
    // The [W, P] part of every Ritz vector, the active ones' in the first P slots (their next P),
    // the others' in the slots after them; then X = (X part) + that, one pass of first + 1 sources
    // instead of all m for X and again m − first for P.
    const order = [...active, ...rows.filter((k) => !active.includes(k))];
    const parts = order.map((_, a) => next.v[2 * nb + a]);
    combineAll(parts, S.slice(first), ritz.y, take, first, order, spare);
    combineAll(order.map((k) => next.v[k]), S.slice(0, first), ritz.y, take, 0, order, spare);
    order.forEach((k, a) => addTo(next.v[k], parts[a]));
    const fresh = [...rows, ...active.map((_, a) => 2 * nb + a)];
    applyAll(fresh.map((c) => next.v[c]), fresh.map((c) => next.av[c]));
  };
  const swap = (): void => {
    const t = cur;
    cur = next;
    next = t;
  };

  const first = rayleighRitz(cur, startCols, nb, new Float64Array(0));
  if (first.kept.length < nb) throw new RangeError(`lobpcg: start block is rank deficient (${first.kept.length} of ${nb})`);
  fill(first, []);
  swap();
  let lambda = first.values;
  let pCount = 0;
  let iterations = 0;
  let converged = false;

  for (; iterations <= maxIterations; iterations++) {
    const active: number[] = [];
    let wantedDone = true;
    // Each residual goes to the next free W column, which the next active vector takes over if this one has converged.
    for (let k = 0; k < nb; k++) {
      const done = Math.sqrt(residual(cur.av[k], cur.v[k], lambda[k], cur.v[nb + active.length])) <= tolerance;
      if (k < count && !done) wantedDone = false;
      if (k >= count || !done) active.push(k);
    }
    if (wantedDone) {
      converged = true;
      break;
    }
    if (iterations === maxIterations) break;

    const cols = Array.from({ length: nb }, (_, k) => k);
    // The residuals of the active vectors, preconditioned in place in the W columns.
    const search = active.map((_, a) => cur.v[nb + a]);
    if (problem.preconditionBlock) problem.preconditionBlock(search, search);
    else {
      for (const r of search) {
        spare.set(r);
        precondition(spare, r);
      }
    }
    applyAll(search, cur.av.slice(nb, nb + active.length));
    active.forEach((_, a) => cols.push(nb + a));
    for (let a = 0; a < pCount; a++) cols.push(2 * nb + a);

    const ritz = rayleighRitz(cur, cols, nb, lambda);
    if (ritz.values.length < nb) break;
    fill(ritz, active);
    swap();
    lambda = ritz.values;
    const searchKept = ritz.kept.some((c) => c >= nb);
    pCount = searchKept ? active.length : 0;
    if (!searchKept) break;
  }
  return {
    values: Float64Array.from(lambda.subarray(0, count)),
    vectors: cur.v.slice(0, count).map((v) => Float64Array.from(v)),
    iterations,
    converged,
    guards: cur.v.slice(count, nb).map((v) => Float64Array.from(v)),
  };
}
