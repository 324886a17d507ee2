/** What a design search needs from a wire: per-band state counts, coarse settings, targets compiled for the wire geometry. */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors.js';
import { loadSpecFile } from '../../engine/input/load.js';
import { buildWireStructure } from '../../engine/wire/structure.js';
import { solveWireStructure } from '../../engine/wire/solve.js';
import { prepareDesign, searchWireSettings, SEARCH_WIRE_TOLERANCE_EV } from '../../engine/design/problem.js';
import { compileTargets, scoreTargets } from '../../objectives/index.js';
import { mismatch } from '../design/check.js';

const spec = loadSpecFile('runs/wire-spacing.yaml').spec;
const values = { w: 9, h: 7 };

describe('wire solve for a design search', () => {
  const structure = buildWireStructure(spec, values);
  const full = solveWireStructure(structure);
  const coarse = solveWireStructure({ ...structure, settings: searchWireSettings(structure.settings) }, { states: { electron: 2, heavy_hole: 1, light_hole: 0 } });

  it('skips a band asked for 0 states and solves only the counts asked for', () => {
    expect(coarse.bands.light_hole.states).toEqual([]);
    expect(coarse.bands.electron.states.map((s) => s.label)).toEqual(['e1', 'e2']);
    expect(coarse.bands.heavy_hole.states.map((s) => s.label)).toEqual(['hh1']);
    // A skipped band keeps its edges (read by subband_edge and at_barrier_edge targets): Elh of the materials, not a solve.
    expect(coarse.bands.light_hole.barrier_eV).toBe(full.bands.light_hole.barrier_eV);
    expect(coarse.status).toBe('ok');
  });

  it('scores the targets on coarse settings within the search tolerance of the spec\'s own solve', () => {
    // Property: the coarse solve (1 nm, 2 meV) against the spec's (0.5 nm, 0.5 meV), whose edges test/wire/wire.test.ts checks against closed forms.
    const targets = compileTargets(spec.targets, 'wire');
    const a = scoreTargets(targets, coarse).evaluations;
    const b = scoreTargets(targets, full).evaluations;
    const e = (r: typeof full, l: string): number => r.bands.electron.states.find((s) => s.label === l)!.energy_eV;
    const tol = 2 * SEARCH_WIRE_TOLERANCE_EV * 1000;
    const got = (e(coarse, 'e2') - e(coarse, 'e1')) * 1000;
    const want = (e(full, 'e2') - e(full, 'e1')) * 1000;
    expect(Math.abs(got - want), mismatch('9 × 7 nm e1-e2 (meV), coarse vs spec settings', got, want, tol)).toBeLessThanOrEqual(tol);
    expect(a[0]!.achieved).toBe(got);
    expect(a.map((x) => x.satisfied)).toEqual(b.map((x) => x.satisfied));
  });

  it('refuses a solve that skips every band', () => {
    expect(() => solveWireStructure(structure, { states: { electron: 0, heavy_hole: 0, light_hole: 0 } })).toThrow(InputError);
  });

  it('records each length variable with the monolayer of the material it sizes', () => {
    const lv = structure.lengthVariables;
    expect(Object.keys(lv).sort()).toEqual(['h', 'w']);
    expect(lv.w!.field).toBe('wire.shape.width');
    expect(lv.w!.nm).toBe(9);
    // GaAs a = 0.565325 nm at 300 K (Vurgaftman, Meyer & Ram-Mohan 2001, Table III); a (001) monolayer is a/2.
    expect(Math.abs(lv.w!.monolayer_nm - 0.565325 / 2), mismatch('GaAs monolayer (nm)', lv.w!.monolayer_nm, 0.565325 / 2, 1e-5)).toBeLessThanOrEqual(1e-5);
  });
});

describe('targets compiled for a wire', () => {
  it.each(['critical_thickness', 'direct_gap', 'total_thickness'])('refuses the layer constraint %s, naming its field', (constraint) => {
    const raw = [{ constraint, ...(constraint === 'total_thickness' ? { at_most: '100 nm' } : {}) }];
    expect(() => compileTargets(raw, 'stack')).not.toThrow();
    expect(() => compileTargets(raw, 'wire')).toThrow(/targets\[0\]\.constraint: .*wire/);
  });

  it('refuses an oscillator strength on a wire but keeps the overlap', () => {
    expect(() => compileTargets([{ maximize: 'oscillator_strength', transition: 'e1-e2' }], 'wire')).toThrow(/targets\[0\]\.maximize/);
    expect(() => compileTargets([{ maximize: 'overlap', transition: 'e1-hh1' }], 'wire')).not.toThrow();
  });

  it('prepareDesign on a wire spec with a layer constraint is bad input', () => {
    const bad = { ...spec, targets: [...(spec.targets ?? []), { constraint: 'critical_thickness' }] };
    expect(() => prepareDesign(bad)).toThrow(InputError);
  });
});
