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
