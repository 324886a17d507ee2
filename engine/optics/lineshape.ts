/**
 * Lineshapes of the intraband (dephasing) broadening of an optical transition: each is a density
 * L(x) of unit area in the detuning x = E_transition − ħω (eV) and its cumulative Φ(x) = ∫_{−∞}^x L,
 * which the spectra integrate over energy bins exactly (spectra.ts).
 *
 * - 'lorentzian': L = (Γ/π)/(x² + Γ²), Γ = ħ/τ_in (half width at half maximum), the Markovian
 *   relaxation-time form (common practice; e.g. S. L. Chuang, Physics of Optoelectronic Devices,
 *   Wiley 1995, Ch. 9, from memory). Its 1/x² tail puts absorption below the gap even at full
 *   inversion of the band edge and shifts the transparency point away from the quasi-Fermi separation.
 * - 'sech': L = sech(x/Γ)/(πΓ), Γ = ħ/τ_in, the hyperbolic-secant lineshape of S. R. Chinn,
 *   P. S. Zory and A. R. Reisinger, IEEE J. Quantum Electron. 24, 2191 (1988) (from memory). The
 *   same centre height as the Lorentzian of the same τ_in, but an exponential tail 2e^{−|x|/Γ}/(πΓ).
 *   Φ(x) = ½ + gd(x/Γ)/π with the Gudermannian gd(y) = 2 arctan(tanh(y/2)) = arctan(sinh y).
 * - 'delta': no broadening, Φ the unit step (½ at 0), for closed-form checks.
 * Energies eV, τ_in in ps.
 */
import { HBAR_EV_S } from '../constants.js';
import { failBadValue } from '../errors.js';

export type LineshapeKind = 'lorentzian' | 'sech' | 'delta';

export const LINESHAPES: readonly LineshapeKind[] = ['lorentzian', 'sech', 'delta'];

export interface Lineshape {
  readonly kind: LineshapeKind;
  /** Γ = ħ/τ_in (eV); 0 for 'delta'. */
  readonly gamma_eV: number;
  /** Density L(x) (1/eV); for 'delta' it is 0 except at x = 0, where it is Infinity. */
  readonly density: (x: number) => number;
  /** Cumulative Φ(x) (dimensionless, 0 → 1). */
  readonly cumulative: (x: number) => number;
}

/** Γ = ħ/τ (eV) for τ in ps: 0.658 meV·ps / τ. */
export const gammaOfTau = (tau_ps: number): number => (HBAR_EV_S * 1e12) / tau_ps;

/**
 * The lineshape of `kind` for intraband relaxation time tau_ps (ps, > 0; ignored for 'delta').
 * Example: lineshape('lorentzian', 0.1).gamma_eV = 6.58e-3 eV; its density at 0 is 1/(πΓ) = 48.4 /eV.
 */
export function lineshape(kind: LineshapeKind, tau_ps: number): Lineshape {
  // The step takes ½ at 0, so a photon energy on a bin edge averages the two bins beside it.
  if (kind === 'delta') return { kind, gamma_eV: 0, density: (x) => (x === 0 ? Infinity : 0), cumulative: (x) => (x > 0 ? 1 : x < 0 ? 0 : 0.5) };
  if (!(tau_ps > 0) || !Number.isFinite(tau_ps)) failBadValue('optics.intraband_time', 'must be a positive time in ps', tau_ps, 'give e.g. "0.1 ps"');
  const g = gammaOfTau(tau_ps);
  if (kind === 'lorentzian') {
    return { kind, gamma_eV: g, density: (x) => g / Math.PI / (x * x + g * g), cumulative: (x) => 0.5 + Math.atan(x / g) / Math.PI };
  }
  if (kind === 'sech') {
    return {
      kind, gamma_eV: g,
      density: (x) => 1 / (Math.PI * g * Math.cosh(x / g)),
      // gd(y) = 2 arctan(tanh(y/2)) = arctan(sinh y); beyond |y| = 40 the tail is below 1e-17.
      cumulative: (x) => (x > 40 * g ? 1 : x < -40 * g ? 0 : 0.5 + Math.atan(Math.sinh(x / g)) / Math.PI),
    };
  }
  return failBadValue('optics.lineshape', `must be one of ${LINESHAPES.join(', ')}`, kind, 'pick a lineshape');
}
