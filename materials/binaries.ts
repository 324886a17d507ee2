/**
 * Band parameters of the nine zinc-blende III–V binaries, from I. Vurgaftman, J. R. Meyer and
 * L. R. Ram-Mohan, J. Appl. Phys. 89, 5815 (2001) (VMR2001), one table per material in its
 * Sec. III. Every value here was typed from memory of that paper: no public copy of its tables
 * was reachable while this file was written (see materials/SOURCES.md). The paper's units are
 * kept in the table below (Å, meV/K) and converted once, so each row can be read against it. Each
 * gap carries the temperature law the paper gives for it (Varshni, or GaP Γ's Bose–Einstein form).
 */
import type { BinaryParams, GapLaw } from './types.js';

/** A gap's temperature law in the paper's units: Varshni α in meV/K and β in K, or the
 * Bose–Einstein form's a in eV and T1 in K (types.ts GapLaw). */
type PaperLaw = readonly ['varshni', number, number] | readonly ['bose-einstein', number, number];
const v = (alpha_meV: number, beta_K: number): PaperLaw => ['varshni', alpha_meV, beta_K];
const be = (a_eV: number, T1_K: number): PaperLaw => ['bose-einstein', a_eV, T1_K];

/** One row in the paper's own units: Å, Å/K, eV, m0, eV, GPa; gap laws as PaperLaw. */
interface PaperRow {
  readonly a_A: number; readonly da_dT_A: number;
  readonly EgG: number; readonly G: PaperLaw;
  readonly EgX: number; readonly X: PaperLaw;
  readonly EgL: number; readonly L: PaperLaw;
  readonly Dso: number; readonly me: number;
  readonly g1: number; readonly g2: number; readonly g3: number;
  readonly Ep: number; readonly F: number; readonly VBO: number;
  readonly ac: number; readonly av: number; readonly b: number;
  readonly C11: number; readonly C12: number;
}

/** Which VMR2001 table each row comes from (the paper gives one table per binary; table numbers
 * are recalled, from memory). */
export const BINARY_SOURCES: Readonly<Record<BinaryName, string>> = {
  GaAs: 'VMR2001 Table I (GaAs), from memory',
  AlAs: 'VMR2001 Table II (AlAs), from memory',
  InAs: 'VMR2001 Table III (InAs), from memory',
  GaP: 'VMR2001 Table IV (GaP), from memory',
  AlP: 'VMR2001 Table V (AlP), from memory',
  InP: 'VMR2001 Table VI (InP), from memory',
  GaSb: 'VMR2001 Table VII (GaSb), from memory',
  AlSb: 'VMR2001 Table VIII (AlSb), from memory',
  InSb: 'VMR2001 Table IX (InSb), from memory',
};

export type BinaryName = 'GaAs' | 'AlAs' | 'InAs' | 'GaP' | 'AlP' | 'InP' | 'GaSb' | 'AlSb' | 'InSb';

// GaP Γ gap: VMR2001 gives 2.886 + 0.1081[1 − coth(164/T)] eV, not a Varshni law (from memory).
// InP X gap: VMR2001 gives the linear law 2.384 − 3.7e-4 T, which is the Varshni form with β = 0.
// InSb X and L gaps: the paper gives no separate temperature law for them; the Γ α, β are used.
const ROWS: Readonly<Record<BinaryName, PaperRow>> = {
  GaAs: {
    a_A: 5.65325, da_dT_A: 3.88e-5,
    EgG: 1.519, G: v(0.5405, 204), EgX: 1.981, X: v(0.460, 204), EgL: 1.815, L: v(0.605, 204),
    Dso: 0.341, me: 0.067, g1: 6.98, g2: 2.06, g3: 2.93, Ep: 28.8, F: -1.94, VBO: -0.80,
    ac: -7.17, av: -1.16, b: -2.0, C11: 1221, C12: 566,
  },
  AlAs: {
    a_A: 5.6611, da_dT_A: 2.90e-5,
    EgG: 3.099, G: v(0.885, 530), EgX: 2.24, X: v(0.70, 530), EgL: 2.46, L: v(0.605, 204),
    Dso: 0.28, me: 0.15, g1: 3.76, g2: 0.82, g3: 1.42, Ep: 21.1, F: -0.48, VBO: -1.33,
    ac: -5.64, av: -2.47, b: -2.3, C11: 1250, C12: 534,
  },
  InAs: {
    a_A: 6.0583, da_dT_A: 2.74e-5,
    EgG: 0.417, G: v(0.276, 93), EgX: 1.433, X: v(0.276, 93), EgL: 1.133, L: v(0.276, 93),
    Dso: 0.39, me: 0.026, g1: 20.0, g2: 8.5, g3: 9.2, Ep: 21.5, F: -2.90, VBO: -0.59,
    ac: -5.08, av: -1.00, b: -1.8, C11: 832.9, C12: 452.6,
  },
  GaP: {
    a_A: 5.4505, da_dT_A: 2.92e-5,
    EgG: 2.886, G: be(0.1081, 164), EgX: 2.35, X: v(0.5771, 372), EgL: 2.72, L: v(0.5771, 372),
    Dso: 0.08, me: 0.13, g1: 4.05, g2: 0.49, g3: 2.93, Ep: 31.4, F: -2.04, VBO: -1.27,
    ac: -8.2, av: -1.7, b: -1.6, C11: 1405, C12: 620.3,
  },
  AlP: {
    a_A: 5.4672, da_dT_A: 2.92e-5,
    EgG: 3.63, G: v(0.5771, 372), EgX: 2.52, X: v(0.318, 588), EgL: 3.57, L: v(0.318, 588),
    Dso: 0.07, me: 0.22, g1: 3.35, g2: 0.71, g3: 1.23, Ep: 17.7, F: -0.65, VBO: -1.74,
    ac: -5.7, av: -3.0, b: -1.5, C11: 1330, C12: 630,
  },
  InP: {
    a_A: 5.8697, da_dT_A: 2.79e-5,
    EgG: 1.4236, G: v(0.363, 162), EgX: 2.384, X: v(0.37, 0), EgL: 2.014, L: v(0.363, 162),
    Dso: 0.108, me: 0.0795, g1: 5.08, g2: 1.60, g3: 2.10, Ep: 20.7, F: -1.31, VBO: -0.94,
    ac: -6.0, av: -0.6, b: -2.0, C11: 1011, C12: 561,
  },
  GaSb: {
    a_A: 6.0959, da_dT_A: 4.72e-5,
    EgG: 0.812, G: v(0.417, 140), EgX: 1.141, X: v(0.475, 94), EgL: 0.875, L: v(0.597, 140),
    Dso: 0.76, me: 0.039, g1: 13.4, g2: 4.7, g3: 6.0, Ep: 27.0, F: -1.63, VBO: -0.03,
    ac: -7.5, av: -0.8, b: -2.0, C11: 884.2, C12: 402.6,
  },
  AlSb: {
    a_A: 6.1355, da_dT_A: 2.60e-5,
    EgG: 2.386, G: v(0.42, 140), EgX: 1.696, X: v(0.39, 140), EgL: 2.329, L: v(0.58, 140),
    Dso: 0.676, me: 0.14, g1: 5.18, g2: 1.19, g3: 1.97, Ep: 18.7, F: -0.56, VBO: -0.41,
    ac: -4.5, av: -1.4, b: -1.35, C11: 876.9, C12: 434.1,
  },
  InSb: {
    a_A: 6.4794, da_dT_A: 3.48e-5,
    EgG: 0.235, G: v(0.32, 170), EgX: 0.63, X: v(0.32, 170), EgL: 0.93, L: v(0.32, 170),
    Dso: 0.81, me: 0.0135, g1: 34.8, g2: 15.5, g3: 16.5, Ep: 23.3, F: -0.23, VBO: 0,
    ac: -6.94, av: -0.36, b: -2.0, C11: 684.7, C12: 373.5,
  },
};

const law = ([kind, p, q]: PaperLaw): GapLaw => Object.freeze(kind === 'varshni'
  ? { kind, alpha_eV_per_K: p * 1e-3, beta_K: q }
  : { kind, a_eV: p, T1_K: q });

const fromRow = (name: BinaryName, r: PaperRow): BinaryParams => Object.freeze({
  name,
  a_nm: r.a_A / 10, da_dT_nm_per_K: r.da_dT_A / 10,
  EgG0: r.EgG, EgX0: r.EgX, EgL0: r.EgL,
  lawG: law(r.G), lawX: law(r.X), lawL: law(r.L),
  Dso: r.Dso, me: r.me,
  gamma1: r.g1, gamma2: r.g2, gamma3: r.g3,
  Ep: r.Ep, F: r.F, VBO: r.VBO,
  ac: r.ac, av: r.av, b: r.b, C11: r.C11, C12: r.C12,
});

/** The VMR2001 binaries at 0 K (lattice constant at 300 K), keyed by formula ("GaAs"); nm, eV,
 * m0, GPa, with each gap's temperature law. Example: BINARIES.GaAs.EgG0 = 1.519 eV. */
export const BINARIES: Readonly<Record<BinaryName, BinaryParams>> = Object.freeze(
  Object.fromEntries((Object.keys(ROWS) as BinaryName[]).map((n) => [n, fromRow(n, ROWS[n])])) as Record<BinaryName, BinaryParams>,
);

/** The binary formed by one group-III and one group-V element, or undefined when not tabulated. */
export const binaryOf = (III: string, V: string): BinaryParams | undefined =>
  (BINARIES as Readonly<Record<string, BinaryParams>>)[III + V];
