/**
 * Densities of states of quantum wells (2-D), wires (1-D) and bulk (3-D), spin included, with
 * optional broadening in closed form. Energies eV, masses m0; results per eV per cm², cm or cm³.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import { failBadValue } from '../errors.js';

/** One subband: its edge and the mass that sets its dispersion. */
export interface Subband {
  /** Subband edge in eV, in the particle sense (for holes: measured downward, see engine/profile.ts). */
  readonly energy: number;
  /** Mass (m0) of the free motion: in-plane mass for a well, mass along the wire axis for a wire. */
  readonly mass: number;
}

/** Broadening of the 2-D staircase: none, Gaussian (standard deviation σ) or Lorentzian (half width Γ). */
export type Broadening2D =
  | { readonly kind: 'none' }
  | { readonly kind: 'gaussian'; readonly sigma_eV: number }
  | { readonly kind: 'lorentzian'; readonly gamma_eV: number };

/** Broadening of the 1-D singularities: none or Lorentzian (half width at half maximum Γ). */
export type Broadening1D = { readonly kind: 'none' } | { readonly kind: 'lorentzian'; readonly gamma_eV: number };

const NM2_PER_CM2 = 1e14;
const NM_PER_CM = 1e7;
const NM3_PER_CM3 = 1e21;

const fail = failBadValue;

const checkSubbands = (subbands: readonly Subband[], where: string): void => {
  subbands.forEach((s, i) => {
    if (!Number.isFinite(s.energy)) fail(`${where}.subbands[${i}].energy`, 'must be finite (eV)', s.energy, 'pass the subband edge in eV');
    if (!(s.mass > 0) || !Number.isFinite(s.mass)) fail(`${where}.subbands[${i}].mass`, 'must be positive and finite (m0)', s.mass, 'pass the effective mass in units of m0');
  });
};

const checkEnergies = (energies: readonly number[], where: string): void => {
  energies.forEach((e, i) => {
    if (!Number.isFinite(e)) fail(`${where}.energies_eV[${i}]`, 'must be finite (eV)', e, 'pass finite energies in eV');
  });
};

const checkWidth = (width: number, where: string): void => {
  if (!(width > 0) || !Number.isFinite(width)) fail(where, 'broadening width must be positive and finite (eV)', width, "pass a width in eV, or { kind: 'none' }");
};

/**
 * Error function by the everywhere-positive series erf(x) = (2/√π) e^(−x²) Σ 2^n x^(2n+1)/(2n+1)!!
 * (M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions, eq. 7.1.6), which has no
 * cancellation; beyond |x| = 6, |1 − |erf x|| < 3e-17 and ±1 is returned.
 */
export function erf(x: number): number {
  const a = Math.abs(x);
  if (a >= 6) return Math.sign(x);
  let term = a;
  let sum = a;
  for (let n = 1; term > 1e-17 * sum; n++) {
    term *= (2 * a * a) / (2 * n + 1);
    sum += term;
  }
  return Math.sign(x) * (2 / Math.sqrt(Math.PI)) * Math.exp(-a * a) * sum;
}

/**
 * Height of one step of the 2-D staircase, m/(πħ²), spin included, per unit area.
 *
 * g = m m0 / (π ħ²) = m / (2π · ħ²/(2m0)) (common practice). Example: m = 0.067 → 2.80e13.
 *
 * @param mass in-plane effective mass (m0).
 * @returns states per eV per cm².
 */
export function stepHeight2d(mass: number): number {
  if (!(mass > 0) || !Number.isFinite(mass)) fail('stepHeight2d.mass', 'must be positive and finite (m0)', mass, 'pass the in-plane mass in units of m0');
  return (mass / (2 * Math.PI * HBAR2_OVER_2M0)) * NM2_PER_CM2;
}

/**
 * 2-D density of states of a well: g2(E) = Σ_n m_n/(πħ²) Θ(E − E_n), per unit area, spin included.
 *
 * Broadening replaces each step Θ(ε), ε = E − E_n, by its convolution in closed form:
 * Gaussian of standard deviation σ → ½[1 + erf(ε/(σ√2))]; Lorentzian of half width Γ →
 * ½ + arctan(ε/Γ)/π. Both differences from the sharp step are odd in ε, so the number of states
 * in any window symmetric about an edge is conserved.
 *
 * @param args.subbands edges (eV) and in-plane masses (m0).
 * @param args.energies_eV energies at which to evaluate (eV).
 * @param args.broadening default none.
 * @returns g2 at each energy, states per eV per cm².
 */
export function dos2d(args: {
  readonly subbands: readonly Subband[];
  readonly energies_eV: readonly number[];
  readonly broadening?: Broadening2D;
}): readonly number[] {
  const { subbands, energies_eV, broadening = { kind: 'none' } } = args;
  checkSubbands(subbands, 'dos2d');
  checkEnergies(energies_eV, 'dos2d');
  let step: (eps: number) => number;
  switch (broadening.kind) {
    case 'none':
      step = (eps) => (eps >= 0 ? 1 : 0);
      break;
    case 'gaussian': {
      checkWidth(broadening.sigma_eV, 'dos2d.broadening.sigma_eV');
      const scale = broadening.sigma_eV * Math.SQRT2;
      step = (eps) => 0.5 * (1 + erf(eps / scale));
      break;
    }
    case 'lorentzian': {
      checkWidth(broadening.gamma_eV, 'dos2d.broadening.gamma_eV');
      const gamma = broadening.gamma_eV;
      step = (eps) => 0.5 + Math.atan(eps / gamma) / Math.PI;
      break;
    }
  }
  const heights = subbands.map((s) => stepHeight2d(s.mass));
  return energies_eV.map((e) => subbands.reduce((g, s, i) => g + heights[i] * step(e - s.energy), 0));
}

/**
 * 1-D density of states of a wire: g1(E) = Σ_n √(2 m_n)/(πħ) (E − E_n)^(−1/2), per unit length,
 * spin included (common practice); +∞ exactly at an edge when unbroadened.
 *
 * Lorentzian broadening (half width Γ) in closed form: with ε = E − E_n and r = √(ε² + Γ²),
 * (1/π)∫0^∞ x^(−1/2) Γ/((ε − x)² + Γ²) dx = Im[(−ε − iΓ)^(−1/2)] = √((r + ε)/2) / r,
 * from ∫0^∞ x^(−1/2)/(x + a) dx = π/√a (I. S. Gradshteyn and I. M. Ryzhik, Table of Integrals,
 * 3.222.2, from memory) with a = −ε − iΓ. Its integral √(2(r + ε)) tends to the sharp count 2√ε,
 * so the number of states is conserved.
 *
 * @param args.subbands edges (eV) and masses along the wire (m0).
 * @param args.energies_eV energies at which to evaluate (eV).
 * @param args.broadening default none.
 * @returns g1 at each energy, states per eV per cm.
 */
export function dos1d(args: {
  readonly subbands: readonly Subband[];
  readonly energies_eV: readonly number[];
  readonly broadening?: Broadening1D;
}): readonly number[] {
  const { subbands, energies_eV, broadening = { kind: 'none' } } = args;
  checkSubbands(subbands, 'dos1d');
  checkEnergies(energies_eV, 'dos1d');
  let shape: (eps: number) => number;
  if (broadening.kind === 'lorentzian') {
    checkWidth(broadening.gamma_eV, 'dos1d.broadening.gamma_eV');
    const gamma = broadening.gamma_eV;
    shape = (eps) => {
      const r = Math.hypot(eps, gamma);
      // for ε ≪ −Γ, r + ε cancels: r + ε = Γ²/(r − ε)
      const rPlusEps = eps >= 0 ? r + eps : (gamma * gamma) / (r - eps);
      return Math.sqrt(rPlusEps / 2) / r;
    };
  } else {
    shape = (eps) => (eps > 0 ? 1 / Math.sqrt(eps) : eps === 0 ? Number.POSITIVE_INFINITY : 0);
  }
  // √(2m m0)/(πħ) = √(m / (ħ²/2m0)) / π in nm⁻¹ eV^(−1/2)
  const prefactors = subbands.map((s) => (Math.sqrt(s.mass / HBAR2_OVER_2M0) / Math.PI) * NM_PER_CM);
  return energies_eV.map((e) => subbands.reduce((g, s, i) => g + prefactors[i] * shape(e - s.energy), 0));
}

/**
 * Bulk (3-D) density of states of a parabolic band: g3(E) = (1/2π²)(2m/ħ²)^(3/2) √(E − E0), spin
 * included, per unit volume (common practice). It envelopes the staircase g2/L of an infinite
 * well of width L, touching it at every edge E_n = n² E_1.
 *
 * @param args.edge_eV band edge E0 (eV).
 * @param args.mass density-of-states mass (m0).
 * @param args.energies_eV energies (eV).
 * @returns g3 at each energy, states per eV per cm³.
 */
export function dos3d(args: { readonly edge_eV: number; readonly mass: number; readonly energies_eV: readonly number[] }): readonly number[] {
  const { edge_eV, mass, energies_eV } = args;
  checkSubbands([{ energy: edge_eV, mass }], 'dos3d');
  checkEnergies(energies_eV, 'dos3d');
  const prefactor = ((mass / HBAR2_OVER_2M0) ** 1.5 / (2 * Math.PI * Math.PI)) * NM3_PER_CM3;
  return energies_eV.map((e) => (e > edge_eV ? prefactor * Math.sqrt(e - edge_eV) : 0));
}
