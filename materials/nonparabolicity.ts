/**
 * Electron non-parabolicity α (1/eV) of the energy-dependent mass m(E) = m*(1 + α (E − Ec)),
 * equivalently (E − Ec)(1 + α (E − Ec)) = ħ²k²/(2m*) to first order (D. F. Nelson, R. C. Miller,
 * D. A. Kleinman, Phys. Rev. B 35, 7770 (1987), from memory).
 */
import { InputError } from '../engine/errors.js';

/** Which form of α: 'two-band' α = 1/Eg; 'three-band' the Kane model with the split-off band. */
export type NonparabolicityModel = 'two-band' | 'three-band';

/** Band quantities α needs: Γ gap Eg and spin–orbit splitting Dso (eV), band-edge mass me (m0). */
export interface NonparabolicityInput {
  readonly Eg: number;
  readonly Dso: number;
  readonly me: number;
}

const NONPARABOLICITY_MODELS: readonly NonparabolicityModel[] = ['two-band', 'three-band'];

/**
 * Non-parabolicity α (1/eV) of the Γ conduction band.
 *
 * 'two-band': α = 1/Eg, the Kane two-band result with the free-electron term neglected (m* ≪ m0).
 *
 * 'three-band': first order of E. O. Kane's secular equation with the split-off band and the
 * free-electron term (Kane, J. Phys. Chem. Solids 1, 249 (1957), from memory), for E′ = E − ħ²k²/2m0:
 *   E′ (E′ + Eg)(E′ + Eg + Δ) = (ħ²k²/2m0) Ep (E′ + Eg + 2Δ/3).
 * Writing E = (ħ²k²/2m0)[1 + g(E′)], g(E′) = (Ep/3)[2/(E′ + Eg) + 1/(E′ + Eg + Δ)], the band-edge
 * mass is m0/m* = 1 + g(0), and E′ = E (1 − m* / m0) to first order, so
 *   α = −d ln(m0/m)/dE = (1 − m* / m0)² [2/Eg² + 1/(Eg + Δ)²] / [2/Eg + 1/(Eg + Δ)]
 * (our derivation). Ep drops out once m* is given: remote bands other than the free-electron term
 * are taken as absorbed in an Ep that reproduces the tabulated m*. Both limits Δ → 0 and Δ → ∞
 * give the two-band Kane value (1 − m* / m0)²/Eg; Δ = Infinity (a custom material) is allowed.
 *
 * Units: Eg, Dso in eV (Eg > 0, Dso ≥ 0), me in m0 (0 < me < 1); result in 1/eV.
 * Example: GaAs at 0 K (Eg 1.519, Δ 0.341, m* 0.067): two-band 0.658, three-band 0.543 eV⁻¹.
 * Throws InputError 'bad-value' for an unknown model, Eg ≤ 0 (no Kane band edge: a semimetal has
 * no non-parabolicity of this form; the caller decides what to use there), Dso < 0 or me outside (0, 1).
 */
export function nonparabolicity(model: NonparabolicityModel, p: NonparabolicityInput): number {
  if (!NONPARABOLICITY_MODELS.includes(model)) {
    throw new InputError('bad-value', `nonparabolicity model: must be 'two-band' or 'three-band', got ${JSON.stringify(model)}; pick one of them`);
  }
  if (!(Number.isFinite(p.Eg) && p.Eg > 0)) {
    throw new InputError('bad-value', `nonparabolicity: Eg must be a finite gap > 0 eV, got ${String(p.Eg)}; the Kane form needs a band gap`);
  }
  if (model === 'two-band') return 1 / p.Eg;
  if (!(p.Dso >= 0)) {
    throw new InputError('bad-value', `nonparabolicity: Dso must be ≥ 0 eV, got ${String(p.Dso)}; give the spin–orbit splitting`);
  }
  if (!(Number.isFinite(p.me) && p.me > 0 && p.me < 1)) {
    throw new InputError('bad-value', `nonparabolicity: me must lie in (0, 1) m0, got ${String(p.me)}; give the band-edge electron mass`);
  }
  const so = 1 / (p.Eg + p.Dso);
  const kane = (1 - p.me) ** 2;
  return (kane * (2 / (p.Eg * p.Eg) + so * so)) / (2 / p.Eg + so);
}
