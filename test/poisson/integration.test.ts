/**
 * The doped scenarios of runs/ through the public path (spec file → solve / design), once the doping,
 * bias and absorption keys are in engine/input/schema.ts and the doped solve is wired into solve and
 * design (the integration lines of issue 15): the 9 µm doped detector's design lands on its window
 * and reports both its e1-e2 line and its absorption peak; the bound-to-continuum scenario is solved
 * at each bias of its sweep.
 */
import { describe, expect, it } from 'vitest';
import { loadSpecFile } from '../../engine/input/load.js';
import { findTransition } from '../../engine/solve.js';
import { solveDoped, type DopedSolveResult } from '../../engine/poisson/doped.js';
import { design } from '../../engine/design/search.js';

describe('doped scenarios of runs/', () => {
  it('runs/qwip-doped-9um.yaml: design meets 9 ± 0.2 µm (absorption peak), e2 at the barrier edge and 0.2 % per pass; e1-e2 and the peak both reported', async () => {
    const { spec } = loadSpecFile('runs/qwip-doped-9um.yaml');
    const r = await design(spec, { starts: 4, seed: 1, top: 1, workers: 1, compositionStep: 0.001, maxEvaluations: 80 });
    const best = r.designs[0]!;
    expect(best.satisfied, best.evaluations.map((e) => `${e.label} ${e.achieved} ${e.unit}`).join(', ')).toBe(true);
    const solved = best.result as DopedSolveResult;
    expect(solved.selfConsistent.status).toBe('converged');
    expect(Math.abs(solved.absorption!.peak_um - 9)).toBeLessThanOrEqual(0.2);
    const line = findTransition(solved, 'e1-e2')!;
    // The bare e1-e2 line lies below the depolarisation-shifted peak.
    expect(line.energy_eV).toBeLessThan(solved.absorption!.peak_eV);
  }, 120_000);

  it('runs/qwip-bound-to-continuum.yaml: one bound electron state, a broad line, three bias points', () => {
    const { spec } = loadSpecFile('runs/qwip-bound-to-continuum.yaml');
    const r = solveDoped(spec);
    expect(r.status).toBe('ok');
    expect(r.bands.electron.states.filter((s) => s.bound).length).toBe(1);
    expect(r.absorption!.fwhm_um).toBeGreaterThan(1);
    expect(r.sweep!.map((b) => b.bias.voltage_V)).toEqual([0, 0.1, 0.2]);
    for (const b of r.sweep!) expect(b.selfConsistent.status).toBe('converged');
  }, 60_000);
});
