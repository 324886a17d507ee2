/**
 * Resonances (quasi-bound states) of one band: Siegert poles of the exact piecewise transfer of
 * solver1d, continued in the field from the zero-field bound states.
 *
 * A state that a field lets escape into the downhill contact is not an eigenstate of the open
 * structure but a pole of its scattering matrix at a complex energy E = E_r − iΓ/2 whose solution
 * is purely outgoing in every open outer region and decays in every closed one (A. J. F. Siegert,
 * Phys. Rev. 56, 750 (1939); G. Gamow, Z. Phys. 51, 204 (1928)). The same exact slice-by-slice
 * transfer as solver1d (BenDaniel–Duke continuity of ψ and ψ′/m, two-band mass with its floor)
 * carries (ψ, ψ′/m) at complex E: in a slice u(x) = u0 cos(qx) + m p0 sin(qx)/q,
 * p(x) = p0 cos(qx) − ((E − V)/(ħ²/2m0)) u0 sin(qx)/q, q² = m(E)(E − V)/(ħ²/2m0); both are even in q
 * so no branch is chosen inside the stack. In an outer region ψ = e^{∓ik(z − z_edge)} (outgoing
 * to the left / right): an open region (Re E above its edge) takes the principal k = √(q²), the
 * continuation of the real wavenumber into the lower half-plane; a closed one k = i√(−q²), the
 * decaying branch. The pole is a zero of the analytic mismatch of the two solutions at a boundary
 * where the zero-field state is largest (see mismatch), found by the secant method in the complex
 * plane (J. Stoer and R. Bulirsch, Introduction to Numerical Analysis, §5.9). A closed side is cut
 * where the state has decayed by e^{−40} (see trimmed).
 *
 * Width: the continuity equation of the decaying state ψ e^{−iEt/ħ} over any interval [a, b] gives
 * Γ ∫_a^b ρ dz = ħ (j(b) − j(a)), j = (ħ/m0) Im(ψ* ψ′/m), exactly at the pole, with
 * ρ = |ψ|² + (ħ²/2m0) alpha·mass |ψ′/m|² for the two-band mass m(E) = mass (1 + alpha (E − V)): the
 * second term, from ∂(1/m)/∂E, is the norm an energy-dependent Hamiltonian carries beyond |ψ|² (it
 * follows from subtracting the equation at E and at E* and integrating; where the mass sits on its
 * floor it does not depend on E and the term is absent). Γ is taken from this flux over the norm on
 * the stack and the closed tails, not from Im E: behind a thick barrier the coupling to the contact
 * is far below the rounding of E (Γ ≈ 1e-18 eV for a 10 nm GaAs well at 50 kV/cm), while the
 * outgoing amplitude relative to the well's, carried with a log scale, keeps its full relative
 * precision. Where Γ is resolvable the two agree (test/reference/field).
 *
 * Tracking: the field is raised from 0 to F in steps, the pole at each step found from the
 * prediction of the previous two (natural-parameter continuation, E. L. Allgower and K. Georg,
 * Introduction to Numerical Continuation Methods (1990), ch. 1); a step is accepted when the secant
 * converges within a quarter of the state's zero-field spacing of the prediction, else halved. So a
 * reported resonance is the continuation of a bound state of the well, never a state of a contact.
 *
 * Units: energies eV (particle sense of BandProfile), lengths nm, masses m0.
 */
import { HBAR2_OVER_2M0 } from './constants.js';
import type { BandProfile } from './profile.js';
import { MASS_FLOOR, requireFlat, twoBandFactor, unpack, type Unpacked } from './solver1d/slices.js';

const C = HBAR2_OVER_2M0;

/** A resonance (or, with both outer regions closed, a bound state) as a pole of the open structure. */
export interface Pole {
  /** Re E, the resonance energy (eV, particle sense). */
  readonly energy: number;
  /** Im E (eV): −Γ/2 where Γ is above the rounding of E, else rounding noise; see resonanceWidth. */
  readonly imaginary: number;
  /** Outer regions taken as open (outgoing wave) rather than closed (decaying). */
  readonly openLeft: boolean;
  readonly openRight: boolean;
  /** Where the two solutions are matched (nm from the first slice's left edge): the seed's anchor. */
  readonly anchor_nm: number;
}

/** Secant iterations before a pole search gives up. */
const MAX_SECANT = 60;
/** Convergence of a pole's energy (eV), as solver1d's bound states. */
const POLE_TOLERANCE = 1e-12;
/** First secant step (eV). */
const SECANT_PROBE = 1e-6;
/** A pole above the real axis by more than this (eV) is not a decaying state: rejected. */
const UPPER_HALF_PLANE = 1e-9;
/** Decay (∫ Re κ dz) beyond which a closed side is cut off (see trimmed). */
const DECAYED = 40;
/** Smallest continuation step (fraction of the field) before a state is declared lost. */
const MIN_STEP = 1 / 4096;
/** |Im(qL)| above which a slice is carried with e^{|Im qL|} factored out (cosh overflows near 710). */
const SCALED = 20;
const BIG = 1e150;
const SMALL = 1e-150;
/**
 * Gauss–Legendre 3-point rule on [0, 1] (Abramowitz & Stegun 25.4.30), on panels across which ψ
 * changes phase or scale by at most PANEL (|q|·h ≤ PANEL): the relative error of ∫|ψ|², whose
 * sixth derivative is at most (2|q|)⁶ times it, is below (2·PANEL)⁶/2016000 ≈ 8e-9 per panel.
 */
const GL_X = [0.5 - 0.5 * Math.sqrt(0.6), 0.5, 0.5 + 0.5 * Math.sqrt(0.6)];
const GL_W = [5 / 18, 8 / 18, 5 / 18];
const PANEL = 0.25;

/** (u, p) = (ψ, ψ′/m) of a complex solution with a log scale: the true value is (u, p)·e^log. */
interface Carry {
  ur: number; ui: number; pr: number; pi: number; log: number;
}

/** Scratch of one slice step: cos(qL), sin(qL)/q (complex) and the log factored out of both. */
interface Coeffs {
  cr: number; ci: number; Sr: number; Si: number; gained: number;
}

const newCarry = (): Carry => ({ ur: 0, ui: 0, pr: 0, pi: 0, log: 0 });
const newCoeffs = (): Coeffs => ({ cr: 0, ci: 0, Sr: 0, Si: 0, gained: 0 });

/** Principal square root of x + iy into out[0], out[1] (branch cut on the negative real axis). */
function csqrt(x: number, y: number, out: Float64Array): void {
  const r = Math.sqrt(x * x + y * y);
  if (x >= 0) {
    const t = Math.sqrt(0.5 * (r + x));
    out[0] = t;
    out[1] = t === 0 ? 0 : y / (2 * t);
  } else {
    const t = Math.sqrt(0.5 * (r - x));
    out[0] = Math.abs(y) / (2 * t);
    out[1] = y < 0 ? -t : t;
  }
}

/** cos(qL) and sin(qL)/q for q² = s (complex), L ≥ 0, with e^{|Im qL|} factored out where large. */
function coefficients(sr: number, si: number, L: number, out: Coeffs, sq: Float64Array): void {
  csqrt(sr, si, sq);
  coefficientsQ(sq[0]!, sq[1]!, sr, si, L, out);
}

/** coefficients with q = √s given (either sign: both results are even in q). */
function coefficientsQ(qr: number, qi: number, sr: number, si: number, L: number, out: Coeffs): void {
  const w2r = sr * L * L;
  const w2i = si * L * L;
  if (Math.abs(w2r) + Math.abs(w2i) < 1e-6) {
    // Series: |qL| < 1e-3 (the closed forms divide by a vanishing q).
    const w4r = w2r * w2r - w2i * w2i;
    const w4i = 2 * w2r * w2i;
    out.cr = 1 - w2r / 2 + w4r / 24;
    out.ci = -w2i / 2 + w4i / 24;
    out.Sr = L * (1 - w2r / 6 + w4r / 120);
    out.Si = L * (-w2i / 6 + w4i / 120);
    out.gained = 0;
    return;
  }
  const a = qr * L;
  const b = qi * L;
  const ab = Math.abs(b);
  let ch: number;
  let sh: number;
  if (ab > SCALED) {
    const e = Math.exp(-2 * ab);
    ch = 0.5 * (1 + e);
    sh = (b > 0 ? 0.5 : -0.5) * (1 - e);
    out.gained = ab;
  } else {
    ch = Math.cosh(b);
    sh = Math.sinh(b);
    out.gained = 0;
  }
  const ca = Math.cos(a);
  const sa = Math.sin(a);
  out.cr = ca * ch;
  out.ci = -sa * sh;
  const snr = sa * ch;
  const sni = ca * sh;
  const den = qr * qr + qi * qi;
  out.Sr = (snr * qr + sni * qi) / den;
  out.Si = (sni * qr - snr * qi) / den;
}

/** Two-band mass at complex E − V into out[0], out[1]; its floor applies by the real part (solver1d's twoBandFactor). */
function massAt(mass: number, alpha: number, dVr: number, dVi: number, out: Float64Array): void {
  const xr = 1 + alpha * dVr;
  if (xr < MASS_FLOOR) {
    out[0] = mass * MASS_FLOOR;
    out[1] = 0;
  } else {
    out[0] = mass * xr;
    out[1] = mass * alpha * dVi;
  }
}

/** Scratch shared by one pole computation. */
interface Work {
  readonly co: Coeffs;
  readonly m: Float64Array;
  readonly sq: Float64Array;
  readonly st: Carry;
  evaluations: number;
}

const newWork = (): Work => ({ co: newCoeffs(), m: new Float64Array(2), sq: new Float64Array(2), st: newCarry(), evaluations: 0 });

/** Carries (u, p) exactly across slice i at complex energy E, rightwards (dir 1) or leftwards (−1). */
function step(d: Unpacked, Er: number, Ei: number, i: number, dir: 1 | -1, w: Work): void {
  const st = w.st;
  const dVr = Er - d.V[i]!;
  const dVi = Ei;
  massAt(d.mass[i]!, d.alpha[i]!, dVr, dVi, w.m);
  const mr = w.m[0]!;
  const mi = w.m[1]!;
  const sr = (mr * dVr - mi * dVi) / C;
  const si = (mr * dVi + mi * dVr) / C;
  const co = w.co;
  coefficients(sr, si, d.width[i]!, co, w.sq);
  const Sr = dir * co.Sr;
  const Si = dir * co.Si;
  const { ur, ui, pr, pi } = st;
  // u1 = u c + (m p) S;  p1 = p c − ((E − V)/C) u S.
  const mpr = mr * pr - mi * pi;
  const mpi = mr * pi + mi * pr;
  let u1r = ur * co.cr - ui * co.ci + mpr * Sr - mpi * Si;
  let u1i = ur * co.ci + ui * co.cr + mpr * Si + mpi * Sr;
  const gur = (dVr * ur - dVi * ui) / C;
  const gui = (dVr * ui + dVi * ur) / C;
  let p1r = pr * co.cr - pi * co.ci - (gur * Sr - gui * Si);
  let p1i = pr * co.ci + pi * co.cr - (gur * Si + gui * Sr);
  let log = st.log + co.gained;
  const a = Math.abs(u1r) + Math.abs(u1i) + Math.abs(p1r) + Math.abs(p1i);
  if (a > BIG || a < SMALL) {
    u1r /= a; u1i /= a; p1r /= a; p1i /= a;
    log += Math.log(a);
  }
  st.ur = u1r; st.ui = u1i; st.pr = p1r; st.pi = p1i; st.log = log;
}

/**
 * Wavenumber of an outer region at complex E into out[0..1] and its mass into out[2..3]: ψ = e^{ik|z − edge|}
 * away from the stack; open: k = √(m(E − V)/C) (principal), closed: k = i √(m(V − E)/C).
 */
function outerWave(mass: number, alpha: number, V: number, Er: number, Ei: number, open: boolean, w: Work, out: Float64Array): void {
  const dVr = Er - V;
  massAt(mass, alpha, dVr, Ei, w.m);
  const mr = w.m[0]!;
  const mi = w.m[1]!;
  const sr = (mr * dVr - mi * Ei) / C;
  const si = (mr * Ei + mi * dVr) / C;
  if (open) {
    csqrt(sr, si, w.sq);
    out[0] = w.sq[0]!;
    out[1] = w.sq[1]!;
  } else {
    csqrt(-sr, -si, w.sq);
    out[0] = -w.sq[1]!;
    out[1] = w.sq[0]!;
  }
  out[2] = mr;
  out[3] = mi;
}

/** Sets (u, p) = (1, ±ik/m) of the outgoing or decaying wave at the left (side −1) or right (side 1) edge. */
function startAt(d: Unpacked, Er: number, Ei: number, side: -1 | 1, open: boolean, w: Work, k: Float64Array): void {
  if (side < 0) outerWave(d.mL, d.aL, d.VL, Er, Ei, open, w, k);
  else outerWave(d.mR, d.aR, d.VR, Er, Ei, open, w, k);
  // ψ′ = side · i k ψ at the edge (e^{−ikz} to the left, e^{ikz} to the right).
  const dr = -side * k[1]!;
  const di = side * k[0]!;
  const mr = k[2]!;
  const mi = k[3]!;
  const den = mr * mr + mi * mi;
  const st = w.st;
  st.ur = 1; st.ui = 0; st.log = 0;
  st.pr = (dr * mr + di * mi) / den;
  st.pi = (di * mr - dr * mi) / den;
}

interface Sides {
  readonly openLeft: boolean;
  readonly openRight: boolean;
}

/**
 * The mismatch W/D at boundary j, W = λ(u_L p_R − u_R p_L), D = u_L u_R + λ² p_L p_R (λ in m0·nm,
 * real): into out[0], out[1]. Both are bilinear in the two solutions, so the rescaling of either
 * cancels and the ratio is analytic in E; on the real axis it is tan(θ_L − θ_R) of the Prüfer angles
 * of (u, λp) = ρ (sin θ, cos θ), zero at the poles sought and infinite only half-way between them in
 * phase, whereas p_L/u_L − p_R/u_R would also blow up wherever ψ has a node at the matching boundary.
 */
function mismatch(d: Unpacked, Er: number, Ei: number, sides: Sides, j: number, lambda: number, w: Work, k: Float64Array, out: Float64Array): void {
  const st = w.st;
  startAt(d, Er, Ei, -1, sides.openLeft, w, k);
  for (let i = 0; i < j; i++) step(d, Er, Ei, i, 1, w);
  const uLr = st.ur; const uLi = st.ui;
  const pLr = st.pr * lambda; const pLi = st.pi * lambda;
  startAt(d, Er, Ei, 1, sides.openRight, w, k);
  for (let i = d.n - 1; i >= j; i--) step(d, Er, Ei, i, -1, w);
  const uRr = st.ur; const uRi = st.ui;
  const pRr = st.pr * lambda; const pRi = st.pi * lambda;
  const Wr = uLr * pRr - uLi * pRi - (uRr * pLr - uRi * pLi);
  const Wi = uLr * pRi + uLi * pRr - (uRr * pLi + uRi * pLr);
  const Dr = uLr * uRr - uLi * uRi + (pLr * pRr - pLi * pRi);
  const Di = uLr * uRi + uLi * uRr + (pLr * pRi + pLi * pRr);
  const den = Dr * Dr + Di * Di;
  out[0] = (Wr * Dr + Wi * Di) / den;
  out[1] = (Wi * Dr - Wr * Di) / den;
  w.evaluations++;
}

/** λ of the mismatch at boundary j: m/|q| of the slice beside it at E (the length that balances u and λp), at least m·1 nm. */
function balance(d: Unpacked, Er: number, j: number): number {
  const i = Math.min(j, d.n - 1);
  const dV = Er - d.V[i]!;
  const m = d.mass[i]! * twoBandFactor(d.alpha[i]!, dV);
  return m / Math.max(Math.sqrt((m * Math.abs(dV)) / C), 1);
}

/** The boundary nearest z (nm). */
function boundaryNear(d: Unpacked, z: number): number {
  let lo = 0;
  let hi = d.n;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (d.edge[mid]! <= z) lo = mid;
    else hi = mid;
  }
  return z - d.edge[lo]! <= d.edge[hi]! - z ? lo : hi;
}

/**
 * Secant iteration on the mismatch from E0 (complex); steps longer than `cap` eV are shortened.
 * Returns the root in out[0], out[1], or false when it does not converge.
 */
function secant(d: Unpacked, E0r: number, E0i: number, sides: Sides, j: number, cap: number, w: Work, out: Float64Array): boolean {
  const k = new Float64Array(4);
  const f = new Float64Array(2);
  let x0r = E0r;
  let x0i = E0i;
  const lambda = balance(d, E0r, j);
  mismatch(d, x0r, x0i, sides, j, lambda, w, k, f);
  let f0r = f[0]!;
  let f0i = f[1]!;
  let x1r = E0r + SECANT_PROBE;
  let x1i = E0i;
  mismatch(d, x1r, x1i, sides, j, lambda, w, k, f);
  let f1r = f[0]!;
  let f1i = f[1]!;
  for (let it = 0; it < MAX_SECANT; it++) {
    if (f1r === 0 && f1i === 0) break;
    // dx = −f1 (x1 − x0)/(f1 − f0)
    const dfr = f1r - f0r;
    const dfi = f1i - f0i;
    const den = dfr * dfr + dfi * dfi;
    if (!(den > 0) || !Number.isFinite(den)) return false;
    const qr = (f1r * dfr + f1i * dfi) / den;
    const qi = (f1i * dfr - f1r * dfi) / den;
    const hr = x1r - x0r;
    const hi = x1i - x0i;
    let dxr = -(qr * hr - qi * hi);
    let dxi = -(qr * hi + qi * hr);
    const size = Math.hypot(dxr, dxi);
    if (!Number.isFinite(size)) return false;
    if (size > cap) {
      dxr *= cap / size;
      dxi *= cap / size;
    }
    x0r = x1r; x0i = x1i; f0r = f1r; f0i = f1i;
    x1r += dxr;
    x1i += dxi;
    if (size <= POLE_TOLERANCE) break;
    mismatch(d, x1r, x1i, sides, j, lambda, w, k, f);
    f1r = f[0]!;
    f1i = f[1]!;
    if (it === MAX_SECANT - 1) return false;
  }
  out[0] = x1r;
  out[1] = x1i;
  return Number.isFinite(x1r) && Number.isFinite(x1i);
}

/**
 * The solution at a pole joined at boundary j: (u, p, log) at every boundary, the left solution up
 * to j and the right one (rescaled to agree in u at j) beyond; per slice m(E) and q² at E.
 */
interface Joined {
  readonly d: Unpacked;
  readonly ur: Float64Array; readonly ui: Float64Array;
  readonly pr: Float64Array; readonly pi: Float64Array;
  readonly lg: Float64Array;
  readonly mr: Float64Array; readonly mi: Float64Array;
  readonly sr: Float64Array; readonly si: Float64Array;
  /** q = √(q²) per slice, Im q ≥ 0. */
  readonly qr: Float64Array; readonly qi: Float64Array;
  /** Outer wavenumbers (k, with ψ = u e^{ik|z − edge|}) and masses: [kr, ki, mr, mi]. */
  readonly kL: Float64Array; readonly kR: Float64Array;
  readonly sides: Sides;
}

function join(d: Unpacked, Er: number, Ei: number, sides: Sides, j: number, w: Work): Joined {
  const n = d.n;
  const ur = new Float64Array(n + 1);
  const ui = new Float64Array(n + 1);
  const pr = new Float64Array(n + 1);
  const pi = new Float64Array(n + 1);
  const lg = new Float64Array(n + 1);
  const st = w.st;
  const save = (i: number): void => {
    ur[i] = st.ur; ui[i] = st.ui; pr[i] = st.pr; pi[i] = st.pi; lg[i] = st.log;
  };
  const kL = new Float64Array(4);
  const kR = new Float64Array(4);
  startAt(d, Er, Ei, -1, sides.openLeft, w, kL);
  save(0);
  for (let i = 0; i < j; i++) {
    step(d, Er, Ei, i, 1, w);
    save(i + 1);
  }
  const uLr = st.ur;
  const uLi = st.ui;
  const logL = st.log;
  startAt(d, Er, Ei, 1, sides.openRight, w, kR);
  const right = { ur: new Float64Array(n + 1), ui: new Float64Array(n + 1), pr: new Float64Array(n + 1), pi: new Float64Array(n + 1), lg: new Float64Array(n + 1) };
  const keep = (i: number): void => {
    right.ur[i] = st.ur; right.ui[i] = st.ui; right.pr[i] = st.pr; right.pi[i] = st.pi; right.lg[i] = st.log;
  };
  keep(n);
  for (let i = n - 1; i >= j; i--) {
    step(d, Er, Ei, i, -1, w);
    keep(i);
  }
  // Scale the right solution by r = u_L(z_j)/u_R(z_j) (complex part, |r| normalised into the log).
  const den = right.ur[j]! * right.ur[j]! + right.ui[j]! * right.ui[j]!;
  let rr = (uLr * right.ur[j]! + uLi * right.ui[j]!) / den;
  let ri = (uLi * right.ur[j]! - uLr * right.ui[j]!) / den;
  const size = Math.hypot(rr, ri);
  rr /= size;
  ri /= size;
  const shift = logL - right.lg[j]! + Math.log(size);
  for (let i = j + 1; i <= n; i++) {
    ur[i] = rr * right.ur[i]! - ri * right.ui[i]!;
    ui[i] = rr * right.ui[i]! + ri * right.ur[i]!;
    pr[i] = rr * right.pr[i]! - ri * right.pi[i]!;
    pi[i] = rr * right.pi[i]! + ri * right.pr[i]!;
    lg[i] = right.lg[i]! + shift;
  }
  const mr = new Float64Array(n);
  const mi = new Float64Array(n);
  const sr = new Float64Array(n);
  const si = new Float64Array(n);
  const qr = new Float64Array(n);
  const qi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const dVr = Er - d.V[i]!;
    massAt(d.mass[i]!, d.alpha[i]!, dVr, Ei, w.m);
    mr[i] = w.m[0]!;
    mi[i] = w.m[1]!;
    sr[i] = (mr[i]! * dVr - mi[i]! * Ei) / C;
    si[i] = (mr[i]! * Ei + mi[i]! * dVr) / C;
    csqrt(sr[i]!, si[i]!, w.sq);
    const flip = w.sq[1]! < 0 ? -1 : 1;
    qr[i] = flip * w.sq[0]!;
    qi[i] = flip * w.sq[1]!;
  }
  w.evaluations += 2;
  return { d, ur, ui, pr, pi, lg, mr, mi, sr, si, qr, qi, kL, kR, sides };
}

/** e^{iqt} for Im q ≥ 0, t ≥ 0 (magnitude ≤ 1) into out[at], out[at + 1]. */
function expIq(qr: number, qi: number, t: number, out: Float64Array, at: number): void {
  const e = Math.exp(-qi * t);
  out[at] = e * Math.cos(qr * t);
  out[at + 1] = e * Math.sin(qr * t);
}

/**
 * sin(qy)/sin(qL) into tmp[at..at+1] and cos(qy)/sin(qL) into tmp[at+2..at+3], Im q ≥ 0, given
 * 1 − e^{2iqL} = dr + i di (dd = |·|²); tmp[12..15] is scratch.
 */
function ratios(qr: number, qi: number, L: number, y: number, dr: number, di: number, dd: number, tmp: Float64Array, at: number): void {
  expIq(qr, qi, L - y, tmp, 12);
  expIq(qr, qi, 2 * y, tmp, 14);
  const ar = tmp[12]! * (1 - tmp[14]!) + tmp[13]! * tmp[15]!;
  const ai = -tmp[12]! * tmp[15]! + tmp[13]! * (1 - tmp[14]!);
  tmp[at] = (ar * dr + ai * di) / dd;
  tmp[at + 1] = (ai * dr - ar * di) / dd;
  const br = tmp[12]! * (1 + tmp[14]!) - tmp[13]! * tmp[15]!;
  const bi = tmp[12]! * tmp[15]! + tmp[13]! * (1 + tmp[14]!);
  // −i (b / den)
  tmp[at + 2] = (bi * dr - br * di) / dd;
  tmp[at + 3] = -(br * dr + bi * di) / dd;
}

/** A complex value with a log scale: (re + i im)·e^log, for ψ and ψ′/m at one point. */
interface Point {
  ur: number; ui: number; pr: number; pi: number; log: number;
}

const newPoint = (): Point => ({ ur: 0, ui: 0, pr: 0, pi: 0, log: 0 });

/**
 * ψ and ψ′/m at x ∈ [0, L] inside slice i of a joined solution. Slices where Im q·L ≤ 1 use the
 * initial values at their left end; more evanescent ones the two-point form
 * ψ = [u_i sin q(L − x) + u_{i+1} sin qx]/sin qL, ψ′ = q [u_{i+1} cos qx − u_i cos q(L − x)]/sin qL,
 * written with decaying exponentials only (Im q ≥ 0), so neither end's growing solution enters:
 * sin(qy)/sin(qL) = e^{iq(L−y)}(1 − e^{2iqy})/(1 − e^{2iqL}) and
 * cos(qy)/sin(qL) = −i e^{iq(L−y)}(1 + e^{2iqy})/(1 − e^{2iqL}).
 */
function pointInSlice(J: Joined, i: number, x: number, w: Work, out: Point, tmp: Float64Array): void {
  const d = J.d;
  const L = d.width[i]!;
  const qr = J.qr[i]!;
  const qi = J.qi[i]!;
  const mr = J.mr[i]!;
  const mi = J.mi[i]!;
  if (qi * L <= 1) {
    const co = w.co;
    coefficientsQ(qr, qi, J.sr[i]!, J.si[i]!, x, co);
    const u0r = J.ur[i]!;
    const u0i = J.ui[i]!;
    const p0r = J.pr[i]!;
    const p0i = J.pi[i]!;
    const mpr = mr * p0r - mi * p0i;
    const mpi = mr * p0i + mi * p0r;
    out.ur = u0r * co.cr - u0i * co.ci + mpr * co.Sr - mpi * co.Si;
    out.ui = u0r * co.ci + u0i * co.cr + mpr * co.Si + mpi * co.Sr;
    // p = p0 c − ((E − V)/C) u0 S, with (E − V)/C = q²/m.
    const den = mr * mr + mi * mi;
    const gr = (J.sr[i]! * mr + J.si[i]! * mi) / den;
    const gi = (J.si[i]! * mr - J.sr[i]! * mi) / den;
    const gur = gr * u0r - gi * u0i;
    const gui = gr * u0i + gi * u0r;
    out.pr = p0r * co.cr - p0i * co.ci - (gur * co.Sr - gui * co.Si);
    out.pi = p0r * co.ci + p0i * co.cr - (gur * co.Si + gui * co.Sr);
    out.log = J.lg[i]!;
    return;
  }
  expIq(qr, qi, 2 * L, tmp, 0);
  const dr = 1 - tmp[0]!;
  const di = -tmp[1]!;
  const dd = dr * dr + di * di;
  ratios(qr, qi, L, L - x, dr, di, dd, tmp, 2);
  ratios(qr, qi, L, x, dr, di, dd, tmp, 6);
  const l0 = J.lg[i]!;
  const l1 = J.lg[i + 1]!;
  const ref = Math.max(l0, l1);
  const a0 = Math.exp(l0 - ref);
  const a1 = Math.exp(l1 - ref);
  const u0r = a0 * J.ur[i]!;
  const u0i = a0 * J.ui[i]!;
  const u1r = a1 * J.ur[i + 1]!;
  const u1i = a1 * J.ui[i + 1]!;
  out.ur = u0r * tmp[2]! - u0i * tmp[3]! + u1r * tmp[6]! - u1i * tmp[7]!;
  out.ui = u0r * tmp[3]! + u0i * tmp[2]! + u1r * tmp[7]! + u1i * tmp[6]!;
  // ψ′ = q (u1 K(x) − u0 K(L − x)), p = ψ′/m.
  const vr = u1r * tmp[8]! - u1i * tmp[9]! - (u0r * tmp[4]! - u0i * tmp[5]!);
  const vi = u1r * tmp[9]! + u1i * tmp[8]! - (u0r * tmp[5]! + u0i * tmp[4]!);
  const qvr = qr * vr - qi * vi;
  const qvi = qr * vi + qi * vr;
  const den = mr * mr + mi * mi;
  out.pr = (qvr * mr + qvi * mi) / den;
  out.pi = (qvi * mr - qvr * mi) / den;
  out.log = ref;
}

/**
 * Integrals of a joined solution over the stack and its outer tails, at the log scale `ref`: ρ over
 * the stack and the closed tails (whose flux vanishes at infinity), the flux through the open
 * edges, and ∫ψ² over the stack and every tail, an open one regularised (its outgoing wave
 * u e^{ik t} with Im k < 0 grows; the analytic continuation of ∫_0^∞ e^{2ikt} dt, u² i/(2k), is its
 * value: Ya. B. Zel'dovich, Sov. Phys. JETP 12, 542 (1961)).
 */
interface Norms {
  /** ∫ρ, ρ = |ψ|² + C·alpha·mass·|ψ′/m|² (the flux identity's density; see the module comment). */
  readonly density: number;
  /** ∫ψ² (bilinear, complex). */
  readonly cr: number;
  readonly ci: number;
  /** Im(ψ* ψ′/m) out through the open edges: right edge minus left edge. */
  readonly flux: number;
  readonly ref: number;
}

/** C·alpha·mass where the two-band mass depends on E at this real energy, 0 on its floor. */
const derivativeWeight = (mass: number, alpha: number, dVr: number): number => (1 + alpha * dVr < MASS_FLOOR ? 0 : C * alpha * mass);

function norms(J: Joined, Er: number, w: Work): Norms {
  const d = J.d;
  let ref = -Infinity;
  for (let i = 0; i <= d.n; i++) {
    const a = J.lg[i]! + 0.5 * Math.log(J.ur[i]! * J.ur[i]! + J.ui[i]! * J.ui[i]! + J.pr[i]! * J.pr[i]! + J.pi[i]! * J.pi[i]!);
    if (a > ref) ref = a;
  }
  let density = 0;
  let cr = 0;
  let ci = 0;
  const v = newPoint();
  const tmp = new Float64Array(16);
  for (let i = 0; i < d.n; i++) {
    const L = d.width[i]!;
    const rate = Math.max(Math.abs(J.qr[i]!), J.qi[i]!);
    const panels = Math.max(1, Math.ceil((rate * L) / PANEL));
    const h = L / panels;
    const extra = derivativeWeight(d.mass[i]!, d.alpha[i]!, Er - d.V[i]!);
    for (let p = 0; p < panels; p++) {
      for (let g = 0; g < GL_X.length; g++) {
        pointInSlice(J, i, (p + GL_X[g]!) * h, w, v, tmp);
        const s = Math.exp(2 * (v.log - ref)) * GL_W[g]! * h;
        density += s * (v.ur * v.ur + v.ui * v.ui + extra * (v.pr * v.pr + v.pi * v.pi));
        cr += s * (v.ur * v.ur - v.ui * v.ui);
        ci += s * 2 * v.ur * v.ui;
      }
    }
  }
  let flux = 0;
  // Tails u e^{ik t}, t ≥ 0 away from the edge. Open: the flux through the edge. Closed:
  // ∫|u|² e^{−2 Im k t} = |u|²/(2 Im k), the same times |k/m|² for |ψ′/m|². Both: ∫ψ² = u² i/(2k).
  const ends: readonly [number, Float64Array, boolean, -1 | 1, number, number, number][] = [
    [0, J.kL, J.sides.openLeft, -1, d.mL, d.aL, d.VL],
    [d.n, J.kR, J.sides.openRight, 1, d.mR, d.aR, d.VR],
  ];
  for (const [b, k, open, side, mass, alpha, V] of ends) {
    const s = Math.exp(2 * (J.lg[b]! - ref));
    const ur = J.ur[b]!;
    const ui = J.ui[b]!;
    const kr = k[0]!;
    const ki = k[1]!;
    if (open) {
      flux += side * s * (ur * J.pi[b]! - ui * J.pr[b]!);
    } else {
      const u2 = ur * ur + ui * ui;
      const km2 = (kr * kr + ki * ki) / (k[2]! * k[2]! + k[3]! * k[3]!);
      density += (s * u2 * (1 + derivativeWeight(mass, alpha, Er - V) * km2)) / (2 * ki);
    }
    const u2r = ur * ur - ui * ui;
    const u2i = 2 * ur * ui;
    // i/(2k) = i k̄ / (2|k|²)
    const kk = 2 * (kr * kr + ki * ki);
    const gr = ki / kk;
    const gi = kr / kk;
    cr += s * (u2r * gr - u2i * gi);
    ci += s * (u2r * gi + u2i * gr);
  }
  return { density, cr, ci, flux, ref };
}

/**
 * The profile without the part of a closed side where the state has decayed: beyond the boundary
 * where ∫ Re κ dz from the anchor exceeds DECAYED (κ at real energy Er), the last slice kept is
 * continued as the outer region. The solution there is e^{−DECAYED} of its size at the anchor, so
 * the pole moves by a relative e^{−2·DECAYED} ≈ 2e-35: nothing, while a thick uphill cladding under
 * a strong field is otherwise most of every sweep. Open sides are kept whole: the outgoing wave is
 * set at the contact.
 */
function trimmed(d: Unpacked, Er: number, sides: Sides, anchor_nm: number): Unpacked {
  const j = boundaryNear(d, anchor_nm);
  const depth = (i: number): number => {
    const dV = Er - d.V[i]!;
    const q2 = (d.mass[i]! * twoBandFactor(d.alpha[i]!, dV) * dV) / C;
    return q2 < 0 ? Math.sqrt(-q2) * d.width[i]! : 0;
  };
  let from = 0;
  let to = d.n;
  if (!sides.openRight) {
    for (let i = j, acc = 0; i < d.n; i++) {
      acc += depth(i);
      if (acc > DECAYED) { to = i + 1; break; }
    }
  }
  if (!sides.openLeft) {
    for (let i = j - 1, acc = 0; i >= 0; i--) {
      acc += depth(i);
      if (acc > DECAYED) { from = i; break; }
    }
  }
  if (from === 0 && to === d.n) return d;
  const last = to - 1;
  return {
    ...d,
    n: to - from,
    width: d.width.subarray(from, to), V: d.V.subarray(from, to), mass: d.mass.subarray(from, to), alpha: d.alpha.subarray(from, to),
    edge: d.edge.subarray(from, to + 1),
    VL: from > 0 ? d.V[from]! : d.VL, mL: from > 0 ? d.mass[from]! : d.mL, aL: from > 0 ? d.alpha[from]! : d.aL,
    VR: to < d.n ? d.V[last]! : d.VR, mR: to < d.n ? d.mass[last]! : d.mR, aR: to < d.n ? d.alpha[last]! : d.aR,
  };
}

/** The pole near (Er, Ei) on profile d, matched at the boundary nearest anchor_nm; sides from the guess's real part. */
function poleNear(full: Unpacked, Er: number, Ei: number, cap: number, anchor_nm: number, w: Work): Pole | undefined {
  const sides: Sides = { openLeft: Er > full.VL, openRight: Er > full.VR };
  const d = trimmed(full, Er, sides, anchor_nm);
  const root = new Float64Array(2);
  if (!secant(d, Er, Ei, sides, boundaryNear(d, anchor_nm), cap, w, root)) return undefined;
  const re = root[0]!;
  const im = root[1]!;
  if (im > UPPER_HALF_PLANE || Math.hypot(re - Er, im - Ei) > cap) return undefined;
  return { energy: re, imaginary: im, openLeft: sides.openLeft, openRight: sides.openRight, anchor_nm };
}

/** The solution at a pole of `profile`, joined at its anchor on the trimmed profile. */
function joinAt(profile: BandProfile, pole: Pole, w: Work): Joined {
  const d = trimmed(requireFlat(unpack(profile), 'resonances'), pole.energy, pole, pole.anchor_nm);
  return join(d, pole.energy, pole.imaginary, pole, boundaryNear(d, pole.anchor_nm), w);
}

/** Where a resonance is followed: its zero-field energy, spacing and position. */
export interface ResonanceSeed {
  /** Zero-field bound-state energy (eV, particle sense). */
  readonly energy_eV: number;
  /** Its zero-field spacing to its neighbours (eV): the pole may move a quarter of it per step. */
  readonly scale_eV: number;
  /**
   * Where its zero-field ψ is largest (nm from the first slice's left edge): the two solutions are
   * matched there, and the part of the stack that holds the state is bounded on an open side by the
   * turning point between it and the contact (see resonanceWavefunction).
   */
  readonly anchor_nm: number;
}

/**
 * The resonance (Siegert pole) of a band profile nearest a guess (complex, eV), or undefined when
 * none is found within reach_eV of it; the secant's steps are kept within reach_eV too, so it does
 * not wander to another pole.
 *
 * Method: see the module comment; outer regions above which Re(guess) lies are open; matched at the
 * boundary nearest anchor_nm (nm from the first slice's left edge), where the state is large.
 * Units: eV, nm. Example: a 5.2 nm GaAs well in Al0.26Ga0.74As at 77 K under 30 kV/cm, guess e2's
 * zero-field energy, anchor the well's centre: the pole about 2 meV below it, width about 12 meV.
 */
export function siegertPole(profile: BandProfile, guess_eV: number, guessImaginary_eV: number, anchor_nm: number, reach_eV: number): { pole: Pole | undefined; evaluations: number } {
  const w = newWork();
  const pole = poleNear(requireFlat(unpack(profile), 'resonances'), guess_eV, guessImaginary_eV, reach_eV, anchor_nm, w);
  return { pole, evaluations: w.evaluations };
}

/**
 * Follows a zero-field bound state to the full field: the pole at fraction 1 of `build`, continued
 * from the seed's energy at fraction 0, or undefined when the state is lost (it dissolves into the
 * continuum or meets another state's pole).
 *
 * build(λ) is the profile at λ times the field (λ ∈ (0, 1]). Steps start at the whole field and are
 * halved until the secant converges within scale_eV/4 of the linear prediction from the two
 * previous fields (the first from the zero-field energy itself), down to 1/4096 of the field; each
 * success doubles the next step. Units: eV, nm. Example: e1 of an 8 nm GaAs/Al0.3Ga0.7As well under
 * 30 kV/cm stays bound: one step, a real pole.
 */
export function followResonance(build: (fraction: number) => BandProfile, seed: ResonanceSeed): { pole: Pole | undefined; evaluations: number } {
  const w = newWork();
  const cap = seed.scale_eV / 4;
  let lambda = 0;
  let Er = seed.energy_eV;
  let Ei = 0;
  let prev: { lambda: number; Er: number; Ei: number } | undefined;
  let dl = 1;
  let pole: Pole | undefined;
  while (lambda < 1) {
    const next = Math.min(1, lambda + dl);
    const d = requireFlat(unpack(build(next)), 'resonances');
    const t = prev ? (next - lambda) / (lambda - prev.lambda) : 0;
    const pr = Er + t * (Er - (prev?.Er ?? Er));
    const pi = Ei + t * (Ei - (prev?.Ei ?? Ei));
    const found = poleNear(d, pr, pi, cap, seed.anchor_nm, w);
    if (found) {
      prev = { lambda, Er, Ei };
      lambda = next;
      Er = found.energy;
      Ei = found.imaginary;
      pole = found;
      dl = Math.min(2 * dl, 1 - lambda);
    } else {
      dl /= 2;
      if (dl < MIN_STEP) return { pole: undefined, evaluations: w.evaluations };
    }
  }
  return { pole, evaluations: w.evaluations };
}

/**
 * Width Γ (eV, full width at half maximum; lifetime ħ/Γ) of a pole of `profile`: the flux out of
 * the open sides over the norm (see the module comment), 0 when both sides are closed. Widths below
 * about 1e-300 eV underflow to 0.
 */
export function resonanceWidth(profile: BandProfile, pole: Pole): number {
  if (!pole.openLeft && !pole.openRight) return 0;
  const w = newWork();
  const n = norms(joinAt(profile, pole, w), pole.energy, w);
  return Math.max(0, (2 * C * n.flux) / n.density);
}

/**
 * ψ of a resonance sampled on a z grid (nm; z = 0 at the first slice's left edge): the real part of
 * the Siegert state normalised by its c-norm, ∫ψ² = 1 over all z (the bilinear product, without
 * complex conjugation, made real and positive by a phase; the open tails regularised, see norms):
 * the normalisation of resonance states (Ya. B. Zel'dovich, Sov. Phys. JETP 12, 542 (1961);
 * N. Moiseyev, Phys. Rep. 302, 212 (1998)), whose squared dipoles give the strength of the
 * resonance's absorption line (T. N. Rescigno and V. McKoy, Phys. Rev. A 12, 522 (1975)).
 * Why not ∫|ψ|² = 1 over the stack: the outgoing wave in the open cladding adds |c|² per nm of
 * cladding (more, as it grows outwards), so the well's share, and with it every dipole, would
 * depend on where the contact begins; in the c-norm the outgoing wave oscillates and, with its
 * regularised tail, leaves no dependence on the cladding's length. In the well ψ is the quasi-bound
 * state normalised as a bound one, with a standing wave of amplitude |c| ~ √(Γ m/(ħ²k)) beyond the
 * barrier; as for bound states ψ is real, so overlaps and dipoles use it unchanged. With both outer
 * regions closed it is the bound state itself. For a resonance broader than its spacing these
 * strengths lose their meaning (the pole's residue is no longer a separate line).
 * Units: nm^-1/2.
 */
export function resonanceWavefunction(profile: BandProfile, pole: Pole, z_nm: Float64Array): Float64Array {
  const w = newWork();
  const J = joinAt(profile, pole, w);
  const d = J.d;
  const nm = norms(J, pole.energy, w);
  // Phase e^{−iφ} with 2φ = arg ∫ψ², so that ∫(e^{−iφ}ψ)² = |∫ψ²|.
  const phi = 0.5 * Math.atan2(nm.ci, nm.cr);
  const scale = 1 / Math.sqrt(Math.hypot(nm.cr, nm.ci));
  const cph = Math.cos(phi);
  const sph = Math.sin(phi);
  const out = new Float64Array(z_nm.length);
  const v = newPoint();
  const tmp = new Float64Array(16);
  const zStart = d.edge[0]!;
  const zEnd = d.edge[d.n]!;
  const tail = (b: number, k: Float64Array, t: number): void => {
    // u e^{ik t}, t ≥ 0 the distance from the edge.
    const e = Math.exp(-k[1]! * t);
    const c = e * Math.cos(k[0]! * t);
    const s = e * Math.sin(k[0]! * t);
    v.ur = J.ur[b]! * c - J.ui[b]! * s;
    v.ui = J.ur[b]! * s + J.ui[b]! * c;
    v.log = J.lg[b]!;
  };
  let i = 0;
  for (let g = 0; g < z_nm.length; g++) {
    const z = z_nm[g]!;
    if (z <= zStart) tail(0, J.kL, zStart - z);
    else if (z >= zEnd) tail(d.n, J.kR, z - zEnd);
    else {
      if (!(z >= d.edge[i]! && z < d.edge[i + 1]!)) {
        let lo = 0;
        let hi = d.n;
        while (hi - lo > 1) {
          const mid = (lo + hi) >> 1;
          if (d.edge[mid]! <= z) lo = mid;
          else hi = mid;
        }
        i = lo;
      }
      pointInSlice(J, i, z - d.edge[i]!, w, v, tmp);
    }
    out[g] = (v.ur * cph + v.ui * sph) * Math.exp(v.log - nm.ref) * scale;
  }
  return out;
}
