import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { isInputError } from '../../engine/errors.js';
import { sampleCrossSection, solveCrossSection, solveCrossSectionConverged } from '../../engine/solver2d.js';
import { expectClose, gridOf } from './helpers.js';

const M = 0.067;
const box = (lx: number, ly: number) => ({ x0_nm: 0, y0_nm: 0, width_nm: lx, height_nm: ly });
const uniform = () => ({ V: 0, mass: M });

/** Dirichlet-box levels ħ²π²/(2m)(p²/Lx² + q²/Ly²), lowest `count` (closed form). */
function boxLevels(lx: number, ly: number, count: number): number[] {
  const out: number[] = [];
  for (let p = 1; p <= count; p++) for (let q = 1; q <= count; q++) out.push(((HBAR2_OVER_2M0 * Math.PI ** 2) / M) * (p * p / lx ** 2 + (q * q) / ly ** 2));
  return out.sort((a, b) => a - b).slice(0, count);
}

describe('infinite rectangular wire (closed form: Dirichlet box)', () => {
  it('discrete levels equal the 5-point closed form Σ 2c(1 − cos(pπ/(n+1)))/h² exactly, dense and LOBPCG paths', () => {
    // Closed form of the 5-point Dirichlet Laplacian (common practice): eigenvectors are sin products.
    for (const [nx, ny, count] of [[7, 5, 4], [31, 23, 6]] as const) {
      const dx = 0.4;
      const dy = 0.3;
      const levels: number[] = [];
      for (let p = 1; p <= nx; p++) for (let q = 1; q <= ny; q++) {
        levels.push((2 * HBAR2_OVER_2M0 / M) * ((1 - Math.cos((p * Math.PI) / (nx + 1))) / dx ** 2 + (1 - Math.cos((q * Math.PI) / (ny + 1))) / dy ** 2));
      }
      levels.sort((a, b) => a - b);
      const r = solveCrossSection(gridOf(nx, ny, dx, dy, () => ({ V: 0.1, mass: M })), count, { tolerance_eV: 1e-9 });
      expect(r.status).toBe('converged');
      r.energies.forEach((e, k) => expectClose(e, levels[k] + 0.1, 1e-9, `${nx}×${ny} level ${k}`));
    }
  });

  it('10 nm × 14 nm wire: Richardson-extrapolated levels within 0.05 meV of ħ²π²/(2m)(p²/Lx² + q²/Ly²), second order observed', () => {
    const exact = boxLevels(10, 14, 6);
    const r = solveCrossSectionConverged((h) => sampleCrossSection(box(10, 14), h, uniform), 6, { h_nm: 0.5, tolerance_eV: 5e-4 });
    expect(r.extrapolated).toBe(true);
    r.energies.forEach((e, k) => expectClose(e, exact[k], 5e-5, `box level ${k}`));
    // Halving h cuts the error fourfold for a second-order scheme (common practice).
    const e1 = solveCrossSection(sampleCrossSection(box(10, 14), 0.5, uniform), 1).energies[0] - exact[0];
    const e2 = solveCrossSection(sampleCrossSection(box(10, 14), 0.25, uniform), 1).energies[0] - exact[0];
    expectClose(e1 / e2, 4, 0.05, 'error ratio E(h)/E(h/2) for h = 0.5 nm');
  });

  it('square wire: the (1,2) and (2,1) states are degenerate within 1e-6 eV (symmetry of the square)', () => {
    const r = solveCrossSection(sampleCrossSection(box(12, 12), 0.2, uniform), 3, { tolerance_eV: 1e-8 });
    expectClose(r.energies[1], r.energies[2], 1e-6, 'E(1,2) vs E(2,1)');
    expectClose(r.energies[1], boxLevels(12, 12, 2)[1], 5e-4, 'E(1,2) against the closed form');
  });

  it('rejects bad input with an InputError naming the field', () => {
    const g = gridOf(4, 4, 0.5, 0.5, uniform);
    const bad = [
      () => solveCrossSection({ ...g, dx_nm: -1 }, 1),
      () => solveCrossSection({ ...g, mass: new Float64Array(16) }, 1),
      () => solveCrossSection({ ...g, V: new Float64Array(3) }, 1),
      () => solveCrossSection(g, 17),
    ];
    for (const f of bad) {
      let caught: unknown;
      try {
        f();
      } catch (e) {
        caught = e;
      }
      expect(isInputError(caught), String(caught)).toBe(true);
    }
  });
});
