/**
 * Band-gap renormalisation of a well by its electron–hole plasma (optional, off by default): the
 * universal two-dimensional density law of S. Schmitt-Rink, C. Ell and H. Haug, Phys. Rev. B 33,
 * 1183 (1986), found in GaAs/AlGaAs wells by G. Tränkle et al., Phys. Rev. Lett. 58, 419 (1987)
 * (both from memory):
 *   ΔEg = −3.1 (n a_B²)^{1/3} Ry*,
 * with Ry* and a_B the effective Rydberg and Bohr radius (engine/observables/exciton.ts) of the e1
 * and top hole in-plane masses and the well's static permittivity, n the plasma sheet density (the
 * mean of electrons and holes). Applied as a rigid shift of every transition.
 * Units: eV, cm⁻², masses m0.
 */
import { effectiveBohrRadius, effectiveRydberg } from '../observables/exciton.js';

/** The law's coefficient (dimensionless). */
export const BGR_COEFFICIENT = 3.1;

/**
 * ΔEg (eV, ≤ 0) at plasma sheet density n_cm2 for reduced mass μ (m0) and permittivity ε_r; 0 when
 * n = 0. Example: μ = 0.05, ε_r = 12.9, n = 2e12 cm⁻² → Ry* = 4.09 meV, a_B = 13.65 nm, ΔEg = −19.0 meV.
 */
export function gapShift(n_cm2: number, reducedMass: number, permittivity: number): number {
  if (!(n_cm2 > 0)) return 0;
  const a = effectiveBohrRadius(reducedMass, permittivity);
  return -BGR_COEFFICIENT * Math.cbrt(n_cm2 * 1e-14 * a * a) * effectiveRydberg(reducedMass, permittivity);
}
