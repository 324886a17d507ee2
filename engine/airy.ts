/**
 * Airy functions Ai, Bi and their derivatives on the real line, in scaled form, with the continuous
 * phase of Ai + i·Bi, and the exact transfer of a solution of y″ = x·y between two points: what the
 * 1-D solver needs to carry (ψ, ψ′/m) across a layer whose potential is linear in z (a field, a grade).
 *
 * Evaluation (|x| < R): a table of (Ai, Ai′, Bi, Bi′) at nodes H apart, built once by Taylor steps
 * of the Airy equation (coefficients a_{k+2} = (x_c a_k + a_{k−1})/((k+2)(k+1)), entire, so each
 * step converges), then a Taylor series from the nearest node. Each function is stepped in the
 * direction in which it grows or oscillates, never where it decays, so rounding is not amplified:
 * Bi outward from its closed form at 0 (DLMF 9.2.3–9.2.4), Ai inward from the asymptotic series at
 * x = R, and both from 0 towards −R. Beyond |x| ≥ R the asymptotic expansions of DLMF 9.7.5–9.7.12
 * (Abramowitz & Stegun 10.4.58–10.4.67) in ζ = (2/3)|x|^{3/2}, with u_k = (2k+1)(2k+3)···(6k−1)/(216^k k!)
 * and v_k = −(6k+1)/(6k−1)·u_k; at |x| ≥ 16 (ζ ≥ 42.7) their smallest term is far below 1e-30, so
 * the sums are cut where a term falls below 1e-17 of the first.
 *
 * Scaled forms (as DLMF 9.7 writes them, and scipy.special.airye): for x ≥ R, Ai and Ai′ times e^{ζ},
 * Bi and Bi′ times e^{−ζ}; elsewhere unscaled (scale s = 0). The phase θ(x) = arg(Ai(x) + i Bi(x)),
 * continuous and increasing (dθ/dx = W/(Ai² + Bi²), Wronskian W = 1/π, DLMF 9.2.7), from −∞ as
 * x → −∞ through π/3 at 0 to π/2 as x → +∞: the modulus–phase form Ai(−x) = M cos θ, Bi(−x) = M sin θ
 * of DLMF 9.8. It counts zeros: a real solution a·Ai + b·Bi = ρM cos(θ − γ) vanishes where θ crosses
 * γ + π/2 modulo π.
 */

const PI = Math.PI;
const SQRT_PI = Math.sqrt(Math.PI);
/** Asymptotic series beyond this |x| (ζ ≥ 42.7: about ten terms reach 1e-17). */
const R = 16;
/**
 * Table spacing: a Taylor series from the nearest node reaches at most H/2 = 1/32, where its terms
 * fall below ((√R H/2)^k / k!) ≈ 1e-17 of the value by k = 11.
 */
const H = 1 / 16;
/** Terms of the Taylor series from a node (see H). */
const TAYLOR_TERMS = 12;
const NODES = Math.round((2 * R) / H) + 1;
const CENTRE = (NODES - 1) / 2;
/** A series is cut after a term below this fraction of the first. */
const EPS_SERIES = 1e-17;
const MAX_TERMS = 60;
/** Above this exponent a transfer factors e^{|Δs|} out (e^{±Δs} would overflow near 710). */
const SCALED = 20;

/** Ai(0), Ai′(0) (DLMF 9.2.3, 9.2.4): 1/(3^{2/3} Γ(2/3)) and −1/(3^{1/3} Γ(1/3)); Bi(0) = √3 Ai(0), Bi′(0) = −√3 Ai′(0). */
export const AI0 = 0.355028053887817239;
export const AIP0 = -0.258819403792806798;
const BI0 = Math.sqrt(3) * AI0;
const BIP0 = -Math.sqrt(3) * AIP0;

/** u_k and v_k of the asymptotic expansions (DLMF 9.7.2). */
const U = new Float64Array(MAX_TERMS);
const V = new Float64Array(MAX_TERMS);
U[0] = 1;
V[0] = 1;
for (let k = 1; k < MAX_TERMS; k++) {
  U[k] = (U[k - 1]! * (6 * k - 5) * (6 * k - 3) * (6 * k - 1)) / ((2 * k - 1) * 216 * k);
  V[k] = (-(6 * k + 1) / (6 * k - 1)) * U[k]!;
}

/** (2/3) x^{3/2} for x ≥ 0. */
const zetaOf = (x: number): number => (2 / 3) * x * Math.sqrt(x);

/** (2/3)(b^{3/2} − a^{3/2}) for a, b ≥ 0 given d = b − a, without cancellation: (2/3) d (a + √(ab) + b)/(√a + √b). */
function zetaDifference(a: number, b: number, d: number): number {
  const ra = Math.sqrt(a);
  const rb = Math.sqrt(b);
  return ((2 / 3) * d * (a + ra * rb + b)) / (ra + rb);
}

/**
 * Taylor step of y″ = x·y from x_c by t for two solutions at once: (y1, y1′, y2, y2′) in `v`
 * replaced by their values at x_c + t. Terms are summed until both fall below EPS_SERIES of the
 * values' size.
 */
function taylor(xc: number, t: number, v: Float64Array): void {
  for (let s = 0; s < 2; s++) {
    const y = v[2 * s]!;
    const yp = v[2 * s + 1]!;
    // a_{k−1}, a_k, a_{k+1} of the series in t (a_0 = y, a_1 = y′, a_2 = x_c y/2); every third
    // coefficient can vanish (x_c = 0), so the sum stops only once three in a row are negligible.
    let am1 = y;
    let a0 = yp;
    let a1 = (xc * y) / 2;
    let val = y + yp * t + a1 * t * t;
    let der = yp + 2 * a1 * t;
    let tk = t * t; // t^{k+1}
    const floor = EPS_SERIES * (Math.abs(y) + Math.abs(yp));
    let small = 0;
    for (let k = 1; k < 200 && small < 3; k++) {
      const a2 = (xc * a0 + am1) / ((k + 2) * (k + 1));
      const dTerm = (k + 2) * a2 * tk;
      tk *= t;
      const vTerm = a2 * tk;
      val += vTerm;
      der += dTerm;
      am1 = a0;
      a0 = a1;
      a1 = a2;
      small = Math.abs(vTerm) + Math.abs(dTerm) <= floor ? small + 1 : 0;
    }
    v[2 * s] = val;
    v[2 * s + 1] = der;
  }
}

/** Sums of the asymptotic series at ζ into out: [Σ(−1)^k u_k ζ^−k, Σ(−1)^k v_k ζ^−k, Σ u_k ζ^−k, Σ v_k ζ^−k]. */
function evanescentSums(zeta: number, out: Float64Array): void {
  let au = 1;
  let av = 1;
  let bu = 1;
  let bv = 1;
  let p = 1;
  for (let k = 1; k < MAX_TERMS; k++) {
    p /= zeta;
    const tu = U[k]! * p;
    const tv = V[k]! * p;
    const sign = k & 1 ? -1 : 1;
    au += sign * tu;
    av += sign * tv;
    bu += tu;
    bv += tv;
    if (Math.abs(tu) < EPS_SERIES && Math.abs(tv) < EPS_SERIES) break;
  }
  out[0] = au;
  out[1] = av;
  out[2] = bu;
  out[3] = bv;
}

/** Sums P, Q, S, T of the oscillatory expansions at ζ (DLMF 9.7.9–9.7.12) into out[0..3]. */
function oscillatorySums(zeta: number, out: Float64Array): void {
  let P = 1;
  let Q = 0;
  let S = 1;
  let T = 0;
  let p = 1;
  for (let k = 1; k < MAX_TERMS; k++) {
    p /= zeta;
    const tu = U[k]! * p;
    const tv = V[k]! * p;
    // k = 2j: (−1)^j into P, S; k = 2j + 1: (−1)^j into Q, T.
    const sign = ((k >> 1) & 1) ? -1 : 1;
    if (k & 1) {
      Q += sign * tu;
      T += sign * tv;
    } else {
      P += sign * tu;
      S += sign * tv;
    }
    if (Math.abs(tu) < EPS_SERIES && Math.abs(tv) < EPS_SERIES) break;
  }
  out[0] = P;
  out[1] = Q;
  out[2] = S;
  out[3] = T;
}

const sums = new Float64Array(4);

/** Node table: Ai, Ai′, Bi, Bi′ at x = −R + jH. */
const T_AI = new Float64Array(NODES);
const T_AIP = new Float64Array(NODES);
const T_BI = new Float64Array(NODES);
const T_BIP = new Float64Array(NODES);
{
  const v = new Float64Array(4);
  const put = (j: number, which: 0 | 1): void => {
    if (which === 0) { T_AI[j] = v[0]!; T_AIP[j] = v[1]!; }
    else { T_BI[j] = v[2]!; T_BIP[j] = v[3]!; }
  };
  // Both from 0 towards −R (oscillatory: neither grows).
  v[0] = AI0; v[1] = AIP0; v[2] = BI0; v[3] = BIP0;
  put(CENTRE, 0); put(CENTRE, 1);
  for (let j = CENTRE; j > 0; j--) {
    taylor(-R + j * H, -H, v);
    put(j - 1, 0); put(j - 1, 1);
  }
  // Bi outwards from 0 (it grows); the Ai slots are carried along unused.
  v[0] = AI0; v[1] = AIP0; v[2] = BI0; v[3] = BIP0;
  for (let j = CENTRE; j < NODES - 1; j++) {
    taylor(-R + j * H, H, v);
    put(j + 1, 1);
  }
  // Ai inwards from its asymptotic series at R (stepping towards 0 it grows).
  const zeta = zetaOf(R);
  evanescentSums(zeta, sums);
  const e = Math.exp(-zeta);
  const q = Math.sqrt(Math.sqrt(R));
  v[0] = (e * sums[0]!) / (2 * SQRT_PI * q);
  v[1] = (-e * q * sums[1]!) / (2 * SQRT_PI);
  put(NODES - 1, 0);
  for (let j = NODES - 1; j > CENTRE + 1; j--) {
    taylor(-R + j * H, -H, v);
    put(j - 1, 0);
  }
}

/** Ai, Ai′, Bi, Bi′ with their scale and phase at one point (see the module comment). */
export interface AiryPoint {
  /** Ai·e^{s}, Ai′·e^{s}, Bi·e^{−s}, Bi′·e^{−s}. */
  ai: number; aip: number; bi: number; bip: number;
  /** s = ζ for x ≥ R, else 0. */
  s: number;
  /** Continuous phase θ = arg(Ai + i Bi) (rad). */
  theta: number;
}

export const newAiryPoint = (): AiryPoint => ({ ai: 0, aip: 0, bi: 0, bip: 0, s: 0, theta: 0 });

/** 1/((k + 2)(k + 1)), the recurrence's divisors. */
const INV = Float64Array.from({ length: TAYLOR_TERMS + 2 }, (_, k) => 1 / ((k + 2) * (k + 1)));

/**
 * Ai, Ai′, Bi, Bi′ at x_c + t from the node values by TAYLOR_TERMS terms of the series (|t| ≤ H/2),
 * both solutions in one pass: the evaluation that every Airy slice of the solver does twice.
 */
function fromNode(j: number, t: number, out: AiryPoint): void {
  const xc = -R + j * H;
  let a0 = T_AI[j]!; let a1 = T_AIP[j]!; let a2 = 0.5 * xc * a0;
  let b0 = T_BI[j]!; let b1 = T_BIP[j]!; let b2 = 0.5 * xc * b0;
  let av = a0 + t * (a1 + t * a2);
  let ad = a1 + 2 * t * a2;
  let bv = b0 + t * (b1 + t * b2);
  let bd = b1 + 2 * t * b2;
  // a0, a1, a2 hold a_{k−1}, a_k, a_{k+1}; tk = t^{k+1}.
  let am = a0; let ak = a1; let ap = a2;
  let bm = b0; let bk = b1; let bp = b2;
  let tk = t * t;
  for (let k = 1; k < TAYLOR_TERMS; k++) {
    const an = (xc * ak + am) * INV[k]!;
    const bn = (xc * bk + bm) * INV[k]!;
    ad += (k + 2) * an * tk;
    bd += (k + 2) * bn * tk;
    tk *= t;
    av += an * tk;
    bv += bn * tk;
    am = ak; ak = ap; ap = an;
    bm = bk; bk = bp; bp = bn;
  }
  out.ai = av; out.aip = ad; out.bi = bv; out.bip = bd;
}

/**
 * Ai, Ai′, Bi, Bi′ at x in scaled form, with the continuous phase θ of Ai + i Bi, into `out`.
 * Relative accuracy about 1e-15 of each scaled value (of the modulus M for x < 0, where the
 * functions oscillate). Example: x = 0 gives ai 0.3550280539, bi 0.6149266274, theta π/3.
 */
export function airyAt(x: number, out: AiryPoint): void {
  if (x >= R) {
    const zeta = zetaOf(x);
    evanescentSums(zeta, sums);
    const q = Math.sqrt(Math.sqrt(x));
    out.ai = sums[0]! / (2 * SQRT_PI * q);
    out.aip = (-q * sums[1]!) / (2 * SQRT_PI);
    out.bi = sums[2]! / (SQRT_PI * q);
    out.bip = (q * sums[3]!) / SQRT_PI;
    out.s = zeta;
    // π/2 − θ = atan(Ai/Bi) ≈ π e^{−2ζ}/... is below 1e-37 here.
    out.theta = PI / 2;
    return;
  }
  if (x <= -R) {
    const X = -x;
    const zeta = zetaOf(X);
    oscillatorySums(zeta, sums);
    const q = Math.sqrt(Math.sqrt(X));
    const chi = zeta - PI / 4;
    const c = Math.cos(chi);
    const sn = Math.sin(chi);
    const [P, Q, S, T] = [sums[0]!, sums[1]!, sums[2]!, sums[3]!];
    out.ai = (P * c + Q * sn) / (SQRT_PI * q);
    out.bi = (-P * sn + Q * c) / (SQRT_PI * q);
    out.aip = (q * (S * sn - T * c)) / SQRT_PI;
    out.bip = (q * (S * c + T * sn)) / SQRT_PI;
    out.s = 0;
    out.theta = PI / 4 - zeta + Math.atan2(Q, P);
    return;
  }
  const j = Math.round((x + R) / H);
  fromNode(j, x - (-R + j * H), out);
  out.s = 0;
  const raw = Math.atan2(out.bi, out.ai);
  // Within (−R, 0] θ stays within π/12 of π/4 − ζ(|x|), which picks the branch.
  out.theta = x >= 0 ? raw : raw + 2 * PI * Math.round((PI / 4 - zetaOf(-x) - raw) / (2 * PI));
}

/** The transfer across [x0, x1]: y1 = uu·y0 + ud·y0′, y1′ = du·y0 + dd·y0′, all times e^{gained}; dtheta = θ(x1) − θ(x0). */
export interface AiryTransfer {
  uu: number; ud: number; du: number; dd: number;
  gained: number;
  dtheta: number;
}

export const newAiryTransfer = (): AiryTransfer => ({ uu: 1, ud: 0, du: 0, dd: 1, gained: 0, dtheta: 0 });

const P0 = newAiryPoint();
const P1 = newAiryPoint();
const S0 = new Float64Array(4);
const S1 = new Float64Array(4);

/**
 * Exact transfer of (y, y′) of y″ = x·y from x0 to x1 = x0 + dx (either order), with the phase
 * change for counting zeros. With the Wronskian W{Ai, Bi} = 1/π (DLMF 9.2.7):
 *   y(x1)  = π[(Ai1 Bi0′ − Bi1 Ai0′) y0 + (Bi1 Ai0 − Ai1 Bi0) y0′],
 *   y′(x1) = π[(Ai1′ Bi0′ − Bi1′ Ai0′) y0 + (Bi1′ Ai0 − Ai1′ Bi0) y0′].
 * Where both ends lie beyond R on one side, differences of ζ and of phases are formed without
 * cancellation (zetaDifference from the given dx), so a weak field's huge |x| loses no precision:
 * oscillatory, the entries are M1N0 sin(φ0 − θ1), M1M0 sin(θ1 − θ0), N1N0 sin(φ0 − φ1),
 * N1M0 sin(φ1 − θ0) of the modulus–phase forms Ai′ = N cos φ, Bi′ = N sin φ (DLMF 9.8); evanescent,
 * the scaled values with e^{±Δζ}. `dx` must equal x1 − x0 (passed to keep it exact).
 */
export function airyTransfer(x0: number, dx: number, out: AiryTransfer): void {
  const x1 = x0 + dx;
  if (x0 <= -R && x1 <= -R) {
    const X0 = -x0;
    const X1 = -x1;
    const z0 = zetaOf(X0);
    const z1 = zetaOf(X1);
    oscillatorySums(z0, S0);
    oscillatorySums(z1, S1);
    const dz = zetaDifference(X0, X1, -dx);
    const psi0 = Math.atan2(S0[1]!, S0[0]!);
    const psi1 = Math.atan2(S1[1]!, S1[0]!);
    const om0 = Math.atan2(S0[3]!, S0[2]!);
    const om1 = Math.atan2(S1[3]!, S1[2]!);
    const q0 = Math.sqrt(Math.sqrt(X0));
    const q1 = Math.sqrt(Math.sqrt(X1));
    const M0 = Math.hypot(S0[0]!, S0[1]!) / (SQRT_PI * q0);
    const M1 = Math.hypot(S1[0]!, S1[1]!) / (SQRT_PI * q1);
    const N0 = (Math.hypot(S0[2]!, S0[3]!) * q0) / SQRT_PI;
    const N1 = (Math.hypot(S1[2]!, S1[3]!) * q1) / SQRT_PI;
    const dTheta = -dz + (psi1 - psi0);
    const dPhi = -dz + (om1 - om0);
    const phi0MinusTheta0 = PI / 2 + om0 - psi0;
    out.uu = PI * M1 * N0 * Math.sin(phi0MinusTheta0 - dTheta);
    out.ud = PI * M1 * M0 * Math.sin(dTheta);
    out.du = -PI * N1 * N0 * Math.sin(dPhi);
    out.dd = PI * N1 * M0 * Math.sin(dPhi + phi0MinusTheta0);
    out.gained = 0;
    out.dtheta = dTheta;
    return;
  }
  airyAt(x0, P0);
  airyAt(x1, P1);
  // Δs = s1 − s0, exact where both ends are scaled.
  const ds = x0 >= R && x1 >= R ? zetaDifference(x0, x1, dx) : P1.s - P0.s;
  const big = Math.abs(ds);
  let eUp: number;
  let eDown: number;
  if (big > SCALED) {
    out.gained = big;
    eUp = ds > 0 ? 1 : Math.exp(-2 * big);
    eDown = ds > 0 ? Math.exp(-2 * big) : 1;
  } else {
    out.gained = 0;
    eUp = Math.exp(ds);
    eDown = 1 / eUp;
  }
  // Products Bi1·Ai0 carry e^{s1 − s0} = eUp, Ai1·Bi0 carry e^{s0 − s1} = eDown.
  out.uu = PI * (P1.ai * P0.bip * eDown - P1.bi * P0.aip * eUp);
  out.ud = PI * (P1.bi * P0.ai * eUp - P1.ai * P0.bi * eDown);
  out.du = PI * (P1.aip * P0.bip * eDown - P1.bip * P0.aip * eUp);
  out.dd = PI * (P1.bip * P0.ai * eUp - P1.aip * P0.bi * eDown);
  out.dtheta = P1.theta - P0.theta;
}
