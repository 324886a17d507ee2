/**
 * Properties of the 1-D solver that hold for every stack (fast-check, seeded).
 */

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 as C } from '../../engine/constants.js';
import { countStatesBelow, solveBand } from '../../engine/solver1d/states.js';
import { wavefunction } from '../../engine/solver1d/wavefunction.js';
import type { BandProfile } from '../../engine/profile.js';
import { reversed, shifted, stackArb, stackWidth } from './arbitraries.js';
import { layer, message, near, outer, profileOf, signChanges, trapezoid, uniformGrid } from './helpers.js';

const RUNS = { numRuns: 25, seed: 7 };

/** A grid reaching far enough into both outer regions that the least-bound state has decayed by e^{-30}. */
function gridFor(p: BandProfile, eTop: number, dz: number): Float64Array {
  const kL = Math.sqrt((p.left.mass * (p.left.V - eTop)) / C);
  const kR = Math.sqrt((p.right.mass * (p.right.V - eTop)) / C);
  return uniformGrid(-15 / kL, stackWidth(p) + 15 / kR, dz);
}

describe('spectrum properties', () => {
  it('energies strictly increase, lie in (min V, barrier), and state n has n − 1 nodes', () => {
    fc.assert(fc.property(stackArb({ maxLayers: 6 }), (p) => {
      const s = solveBand(p);
      const vmin = Math.min(p.left.V, p.right.V, ...p.slices.map((x) => x.V));
      s.states.forEach((st, k) => {
        expect(st.index).toBe(k + 1);
        expect(st.nodes).toBe(k);
        expect(st.energy).toBeGreaterThan(vmin);
        expect(st.energy).toBeLessThan(s.barrier);
        if (k > 0) expect(st.energy, message(`E${k + 1} > E${k}`, p, st.energy, s.states[k - 1]!.energy, 0)).toBeGreaterThan(s.states[k - 1]!.energy);
      });
    }), RUNS);
  });

  it('reversing the stack changes no energy (within 1e-10 eV)', () => {
    fc.assert(fc.property(stackArb({ maxLayers: 6 }), (p) => {
      const a = solveBand(p).states;
      const b = solveBand(reversed(p)).states;
      expect(b.length).toBe(a.length);
      a.forEach((st, k) => expect(near(b[k]!.energy, st.energy, 1e-10), message(`E${k + 1} reversed`, p, b[k]!.energy, st.energy, 1e-10)).toBe(true));
    }), RUNS);
  });

  it('a constant offset of every potential shifts every level by the offset (within 1e-10 eV)', () => {
    fc.assert(fc.property(stackArb({ maxLayers: 5 }), fc.double({ min: -2, max: 2, noNaN: true }), (p, dV) => {
      const a = solveBand(p).states;
      const b = solveBand(shifted(p, dV)).states;
      expect(b.length).toBe(a.length);
      a.forEach((st, k) => expect(near(b[k]!.energy - dV, st.energy, 1e-10), message(`E${k + 1} shifted`, { dV }, b[k]!.energy - dV, st.energy, 1e-10)).toBe(true));
    }), RUNS);
  });

  it('widening a single well lowers every level and never loses a state', () => {
    const arb = fc.record({
      w: fc.double({ min: 1, max: 15, noNaN: true }),
      dw: fc.double({ min: 0.05, max: 5, noNaN: true }),
      V0: fc.double({ min: 0.05, max: 0.5, noNaN: true }),
      mw: fc.double({ min: 0.04, max: 0.5, noNaN: true }),
      mb: fc.double({ min: 0.04, max: 0.5, noNaN: true }),
    });
    fc.assert(fc.property(arb, ({ w, dw, V0, mw, mb }) => {
      const narrow = solveBand(profileOf([layer(w, 0, mw)], outer(V0, mb))).states;
      const wide = solveBand(profileOf([layer(w + dw, 0, mw)], outer(V0, mb))).states;
      expect(wide.length).toBeGreaterThanOrEqual(narrow.length);
      narrow.forEach((st, k) => expect(wide[k]!.energy, message(`E${k + 1} wider`, { w, dw }, wide[k]!.energy, st.energy, 0)).toBeLessThan(st.energy));
    }), RUNS);
  });

  it('countStatesBelow is monotone in E and equals the number of solved levels below E', () => {
    fc.assert(fc.property(stackArb({ maxLayers: 5 }), fc.double({ min: -0.1, max: 0.6, noNaN: true }), fc.double({ min: 0, max: 0.3, noNaN: true }),
      (p, e1, de) => {
        const levels = solveBand(p).states.map((s) => s.energy);
        const n1 = countStatesBelow(p, e1);
        const n2 = countStatesBelow(p, e1 + de);
        expect(n2).toBeGreaterThanOrEqual(n1);
        expect(n1, message('N(E) vs levels below E', { e1 }, n1, levels.filter((e) => e < e1).length, 0)).toBe(levels.filter((e) => e < e1).length);
      }), RUNS);
  });
});

describe('wavefunction properties', () => {
  it('ψ_n has n − 1 sign changes, is normalised (trapezoid on a 0.01 nm grid within 1e-5) and ψ > 0 on the left tail', () => {
    fc.assert(fc.property(stackArb({ maxLayers: 5 }), (p) => {
      const states = solveBand(p).states.filter((s) => s.energy < Math.min(p.left.V, p.right.V) - 0.005);
      if (states.length === 0) return;
      const dz = 0.01;
      const z = gridFor(p, states[states.length - 1]!.energy, dz);
      for (const st of states) {
        const psi = wavefunction(p, st.energy, z);
        expect(signChanges(psi), message(`sign changes of ψ${st.index}`, p, signChanges(psi), st.nodes, 0)).toBe(st.nodes);
        const norm = trapezoid(psi, psi, dz);
        expect(near(norm, 1, 1e-5), message(`∫ψ${st.index}²`, p, norm, 1, 1e-5)).toBe(true);
        expect(psi[0]!).toBeGreaterThan(0);
      }
    }), { numRuns: 15, seed: 11, endOnFailure: true });
  });

  it('states are orthogonal in plain ∫ψiψj dz, with constant mass and with mass steps (within 1e-5)', () => {
    // The operator −d/dz (1/m) d/dz + V is symmetric with unit weight, so eigenfunctions of distinct
    // eigenvalues are orthogonal in the plain inner product (common practice; BenDaniel and Duke 1966).
    const arb = fc.boolean().chain((constant) =>
      stackArb(constant ? { maxLayers: 5, constantMass: 0.067 } : { maxLayers: 5 }).map((p) => ({ constant, p })));
    fc.assert(fc.property(arb, ({ constant, p }) => {
      const states = solveBand(p).states.filter((s) => s.energy < Math.min(p.left.V, p.right.V) - 0.005);
      if (states.length < 2) return;
      const dz = 0.01;
      const z = gridFor(p, states[states.length - 1]!.energy, dz);
      const psis = states.map((s) => wavefunction(p, s.energy, z));
      for (let i = 0; i < psis.length; i++) {
        for (let j = i + 1; j < psis.length; j++) {
          const o = trapezoid(psis[i]!, psis[j]!, dz);
          expect(near(o, 0, 1e-5), message(`∫ψ${i + 1}ψ${j + 1}`, { constant }, o, 0, 1e-5)).toBe(true);
        }
      }
    }), { numRuns: 15, seed: 13, endOnFailure: true });
  });

  it('the ground state of a square well is cos(kz)/tails with the closed-form normalisation (within 1e-9)', () => {
    // Even state of a well |z| < L/2: ψ = A cos kz inside, A cos(kL/2) e^{−κ(|z|−L/2)} outside;
    // A² [L/2 + sin(kL)/(2k) + cos²(kL/2)/κ] = 1 (common practice).
    const [L, V0, mw, mb] = [8, 0.3, 0.067, 0.092];
    const p = profileOf([layer(L, 0, mw)], outer(V0, mb));
    const E = solveBand(p).states[0]!.energy;
    const k = Math.sqrt((mw * E) / C);
    const kap = Math.sqrt((mb * (V0 - E)) / C);
    const A = 1 / Math.sqrt(L / 2 + Math.sin(k * L) / (2 * k) + Math.cos((k * L) / 2) ** 2 / kap);
    const z = Float64Array.from([-5, -1, 0, 1.3, 4, 6.5, 8, 12]);
    const psi = wavefunction(p, E, z);
    z.forEach((zz, i) => {
      const c = zz - L / 2;
      const expected = Math.abs(c) <= L / 2 ? A * Math.cos(k * c) : A * Math.cos((k * L) / 2) * Math.exp(-kap * (Math.abs(c) - L / 2));
      expect(near(psi[i]!, expected, 1e-9), message(`ψ1(${zz})`, { L }, psi[i]!, expected, 1e-9)).toBe(true);
    });
  });

  it('on a uniform grid (stepped by the addition theorems) ψ equals its direct evaluation within 1e-12 of max |ψ| (property)', () => {
    fc.assert(fc.property(stackArb({ maxLayers: 5 }), (p) => {
      const states = solveBand(p).states;
      if (states.length === 0) return;
      const z = gridFor(p, states[states.length - 1]!.energy, 0.01);
      // Nudging the last point makes the grid non-uniform: every point is then evaluated directly.
      const nudged = Float64Array.from(z);
      nudged[nudged.length - 1]! += 1e-3;
      for (const st of states) {
        const fast = wavefunction(p, st.energy, z);
        const direct = wavefunction(p, st.energy, nudged);
        const scale = Math.max(...fast.map(Math.abs));
        let worst = 0;
        for (let g = 0; g < z.length - 1; g++) worst = Math.max(worst, Math.abs(fast[g]! - direct[g]!));
        expect(worst / scale, message(`max |ψ${st.index} stepped − direct| / max |ψ|`, p, worst / scale, 0, 1e-12)).toBeLessThan(1e-12);
      }
    }), { numRuns: 20, seed: 17, endOnFailure: true });
  });

  it('a slice whose potential lies within 1e-13 eV of the state energy gives ψ within 1e-11 of the flat-slice ψ (E = V: ψ″ = 0), both grids', () => {
    // An asymmetric well (so ψ has a slope in the middle slice) whose middle slice's V is moved onto
    // the ground-state energy by fixed-point iteration, then moved off by dV, which changes ψ by
    // about dV/(energy scale) only. Amplitude–phase or exponential forms with k or κ ~ √dV lose
    // ~ε/(kL) to cancellation (1.5e-7 of max |ψ| here at dV = 1e-16 eV before the near-flat form).
    const withMiddle = (v: number) => profileOf([layer(3, 0, 0.067), layer(4, v, 0.067), layer(2, 0.01, 0.07)], outer(0.3, 0.09));
    let v = 0.02;
    for (let it = 0; it < 60; it++) v = solveBand(withMiddle(v)).states[0]!.energy;
    const z = uniformGrid(-2, 12, 0.01);
    for (const grid of [z, Float64Array.from(z, (x, g) => x + (g % 2) * 1e-7)]) {
      const flat = wavefunction(withMiddle(v), v, grid);
      const scale = Math.max(...flat.map(Math.abs));
      for (const dV of [1e-16, -1e-16, 1e-14, -1e-14, 1e-13]) {
        const psi = wavefunction(withMiddle(v + dV), v, grid);
        let worst = 0;
        for (let g = 0; g < grid.length; g++) worst = Math.max(worst, Math.abs(psi[g]! - flat[g]!));
        expect(worst / scale, message('max |ψ(V = E + dV) − ψ(V = E)| / max |ψ|', { dV, uniform: grid === z }, worst / scale, 0, 1e-11)).toBeLessThan(1e-11);
      }
    }
  });

  it('a state behind thick barriers (κL ≈ 60 per slice) is still normalised and finite', () => {
    const p = profileOf([layer(40, 1.0, 0.1), layer(6, 0, 0.067), layer(40, 1.0, 0.1)], outer(1.0, 0.1));
    const s = solveBand(p).states;
    expect(s.length).toBeGreaterThan(0);
    const dz = 0.005;
    const z = uniformGrid(30, 56, dz);
    for (const st of s) {
      const psi = wavefunction(p, st.energy, z);
      const norm = trapezoid(psi, psi, dz);
      expect(psi.every(Number.isFinite)).toBe(true);
      expect(near(norm, 1, 1e-5), message(`∫ψ${st.index}²`, {}, norm, 1, 1e-5)).toBe(true);
      expect(signChanges(psi)).toBe(st.nodes);
    }
  });
});
