/**
 * Band line-up: how each layer's edges are placed on one energy scale (the offset rule) and what
 * the placed edges give at every heterointerface (the strained ΔEc/ΔEv shares a grower compares
 * with measured offsets), and both as text for tables and reports. Energies eV on the absolute scale
 * of the parameter set.
 */
import type { ResolvedMaterial } from '../materials/types.js';
import { fixed } from './text.js';

/** Which gap difference a conduction-band share divides. */
export type ShareGap = 'unstrained' | 'strained';

/** How band edges were placed on one energy scale; recorded in every output. */
export type OffsetRule =
  | { readonly kind: 'absolute'; readonly source: string }
  | { readonly kind: 'conduction-share'; readonly share: number; readonly reference: string; readonly gap: ShareGap };

/** Conduction and valence edges of one layer (eV, absolute scale). */
export interface Edges {
  readonly Ec: number;
  readonly Ehh: number;
  readonly Elh: number;
}

const top = (e: Edges): number => Math.max(e.Ehh, e.Elh);

/**
 * Edges of a layer under a conduction-band share rule, relative to a reference material.
 *
 * - gap 'unstrained': the unstrained edges are placed by Ec = Ec,ref + Q ΔEg, Ev = Ev,ref − (1 − Q) ΔEg
 *   with ΔEg the unstrained Γ-gap difference, then the layer's own strain shifts are added (the
 *   share then describes the relaxed materials; common practice for lattice-matched systems).
 * - gap 'strained': ΔEg is the difference of the strained gaps Ec − max(Ehh, Elh) of the layer
 *   and of the reference as grown on the substrate, split Q : (1 − Q) between the conduction edge
 *   and the top valence edge; the other valence edge keeps its strain splitting from the top one.
 *   Measured offsets of strained wells are quoted this way, e.g. Q ≈ 0.65 ± 0.07 for
 *   In0.21Ga0.79As/GaAs by photoreflectance and the heavy-hole step ≈ 30 % of the gap difference
 *   for InxGa1−xAs/GaAs, x = 0.09–0.20 (K.-F. Huang, K. Tai, S. N. G. Chu, A. Y. Cho, Appl. Phys.
 *   Lett. 54, 2026 (1989); both abstracts seen).
 *
 * strained: the layer resolved on the substrate; free: the same composition unstrained (used by the
 * unstrained rule); reference: the reference material, unstrained for the unstrained rule and on the
 * substrate for the strained rule (the substrate itself is unstrained either way).
 * Example: In0.2Ga0.8As on GaAs, Q = 0.65 strained → ΔEc = 0.65 × 221 meV ≈ 144 meV at 300 K.
 */
export function shareEdges(rule: { readonly share: number; readonly gap: ShareGap }, strained: Edges, free: Edges & { readonly EgG: number }, reference: Edges & { readonly EgG: number }): Edges {
  const Q = rule.share;
  if (rule.gap === 'unstrained') {
    const dEg = free.EgG - reference.EgG;
    const EvFree = top(reference) - (1 - Q) * dEg;
    const topFree = top(free);
    return { Ec: reference.Ec + Q * dEg + (strained.Ec - free.Ec), Ehh: EvFree + (strained.Ehh - topFree), Elh: EvFree + (strained.Elh - topFree) };
  }
  const gap = (e: Edges): number => e.Ec - top(e);
  const dEg = gap(strained) - gap(reference);
  const Ev = top(reference) - (1 - Q) * dEg;
  const topStrained = top(strained);
  return { Ec: reference.Ec + Q * dEg, Ehh: Ev + (strained.Ehh - topStrained), Elh: Ev + (strained.Elh - topStrained) };
}

/** One heterointerface of a stack, right layer minus left layer (in growth order). */
export interface InterfaceOffset {
  /** Indices of the layers on either side (0-based, left = substrate side). */
  readonly left: number;
  readonly right: number;
  readonly between: string;
  /** Steps of the strained edges, right minus left (meV). */
  readonly dEc_meV: number;
  readonly dEhh_meV: number;
  readonly dElh_meV: number;
  /** Step of the strained gap to the top valence edge, right minus left (meV). */
  readonly dEg_meV: number;
  /**
   * ΔEc/ΔEg of the strained edges (the conduction share measurements quote); null when the gaps
   * differ by less than 1 meV, where a share means nothing.
   */
  readonly conduction_share: number | null;
  /** Alignment of each hole band: 'I' when the side with the lower Ec also holds that hole band higher. */
  readonly heavy_hole_type: 'I' | 'II' | 'flat';
  readonly light_hole_type: 'I' | 'II' | 'flat';
}

/** Below this step (eV) an edge counts as flat across an interface. */
const FLAT = 1e-4;

/** The edges of one layer side as the interface sees them (band samples of a graded layer: its end). */
export interface LayerSide {
  readonly index: number;
  readonly label: string;
  readonly formula: string;
  readonly first: Edges;
  readonly last: Edges;
}

/**
 * Offsets at every interface between layers whose facing edges differ, from the placed (strained)
 * edges. A graded layer meets its neighbours with its end compositions.
 */
export function interfaceOffsets(layers: readonly LayerSide[]): InterfaceOffset[] {
  const out: InterfaceOffset[] = [];
  for (let i = 0; i + 1 < layers.length; i++) {
    const L = layers[i]!;
    const R = layers[i + 1]!;
    const a = L.last;
    const b = R.first;
    const dEc = b.Ec - a.Ec;
    const dEhh = b.Ehh - a.Ehh;
    const dElh = b.Elh - a.Elh;
    if (Math.abs(dEc) < FLAT && Math.abs(dEhh) < FLAT && Math.abs(dElh) < FLAT) continue;
    const dEg = (b.Ec - top(b)) - (a.Ec - top(a));
    // Holes sit where their band edge is higher; type I when that is the side electrons prefer.
    const kind = (dEv: number): 'I' | 'II' | 'flat' => (Math.abs(dEv) < FLAT || Math.abs(dEc) < FLAT ? 'flat' : Math.sign(dEv) === -Math.sign(dEc) ? 'I' : 'II');
    out.push({
      left: L.index, right: R.index, between: `${L.label} (${L.formula}) | ${R.label} (${R.formula})`,
      dEc_meV: dEc * 1000, dEhh_meV: dEhh * 1000, dElh_meV: dElh * 1000, dEg_meV: dEg * 1000,
      conduction_share: Math.abs(dEg) < 1e-3 ? null : dEc / dEg,
      heavy_hole_type: kind(dEhh), light_hole_type: kind(dElh),
    });
  }
  return out;
}

/** One line naming the offset rule, for tables and reports. */
export function describeOffsetRule(rule: OffsetRule): string {
  if (rule.kind === 'absolute') return rule.source;
  return `conduction-band share ${rule.share} of the ${rule.gap} gap difference, relative to ${rule.reference}`;
}

/** Header of the interface table (shared by the terminal table and the report). */
export const INTERFACE_HEADER = ['layers', 'ΔEc meV', 'ΔEhh meV', 'ΔElh meV', 'ΔEg meV', 'Qc', 'hh', 'lh'];

/** One interface as table cells (shared by the terminal table and the report). */
export const interfaceRow = (i: InterfaceOffset): string[] => [`${i.left + 1}|${i.right + 1}`, fixed(i.dEc_meV, 1), fixed(i.dEhh_meV, 1), fixed(i.dElh_meV, 1), fixed(i.dEg_meV, 1),
  i.conduction_share === null ? '–' : fixed(i.conduction_share, 3), `type ${i.heavy_hole_type}`, `type ${i.light_hole_type}`];

/** Edges of a resolved material. */
export const edgesOf = (m: ResolvedMaterial): Edges & { readonly EgG: number } => ({ Ec: m.Ec, Ehh: m.Ehh, Elh: m.Elh, EgG: m.EgG });
