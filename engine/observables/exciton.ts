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
