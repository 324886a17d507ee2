/**
 * The valence part of a solve: subband dispersions along [100] and [110] (or one axial direction),
 * the hole dispersion the quasi-Fermi levels use, and DOS-averaged masses — what `solve --json`,
 * the report's dispersion plot and the carrier calculation read.
 */
import { KB_EV_PER_K } from '../constants.js';
import type { Structure } from '../structure.js';
import type { HoleDispersion } from '../observables/carriers.js';
import { valenceSubbands, type ValenceResult } from './dispersion.js';
import { angularQuadrature, dosMass, holeDispersion } from './dos.js';
import type { ValenceModel } from './hamiltonian.js';

/** k∥ grid of the solve's dispersions: to 1.2 1/nm (holes of 5e12 cm⁻² fill k ≤ 0.56 1/nm), 49 points. */
export const VALENCE_K_MAX_PER_NM = 1.2;
export const VALENCE_K_POINTS = 49;
/** At most this many subbands are followed (the DOS of deeper ones is the parabolic tail's). */
export const MAX_VALENCE_SUBBANDS = 8;
/** Window below a subband's top over which its DOS-averaged mass is taken (eV). */
export const DOS_MASS_WINDOW_EV = 0.005;

export interface ValenceSummary {
  readonly model: ValenceModel;
  readonly axial: boolean;
  /**
   * How the hole DOS averages over in-plane directions: [100] and [110] with weights ½, ½ (the
   * trapezoid rule, exact for the cos 4φ warping; 0.3 % from the 0°/22.5°/45° rule in DOS mass for
   * InGaAs wells), or one direction in the axial approximation.
   */
  readonly dos_average: string;
  readonly k_per_nm: Float64Array;
  readonly directions: ValenceResult['directions'];
  /** DOS-averaged mass of each subband (m0): over 5 meV below its top, and over kT. NaN when its dispersion turns up within the window. */
  readonly dos_mass: readonly { readonly label: string; readonly window_5meV_m0: number; readonly kT_m0: number }[];
}

/**
 * Valence subbands of a structure for a solve: `subbands` Kramers pairs from the top (the bound
 * single-band heavy- and light-hole count, at most MAX_VALENCE_SUBBANDS), their dispersion for
 * the carrier calculation, and the summary for output.
 */
export function valenceOfSolve(structure: Structure, model: ValenceModel, axial: boolean, subbands: number): { readonly summary: ValenceSummary; readonly holes: HoleDispersion } {
  const q = angularQuadrature(axial, 1);
  const r = valenceSubbands(structure, { model, axial, directions: q.directions, kMax_per_nm: VALENCE_K_MAX_PER_NM, kPoints: VALENCE_K_POINTS, subbands: Math.min(Math.max(subbands, 1), MAX_VALENCE_SUBBANDS) });
  const kT = KB_EV_PER_K * structure.temperature_K;
  const dos_mass = r.directions[0]!.subbands.map((s, i) => ({
    label: s.label,
    window_5meV_m0: dosMass(r, q.weights, i, DOS_MASS_WINDOW_EV),
    kT_m0: kT > 0 ? dosMass(r, q.weights, i, kT) : NaN,
  }));
  return {
    summary: {
      model, axial,
      dos_average: axial ? 'axial approximation: one direction' : '[100] and [110], weights 1/2 each (trapezoid over the cos 4φ warping)',
      k_per_nm: r.k_per_nm, directions: r.directions, dos_mass,
    },
    holes: holeDispersion(r, q.weights),
  };
}
