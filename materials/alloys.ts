/**
 * Alloy parameters by the interpolation scheme of VMR2001 (I. Vurgaftman, J. R. Meyer,
 * L. R. Ram-Mohan, J. Appl. Phys. 89, 5815 (2001), Sec. IV–V): ternaries with bowing, quaternaries
 * from their bounding ternaries (bowing table in ternaries.ts).
 */
import { binaryOf } from './binaries.js';
import { formatFormula, type Alloy } from './formula.js';
import { latticeAt, varshni } from './temperature.js';
import { FIELDS, findTernary, type Field, type Ternary, type Values } from './ternaries.js';
import type { BinaryParams } from './types.js';

type View = (b: BinaryParams) => Values;

/** Ternary value: x P_first + (1 − x) P_second − x(1 − x) C(x) (VMR2001 eq. for ternaries),
 * with fractions given for both mixed elements so that zero-fraction ends are exact. */
function ternaryValues(t: Ternary, fractions: Readonly<Record<string, number>>, view: View): Values {
  const x = fractions[t.first]!;
  const y = fractions[t.second]!;
  const bin = (el: string): Values => view((t.side === 'III' ? binaryOf(el, t.common) : binaryOf(t.common, el))!);
  const P = bin(t.first);
  const Q = bin(t.second);
  const out = {} as Record<Field, number>;
  for (const f of FIELDS) {
    const c = t.bow[f];
    out[f] = x * P[f] + y * Q[f] - (c ? x * y * (c.c0 + c.c1 * x) : 0);
  }
  return out;
}

const combine = (terms: readonly (readonly [number, Values])[], denominator: number): Values => {
  const out = {} as Record<Field, number>;
  for (const f of FIELDS) out[f] = terms.reduce((acc, [w, v]) => acc + w * v[f], 0) / denominator;
  return out;
};

// Below this weight sum a quaternary sits on a corner; its bowed form is 0/0 there and its value
// is the binary, which the bilinear or linear mix gives exactly.
const CORNER = 1e-12;

/**
 * A_x B_(1−x) C_y D_(1−y) (two on each side), VMR2001's quaternary interpolation (after
 * Glisson et al.): Q = [x(1−x){y T_ABC(x) + (1−y) T_ABD(x)} + y(1−y){x T_ACD(y) + (1−x) T_BCD(y)}]
 * / [x(1−x) + y(1−y)], with T the bowed ternaries.
 */
function twoByTwo(alloy: Alloy, view: View): Values {
  const [A, B] = Object.keys(alloy.III) as [string, string];
  const [C, D] = Object.keys(alloy.V) as [string, string];
  const x = alloy.III[A]!; const x1 = alloy.III[B]!;
  const y = alloy.V[C]!; const y1 = alloy.V[D]!;
  const den = x * x1 + y * y1;
  if (den < CORNER) {
    const b = (p: string, q: string): Values => view(binaryOf(p, q)!);
    return combine([[x * y, b(A, C)], [x * y1, b(A, D)], [x1 * y, b(B, C)], [x1 * y1, b(B, D)]], x * y + x * y1 + x1 * y + x1 * y1);
  }
  const T = (p: string, q: string, common: string, fr: Readonly<Record<string, number>>): Values =>
    ternaryValues(findTernary(p, q, common)!, fr, view);
  return combine([
    [x * x1 * y, T(A, B, C, alloy.III)],
    [x * x1 * y1, T(A, B, D, alloy.III)],
    [y * y1 * x, T(C, D, A, alloy.V)],
    [y * y1 * x1, T(C, D, B, alloy.V)],
  ], den);
}

/**
 * A_x B_y C_(1−x−y) D (three on one side), VMR2001's weighted-ternary scheme:
 * Q = [xy T_AB(u) + yz T_BC(v) + xz T_AC(w)] / (xy + yz + xz), z = 1 − x − y, where each ternary
 * is taken at the projection of the composition onto its edge: u = (1 + x − y)/2 of A in AB,
 * v = (1 + y − z)/2 of B in BC, w = (1 + x − z)/2 of A in AC.
 */
function threeOnOne(mixed: Readonly<Record<string, number>>, common: string, side: 'III' | 'V', view: View): Values {
  const [A, B, C] = Object.keys(mixed) as [string, string, string];
  const x = mixed[A]!; const y = mixed[B]!; const z = mixed[C]!;
  const den = x * y + y * z + x * z;
  const bin = (el: string): Values => view((side === 'III' ? binaryOf(el, common) : binaryOf(common, el))!);
  if (den < CORNER) return combine([[x, bin(A)], [y, bin(B)], [z, bin(C)]], x + y + z);
  const edge = (p: string, q: string, fp: number): Values =>
    ternaryValues(findTernary(p, q, common)!, { [p]: fp, [q]: 1 - fp }, view);
  return combine([
    [x * y, edge(A, B, (1 + x - y) / 2)],
    [y * z, edge(B, C, (1 + y - z) / 2)],
    [x * z, edge(A, C, (1 + x - z) / 2)],
  ], den);
}

/** Interpolated values of any supported alloy under a view of its binaries. The alloy must have
 * passed supportIssue (validateAlloy / parseFormula guarantee it). */
function interpolate(alloy: Alloy, view: View): Values {
  const III = Object.keys(alloy.III);
  const V = Object.keys(alloy.V);
  if (III.length === 1 && V.length === 1) return view(binaryOf(III[0]!, V[0]!)!);
  if (V.length === 1 && III.length === 2) return ternaryValues(findTernary(III[0]!, III[1]!, V[0]!)!, alloy.III, view);
  if (III.length === 1 && V.length === 2) return ternaryValues(findTernary(V[0]!, V[1]!, III[0]!)!, alloy.V, view);
  if (III.length === 2 && V.length === 2) return twoByTwo(alloy, view);
  if (V.length === 1) return threeOnOne(alloy.III, V[0]!, 'III', view);
  return threeOnOne(alloy.V, III[0]!, 'V', view);
}

const identity: View = (b) => b;

/**
 * Interpolated parameter set of an alloy at 0 K (lattice constant at 300 K), by VMR2001's scheme:
 * bowed Γ/X/L gaps, Δso, electron mass, Ep, F, VBO and ac where the paper gives bowing; Vegard
 * (linear) lattice constant; Luttinger parameters, deformation potentials and elastic constants
 * linear. Varshni α, β here are linear mixes given for reference only: gaps at a temperature come
 * from alloyAt, which bows the binaries' gaps at that temperature.
 * Example: Al0.3Ga0.7As → EgG0 = 0.3·3.099 + 0.7·1.519 − 0.21·(−0.127 + 1.310·0.3) ≈ 1.937 eV.
 */
export function alloyParams(alloy: Alloy): BinaryParams {
  return Object.freeze({ name: formatFormula(alloy), ...interpolate(alloy, identity) });
}

/**
 * The view of the binaries at T: gaps by Varshni, lattice constant at T, the rest as tabulated.
 * Memoised per temperature, since a search resolves the same few binaries at one T thousands of
 * times; the table holds a handful of temperatures (a tolerance run adds ±ΔT) and is cleared past 64.
 */
const views = new Map<number, View>();
function viewAt(T: number): View {
  let view = views.get(T);
  if (view) return view;
  const seen = new Map<BinaryParams, Values>();
  view = (p) => {
    let v = seen.get(p);
    if (!v) {
      v = Object.freeze({
        ...p,
        a_nm: latticeAt(p, T),
        EgG0: varshni(p.EgG0, p.alphaG, p.betaG, T),
        EgX0: varshni(p.EgX0, p.alphaX, p.betaX, T),
        EgL0: varshni(p.EgL0, p.alphaL, p.betaL, T),
      });
      seen.set(p, v);
    }
    return v;
  };
  if (views.size >= 64) views.clear();
  views.set(T, view);
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
 * Alloy parameters at temperature T (K): each binary's Γ/X/L gap is taken at T by Varshni and its
 * lattice constant by a(T) = a(300 K) + da/dT (T − 300), then interpolated with the same
 * (temperature-independent) bowing as at 0 K. Example: In0.53Ga0.47As at 300 K → EgG ≈ 0.737 eV.
 */
export function alloyAt(alloy: Alloy, T: number): AlloyAtT {
  const v = interpolate(alloy, viewAt(T));
  return Object.freeze({
    temperature_K: T, a_nm: v.a_nm, EgG: v.EgG0, EgX: v.EgX0, EgL: v.EgL0,
    Dso: v.Dso, me: v.me, gamma1: v.gamma1, gamma2: v.gamma2, gamma3: v.gamma3,
    Ep: v.Ep, F: v.F, VBO: v.VBO, ac: v.ac, av: v.av, b: v.b, C11: v.C11, C12: v.C12,
  });
}
