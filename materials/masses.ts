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

/**
 * Kane three-band inverse electron mass (m0⁻¹) at gap Eg: m0/m* = (1 + 2F) + Ep (Eg + 2Δ/3) /
 * (Eg (Eg + Δ)) (VMR2001 Sec. II.A, from memory; E. O. Kane, J. Phys. Chem. Solids 1, 249 (1957)).
 * Eg, Ep, Δ (Dso) in eV; F dimensionless. Example: GaAs (Eg 1.519, Ep 28.8, F −1.94, Δ 0.341) → 14.92,
 * i.e. m* = 0.0670, VMR2001's tabulated mass.
 */
export function kaneInverseMass(Eg: number, p: { readonly Ep: number; readonly F: number; readonly Dso: number }): number {
  return 1 + 2 * p.F + (p.Ep * (Eg + (2 * p.Dso) / 3)) / (Eg * (Eg + p.Dso));
}

/**
 * Electron mass (m0) at temperature from its low-temperature value: m*(T) = m*(0) · K(Eg(0)) / K(Eg(T)),
 * K the Kane inverse mass above, so the tabulated mass is kept exactly at T = 0 and only the
 * relative change with the gap is taken from the Kane relation (our scaling of VMR2001's relation).
 * me0 in m0; Eg0, EgT (gaps at 0 K and at T) in eV. Example: GaAs at 300 K (Eg 1.4225 eV) → 0.0622.
 */
export function electronMassAtGap(me0: number, p: { readonly Ep: number; readonly F: number; readonly Dso: number }, Eg0: number, EgT: number): number {
  return Eg0 === EgT ? me0 : (me0 * kaneInverseMass(Eg0, p)) / kaneInverseMass(EgT, p);
}
