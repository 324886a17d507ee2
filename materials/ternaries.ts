/**
 * The VMR2001 ternary bowing table (I. Vurgaftman, J. R. Meyer, L. R. Ram-Mohan, J. Appl. Phys. 89,
 * 5815 (2001), Sec. IV), and which alloys it can describe. Values are from memory of the paper
 * (materials/SOURCES.md).
 */
import { binaryOf } from './binaries.js';
import type { Alloy, BinaryParams } from './types.js';

/** The numeric parameters an alloy interpolates (everything but the name and the gap laws). */
export type Field = Exclude<keyof BinaryParams, 'name' | 'lawG' | 'lawX' | 'lawL'>;
export type Values = Readonly<Record<Field, number>>;

/** Bowing C(x) = c0 + c1·x, x the fraction of the ternary's first element (inside a quaternary, the
 * projection of its composition onto the ternary's edge, alloys.ts). */
export interface Bowing { readonly c0: number; readonly c1: number }
const k = (c0: number, c1 = 0): Bowing => ({ c0, c1 });

/** Bowing of the [001] heavy- and light-hole masses (m0), m = x m_A + (1 − x) m_B − x(1 − x) C. */
export interface HoleMassBowing { readonly mhh: number; readonly mlh: number }

/** One ternary A_x B_(1−x) D (or D A_x B_(1−x)) with the parameters VMR2001 bows. */
export interface Ternary {
  readonly first: string;
  readonly second: string;
  readonly common: string;
  readonly side: 'III' | 'V';
  readonly source: string;
  readonly bow: Readonly<Partial<Record<Field, Bowing>>>;
  /** When given, the hole masses bow (and γ1, γ2, γ3 follow from them, alloys.ts) instead of the
   * Luttinger parameters mixing linearly. */
  readonly holeMasses?: HoleMassBowing;
}

const S = 'VMR2001 Sec. IV, from memory';

/** Ternaries with VMR2001 bowing parameters (eV, or m0 for masses). Parameters not listed are
 * linear; GaInAs bows its [001] hole masses (holeMasses). */
export const TERNARIES: readonly Ternary[] = [
  { first: 'Al', second: 'Ga', common: 'As', side: 'III', source: S, bow: { EgG0: k(-0.127, 1.310), EgX0: k(0.055), EgL0: k(0) } },
  { first: 'Ga', second: 'In', common: 'As', side: 'III', source: S,
    bow: { EgG0: k(0.477), EgX0: k(1.4), EgL0: k(0.33), Dso: k(0.15), me: k(0.0091), Ep: k(-1.48), F: k(1.77), VBO: k(-0.38), ac: k(2.61) },
    holeMasses: { mhh: -0.145, mlh: 0.0202 } },
  { first: 'Al', second: 'In', common: 'As', side: 'III', source: S,
    bow: { EgG0: k(0.70), EgX0: k(0), EgL0: k(0), Dso: k(0.15), me: k(0.049), Ep: k(-4.81), F: k(-4.44), VBO: k(-0.64), ac: k(-1.4) } },
  { first: 'Ga', second: 'In', common: 'P', side: 'III', source: S,
    bow: { EgG0: k(0.65), EgX0: k(0.20), EgL0: k(1.03), me: k(0.01051), F: k(0.78) } },
  { first: 'Al', second: 'In', common: 'P', side: 'III', source: S, bow: { EgG0: k(-0.48), EgX0: k(0.38), VBO: k(-0.19) } },
  { first: 'Al', second: 'Ga', common: 'P', side: 'III', source: S, bow: { EgX0: k(0.13) } },
  { first: 'Al', second: 'Ga', common: 'Sb', side: 'III', source: S, bow: { EgG0: k(-0.044, 1.22), EgX0: k(0), EgL0: k(0), Dso: k(0.3) } },
  { first: 'Ga', second: 'In', common: 'Sb', side: 'III', source: S,
    bow: { EgG0: k(0.415), EgX0: k(0.33), EgL0: k(0.4), Dso: k(0.1), me: k(0.0092) } },
  { first: 'Al', second: 'In', common: 'Sb', side: 'III', source: S, bow: { EgG0: k(0.43), Dso: k(0.25) } },
  { first: 'As', second: 'P', common: 'Ga', side: 'V', source: S, bow: { EgG0: k(0.19), EgX0: k(0.24), EgL0: k(0.16) } },
  { first: 'As', second: 'P', common: 'In', side: 'V', source: S, bow: { EgG0: k(0.10), EgX0: k(0.27), EgL0: k(0.27), Dso: k(0.16) } },
  { first: 'As', second: 'P', common: 'Al', side: 'V', source: S, bow: { EgG0: k(0.22), EgX0: k(0.22), EgL0: k(0.22) } },
  { first: 'As', second: 'Sb', common: 'Ga', side: 'V', source: S,
    bow: { EgG0: k(1.43), EgX0: k(1.2), EgL0: k(1.2), Dso: k(0.6), VBO: k(-1.06) } },
  { first: 'As', second: 'Sb', common: 'In', side: 'V', source: S,
    bow: { EgG0: k(0.67), EgX0: k(0.6), EgL0: k(0.6), Dso: k(1.2), me: k(0.035) } },
  { first: 'As', second: 'Sb', common: 'Al', side: 'V', source: S,
    bow: { EgG0: k(0.8), EgX0: k(0.28), EgL0: k(0.28), Dso: k(0.15), VBO: k(-1.71) } },
];

export const findTernary = (p: string, q: string, common: string): Ternary | undefined =>
  TERNARIES.find((t) => t.common === common && ((t.first === p && t.second === q) || (t.first === q && t.second === p)));

export const FIELDS: readonly Field[] = [
  'a_nm', 'da_dT_nm_per_K', 'EgG0', 'EgX0', 'EgL0',
  'Dso', 'me', 'gamma1', 'gamma2', 'gamma3', 'Ep', 'F', 'VBO', 'ac', 'av', 'b', 'C11', 'C12',
];

/** Answers of supportIssue by element sets: a search asks about the same alloy at every candidate. */
const issues = new Map<string, string | null>();

/** Which binaries and ternaries an alloy needs, as a message when one is missing, else null. Depends only on which elements are present. */
export function supportIssue(alloy: Alloy): string | null {
  const III = Object.keys(alloy.III);
  const V = Object.keys(alloy.V);
  const key = `${III.join(',')}|${V.join(',')}`;
  const hit = issues.get(key);
  if (hit !== undefined) return hit;
  const issue = findSupportIssue(III, V);
  if (issues.size >= 256) issues.clear();
  issues.set(key, issue);
  return issue;
}

function findSupportIssue(III: readonly string[], V: readonly string[]): string | null {
  for (const x of III) for (const y of V) {
    if (binaryOf(x, y) === undefined) return `no parameters for ${x}${y} (this table covers Al, Ga, In with P, As, Sb); define a custom material with your own band edges`;
  }
  if (III.length > 1 && V.length > 1 && (III.length > 2 || V.length > 2)) {
    return `alloys of ${III.length} group-III and ${V.length} group-V elements are not supported (no published check of their interpolation here); use at most two on each side, or three on one side and one on the other`;
  }
  if (III.length > 3 || V.length > 3) return 'more than three elements on one side are not supported (no published check of their interpolation here); use at most three';
  const pairs = (els: readonly string[]): [string, string][] => els.flatMap((p, i) => els.slice(i + 1).map((q): [string, string] => [p, q]));
  for (const [p, q] of pairs(III)) for (const c of V) {
    if (!findTernary(p, q, c)) return `no bowing parameters for the ternary ${p}${q}${c} in this table`;
  }
  for (const [p, q] of pairs(V)) for (const c of III) {
    if (!findTernary(p, q, c)) return `no bowing parameters for the ternary ${c}${p}${q} in this table`;
  }
  return null;
}
