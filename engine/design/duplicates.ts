/**
 * Near-duplicate designs, merged in a ranking: two designs a grower could not tell apart in the
 * reactor — every layer (or wire part) the same whole number of monolayers and every alloy
 * fraction within one composition step — or one the mirror image of the other (a stack grown in
 * reverse order, which has the same spectrum when no field breaks the symmetry; a wire reflected
 * across its vertical axis).
 */
import type { LayerComposition, Structure } from '../structure.js';
import type { WireStructure } from '../wire/structure.js';
import { parseMaterialName } from '../../materials/quaternary.js';

/** One layer or wire part as the comparison reads it: size in monolayers and composition. */
interface Piece {
  readonly ml: number;
  readonly material: string;
  readonly fractions: readonly number[];
}

/** A design's pieces in growth order (stack) or paint order (wire), and its mirror image's. */
export interface Fingerprint {
  readonly pieces: readonly Piece[];
  readonly mirrored: readonly Piece[] | null;
  /** Lengths of a wire fingerprint are positions, compared within half a monolayer. */
  readonly tolerance: number;
}

/** Element fractions of a composition in a fixed order, and its elements' names. */
function compositionKey(c: LayerComposition): { material: string; fractions: number[] } {
  if (c.kind === 'custom') return { material: `custom:${c.name}`, fractions: [] };
  const ends = c.kind === 'alloy' ? [c.alloy] : [c.from, c.to];
  const els = [...new Set(ends.flatMap((a) => [...Object.keys(a.III), ...Object.keys(a.V)]))].sort();
  return { material: `${c.kind}:${els.join('')}`, fractions: ends.flatMap((a) => els.map((e) => a.III[e] ?? a.V[e] ?? 0)) };
}

/** Fingerprint of a stack: each layer's whole monolayers and fractions; the mirror only without a field. */
export function stackFingerprint(s: Structure): Fingerprint {
  const pieces = s.layers.map((l): Piece => ({ ml: Math.round(l.monolayers), ...compositionKey(l.composition) }));
  // A graded layer grown in reverse runs the other way: its ends swap.
  const flip = (p: Piece, l: Structure['layers'][number]): Piece => (l.composition.kind === 'graded' ? { ...p, ...compositionKey({ kind: 'graded', from: l.composition.to, to: l.composition.from }) } : p);
  return { pieces, mirrored: s.field_kV_per_cm === 0 ? pieces.map((p, i) => flip(p, s.layers[i]!)).reverse() : null, tolerance: 0 };
}

/**
 * Fingerprint of a wire: each primitive's edges (nm, x mirrored for the image) with its material;
 * positions match within half the smallest monolayer of its materials.
 */
export function wireFingerprint(w: WireStructure): Fingerprint {
  const mono = Math.min(...w.materials.map((m) => m.material.monolayer_nm).filter((x) => x > 0), 0.3);
  const materialOf = (k: number): { material: string; fractions: number[] } => {
    const m = w.materials[k]!;
    try {
      return compositionKey({ kind: 'alloy', alloy: parseMaterialName(m.formula) });
    } catch {
      return { material: `custom:${m.formula}`, fractions: [] };
    }
  };
  const piece = (edges: readonly number[], k: number): Piece => ({ ml: NaN, ...materialOf(k), fractions: [...materialOf(k).fractions, ...edges] });
  const pieces = w.primitives.map((p) => (p.kind === 'rect' ? piece([p.x0, p.x1, p.y0, p.y1], p.material) : piece([p.radius], p.material)));
  const mirrored = w.primitives.map((p) => (p.kind === 'rect' ? piece([-p.x1, -p.x0, p.y0, p.y1], p.material) : piece([p.radius], p.material)));
  return { pieces, mirrored, tolerance: mono / 2 };
}

function samePieces(a: readonly Piece[], b: readonly Piece[], step: number, tolerance: number): boolean {
  if (a.length !== b.length) return false;
  return a.every((p, i) => {
    const q = b[i]!;
    if (p.material !== q.material || p.fractions.length !== q.fractions.length) return false;
    if (!(Number.isNaN(p.ml) && Number.isNaN(q.ml)) && p.ml !== q.ml) return false;
    // Fractions compare within one step; a wire's trailing edges (beyond the composition) within the tolerance.
    const nFractions = p.material.startsWith('custom:') ? 0 : p.material.split(':')[1]!.match(/[A-Z][a-z]?/g)!.length * (p.material.startsWith('graded:') ? 2 : 1);
    return p.fractions.every((x, k) => Math.abs(x - q.fractions[k]!) <= (k < nFractions ? step + 1e-9 : tolerance));
  });
}

/** Whether two designs are near-duplicates (see the file comment); step is the composition step. */
export function nearDuplicates(a: Fingerprint, b: Fingerprint, step: number): boolean {
  return samePieces(a.pieces, b.pieces, step, a.tolerance) || (b.mirrored !== null && samePieces(a.pieces, b.mirrored, step, a.tolerance));
}
