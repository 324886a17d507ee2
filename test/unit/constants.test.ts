import { describe, expect, it } from 'vitest';
import { ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, HBAR2_OVER_2M0, HBAR_EV_S, HC_EV_NM, KB_EV_PER_K, wavelengthNm, wavenumberPerCm } from '../../engine/constants.js';

// CODATA 2018 defining constants (exact): h = 6.62607015e-34 J s, e = 1.602176634e-19 C,
// k_B = 1.380649e-23 J/K, c = 299792458 m/s; m0 = 9.1093837015e-31 kg (recommended).
const h = 6.62607015e-34;
const c = 299792458;
const kB = 1.380649e-23;

describe('constants against CODATA 2018', () => {
  it('ħ²/2m0 in eV nm² follows from ħ, m0 and e', () => {
    const hbar = h / (2 * Math.PI);
    const derived = (hbar * hbar) / (2 * ELECTRON_MASS_KG) / ELEMENTARY_CHARGE_C * 1e18;
    expect(Math.abs(HBAR2_OVER_2M0 - derived) / derived).toBeLessThan(1e-8);
  });
  it('hc in eV nm, ħ in eV s and k_B in eV/K', () => {
    expect(Math.abs(HC_EV_NM - (h * c) / ELEMENTARY_CHARGE_C * 1e9)).toBeLessThan(1e-5);
    expect(Math.abs(HBAR_EV_S - h / (2 * Math.PI) / ELEMENTARY_CHARGE_C) / HBAR_EV_S).toBeLessThan(1e-9);
    expect(Math.abs(KB_EV_PER_K - kB / ELEMENTARY_CHARGE_C) / KB_EV_PER_K).toBeLessThan(1e-9);
  });
  it('photon conversions: 1.27 eV ≈ 976.3 nm, 1 eV = 8065.54 cm⁻¹ (common practice)', () => {
    expect(wavelengthNm(1.27)).toBeCloseTo(976.25, 2);
    expect(wavenumberPerCm(1)).toBeCloseTo(8065.544, 3);
  });
});
