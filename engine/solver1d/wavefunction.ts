/**
 * ψ of a bound state sampled on a z grid: the solutions decaying to the left and to the right carried
 * exactly across the flat slices (closed forms in slices.ts), joined where both are accurate,
 * normalised analytically, and evaluated per slice in closed form (stepped by the addition theorems on
 * the engine's uniform grids).
 *
 * Units: energies eV, lengths nm, masses m0; ψ in nm^-1/2.
 */

import { HBAR2_OVER_2M0 } from '../constants.js';
import type { BandProfile } from '../profile.js';
import { bad, cFun, intS2, isFiniteNumber, requireFlat, SCALED_EVANESCENT, sFun, twoBandFactor, unpack } from './slices.js';

const C = HBAR2_OVER_2M0;
/** Closed forms of ψ inside a slice, for sampling (see wavefunction). */
const OSCILLATORY = 1;
const SHORT_EVANESCENT = 2;
const LONG_EVANESCENT = 3;
const NEAR_FLAT = 0;
/**
 * Below this phase √|s|·L across a slice its ψ is sampled as u0 c(x) + m p0 S(x): the other forms
 * lose about ε/(√|s|·L) of relative accuracy to cancellation, 2e-14 at this bound.
 */
const NEAR_FLAT_PHASE = 1e-2;
/** Points between direct evaluations of a rotation while sampling (rounding grows with the steps taken). */
const RESEED = 64;

/** The step of an ascending grid of equal steps (each within 1e-11 of the mean), else undefined. */
function uniformStep(z: Float64Array): number | undefined {
  const n = z.length;
  if (n < 2) return undefined;
  const h = (z[n - 1]! - z[0]!) / (n - 1);
  if (!(h > 0)) return undefined;
  for (let g = 1; g < n; g++) if (Math.abs(z[g]! - z[g - 1]! - h) > 1e-11 * h) return undefined;
  return h;
}

/** One exact step of (u, p) over a signed distance x in a slice of s = m(E − V)/C; writes out[0..2] = u, p, log-scale gained. */
function step(s: number, m: number, x: number, u: number, p: number, out: Float64Array): void {
  if (s < 0) {
    const kap = Math.sqrt(-s);
    const y = kap * Math.abs(x);
    if (y >= SCALED_EVANESCENT) {
      const q = Math.exp(-2 * y);
      const ch = 0.5 * (1 + q);
      const sh = x > 0 ? 0.5 * (1 - q) : -0.5 * (1 - q);
      out[0] = u * ch + (m * p * sh) / kap;
      out[1] = p * ch + (kap / m) * u * sh;
      out[2] = y;
      return;
    }
  }
  const c = cFun(s, x);
  const S = sFun(s, x);
  out[0] = u * c + m * p * S;
  out[1] = p * c - (s / m) * u * S;
  out[2] = 0;
}

/**
 * ψ of one bound state sampled on a z grid, normalised to ∫|ψ|² dz = 1.
 *
 * The solution decaying to the left and the one decaying to the right are carried exactly across the
 * slices (with a log scale kept per boundary) and joined at the boundary where |ψ| is largest, so the
 * growing error of either sweep never enters its evanescent tail. The norm is integrated analytically:
 * per oscillatory (or short evanescent) slice ∫(u0 c + B S)² = u0²(L + cS)/2 + u0 B S² + B² (L − cS)/(2s);
 * per long evanescent slice the two-point form u(x) = [u0 sinh κ(L − x) + u1 sinh κx]/sinh κL;
 * the outer tails u²/(2κ). Sign convention: ψ > 0 in the left outer region (equivalently at its first
 * extremum from the left).
 * Units: energy eV (must be a bound-state energy of `profile`, below the continuum edge), z_nm in nm with
 * z = 0 at the left edge of the first slice (may extend into the outer regions); result nm^-1/2.
 */
export function wavefunction(profile: BandProfile, energy: number, z_nm: Float64Array): Float64Array {
  const d = requireFlat(unpack(profile), 'wavefunction');
  if (!isFiniteNumber(energy) || !(energy < d.barrier)) {
    throw bad('energy', `must be a bound-state energy below the continuum edge ${d.barrier} eV`, energy,
      'pass an energy from solveBand');
  }
  for (let i = 0; i < z_nm.length; i++) {
    if (!Number.isFinite(z_nm[i]!)) throw bad(`z_nm[${i}]`, 'must be a finite position in nm', z_nm[i], 'fix the grid');
  }
  const { n, width, V, mass, alpha, edge } = d;
  const E = energy;
  const ms = new Float64Array(n);
  const ss = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const dV = E - V[i]!;
    ms[i] = mass[i]! * twoBandFactor(alpha[i]!, dV);
    ss[i] = (ms[i]! * dV) / C;
  }
  const mLe = d.mL * twoBandFactor(d.aL, E - d.VL);
  const mRe = d.mR * twoBandFactor(d.aR, E - d.VR);
  const kL = Math.sqrt((mLe * (d.VL - E)) / C);
  const kR = Math.sqrt((mRe * (d.VR - E)) / C);

  // Left sweep (index j = boundary) and right sweep, each normalised to |u| + |p| = 1 with log scale e.
  const uA = new Float64Array(n + 1); const pA = new Float64Array(n + 1); const eA = new Float64Array(n + 1);
  const uB = new Float64Array(n + 1); const pB = new Float64Array(n + 1); const eB = new Float64Array(n + 1);
  const tmp = new Float64Array(3);
  const normalise = (u: Float64Array, p: Float64Array, e: Float64Array, j: number, gained: number): void => {
    const a = Math.abs(u[j]!) + Math.abs(p[j]!);
    u[j] = u[j]! / a; p[j] = p[j]! / a; e[j] = e[j]! + gained + Math.log(a);
  };
  uA[0] = 1; pA[0] = kL / mLe;
  normalise(uA, pA, eA, 0, 0);
  for (let i = 0; i < n; i++) {
    step(ss[i]!, ms[i]!, width[i]!, uA[i]!, pA[i]!, tmp);
    uA[i + 1] = tmp[0]!; pA[i + 1] = tmp[1]!; eA[i + 1] = eA[i]!;
    normalise(uA, pA, eA, i + 1, tmp[2]!);
  }
  uB[n] = 1; pB[n] = -kR / mRe;
  normalise(uB, pB, eB, n, 0);
  for (let i = n - 1; i >= 0; i--) {
    step(ss[i]!, ms[i]!, -width[i]!, uB[i + 1]!, pB[i + 1]!, tmp);
    uB[i] = tmp[0]!; pB[i] = tmp[1]!; eB[i] = eB[i + 1]!;
    normalise(uB, pB, eB, i, tmp[2]!);
  }
  // Join where |ψ_left · ψ_right| is largest: there both sweeps are accurate.
  let jStar = 0;
  let best = Number.NEGATIVE_INFINITY;
  for (let j = 0; j <= n; j++) {
    const score = Math.log(Math.abs(uA[j]!)) + eA[j]! + Math.log(Math.abs(uB[j]!)) + eB[j]!;
    if (score > best) { best = score; jStar = j; }
  }
  const ratio = uA[jStar]! / uB[jStar]!;
  const shiftB = Math.log(Math.abs(ratio)) + eA[jStar]! - eB[jStar]!;
  const signB = ratio > 0 ? 1 : -1;
  // Joined boundary values: left sweep for j ≤ j*, rescaled right sweep beyond.
  // Slice i uses the sweep of its own side: boundaries i and i+1 of sweep A if i < j*, else of sweep B.
  const value = (fromA: boolean, j: number): number => (fromA ? uA[j]! : signB * uB[j]!);
  const slope = (fromA: boolean, j: number): number => (fromA ? pA[j]! : signB * pB[j]!);
  const scale = (fromA: boolean, j: number): number => (fromA ? eA[j]! : eB[j]! + shiftB);

  // Norm: pieces are (integral at unit scale, log scale); sum relative to the largest log scale.
  const pieceI = new Float64Array(n + 2);
  const pieceE = new Float64Array(n + 2);
  const u0L = value(true, 0);
  pieceI[0] = (u0L * u0L) / (2 * kL);
  pieceE[0] = scale(true, 0);
  for (let i = 0; i < n; i++) {
    const fromA = i < jStar;
    const L = width[i]!;
    const s = ss[i]!;
    const m = ms[i]!;
    const u0 = value(fromA, i);
    const e0 = scale(fromA, i);
    if (s < 0 && Math.sqrt(-s) * L >= 1) {
      const e1 = scale(fromA, i + 1);
      const eRef = Math.max(e0, e1);
      const a0 = u0 * Math.exp(e0 - eRef);
      const a1 = value(fromA, i + 1) * Math.exp(e1 - eRef);
      const kap = Math.sqrt(-s);
      const y = kap * L;
      const q = Math.exp(-2 * y);
      const I1 = (1 + q) / (1 - q) / (2 * kap) - (2 * L * q) / ((1 - q) * (1 - q));
      const I2 = (Math.exp(-y) / (1 - q)) * ((L * (1 + q)) / (1 - q) - 1 / kap);
      pieceI[i + 1] = (a0 * a0 + a1 * a1) * I1 + 2 * a0 * a1 * I2;
      pieceE[i + 1] = eRef;
    } else {
      const B = m * slope(fromA, i);
      const cL = cFun(s, L);
      const SL = sFun(s, L);
      pieceI[i + 1] = (u0 * u0 * (L + cL * SL)) / 2 + u0 * B * SL * SL + B * B * intS2(s, L, cL, SL);
      pieceE[i + 1] = e0;
    }
  }
  const uNR = value(n < jStar, n);
  pieceI[n + 1] = (uNR * uNR) / (2 * kR);
  pieceE[n + 1] = scale(n < jStar, n);
  let eMax = Number.NEGATIVE_INFINITY;
  for (let k = 0; k < n + 2; k++) if (pieceE[k]! > eMax) eMax = pieceE[k]!;
  let norm = 0;
  for (let k = 0; k < n + 2; k++) norm += pieceI[k]! * Math.exp(2 * (pieceE[k]! - eMax));
  const inv = 1 / Math.sqrt(norm);

  // Each slice's ψ in closed form with its log scale and the norm folded in, so a grid point costs
  // one or two elementary functions: R cos(kx − φ) where oscillatory, P e^{κx} + Q e^{−κx} where
  // short and evanescent, P e^{−κx} + Q e^{−κ(L−x)} where long, a + b x where flat.
  const kind = new Uint8Array(n);
  const kk = new Float64Array(n);
  const c0 = new Float64Array(n);
  const c1 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const fromA = i < jStar;
    const s = ss[i]!;
    const L = width[i]!;
    const a = value(fromA, i) * Math.exp(scale(fromA, i) - eMax) * inv;
    const b = ms[i]! * slope(fromA, i) * Math.exp(scale(fromA, i) - eMax) * inv;
    if (Math.sqrt(Math.abs(s)) * L < NEAR_FLAT_PHASE) {
      // Nearly flat (E within a hair of V): the amplitude–phase and exponential forms would divide b
      // by a vanishing k or κ and cancel; u0 c(x) + m p0 S(x) with the series of c and S does not.
      kind[i] = NEAR_FLAT; kk[i] = s; c0[i] = a; c1[i] = b;
    } else if (s > 0) {
      const k = Math.sqrt(s);
      kind[i] = OSCILLATORY; kk[i] = k; c0[i] = Math.hypot(a, b / k); c1[i] = Math.atan2(b / k, a);
    } else if (s < 0 && Math.sqrt(-s) * L >= 1) {
      // Two-point form u(x) = [u0 sinh κ(L − x) + u1 sinh κx]/sinh κL = P e^{−κx} + Q e^{−κ(L−x)},
      // P = (u0 − u1 e^{−κL})/(1 − e^{−2κL}), Q = (u1 − u0 e^{−κL})/(1 − e^{−2κL}): no growing exponential.
      const kap = Math.sqrt(-s);
      const d = Math.exp(-kap * L);
      const q = 1 - d * d;
      const u0 = value(fromA, i) * Math.exp(scale(fromA, i) - eMax) * inv;
      const u1 = value(fromA, i + 1) * Math.exp(scale(fromA, i + 1) - eMax) * inv;
      kind[i] = LONG_EVANESCENT; kk[i] = kap; c0[i] = (u0 - u1 * d) / q; c1[i] = (u1 - u0 * d) / q;
    } else {
      const kap = Math.sqrt(-s);
      kind[i] = SHORT_EVANESCENT; kk[i] = kap; c0[i] = 0.5 * (a + b / kap); c1[i] = 0.5 * (a - b / kap);
    }
  }

  /** ψ at x inside slice i, directly. */
  const inSlice = (i: number, x: number): number => {
    const k = kk[i]!;
    switch (kind[i]) {
      case OSCILLATORY: return c0[i]! * Math.cos(k * x - c1[i]!);
      case SHORT_EVANESCENT: { const e = Math.exp(k * x); return c0[i]! * e + c1[i]! / e; }
      case LONG_EVANESCENT: return c0[i]! * Math.exp(-k * x) + c1[i]! * Math.exp(-k * (width[i]! - x));
      default: return c0[i]! * cFun(k, x) + c1[i]! * sFun(k, x);
    }
  };
  const psi = new Float64Array(z_nm.length);
  const zEnd = edge[n]!;
  const leftTail = (z: number): number => value(true, 0) * Math.exp(kL * z + scale(true, 0) - eMax) * inv;
  const rightTail = (z: number): number => value(n < jStar, n) * Math.exp(-kR * (z - zEnd) + scale(n < jStar, n) - eMax) * inv;
  const h = uniformStep(z_nm);
  if (h === undefined) {
    let i = 0;
    for (let g = 0; g < z_nm.length; g++) {
      const z = z_nm[g]!;
      if (z <= 0) { psi[g] = leftTail(z); continue; }
      if (z >= zEnd) { psi[g] = rightTail(z); continue; }
      // Keep the slice of the previous point while it still holds z.
      if (!(z >= edge[i]! && z < edge[i + 1]!)) {
        let lo = 0;
        let hi = n;
        while (hi - lo > 1) {
          const mid = (lo + hi) >> 1;
          if (edge[mid]! <= z) lo = mid;
          else hi = mid;
        }
        i = lo;
      }
      psi[g] = inSlice(i, z - edge[i]!);
    }
    return psi;
  }
  // A uniform ascending grid (the engine's): inside a slice, step from point to point by the
  // addition theorems, a rotation for cos(kx − φ) and a constant factor for each exponential, each
  // exponential taken in the direction it decays; every slice starts from a direct evaluation and
  // the rotation restarts every RESEED points, so rounding grows by at most that many steps.
  let g = 0;
  const N = z_nm.length;
  for (; g < N && z_nm[g]! <= 0; g++) psi[g] = leftTail(z_nm[g]!);
  for (let i = 0; i < n && g < N; i++) {
    let g1 = g;
    while (g1 < N && z_nm[g1]! < edge[i + 1]!) g1++;
    if (g1 === g) continue;
    const x0 = z_nm[g]! - edge[i]!;
    const k = kk[i]!;
    switch (kind[i]) {
      case OSCILLATORY: {
        const cd = Math.cos(k * h);
        const sd = Math.sin(k * h);
        let C = 0;
        let S = 0;
        for (let q = g; q < g1; q++) {
          if ((q - g) % RESEED === 0) {
            const theta = k * (z_nm[q]! - edge[i]!) - c1[i]!;
            C = Math.cos(theta);
            S = Math.sin(theta);
          }
          psi[q] = c0[i]! * C;
          const C1 = C * cd - S * sd;
          S = S * cd + C * sd;
          C = C1;
        }
        break;
      }
      case SHORT_EVANESCENT: {
        const up = Math.exp(k * h);
        let grow = Math.exp(k * x0);
        let decay = 1 / grow;
        for (let q = g; q < g1; q++) {
          psi[q] = c0[i]! * grow + c1[i]! * decay;
          grow *= up;
          decay /= up;
        }
        break;
      }
      case LONG_EVANESCENT: {
        const r = Math.exp(-k * h);
        let a = Math.exp(-k * x0);
        for (let q = g; q < g1; q++) {
          psi[q] = c0[i]! * a;
          a *= r;
        }
        let b = Math.exp(-k * (width[i]! - (z_nm[g1 - 1]! - edge[i]!)));
        for (let q = g1 - 1; q >= g; q--) {
          psi[q] += c1[i]! * b;
          b *= r;
        }
        break;
      }
      default:
        for (let q = g; q < g1; q++) psi[q] = inSlice(i, z_nm[q]! - edge[i]!);
    }
    g = g1;
  }
  for (; g < N; g++) psi[g] = rightTail(z_nm[g]!);
  return psi;
}
