/**
 * Where a wire's grids lie (engine/wire/solve.ts wireBox): the shape's outer interfaces on cell
 * faces of every grid at 2h, h, h/2 and h/4, the hard wall exactly `margin` outside the shape, so the
 * subbands do not depend on the grid setting beyond their error estimates (a margin rounded up to
 * whole pairs of cells moved e2 of a 9 × 7 nm wire by 0.19 meV between the settings 1 and 0.5 nm).
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { solveWireStructure, wireBox } from '../../engine/wire/solve.js';
import { buildWireStructure } from '../../engine/wire/structure.js';

const spec = (grid: number) => parseSpecText(`
substrate: GaAs
temperature: 300 K
solver: { nonparabolic: false }
wire:
  barrier: Al0.3Ga0.7As
  shape: { kind: rectangle, material: GaAs, width: 9.3 nm, height: 6.7 nm }
  grid: ${grid} nm
  margin: 6 nm
  states: 2
  tolerance: 0.1 meV
`).spec;

describe('wire grids', () => {
  it('put the rectangle on cell faces of the grids at 2h … h/4 and the wall exactly at the margin', () => {
    for (const grid of [1, 0.5, 0.4]) {
      const s = buildWireStructure(spec(grid), {});
      const { box, spacing, rest } = wireBox(s);
      for (const [lo, hi, start, size, step, r] of [[s.bounds.x0, s.bounds.x1, box.x0_nm, box.width_nm, spacing[0], rest[0]], [s.bounds.y0, s.bounds.y1, box.y0_nm, box.height_nm, spacing[1], rest[1]]] as const) {
        expect(step).toBeLessThanOrEqual(grid);
        for (const f of [2, 1, 0.5, 0.25]) {
          const cells = (x: number): number => (x - start) / (step * f);
          for (const x of [lo, hi, start + size]) expect(Math.abs(cells(x) - Math.round(cells(x))), `grid ${grid}, spacing ${step * f}`).toBeLessThan(1e-9);
        }
        expect(Math.abs(start - r - (lo - 6))).toBeLessThan(1e-12);
        expect(Math.abs(start + size + r - (hi + 6))).toBeLessThan(1e-12);
      }
    }
  });

  it('give the same subbands at grid settings 0.5 and 0.4 nm within the two error estimates', () => {
    const band = (grid: number) => solveWireStructure(buildWireStructure(spec(grid), {}), { states: { electron: 2, heavy_hole: 1, light_hole: 0 } }).bands;
    const a = band(0.5);
    const b = band(0.4);
    for (const name of ['electron', 'heavy_hole'] as const) {
      const tol = (a[name].errorEstimate_meV + b[name].errorEstimate_meV) / 1000;
      a[name].states.forEach((s, k) => expect(Math.abs(s.energy_eV - b[name].states[k]!.energy_eV), `${s.label}: ${s.energy_eV} vs ${b[name].states[k]!.energy_eV}, tolerance ${tol}`).toBeLessThanOrEqual(tol));
    }
  });
});
