/** Shared helpers of the cross-section solver tests. */
import { expect } from 'vitest';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import type { CrossSectionGrid } from '../../engine/solver2d.js';

/** Asserts |got − expected| ≤ tolerance with a message carrying input, got, expected, difference and tolerance. */
export function expectClose(got: number, expected: number, tolerance: number, input: string): void {
  const difference = got - expected;
  expect(
    Math.abs(difference) <= tolerance,
    `${input}: got ${got}, expected ${expected}, difference ${difference.toExponential(3)}, tolerance ${tolerance}`,
  ).toBe(true);
}

/** A uniform grid over a box with the walls at its edges; V and mass from a node function. */
export function gridOf(
  nx: number,
  ny: number,
  dx: number,
  dy: number,
  node: (i: number, j: number) => { V: number; mass: number },
): CrossSectionGrid {
  const V = new Float64Array(nx * ny);
  const mass = new Float64Array(nx * ny);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const p = node(i, j);
      V[i + nx * j] = p.V;
      mass[i + nx * j] = p.mass;
    }
  }
  return { nx, ny, dx_nm: dx, dy_nm: dy, x0_nm: dx, y0_nm: dy, V, mass };
}

/**
 * Lowest even-parity level (eV) of a 1-D finite square well of width L (nm), depth V0 (eV), well
 * mass mw and barrier mass mb (m0): root of the BenDaniel–Duke matching (k/mw) tan(kL/2) = κ/mb,
 * k = √(mw E/c), κ = √(mb (V0 − E)/c), c = ħ²/2m0 (G. Bastard, Wave Mechanics Applied to
 * Semiconductor Heterostructures (1988), ch. II), bracketed on (0, min(V0, first pole)) and bisected.
 */
export function finiteWellGround(L: number, V0: number, mw: number, mb: number): number {
  const f = (E: number): number => {
    const k = Math.sqrt((mw * E) / HBAR2_OVER_2M0);
    const kappa = Math.sqrt((mb * (V0 - E)) / HBAR2_OVER_2M0);
    return (k / mw) * Math.tan((k * L) / 2) - kappa / mb;
  };
  // tan(kL/2) reaches its first pole at kL/2 = π/2.
  const pole = (HBAR2_OVER_2M0 * (Math.PI / L) ** 2) / mw;
  let lo = 1e-12;
  let hi = Math.min(V0, pole) * (1 - 1e-12);
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) > 0) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}
