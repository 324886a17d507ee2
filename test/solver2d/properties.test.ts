import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { solveCrossSection, type CrossSectionGrid } from '../../engine/solver2d.js';
import { expectClose, gridOf } from './helpers.js';

/**
 * Random small cross-sections: a rectangular well (V = 0, mass mw) of random size and place inside
 * a barrier (V0, mass mb) on an nx × ny grid; `mirror` makes it symmetric in x.
 */
const crossSection = fc
  .record({
    nx: fc.integer({ min: 9, max: 21 }),
    ny: fc.integer({ min: 8, max: 18 }),
    h: fc.double({ min: 0.3, max: 1, noNaN: true }),
    V0: fc.double({ min: 0.1, max: 0.5, noNaN: true }),
    mw: fc.double({ min: 0.04, max: 0.1, noNaN: true }),
    mb: fc.double({ min: 0.05, max: 0.2, noNaN: true }),
    fx: fc.tuple(fc.double({ min: 0, max: 0.5, noNaN: true }), fc.double({ min: 0.5, max: 1, noNaN: true })),
    fy: fc.tuple(fc.double({ min: 0, max: 0.5, noNaN: true }), fc.double({ min: 0.5, max: 1, noNaN: true })),
    mirror: fc.boolean(),
  })
  .map((p): CrossSectionGrid => {
    const [xa, xb] = p.mirror ? [Math.min(p.fx[0], 1 - p.fx[1]), 1 - Math.min(p.fx[0], 1 - p.fx[1])] : p.fx;
    return gridOf(p.nx, p.ny, p.h, p.h * 0.9, (i, j) => {
      const u = (i + 0.5) / p.nx;
      const v = (j + 0.5) / p.ny;
      return u >= xa && u <= xb && v >= p.fy[0] && v <= p.fy[1] ? { V: 0, mass: p.mw } : { V: p.V0, mass: p.mb };
    });
  });

const TOL = { tolerance_eV: 1e-10 };

describe('solveCrossSection properties (fast-check, small grids)', () => {
  it('energies ascend and states are orthonormal on the grid: Σψiψj dx dy = δij within 1e-8 (definition)', () => {
    fc.assert(
      fc.property(crossSection, fc.integer({ min: 1, max: 5 }), (g, count) => {
        const r = solveCrossSection(g, count, TOL);
        expect(r.status).toBe('converged');
        for (let k = 1; k < count; k++) expect(r.energies[k] >= r.energies[k - 1], `energies ${r.energies.join(', ')} not ascending`).toBe(true);
        for (let a = 0; a < count; a++) {
          for (let b = 0; b <= a; b++) {
            let s = 0;
            for (let k = 0; k < g.nx * g.ny; k++) s += r.psi[a][k] * r.psi[b][k];
            expectClose(s * g.dx_nm * g.dy_nm, a === b ? 1 : 0, 1e-8, `${g.nx}×${g.ny} ⟨ψ${a}, ψ${b}⟩`);
          }
        }
      }),
      { numRuns: 20, seed: 11 },
    );
  });

  it('shrinking the wire (all lengths × s < 1) raises every level (H(s) = K/s² + V with K positive definite, min-max principle)', () => {
    fc.assert(
      fc.property(crossSection, fc.double({ min: 0.5, max: 0.95, noNaN: true }), (g, s) => {
        const big = solveCrossSection(g, 4, TOL).energies;
        const small = solveCrossSection({ ...g, dx_nm: g.dx_nm * s, dy_nm: g.dy_nm * s }, 4, TOL).energies;
        big.forEach((e, k) => expect(small[k] > e, `level ${k}: ${small[k]} eV after shrink by ${s} not above ${e} eV`).toBe(true));
      }),
      { numRuns: 20, seed: 12 },
    );
  });

  it('a cross-section mirror-symmetric in x gives states of definite parity within 1e-6 (symmetry)', () => {
    fc.assert(
      fc.property(crossSection.filter((g) => isMirror(g)), (g) => {
        const count = 4;
        const r = solveCrossSection(g, count, TOL);
        const mirrored = (v: Float64Array): Float64Array => v.map((_, k) => v[g.nx - 1 - (k % g.nx) + g.nx * Math.floor(k / g.nx)]);
        // Near-degenerate states (gap < 1e-5 eV) may mix: then the pair's span must be mirror-invariant.
        for (let a = 0; a < count; a++) {
          const cluster = r.energies.map((_, b) => b).filter((b) => Math.abs(r.energies[b] - r.energies[a]) < 1e-5);
          const m = mirrored(r.psi[a]);
          const rest = Float64Array.from(m);
          for (const b of cluster) {
            let c = 0;
            for (let k = 0; k < m.length; k++) c += m[k] * r.psi[b][k];
            c *= g.dx_nm * g.dy_nm;
            for (let k = 0; k < m.length; k++) rest[k] -= c * r.psi[b][k];
          }
          const worst = rest.reduce((w, x) => Math.max(w, Math.abs(x)), 0);
          expect(worst <= 1e-6, `${g.nx}×${g.ny} state ${a}: |Mψ − ±ψ| = ${worst}, tolerance 1e-6`).toBe(true);
        }
      }),
      { numRuns: 20, seed: 13 },
    );
  });
});

function isMirror(g: CrossSectionGrid): boolean {
  for (let j = 0; j < g.ny; j++) {
    for (let i = 0; i < g.nx; i++) {
      const k = i + g.nx * j;
      const l = g.nx - 1 - i + g.nx * j;
      if (g.V[k] !== g.V[l] || g.mass[k] !== g.mass[l]) return false;
    }
  }
  return true;
}
