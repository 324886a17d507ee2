/**
 * Exciton binding-energy estimate for a quantum well in the fractional-dimensional model:
 * the electron–hole pair is a hydrogen atom in a space of non-integer dimension α (2 < α ≤ 3).
 * Energies eV, lengths nm, masses m0, ε_r dimensionless.
 */
import { failBadValue } from '../errors.js';

/** Rydberg energy R∞hc in eV (CODATA 2018). */
const RYDBERG_EV = 13.605693122994;

/** Bohr radius in nm (CODATA 2018). */
const BOHR_RADIUS_NM = 0.0529177210903;

const fail = failBadValue;

const checkMaterial = (mu: number, eps: number, where: string): void => {
  if (!(mu > 0) || !Number.isFinite(mu)) fail(`${where}.reducedMass`, 'must be positive and finite (m0)', mu, 'pass μ = m_e m_h/(m_e + m_h) in units of m0');
  if (!(eps > 0) || !Number.isFinite(eps)) fail(`${where}.dielectricConstant`, 'must be positive and finite', eps, 'pass the static relative permittivity ε_r');
};

/**
 * Effective Rydberg Ry* = 13.6057 eV · μ/ε_r² (hydrogenic exciton, common practice).
 *
 * @param reducedMass electron–hole reduced mass μ (m0).
 * @param dielectricConstant static relative permittivity ε_r.
 * @returns Ry* in eV. Example: μ = 0.058, ε_r = 12.9 → 4.74 meV.
 */
export function effectiveRydberg(reducedMass: number, dielectricConstant: number): number {
  checkMaterial(reducedMass, dielectricConstant, 'effectiveRydberg');
  return (RYDBERG_EV * reducedMass) / (dielectricConstant * dielectricConstant);
}

/**
 * Effective Bohr radius a_B = 0.052918 nm · ε_r/μ (hydrogenic exciton, common practice).
 *
 * @returns a_B in nm. Example: μ = 0.058, ε_r = 12.9 → 11.8 nm.
 */
export function effectiveBohrRadius(reducedMass: number, dielectricConstant: number): number {
  checkMaterial(reducedMass, dielectricConstant, 'effectiveBohrRadius');
  return (BOHR_RADIUS_NM * dielectricConstant) / reducedMass;
}

/**
 * Ground-state binding energy of a hydrogenic exciton in dimension α:
 * E_b = Ry* / [1 + (α − 3)/2]² = 4 Ry* /(α − 1)² (X.-F. He, Phys. Rev. B 43, 2063 (1991), the
 * bound levels E_n = Ry* /[n + (α − 3)/2]², n = 1, 2, …). α = 3 gives Ry*, α = 2 gives 4 Ry*.
 *
 * @param dimension α, in [2, 3].
 * @param rydberg_eV Ry* (eV).
 * @returns E_b in eV.
 */
export function fractionalDimensionBinding(dimension: number, rydberg_eV: number): number {
  if (!(dimension >= 2 && dimension <= 3)) fail('fractionalDimensionBinding.dimension', 'must lie in [2, 3]', dimension, 'pass α between the 2-D and 3-D limits');
  if (!(rydberg_eV > 0) || !Number.isFinite(rydberg_eV)) fail('fractionalDimensionBinding.rydberg_eV', 'must be positive and finite (eV)', rydberg_eV, 'pass the effective Rydberg in eV');
  return (4 * rydberg_eV) / ((dimension - 1) * (dimension - 1));
}

/** The exciton estimate of a well, with the quantities that produced it. */
export interface ExcitonEstimate {
  /** Binding energy (eV). */
  readonly binding_eV: number;
  /** Fractional dimension α used. */
  readonly dimension: number;
  /** Effective Rydberg Ry* (eV). */
  readonly rydberg_eV: number;
  /** Effective Bohr radius a_B (nm). */
  readonly bohrRadius_nm: number;
}

/**
 * Exciton binding energy of a quantum well in the fractional-dimensional model.
 *
 * Dimension from the rule α = 3 − exp(−L* /(2 a_B)) of H. Mathieu, P. Lefebvre and P. Christol,
 * J. Appl. Phys. 72, 300 (1992) (from memory), with L* the effective width of the well: for
 * infinite barriers the well width, for finite barriers the width plus the penetration of the
 * electron and hole envelopes into the barriers (which lowers the binding); then
 * E_b = 4 Ry* /(α − 1)² (He 1991). A one-parameter interpolation between the 3-D (L* ≫ a_B) and
 * 2-D (L* → 0) limits: expect ~10–20 % agreement with variational results, not better.
 *
 * @param args.effectiveWidth_nm L* (nm, ≥ 0).
 * @param args.reducedMass μ (m0); in-plane reduced mass for a well.
 * @param args.dielectricConstant static ε_r.
 * @returns the estimate with α, Ry* and a_B.
 * @example wellExciton({ effectiveWidth_nm: 10, reducedMass: 0.058, dielectricConstant: 12.9 }).binding_eV // ≈ 0.0105
 */
export function wellExciton(args: { readonly effectiveWidth_nm: number; readonly reducedMass: number; readonly dielectricConstant: number }): ExcitonEstimate {
  const { effectiveWidth_nm: width, reducedMass, dielectricConstant } = args;
  checkMaterial(reducedMass, dielectricConstant, 'wellExciton');
  if (!(width >= 0) || !Number.isFinite(width)) fail('wellExciton.effectiveWidth_nm', 'must be non-negative and finite (nm)', width, 'pass the effective well width in nm');
  const rydberg_eV = effectiveRydberg(reducedMass, dielectricConstant);
  const bohrRadius_nm = effectiveBohrRadius(reducedMass, dielectricConstant);
  const dimension = 3 - Math.exp(-width / (2 * bohrRadius_nm));
  return { binding_eV: fractionalDimensionBinding(dimension, rydberg_eV), dimension, rydberg_eV, bohrRadius_nm };
}

/** σ²/L² of the infinite-well ground state, 1/12 − 1/(2π²): the spread that defines L* below. */
const GROUND_SPREAD = 1 / 12 - 1 / (2 * Math.PI * Math.PI);

/** Variance of z under the probability density ψ² (nm²), normalised by ∫ψ² so sampling error cancels. */
function spread(psi: ArrayLike<number>, z: ArrayLike<number>, w: ArrayLike<number>): number {
  let n = 0;
  let m1 = 0;
  let m2 = 0;
  for (let i = 0; i < w.length; i++) {
    const p = w[i]! * psi[i]! * psi[i]!;
    n += p;
    m1 += p * z[i]!;
    m2 += p * z[i]! * z[i]!;
  }
  const mean = m1 / n;
  return Math.max(m2 / n - mean * mean, 0);
}

/**
 * The exciton of one electron and one hole subband of a solved well, in the fractional-dimensional
 * model (wellExciton) with inputs taken from the two envelopes:
 * - effective width L* = √((σe² + σh²)/(2c)), σ² the variance of z under |ψ|² and
 *   c = 1/12 − 1/(2π²) that of the infinite-well ground state, so that L* is exactly the width of an
 *   infinite well and grows with the envelopes' penetration into finite barriers (ours: it makes
 *   the binding of a narrow well fall back towards the barrier's bulk value, as variational
 *   calculations find, e.g. R. L. Greene, K. K. Bajaj, D. E. Phelps, Phys. Rev. B 29, 1807 (1984));
 * - reduced mass from the two subbands' in-plane masses (m0);
 * - permittivity averaged over ½(|ψe|² + |ψh|²) (permittivity per grid point).
 * Grid z (nm) with quadrature weights w (e.g. Simpson's), envelopes sampled on it.
 * Example: a 10 nm GaAs/Al0.3Ga0.7As well, e1-hh1 → E_b ≈ 8 meV.
 */
export function subbandExciton(args: {
  readonly z: ArrayLike<number>; readonly w: ArrayLike<number>;
  readonly psiElectron: ArrayLike<number>; readonly psiHole: ArrayLike<number>;
  readonly massElectron: number; readonly massHole: number;
  readonly permittivity: ArrayLike<number>;
}): ExcitonEstimate & { readonly effectiveWidth_nm: number; readonly reducedMass: number; readonly dielectricConstant: number } {
  const { z, w, psiElectron: pe, psiHole: ph } = args;
  const reducedMass = 1 / (1 / args.massElectron + 1 / args.massHole);
  let eps = 0;
  let norm = 0;
  for (let i = 0; i < w.length; i++) {
    const p = 0.5 * w[i]! * (pe[i]! * pe[i]! + ph[i]! * ph[i]!);
    eps += p * args.permittivity[i]!;
    norm += p;
  }
  const dielectricConstant = eps / norm;
  const effectiveWidth_nm = Math.sqrt((spread(pe, z, w) + spread(ph, z, w)) / (2 * GROUND_SPREAD));
  return { ...wellExciton({ effectiveWidth_nm, reducedMass, dielectricConstant }), effectiveWidth_nm, reducedMass, dielectricConstant };
}

/**
 * The layers' static permittivity at each grid point z (nm, z = 0 at the first layer's start);
 * points beyond the stack take the outer layers' values. NaN where a layer's permittivity is unknown.
 */
export function permittivityOnGrid(layers: readonly { readonly thickness_nm: number; readonly permittivity: number }[], z: ArrayLike<number>): Float64Array {
  const out = new Float64Array(z.length);
  let k = 0;
  let end = layers[0]!.thickness_nm;
  for (let i = 0; i < z.length; i++) {
    while (z[i]! > end && k < layers.length - 1) end += layers[++k]!.thickness_nm;
    out[i] = layers[k]!.permittivity;
  }
  return out;
}
