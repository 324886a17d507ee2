/**
 * Design round trip on the absorption peak (acceptance: "design on an absorption-peak target
 * round-trips as the transition targets do"): the absorption peak of a random doped detector well
 * becomes the target, and the project's bounded Nelder–Mead (engine/design/neldermead.ts) over the
 * well width, scoring the absorption_peak objective on the self-consistent solve, must land in the
 * window. The design command runs the same objective on the same solve once the doping keys are in
 * the spec schema (test/poisson/integration.test.ts).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { settingsOf } from '../../engine/solve.js';
import { resolveDoping } from '../../engine/poisson/doping.js';
import { dopedOptionsOf, solveDopedStructure, type DopedOptions } from '../../engine/poisson/doped.js';
import { minimize } from '../../engine/design/neldermead.js';
import { absorptionPeakObjective } from '../../objectives/absorption-peak.js';

const text = `
substrate: GaAs
temperature: 77 K
solver: { valence: parabolic }
vary:
  w: { from: 3.5 nm, to: 7 nm }
stack:
  - { material: Al0.25Ga0.75As, thickness: 30 nm }
  - { material: GaAs, thickness: w }
  - { material: Al0.25Ga0.75As, thickness: 30 nm }
`;
const spec = parseSpecText(text, 'roundtrip.yaml').spec;
const settings = settingsOf(spec);
const base = dopedOptionsOf(spec, settings);
// A short box and range keep each evaluation at a few tens of ms; the window is what the search must meet.
const options: DopedOptions = { ...base, absorption: { ...base.absorption!, continuum_nm: 60, range_eV: 0.15 } };

function peak_um(w: number): number {
  const s = buildStructure(spec, { w });
  const r = solveDopedStructure(s, resolveDoping({ layers: [undefined, { donors: '5e17 cm-3' }, undefined] }, s), settings, options, { wavefunctions: false, states: { heavy_hole: 0, light_hole: 0 } });
  return absorptionPeakObjective.evaluate({ absorption_peak: '9 µm', within: '1 µm' }, r).achieved!;
}

describe('design round trip on absorption_peak', () => {
  it('three random widths: their absorption peak (± 0.1 µm) is found again from the box centre', () => {
    const widths = fc.sample(fc.integer({ min: 40, max: 65 }).map((t) => t / 10), { numRuns: 3, seed: 15 });
    for (const w of widths) {
      const goal = peak_um(w);
      const target = { absorption_peak: `${goal} µm`, within: '0.1 µm' };
      const loss = (x: readonly number[]): number => {
        const s = buildStructure(spec, { w: x[0]! });
        const r = solveDopedStructure(s, resolveDoping({ layers: [undefined, { donors: '5e17 cm-3' }, undefined] }, s), settings, options, { wavefunctions: false, states: { heavy_hole: 0, light_hole: 0 } });
        return absorptionPeakObjective.evaluate(target, r).residual ** 2;
      };
      const found = minimize(loss, [5.25], { bounds: [[3.5, 7]], maxEvaluations: 40, xTolerance: 1e-3, fTolerance: 1e-4, stopValue: 0.25 });
      expect(found.f, `width ${w} nm → peak ${goal.toFixed(3)} µm; found w = ${found.x[0]} after ${found.evaluations} evaluations`).toBeLessThanOrEqual(1);
      expect(Math.abs(peak_um(found.x[0]!) - goal)).toBeLessThanOrEqual(0.1);
    }
  }, 60_000);
});
