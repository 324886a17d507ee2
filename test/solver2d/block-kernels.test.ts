/**
 * The four-vector kernels the wire solver uses for speed give exactly what the one-vector forms
 * give (a definition of correctness for a reordering of loops): the 5-point operator on a block of
 * columns equals applyStencil column by column bit for bit, and one V-cycle of the multigrid on a
 * block equals the V-cycles of its columns taken alone, also in place (x the same arrays as b).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { CrossSectionGrid } from '../../engine/solver2d.js';
import { buildMultigrid } from '../../engine/solver2d/multigrid.js';
import { applyStencil, applyStencilColumns, buildOperator } from '../../engine/solver2d/operator.js';
import { gridOf } from './helpers.js';

const grid = fc.record({ nx: fc.integer({ min: 3, max: 40 }), ny: fc.integer({ min: 3, max: 40 }), h: fc.double({ min: 0.2, max: 1, noNaN: true }), seed: fc.integer({ min: 1, max: 1e6 }) })
  .map(({ nx, ny, h, seed }): CrossSectionGrid => {
    const r = (k: number): number => Math.abs(Math.sin(seed * 12.9898 + k * 78.233)) % 1;
    const base = gridOf(nx, ny, h, 0.9 * h, (i, j) => ({ V: 0.3 * r(i + nx * j), mass: 0.05 + 0.3 * r(i + nx * j + 7) }));
    return { ...base, massY: Float64Array.from({ length: nx * ny }, (_, k) => 0.05 + 0.4 * r(k + 13)) };
  });

const columns = (n: number, count: number, salt: number): Float64Array[] =>
  Array.from({ length: count }, (_, c) => Float64Array.from({ length: n }, (_, k) => Math.sin(0.37 * k * (c + 1) + salt) + 0.1 * c));

describe('four-vector kernels of the wire solver', () => {
  it('applyStencilColumns equals applyStencil on each column, bit for bit, for 1 to 9 columns', () => {
    fc.assert(fc.property(grid, fc.integer({ min: 1, max: 9 }), (g, count) => {
      const op = buildOperator(g, 0.01, 0.05);
      const xs = columns(g.nx * g.ny, count, g.nx);
      const block = xs.map((x) => new Float64Array(x.length));
      applyStencilColumns(op, xs, block);
      xs.forEach((x, c) => {
        const one = new Float64Array(x.length);
        applyStencil(op, x, one);
        expect(Array.from(block[c]!)).toEqual(Array.from(one));
      });
    }), { numRuns: 40, seed: 18 });
  });

  it('a block V-cycle equals the V-cycles of its columns alone, bit for bit, in place or not', () => {
    fc.assert(fc.property(grid, fc.integer({ min: 1, max: 9 }), (g, count) => {
      const mg = buildMultigrid(buildOperator(g, 0.01, 0.05));
      const bs = columns(g.nx * g.ny, count, g.ny);
      const block = bs.map((b) => new Float64Array(b.length));
      mg.apply(bs, block);
      const inPlace = bs.map((b) => Float64Array.from(b));
      mg.apply(inPlace, inPlace);
      bs.forEach((b, c) => {
        const one = [new Float64Array(b.length)];
        mg.apply([b], one);
        expect(Array.from(block[c]!)).toEqual(Array.from(one[0]!));
        expect(Array.from(inPlace[c]!)).toEqual(Array.from(one[0]!));
      });
    }), { numRuns: 30, seed: 19 });
  });
});
