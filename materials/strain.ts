/**
 * Pseudomorphic (001) biaxial strain: strain tensor, band-edge shifts and the Matthews–Blakeslee
 * critical thickness.
 */

/** Strain of a layer grown coherently on a (001) substrate. */
export interface BiaxialStrain {
  /** In-plane ε∥ = (a_sub − a)/a; negative is compressive. */
  readonly par: number;
  /** Along [001]: ε⊥ = −2 (C12/C11) ε∥. */
  readonly perp: number;
  /** Trace 2ε∥ + ε⊥ (relative volume change). */
  readonly trace: number;
}

/**
 * Biaxial strain of a layer of relaxed lattice constant a (nm) on a substrate a_sub (nm), with
 * elastic constants C11, C12 (any common unit): ε∥ = (a_sub − a)/a, ε⊥ = −2 (C12/C11) ε∥
 * (zero stress along [001]; common practice, e.g. VMR2001 Sec. II.A.3).
 * Example: In0.2Ga0.8As on GaAs → ε∥ ≈ −0.0141, ε⊥ ≈ +0.0134.
 */
export function biaxialStrain(a_nm: number, aSub_nm: number, C11: number, C12: number): BiaxialStrain {
  const par = (aSub_nm - a_nm) / a_nm;
  const perp = (-2 * C12 / C11) * par;
  return { par, perp, trace: 2 * par + perp };
}

/** Shifts (eV) of the Γ conduction edge and of the heavy- and light-hole valence edges. */
export interface EdgeShifts {
  readonly dEc: number;
  readonly dEhh: number;
  readonly dElh: number;
  /** Shear term Qε = −b (ε∥ − ε⊥) (eV), Chuang's sign: hh shifts by −Qε, lh by about +Qε. */
  readonly Qe: number;
}

/**
 * Light-hole edge shift from the shear term, including its coupling to the split-off band:
 * δE_lh = ½ [Qε − Δ + √(Δ² + 2ΔQε + 9Qε²)], the upper eigenvalue of the k = 0 lh–so block
 * [[Qε, √2 Qε], [√2 Qε, −Δ]] (S. L. Chuang, Physics of Optoelectronic Devices, Wiley, strained
 * band edges; from memory). Tends to the decoupled +Qε for |Qε| ≪ Δ. Qe, Dso in eV; result eV.
 */
export function lightHoleShift(Qe: number, Dso: number): number {
  return 0.5 * (Qe - Dso + Math.sqrt(Dso * Dso + 2 * Dso * Qe + 9 * Qe * Qe));
}

/**
 * Band-edge shifts under biaxial strain, deformation potentials in VMR2001's convention (eV).
 *
 * Hydrostatic: δEc = ac·tr ε; the valence edge moves by −av·tr ε, because VMR2001 gives av with the
 * sign for which the gap deformation potential is ac + av (GaAs: −7.17 − 1.16 = −8.33 eV), i.e.
 * the opposite sign to the av of Chuang's Pε = −av tr ε. Shear (Chuang): Qε = −b (ε∥ − ε⊥),
 * δE_hh = −av·tr ε − Qε, δE_lh = −av·tr ε + lightHoleShift(Qε, Δso).
 * So compression (ε∥ < 0, b < 0) widens the gap and lifts hh above lh; tension does the reverse.
 */
export function edgeShifts(
  p: { readonly ac: number; readonly av: number; readonly b: number; readonly Dso: number },
  s: BiaxialStrain,
): EdgeShifts {
  const hydroV = -p.av * s.trace;
  const Qe = -p.b * (s.par - s.perp);
  return { dEc: p.ac * s.trace, dEhh: hydroV - Qe, dElh: hydroV + lightHoleShift(Qe, p.Dso), Qe };
}

/**
 * Matthews–Blakeslee critical thickness (nm) of a strained layer for 60° misfit dislocations
 * (J. W. Matthews and A. E. Blakeslee, J. Cryst. Growth 27, 118 (1974)):
 *   h_c = b/(4π f) · (1 − ν cos²α)/((1 + ν) cos λ) · (ln(h_c/b) + 1),
 * b = a/√2 (a: relaxed lattice constant of the layer, nm), f = |mismatch|, ν = C12/(C11 + C12),
 * cos α = cos λ = 1/2, solved by fixed-point iteration from above (the map is increasing and
 * concave, so it converges to the larger, physical root).
 *
 * Published forms of this balance differ by a factor of 2 in the prefactor (2π or 4π; single
 * uncapped layer versus a layer capped by unstrained material), and which form belongs to which
 * case is recalled from memory here. We use the 4π form, the smaller critical thickness: a force
 * balance of the misfit-strain force 2G b h ε (1+ν)/(1−ν) cos λ against the dislocation line
 * tension G b² (1 − ν cos²α)/(4π(1−ν)) (ln(h/b) + 1) gives it for the capped well this tool
 * designs, and as a growth constraint it errs on the safe side. For In0.2Ga0.8As on GaAs it gives
 * ≈ 14.3 nm, in the range of the critical widths measured for InGaAs/GaAs wells by T. G. Andersson
 * et al., Appl. Phys. Lett. 51, 752 (1987) (the abstract, seen, says they agree with Matthews–
 * Blakeslee; the measured widths themselves are from memory).
 * Returns Infinity for f = 0, and 0 when no root exceeds one Burgers vector (the layer cannot be
 * grown coherently at any thickness).
 */
export function criticalThickness(a_nm: number, mismatch: number, C11: number, C12: number): number {
  const f = Math.abs(mismatch);
  if (f === 0) return Infinity;
  const b = a_nm / Math.SQRT2;
  const nu = C12 / (C11 + C12);
  const cos = 0.5;
  const A = (b / (4 * Math.PI * f)) * (1 - nu * cos * cos) / ((1 + nu) * cos);
  // u = h/b solves u = k (ln u + 1); only k > 1 has a root above u = 1.
  const kk = A / b;
  if (kk <= 1) return 0;
  let u = Math.max(Math.E, kk * (Math.log(kk) + 1)) * 2;
  for (let i = 0; i < 1_000_000; i++) {
    const next = kk * (Math.log(u) + 1);
    if (Math.abs(next - u) <= 1e-13 * u) return next * b;
    u = next;
  }
  return u * b;
}
