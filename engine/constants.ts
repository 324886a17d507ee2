/**
 * Physical constants (CODATA 2018) in the units the engine works in: eV, nm, K, masses in m0.
 */

/** ħ²/(2 m0) in eV nm² (CODATA 2018). */
export const HBAR2_OVER_2M0 = 0.0380998212;

/** h c in eV nm (CODATA 2018): λ[nm] = HC_EV_NM / E[eV]. */
export const HC_EV_NM = 1239.84198;

/** Boltzmann constant in eV/K (CODATA 2018, exact). */
export const KB_EV_PER_K = 8.617333262e-5;

/** Elementary charge in C (exact). */
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;

/** Electron rest mass in kg (CODATA 2018). */
export const ELECTRON_MASS_KG = 9.1093837015e-31;

/** Reduced Planck constant in eV s (CODATA 2018, exact). */
export const HBAR_EV_S = 6.582119569e-16;

/** Vacuum permittivity in F/m (CODATA 2018). */
export const EPSILON0_F_PER_M = 8.8541878128e-12;

/** Photon wavelength in nm for an energy in eV. */
export const wavelengthNm = (energyEv: number): number => HC_EV_NM / energyEv;

/** Wavenumber in cm⁻¹ for an energy in eV (1 eV = 8065.54 cm⁻¹). */
export const wavenumberPerCm = (energyEv: number): number => 1e7 / (HC_EV_NM / energyEv);
