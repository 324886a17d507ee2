/**
 * One grid for every band of a wire. Each band's converged solve ends on its own finest grid
 * (h/2 or h/4), cell-centred in the same box (engine/solver2d.ts sampleCrossSection); because the
 * box is a whole number of coarse cells, these grids nest: cell (i, j) of a grid with c cells per
 * side is the s × s block of cells (s·i … s·i + s − 1, s·j …) of the grid with s·c cells.
 * Envelopes are averaged onto the coarsest of the finest grids (and renormalised there) so
 * overlaps and maps compare like with like. Lengths nm, envelopes 1/nm.
 */
import type { CrossSectionBox, CrossSectionGrid } from '../solver2d.js';

/** The grid of the |ψ|² maps: node (i, j) at (x0 + i·dx, y0 + j·dy), index i + nx·j. */
export interface MapGrid extends Pick<CrossSectionGrid, 'nx' | 'ny' | 'dx_nm' | 'dy_nm' | 'x0_nm' | 'y0_nm'> {
  /** Material index at each node (0 = barrier; order as in structure.materials). */
  readonly material: readonly number[];
}

/** Envelopes of each band averaged onto the coarsest nested grid, renormalised to Σψ² dx dy = 1. */
export function commonGrid(
  box: CrossSectionBox,
  bands: readonly { readonly psi: readonly Float64Array[]; readonly nx: number; readonly ny: number }[],
  region: (x_nm: number, y_nm: number) => number,
): { readonly grid: MapGrid; readonly psi: readonly Float64Array[][] } {
  const nx = Math.min(...bands.map((b) => b.nx));
  const ny = Math.min(...bands.map((b) => b.ny));
  const dx = box.width_nm / nx;
  const dy = box.height_nm / ny;
  const material: number[] = [];
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) material.push(region(box.x0_nm + (i + 0.5) * dx, box.y0_nm + (j + 0.5) * dy));
  const psi = bands.map((b) => {
    const sx = Math.round(b.nx / nx);
    const sy = Math.round(b.ny / ny);
    return b.psi.map((v) => {
      const out = new Float64Array(nx * ny);
      let norm = 0;
      for (let j = 0; j < ny; j++) {
        for (let i = 0; i < nx; i++) {
          let x = 0;
          for (let q = 0; q < sy; q++) for (let p = 0; p < sx; p++) x += v[sx * i + p + b.nx * (sy * j + q)]!;
          x /= sx * sy;
          out[i + nx * j] = x;
          norm += x * x;
        }
      }
      const scale = 1 / Math.sqrt(norm * dx * dy);
      return out.map((x) => x * scale);
    });
  });
  return { grid: { nx, ny, dx_nm: dx, dy_nm: dy, x0_nm: box.x0_nm + 0.5 * dx, y0_nm: box.y0_nm + 0.5 * dy, material }, psi };
}

/** Interband overlap |∫ψ_a ψ_b dx dy|² of two envelopes on one grid (rectangle rule, exact for the discrete eigenvectors' inner product). */
export function overlap2d(a: Float64Array, b: Float64Array, grid: Pick<MapGrid, 'dx_nm' | 'dy_nm'>): number {
  let s = 0;
  for (let k = 0; k < a.length; k++) s += a[k]! * b[k]!;
  const o = s * grid.dx_nm * grid.dy_nm;
  return o * o;
}
