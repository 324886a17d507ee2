import { describe, expect, it } from 'vitest';
import fixture from '../reference/valence/valence_fem.json' with { type: 'json' };
import { valenceSubbands, type ValenceResult } from '../../engine/valence/dispersion.js';
import { valenceProfile } from '../../engine/valence/profile.js';
import { expectWithin, well } from './helpers.js';

/**
 * Against the independent P2 finite-element solver test/reference/valence/fem_subbands.py (its
 * generator valence_fixture.py holds the layer parameters; walls at the ends of the 40 nm barriers,
 * as here with outer_nm = 0). The criterion: within 0.5 meV for k∥ ≤ 0.8 1/nm.
 */
type Structure = (typeof fixture.structures)[number];

const structureOf = (s: Structure) => well(s.barrier, s.well, s.width_nm, 40, fixture.temperature_K);

function ours(s: Structure, model: 'kp4' | 'kp6'): ValenceResult {
  const k = s.k_per_nm;
  return valenceSubbands(structureOf(s), { model, outer_nm: 0, kPoints: k.length, kMax_per_nm: k[k.length - 1]!, subbands: 4, bothBlocks: true });
}

/** The 8 highest states at point i of a direction, highest first (both branches of 4 subbands). */
const statesAt = (r: ValenceResult, direction: number, i: number): number[] =>
  r.directions[direction]!.subbands.flatMap((sb) => [sb.energy_eV[0][i]!, sb.energy_eV[1][i]!]).sort((a, b) => b - a);

describe('valence subbands against an independent finite-element calculation (valence_fem.json)', () => {
  for (const s of fixture.structures.slice(0, 2)) {
    it(`${s.name}: the product resolves the fixture's layer parameters`, () => {
      const p = valenceProfile(structureOf(s), { model: 'kp6', maxSlice_nm: 0.25, outer_nm: 0 });
      p.slices.forEach((slice, i) => {
        const want = s.layers[i]!;
        expectWithin(slice.width_nm, want.thickness_nm, 1e-12, `layer ${i} width`);
        for (const key of ['Ehh', 'Elh', 'gamma1', 'gamma2', 'gamma3', 'Dso', 'Qe'] as const) expectWithin(slice.point[key], want[key], 1e-12 * (1 + Math.abs(want[key])), `layer ${i} ${key}`);
      });
    });
    for (const model of ['kp4', 'kp6'] as const) {
      it(`${s.name}, ${model}: 4 subbands along [100] and [110] within 0.5 meV up to 0.8 1/nm`, () => {
        const r = ours(s, model);
        let worst = 0;
        for (const run of s.runs.filter((x) => x.model === model)) {
          const d = run.angle_deg === 0 ? 0 : 1;
          run.energies_eV.forEach((ref, i) => {
            const mine = statesAt(r, d, i);
            ref.forEach((e, j) => {
              worst = Math.max(worst, Math.abs(mine[j]! - e));
              expectWithin(mine[j]!, e, 5e-4, `${model} ${run.angle_deg}° k = ${s.k_per_nm[i]} state ${j + 1}`);
            });
          });
        }
        // The box scheme at the default 0.25 nm is second order: well inside the criterion.
        expect(worst).toBeLessThan(5e-4);
      });
    }
  }
});

/** Extremum of y on a uniform grid, refined by the parabola through the best point and its neighbours. */
function extremum(x: readonly number[], y: readonly number[], sign: 1 | -1): { x: number; y: number } {
  let best = 1;
  for (let i = 1; i < y.length - 1; i++) if (sign * y[i]! > sign * y[best]!) best = i;
  const [a, b, c] = [y[best - 1]!, y[best]!, y[best + 1]!];
  const h = x[1]! - x[0]!;
  const t = (0.5 * (a - c)) / (a - 2 * b + c);
  return { x: x[best]! + t * h, y: b - 0.25 * (a - c) * t };
}

describe('anticrossings of a 10 nm GaAs/Al0.3Ga0.7As well (kp4) where the finite-element calculation puts them', () => {
  // With these parameters lh1 stays above hh2 at k∥ = 0 (8.4 meV); their k·p coupling (∝ γ3 k∥ k_z)
  // pushes lh1 up into an electron-like hump and on towards hh1, with which it anticrosses, and drives
  // hh3 up into its anticrossing with hh2. Checked: the lh1 hump (its top and where), and the smallest
  // hh1–lh1 and hh2–hh3 separations with their k, along [100] and [110].
  const s = fixture.structures[2]!;
  const r = ours(s, 'kp4');
  for (const run of s.runs) {
    const d = run.angle_deg === 0 ? 0 : 1;
    const features = (states: (i: number) => number[]) => {
      const E = (j: number) => s.k_per_nm.map((_, i) => states(i)[2 * j]!);
      return {
        hump: extremum(s.k_per_nm, E(1), 1),
        hh1lh1: extremum(s.k_per_nm, s.k_per_nm.map((_, i) => E(0)[i]! - E(1)[i]!), -1),
        hh2hh3: extremum(s.k_per_nm, s.k_per_nm.map((_, i) => E(2)[i]! - E(3)[i]!), -1),
      };
    };
    const mine = features((i) => statesAt(r, d, i));
    const ref = features((i) => run.energies_eV[i]!);
    it(`${run.angle_deg === 0 ? '[100]' : '[110]'}: positions within 0.01 1/nm, energies and gaps within 0.2 meV`, () => {
      for (const key of ['hump', 'hh1lh1', 'hh2hh3'] as const) {
        expectWithin(mine[key].x, ref[key].x, 0.01, `${key} k`);
        expectWithin(mine[key].y, ref[key].y, 2e-4, `${key} energy or gap`);
      }
      // They are anticrossings: the gap has an interior minimum, well above zero.
      expect(ref.hh1lh1.y).toBeGreaterThan(1e-3);
      expect(ref.hh2hh3.x).toBeGreaterThan(0.05);
    });
  }
});
