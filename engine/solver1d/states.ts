/**
 * Bound states of one band of a 1-D heterostructure: the exact piecewise-constant transfer method
 * (the model and the closed forms of a slice are in slices.ts) with Prüfer-angle (oscillation-theorem)
 * state counting and Newton refinement of each level.
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

import { airyTransfer, newAiryTransfer } from '../airy.js';
import { HBAR2_OVER_2M0 } from '../constants.js';
import type { BandName, BandProfile } from '../profile.js';
import { bad, cFun, intS2, isFiniteNumber, MASS_FLOOR, SCALED_EVANESCENT, sFun, twoBandFactor, unpack, type Unpacked } from './slices.js';

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
/** Rescale (u, p) in the counting sweep beyond these magnitudes. */
const BIG = 1e150;
const SMALL = 1e-150;
const DEFAULT_TOLERANCE = 1e-12;

/**
 * Scratch for one sweep: count of eigenvalues below E and the total Prüfer mismatch θ(z_R) − θ_R
 * (or the mismatch at a matching boundary, with its E-derivative `slope` when tracked).
 */
interface Sweep {
  count: number;
  angle: number;
  slope: number;
}

/** Scratch of the Airy transfer across a sloped slice (sweeps are synchronous, so one suffices). */
const AIRY = newAiryTransfer();

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
