/**
 * Highest eigenpairs of a real symmetric banded matrix: Sylvester inertia from a banded LDLᵀ
 * factorisation (spectrum slicing), bisection to isolate, and Rayleigh-quotient iteration with the
 * same factorisation for the vectors, warm-started from the previous k of a dispersion.
 *
 * Storage: lower band rows, entry (r, c) with r − bw ≤ c ≤ r at r·(bw + 1) + (r − c).
 * LDLᵀ without pivoting of A − σI: D's negative entries count the eigenvalues below σ (Sylvester's
 * law of inertia; the count is exact for a tridiagonal matrix in floating point, W. Kahan, and the
 * standard spectrum-slicing tool for banded ones, B. N. Parlett, The Symmetric Eigenvalue Problem,
 * SIAM 1998, Ch. 3). A zero pivot is replaced by a tiny one, the usual safeguard. Rayleigh-quotient
 * iteration converges cubically (Parlett, Ch. 4); each step is one factorisation and one solve,
 * O(n bw²). A warm-started answer is checked by a count — the values must be exactly the `count`
 * highest — else it is recomputed by bisection from scratch (the cold start).
 */

/** A real symmetric banded matrix in lower band storage. */
export interface Band {
  readonly n: number;
  readonly bw: number;
  readonly data: Float64Array;
}

/** Work arrays of one size, reused across calls so a dispersion allocates once. */
export interface BandWork {
  /** Unit lower factor, band layout. */
  readonly L: Float64Array;
  /** Reciprocal pivots 1/D. */
  readonly invD: Float64Array;
  /** Scratch of one band row. */
  readonly u: Float64Array;
  /** Scratch vector of length n. */
  readonly v: Float64Array;
}

export const bandWork = (n: number, bw: number): BandWork => ({
  // bw rows of zero padding past the end let the unrolled back substitution read beyond row n − 1.
  L: new Float64Array((n + bw) * (bw + 1)), invD: new Float64Array(n), u: new Float64Array(bw + 1), v: new Float64Array(n),
});

/**
 * LDLᵀ of A − σI into work.L (unit lower, band layout) and work.invD (the reciprocal pivots);
 * returns the number of negative pivots, i.e. of eigenvalues below σ.
 */
export function factor(A: Band, sigma: number, work: BandWork): number {
  if (A.bw === 3) return factor3(A, sigma, work);
  const { n, bw, data } = A;
  const s = bw + 1;
  const { L, invD, u } = work;
  let neg = 0;
  const tiny = 1e-300 + 1e-15 * (Math.abs(data[0]!) + Math.abs(sigma));
  for (let r = 0; r < n; r++) {
    const row = r * s;
    const c0 = r > bw ? r - bw : 0;
    // u[c − c0] = L(r, c) D(c): the value before the division by the pivot.
    let d = data[row]! - sigma;
    for (let c = c0; c < r; c++) {
      let x = data[row + r - c]!;
      const col = c * s + c;
      for (let k = c0; k < c; k++) x -= u[k - c0]! * L[col - k]!;
      u[c - c0] = x;
      const l = x * invD[c]!;
      L[row + r - c] = l;
      d -= x * l;
    }
    if (d === 0) d = tiny;
    if (d < 0) neg++;
    invD[r] = 1 / d;
  }
  return neg;
}

/** solveFactored for bandwidth 3, unrolled. */
function solveFactored3(n: number, work: BandWork, b: Float64Array): void {
  const { L, invD } = work;
  let b1 = 0;
  let b2 = 0;
  let b3 = 0;
  for (let r = 0; r < n; r++) {
    const row = 4 * r;
    const x = b[r]! - L[row + 1]! * b1 - L[row + 2]! * b2 - L[row + 3]! * b3;
    b[r] = x;
    b3 = b2;
    b2 = b1;
    b1 = x;
  }
  for (let r = 0; r < n; r++) b[r] = b[r]! * invD[r]!;
  b1 = 0;
  b2 = 0;
  b3 = 0;
  for (let r = n - 1; r >= 0; r--) {
    const x = b[r]! - L[4 * (r + 1) + 1]! * b1 - L[4 * (r + 2) + 2]! * b2 - L[4 * (r + 3) + 3]! * b3;
    b[r] = x;
    b3 = b2;
    b2 = b1;
    b1 = x;
  }
}

/**
 * factor for bandwidth 3 (the two-component blocks of the 4×4 model), unrolled: the same
 * arithmetic in the same order, with the row's three multipliers in registers.
 */
function factor3(A: Band, sigma: number, work: BandWork): number {
  const { n, data } = A;
  const { L, invD } = work;
  let neg = 0;
  const tiny = 1e-300 + 1e-15 * (Math.abs(data[0]!) + Math.abs(sigma));
  for (let r = 0; r < n; r++) {
    const row = 4 * r;
    let d = data[row]! - sigma;
    // Columns r−3, r−2, r−1 (those below 0 absent); u = L(r, c) D(c) before the division.
    let u3 = 0;
    let u2 = 0;
    if (r >= 3) {
      u3 = data[row + 3]!;
      const l = u3 * invD[r - 3]!;
      L[row + 3] = l;
      d -= u3 * l;
    }
    if (r >= 2) {
      const c = 4 * (r - 2);
      u2 = data[row + 2]! - (r >= 3 ? u3 * L[c + 1]! : 0);
      const l = u2 * invD[r - 2]!;
      L[row + 2] = l;
      d -= u2 * l;
    }
    if (r >= 1) {
      const c = 4 * (r - 1);
      const u1 = data[row + 1]! - (r >= 3 ? u3 * L[c + 2]! : 0) - (r >= 2 ? u2 * L[c + 1]! : 0);
      const l = u1 * invD[r - 1]!;
      L[row + 1] = l;
      d -= u1 * l;
    }
    if (d === 0) d = tiny;
    if (d < 0) neg++;
    invD[r] = 1 / d;
  }
  return neg;
}

/** Solves (A − σI) x = b with the factors of `factor`, in place in b. */
export function solveFactored(A: Band, work: BandWork, b: Float64Array): void {
  if (A.bw === 3) {
    solveFactored3(A.n, work, b);
    return;
  }
  const { n, bw } = A;
  const s = bw + 1;
  const { L, invD } = work;
  for (let r = 0; r < n; r++) {
    let x = b[r]!;
    const row = r * s + r;
    for (let k = r > bw ? r - bw : 0; k < r; k++) x -= L[row - k]! * b[k]!;
    b[r] = x;
  }
  for (let r = 0; r < n; r++) b[r] = b[r]! * invD[r]!;
  for (let r = n - 1; r >= 0; r--) {
    let x = b[r]!;
    const top = r + bw < n ? r + bw : n - 1;
    for (let k = r + 1; k <= top; k++) x -= L[k * s + k - r]! * b[k]!;
    b[r] = x;
  }
}

/** Gershgorin bounds of the spectrum. */
function gershgorin(A: Band): { lo: number; hi: number } {
  const { n, bw, data } = A;
  const s = bw + 1;
  const radius = new Float64Array(n);
  for (let r = 0; r < n; r++) {
    for (let c = Math.max(0, r - bw); c < r; c++) {
      const a = Math.abs(data[r * s + r - c]!);
      radius[r] = radius[r]! + a;
      radius[c] = radius[c]! + a;
    }
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (let r = 0; r < n; r++) {
    lo = Math.min(lo, data[r * s]! - radius[r]!);
    hi = Math.max(hi, data[r * s]! + radius[r]!);
  }
  return { lo, hi };
}

/** Eigenpairs, highest first; vectors[j] has length n and unit norm. */
export interface Eigenpairs {
  readonly values: Float64Array;
  readonly vectors: readonly Float64Array[];
  /** Factorisations spent (the work, for benchmarks and tests). */
  readonly factorisations: number;
}

const dot = (a: Float64Array, b: Float64Array): number => {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
};

/** Gram–Schmidt against orthonormal `against`, repeated once when it cancelled most of x (W. Kahan's
 * "twice is enough", Parlett Ch. 6), then normalised; returns the norm before normalising. */
function orthonormalise(x: Float64Array, against: readonly Float64Array[]): number {
  const n = x.length;
  let before = Math.sqrt(dot(x, x));
  for (let pass = 0; pass < 2 && against.length > 0; pass++) {
    for (const q of against) {
      const c = dot(x, q);
      for (let i = 0; i < n; i++) x[i] = x[i]! - c * q[i]!;
    }
    const after = Math.sqrt(dot(x, x));
    const enough = after > 0.5 * before;
    before = after;
    if (enough) break;
  }
  if (before > 0) for (let i = 0; i < n; i++) x[i] = x[i]! / before;
  return before;
}

/**
 * Start vector of a cold start: a fixed pseudo-random sequence (linear congruential, Numerical
 * Recipes constants), so that it overlaps every eigenvector generically — a smooth pattern can be
 * orthogonal to a symmetric structure's states by symmetry.
 */
function startVector(n: number, j: number): Float64Array {
  const x = new Float64Array(n);
  let state = (0x9e3779b9 ^ (j * 2654435761)) >>> 0;
  for (let i = 0; i < n; i++) {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    x[i] = state / 4294967296 - 0.5;
  }
  return x;
}

/**
 * Rayleigh-quotient iteration from x at shift σ, orthogonal to `locked` (eigenvectors of A):
 * returns the eigenvalue and leaves the vector in x. One step solves (A − σ) y = x with ‖x‖ = 1;
 * then ŷ = y/‖y‖ has Rayleigh quotient θ = σ + xᵀy/yᵀy and residual ‖Aŷ − θŷ‖² = 1/yᵀy − (xᵀy/yᵀy)²
 * (no product with A needed; y stays orthogonal to `locked` because A − σ maps that eigenspace to
 * itself). Stops when the residual is below `tol`.
 */
function rqi(A: Band, work: BandWork, x: Float64Array, sigma: number, locked: readonly Float64Array[], tol: number, counter: { n: number }): number {
  const y = work.v;
  const n = x.length;
  let shift = sigma;
  if (orthonormalise(x, locked) === 0) return NaN;
  for (let it = 0; it < 30; it++) {
    factor(A, shift, work);
    counter.n++;
    y.set(x);
    solveFactored(A, work, y);
    const xy = dot(x, y);
    const yy = dot(y, y);
    const theta = shift + xy / yy;
    const r2 = 1 / yy - (xy / yy) * (xy / yy);
    const norm = Math.sqrt(yy);
    for (let i = 0; i < n; i++) x[i] = y[i]! / norm;
    if (orthonormalise(x, locked) === 0) return NaN;
    if (!(r2 > tol * tol)) return theta;
    shift = theta;
  }
  return shift;
}

/** Number of eigenvalues above σ. */
const countAbove = (A: Band, sigma: number, work: BandWork, counter: { n: number }): number => {
  counter.n++;
  return A.n - factor(A, sigma, work);
};

/**
 * The `count` highest eigenpairs of A. `guess` (values and vectors of a nearby matrix, e.g. the
 * previous k) starts Rayleigh-quotient iteration; without it, or when the checked result is not the
 * `count` highest, the eigenvalues are first isolated by bisection on the inertia count.
 * `tol` is the residual bound (units of A).
 */
export function highestEigenpairs(A: Band, count: number, work: BandWork, tol: number, guess?: { readonly values: ArrayLike<number>; readonly vectors: readonly Float64Array[] }): Eigenpairs {
  const counter = { n: 0 };
  let hint: { lo: number; hi: number } | undefined;
  if (guess && guess.vectors.length === count) {
    const warm = solveFrom(A, count, work, tol, guess, counter);
    if (warm) return { ...warm, factorisations: counter.n };
    // The guesses still bound the region: bisection starts from around them, not the whole spectrum.
    let lo = Infinity;
    let hi = -Infinity;
    for (let j = 0; j < count; j++) {
      lo = Math.min(lo, guess.values[j]!);
      hi = Math.max(hi, guess.values[j]!);
    }
    const pad = 0.1 * (hi - lo) + 1e-3 * (1 + Math.abs(hi));
    hint = { lo: lo - pad, hi: hi + pad };
  }
  const cold = coldStart(A, count, work, tol, counter, hint);
  return { ...cold, factorisations: counter.n };
}

/** Sorts pairs highest first. */
function sorted(values: number[], vectors: Float64Array[]): { values: Float64Array; vectors: Float64Array[] } {
  const order = values.map((_, i) => i).sort((a, b) => values[b]! - values[a]!);
  return { values: Float64Array.from(order.map((i) => values[i]!)), vectors: order.map((i) => vectors[i]!) };
}

/** RQI from each guess; null when the count check fails. */
function solveFrom(A: Band, count: number, work: BandWork, tol: number, guess: { readonly values: ArrayLike<number>; readonly vectors: readonly Float64Array[] }, counter: { n: number }): { values: Float64Array; vectors: Float64Array[] } | null {
  const values: number[] = [];
  const vectors: Float64Array[] = [];
  for (let j = 0; j < count; j++) {
    const x = Float64Array.from(guess.vectors[j]!);
    const theta = rqi(A, work, x, guess.values[j]!, vectors, tol, counter);
    if (!Number.isFinite(theta)) return null;
    values.push(theta);
    vectors.push(x);
  }
  const out = sorted(values, vectors);
  return checkTop(A, out.values, count, work, counter) ? out : null;
}

/** True when the values are exactly the `count` highest eigenvalues (with their multiplicity). */
function checkTop(A: Band, values: Float64Array, count: number, work: BandWork, counter: { n: number }): boolean {
  const lowest = values[count - 1]!;
  const margin = 1e-9 * (1 + Math.abs(lowest));
  // The values belong to `count` orthonormal eigenvectors, so they are `count` eigenvalues (with
  // multiplicity) at or above the lowest; they are the highest ones when no other lies above it.
  return countAbove(A, lowest - margin, work, counter) === count;
}

/** Bisection on the inertia count for each of the `count` highest eigenvalues, then RQI. */
function coldStart(A: Band, count: number, work: BandWork, tol: number, counter: { n: number }, hint?: { lo: number; hi: number }): { values: Float64Array; vectors: Float64Array[] } {
  const g = gershgorin(A);
  const hi = hint && countAbove(A, hint.hi, work, counter) === 0 ? hint.hi : g.hi;
  let step = hint ? hi - hint.lo : Math.max(1e-3, 1e-3 * (g.hi - g.lo));
  let lo = hi - step;
  let countLo = countAbove(A, lo, work, counter);
  while (countLo < count && lo > g.lo) {
    step *= 2;
    lo = Math.max(g.lo, hi - step);
    countLo = countAbove(A, lo, work, counter);
  }
  if (countLo < count) {
    lo = g.lo - 1e-9 * (1 + Math.abs(g.lo));
    countLo = A.n;
  }
  const width = hi - lo;
  const floor = 1e-7 * (g.hi - g.lo);
  const values: number[] = [];
  const vectors: Float64Array[] = [];
  // Spectrum slicing: every count tightens the brackets of all the wanted eigenvalues at once;
  // λ_j = sup{σ: count_above(σ) ≥ j} lies in [lower[j], upper[j]], with the counts at both ends.
  const lower = new Float64Array(count + 1).fill(lo);
  const upper = new Float64Array(count + 1).fill(hi);
  const countLower = new Float64Array(count + 1).fill(countLo);
  const countUpper = new Float64Array(count + 1).fill(0);
  for (let j = 1; j <= count; j++) {
    // Until the bracket holds λ_j alone and is small against the searched range, or (a cluster)
    // reaches rounding-level width.
    while ((countLower[j]! > j || countUpper[j]! < j - 1 || upper[j]! - lower[j]! > 1e-2 * width) && upper[j]! - lower[j]! > floor) {
      const mid = 0.5 * (lower[j]! + upper[j]!);
      const c = countAbove(A, mid, work, counter);
      for (let i = j; i <= count; i++) {
        if (i <= c && mid > lower[i]!) {
          lower[i] = mid;
          countLower[i] = c;
        } else if (i > c && mid < upper[i]!) {
          upper[i] = mid;
          countUpper[i] = c;
        }
      }
    }
    const a = lower[j]!;
    const b = upper[j]!;
    const lambda = 0.5 * (a + b);
    const x = startVector(A.n, j);
    // Inverse iteration at the isolated value, until the Rayleigh quotient falls in its bracket (the
    // vector is then that eigenvalue's, or one of its cluster orthogonal to those already found);
    // Rayleigh-quotient iteration polishes it.
    const slack = floor;
    let theta = lambda;
    for (let it = 0; it < 20; it++) {
      theta = rqi(A, work, x, lambda, vectors, Infinity, counter);
      if (theta >= a - slack && theta <= b + slack) break;
    }
    theta = rqi(A, work, x, theta, vectors, tol, counter);
    values.push(Number.isFinite(theta) ? theta : lambda);
    vectors.push(x);
  }
  return sorted(values, vectors);
}
