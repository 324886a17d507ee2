/**
 * Strain of a whole stack: the zero-stress balance of strain-compensated layers and the
 * critical thickness of runs of strained layers taken together.
 *
 * Zero-stress condition (N. J. Ekins-Daukes, K. Kawaguchi, J. Zhang, Cryst. Growth Des. 2, 287
 * (2002), from memory; their two-layer form generalised to n layers): a coherent multilayer of
 * layers i (thickness t_i, relaxed lattice a_i, A_i = C11 + C12 − 2 C12²/C11) exerts no net
 * in-plane stress on its substrate when its in-plane lattice constant is
 *   a0 = Σ t_i A_i / a_i ÷ Σ t_i A_i / a_i²,
 * the minimum over a of the elastic energy Σ t_i A_i (a − a_i)²/a_i² per unit area (biaxial
 * strain, zero stress along [001]). For two layers this is their a0 = (t1 A1 a1 a2² + t2 A2 a2 a1²)
 * / (t1 A1 a2² + t2 A2 a1²), and balance on a substrate a_s (a0 = a_s) is
 *   t1 A1 ε1 a2 + t2 A2 ε2 a1 = 0,  ε_i = (a_s − a_i)/a_i,
 * which gives the thickness of a compensating layer (balancingThickness).
 *
 * Critical thickness of a multilayer (our rule, stated): every contiguous run of layers that
 * starts and ends at a strained layer is treated as one layer of its zero-stress lattice constant
 * a0, i.e. of mismatch f = (a0 − a_s)/a_s, with thickness-weighted elastic constants, and its total
 * thickness is compared with the Matthews–Blakeslee critical thickness of that mismatch
 * (materials/strain.ts). This is the equivalent-single-layer treatment of strained multilayers
 * (J. W. Matthews and A. E. Blakeslee, J. Cryst. Growth 32, 265 (1976), and the stack critical
 * thickness of Ekins-Daukes et al. 2002; both from memory). A single strained layer is a run of
 * one, so the layer-by-layer check is included; unstrained spacers inside a run dilute its mismatch
 * and add to its thickness, as the equivalent layer has them. A balanced run (a0 = a_s) has no
 * critical thickness, an unbalanced one fails once it is thick enough however thin each layer is.
 */
import { criticalThickness } from './strain.js';

/** One layer as the strain checks read it: thickness (nm), relaxed lattice (nm), elastic constants (GPa). */
export interface StrainLayer {
  readonly thickness_nm: number;
  readonly a_nm: number;
  readonly C11: number;
  readonly C12: number;
}

/** Below this |mismatch| a layer counts as lattice-matched (as materials/resolve.ts). */
const MATCHED = 1e-6;

/** A = C11 + C12 − 2 C12²/C11 (GPa): the biaxial stiffness that weights each layer's strain. */
export const biaxialStiffness = (C11: number, C12: number): number => C11 + C12 - (2 * C12 * C12) / C11;

/** Whether a layer takes part in the balance: a finite lattice and stiffness (a custom material without a lattice does not). */
const counts = (l: StrainLayer): boolean => Number.isFinite(l.a_nm) && Number.isFinite(biaxialStiffness(l.C11, l.C12)) && l.thickness_nm > 0;

/**
 * In-plane lattice constant (nm) at which the layers exert no net stress: a0 = Σ t A/a ÷ Σ t A/a²
 * (Ekins-Daukes et al. 2002, see the file comment). NaN when no layer counts.
 * Example: equal thicknesses of GaAs and an equally stiff layer 1 % larger → a0 ≈ midway.
 */
export function zeroStressLattice(layers: readonly StrainLayer[]): number {
  let num = 0;
  let den = 0;
  for (const l of layers) {
    if (!counts(l)) continue;
    const w = (l.thickness_nm * biaxialStiffness(l.C11, l.C12)) / l.a_nm;
    num += w;
    den += w / l.a_nm;
  }
  return den > 0 ? num / den : NaN;
}

/**
 * Net strain of a multilayer on a substrate of lattice a_s (nm): (a_s − a0)/a0, the in-plane
 * strain of one layer of the zero-stress lattice a0. Zero when the layers balance; negative when
 * compression dominates. Equals Σ t A ε/a ÷ Σ t A/a with ε = (a_s − a)/a (the stress-weighted mean).
 */
export function netStrain(layers: readonly StrainLayer[], aSubstrate_nm: number): number {
  const a0 = zeroStressLattice(layers);
  return Number.isFinite(a0) ? (aSubstrate_nm - a0) / a0 : 0;
}

/**
 * Thickness (nm) of a layer `b` that balances a layer `a` of thickness tA on a substrate a_s:
 * t_b = −t_a A_a ε_a a_b / (A_b ε_b a_a) (Ekins-Daukes et al. 2002). Negative when both strains have
 * the same sign (no balance is possible), Infinity when b is lattice-matched.
 */
export function balancingThickness(a: Omit<StrainLayer, 'thickness_nm'>, tA_nm: number, b: Omit<StrainLayer, 'thickness_nm'>, aSubstrate_nm: number): number {
  const eA = (aSubstrate_nm - a.a_nm) / a.a_nm;
  const eB = (aSubstrate_nm - b.a_nm) / b.a_nm;
  return (-tA_nm * biaxialStiffness(a.C11, a.C12) * eA * b.a_nm) / (biaxialStiffness(b.C11, b.C12) * eB * a.a_nm);
}

/** The worst run of the multilayer critical-thickness check. */
export interface StrainRun {
  /** Indices of its first and last layer (inclusive). */
  readonly first: number;
  readonly last: number;
  readonly thickness_nm: number;
  /** Mismatch (a0 − a_s)/a_s of its zero-stress lattice. */
  readonly mismatch: number;
  /** Matthews–Blakeslee critical thickness of that mismatch (nm); Infinity when balanced. */
  readonly criticalThickness_nm: number;
  /** thickness / critical thickness: above 1 the run relaxes. */
  readonly ratio: number;
}

/**
 * The run of consecutive layers, starting and ending at a strained layer, with the largest
 * thickness / critical-thickness ratio (see the file comment); null when no layer is strained.
 * Ties go to the earlier, then shorter, run. O(k²) runs for k strained layers, by prefix sums.
 */
export function worstStrainRun(layers: readonly StrainLayer[], aSubstrate_nm: number): StrainRun | null {
  const pre = { w: [0], w2: [0], t: [0], c11: [0], c12: [0] };
  for (const l of layers) {
    const ok = counts(l);
    const w = ok ? (l.thickness_nm * biaxialStiffness(l.C11, l.C12)) / l.a_nm : 0;
    pre.w.push(pre.w.at(-1)! + w);
    pre.w2.push(pre.w2.at(-1)! + (ok ? w / l.a_nm : 0));
    pre.t.push(pre.t.at(-1)! + l.thickness_nm);
    pre.c11.push(pre.c11.at(-1)! + (ok ? l.thickness_nm * l.C11 : 0));
    pre.c12.push(pre.c12.at(-1)! + (ok ? l.thickness_nm * l.C12 : 0));
  }
  const strained = layers.flatMap((l, i) => (counts(l) && Math.abs(l.a_nm - aSubstrate_nm) / aSubstrate_nm > MATCHED ? [i] : []));
  let worst: StrainRun | null = null;
  for (let p = 0; p < strained.length; p++) {
    for (let q = p; q < strained.length; q++) {
      const i = strained[p]!;
      const j = strained[q]! + 1;
      const a0 = (pre.w[j]! - pre.w[i]!) / (pre.w2[j]! - pre.w2[i]!);
      const mismatch = (a0 - aSubstrate_nm) / aSubstrate_nm;
      const t = pre.t[j]! - pre.t[i]!;
      // Thickness-weighted sums of C11 and C12: criticalThickness reads only their ratio (Poisson ν).
      const hc = Math.abs(mismatch) < MATCHED ? Infinity : criticalThickness(a0, mismatch, pre.c11[j]! - pre.c11[i]!, pre.c12[j]! - pre.c12[i]!);
      const ratio = t / hc;
      if (!worst || ratio > worst.ratio) worst = { first: i, last: j - 1, thickness_nm: t, mismatch, criticalThickness_nm: hc, ratio };
    }
  }
  return worst;
}
