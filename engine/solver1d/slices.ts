/**
 * The 1-D model shared by the state search and the wavefunctions: a band profile unpacked into flat
 * arrays and checked, the two-band non-parabolic mass, and the closed forms of ψ across one slice.
 *
 * Model: single-band envelope function with position-dependent mass and BenDaniel–Duke continuity
 * (ψ and ψ′/m continuous; D. J. BenDaniel and C. B. Duke, Phys. Rev. 152, 683 (1966)):
 *   −(ħ²/2m0) d/dz (1/m(z) dψ/dz) + V(z) ψ = E ψ,
 * with the two-band non-parabolic mass m(E) = mass · max(1 + alpha (E − V), 0.1) in every slice and
 * in the two outer regions (see twoBandFactor for the floor). In a slice of constant V and m the
 * solution is analytic, so carrying (u, p) = (ψ, ψ′/m) across slices is exact. With
 * s = m (E − V) / (ħ²/2m0) (nm⁻²):
 *   u(x) = u0 c(x) + m p0 S(x),   p(x) = p0 c(x) − (s/m) u0 S(x),
 *   c = cos √s x, S = sin(√s x)/√s for s > 0;  c = cosh √−s x, S = sinh(√−s x)/√−s for s < 0.
 *
 * Units: energies eV, lengths nm, masses m0. Holes are solved in the particle sense of BandProfile.
 */

import { badValue, type InputError } from '../errors.js';
import type { BandProfile } from '../profile.js';

/** Above this κL an evanescent step is carried with e^{κL} factored out (cosh overflows at ~710). */
export const SCALED_EVANESCENT = 20;

/** The two-band factor's floor (see twoBandFactor). */
export const MASS_FLOOR = 0.1;

/**
 * Factor of the two-band mass, m(E) = mass · twoBandFactor(alpha, E − V), dimensionless.
 *
 * The two-band (Kane) form 1 + alpha (E − V), alpha = 1/Eg (D. F. Nelson, R. C. Miller and
 * D. A. Kleinman, Phys. Rev. B 35, 7770 (1987)), floored at 0.1. Why: the form is meaningful only
 * above E = V − 1/alpha (the valence-band edge of the two-band model), where it reaches zero; a field
 * across thick claddings puts a state's energy far below a barrier's edge, often more than a gap
 * below it, where the mass would be non-positive. Kept above the floor, the mass stays positive and
 * non-decreasing in E, which is what the oscillation count needs (see the module comment), and the
 * decay constant κ² = m(E)(V − E)/(ħ²/2m0) grows again with depth below it (a single-band envelope
 * model has no valence band to tunnel into). The floor sits at 90 % of the gap below the edge: the
 * deepest barriers of unbiased wells stay above it (InAs/AlSb with this parameter set reaches 0.22),
 * so their levels are those of the plain two-band form.
 * Example: twoBandFactor(0.7, 0.1) = 1.07; twoBandFactor(0.7, −1.5) = 0.1 (not −0.05).
 */
export const twoBandFactor = (alpha: number, dV: number): number => Math.max(1 + alpha * dV, MASS_FLOOR);

/** The profile unpacked into flat arrays once per call, so the sweeps read no objects. */
export interface Unpacked {
  readonly n: number;
  readonly width: Float64Array;
  readonly V: Float64Array;
  readonly mass: Float64Array;
  readonly alpha: Float64Array;
  /** Gradients dV/dz (eV/nm), d(mass)/dz, d(alpha)/dz per slice: all 0 for a flat slice; else V, mass, alpha are centre values. */
  readonly gV: Float64Array;
  readonly gM: Float64Array;
  readonly gA: Float64Array;
  /** Per slice: 1 for a linear slice (profile gradient given), 0 for a flat one. */
  readonly isLinear: Uint8Array;
  /** Whether any slice is linear. */
  readonly linear: boolean;
  /** z of boundary j (j = 0..n), nm. */
  readonly edge: Float64Array;
  readonly VL: number; readonly mL: number; readonly aL: number;
  readonly VR: number; readonly mR: number; readonly aR: number;
  readonly Vmin: number;
  readonly barrier: number;
}

export const isFiniteNumber = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

export const bad = (field: string, what: string, got: unknown, fix: string): InputError => badValue(field, what, got, fix, field);

/** The profile checked (every field finite, widths and masses positive, alpha ≥ 0) and unpacked; throws InputError naming the field. */
export function unpack(profile: BandProfile): Unpacked {
  const slices = profile.slices;
  const n = slices.length;
  const width = new Float64Array(n);
  const V = new Float64Array(n);
  const mass = new Float64Array(n);
  const alpha = new Float64Array(n);
  const gV = new Float64Array(n);
  const gM = new Float64Array(n);
  const gA = new Float64Array(n);
  const isLinear = new Uint8Array(n);
  const edge = new Float64Array(n + 1);
  let linear = false;
  const checkRegion = (where: string, v: number, m: number, a: number): void => {
    if (!isFiniteNumber(v)) throw bad(`${where}.V`, 'must be a finite potential in eV', v, 'fix the band profile');
    if (!isFiniteNumber(m) || m <= 0) throw bad(`${where}.mass`, 'must be a positive mass in m0', m, 'fix the band profile');
    if (!isFiniteNumber(a) || a < 0) throw bad(`${where}.alpha`, 'must be a finite non-parabolicity ≥ 0 in 1/eV (two-band alpha = 1/Eg)', a, 'use 0 for a parabolic band');
  };
  const { left, right } = profile;
  checkRegion('profile.left', left.V, left.mass, left.alpha);
  checkRegion('profile.right', right.V, right.mass, right.alpha);
  let Vmin = Math.min(left.V, right.V);
  for (let i = 0; i < n; i++) {
    const s = slices[i]!;
    const where = `profile.slices[${i}]`;
    if (!isFiniteNumber(s.width_nm) || s.width_nm <= 0) {
      throw bad(`${where}.width_nm`, 'must be a positive width in nm', s.width_nm, 'drop empty slices or fix the width');
    }
    checkRegion(where, s.V, s.mass, s.alpha);
    width[i] = s.width_nm;
    V[i] = s.V;
    mass[i] = s.mass;
    alpha[i] = s.alpha;
    if (s.gradient) {
      const g = s.gradient;
      for (const [key, value] of [['V', g.V], ['mass', g.mass], ['alpha', g.alpha]] as const) {
        if (!isFiniteNumber(value)) throw bad(`${where}.gradient.${key}`, 'must be a finite gradient per nm', value, 'omit gradient for a flat slice');
      }
      // The mass and alpha must stay valid across the slice, not only at its centre.
      const h = 0.5 * s.width_nm;
      if (!(Math.min(s.mass - h * g.mass, s.mass + h * g.mass) > 0)) throw bad(`${where}.gradient.mass`, 'must keep the mass positive across the slice', g.mass, 'fix the band profile');
      if (!(Math.min(s.alpha - h * g.alpha, s.alpha + h * g.alpha) >= 0)) throw bad(`${where}.gradient.alpha`, 'must keep alpha ≥ 0 across the slice', g.alpha, 'fix the band profile');
      gV[i] = g.V;
      gM[i] = g.mass;
      gA[i] = g.alpha;
      isLinear[i] = 1;
      linear = true;
    }
    edge[i + 1] = edge[i]! + s.width_nm;
    const low = s.V - 0.5 * Math.abs(gV[i]!) * s.width_nm;
    if (low < Vmin) Vmin = low;
  }
  const barrier = Math.min(left.V, right.V);
  return {
    n, width, V, mass, alpha, gV, gM, gA, isLinear, linear, edge,
    VL: left.V, mL: left.mass, aL: left.alpha,
    VR: right.V, mR: right.mass, aR: right.alpha,
    Vmin, barrier,
  };
}

/**
 * The profile itself when every slice is flat; a sloped one (buildBandProfile's `linear`) is refused:
 * wavefunctions, resonances and the observables sample piecewise-constant slices.
 */
export function requireFlat(d: Unpacked, what: string): Unpacked {
  if (!d.linear) return d;
  const i = d.isLinear.indexOf(1);
  throw bad(`profile.slices[${i}].gradient`, `must be absent for ${what}, which works on flat slices`, 'a linear slice', 'build the profile without the linear option (slices of at most slice_nm)');
}

/** ∫0^L S(x)² dx = (L − c(L)S(L)) / (2s), by series in t = sL² where that cancels. */
export function intS2(s: number, L: number, cL: number, SL: number): number {
  const t = s * L * L;
  if (Math.abs(t) < 1e-2) {
    return L * L * L * (1 / 3 - t / 15 + (2 * t * t) / 315 - (t * t * t) / 2835);
  }
  return (L - cL * SL) / (2 * s);
}

/** c(x) = cos √s x (cosh for s < 0). */
export function cFun(s: number, x: number): number {
  if (s > 0) return Math.cos(Math.sqrt(s) * x);
  if (s < 0) return Math.cosh(Math.sqrt(-s) * x);
  return 1;
}

/** S(x) = sin(√s x)/√s (sinh for s < 0, x for s = 0). */
export function sFun(s: number, x: number): number {
  const t = s * x * x;
  if (Math.abs(t) < 1e-8) return x * (1 - t / 6 + (t * t) / 120);
  if (s > 0) {
    const k = Math.sqrt(s);
    return Math.sin(k * x) / k;
  }
  const k = Math.sqrt(-s);
  return Math.sinh(k * x) / k;
}
