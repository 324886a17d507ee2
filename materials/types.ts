/**
 * Shared shapes of the materials layer. Energies in eV, lengths in nm, masses in m0, T in K.
 */

/** An alloy: fractions of the group-III and group-V elements, each side summing to 1.
 * Zero fractions are kept as given ("In0Ga1As" is GaAs reached from the InGaAs side). */
export interface Alloy {
  readonly III: Readonly<Record<string, number>>;
  readonly V: Readonly<Record<string, number>>;
}

/**
 * Temperature law of one gap, from its 0 K value E0 (eV), T in K:
 * - 'varshni': E(T) = E0 − α T²/(T + β) (Y. P. Varshni, Physica 34, 149 (1967)); α in eV/K, β in K;
 *   β = 0 is the linear law E0 − αT.
 * - 'bose-einstein': E(T) = E0 + a [1 − coth(T1/T)], the Bose–Einstein form of L. Viña,
 *   S. Logothetidis, M. Cardona, Phys. Rev. B 30, 1979 (1984) (from memory) written as VMR2001 gives
 *   it for the GaP Γ gap; a in eV, T1 = Θ/2 in K (Θ the mean phonon temperature).
 */
export type GapLaw =
  | { readonly kind: 'varshni'; readonly alpha_eV_per_K: number; readonly beta_K: number }
  | { readonly kind: 'bose-einstein'; readonly a_eV: number; readonly T1_K: number };

/** Parameters of one zinc-blende binary at 0 K, as tabulated by Vurgaftman, Meyer & Ram-Mohan,
 * J. Appl. Phys. 89, 5815 (2001) (hereafter VMR2001). */
export interface BinaryParams {
  readonly name: string;
  /** Lattice constant at 300 K (Å in the paper; nm here) and its temperature coefficient (nm/K). */
  readonly a_nm: number;
  readonly da_dT_nm_per_K: number;
  /** Γ, X, L gaps at 0 K (eV). */
  readonly EgG0: number; readonly EgX0: number; readonly EgL0: number;
  /** Spin–orbit splitting (eV). */
  readonly Dso: number;
  /** Γ-valley electron effective mass at low temperature (m0). */
  readonly me: number;
  /** Luttinger parameters. */
  readonly gamma1: number; readonly gamma2: number; readonly gamma3: number;
  /** Kane energy Ep (eV) and remote-band parameter F. */
  readonly Ep: number; readonly F: number;
  /** Valence-band maximum (unstrained, without spin–orbit averaging) on the absolute scale of VMR2001 (eV). */
  readonly VBO: number;
  /** Deformation potentials (eV): conduction ac, valence av (VMR2001 sign convention), shear b. */
  readonly ac: number; readonly av: number; readonly b: number;
  /** Elastic constants (GPa). */
  readonly C11: number; readonly C12: number;
  /** Temperature laws of the Γ, X and L gaps, as the source gives them for this binary. */
  readonly lawG: GapLaw; readonly lawX: GapLaw; readonly lawL: GapLaw;
}

/** How the electron mass depends on temperature: 'low-temperature' keeps the tabulated (0 K)
 * mass at every T; 'kane-temperature' scales it by the Kane-model inverse mass at Eg(T) (masses.ts). */
export type ElectronMassModel = 'low-temperature' | 'kane-temperature';
/** How the lattice constant follows temperature: 'linear' is a(300 K) + da/dT (T − 300) at every
 * T; 'held-below-100K' uses the same law above 100 K and holds a(100 K) below (temperature.ts). */
export type LatticeModel = 'linear' | 'held-below-100K';

/** The model choices a resolved material was computed with. */
export interface MaterialModels {
  readonly electronMass: ElectronMassModel;
  readonly lattice: LatticeModel;
}

/** A material after alloying, temperature and strain: everything the profile builder needs. */
export interface ResolvedMaterial {
  /** Canonical formula, e.g. "In0.2Ga0.8As", or the custom name. */
  readonly formula: string;
  readonly temperature_K: number;
  /** Substrate formula the layer is strained on, or null when unstrained (free-standing). */
  readonly substrate: string | null;
  /** Relaxed lattice constant at T (nm). */
  readonly a_nm: number;
  /** Unstrained gaps at T (eV). */
  readonly EgG: number; readonly EgX: number; readonly EgL: number;
  readonly Dso: number;
  /** Band edges on the absolute (VBO) scale including strain (eV). Ec is the Γ conduction edge. */
  readonly Ec: number;
  readonly Ehh: number;
  readonly Elh: number;
  /** Strained Γ gap to the top valence edge: Ec − max(Ehh, Elh). */
  readonly EgStrained: number;
  /** Electron Γ mass (m0), isotropic, at temperature_K under models.electronMass. */
  readonly me: number;
  /** Hole masses along [001] (growth, z) and in-plane (axial approximation), m0. */
  readonly mhh_z: number; readonly mlh_z: number;
  readonly mhh_par: number; readonly mlh_par: number;
  /** Strain: in-plane ε∥ = (a_sub − a)/a and perpendicular ε⊥ = −2 (C12/C11) ε∥. */
  readonly strain_par: number;
  readonly strain_perp: number;
  /** Lattice mismatch (a − a_sub)/a_sub; 0 when unstrained. */
  readonly mismatch: number;
  /** Elastic constants (GPa) of the layer, for strain balance; NaN for a custom material. */
  readonly C11: number;
  readonly C12: number;
  /** Matthews–Blakeslee critical thickness (nm); Infinity when lattice-matched or unstrained. */
  readonly criticalThickness_nm: number;
  /** One (001) monolayer of the strained layer: a⊥/2 (nm). */
  readonly monolayer_nm: number;
  /** True when X or L lies below Γ (unstrained). */
  readonly indirect: boolean;
  /** Which valley is lowest: 'Γ' | 'X' | 'L'. */
  readonly lowestValley: 'Γ' | 'X' | 'L';
  /** Model choices that produced the values; null for a custom material (its values are given). */
  readonly models: MaterialModels | null;
}
