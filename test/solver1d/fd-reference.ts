/**
 * Independent reference for the 1-D solver, used only by tests: finite differences (finite volumes)
 * on a uniform grid, a symmetric tridiagonal matrix, and Sturm-sequence bisection for its eigenvalues
 * (J. H. Wilkinson, The Algebraic Eigenvalue Problem (1965), §5.38; G. H. Golub and C. F. Van Loan,
 * Matrix Computations, §8.4 on the LDLᵀ inertia count).
 *
 * Cells of width h tile the slices exactly (every slice width a multiple of h) plus `tail_nm` of each
 * outer region, with ψ = 0 beyond. The flux ψ′/m between two cell centres crosses half a cell of each
 * mass, so the link carries the arithmetic mean mass: −C/h² [(ψ_{i+1} − ψ_i)/m_{i+½} − (ψ_i − ψ_{i−1})/m_{i−½}]
 * + V_i ψ_i = E ψ_i. Parabolic bands only (alpha is ignored by construction: tests pass alpha = 0).
 */

import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import type { BandProfile } from '../../engine/profile.js';

interface Tridiagonal {
  readonly diag: Float64Array;
  /** off[i] couples cells i and i + 1. */
  readonly off: Float64Array;
}

function assemble(profile: BandProfile, h: number, tail_nm: number): Tridiagonal {
  const V: number[] = [];
  const m: number[] = [];
  const tailCells = Math.round(tail_nm / h);
  for (let i = 0; i < tailCells; i++) { V.push(profile.left.V); m.push(profile.left.mass); }
  for (const s of profile.slices) {
    const cells = Math.round(s.width_nm / h);
    if (Math.abs(cells * h - s.width_nm) > 1e-9 * s.width_nm) {
      throw new Error(`fd-reference: slice width ${s.width_nm} nm is not a multiple of h = ${h} nm`);
    }
    for (let i = 0; i < cells; i++) { V.push(s.V); m.push(s.mass); }
  }
  for (let i = 0; i < tailCells; i++) { V.push(profile.right.V); m.push(profile.right.mass); }
  const n = V.length;
  const g = HBAR2_OVER_2M0 / (h * h);
  const diag = new Float64Array(n);
  const off = new Float64Array(n - 1);
  for (let i = 0; i < n; i++) {
    const left = i > 0 ? 0.5 * (m[i - 1]! + m[i]!) : m[i]!;
    const right = i < n - 1 ? 0.5 * (m[i]! + m[i + 1]!) : m[i]!;
    diag[i] = V[i]! + g * (1 / left + 1 / right);
    if (i < n - 1) off[i] = -g / right;
  }
  return { diag, off };
}

/** Number of eigenvalues of the tridiagonal matrix below x (negative pivots of LDLᵀ of T − x I). */
function sturmCount(t: Tridiagonal, x: number): number {
  let count = 0;
  let q = t.diag[0]! - x;
  if (q < 0) count++;
  for (let i = 1; i < t.diag.length; i++) {
    const b = t.off[i - 1]!;
    const prev = q === 0 ? -1e-300 : q;
    q = t.diag[i]! - x - (b * b) / prev;
    if (q < 0) count++;
  }
  return count;
}

/** The lowest `count` eigenvalues (eV) below `ceiling` of the FD matrix at step h (nm), by bisection to 1e-11 eV. */
export function fdEigenvalues(profile: BandProfile, h: number, tail_nm: number, ceiling: number): number[] {
  const t = assemble(profile, h, tail_nm);
  // Gershgorin lower bound of the spectrum.
  let lo = Infinity;
  for (let i = 0; i < t.diag.length; i++) {
    const radius = (i > 0 ? Math.abs(t.off[i - 1]!) : 0) + (i < t.off.length ? Math.abs(t.off[i]!) : 0);
    lo = Math.min(lo, t.diag[i]! - radius);
  }
  const total = sturmCount(t, ceiling);
  const out: number[] = [];
  for (let k = 0; k < total; k++) {
    let a = lo;
    let b = ceiling;
    while (b - a > 1e-11) {
      const mid = 0.5 * (a + b);
      if (sturmCount(t, mid) > k) b = mid;
      else a = mid;
    }
    out.push(0.5 * (a + b));
  }
  return out;
}

/** FD eigenvalues at h and h/2, Richardson-extrapolated for a second-order scheme: E(h/2) + (E(h/2) − E(h))/3. */
export function fdExtrapolated(profile: BandProfile, h: number, tail_nm: number, ceiling: number): number[] {
  const coarse = fdEigenvalues(profile, h, tail_nm, ceiling);
  const fine = fdEigenvalues(profile, h / 2, tail_nm, ceiling);
  const n = Math.min(coarse.length, fine.length);
  return fine.slice(0, n).map((e, k) => e + (e - coarse[k]!) / 3);
}

/** Solves the tridiagonal system (T − shift I) x = b by Gaussian elimination with partial pivoting (LAPACK dgtsv's scheme). */
function solveShifted(t: Tridiagonal, shift: number, b: Float64Array): Float64Array {
  const n = t.diag.length;
  const d = Float64Array.from(t.diag, (v) => v - shift);
  const du = Float64Array.from(t.off);
  const dl = Float64Array.from(t.off);
  const du2 = new Float64Array(n);
  const x = Float64Array.from(b);
  for (let i = 0; i < n - 1; i++) {
    if (Math.abs(d[i]!) >= Math.abs(dl[i]!)) {
      const f = dl[i]! / d[i]!;
      d[i + 1] = d[i + 1]! - f * du[i]!;
      x[i + 1] = x[i + 1]! - f * x[i]!;
      dl[i] = 0;
    } else {
      // Swap rows i and i + 1.
      const f = d[i]! / dl[i]!;
      d[i] = dl[i]!;
      const tmp = d[i + 1]!;
      d[i + 1] = du[i]! - f * tmp;
      if (i < n - 2) {
        du2[i] = du[i + 1]!;
        du[i + 1] = -f * du2[i]!;
      }
      du[i] = tmp;
      const xt = x[i]!;
      x[i] = x[i + 1]!;
      x[i + 1] = xt - f * x[i + 1]!;
    }
  }
  x[n - 1] = x[n - 1]! / d[n - 1]!;
  if (n > 1) x[n - 2] = (x[n - 2]! - du[n - 2]! * x[n - 1]!) / d[n - 2]!;
  for (let i = n - 3; i >= 0; i--) x[i] = (x[i]! - du[i]! * x[i + 1]! - du2[i]! * x[i + 2]!) / d[i]!;
  return x;
}

const dot = (a: Float64Array, b: Float64Array): number => a.reduce((s, v, i) => s + v * b[i]!, 0);

/**
 * Second-order shift (eV) of level `n` (1-based) of the finite-difference matrix under a perturbation
 * W(z) (eV, z in nm from the first slice's left edge): ΔE = Σ_{m≠n} |W_mn|²/(E_n − E_m) over every
 * state of the matrix, the hard-walled box of `tail_nm` beyond each end discretising the continuum.
 * Evaluated without the states as −⟨Wψ_n| Q (T − E_n)⁻¹ Q |Wψ_n⟩ (Q projects out ψ_n): the matrix form
 * of the Dalgarno–Lewis method (A. Dalgarno and J. T. Lewis, Proc. R. Soc. A 233, 70 (1955)), one
 * pivoted tridiagonal solve. ψ_n by inverse iteration at its Sturm-bisected eigenvalue. Also returns
 * that eigenvalue.
 */
export function fdSecondOrderShift(profile: BandProfile, h: number, tail_nm: number, n: number, W: (z: number) => number): { energy: number; shift: number } {
  const t = assemble(profile, h, tail_nm);
  const cells = t.diag.length;
  const levels = fdEigenvalues(profile, h, tail_nm, Math.min(profile.left.V, profile.right.V));
  const energy = levels[n - 1]!;
  if (energy === undefined) throw new Error(`fd-reference: the box holds no level ${n} below the barrier`);
  let psi: Float64Array = new Float64Array(cells).fill(1);
  for (let it = 0; it < 4; it++) {
    psi = solveShifted(t, energy + 1e-9, psi);
    const norm = Math.sqrt(dot(psi, psi));
    psi = psi.map((v) => v / norm);
  }
  const z0 = -Math.round(tail_nm / h) * h;
  const w = Float64Array.from({ length: cells }, (_, i) => W(z0 + (i + 0.5) * h));
  const b = psi.map((v, i) => v * w[i]!);
  const first = dot(psi, b);
  for (let i = 0; i < cells; i++) b[i] = b[i]! - first * psi[i]!;
  // A shift 1e-9 eV off the level keeps the solve regular; ψ_n's own component is projected out after.
  const x = solveShifted(t, energy + 1e-9, b);
  const along = dot(psi, x);
  for (let i = 0; i < cells; i++) x[i] = x[i]! - along * psi[i]!;
  return { energy, shift: -dot(b, x) };
}
