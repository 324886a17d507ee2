/**
 * Temperature dependence of gaps and lattice constants.
 */
import type { BinaryParams } from './types.js';

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

/** Γ, X and L gaps (eV) of a binary at T (K) by the Varshni law with its VMR2001 α, β. */
export function gapsAt(p: BinaryParams, T: number): { readonly EgG: number; readonly EgX: number; readonly EgL: number } {
  return {
    EgG: varshni(p.EgG0, p.alphaG, p.betaG, T),
    EgX: varshni(p.EgX0, p.alphaX, p.betaX, T),
    EgL: varshni(p.EgL0, p.alphaL, p.betaL, T),
  };
}

/**
 * Relaxed lattice constant (nm) at T (K): a(T) = a(300 K) + da/dT (T − 300), the linear form
 * VMR2001 tabulates. Example: GaAs at 300 K → 0.565325 nm.
 */
export function latticeAt(p: Pick<BinaryParams, 'a_nm' | 'da_dT_nm_per_K'>, T: number): number {
  return p.a_nm + p.da_dT_nm_per_K * (T - 300);
}
