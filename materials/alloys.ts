/**
 * Alloy parameters from the VMR2001 binaries and ternary bowings (I. Vurgaftman, J. R. Meyer,
 * L. R. Ram-Mohan, J. Appl. Phys. 89, 5815 (2001), Sec. IV; table in ternaries.ts), with one
 * quadratic interpolation for ternaries and quaternaries alike (see interpolate).
 *
 * Why not VMR2001's quaternary scheme: its weighted mean of the bounding ternaries (after
 * T. H. Glisson et al., J. Electron. Mater. 7, 1 (1978), both from memory) keeps only a share
 * x(1−x)/[x(1−x) + y(1−y)] of each ternary bowing inside the quaternary. With the VMR2001 bowings
 * it put lattice-matched InGaAsP on InP 37–61 meV above R. E. Nahory et al., Appl. Phys. Lett. 33,
 * 659 (1978) over y = 0.2–0.8, and (AlGa)InAs on InP up to 41 meV above D. Olego et al., Appl.
 * Phys. Lett. 41, 476 (1982). The additive form below, with the same bowings and no fitted
 * parameter, stays within 17 meV of Nahory and 23 meV of Olego (test/materials/published.test.ts).
 */
import { binaryOf } from './binaries.js';
import { formatFormula } from './formula.js';
import { gapsAt, latticeAt } from './temperature.js';
import { FIELDS, findTernary, type Field, type HoleMassBowing, type Ternary, type Values } from './ternaries.js';
import type { Alloy, BinaryParams, LatticeModel } from './types.js';

type View = (b: BinaryParams) => Values;

/**
 * Bowing of 1/m (m0⁻¹) implied by a mass bowing C (m0) between end masses mP (first element) and
 * mQ at fraction u of the first: with m(u) = u mP + (1−u) mQ − u(1−u) C and L′ = u mQ + (1−u) mP,
 * 1/m(u) = u/mP + (1−u)/mQ − u(1−u) [(mP − mQ)² − C L′] / (m(u) mP mQ) (exact algebra; no 0/0
 * at the ends).
 */
function inverseMassBowing(mP: number, mQ: number, C: number, u: number): number {
  const m = u * mP + (1 - u) * mQ - u * (1 - u) * C;
  return ((mP - mQ) ** 2 - C * (u * mQ + (1 - u) * mP)) / (m * mP * mQ);
}

/** A ternary's bowings prepared once: each bowed field's (c0, c1), and for a hole-mass bowing the
 * end binaries' [001] masses (m0) it needs. */
interface Prepared {
  readonly fields: readonly (readonly [Field, number, number])[];
  readonly masses: { readonly hhP: number; readonly hhQ: number; readonly lhP: number; readonly lhQ: number; readonly bow: HoleMassBowing } | null;
}
const prepared = new Map<Ternary, Prepared>();
function prepare(t: Ternary): Prepared {
  let p = prepared.get(t);
  if (p) return p;
  const end = (el: string): BinaryParams => (t.side === 'III' ? binaryOf(el, t.common) : binaryOf(t.common, el))!;
  const P = end(t.first);
  const Q = end(t.second);
  p = {
    fields: (Object.keys(t.bow) as Field[]).map((f): readonly [Field, number, number] => [f, t.bow[f]!.c0, t.bow[f]!.c1]),
    masses: t.holeMasses ? {
      hhP: 1 / (P.gamma1 - 2 * P.gamma2), hhQ: 1 / (Q.gamma1 - 2 * Q.gamma2),
      lhP: 1 / (P.gamma1 + 2 * P.gamma2), lhQ: 1 / (Q.gamma1 + 2 * Q.gamma2), bow: t.holeMasses,
    } : null,
  };
  prepared.set(t, p);
  return p;
}

/**
 * Subtracts w × every bowing of ternary t at fraction u of its first element from out. A hole-mass
 * bowing enters as the Luttinger-parameter bowings that make the [001] masses m_hh = 1/(γ1 − 2γ2),
 * m_lh = 1/(γ1 + 2γ2) follow VMR2001's bowed-mass form: γ1 = (1/m_hh + 1/m_lh)/2,
 * γ2 = (1/m_lh − 1/m_hh)/4; γ3 keeps γ3 − γ2 (the valence-band warping) linear, so it bows as γ2.
 */
function subtractBowings(out: Record<Field, number>, t: Ternary, u: number, w: number): void {
  const p = prepare(t);
  for (const [f, c0, c1] of p.fields) out[f] -= w * (c0 + c1 * u);
  if (p.masses) {
    const m = p.masses;
    const hh = inverseMassBowing(m.hhP, m.hhQ, m.bow.mhh, u);
    const lh = inverseMassBowing(m.lhP, m.lhQ, m.bow.mlh, u);
    const g2 = (lh - hh) / 4;
    out.gamma1 -= (w * (hh + lh)) / 2;
    out.gamma2 -= w * g2;
    out.gamma3 -= w * g2;
  }
}

/**
 * Interpolated values of any supported alloy under a view of its binaries, by the quadratic form
 * P = Σ_ij x_i y_j P_ij − Σ_{i<i′} Σ_j x_i x_i′ y_j C_ii′j(u) − Σ_{j<j′} Σ_i y_j y_j′ x_i C_ijj′(u),
 * x the group-III and y the group-V fractions, P_ij the binaries, C the ternary bowings. For a
 * ternary it is VMR2001's x P_A + (1−x) P_B − x(1−x) C; for A_x B_(1−x) C_y D_(1−y) the form of
 * R. L. Moon, G. A. Antypas, L. W. James, J. Electron. Mater. 3, 635 (1974) (from memory; the
 * interpolation form is what Adachi's InGaAsP relation, S. Adachi, J. Appl. Phys. 53, 8775 (1982),
 * expands to); for A_x B_y C_z D the sum of the three pair bowings. A bowing that depends on
 * composition, C(u) = c0 + c1·u, is taken at u = (1 + x_i − x_i′)/2 of the pair's first element:
 * the pair's own fraction on its edge, the projection of the composition onto the edge inside
 * (the Redlich–Kister extension of a two-term bowing, common practice). Fractions with zero
 * weight are skipped, so a zero-fraction end is exactly its binary or ternary.
 * The alloy must have passed supportIssue (validateAlloy / parseFormula guarantee it).
 */
function interpolate(alloy: Alloy, view: View): Values {
  const III = Object.entries(alloy.III);
  const V = Object.entries(alloy.V);
  const out = Object.fromEntries(FIELDS.map((f) => [f, 0])) as Record<Field, number>;
  for (const [c3, x] of III) for (const [c5, y] of V) {
    const w = x * y;
    if (w === 0) continue;
    const b = view(binaryOf(c3, c5)!);
    for (const f of FIELDS) out[f] += w * b[f];
  }
  const bow = (mixed: readonly [string, number][], others: readonly [string, number][]): void => {
    for (let i = 0; i < mixed.length; i++) for (let k = i + 1; k < mixed.length; k++) {
      const [p, xp] = mixed[i]!;
      const [q, xq] = mixed[k]!;
      for (const [c, z] of others) {
        const w = xp * xq * z;
        if (w === 0) continue;
        const t = findTernary(p, q, c)!;
        subtractBowings(out, t, t.first === p ? (1 + xp - xq) / 2 : (1 + xq - xp) / 2, w);
      }
    }
  };
  bow(III, V);
  bow(V, III);
  return out;
}

/** Interpolated parameters of an alloy at 0 K (lattice constant at 300 K); nm, eV, m0, GPa. */
export type AlloyParams = Values & { readonly name: string };

/**
 * Interpolated parameter set of an alloy at 0 K (lattice constant at 300 K), by interpolate:
 * bowed Γ/X/L gaps, Δso, electron mass, Ep, F, VBO and ac where VMR2001 gives bowing; GaInAs
 * [001] hole masses bowed, with γ1, γ2, γ3 following from them; Vegard (linear) lattice constant;
 * the remaining Luttinger parameters, deformation potentials and elastic constants linear.
 * Gaps at a temperature come from alloyAt, which bows the binaries' gaps at that temperature.
 * Example: Al0.3Ga0.7As → EgG0 = 0.3·3.099 + 0.7·1.519 − 0.21·(−0.127 + 1.310·0.3) ≈ 1.937 eV.
 */
export function alloyParams(alloy: Alloy): AlloyParams {
  return Object.freeze({ name: formatFormula(alloy), ...interpolate(alloy, (b) => b) });
}

/**
 * The view of the binaries at T: gaps by each binary's tabulated law, lattice constant at T under
 * the lattice model, the rest as tabulated. Memoised per (T, model), since a search resolves the
 * same few binaries at one T thousands of times; the table holds a handful of temperatures (a
 * tolerance run adds ±ΔT) and is cleared past 64.
 */
const views = new Map<string, View>();
function viewAt(T: number, lattice: LatticeModel): View {
  const key = `${T}|${lattice}`;
  let view = views.get(key);
  if (view) return view;
  const seen = new Map<BinaryParams, Values>();
  view = (p) => {
    let v = seen.get(p);
    if (!v) {
      const g = gapsAt(p, T);
      v = Object.freeze({ ...p, a_nm: latticeAt(p, T, lattice), EgG0: g.EgG, EgX0: g.EgX, EgL0: g.EgL });
      seen.set(p, v);
    }
    return v;
  };
  if (views.size >= 64) views.clear();
  views.set(key, view);
  return view;
}

/** Alloy parameters at a temperature: gaps (eV) and relaxed lattice constant (nm) at T. */
export interface AlloyAtT {
  readonly temperature_K: number;
  readonly a_nm: number;
  readonly EgG: number; readonly EgX: number; readonly EgL: number;
  readonly Dso: number; readonly me: number;
  readonly gamma1: number; readonly gamma2: number; readonly gamma3: number;
  readonly Ep: number; readonly F: number; readonly VBO: number;
  readonly ac: number; readonly av: number; readonly b: number;
  readonly C11: number; readonly C12: number;
}

/**
 * Alloy parameters at temperature T (K): each binary's Γ/X/L gap is taken at T by its tabulated
 * law (temperature.ts) and its lattice constant by the lattice model (default 'linear',
 * a(300 K) + da/dT (T − 300)), then interpolated with the same (temperature-independent) bowing
 * as at 0 K. me is the low-temperature mass (resolve.ts applies the electron-mass model).
 * Example: In0.53Ga0.47As at 300 K → EgG ≈ 0.737 eV.
 */
export function alloyAt(alloy: Alloy, T: number, lattice: LatticeModel = 'linear'): AlloyAtT {
  const v = interpolate(alloy, viewAt(T, lattice));
  return Object.freeze({
    temperature_K: T, a_nm: v.a_nm, EgG: v.EgG0, EgX: v.EgX0, EgL: v.EgL0,
    Dso: v.Dso, me: v.me, gamma1: v.gamma1, gamma2: v.gamma2, gamma3: v.gamma3,
    Ep: v.Ep, F: v.F, VBO: v.VBO, ac: v.ac, av: v.av, b: v.b, C11: v.C11, C12: v.C12,
  });
}
