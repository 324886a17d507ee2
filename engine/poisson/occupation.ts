/**
 * Carrier densities of a doped stack at a Fermi level, and the Fermi level that makes it neutral.
 *
 * Subbands (bound states): n_i = (m_i/(πħ²)) kT ln(1 + e^((F − E_i)/kT)) per unit area, the 2-D
 * staircase with the state's in-plane mass filled by Fermi–Dirac statistics (common practice;
 * J. H. Davies, The Physics of Low-Dimensional Semiconductors (1998), §4.2, from memory).
 * Continuum: above the barrier edge E_b (the lower contact's band edge, where states stop being
 * bound) the carriers are a semiclassical 3-D gas with the local band edge E_c(z):
 *   n(z) = (1/2π²)(2m/ħ²)^(3/2) ∫_{max(E_b, E_c)}^∞ √(E − E_c) f(E) dE,
 * so bound states below E_b and the gas above it never count a state twice (the usual
 * quantum/classical split of self-consistent solvers, e.g. I.-H. Tan, G. L. Snider, L. D. Chang and
 * E. L. Hu, J. Appl. Phys. 68, 4071 (1990), from memory). Energies are in the particle sense of
 * BandProfile (holes downward), so one code serves electrons and holes.
 * Units: energies eV, masses m0, kT eV, densities nm⁻² (sheets) and nm⁻³ (gas).
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import { fermiDirac, rootOfIncreasing } from '../observables/fermi.js';
import { erf } from '../observables/dos.js';

const C = HBAR2_OVER_2M0;
const SQRT_PI = Math.sqrt(Math.PI);

/** A level more than this many kT above the Fermi level holds e^−45 ≈ 3e-20 of a full one: it is taken empty. */
export const EMPTY_KT = 45;

/** 2-D density of states m/(πħ²) in nm⁻² eV⁻¹ (spin included): 0.2799 for m = 0.067. */
export const sheetDos = (mass: number): number => mass / (2 * Math.PI * C);

/**
 * Carriers of one subband (nm⁻²) at Fermi level F: (m/(πħ²)) kT ln(1 + e^((F − E)/kT)); at kT = 0
 * the degenerate limit (m/(πħ²)) max(F − E, 0).
 */
export function subbandFilling(mass: number, energy: number, fermi: number, kT: number): number {
  const g = sheetDos(mass);
  if (kT === 0) return fermi > energy ? g * (fermi - energy) : 0;
  const eta = (fermi - energy) / kT;
  if (eta < -EMPTY_KT) return 0;
  return g * kT * (eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta)));
}

/** d(subbandFilling)/dF (nm⁻² eV⁻¹): (m/(πħ²)) / (1 + e^((E − F)/kT)); a step at kT = 0. */
export function subbandSlope(mass: number, energy: number, fermi: number, kT: number): number {
  const g = sheetDos(mass);
  if (kT === 0) return fermi > energy ? g : 0;
  const eta = (fermi - energy) / kT;
  return eta < -EMPTY_KT ? 0 : g / (1 + Math.exp(-eta));
}

/** 8-point Gauss–Legendre nodes and weights on [−1, 1] (M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions (1964), Table 25.4). */
const GL_X = [-0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498, 0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363];
const GL_W = [0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620, 0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763];

/**
 * ∫_b^∞ √t/(1 + e^(t − η)) dt for b ≥ 0, and its η-derivative ∫_b^∞ √t f(1 − f) dt: after t = b + s²
 * the integrands 2s√(b + s²) f and 2s√(b + s²) f(1 − f) are smooth, integrated by composite 8-point
 * Gauss–Legendre up to s² = max(η − b, 0) + EMPTY_KT, with panels no wider than 1/(1 + √(η − b))
 * (the Fermi edge of a degenerate gas is that steep in s) on both sides of the edge. Relative
 * accuracy 1e-10 (against (√π/2) F_{1/2}(η) at b = 0, test/poisson/occupation.test.ts).
 */
export function incompleteHalf(eta: number, b: number): { readonly value: number; readonly slope: number } {
  const shifted = eta - b;
  const edge = Math.sqrt(Math.max(shifted, 0));
  const end = Math.sqrt(Math.max(shifted, 0) + EMPTY_KT);
  let value = 0;
  let slope = 0;
  const cover = (lo: number, hi: number, width: number): void => {
    const m = Math.max(1, Math.ceil((hi - lo) / width));
    for (let j = 0; j < m; j++) {
      const a = lo + ((hi - lo) * j) / m;
      const half = (hi - lo) / (2 * m);
      for (let k = 0; k < 8; k++) {
        const s = a + half * (1 + GL_X[k]!);
        const x = s * s - shifted;
        const f = x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x));
        const w = half * GL_W[k]! * 2 * s * Math.sqrt(b + s * s);
        value += w * f;
        slope += w * f * (1 - f);
      }
    }
  };
  const fine = Math.min(1, 1 / (1 + edge));
  if (edge > 0) cover(0, edge, fine);
  cover(edge, end, fine);
  return { value, slope };
}

/**
 * The scaled complementary error function erfcx(x) = e^(x²) erfc(x), x ≥ 0: e^(x²)(1 − erf x)
 * below 2 (erf of engine/observables/dos.ts, no cancellation there: erfc(2) = 4.7e-3), above it the
 * continued fraction √π erfcx(x) = 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + …)))) (Abramowitz and Stegun
 * 7.1.14), min(60, 8 + 400/x²) levels deep (converged to rounding from x = 2 on; checked against the
 * quadrature in test/poisson/occupation.test.ts).
 */
export function erfcx(x: number): number {
  if (x < 2) return Math.exp(x * x) * (1 - erf(x));
  let t = x;
  for (let k = Math.min(60, 8 + Math.ceil(400 / (x * x))); k >= 1; k--) t = x + k / 2 / t;
  return 1 / (SQRT_PI * t);
}

/** Terms of the non-degenerate series kept: x^(K+1) ≤ e^(−28) ≈ 7e-13 where it is used. */
const SERIES_TERMS = 13;
/** The series is used where the Fermi level lies at least this many kT below the gas's lowest state. */
const SERIES_FROM_KT = 2;

/**
 * One point of the semiclassical gas: its band edge E_c, the barrier edge E_b above which its
 * carriers count, its density-of-states mass, and what the density at any Fermi level needs.
 */
export interface GasSite {
  readonly mass: number;
  readonly edge: number;
  /** max(E_b, E_c): the lowest state of the gas here (eV). */
  readonly from: number;
  /** (from − E_c)/kT. */
  readonly b: number;
  /** (1/2π²)(m/(ħ²/2m0))^(3/2) kT^(3/2) (nm⁻³). */
  readonly prefactor: number;
  /** J_k = ∫_0^∞ √(b + u) e^(−ku) du, k = 1…SERIES_TERMS, made on first use (most sites never need it). */
  series: Float64Array | null;
}

/** The gas at one point at temperature kT (eV; see gasDensity): band edge, barrier edge and DOS mass. */
export function gasSite(mass: number, edge: number, barrier: number, kT: number): GasSite {
  const from = Math.max(barrier, edge);
  const g = (mass / C) ** 1.5 / (2 * Math.PI * Math.PI);
  return { mass, edge, from, b: kT > 0 ? (from - edge) / kT : 0, prefactor: g * kT ** 1.5, series: null };
}

/** J_k of a site (see GasSite), from Γ(3/2, x) = √x e^(−x) + (√π/2) erfc(√x). */
function seriesOf(b: number): Float64Array {
  const out = new Float64Array(SERIES_TERMS);
  for (let k = 1; k <= SERIES_TERMS; k++) {
    const r = Math.sqrt(k * b);
    out[k - 1] = (r + (SQRT_PI / 2) * erfcx(r)) / k ** 1.5;
  }
  return out;
}

/**
 * An upper bound of gasDensity(site, F, kT) (nm⁻³) that costs one exponential:
 * prefactor · e^((F − from)/kT) · J_1 with J_1 ≤ √b + √π/2 (f ≤ e^(−(t − η)) above the Fermi level).
 * Only meaningful below it (F < from); the self-consistent loop skips sites it shows negligible.
 */
export const gasBound = (site: GasSite, fermi: number, kT: number): number =>
  kT > 0 ? site.prefactor * Math.exp((fermi - site.from) / kT) * (Math.sqrt(site.b) + SQRT_PI / 2) : Infinity;

/**
 * Semiclassical carriers above the barrier edge at one point (nm⁻³) at Fermi level F:
 * (1/2π²)(m/(ħ²/2m0))^(3/2) ∫_{max(E_b, E_c)}^∞ √(E − E_c) f(E) dE (see the module comment).
 * Non-degenerate (F at least 2kT below the gas's lowest state): the series
 * kT^(3/2) Σ_k (−1)^(k+1) e^(k(F − from)/kT) J_k of e^(−k(t − η)) expansions of f, each term in
 * closed form, J_k = k^(−3/2)(√(kb) + (√π/2) erfcx(√(kb))) (via Γ(3/2, x)); otherwise from the edge up
 * (√π/2) F_{1/2}(η) kT^(3/2) with the normalised Fermi–Dirac integral (fermi.ts), or the quadrature
 * incompleteHalf above a barrier; at kT = 0, (2/3)[(F − E_c)^(3/2) − (from − E_c)^(3/2)].
 */
export function gasDensity(site: GasSite, fermi: number, kT: number): number {
  const g = (site.mass / C) ** 1.5 / (2 * Math.PI * Math.PI);
  if (kT === 0) return fermi > site.from ? (2 / 3) * g * ((fermi - site.edge) ** 1.5 - (site.from - site.edge) ** 1.5) : 0;
  const shifted = (fermi - site.from) / kT;
  if (shifted < -EMPTY_KT) return 0;
  if (shifted < -SERIES_FROM_KT) {
    const series = (site.series ??= seriesOf(site.b));
    const x = Math.exp(shifted);
    let sum = 0;
    let power = 1;
    for (let k = 0; k < SERIES_TERMS; k++) {
      power *= x;
      sum += (k % 2 === 0 ? power : -power) * series[k]!;
    }
    return site.prefactor * sum;
  }
  const eta = (fermi - site.edge) / kT;
  return site.prefactor * (site.b === 0 ? (SQRT_PI / 2) * fermiDirac(0.5, eta) : incompleteHalf(eta, site.b).value);
}

/**
 * d(gasDensity)/dF (nm⁻³ eV⁻¹), each regime differentiated as it is summed: the series term by
 * term (k x^k J_k / kT), (√π/2) F_{−1/2}(η) kT^(1/2) from the edge up (dF_{1/2}/dη = F_{−1/2}), the
 * quadrature's f(1 − f) integral above a barrier, g √(F − E_c) at kT = 0.
 */
export function gasSlope(site: GasSite, fermi: number, kT: number): number {
  const g = (site.mass / C) ** 1.5 / (2 * Math.PI * Math.PI);
  if (kT === 0) return fermi > site.from ? g * Math.sqrt(fermi - site.edge) : 0;
  const shifted = (fermi - site.from) / kT;
  if (shifted < -EMPTY_KT) return 0;
  if (shifted < -SERIES_FROM_KT) {
    const series = (site.series ??= seriesOf(site.b));
    const x = Math.exp(shifted);
    let sum = 0;
    let power = 1;
    for (let k = 0; k < SERIES_TERMS; k++) {
      power *= x;
      sum += (k % 2 === 0 ? 1 : -1) * (k + 1) * power * series[k]!;
    }
    return (site.prefactor * sum) / kT;
  }
  const eta = (fermi - site.edge) / kT;
  return (site.prefactor / kT) * (site.b === 0 ? (SQRT_PI / 2) * fermiDirac(-0.5, eta) : incompleteHalf(eta, site.b).slope);
}

/**
 * The Fermi level (eV, particle sense) at which `carriers(F)` (increasing in F) equals `wanted`,
 * by safeguarded regula falsi (rootOfIncreasing, fermi.ts) from a bracket of ±2kT (or ±10 meV)
 * about `guess`; to 1e-12 eV.
 */
export function neutralLevel(carriers: (fermi: number) => number, wanted: number, guess: number, kT: number): number {
  const step = Math.max(2 * kT, 0.01);
  return rootOfIncreasing((f) => carriers(f) - wanted, guess - step, guess + step, 1e-12);
}
