/**
 * Structure -> valence profile: the layered structure as slices of constant valence parameters
 * (strained hh and lh edges with any field tilt, Luttinger parameters, Δso, shear strain Q_ε), the
 * input of the multiband discretisation. Slicing is that of engine/profile.ts, so graded layers and
 * fields are cut exactly as for the single-band solver.
 */
import { buildBandProfile } from '../profile.js';
import { mixAlloys, type ResolvedLayer, type Structure } from '../structure.js';
import { alloyAt, formatFormula, lightHoleShift, type Alloy } from '../../materials/index.js';
import { InputError } from '../errors.js';
import type { ValenceModel, ValencePoint } from './hamiltonian.js';

/** One slice of constant valence parameters. */
export interface ValenceSlice {
  readonly width_nm: number;
  /** Index of the structure layer it belongs to; −1 for the padding added to an outer layer. */
  readonly layer: number;
  readonly point: ValencePoint;
}

/** The valence slices from left to right; the first and last belong to the outer layers. */
export interface ValenceProfile {
  readonly slices: readonly ValenceSlice[];
  /** Width (nm) of the outer region on each side (outer layer plus padding). */
  readonly outerLeft_nm: number;
  readonly outerRight_nm: number;
  /** Number of slices at each end that make up the outer regions. */
  readonly outerSlicesLeft: number;
  readonly outerSlicesRight: number;
  /** Where the structure's z = 0 (the first layer's start) lies on the profile's axis (nm): the left padding. */
  readonly origin_nm: number;
}

/**
 * Q_ε from the strained edge split: E_lh − E_hh = Q_ε + lightHoleShift(Q_ε, Δ) (materials/strain.ts),
 * an increasing function of Q_ε; solved by Newton steps safeguarded by bisection. With Δ = ∞ the
 * split is 2Q_ε. Energies eV.
 */
export function shearFromSplit(split: number, Dso: number): number {
  if (!Number.isFinite(Dso)) return split / 2;
  const f = (q: number): number => q + lightHoleShift(q, Dso) - split;
  // f(q) ≥ q + (q − Δ)/2 − … : a bracket of width a few |split| + Δ always holds the root.
  let lo = -Math.abs(split) - Dso;
  let hi = Math.abs(split) + Dso;
  while (f(lo) > 0) lo *= 2;
  while (f(hi) < 0) hi *= 2;
  let q = split / 2;
  for (let it = 0; it < 200; it++) {
    const fq = f(q);
    if (fq === 0) return q;
    if (fq < 0) lo = q;
    else hi = q;
    const h = 1e-7 * (Math.abs(q) + Dso);
    const slope = (f(q + h) - f(q - h)) / (2 * h);
    let next = q - fq / slope;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - q) <= 1e-15 * (Math.abs(q) + Dso)) return next;
    q = next;
  }
  return q;
}

/** γ3 − γ2 (the warping) and Δso of an alloy at T; memoised, since a search repeats the same few. */
const alloyWarping = new Map<string, { readonly warp: number; readonly Dso: number }>();
function warpingOf(alloy: Alloy, T: number, lattice: Structure['models']['lattice']): { readonly warp: number; readonly Dso: number } {
  const key = `${formatFormula(alloy)}|${T}|${lattice}`;
  let v = alloyWarping.get(key);
  if (!v) {
    const p = alloyAt(alloy, T, lattice);
    v = { warp: p.gamma3 - p.gamma2, Dso: p.Dso };
    if (alloyWarping.size >= 4096) alloyWarping.clear();
    alloyWarping.set(key, v);
  }
  return v;
}

/** Warping and Δso at fraction t (0…1) through a layer. Custom materials carry no γ3: γ3 = γ2. */
function layerExtras(layer: ResolvedLayer, t: number, s: Structure): { readonly warp: number; readonly Dso: number } {
  const c = layer.composition;
  if (c.kind === 'custom') return { warp: 0, Dso: layer.material.Dso };
  const alloy = c.kind === 'alloy' ? c.alloy : mixAlloys(c.from, c.to, t);
  return warpingOf(alloy, s.temperature_K, s.models.lattice);
}

/**
 * The valence profile of a structure: hh and lh edges and [001] masses from the single-band
 * profiles (engine/profile.ts, slices of at most `maxSlice_nm` in graded layers and under a field),
 * γ1 = (1/m_hh + 1/m_lh)/2 and γ2 = (1/m_lh − 1/m_hh)/4 from those masses (the inverse of
 * materials/masses.ts, so the k∥ = 0 limit is the single-band model exactly), γ3 = γ2 + (γ3 − γ2) of
 * the alloy at the slice (materials/alloys.ts alloyAt; custom materials: γ3 = γ2), Δso likewise, and
 * Q_ε from the edge split (shearFromSplit). The outer layers continue outwards (as in the single-band
 * solver): each is padded with its outer material to at least `outer_nm`. A single layer is a slab
 * between walls (no outer region).
 * Throws InputError for kp6 when a layer has no split-off energy (a custom material).
 */
export function valenceProfile(s: Structure, options: { readonly model: ValenceModel; readonly maxSlice_nm: number; readonly outer_nm: number }): ValenceProfile {
  const hh = buildBandProfile(s, 'heavy_hole', { maxSlice_nm: options.maxSlice_nm, nonparabolic: false });
  const lh = buildBandProfile(s, 'light_hole', { maxSlice_nm: options.maxSlice_nm, nonparabolic: false });
  const perLayer = new Map<number, number>();
  for (const sl of hh.slices) perLayer.set(sl.layer, (perLayer.get(sl.layer) ?? 0) + 1);
  const seen = new Map<number, number>();
  const pointOf = (Vhh: number, mhh: number, Vlh: number, mlh: number, layer: ResolvedLayer, t: number): ValencePoint => {
    const Ehh = -Vhh;
    const Elh = -Vlh;
    const gamma1 = (1 / mhh + 1 / mlh) / 2;
    const gamma2 = (1 / mlh - 1 / mhh) / 4;
    const { warp, Dso } = layerExtras(layer, t, s);
    if (options.model === 'kp6' && !Number.isFinite(Dso)) {
      throw new InputError('bad-value', `solver.valence: kp6 needs the split-off energy of every layer, but ${layer.label} (${layer.formula}) is a custom material without one; use kp4`, 'solver.valence');
    }
    return { Ehh, Elh, gamma1, gamma2, gamma3: gamma2 + warp, Dso, Qe: shearFromSplit(Elh - Ehh, Dso) };
  };
  const slices: ValenceSlice[] = hh.slices.map((a, i) => {
    const b = lh.slices[i]!;
    const k = seen.get(a.layer) ?? 0;
    seen.set(a.layer, k + 1);
    const layer = s.layers[a.layer]!;
    return { width_nm: a.width_nm, layer: a.layer, point: pointOf(a.V, a.mass, b.V, b.mass, layer, (k + 0.5) / perLayer.get(a.layer)!) };
  });
  const first = s.layers[0]!;
  const last = s.layers[s.layers.length - 1]!;
  // A single layer is a slab between the two walls (the bulk limit): no outer region.
  const single = s.layers.length === 1;
  const leftCount = single ? 0 : perLayer.get(first.index)!;
  const rightCount = single ? 0 : perLayer.get(last.index)!;
  const padLeft = single ? 0 : Math.max(0, options.outer_nm - first.thickness_nm);
  const padRight = single ? 0 : Math.max(0, options.outer_nm - last.thickness_nm);
  const out: ValenceSlice[] = [];
  if (padLeft > 0) out.push({ width_nm: padLeft, layer: -1, point: pointOf(hh.left.V, hh.left.mass, lh.left.V, lh.left.mass, first, 0) });
  out.push(...slices);
  if (padRight > 0) out.push({ width_nm: padRight, layer: -1, point: pointOf(hh.right.V, hh.right.mass, lh.right.V, lh.right.mass, last, 1) });
  return {
    slices: out,
    outerLeft_nm: single ? 0 : first.thickness_nm + padLeft,
    outerRight_nm: single ? 0 : last.thickness_nm + padRight,
    outerSlicesLeft: leftCount + (padLeft > 0 ? 1 : 0),
    outerSlicesRight: rightCount + (padRight > 0 ? 1 : 0),
    origin_nm: padLeft,
  };
}
