/**
 * Shared shapes of the materials layer. Energies in eV, lengths in nm, masses in m0, T in K.
 */

/** Parameters of one zinc-blende binary at 0 K, as tabulated by Vurgaftman, Meyer & Ram-Mohan,
 * J. Appl. Phys. 89, 5815 (2001) (hereafter VMR2001). */
export interface BinaryParams {
  readonly name: string;
  /** Lattice constant at 300 K (Å in the paper; nm here) and its temperature coefficient (nm/K). */
  readonly a_nm: number;
  readonly da_dT_nm_per_K: number;
  /** Γ, X, L gaps at 0 K (eV) and their Varshni α (eV/K), β (K). */
  readonly EgG0: number; readonly alphaG: number; readonly betaG: number;
  readonly EgX0: number; readonly alphaX: number; readonly betaX: number;
  readonly EgL0: number; readonly alphaL: number; readonly betaL: number;
  /** Spin–orbit splitting (eV). */
  readonly Dso: number;
  /** Γ-valley electron effective mass (m0). */
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
  /** Electron Γ mass (m0), isotropic. */
  readonly me: number;
  /** Hole masses along [001] (growth, z) and in-plane (axial approximation), m0. */
  readonly mhh_z: number; readonly mlh_z: number;
  readonly mhh_par: number; readonly mlh_par: number;
  /** Strain: in-plane ε∥ = (a_sub − a)/a and perpendicular ε⊥ = −2 (C12/C11) ε∥. */
  readonly strain_par: number;
  readonly strain_perp: number;
  /** Lattice mismatch (a − a_sub)/a_sub; 0 when unstrained. */
  readonly mismatch: number;
  /** Matthews–Blakeslee critical thickness (nm); Infinity when lattice-matched or unstrained. */
  readonly criticalThickness_nm: number;
  /** One (001) monolayer of the strained layer: a⊥/2 (nm). */
  readonly monolayer_nm: number;
  /** True when X or L lies below Γ (unstrained). */
  readonly indirect: boolean;
  /** Which valley is lowest: 'Γ' | 'X' | 'L'. */
  readonly lowestValley: 'Γ' | 'X' | 'L';
}
