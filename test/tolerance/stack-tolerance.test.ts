/**
 * Growth tolerance of a 5-well stack (engine/tolerance): the figures follow every well's own line
 * (objectives/wells.ts). Checks: ±1 ML on one well moves that well's line in opposite directions
 * (a thinner well confines more: the line rises; closed-form trend of a finite well); and the
 * Monte Carlo's inhomogeneous spread of the wells' lines matches the spread the one-at-a-time
 * sensitivities predict for independent per-layer monolayer errors (property test over designs):
 * with errors δ_l ∈ {−1, 0, +1} ML drawn with p, 1 − 2p, p, a line shifts by Σ_l s_l(δ_l), so its
 * variance is Σ_l [p s_l(+1)² + p s_l(−1)² − p² (s_l(+1) + s_l(−1))²] (independent layers, shifts
 * additive to first order), and the pooled spread over the wells adds the spread of their means.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseSpecText } from '../../engine/input/load.js';
import { nominalVariables } from '../../engine/structure.js';
import { measure, prepareTolerance } from '../../engine/tolerance/measure.js';
import { sensitivities } from '../../engine/tolerance/sensitivity.js';
import { runSamples, ensembleSpreads, DEFAULT_TOLERANCE } from '../../engine/tolerance/analyse.js';
import { drawKeys, type GrowthModel } from '../../engine/tolerance/montecarlo.js';
import type { Spec } from '../../engine/input/schema.js';

const P = 0.15;
const onlyMonolayers = (periods: GrowthModel['periods']): GrowthModel => ({ monolayers: { kind: 'table', table: [{ ml: -1, p: P }, { ml: 0, p: 1 - 2 * P }, { ml: 1, p: P }] }, compositionSigma: 0, rateSigmaPercent: 0, periods });

function fiveWells(ml: number, inFraction: number): Spec {
  return parseSpecText(`substrate: GaAs
temperature: 300 K
stack:
  - { material: GaAs, thickness: 25 nm }
  - periods: 5
    repeat:
      - { material: In${inFraction}Ga${Number((1 - inFraction).toFixed(4))}As, thickness: ${ml} ML, label: well }
      - { material: GaAs, thickness: 25 nm, label: barrier }
targets:
  - { transition: e1-hh1, wavelength: 950 nm, within: 20 nm }
`, 'five-wells').spec;
}

describe('tolerance of a 5-well stack follows every well', () => {
  it('+1 ML and −1 ML on well[3] shift well[3]\'s own line with opposite signs, the other wells\' lines by at most a tenth of that (their e1 miniband re-forms)', () => {
    const spec = fiveWells(24, 0.15);
    const problem = prepareTolerance(spec, nominalVariables(spec));
    expect(problem.wells).toEqual(['well[1]', 'well[2]', 'well[3]', 'well[4]', 'well[5]']);
    const rows = sensitivities(problem, measure(problem));
    const row = rows.find((r) => r.label.includes('(well[3]) thickness'))!;
    const own = problem.quantities.findIndex((q) => q.label === 'e1-hh1 energy of well[3]');
    const minus = row.minus[own]!;
    const plus = row.plus[own]!;
    console.log(`well[3] ±1 ML: its e1-hh1 line ${minus.toFixed(3)} / ${plus.toFixed(3)} meV; other wells' lines ${problem.quantities.flatMap((q, k) => (q.well && k !== own ? [`${row.minus[k]!.toFixed(4)}/${row.plus[k]!.toFixed(4)}`] : [])).join(', ')} meV`);
    expect(minus, `−1 ML: well[3] line shift ${minus} meV, expected a rise`).toBeGreaterThan(1);
    expect(plus, `+1 ML: well[3] line shift ${plus} meV, expected a fall`).toBeLessThan(-1);
    problem.quantities.forEach((q, k) => {
      if (q.well && k !== own) expect(Math.abs(row.minus[k]!) + Math.abs(row.plus[k]!), `${q.label} moved by well[3]'s error`).toBeLessThan(0.1 * (Math.abs(minus) + Math.abs(plus)));
    });
  });

  it('Monte Carlo ensemble spread matches the per-well sensitivities × the error distribution (property over designs)', async () => {
    await fc.assert(fc.asyncProperty(fc.integer({ min: 18, max: 30 }), fc.integer({ min: 10, max: 20 }), fc.integer({ min: 1, max: 1000 }), async (ml, inPercent, seed) => {
      const spec = fiveWells(ml, inPercent / 100);
      const values = nominalVariables(spec);
      const problem = prepareTolerance(spec, values);
      const nominal = measure(problem);
      const rows = sensitivities(problem, nominal).filter((r) => r.kind === 'thickness');
      const lines = problem.quantities.flatMap((q, k) => (q.well ? [k] : []));
      // Predicted variance and mean of each well's line.
      const predicted = lines.map((k) => {
        let variance = 0;
        let mean = nominal.values[k]!;
        for (const r of rows) {
          const up = r.plus[k]!;
          const down = r.minus[k]!;
          variance += P * up * up + P * down * down - (P * (up + down)) ** 2;
          mean += P * (up + down);
        }
        return { variance, mean };
      });
      const grand = predicted.reduce((a, x) => a + x.mean, 0) / predicted.length;
      const sigma = Math.sqrt(predicted.reduce((a, x) => a + x.variance + (x.mean - grand) ** 2, 0) / predicted.length);
      const samples = await runSamples(spec, values, { ...DEFAULT_TOLERANCE, samples: 120, seed, growth: onlyMonolayers('independent'), workers: 2, batch: 30 });
      const [ensemble] = ensembleSpreads(samples, problem.quantities);
      const n = ensemble!.lines;
      // σ of a sample σ for this three-point distribution (kurtosis 1/(2p) = 3.33): √((κ − 1)/4n); 4 of those, and 3 % for the first-order additivity.
      const tolerance = sigma * (4 * Math.sqrt((1 / (2 * P) - 1) / (4 * n)) + 0.03);
      console.log(`${ml} ML In${inPercent / 100}: Monte Carlo σ ${ensemble!.sigma_meV.toFixed(3)} meV over ${n} lines, predicted ${sigma.toFixed(3)} meV, tolerance ${tolerance.toFixed(3)} meV`);
      expect(Math.abs(ensemble!.sigma_meV - sigma), `${ml} ML, In ${inPercent} %, seed ${seed}: got ${ensemble!.sigma_meV}, expected ${sigma}, tolerance ${tolerance}`).toBeLessThanOrEqual(tolerance);
    }), { numRuns: 2, seed: 16 });
  }, 60_000);

  it('correlated periods repeat one draw in every period: the wells\' lines then move together', async () => {
    const spec = fiveWells(24, 0.15);
    expect(new Set(drawKeys(spec, onlyMonolayers('correlated'))).size, 'draws: cladding + one per written layer of the period').toBe(3);
    expect(new Set(drawKeys(spec, onlyMonolayers('independent'))).size, 'draws: one per layer').toBe(11);
    const values = nominalVariables(spec);
    const problem = prepareTolerance(spec, values);
    const run = async (periods: GrowthModel['periods']): Promise<number> => ensembleSpreads(await runSamples(spec, values, { ...DEFAULT_TOLERANCE, samples: 24, seed: 4, growth: onlyMonolayers(periods), workers: 1, batch: 24 }), problem.quantities)[0]!.withinSample_meV;
    const correlated = await run('correlated');
    const independent = await run('independent');
    console.log(`within-sample spread of the wells' lines: correlated ${correlated.toFixed(4)} meV, independent ${independent.toFixed(4)} meV`);
    // Correlated: only the nominal spread of the e1 miniband's members among the wells (< 0.2 meV) remains.
    expect(correlated).toBeLessThan(0.2 * independent);
    expect(independent).toBeGreaterThan(0.5);
  }, 30_000);
});
