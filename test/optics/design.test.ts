/**
 * `design` on the gain-peak target (issue 14 acceptance): the 976 nm pump scenario
 * (runs/pump-976-gain.yaml, invented) designed to its TE gain peak at 3e12 cm⁻²; its computed gain
 * peak, re-solved with the full valence model of `wellsmith solve` ([100]/[110], 49 k∥ points, grid
 * extrapolation), lies in the target window, and its e1-hh1 line lies where band filling puts it:
 * on the long-wavelength side of the gain peak. Round trip as for the transition targets
 * (test/design/roundtrip.test.ts): the gain peak of random designs inside the bounds, as the search's
 * own objective computes it, becomes the target, and the search must meet it.
 * Needs the optical kinds registered in objectives/index.ts and the `optics:` section in the spec
 * schema (the integration lines of issue 14).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { loadSpecFile } from '../../engine/input/load.js';
import { findTransition, settingsOf, solveStructure } from '../../engine/solve.js';
import { buildStructure } from '../../engine/structure.js';
import { design } from '../../engine/design/search.js';
import { opticsOfSolve } from '../../engine/optics/optics.js';
import { opticsSettings } from '../../engine/optics/schema.js';
import { compileTargets, scoreTargets } from '../../objectives/index.js';
import type { Spec } from '../../engine/input/schema.js';

const SCENARIO = 'runs/pump-976-gain.yaml';
const N = 3e12;

describe('design to the gain peak', () => {
  const spec = loadSpecFile(SCENARIO).spec;

  it('runs/pump-976-gain.yaml: the designed well\'s full-model TE gain peak at 3e12 cm⁻² lies within 976 ± 2 nm, its e1-hh1 line on the red side', async () => {
    const t0 = performance.now();
    const r = await design(spec, { starts: 3, seed: 1, top: 1, workers: 2, compositionStep: 0.001, maxEvaluations: 80 });
    const seconds = (performance.now() - t0) / 1000;
    const best = r.designs[0]!;
    expect(best.satisfied, JSON.stringify(best.evaluations)).toBe(true);
    const values = Object.fromEntries(best.variables.map((v) => [v.name, v.value]));
    const solved = solveStructure(buildStructure(spec, values), settingsOf(spec));
    const o = opticsOfSolve(solved, opticsSettings(undefined), [{ electrons_cm2: N, holes_cm2: N }])!;
    const peak = o.spectra[0]!.peak_te;
    const line = findTransition(solved, 'e1-hh1')!.wavelength_nm;
    console.log(`design ${seconds.toFixed(1)} s, ${r.evaluations} solves: w ${values.w!.toFixed(3)} nm, x ${values.x!.toFixed(3)}; search objective ${best.evaluations[0]!.achieved!.toFixed(2)} nm; full model ${peak.wavelength_nm.toFixed(2)} nm (${peak.gain_per_cm.toFixed(0)} cm⁻¹); e1-hh1 ${line.toFixed(2)} nm, ${(line - peak.wavelength_nm).toFixed(2)} nm to the red of the peak`);
    expect(Math.abs(peak.wavelength_nm - 976)).toBeLessThanOrEqual(2);
    expect(peak.gain_per_cm).toBeGreaterThan(0);
    // Band filling: the gain peak lies above the band-edge line in energy.
    expect(line).toBeGreaterThan(peak.wavelength_nm + 1);
  }, 180_000);

  it('recovers the gain peak of random designs inside the bounds (round trip, ±2 nm)', async () => {
    const cases = fc.sample(fc.record({ w: fc.integer({ min: 50, max: 90 }).map((t) => t / 10), x: fc.integer({ min: 120, max: 240 }).map((t) => t / 1000) }), { numRuns: 2, seed: 14 });
    for (const { w, x } of cases) {
      const truthSpec: Spec = { ...spec, targets: [{ gain_peak: 'TE', wavelength: '976 nm', within: '2 nm', density: '3e12 cm-2' }] };
      const truth = solveStructure(buildStructure(truthSpec, { w, x }), settingsOf(truthSpec));
      const goal = scoreTargets(compileTargets(truthSpec.targets), truth).evaluations[0]!.achieved!;
      const target: Spec = { ...spec, targets: [{ gain_peak: 'TE', wavelength: `${goal} nm`, within: '2 nm', density: '3e12 cm-2' }] };
      const r = await design(target, { starts: 2, seed: 3, top: 1, workers: 2, compositionStep: 0.001, maxEvaluations: 50 });
      const best = r.designs[0]!;
      console.log(`w ${w} nm, x ${x}: target ${goal.toFixed(2)} nm → ${best.evaluations[0]!.achieved?.toFixed(2)} nm at ${best.variables.map((v) => `${v.name} ${v.value.toFixed(3)}`).join(', ')}`);
      expect(best.satisfied, `w ${w}, x ${x}: ${JSON.stringify(best.evaluations)}`).toBe(true);
    }
  }, 180_000);

  it('runs/tm-gain-tensile.yaml: a tensile InGaAs/InP well with its light hole on top, TM gain peak at 1550 ± 5 nm and at least twice the TE peak', async () => {
    const tm = loadSpecFile('runs/tm-gain-tensile.yaml').spec;
    const r = await design(tm, { starts: 2, seed: 1, top: 1, workers: 2, compositionStep: 0.001, maxEvaluations: 60 });
    const best = r.designs[0]!;
    const values = Object.fromEntries(best.variables.map((v) => [v.name, v.value]));
    const solved = solveStructure(buildStructure(tm, values), settingsOf(tm));
    const o = opticsOfSolve(solved, opticsSettings(undefined), [{ electrons_cm2: N, holes_cm2: N }])!;
    const s = o.spectra[0]!;
    const lh1 = solved.bands.light_hole.states[0]!.energy_eV;
    const hh1 = solved.bands.heavy_hole.states[0]!.energy_eV;
    console.log(`TM design: ${best.variables.map((v) => `${v.name} ${v.value.toFixed(3)}`).join(', ')}, ε∥ ${(solved.structure.layers[1]!.material.strain_par * 100).toFixed(2)} %; lh1 ${((lh1 - hh1) * 1000).toFixed(1)} meV above hh1; search: ${best.evaluations.map((e) => `${e.label} ${e.achieved?.toFixed(3)}`).join(', ')}; full model: TM peak ${s.peak_tm.gain_per_cm.toFixed(0)} cm⁻¹ at ${s.peak_tm.wavelength_nm.toFixed(1)} nm, TE peak ${s.peak_te.gain_per_cm.toFixed(0)} cm⁻¹`);
    expect(best.satisfied, JSON.stringify(best.evaluations)).toBe(true);
    expect(solved.structure.layers[1]!.material.strain_par).toBeGreaterThan(0);
    expect(lh1).toBeGreaterThan(hh1);
    expect(Math.abs(s.peak_tm.wavelength_nm - 1550)).toBeLessThanOrEqual(5);
    expect(s.peak_tm.gain_per_cm).toBeGreaterThan(2 * s.peak_te.gain_per_cm);
  }, 180_000);
});
