/**
 * Temperature dependence of gaps and lattice constants.
 */
import type { BinaryParams, GapLaw, LatticeModel } from './types.js';

/**
 * Band gap at temperature T by the Varshni law E(T) = E0 − α T²/(T + β)
 * (Y. P. Varshni, Physica 34, 149 (1967)).
 * E0 in eV (0 K gap), alpha in eV/K, beta in K, T in K; result in eV. β = 0 is the linear law
 * E0 − αT (VMR2001's InP X gap), whose 0/0 at T = 0 is E0.
 * Example: GaAs Γ, varshni(1.519, 5.405e-4, 204, 300) ≈ 1.4225 eV.
 */
export function varshni(E0: number, alpha: number, beta: number, T: number): number {
  return T === 0 ? E0 : E0 - (alpha * T * T) / (T + beta);
}

/**
 * Band gap at temperature T by the Bose–Einstein form E(T) = E0 + a [1 − coth(T1/T)]
 * (L. Viña, S. Logothetidis, M. Cardona, Phys. Rev. B 30, 1979 (1984), from memory, with
 * T1 = Θ/2), the law VMR2001 gives for the GaP Γ gap: 2.886 + 0.1081[1 − coth(164/T)] eV.
 * E0 and a in eV, T1 and T in K; result in eV. At T = 0 (coth → 1) it is E0.
 * Example: boseEinstein(2.886, 0.1081, 164, 300) ≈ 2.7770 eV.
 */
export function boseEinstein(E0: number, a: number, T1: number, T: number): number {
  // 1 − coth(u) = −2/(e^{2u} − 1), written so that large u (low T) does not lose digits.
  return T === 0 ? E0 : E0 - (2 * a) / Math.expm1((2 * T1) / T);
}

/** Gap (eV) at T (K) from its 0 K value E0 (eV) under the law its source gives (types.ts GapLaw). */
export function gapAt(E0: number, law: GapLaw, T: number): number {
  return law.kind === 'varshni' ? varshni(E0, law.alpha_eV_per_K, law.beta_K, T) : boseEinstein(E0, law.a_eV, law.T1_K, T);
}

/** Γ, X and L gaps (eV) of a binary at T (K), each by the temperature law tabulated for it. */
export function gapsAt(p: BinaryParams, T: number): { readonly EgG: number; readonly EgX: number; readonly EgL: number } {
  return { EgG: gapAt(p.EgG0, p.lawG, T), EgX: gapAt(p.EgX0, p.lawX, T), EgL: gapAt(p.EgL0, p.lawL, T) };
}

/** Below this temperature (K) the 'held-below-100K' lattice model holds a(T) constant. */
export const LATTICE_HOLD_K = 100;

/**
 * Relaxed lattice constant (nm) at T (K).
 * 'linear': a(T) = a(300 K) + da/dT (T − 300) at every T, the linear form VMR2001 tabulates.
 * 'held-below-100K': the same law above 100 K, a(100 K) below. Why: the expansion coefficient
 * follows the heat capacity (Grüneisen relation) and vanishes as T³ at low T, so the 300 K slope
 * extrapolated to 0 K over-contracts. With a Debye heat capacity of Θ_D = 250–450 K (the III–V
 * binaries' range, from memory; GaAs ≈ 345 K) the 300 K → 0 K contraction is the 300 K slope times
 * 183–224 K (test/reference/materials/debye_contraction.py), so 'linear' (300 K) contracts 1.3–1.6×
 * too much, and holding below 100 K (200 K) is within 11 % with zero slope at low T.
 * Example: GaAs at 300 K → 0.565325 nm under either model; at 4 K 'linear' gives 0.564177 nm,
 * 'held-below-100K' 0.564549 nm.
 */
export function latticeAt(p: Pick<BinaryParams, 'a_nm' | 'da_dT_nm_per_K'>, T: number, model: LatticeModel = 'linear'): number {
  const t = model === 'held-below-100K' ? Math.max(T, LATTICE_HOLD_K) : T;
  return p.a_nm + p.da_dT_nm_per_K * (t - 300);
}
