/**
 * Properties of the whole forward model `solve(spec)` on real and custom-material specs: parity,
 * mirror symmetry, monotonicity in width, the Thomas–Reiche–Kuhn sum rule, the 2-D staircase
 * against the bulk density of states, and sheet-density statistics on solved subbands.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { findTransition, solve, BANDS } from '../../../engine/solve.js';
import type { Spec } from '../../../engine/input/schema.js';
import { dos3d, stepHeight2d } from '../../../engine/observables/dos.js';
import { fermiLevelForSheetDensity, sheetDensity } from '../../../engine/observables/carriers.js';
import { mismatch } from '../../design/check.js';

const alGaAs = (x: number): string => `Al${x}Ga${Number((1 - x).toFixed(3))}As`;
const width = fc.integer({ min: 30, max: 120 }).map((t) => t / 10);
const fraction = fc.integer({ min: 15, max: 40 }).map((t) => t / 100);

const well = (w_nm: number, x: number, temperature = '300 K'): Spec => ({
  substrate: 'GaAs',
  temperature,
  stack: [
    { material: alGaAs(x), thickness: '25 nm' },
    { material: 'GaAs', thickness: `${w_nm} nm` },
    { material: alGaAs(x), thickness: '25 nm' },
  ],
});

/**
 * A custom deep well of parabolic mass m: Ec 0 in the well, `depth` eV in the barrier. The lattice
 * is given because without it every nm thickness of a custom layer is rejected (see the report).
 */
const deepWell = (w_nm: number, depth_eV: number, mass: number, barrier_nm: number): Spec => ({
  materials: {
    W: { Ec: 0, Ev: -1.5, me: mass, mhh: 0.5, mlh: 0.08, lattice: '0.565 nm' },
    B: { Ec: depth_eV, Ev: -1.6, me: mass, mhh: 0.5, mlh: 0.08, lattice: '0.565 nm' },
  },
  temperature: '300 K',
  solver: { nonparabolic: false },
  stack: [
    { material: 'B', thickness: `${barrier_nm} nm` },
    { material: 'W', thickness: `${w_nm} nm` },
    { material: 'B', thickness: `${barrier_nm} nm` },
  ],
});

describe('pipeline properties', () => {
  it('a symmetric stack gives zero e1-hh2 overlap (parity)', () => {
    // Common practice: in a mirror-symmetric well the envelopes have definite parity, so the
    // overlap of states of opposite parity vanishes.
    fc.assert(fc.property(width, fraction, (w, x) => {
      const r = solve(well(w, x));
      const t = findTransition(r, 'e1-hh2');
      if (t === undefined) return true;
      expect(t.overlap2, mismatch(`well ${w} nm, Al ${x}: e1-hh2 overlap²`, t.overlap2, 0, 1e-6)).toBeLessThanOrEqual(1e-6);
      expect(findTransition(r, 'e1-hh1')!.overlap2).toBeGreaterThan(0.5);
      return true;
    }), { numRuns: 20, seed: 11 });
  });

  it('reversing the stack changes no energy', () => {
    // Common practice: the spectrum of H is invariant under z → −z.
    fc.assert(fc.property(width, width, fraction, fc.integer({ min: 0, max: 15 }).map((t) => t / 100), (w1, w2, x, y) => {
      const layers = [
        { material: alGaAs(x), thickness: '20 nm' },
        { material: 'GaAs', thickness: `${w1} nm` },
        { material: alGaAs(Math.max(0.1, x - 0.1)), thickness: '2 nm' },
        { material: y === 0 ? 'GaAs' : alGaAs(y), thickness: `${w2} nm` },
        { material: alGaAs(x), thickness: '20 nm' },
      ];
      const forward = solve({ substrate: 'GaAs', stack: layers });
      const backward = solve({ substrate: 'GaAs', stack: [...layers].reverse() });
      for (const band of BANDS) {
        const a = forward.bands[band].states;
        const b = backward.bands[band].states;
        expect(b.length, `${band}: state counts ${a.length} vs ${b.length}`).toBe(a.length);
        a.forEach((s, i) => {
          const d = Math.abs(s.energy_eV - b[i]!.energy_eV);
          expect(d, mismatch(`${band} ${s.label} of [${w1}, ${w2}] nm, Al ${x}, ${y}`, b[i]!.energy_eV, s.energy_eV, 1e-9)).toBeLessThanOrEqual(1e-9);
        });
      }
      return true;
    }), { numRuns: 15, seed: 12 });
  });

  it('widening a well lowers every confinement energy', () => {
    // Common practice (variational argument): a wider well admits every trial state of the narrower
    // one, so each level's confinement energy falls.
    fc.assert(fc.property(width, fc.integer({ min: 1, max: 20 }).map((t) => t / 10), fraction, (w, dw, x) => {
      const narrow = solve(well(w, x));
      const wide = solve(well(w + dw, x));
      for (const band of BANDS) {
        const a = narrow.bands[band].states;
        const b = wide.bands[band].states;
        expect(b.length).toBeGreaterThanOrEqual(a.length);
        a.forEach((s, i) => {
          expect(b[i]!.confinement_meV, mismatch(`${band} ${s.label}, ${w} → ${w + dw} nm, Al ${x} (meV)`, b[i]!.confinement_meV, s.confinement_meV, 0)).toBeLessThan(s.confinement_meV);
        });
      }
      return true;
    }), { numRuns: 15, seed: 13 });
  });

  it('Thomas–Reiche–Kuhn: Σ_j f_1j over bound states of a deep wide well of constant mass is close to 1', () => {
    // Thomas–Reiche–Kuhn sum rule Σ_j f_ij = 1 for constant mass (common practice). The missing
    // continuum share of a well 10 eV deep with ≥ 10 bound states is below 1 % (f_1j falls as
    // j⁻³ for a square well); tolerance 2 %.
    fc.assert(fc.property(fc.integer({ min: 100, max: 200 }).map((t) => t / 10), fc.integer({ min: 50, max: 100 }).map((t) => t / 1000), (w, m) => {
      const r = solve(deepWell(w, 10, m, 3));
      const f = r.transitions.filter((t) => t.label.startsWith('e1-e')).reduce((s, t) => s + t.oscillator_strength!, 0);
      expect(r.bands.electron.states.length).toBeGreaterThanOrEqual(10);
      expect(Math.abs(f - 1), mismatch(`deep well ${w} nm, m ${m}: Σ f_1j`, f, 1, 0.02)).toBeLessThanOrEqual(0.02);
      return true;
    }), { numRuns: 10, seed: 14 });
  });

  it('the 2-D staircase divided by the width touches the bulk 3-D density of states at each step edge', () => {
    // Common practice: for an infinite well of width L, n m/(πħ²)/L equals g3(E_n) at E_n = n² E_1.
    // A 20 eV deep well has E_n lower by ≈ 2/(κL) relative (κ the barrier decay constant), so
    // g3(E_n) falls short by about 1/(κL) ≤ 1 %; tolerance 3 %. Just below each edge the staircase
    // holds n − 1 steps and lies under the bulk curve.
    fc.assert(fc.property(fc.integer({ min: 200, max: 600 }).map((t) => t / 10), fc.integer({ min: 50, max: 90 }).map((t) => t / 1000), (w, m) => {
      const r = solve({ ...deepWell(w, 20, m, 2), solver: { nonparabolic: false, max_states: 5 } });
      const states = r.bands.electron.states;
      expect(states.length).toBe(5);
      const edge = r.bands.electron.edge_eV;
      const perCm3 = stepHeight2d(m) / (w * 1e-7);
      const bulk = dos3d({ edge_eV: edge, mass: m, energies_eV: states.map((s) => s.energy_eV) });
      states.forEach((s, i) => {
        const n = i + 1;
        expect(s.mass_inplane).toBeCloseTo(m, 12);
        const stair = n * perCm3;
        const rel = Math.abs(stair - bulk[i]!) / bulk[i]!;
        expect(rel, mismatch(`${w} nm, m ${m}: staircase/L at E_${n} (cm⁻³ eV⁻¹)`, stair, bulk[i]!, 0.03 * bulk[i]!)).toBeLessThanOrEqual(0.03);
        expect((n - 1) * perCm3).toBeLessThan(bulk[i]!);
      });
      return true;
    }), { numRuns: 10, seed: 15 });
  });

  it('sheet density of the solved electron subbands is monotone in the Fermi level and the inverse round-trips', () => {
    // n2D = Σ m/(πħ²) kT ln(1 + e^((E_F − E_n)/kT)) is strictly increasing in E_F (common practice);
    // fermiLevelForSheetDensity claims a 1e-12 relative round trip; tolerance 1e-9.
    fc.assert(fc.property(width, fraction, fc.array(fc.double({ min: -0.15, max: 0.15, noNaN: true }), { minLength: 2, maxLength: 6 }), (w, x, offsets) => {
      const r = solve(well(w, x, '77 K'));
      const subbands = r.dos.bands.electron.map((s) => ({ energy: s.edge_eV, mass: s.mass_inplane }));
      const e1 = subbands[0]!.energy;
      const levels = [...offsets].sort((a, b) => a - b).map((d) => e1 + d);
      const n = levels.map((fermiLevel_eV) => sheetDensity({ subbands, fermiLevel_eV, temperature_K: 77 }));
      for (let i = 1; i < n.length; i++) if (levels[i]! > levels[i - 1]!) expect(n[i]!, `n(E_F) at ${levels[i - 1]}, ${levels[i]} eV: ${n[i - 1]}, ${n[i]}`).toBeGreaterThan(n[i - 1]!);
      n.forEach((density_cm2, i) => {
        const back = fermiLevelForSheetDensity({ subbands, density_cm2, temperature_K: 77 });
        const again = sheetDensity({ subbands, fermiLevel_eV: back, temperature_K: 77 });
        expect(Math.abs(again - density_cm2) / density_cm2, mismatch(`E_F ${levels[i]} eV round trip (cm⁻²)`, again, density_cm2, 1e-9 * density_cm2)).toBeLessThanOrEqual(1e-9);
      });
      return true;
    }), { numRuns: 15, seed: 16 });
  });
});
