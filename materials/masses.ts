/**
 * Hole masses from the Luttinger parameters.
 */

/** Heavy- and light-hole masses along [001] and in the (001) plane (m0). */
export interface HoleMasses {
  readonly mhh_z: number; readonly mlh_z: number;
  readonly mhh_par: number; readonly mlh_par: number;
}

/**
 * Hole masses (m0) from γ1, γ2 (dimensionless): along [001] m_hh = 1/(γ1 − 2γ2),
 * m_lh = 1/(γ1 + 2γ2); in-plane in the axial approximation m_hh,∥ = 1/(γ1 + γ2),
 * m_lh,∥ = 1/(γ1 − γ2) (common practice; S. L. Chuang, Physics of Optoelectronic Devices).
 * Example: GaAs (6.98, 2.06) → m_hh,z = 0.350, m_lh,z = 0.0901, m_hh,∥ = 0.1106, m_lh,∥ = 0.2033.
 */
export function holeMasses(p: { readonly gamma1: number; readonly gamma2: number }): HoleMasses {
  return {
    mhh_z: 1 / (p.gamma1 - 2 * p.gamma2),
    mlh_z: 1 / (p.gamma1 + 2 * p.gamma2),
    mhh_par: 1 / (p.gamma1 + p.gamma2),
    mlh_par: 1 / (p.gamma1 - p.gamma2),
  };
}
