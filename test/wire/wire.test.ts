import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { solveWire } from '../../engine/wire/solve.js';
import { wireFermiLevel, wireLineDensity } from '../../engine/wire/carriers.js';
import { dos1d } from '../../engine/observables/dos.js';
import fixture from '../reference/solver2d/circular_wire.json' with { type: 'json' };
import { customWire, expectClose, finiteWellGround } from './helpers.js';

const V0 = 0.2;
const M = 0.067;

describe('rectangular wire', () => {
  it('a wide rectangle approaches the 1-D well level plus the lateral finite-well term', () => {
    // Closed form: separable limit E ≈ E_well(h) + E_well(W), each the BenDaniel–Duke finite-well
    // ground level (equal masses, so the corner regions, where the separable form is wrong, carry
    // little weight when W ≫ h; common practice, Marcatili-type approximation).
    const W = 30;
    const h = 6;
    const r = solveWire(customWire(`{ kind: rectangle, material: W, width: ${W} nm, height: ${h} nm }`, { V0, mw: M, mb: M, extra: '  grid: 1 nm\n  margin: 6 nm\n  states: 1\n  tolerance: 1 meV' }));
    const expected = finiteWellGround(h, V0, M, M) + finiteWellGround(W, V0, M, M);
    expectClose(r.bands.electron.states[0]!.energy_eV, expected, 1.5e-3, `${W} × ${h} nm wire, V0 ${V0} eV, m ${M}`);
  });
});

describe('circular core wire (fixture test/reference/solver2d/circular_wire.json: exact Bessel matching)', () => {
  it('lowest levels within 0.5 meV through the spec path', () => {
    const r = solveWire(customWire(`{ kind: circle, material: W, radius: ${fixture.radius_nm} nm }`, {
      V0: fixture.V_barrier_eV, mw: fixture.mass_well, mb: fixture.mass_barrier, extra: '  grid: 0.5 nm\n  margin: 8 nm\n  states: 3',
    }));
    // l = 0 ground level, then the twofold l = 1 level.
    const expected = [fixture.states.find((s) => s.l === 0 && s.n === 1)!.E_eV, ...Array(2).fill(fixture.states.find((s) => s.l === 1 && s.n === 1)!.E_eV) as number[]];
    const got = r.bands.electron.states.map((s) => s.energy_eV);
    expected.forEach((e, k) => expectClose(got[k]!, e, 5e-4, `disc r = ${fixture.radius_nm} nm, level ${k}`));
  });
});

describe('T-shaped wire', () => {
  it('the junction ground state lies below both parent wells (common practice)', () => {
    const r = solveWire(customWire('{ kind: t-shape, stem: { material: W, width: 5 nm, length: 16 nm }, arm: { material: W, width: 6 nm, length: 30 nm } }', {
      V0, mw: M, mb: M, extra: '  grid: 1 nm\n  margin: 5 nm\n  states: 1\n  tolerance: 1 meV',
    }));
    const e1 = r.bands.electron.states[0]!.energy_eV;
    for (const w of [5, 6]) {
      const parent = finiteWellGround(w, V0, M, M);
      expect(e1 < parent - 1e-3, `T-wire e1 ${e1} eV vs ${w} nm parent well ${parent} eV (closed form), margin 1 meV`).toBe(true);
    }
  });
});

describe('1-D density of states and line density of a wire', () => {
  const r = solveWire(customWire('{ kind: rectangle, material: W, width: 12 nm, height: 8 nm }', { V0, mw: M, mb: 0.09, extra: '  grid: 1 nm\n  margin: 5 nm\n  states: 3\n  tolerance: 2 meV' }));
  const states = r.bands.electron.states;

  it('has the JSON shape of a well result where the two agree, with dos.dimension 1', () => {
    expect(r.dos.dimension).toBe(1);
    expect(states.length).toBeGreaterThanOrEqual(2);
    expect(r.dos.bands.electron.map((d) => d.edge_eV)).toEqual(states.map((s) => s.energy_eV));
    expect(r.maps.psi2.electron).toHaveLength(states.length);
  });

  it('∫ g1 over [E1, E1 + Δ] of one subband equals 2√(2mΔ)/(πħ) (closed form)', () => {
    const s = states[0]!;
    for (const delta of [1e-3, 0.01, 0.05]) {
      // Substituting E = E1 + t² removes the edge singularity: ∫ g dE = ∫0^√Δ 2t g(E1 + t²) dt (midpoint rule).
      const n = 2000;
      const dt = Math.sqrt(delta) / n;
      const t = Array.from({ length: n }, (_, k) => (k + 0.5) * dt);
      const g = dos1d({ subbands: [{ energy: s.energy_eV, mass: s.mass_axis }], energies_eV: t.map((x) => s.energy_eV + x * x) });
      const integral = g.reduce((acc, v, k) => acc + 2 * t[k]! * v * dt, 0);
      const closed = ((2 * Math.sqrt((s.mass_axis * delta) / HBAR2_OVER_2M0)) / Math.PI) * 1e7;
      expectClose(integral, closed, 1e-9 * closed, `Δ = ${delta} eV, m = ${s.mass_axis}`);
      expectClose(r.dos.bands.electron[0]!.prefactor_per_cm_per_sqrt_eV * 2 * Math.sqrt(delta), closed, 1e-9 * closed, `prefactor, Δ = ${delta} eV`);
    }
  });

  it('line density rises with the Fermi level and round-trips (fast-check)', () => {
    const e1 = states[0]!.energy_eV;
    fc.assert(fc.property(fc.double({ min: -0.2, max: 0.1, noNaN: true }), fc.double({ min: 1e-4, max: 0.05, noNaN: true }), (offset, step) => {
      const ef = e1 + offset;
      const n = wireLineDensity(r, 'electron', ef);
      const higher = wireLineDensity(r, 'electron', ef + step);
      expect(higher > n, `n(${ef + step}) = ${higher} should exceed n(${ef}) = ${n}`).toBe(true);
      expectClose(wireFermiLevel(r, 'electron', n), ef, 1e-9, `round trip at E_F = ${ef} eV, n = ${n} cm⁻¹`);
    }), { numRuns: 50, seed: 7 });
  });
});

describe('shrinking a wire', () => {
  it('raises every bound level (fast-check, few runs on coarse grids)', () => {
    fc.assert(fc.property(fc.double({ min: 8, max: 14, noNaN: true }), fc.double({ min: 5, max: 8, noNaN: true }), (w, h) => {
      const at = (s: number) => solveWire(customWire(`{ kind: rectangle, material: W, width: ${(w * s).toFixed(3)} nm, height: ${(h * s).toFixed(3)} nm }`, {
        V0, mw: M, mb: M, extra: '  grid: 1 nm\n  margin: 4 nm\n  states: 2\n  tolerance: 2 meV',
      })).bands.electron.states.map((x) => x.energy_eV);
      const big = at(1);
      const small = at(0.8);
      small.forEach((e, k) => expect(e > big[k]!, `${w}×${h} nm scaled 0.8: level ${k} got ${e}, expected above ${big[k]}`).toBe(true));
    }), { numRuns: 3, seed: 11 });
  });
});
