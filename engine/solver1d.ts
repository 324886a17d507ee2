/**
 * Bound states of one band of a 1-D heterostructure: the exact piecewise-constant transfer method
 * with Prüfer-angle (oscillation-theorem) state counting.
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
 * Counting: the Prüfer angle θ (u = ρ sin θ, p = ρ cos θ) obeys θ′ = m cos²θ + (E − V)/(ħ²/2m0) sin²θ,
 * so it only crosses multiples of π upwards (at the zeros of u). Starting from the solution that
 * decays to the left and comparing θ at the right edge with the angle θ_R of the solution that decays
 * to the right gives N(E) = number of eigenvalues strictly below E = ceil((θ(z_R) − θ_R)/π)
 * (Sturm oscillation theorem; J. D. Pryce, Numerical Solution of Sturm–Liouville Problems (1993);
 * S. Pruess, SIAM J. Numer. Anal. 10, 55 (1973) for piecewise-constant coefficients). The zeros of u
 * inside a slice are counted exactly: an oscillatory slice of phase kL holds floor(kL/π) or one more,
 * decided by the sign change of u across it; an evanescent or flat slice holds at most one.
 * Each eigenvalue is isolated by bisection on N(E) and refined by safeguarded Newton steps on the
 * continuous, increasing mismatch θ(z_R) − θ_R − nπ, whose E-derivative is an integral of the same
 * sweep (see sweepMatched). θ′ grows with E wherever m(E) and E − V both do, which holds for
 * alpha ≥ 0 with the floored two-band mass (positive and non-decreasing in E; Sturm comparison
 * theorem); the start angle rises and θ_R falls with E as well. So θ(z_R) − θ_R increases strictly
 * with E and no state is missed or counted twice. A negative alpha would lose that guarantee and is
 * refused as input. Newton refines on the same mismatch taken at an interior boundary (the left
 * solution carried to it, the right one carried back), which has the same roots but stays smooth
 * where the state lives: at the right edge of a stack clad in thick barriers the mismatch is a step
 * too sharp to follow (see sweepMatched).
 *
 * Linear slices (graded layers, fields; BandProfile slices with a gradient) are carried with Airy
 * functions in a mass-weighted coordinate (see carryLinear); their zeros are counted the same way,
 * from the phase of Ai + i·Bi across the slice (engine/airy.ts), so the counting guarantee holds for
 * them too: θ′ in the slice's coordinate is m̄ cos²θ − (Q/m̄) sin²θ with m̄ and −Q non-decreasing in E.
 *
 * Units: energies eV, lengths nm, masses m0. Holes are solved in the particle sense of BandProfile.
 */

import { airyTransfer, newAiryTransfer } from './airy.js';
import { HBAR2_OVER_2M0 } from './constants.js';
import { badValue, type InputError } from './errors.js';
import type { BandName, BandProfile } from './profile.js';

/** One bound state. */
export interface BoundState {
  /** 1-based index in ascending particle energy. */
  readonly index: number;
  /** Particle energy (eV). */
  readonly energy: number;
  /** Zeros of ψ (index − 1 by the oscillation theorem). */
  readonly nodes: number;
}

/** The bound states of one band. */
export interface BandSolution {
  readonly band: BandName;
  readonly sign: 1 | -1;
  /** Ascending particle energy. */
  readonly states: readonly BoundState[];
  /** Continuum edge: the lower of the two outer potentials (eV, particle sense). */
  readonly barrier: number;
  /** Count of N(E) and mismatch evaluations (work done). */
  readonly evaluations: number;
}

export interface SolveBandOptions {
  /** Keep at most this many of the lowest states (positive integer; default all). */
  readonly maxStates?: number;
  /** Absolute tolerance of each energy (eV, default 1e-12). */
  readonly tolerance_eV?: number;
}

const C = HBAR2_OVER_2M0;
const PI = Math.PI;
/** Above this κL an evanescent step is carried with e^{κL} factored out (cosh overflows at ~710). */
const SCALED_EVANESCENT = 20;
/** Rescale (u, p) in the counting sweep beyond these magnitudes. */
const BIG = 1e150;
const SMALL = 1e-150;
const DEFAULT_TOLERANCE = 1e-12;
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

/**
 * Scratch for one sweep: count of eigenvalues below E and the total Prüfer mismatch θ(z_R) − θ_R
 * (or the mismatch at a matching boundary, with its E-derivative `slope` when tracked).
 */
interface Sweep {
  count: number;
  angle: number;
  slope: number;
}

const isFiniteNumber = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

const bad = (field: string, what: string, got: unknown, fix: string): InputError => badValue(field, what, got, fix, field);

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

/** Scratch of the Airy transfer across a sloped slice (sweeps are synchronous, so one suffices). */
const AIRY = newAiryTransfer();

/**
 * The profile itself when every slice is flat; a sloped one (buildBandProfile's `linear`) is refused:
 * wavefunctions, resonances and the observables sample piecewise-constant slices.
 */
export function requireFlat(d: Unpacked, what: string): Unpacked {
  if (!d.linear) return d;
  const i = d.isLinear.indexOf(1);
  throw bad(`profile.slices[${i}].gradient`, `must be absent for ${what}, which works on flat slices`, 'a linear slice', 'build the profile without the linear option (slices of at most slice_nm)');
}

/**
 * (u, p) of a solution at a slice boundary and the zeros of u passed so far; scratch of the sweeps.
 * With `track`, `integral` accumulates ∫(u²/C + ∂m/∂E·p²) dz from the solution's outer edge, in the
 * scale of (u, p): the E-derivative of its Prüfer angle is integral/(u² + p²) (see sweepMatched).
 */
interface Carry {
  u: number;
  p: number;
  zeros: number;
  track: boolean;
  integral: number;
}

const newCarry = (): Carry => ({ u: 0, p: 0, zeros: 0, track: false, integral: 0 });

/** ∂m/∂E (m0/eV) of the two-band mass mass·(1 + alpha (E − V)), 0 where it sits on its floor. */
const massSlope = (mass: number, alpha: number, dV: number): number => (1 + alpha * dV > MASS_FLOOR ? mass * alpha : 0);

/**
 * ∫0^L (u²/C + mE p²) of the constant-slice solution u = u0 c + m q S, p = q c − (s/m) u0 S
 * (q = ±p0 by direction): the integrals of c², cS and S² are (L + cS)/2, S²/2 and iSS. A long
 * evanescent slice passes its values scaled by e^{−2κL} (L then multiplied by e^{−2κL} too).
 */
function constantPart(u0: number, q: number, m: number, s: number, mE: number, L: number, c: number, S: number, iSS: number): number {
  const icc = 0.5 * (L + c * S);
  const ics = 0.5 * S * S;
  const g = s / m;
  const uu = u0 * u0 * icc + 2 * u0 * m * q * ics + m * m * q * q * iSS;
  const pp = q * q * icc - 2 * q * g * u0 * ics + g * g * u0 * u0 * iSS;
  return uu / C + mE * pp;
}

/**
 * Carries (u, p) exactly across slice i at energy E, rightwards (dir = 1) or leftwards (dir = −1),
 * and adds the zeros of u inside the slice (and, with st.track, the slice's part of the integral).
 * Allocation-free: this is the inner loop of every search.
 */
function carry(d: Unpacked, E: number, i: number, dir: 1 | -1, st: Carry): void {
  const L = d.width[i]!;
  const dV = E - d.V[i]!;
  const m = d.mass[i]! * twoBandFactor(d.alpha[i]!, dV);
  const s = (m * dV) / C;
  const { u, p, track } = st;
  let u1: number;
  let p1: number;
  let whole = 0;
  // Scale of the slice's output relative to its input (long evanescent slices drop e^{κL}).
  let keep = 1;
  let part = 0;
  if (d.isLinear[i] === 1) {
    whole = carryLinear(d, E, i, dir, u, p, st);
    u1 = st.u;
    p1 = st.p;
  } else if (s > 0) {
    const k = Math.sqrt(s);
    const y = k * L;
    const c = Math.cos(y);
    const S = Math.sin(y) / k;
    u1 = u * c + m * p * dir * S;
    p1 = p * c - (s / m) * u * dir * S;
    whole = Math.floor(y / PI);
    if (track) part = constantPart(u, dir * p, m, s, massSlope(d.mass[i]!, d.alpha[i]!, dV), L, c, S, intS2(s, L, c, S));
  } else if (s < 0) {
    const kap = Math.sqrt(-s);
    const y = kap * L;
    if (y < SCALED_EVANESCENT) {
      const c = Math.cosh(y);
      const S = Math.sinh(y) / kap;
      u1 = u * c + m * p * dir * S;
      p1 = p * c - (s / m) * u * dir * S;
      if (track) part = constantPart(u, dir * p, m, s, massSlope(d.mass[i]!, d.alpha[i]!, dV), L, c, S, intS2(s, L, c, S));
    } else {
      const q = Math.exp(-2 * y);
      const ch = 0.5 * (1 + q);
      const sh = 0.5 * (1 - q);
      u1 = u * ch + (m * p * dir * sh) / kap;
      p1 = p * ch + (kap / m) * u * dir * sh;
      if (track) {
        keep = q;
        part = constantPart(u, dir * p, m, s, massSlope(d.mass[i]!, d.alpha[i]!, dV), L * q, ch, sh / kap, (L * q - (ch * sh) / kap) / (2 * s));
      }
    }
  } else {
    u1 = u + dir * m * p * L;
    p1 = p;
    if (track) part = constantPart(u, dir * p, m, 0, massSlope(d.mass[i]!, d.alpha[i]!, dV), L, 1, L, (L * L * L) / 3);
  }
  // Zeros inside the slice: `whole` full half-periods, plus one more when the observed sign change
  // disagrees with the parity of `whole` (exact: floor((β + kL)/π) with β ∈ [0, π) the initial phase).
  if (u === 0) {
    st.zeros += whole;
  } else if (u1 === 0) {
    st.zeros += whole + 1;
  } else {
    const flipped = (u > 0) !== (u1 > 0);
    st.zeros += whole + (flipped !== ((whole & 1) === 1) ? 1 : 0);
  }
  if (track && d.isLinear[i] !== 1) st.integral = st.integral * keep + part;
  const a = Math.abs(u1) + Math.abs(p1);
  if (a > BIG || a < SMALL) {
    u1 /= a;
    p1 /= a;
    if (track) st.integral /= a * a;
  }
  st.u = u1;
  st.p = p1;
}

/** ξψ² − ψ_ξ², whose difference is ∫ψ² dξ for ψ_ξξ = ξψ. */
const airySquare = (x: number, v: number, w: number): number => x * v * v - w * w;
/** (2ψψ_ξ − ξ²ψ² + ξψ_ξ²)/3, whose difference is ∫ψ_ξ² dξ for ψ_ξξ = ξψ. */
const airySlopeSquare = (x: number, v: number, w: number): number => (2 * v * w - x * x * v * v + x * w * w) / 3;

/** Gauss–Legendre 3-point nodes on [−1, 1] and weights (Abramowitz & Stegun 25.4.29). */
const GL_T = Math.sqrt(0.6);
const GL_W = [5 / 9, 8 / 9, 5 / 9];
/** Scratch of carryLinear: mass and (V − E)/C at the three nodes. */
const NODE_M = new Float64Array(3);
const NODE_W = new Float64Array(3);

/**
 * Carries (u, p) across linear slice i (V, mass, alpha linear in z) into st.u, st.p; returns the
 * number of whole half-periods of the phase passed (the zero count before the parity check).
 *
 * In the mass-weighted coordinate y = ∫ m(z, E)/m̄ dz (m̄ the slice's mean mass, so the slice keeps
 * its length L in y) the equation −C (ψ′/m)′ + (V − E) ψ = 0 becomes ψ_yy = Q(y) ψ with
 * Q = m̄² (V − E)/(C m), and p = ψ′/m = ψ_y/m̄: the mass variation is carried exactly, and only
 * Q's departure from a straight line is left. Q is replaced by its least-squares line over the
 * slice, Q0 + Q1 (y − y_c), Q0 = (m̄/L) ∫(V − E)/C dz and Q1 = (12/L³) ∫(y − y_c) m̄ (V − E)/C dz
 * (3-point Gauss–Legendre, exact for the quadratic m through the nodes); the remainder has zero
 * mean and zero first moment, so the energy errs at fourth order in the slice (a constant-mass
 * slice would err at second order: 1e-7 eV for the 64 pieces of a 15 nm grade). The line is solved
 * exactly by Airy functions: with β = Q1^{1/3}, ξ = β (y − y_c) + Q0/β² obeys ψ_ξξ = ξ ψ, and
 * (ψ, p) = (ψ, (β/m̄) ψ_ξ). A line too flat to resolve (|Q1| L below 1e-13 of |Q0| + 1/L²) is the
 * constant slice ψ_yy = Q0 ψ. The mass of each node is the two-band m(E − V) with its floor.
 */
function carryLinear(d: Unpacked, E: number, i: number, dir: 1 | -1, u: number, p: number, st: Carry): number {
  const L = d.width[i]!;
  const h = 0.5 * L;
  const tau = GL_T * h;
  const Vc = d.V[i]!;
  for (let k = 0; k < 3; k++) {
    const t = (k - 1) * tau;
    const Vk = Vc + d.gV[i]! * t;
    NODE_M[k] = (d.mass[i]! + d.gM[i]! * t) * twoBandFactor(d.alpha[i]! + d.gA[i]! * t, E - Vk);
    NODE_W[k] = (Vk - E) / C;
  }
  const mLeft = NODE_M[0]!;
  const mMid = NODE_M[1]!;
  const mRight = NODE_M[2]!;
  const mbar = (GL_W[0]! * mLeft + GL_W[1]! * mMid + GL_W[2]! * mRight) * 0.5;
  // m(t) = c0 + c1 t + c2 t² through the nodes; y(t) = ∫0^t m/m̄, y_c = (y(h) + y(−h))/2.
  const c1 = (mRight - mLeft) / (2 * tau);
  const c2 = (mRight + mLeft - 2 * mMid) / (2 * tau * tau);
  const yc = (c1 * h * h) / (2 * mbar);
  let q0 = 0;
  let q1 = 0;
  for (let k = 0; k < 3; k++) {
    const t = (k - 1) * tau;
    const y = (mMid * t + (c1 * t * t) / 2 + (c2 * t * t * t) / 3) / mbar;
    q0 += GL_W[k]! * NODE_W[k]!;
    q1 += GL_W[k]! * (y - yc) * NODE_W[k]!;
  }
  // ∫ dz = h Σ w_k; Q0 = m̄ ∫W dz / L, Q1 = 12 m̄ ∫(y − y_c) W dz / L³.
  const Q0 = (mbar * h * q0) / L;
  const Q1 = (12 * mbar * h * q1) / (L * L * L);
  // ∂m̄/∂E for the derivative integral, from the centre (an estimate: Newton only needs its size).
  const mE = massSlope(d.mass[i]!, d.alpha[i]!, E - Vc);
  if (Math.abs(Q1) * L <= 1e-13 * (Math.abs(Q0) + 1 / (L * L))) {
    const sq = -Q0;
    const c = cFun(sq, L);
    const S = sFun(sq, L);
    st.u = u * c + mbar * p * dir * S;
    st.p = p * c - (sq / mbar) * u * dir * S;
    if (st.track) st.integral += constantPart(u, dir * p, mbar, sq, mE, L, c, S, intS2(sq, L, c, S));
    return sq > 0 ? Math.floor((Math.sqrt(sq) * L) / PI) : 0;
  }
  const beta = Math.cbrt(Q1);
  const span = beta * L;
  const xiLeft = -0.5 * span + Q0 / (beta * beta);
  const t = AIRY;
  const xi0 = dir === 1 ? xiLeft : xiLeft + span;
  airyTransfer(xi0, dir * span, t);
  const d0 = (mbar / beta) * p;
  const u1 = t.uu * u + t.ud * d0;
  const d1 = t.du * u + t.dd * d0;
  st.u = u1;
  st.p = (beta / mbar) * d1;
  if (st.track) {
    // ∫ψ² dξ = [ξψ² − ψ_ξ²] and ∫ψ_ξ² dξ = [(2ψψ_ξ − ξ²ψ² + ξψ_ξ²)/3] for ψ_ξξ = ξψ; dz ≈ dy = dξ/β.
    const xi1 = xi0 + dir * span;
    const keep = Math.exp(-2 * t.gained);
    const uu = (dir / beta) * (airySquare(xi1, u1, d1) - keep * airySquare(xi0, u, d0));
    const pp = ((dir * beta) / (mbar * mbar)) * (airySlopeSquare(xi1, u1, d1) - keep * airySlopeSquare(xi0, u, d0));
    st.integral = st.integral * keep + uu / C + mE * pp;
  }
  return Math.floor(Math.abs(t.dtheta) / PI);
}

/** The Prüfer angle of (u, p) reduced to [0, π): the sign of a solution is free. */
const reducedAngle = (u: number, p: number): number => (u < 0 || (u === 0 && p < 0) ? Math.atan2(-u, -p) : Math.atan2(u, p));

/**
 * The solution decaying into an outer region (potential V, E ≤ V), at its edge: (1, ±κ/m), and
 * with st.track the integral over the region, ∫(u²/C + ∂m/∂E p²) = (1/C + ∂m/∂E κ²/m²)/(2κ).
 */
function startOuter(mass: number, alpha: number, V: number, E: number, side: 1 | -1, st: Carry): void {
  const m = mass * twoBandFactor(alpha, E - V);
  const kap = Math.sqrt(Math.max(0, (m * (V - E)) / C));
  st.u = 1;
  st.p = (side * kap) / m;
  st.zeros = 0;
  st.integral = st.track ? (1 / C + (massSlope(mass, alpha, E - V) * kap * kap) / (m * m)) / (2 * kap) : 0;
}

/** The solution decaying into the left outer region, at its edge (E ≤ its potential). */
const startLeft = (d: Unpacked, E: number, st: Carry): void => startOuter(d.mL, d.aL, d.VL, E, 1, st);

/**
 * One sweep from left to right at energy E (≤ barrier): fills `out` with N(E) and θ(z_R) − θ_R.
 * Allocation-free: this is the inner loop of every search.
 */
function sweep(d: Unpacked, E: number, out: Sweep, st: Carry): void {
  startLeft(d, E, st);
  for (let i = 0; i < d.n; i++) carry(d, E, i, 1, st);
  let { u, p } = st;
  if (u < 0 || (u === 0 && p < 0)) {
    u = -u;
    p = -p;
  }
  const mRe = d.mR * twoBandFactor(d.aR, E - d.VR);
  const kR = Math.sqrt(Math.max(0, mRe * (d.VR - E) / C));
  const phi = Math.atan2(u, p);
  const thetaR = Math.atan2(mRe, -kR);
  out.count = st.zeros + (u > 0 && p * mRe + kR * u < 0 ? 1 : 0);
  out.angle = st.zeros * PI + (phi - thetaR);
}

/**
 * The Prüfer mismatch θ_L(z_j) − θ_R(z_j) at boundary j, with the left-decaying solution carried
 * rightwards to z_j and the right-decaying one leftwards: zero modulo π exactly at eigenvalues and
 * increasing in E, like the mismatch at the right edge that `sweep` returns (j = n gives it), and
 * with the same integer offset, since θ_R falls by π at each zero passed leftwards. At a boundary
 * inside the well that holds the state both solutions stay O(1) there, so the mismatch is smooth
 * in E; at the right edge the left solution has crossed the barrier, where any admixture of the
 * growing solution takes over, and the mismatch is a step of width ~e^(−2κd) that no interpolating
 * root finder can use (A. Messiah, Quantum Mechanics I (1961), ch. III, for matching in the
 * classically allowed region; J. D. Pryce, Numerical Solution of Sturm–Liouville Problems (1993)
 * for the interior matching point of Prüfer shooting).
 *
 * With st.track also its E-derivative into out.slope: differentiating u′ = m p, p′ = ((V − E)/C) u
 * in E gives (p ∂u/∂E − u ∂p/∂E)′ = u²/C + (∂m/∂E) p², and θ = atan2(u, p) moves by
 * (p ∂u/∂E − u ∂p/∂E)/ρ², so ∂θ_L/∂E = ∫_{−∞}^{z_j}(u²/C + ∂m/∂E p²)/ρ_L² and ∂θ_R/∂E is minus the
 * same integral from z_j to +∞ over ρ_R² (the Prüfer-angle form of the Hellmann–Feynman identity;
 * Pryce (1993), ch. 2); both parts are positive. Exact on flat slices; on linear slices it takes
 * dz ≈ dy of the mass-weighted coordinate and ∂m/∂E at the centre (Newton then converges a little
 * slower than quadratically, never to another root).
 */
function sweepMatched(d: Unpacked, E: number, j: number, out: Sweep, st: Carry): void {
  startLeft(d, E, st);
  for (let i = 0; i < j; i++) carry(d, E, i, 1, st);
  const thetaL = st.zeros * PI + reducedAngle(st.u, st.p);
  const slopeL = st.integral / (st.u * st.u + st.p * st.p);
  // θ_R(z_R) = atan2(mRe, −kR) lies in [π/2, π), the reduced angle of (1, −kR/mRe).
  startOuter(d.mR, d.aR, d.VR, E, -1, st);
  for (let i = d.n - 1; i >= j; i--) carry(d, E, i, -1, st);
  // A zero exactly at z_j is counted by carry and sits at θ_R = −(zeros − 1)π, not at the reduced 0 less zeros·π.
  const thetaRj = st.u === 0 ? -(st.zeros - 1) * PI : reducedAngle(st.u, st.p) - st.zeros * PI;
  out.count = -1;
  out.angle = thetaL - thetaRj;
  out.slope = st.track ? slopeL + st.integral / (st.u * st.u + st.p * st.p) : NaN;
}

/**
 * The boundary to match a state at, chosen at an energy E inside its bracket: where the product
 * of the two decaying solutions, |u_L| + |p_L| times |u_R| + |p_R| (each grown from unit size at
 * its outer edge), is largest. At the eigenvalue both are the state, so this is where it is large;
 * the mismatch's slope at the root is ∫ψ²/ρ(z_j)² (ρ² = ψ² + (ψ′/m)², the Prüfer radius), so
 * matching there keeps it smooth. `log` is scratch of n + 1 values.
 */
function matchingBoundary(d: Unpacked, E: number, st: Carry, log: Float64Array): number {
  startLeft(d, E, st);
  log[0] = 0;
  for (let i = 0; i < d.n; i++) {
    carry(d, E, i, 1, st);
    const a = Math.abs(st.u) + Math.abs(st.p);
    log[i + 1] = log[i]! + Math.log(a);
    st.u /= a;
    st.p /= a;
  }
  const mRe = d.mR * twoBandFactor(d.aR, E - d.VR);
  st.u = 1;
  st.p = -Math.sqrt(Math.max(0, mRe * (d.VR - E) / C)) / mRe;
  let right = Math.log(Math.abs(st.u) + Math.abs(st.p));
  let best = d.n;
  let bestScore = log[d.n]! + right;
  for (let i = d.n - 1; i >= 0; i--) {
    carry(d, E, i, -1, st);
    const a = Math.abs(st.u) + Math.abs(st.p);
    right += Math.log(a);
    st.u /= a;
    st.p /= a;
    // Ties keep the right edge, where the mismatch needs no extra sweeps at the bracket ends.
    if (log[i]! + right > bestScore) {
      bestScore = log[i]! + right;
      best = i;
    }
  }
  return best;
}

/** The right edge of the deepest slice (first of equals): inside the well that holds the lowest states. */
function deepestBoundary(d: Unpacked): number {
  let j = 0;
  for (let i = 1; i < d.n; i++) if (d.V[i]! < d.V[j]!) j = i;
  return j + 1;
}

/**
 * Newton steps on the first matching boundary before it is chosen again: at a boundary where the
 * state is small the mismatch is a steep step that Newton crosses only by bisection. Measured over
 * the scenarios in runs/, a state matched at the deepest well's edge converges in 3–5 steps.
 */
const FIRST_TRY_STEPS = 6;
/** Safeguarded Newton halves the bracket at worst every other step; this is never reached with a true bracket. */
const MAX_STEPS = 200;

/**
 * Eigenvalue n in [a, b], isolated by the counts (the mismatch at any boundary is ≤ 0 at a and > 0
 * at b). Newton's method on the mismatch at boundary j (the deepest well's edge) with its analytic
 * derivative (sweepMatched), safeguarded by the bracket: a step that would leave the bracket, as
 * the bracket shrinks on every evaluation by the mismatch's sign, is a bisection (W. H. Press et
 * al., Numerical Recipes, 3rd ed. (2007), §9.4, rtsafe). If it has not converged after a few steps
 * (the state lives in another well), the boundary matchingBoundary picks inside the bracket takes
 * over. Any boundary gives the same root; the choice only sets how smooth the mismatch is.
 * Converged when a Newton step is below tol/2 + 2ε|E|: the error is then of the order of its square.
 */
function refine(d: Unpacked, n: number, j: number, a: number, b: number, tol: number,
  ws: Sweep, st: Carry, work: { evaluations: number }, logs: Float64Array): number {
  let lo = a;
  let hi = b;
  let k = j;
  let x = 0.5 * (a + b);
  st.track = true;
  try {
    for (let step = 0; step < MAX_STEPS; step++) {
      if (step === FIRST_TRY_STEPS) {
        st.track = false;
        k = matchingBoundary(d, x, st, logs);
        work.evaluations++;
        st.track = true;
      }
      sweepMatched(d, x, k, ws, st);
      work.evaluations++;
      const f = ws.angle - n * PI;
      if (f === 0) return x;
      if (f < 0) lo = x;
      else hi = x;
      const tol1 = 2 * Number.EPSILON * Math.abs(x) + 0.5 * tol;
      const newton = x - f / ws.slope;
      if (Math.abs(newton - x) <= tol1) return Math.min(Math.max(newton, lo), hi);
      x = newton > lo && newton < hi ? newton : 0.5 * (lo + hi);
      if (hi - lo <= 2 * tol1) return 0.5 * (lo + hi);
    }
    return 0.5 * (lo + hi);
  } finally {
    st.track = false;
  }
}

function checkOptions(options: SolveBandOptions | undefined): { maxStates: number; tol: number } {
  const maxStates = options?.maxStates ?? Number.POSITIVE_INFINITY;
  const tol = options?.tolerance_eV ?? DEFAULT_TOLERANCE;
  if (maxStates !== Number.POSITIVE_INFINITY && !(Number.isInteger(maxStates) && maxStates > 0)) {
    throw bad('options.maxStates', 'must be a positive integer', maxStates, 'omit it to keep every bound state');
  }
  if (!isFiniteNumber(tol) || tol <= 0) {
    throw bad('options.tolerance_eV', 'must be a positive energy in eV', tol, 'omit it for the default 1e-12 eV');
  }
  return { maxStates, tol };
}

/**
 * Number of bound states with particle energy strictly below `energy` (eV).
 *
 * Sturm oscillation count of the exact piecewise-constant transfer sweep (see the module comment).
 * For energies at or above the continuum edge (the lower outer potential) it is the total number of
 * bound states; at or below the lowest potential it is 0.
 * Example: a 10 nm well of depth 0.3 eV, mass 0.067 (barrier mass 0.092), at E = 0 → 0; at 0.3 → 3.
 */
export function countStatesBelow(profile: BandProfile, energy: number): number {
  if (!isFiniteNumber(energy)) throw bad('energy', 'must be a finite energy in eV', energy, 'pass a number');
  const d = unpack(profile);
  if (energy <= d.Vmin) return 0;
  const ws: Sweep = { count: 0, angle: 0, slope: NaN };
  sweep(d, Math.min(energy, d.barrier), ws, newCarry());
  return ws.count;
}

/**
 * Bound states of one band profile, ascending in particle energy, strictly between the lowest
 * potential and the continuum edge (the lower of the two outer potentials).
 *
 * Method: bisection on the oscillation count N(E) isolates each eigenvalue, then safeguarded Newton
 * steps on the continuous Prüfer mismatch refine it to `tolerance_eV` (default 1e-12 eV). State n (1-based)
 * has n − 1 nodes. Eigenvalues closer together than the floating-point resolution of E (a double well
 * behind a very thick barrier) are reported at one common energy rather than dropped.
 * Example: a 10 nm GaAs-like well (V = 0, m = 0.067) in barriers V = 0.3 eV, m = 0.092 has three
 * electron states: 0.03200, 0.12632 and 0.26763 eV.
 */
export function solveBand(profile: BandProfile, options?: SolveBandOptions): BandSolution {
  const { maxStates, tol } = checkOptions(options);
  const d = unpack(profile);
  const work = { evaluations: 0 };
  const energies: number[] = [];
  if (d.Vmin < d.barrier) {
    const ws: Sweep = { count: 0, angle: 0, slope: NaN };
    const st = newCarry();
    sweep(d, d.barrier, ws, st);
    work.evaluations++;
    const total = Math.min(ws.count, maxStates);
    const topCount = ws.count;
    if (total > 0) {
      const logs = new Float64Array(d.n + 1);
      const deepest = deepestBoundary(d);
      // Brackets on an explicit stack: [a, na, b, nb]; lower intervals are popped first. No state
      // lies at or below the lowest potential, so N(Vmin) = 0 needs no sweep.
      const stack: number[] = [d.Vmin, 0, d.barrier, topCount];
      const found = new Float64Array(total);
      while (stack.length > 0) {
        const nb = stack.pop()!;
        const b = stack.pop()!;
        const na = stack.pop()!;
        const a = stack.pop()!;
        if (na >= total || nb <= na) continue;
        if (nb - na === 1) {
          // The counts isolated one eigenvalue in [a, b].
          found[na] = refine(d, na, deepest, a, b, tol, ws, st, work, logs);
          continue;
        }
        const mid = 0.5 * (a + b);
        if (!(mid > a && mid < b) || b - a <= 4 * Number.EPSILON * Math.max(Math.abs(a), Math.abs(b))) {
          for (let k = na; k < Math.min(nb, total); k++) found[k] = mid;
          continue;
        }
        sweep(d, mid, ws, st);
        work.evaluations++;
        stack.push(mid, ws.count, b, nb);
        stack.push(a, na, mid, ws.count);
      }
      for (let k = 0; k < total; k++) energies.push(found[k]!);
    }
  }
  return {
    band: profile.band,
    sign: profile.sign,
    states: energies.map((energy, k) => ({ index: k + 1, energy, nodes: k })),
    barrier: d.barrier,
    evaluations: work.evaluations,
  };
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

/** c(x) = cos √s x (cosh for s < 0). */
function cFun(s: number, x: number): number {
  if (s > 0) return Math.cos(Math.sqrt(s) * x);
  if (s < 0) return Math.cosh(Math.sqrt(-s) * x);
  return 1;
}

/** S(x) = sin(√s x)/√s (sinh for s < 0, x for s = 0). */
function sFun(s: number, x: number): number {
  const t = s * x * x;
  if (Math.abs(t) < 1e-8) return x * (1 - t / 6 + (t * t) / 120);
  if (s > 0) {
    const k = Math.sqrt(s);
    return Math.sin(k * x) / k;
  }
  const k = Math.sqrt(-s);
  return Math.sinh(k * x) / k;
}

/** ∫0^L S(x)² dx = (L − c(L)S(L)) / (2s), by series in t = sL² where that cancels. */
function intS2(s: number, L: number, cL: number, SL: number): number {
  const t = s * L * L;
  if (Math.abs(t) < 1e-2) {
    return L * L * L * (1 / 3 - t / 15 + (2 * t * t) / 315 - (t * t * t) / 2835);
  }
  return (L - cL * SL) / (2 * s);
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
