/**
 * Background refractive index of a well layer near its gap, for the gain prefactor 1/n_r: the model
 * of S. Adachi, J. Appl. Phys. 53, 5863 (1982) (from memory),
 *   n² = A [f(χ) + ½ (E0/(E0 + Δ0))^{3/2} f(χ_so)] + B,   f(χ) = χ⁻² [2 − √(1 + χ) − √(1 − χ)],
 * χ = ħω/E0, χ_so = ħω/(E0 + Δ0), with √(1 − χ) → 0 above the gap (the real part), E0 and Δ0 the
 * layer's unstrained Γ gap and spin–orbit splitting at T, A and B per binary from that paper
 * (from memory): GaAs 6.30, 9.40; AlAs 25.30, −0.80; InP 8.40, 6.60 — linear in the binary
 * fractions (Adachi's own AlGaAs interpolation). A binary outside this table takes GaAs's A and B,
 * an approximation the source string records; a custom material, or a spec that gives
 * optics.refractive_index, uses the given number.
 */
import type { ResolvedLayer } from '../structure.js';
import { mixAlloys } from '../structure.js';

/** Adachi's A and B (dimensionless) of the binaries this module knows. */
export const ADACHI_AB: Readonly<Record<string, { readonly A: number; readonly B: number }>> = {
  GaAs: { A: 6.3, B: 9.4 },
  AlAs: { A: 25.3, B: -0.8 },
  InP: { A: 8.4, B: 6.6 },
};

const f = (chi: number): number => (2 - Math.sqrt(1 + chi) - (chi < 1 ? Math.sqrt(1 - chi) : 0)) / (chi * chi);

/**
 * n from Adachi's model (module comment) for given A, B, E0, Δ0 (eV) at photon energy ħω (eV).
 * Example: GaAs at 300 K (E0 1.424, Δ0 0.341) and ħω = 1.40 eV → 3.63.
 */
export function adachiIndex(p: { readonly A: number; readonly B: number; readonly E0: number; readonly Dso: number; readonly photon_eV: number }): number {
  const so = Number.isFinite(p.Dso) ? 0.5 * (p.E0 / (p.E0 + p.Dso)) ** 1.5 * f(p.photon_eV / (p.E0 + p.Dso)) : 0;
  return Math.sqrt(p.A * (f(p.photon_eV / p.E0) + so) + p.B);
}

/** A refractive index and where it comes from, as recorded in every optical result. */
export interface RefractiveIndex {
  readonly value: number;
  readonly source: string;
}

/**
 * The index of a well layer at photon energy ħω (eV), or the given value. Graded layers use their
 * mid composition; custom materials need the given value (else NaN, which callers report).
 */
export function wellIndex(layer: ResolvedLayer, photon_eV: number, given?: number): RefractiveIndex {
  if (given !== undefined) return { value: given, source: 'optics.refractive_index (given)' };
  const c = layer.composition;
  if (c.kind === 'custom') return { value: NaN, source: `custom material ${layer.formula}: give optics.refractive_index` };
  const alloy = c.kind === 'alloy' ? c.alloy : mixAlloys(c.from, c.to, 0.5);
  let A = 0;
  let B = 0;
  const missing: string[] = [];
  for (const [iii, x] of Object.entries(alloy.III)) {
    for (const [v, y] of Object.entries(alloy.V)) {
      const name = `${iii}${v}`;
      const ab = ADACHI_AB[name] ?? ADACHI_AB.GaAs!;
      if (!ADACHI_AB[name] && x * y > 0) missing.push(name);
      A += x * y * ab.A;
      B += x * y * ab.B;
    }
  }
  const value = adachiIndex({ A, B, E0: layer.material.EgG, Dso: layer.material.Dso, photon_eV });
  const note = missing.length > 0 ? `; ${missing.join(', ')} taken with GaAs's A and B (not tabulated)` : '';
  return { value, source: `Adachi 1982 model at ${photon_eV.toFixed(4)} eV for ${layer.formula}${note}` };
}
