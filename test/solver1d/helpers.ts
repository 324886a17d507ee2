/**
 * Test-only helpers for the 1-D solver: profile builders, an independent bracketed root finder, and
 * a comparison message that prints input, got, expected, difference and tolerance.
 */

import type { BandProfile, OuterRegion, Slice } from '../../engine/profile.js';

export const layer = (width_nm: number, V: number, mass: number, alpha = 0): Slice => ({
  width_nm, V, mass, alpha, massInPlane: mass, layer: 0,
});

export const outer = (V: number, mass: number, alpha = 0): OuterRegion => ({ V, mass, alpha, massInPlane: mass });

export const profileOf = (slices: readonly Slice[], left: OuterRegion, right: OuterRegion = left): BandProfile => ({
  band: 'electron', sign: 1, slices, left, right, openEdge: Math.min(left.V, right.V),
});

/** Slices of a smooth potential V(z) on [z0, z1], at most h wide, each at its midpoint value (midpoint rule). */
export function midpointSlices(V: (z: number) => number, z0: number, z1: number, h: number, mass: number): Slice[] {
  const count = Math.ceil((z1 - z0) / h - 1e-9);
  const w = (z1 - z0) / count;
  const out: Slice[] = [];
  for (let i = 0; i < count; i++) out.push(layer(w, V(z0 + (i + 0.5) * w), mass));
  return out;
}

/** Message for a failed numeric comparison. */
export function message(what: string, input: unknown, got: number, expected: number, tol: number): string {
  return `${what}: input ${JSON.stringify(input)}, got ${got}, expected ${expected}, difference ${got - expected}, tolerance ${tol}`;
}

/** |got − expected| ≤ tol as a boolean, with the message for expect(...). */
export function near(got: number, expected: number, tol: number): boolean {
  return Math.abs(got - expected) <= tol;
}

/**
 * All roots of a continuous f on [a, b]: scan on `n` equal steps for sign changes, then bisect each
 * to 1e-15 relative (plain bisection, independent of the solver's Brent). Sign changes caused by poles
 * must be excluded by the caller's choice of f.
 */
export function rootsOf(f: (x: number) => number, a: number, b: number, n: number): number[] {
  const roots: number[] = [];
  let x0 = a;
  let f0 = f(x0);
  for (let i = 1; i <= n; i++) {
    const x1 = a + ((b - a) * i) / n;
    const f1 = f(x1);
    if (f0 === 0) roots.push(x0);
    else if (f0 * f1 < 0) {
      let lo = x0;
      let hi = x1;
      let flo = f0;
      for (let it = 0; it < 200 && hi - lo > 1e-15 * Math.max(1, Math.abs(lo)); it++) {
        const mid = 0.5 * (lo + hi);
        const fm = f(mid);
        if (fm === 0) { lo = mid; hi = mid; break; }
        if ((fm < 0) === (flo < 0)) { lo = mid; flo = fm; } else hi = mid;
      }
      roots.push(0.5 * (lo + hi));
    }
    x0 = x1;
    f0 = f1;
  }
  return roots;
}

/** Sign changes of a sampled function, ignoring exact zeros. */
export function signChanges(y: Float64Array): number {
  let changes = 0;
  let last = 0;
  for (const v of y) {
    if (v === 0) continue;
    const s = v > 0 ? 1 : -1;
    if (last !== 0 && s !== last) changes++;
    last = s;
  }
  return changes;
}

/** Trapezoid ∫ f g dz on a uniform grid of step dz. */
export function trapezoid(f: Float64Array, g: Float64Array, dz: number): number {
  let s = 0;
  for (let i = 0; i < f.length; i++) s += f[i]! * g[i]! * (i === 0 || i === f.length - 1 ? 0.5 : 1);
  return s * dz;
}

export function uniformGrid(z0: number, z1: number, dz: number): Float64Array {
  const n = Math.round((z1 - z0) / dz) + 1;
  return Float64Array.from({ length: n }, (_, i) => z0 + i * dz);
}
