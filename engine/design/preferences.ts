/**
 * Preferences a grower sets once every target is met (the spec's `prefer:` list): secondary
 * figures in order of importance, compared lexicographically — the first decides unless two
 * designs lie within its `within`, then the second, and so on; designs still tied keep the order
 * of their loss, then of their start (deterministic).
 *
 * In the search, a candidate that meets every target scores below every candidate that does not,
 * by an amount that grows with its preferences (searchScore), so each start walks along the set of
 * designs meeting the targets towards the preferred end. That scalar weighs the k-th preference by
 * 10⁻³ᵏ: lexicographic up to that resolution, which is why the final order is made again exactly,
 * with the ties, on the full solves (compareDesigns).
 */
import { InputError } from '../errors.js';
import type { PreferenceSpec, Spec } from '../input/schema.js';
import { splitQuantity } from '../input/units.js';
import { findTransition, type SolveResult } from '../solve.js';
import type { Structure } from '../structure.js';
import { worstStrainRun, netStrain } from '../../materials/strain-balance.js';
import { strainView } from '../../objectives/constraints.js';
import { stateEnergy, checkStateLabel } from '../../objectives/common.js';

type Figure = NonNullable<PreferenceSpec['maximize']>;

export interface Preference {
  readonly figure: Figure;
  /** +1 to maximise, −1 to minimise. */
  readonly sense: 1 | -1;
  /** States a spacing, splitting or overlap reads. */
  readonly of: string | null;
  /** Values closer than this tie (figure's unit). */
  readonly tie: number;
  readonly label: string;
  readonly unit: string;
}

/** Unit, default tie and the scale of the search's squashing of each figure. */
const FIGURES: Readonly<Record<Figure, { readonly unit: string; readonly tie: number; readonly scale: number; readonly of: boolean }>> = {
  critical_margin: { unit: '', tie: 0.005, scale: 0.2, of: false },
  spacing: { unit: 'meV', tie: 0.1, scale: 20, of: true },
  splitting: { unit: 'meV', tie: 0.1, scale: 20, of: true },
  overlap: { unit: '', tie: 0.001, scale: 0.2, of: true },
  total_thickness: { unit: 'nm', tie: 0.1, scale: 20, of: false },
  indium: { unit: 'nm', tie: 0.01, scale: 2, of: false },
  aluminium: { unit: 'nm', tie: 0.01, scale: 2, of: false },
  gallium: { unit: 'nm', tie: 0.01, scale: 2, of: false },
  phosphorus: { unit: 'nm', tie: 0.01, scale: 2, of: false },
  antimony: { unit: 'nm', tie: 0.01, scale: 2, of: false },
  strain_residual: { unit: '%', tie: 0.001, scale: 0.1, of: false },
};

const ELEMENT: Readonly<Partial<Record<Figure, string>>> = { indium: 'In', aluminium: 'Al', gallium: 'Ga', phosphorus: 'P', antimony: 'Sb' };

/** Validates the spec's `prefer:` list; every error names its field. */
export function compilePreferences(spec: Spec): Preference[] {
  return (spec.prefer ?? []).map((p, i) => {
    const field = `prefer[${i}]`;
    if ((p.maximize === undefined) === (p.minimize === undefined)) throw new InputError('bad-value', `${field}: give exactly one of maximize or minimize, e.g. { maximize: critical_margin }`, field);
    if (spec.wire !== undefined) throw new InputError('bad-value', `${field}: preferences rank layer stacks; a wire spec has none of these figures`, field);
    const figure = (p.maximize ?? p.minimize)!;
    const info = FIGURES[figure];
    if (info.of && p.of === undefined) throw new InputError('bad-value', `${field}.of: ${figure} needs the states it reads, e.g. of: ${figure === 'overlap' ? 'e1-hh1' : figure === 'splitting' ? 'hh1-lh1' : 'e1-e2'}`, `${field}.of`);
    if (!info.of && p.of !== undefined) throw new InputError('bad-value', `${field}.of: ${figure} reads no states; remove "of"`, `${field}.of`);
    if (p.of !== undefined) {
      const parts = p.of.split('-');
      if (parts.length !== 2) throw new InputError('bad-value', `${field}.of: expected two states such as e1-e2, got "${p.of}"`, `${field}.of`);
      for (const s of parts) checkStateLabel(s, `${field}.of`);
    }
    let tie = info.tie;
    if (p.within !== undefined) {
      const q = splitQuantity(p.within);
      if (!q || !(q.value >= 0) || (q.unit !== '' && q.unit !== info.unit)) throw new InputError('bad-value', `${field}.within: expected a non-negative value${info.unit ? ` in ${info.unit}` : ''}, got ${JSON.stringify(p.within)}`, `${field}.within`);
      tie = q.value;
    }
    const sense = p.maximize !== undefined ? 1 : -1;
    return { figure, sense, of: p.of ?? null, tie, label: `${sense > 0 ? 'max' : 'min'} ${figure.replace('_', ' ')}${p.of ? ` ${p.of}` : ''}`, unit: info.unit };
  });
}

/** Whether the preferences read overlaps (the search then samples wavefunctions). */
export const preferencesNeedWavefunctions = (prefs: readonly Preference[]): boolean => prefs.some((p) => p.figure === 'overlap');

/** States per band the preferences read, as objective state labels ("e2", "lh1"). */
export const preferenceStates = (prefs: readonly Preference[]): string[] => prefs.flatMap((p) => (p.of ? p.of.split('-') : []));

/** Σ thickness × fraction of one element over the layers (nm); a grade counts its mean fraction. */
function content(s: Structure, element: string): number {
  let sum = 0;
  for (const l of s.layers) {
    const c = l.composition;
    const side = (a: { III: Readonly<Record<string, number>>; V: Readonly<Record<string, number>> }): number => a.III[element] ?? a.V[element] ?? 0;
    const x = c.kind === 'alloy' ? side(c.alloy) : c.kind === 'graded' ? (side(c.from) + side(c.to)) / 2 : 0;
    sum += l.thickness_nm * x;
  }
  return sum;
}

/** The smallest 1 − t/h_c over every layer and every run of strained layers (1 when nothing is strained). */
export function criticalMargin(s: Structure): number {
  let m = 1;
  for (const l of s.layers) m = Math.min(m, 1 - l.thickness_nm / l.material.criticalThickness_nm);
  const view = strainView(s.layers, s.substrate);
  const run = view ? worstStrainRun(view.layers, view.aSubstrate_nm) : null;
  return run ? Math.min(m, 1 - run.ratio) : m;
}

/** The value of one preference's figure on a solved stack (its unit); NaN when a state it reads is missing. */
export function preferenceValue(p: Preference, r: SolveResult): number {
  const s = r.structure;
  switch (p.figure) {
    case 'critical_margin': return criticalMargin(s);
    case 'total_thickness': return s.total_nm;
    case 'strain_residual': {
      const view = strainView(s.layers, s.substrate);
      return view ? Math.abs(netStrain(view.layers.filter((l) => Math.abs(l.a_nm - view.aSubstrate_nm) > 1e-6 * view.aSubstrate_nm), view.aSubstrate_nm)) * 100 : 0;
    }
    case 'overlap': return findTransition(r, p.of!)?.overlap2 ?? NaN;
    case 'spacing':
    case 'splitting': {
      const [a, b] = p.of!.split('-') as [string, string];
      const ea = stateEnergy(r, a);
      const eb = stateEnergy(r, b);
      if (ea.missing || eb.missing) return NaN;
      return (p.figure === 'spacing' ? Math.abs(eb.energy - ea.energy) : ea.energy - eb.energy) * 1000;
    }
    default: return content(s, ELEMENT[p.figure]!);
  }
}

/** Preference values of a solve, in preference order. */
export const preferenceValues = (prefs: readonly Preference[], r: SolveResult): number[] => prefs.map((p) => preferenceValue(p, r));

/**
 * The search's scalar: the target loss for a candidate that misses a target (≥ 0), and for one
 * that meets them all −(1 + Σ_k 10⁻³ᵏ u_k) with u_k = ½ + atan(sense·v_k/scale_k)/π ∈ (0, 1)
 * (a missing value counts as the worst, u = 0), always below any miss. Without preferences the
 * loss itself, as before.
 */
export function searchScore(prefs: readonly Preference[], loss: number, satisfied: boolean, values: readonly number[]): number {
  if (prefs.length === 0 || !satisfied) return loss;
  let sum = 0;
  prefs.forEach((p, k) => {
    const v = values[k]!;
    const u = Number.isFinite(v) ? 0.5 + Math.atan((p.sense * v) / FIGURES[p.figure].scale) / Math.PI : 0;
    sum += u * 1e-3 ** k;
  });
  return -(1 + sum);
}

/**
 * Lexicographic order of two designs' preference values (negative: a first): the first preference
 * whose values differ by more than its tie decides, the larger first when maximised; a missing
 * value (NaN) ranks last. 0 when every preference ties.
 */
export function comparePreferences(prefs: readonly Preference[], a: readonly number[], b: readonly number[]): number {
  for (const [k, p] of prefs.entries()) {
    const x = a[k]!;
    const y = b[k]!;
    if (Number.isNaN(x) !== Number.isNaN(y)) return Number.isNaN(x) ? 1 : -1;
    if (Number.isNaN(x) || Math.abs(x - y) <= p.tie) continue;
    return p.sense * (y - x);
  }
  return 0;
}
