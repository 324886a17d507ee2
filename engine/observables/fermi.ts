/**
 * Normalised Fermi–Dirac integrals and their inverses.
 *
 * F_j(η) = (1/Γ(j+1)) ∫0^∞ t^j / (1 + e^(t−η)) dt, for j = −1/2, 0, 1/2 (η dimensionless, the
 * reduced Fermi level (E_F − E_edge)/kT). With this normalisation F_j(η) → e^η for η ≪ 0 and
 * dF_j/dη = F_(j−1) (J. S. Blakemore, Solid-State Electron. 25, 1067 (1982)).
 */
import { InputError } from '../errors.js';

/** The orders of Fermi–Dirac integral the carrier statistics need. */
export type FermiOrder = -0.5 | 0 | 0.5;

const SQRT_PI = Math.sqrt(Math.PI);

/**
 * Above this η the Sommerfeld expansion (five terms) is used: its first omitted term is
 * ≈ 1e-17 relative there, while the quadrature step would keep shrinking as 1/√η.
 */
const SOMMERFELD_FROM = 100;

/** Tail cut of the quadrature: the integrand has fallen below e^(−45) ≈ 3e-20 of its peak. */
const TAIL_EXPONENT = 45;

/**
 * Trapezoid steps per pole distance. The error of the trapezoid rule on the whole line is
 * ≈ exp(−2π d/h) for an integrand analytic in the strip |Im s| < d; d/h = 7 gives ≈ 1e-19.
 */
const STEPS_PER_POLE_DISTANCE = 7;

/**
 * Largest step: far in the non-degenerate tail the poles recede but the Gaussian factor e^(−s²)
 * still limits the rule, with error ≈ 2 exp(−π²/h²); h = 0.45 gives ≈ 1e-21.
 */
const MAX_STEP = 0.45;

const checkOrder = (j: number, where: string): void => {
  if (j !== -0.5 && j !== 0 && j !== 0.5) {
    throw new InputError('bad-value', `${where}: order j must be -0.5, 0 or 0.5, got ${j}; use one of the three supported orders`);
  }
};

const checkEta = (eta: number, where: string): void => {
  if (!Number.isFinite(eta)) {
    throw new InputError('bad-value', `${where}: reduced Fermi level eta must be finite, got ${eta}; pass (E_F − E_edge)/kT as a finite number`);
  }
};

/** ln(1 + e^η) without overflow for large η or loss of digits for η ≪ 0. */
const softplus = (eta: number): number => (eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta)));

/** Γ(x) for x a half-integer (positive or negative), from Γ(1/2) = √π and Γ(x+1) = x Γ(x). */
const gammaHalfInteger = (x: number): number => {
  let g = SQRT_PI;
  let a = 0.5;
  while (a < x) {
    g *= a;
    a += 1;
  }
  while (a > x) {
    a -= 1;
    g /= a;
  }
  return g;
};

/** c_0 = 1 and c_k = 2 (1 − 2^(1−2k)) ζ(2k) for k = 1..4 (closed forms of ζ at even integers). */
const SOMMERFELD_COEFFICIENTS = [
  1,
  Math.PI ** 2 / 6,
  (7 * Math.PI ** 4) / 360,
  (31 * Math.PI ** 6) / 15120,
  (127 * Math.PI ** 8) / 604800,
] as const;

/**
 * Sommerfeld expansion F_j(η) = Σ_k c_k η^(j+1−2k) / Γ(j+2−2k), k = 0..4, for half-integer j.
 * For half-integer j the exponentially small remainder, cos(πj) F_j(−η), vanishes.
 */
const sommerfeld = (j: number, eta: number): number => {
  let sum = 0;
  for (let k = 0; k < SOMMERFELD_COEFFICIENTS.length; k++) {
    sum += (SOMMERFELD_COEFFICIENTS[k] * eta ** (j + 1 - 2 * k)) / gammaHalfInteger(j + 2 - 2 * k);
  }
  return sum;
};

/**
 * ln F_j(η) for j = ±1/2 by the trapezoid rule on the whole line after t = s².
 *
 * F_{-1/2}(η) = (2/√π) ∫0^∞ ds / (1 + e^(s²−η)), F_{1/2}(η) = (4/√π) ∫0^∞ s² ds / (1 + e^(s²−η)).
 * Both integrands are even and analytic in s, so the trapezoid rule converges geometrically
 * (L. N. Trefethen and J. A. C. Weideman, SIAM Rev. 56, 385 (2014)); the nearest poles sit at
 * s² = η ± iπ, at distance d = Im √(η + iπ) from the real axis, which sets the step
 * h = min(d/7, 0.45).
 * For η < 0 the factor e^η is taken out so that deep non-degenerate values do not underflow.
 */
const logHalfOrderByQuadrature = (j: -0.5 | 0.5, eta: number): number => {
  const r = Math.hypot(eta, Math.PI);
  const d = eta >= 0 ? Math.PI / Math.sqrt(2 * (r + eta)) : Math.sqrt((r - eta) / 2);
  const sMax = Math.sqrt(Math.max(eta, 0) + TAIL_EXPONENT);
  const h = Math.min(d / STEPS_PER_POLE_DISTANCE, MAX_STEP);
  const n = Math.ceil(sMax / h);
  const weight = j === 0.5 ? (s: number): number => s * s : (): number => 1;
  let sum = 0;
  if (eta >= 0) {
    for (let k = 1; k <= n; k++) {
      const s = k * h;
      sum += weight(s) / (1 + Math.exp(s * s - eta));
    }
    sum += (0.5 * weight(0)) / (1 + Math.exp(-eta));
    const prefactor = j === 0.5 ? 4 / SQRT_PI : 2 / SQRT_PI;
    return Math.log(prefactor * h * sum);
  }
  const e = Math.exp(eta);
  for (let k = 1; k <= n; k++) {
    const s = k * h;
    const g = Math.exp(-s * s);
    sum += (weight(s) * g) / (1 + e * g);
  }
  sum += (0.5 * weight(0)) / (1 + e);
  const prefactor = j === 0.5 ? 4 / SQRT_PI : 2 / SQRT_PI;
  return eta + Math.log(prefactor * h * sum);
};

/**
 * Natural logarithm of the normalised Fermi–Dirac integral, ln F_j(η), finite for every finite η.
 *
 * Used where densities must be compared far into the non-degenerate tail (F_j ~ e^η underflows
 * below η ≈ −745). j = 0 is exact: ln ln(1 + e^η); j = ±1/2 by whole-line trapezoid quadrature
 * for η ≤ 100 and by the Sommerfeld expansion above; relative accuracy of F_j better than 1e-12.
 *
 * @param j order: −1/2, 0 or 1/2.
 * @param eta reduced Fermi level η (dimensionless).
 * @returns ln F_j(η) (dimensionless).
 * @example logFermiDirac(0.5, -1000) // ≈ −1000 (F_j → e^η)
 */
export function logFermiDirac(j: FermiOrder, eta: number): number {
  checkOrder(j, 'logFermiDirac');
  checkEta(eta, 'logFermiDirac');
  if (j === 0) {
    // ln(1+e^η) = e^η (1 − e^η/2 + …); below η = −36 the correction is under 1e-16.
    return eta < -36 ? eta : Math.log(softplus(eta));
  }
  if (eta > SOMMERFELD_FROM) return Math.log(sommerfeld(j, eta));
  return logHalfOrderByQuadrature(j, eta);
}

/**
 * Normalised Fermi–Dirac integral F_j(η) = (1/Γ(j+1)) ∫0^∞ t^j / (1 + e^(t−η)) dt.
 *
 * F_0(η) = ln(1 + e^η) exactly; F_{±1/2} by quadrature or the Sommerfeld expansion (see
 * logFermiDirac), relative accuracy better than 1e-12 over every finite η (it underflows to 0
 * below η ≈ −745, where logFermiDirac stays usable).
 * Special values: F_{-1/2}(0) = (1 − √2) ζ(1/2) ≈ 0.6048986434, F_{1/2}(0) = (1 − 2^(−1/2)) ζ(3/2)
 * ≈ 0.7651470246; limits e^η (η ≪ 0) and η^(j+1)/Γ(j+2) (η ≫ 0).
 *
 * @param j order: −1/2, 0 or 1/2.
 * @param eta reduced Fermi level η = (E_F − E_edge)/kT (dimensionless).
 * @returns F_j(η) (dimensionless).
 * @example fermiDirac(0, 0) // = ln 2 ≈ 0.6931471806
 */
export function fermiDirac(j: FermiOrder, eta: number): number {
  checkOrder(j, 'fermiDirac');
  checkEta(eta, 'fermiDirac');
  if (j === 0) return softplus(eta);
  if (eta > SOMMERFELD_FROM) return sommerfeld(j, eta);
  return Math.exp(logHalfOrderByQuadrature(j, eta));
}

/**
 * Root of an increasing function on the real line, safeguarded: the bracket is widened until
 * it holds a sign change, then narrowed by the Illinois variant of regula falsi (M. Dowell and
 * P. Jarratt, BIT 11, 168 (1971)), which keeps the root bracketed and converges superlinearly.
 *
 * @param f increasing function of x.
 * @param lo, hi a starting interval (lo < hi); it need not bracket the root.
 * @param xTolerance absolute tolerance on x (same units as x).
 * @returns x with f(x) = 0 to within the tolerance, or the nearer end of the bracket.
 */
export function rootOfIncreasing(f: (x: number) => number, lo: number, hi: number, xTolerance: number): number {
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  for (let step = b - a; fa > 0; step *= 2) {
    b = a;
    fb = fa;
    a -= step;
    fa = f(a);
  }
  for (let step = b - a; fb < 0; step *= 2) {
    a = b;
    fa = fb;
    b += step;
    fb = f(b);
  }
  if (fa === 0) return a;
  if (fb === 0) return b;
  let side = 0;
  for (let iteration = 0; iteration < 200 && b - a > xTolerance; iteration++) {
    let c = (a * fb - b * fa) / (fb - fa);
    if (!(c > a && c < b)) c = 0.5 * (a + b);
    const fc = f(c);
    if (fc === 0) return c;
    if (fc < 0) {
      a = c;
      fa = fc;
      if (side === -1) fb /= 2;
      side = -1;
    } else {
      b = c;
      fb = fc;
      if (side === 1) fa /= 2;
      side = 1;
    }
  }
  return Math.abs(fa) < Math.abs(fb) ? a : b;
}

/**
 * Inverse of the normalised Fermi–Dirac integral: the η with F_j(η) = value.
 *
 * j = 0 in closed form, η = ln(e^F − 1) (computed as F + ln(1 − e^(−F)) for F > 1); j = ±1/2 by
 * rootOfIncreasing on ln F_j(η) − ln value, starting from η ≥ ln value (F_j(η) < e^η for every η).
 * Round trip F_j(inverse(v)) = v to about 1e-12 relative.
 *
 * @param j order: −1/2, 0 or 1/2.
 * @param value F_j (dimensionless, > 0).
 * @returns η (dimensionless).
 * @example fermiDiracInverse(0, Math.LN2) // = 0
 */
export function fermiDiracInverse(j: FermiOrder, value: number): number {
  checkOrder(j, 'fermiDiracInverse');
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new InputError('bad-value', `fermiDiracInverse: value must be positive and finite, got ${value}; F_j(η) is positive for every η`);
  }
  if (j === 0) return value > 1 ? value + Math.log1p(-Math.exp(-value)) : Math.log(Math.expm1(value));
  const target = Math.log(value);
  return rootOfIncreasing((eta) => logFermiDirac(j, eta) - target, target, Math.max(target, 0) + 1, 1e-13 * Math.max(1, Math.abs(target)));
}
