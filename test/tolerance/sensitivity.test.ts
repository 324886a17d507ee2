import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { nominalVariables } from '../../engine/structure.js';
import { measure, prepareTolerance } from '../../engine/tolerance/measure.js';
import { sensitivities } from '../../engine/tolerance/sensitivity.js';
import { expectClose } from '../observables/close.js';
import { deepWell } from './specs.js';

const ML_NM = 0.25;
/** κ = √(V/(ħ²/2m)) for the 50 eV, 1 m0 barrier of deepWell (nm⁻¹). */
const KAPPA = Math.sqrt(50 / HBAR2_OVER_2M0);

const wellShift = (widthML: number): { minus: number; plus: number } => {
  const spec = deepWell(widthML);
  const problem = prepareTolerance(spec, nominalVariables(spec));
  const row = sensitivities(problem, measure(problem)).find((s) => s.kind === 'thickness' && s.layer === 1)!;
  // Quantity 0 is the e1 subband-edge target (meV).
  return { minus: row.minus[0]!, plus: row.plus[0]! };
};

describe('±1 ML sensitivities of a deep square well', () => {
  it('a wider well lowers e1 and a narrower one raises it (closed form: E1 = ħ²π²/(2mL²) falls with L; common practice)', () => {
    const s = wellShift(20);
    expect(s.plus < 0, `20 ML well, +1 ML: got Δe1 ${s.plus} meV, expected < 0`).toBe(true);
    expect(s.minus > 0, `20 ML well, −1 ML: got Δe1 ${s.minus} meV, expected > 0`).toBe(true);
  });

  it('the ±1 ML shift of e1 follows the infinite-well law dE/dL = −2E/L, i.e. ∝ 1/L³ (property over widths)', () => {
    // Closed form (infinite well, E = C/L², C = π²ħ²/(2m)): E(L−a) − E(L+a) = C[1/(L−a)² − 1/(L+a)²].
    // The 50 eV well acts as an infinite well of width L + 2/κ (2/κ ≈ 0.055 nm), so the cube law is
    // off by about 6/(κL) (≤ 5.5 % at 3 nm); tolerance 8/(κL) covers that and nothing more.
    const C = HBAR2_OVER_2M0 * Math.PI ** 2 * 1000;
    fc.assert(fc.property(fc.integer({ min: 12, max: 60 }), (ml) => {
      const L = ml * ML_NM;
      const s = wellShift(ml);
      const expected = C * (1 / (L - ML_NM) ** 2 - 1 / (L + ML_NM) ** 2);
      expectClose(s.minus - s.plus, expected, { rel: 8 / (KAPPA * L) }, `deep well ${ml} ML (${L} nm): E(w−1) − E(w+1) in meV`);
    }), { numRuns: 8, seed: 7 });
  });

  it('ranks the well thickness above the barriers for a target on e1 (a barrier of 2 nm at 50 eV hardly matters)', () => {
    const spec = deepWell(20);
    const problem = prepareTolerance(spec, nominalVariables(spec));
    const rows = sensitivities(problem, measure(problem));
    const impacts = rows.map((r) => r.impact);
    expect(impacts, 'impacts must be sorted, largest first').toEqual([...impacts].sort((a, b) => b - a));
    expect(rows[0]!.label, `first row: ${rows[0]!.label}`).toMatch(/well|growth rate/);
  });
});
