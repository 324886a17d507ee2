/**
 * Discretisation of the layered valence Hamiltonian: a box-integration (finite-volume) scheme on a
 * grid whose nodes include every interface, giving a real symmetric banded matrix per block and k.
 *
 * Cells carry the material (constant coefficients A, B, C of engine/valence/hamiltonian.ts per
 * cell); ψ lives on the nodes, ψ = 0 at the two outer ends. Integrating H ψ = E ψ over the dual
 * cell [z_i − h_{i−1}/2, z_i + h_i/2] of node i (common practice, the box method):
 *   k_z C k_z → −[C_i (ψ_{i+1} − ψ_i)/h_i − C_{i−1}(ψ_i − ψ_{i−1})/h_{i−1}],
 *   k_z B† ψ → −i [B_i† (ψ_i + ψ_{i+1})/2 − B_{i−1}† (ψ_{i−1} + ψ_i)/2],
 *   B k_z ψ → −i [B_{i−1}(ψ_i − ψ_{i−1})/2 + B_i (ψ_{i+1} − ψ_i)/2],
 *   A ψ → (h_{i−1} A_{i−1} + h_i A_i)/2 ψ_i,   E ψ → E (h_{i−1} + h_i)/2 ψ_i.
 * The matrix is Hermitian for any cell values: the off-diagonal block is −C_i/h_i − (i/2)(B_i + B_i†)
 * and the diagonal collects (i/2)[(B − B†)_i − (B − B†)_{i−1}], the discrete form of the interface
 * term (i/2)(B − B†)′ by which the Burt–Foreman ordering differs from the symmetrised one. At
 * k∥ = 0 it is the three-point BenDaniel–Duke operator with the mass of each cell, second order in
 * the spacing. With B = i k B1 (B1 real, hamiltonian.ts) every entry is real; the generalised
 * problem K ψ = E diag(w) ψ is made standard by x = w^{1/2} ψ. Units: eV, nm, 1/nm.
 *
 * Grid: spacing at most h inside the structure; in the two outer layers (which decay away from the
 * wells) the cells grow geometrically by GROWTH away from the inner interface up to OUTER_MAX × h.
 */
import type { ValenceProfile } from './profile.js';
import { pointCoefficients, type PointCoefficients, type ValenceModel } from './hamiltonian.js';

/** Growth factor of cell widths in the outer layers. */
export const GROWTH = 1.1;
/** Largest cell in the outer layers, in units of the inner spacing. */
export const OUTER_MAX = 8;

/** Cells of the grid: widths (nm), slice index of each, and node positions (nm, from the left end). */
export interface ValenceGrid {
  readonly widths: Float64Array;
  readonly slice: Int32Array;
  readonly z_nm: Float64Array;
}

/** Geometric cells of total width W starting at size `start` (nm), growing up to `max`. */
function gradedCells(W: number, start: number, max: number): number[] {
  const cells: number[] = [];
  let remaining = W;
  let size = start;
  while (remaining > 1e-12 * W) {
    const s = Math.min(size, max);
    if (remaining <= 1.5 * s) {
      cells.push(remaining);
      break;
    }
    cells.push(s);
    remaining -= s;
    size = s * GROWTH;
  }
  return cells;
}

/**
 * The grid of a valence profile for inner spacing h (nm), refined `refine` times (each cell of the
 * h grid cut into `refine` equal cells, so that energies on grids 1, 2, 4 … can be extrapolated).
 */
export function valenceGrid(p: ValenceProfile, h: number, refine = 1): ValenceGrid {
  const n = p.slices.length;
  const perSlice: number[][] = p.slices.map((s, i) => {
    const outer = i < p.outerSlicesLeft || i >= n - p.outerSlicesRight;
    if (outer) return [];
    const count = Math.max(1, Math.ceil(s.width_nm / h - 1e-9));
    return Array.from({ length: count }, () => s.width_nm / count);
  });
  // Outer regions, graded from the inner side outwards.
  let size = h;
  for (let i = p.outerSlicesLeft - 1; i >= 0; i--) {
    const cells = gradedCells(p.slices[i]!.width_nm, size, OUTER_MAX * h);
    size = Math.min(cells.length > 1 ? cells[cells.length - 2]! * GROWTH : size, OUTER_MAX * h);
    perSlice[i] = cells.reverse();
  }
  size = h;
  for (let i = n - p.outerSlicesRight; i < n; i++) {
    if (i < p.outerSlicesLeft) continue;
    const cells = gradedCells(p.slices[i]!.width_nm, size, OUTER_MAX * h);
    size = Math.min(cells.length > 1 ? cells[cells.length - 2]! * GROWTH : size, OUTER_MAX * h);
    perSlice[i] = cells;
  }
  const widths: number[] = [];
  const slice: number[] = [];
  perSlice.forEach((cells, i) => {
    for (const w of cells) for (let r = 0; r < refine; r++) {
      widths.push(w / refine);
      slice.push(i);
    }
  });
  const z = new Float64Array(widths.length + 1);
  for (let c = 0; c < widths.length; c++) z[c + 1] = z[c]! + widths[c]!;
  return { widths: Float64Array.from(widths), slice: Int32Array.from(slice), z_nm: z };
}

/**
 * One block's operator on the grid as banded storage in k: band(k) = base + k·lin + k²·quad, lower
 * band rows of width bw + 1 (entry (r, c), r ≥ c ≥ r − bw, at r·(bw + 1) + r − c), already scaled to
 * the standard problem. Unknowns interleave the block's components node by node.
 */
export interface BlockOperator {
  /** Components of the T(φ) basis this block holds (hamiltonian.ts blocksOf). */
  readonly components: readonly number[];
  readonly n: number;
  readonly bw: number;
  readonly base: Float64Array;
  readonly lin: Float64Array;
  readonly quad: Float64Array;
  /** w_i^{-1/2} of each node: ψ = x · scale. */
  readonly scale: Float64Array;
}

/** Restriction of a d × d matrix to components `idx`, m × m. */
function restrict(M: Float64Array, d: number, idx: readonly number[]): Float64Array {
  const m = idx.length;
  const out = new Float64Array(m * m);
  for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) out[a * m + b] = M[idx[a]! * d + idx[b]!]!;
  return out;
}

/**
 * The operators of the blocks `blocks` (component lists; one list of all components when the
 * direction has no mirror symmetry) for direction φ on a grid: see the module comment.
 */
export function blockOperators(p: ValenceProfile, grid: ValenceGrid, model: ValenceModel, phi: number, axial: boolean, blocks: readonly (readonly number[])[]): BlockOperator[] {
  const coefs: PointCoefficients[] = p.slices.map((s) => pointCoefficients(s.point, model, phi, axial));
  const d = coefs[0]!.d;
  const nc = grid.widths.length;
  const nodes = nc - 1;
  return blocks.map((idx) => {
    const m = idx.length;
    const per = coefs.map((c) => ({ A0: restrict(c.A0, d, idx), A2: restrict(c.A2, d, idx), B1: restrict(c.B1, d, idx), C: restrict(c.C, d, idx) }));
    const n = nodes * m;
    const bw = 2 * m - 1;
    const stride = bw + 1;
    const base = new Float64Array(n * stride);
    const lin = new Float64Array(n * stride);
    const quad = new Float64Array(n * stride);
    const scale = new Float64Array(n);
    const w = new Float64Array(nodes);
    for (let i = 0; i < nodes; i++) w[i] = 0.5 * (grid.widths[i]! + grid.widths[i + 1]!);
    const put = (arr: Float64Array, r: number, c: number, v: number): void => {
      arr[r * stride + r - c] = arr[r * stride + r - c]! + v;
    };
    for (let i = 0; i < nodes; i++) {
      for (let a = 0; a < m; a++) scale[i * m + a] = 1 / Math.sqrt(w[i]!);
      // Node i (0-based unknown) sits between cells i (left) and i + 1 (right).
      for (const [cell, side] of [[i, -1], [i + 1, 1]] as const) {
        const h = grid.widths[cell]!;
        const q = per[grid.slice[cell]!]!;
        for (let a = 0; a < m; a++) {
          for (let b = 0; b <= a; b++) {
            const r = i * m + a;
            const c = i * m + b;
            const sw = 1 / w[i]!;
            put(base, r, c, sw * (q.C[a * m + b]! / h + 0.5 * h * q.A0[a * m + b]!));
            put(quad, r, c, sw * 0.5 * h * q.A2[a * m + b]!);
            // −½(Br + Brᵀ) on the right cell, +½(Br + Brᵀ) on the left one, Br = k B1.
            put(lin, r, c, sw * -0.5 * side * (q.B1[a * m + b]! + q.B1[b * m + a]!));
          }
        }
      }
      if (i + 1 < nodes) {
        // Block (i+1, i) = O_iᵀ with O_i = −C/h + ½(Br − Brᵀ) of the cell between them.
        const cell = i + 1;
        const h = grid.widths[cell]!;
        const q = per[grid.slice[cell]!]!;
        const sw = 1 / Math.sqrt(w[i]! * w[i + 1]!);
        for (let a = 0; a < m; a++) {
          for (let b = 0; b < m; b++) {
            const r = (i + 1) * m + a;
            const c = i * m + b;
            put(base, r, c, sw * (-q.C[b * m + a]! / h));
            put(lin, r, c, sw * 0.5 * (q.B1[b * m + a]! - q.B1[a * m + b]!));
          }
        }
      }
    }
    return { components: idx, n, bw, base, lin, quad, scale };
  });
}

/** The banded matrix of a block operator at in-plane wave number k (1/nm), written into `out`. */
export function bandAt(op: BlockOperator, k: number, out: Float64Array): Float64Array {
  const { base, lin, quad } = op;
  const k2 = k * k;
  for (let i = 0; i < base.length; i++) out[i] = base[i]! + k * lin[i]! + k2 * quad[i]!;
  return out;
}
