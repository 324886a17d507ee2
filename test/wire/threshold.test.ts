/**
 * Wire subbands of a T-shaped wire are the states bound below the 2-D continuum of its parent
 * wells, whatever length the arms are drawn: a 5/5 nm GaAs T-wire in Al0.3Ga0.7As (scenario of
 * ours), drawn as a t-shape and as a union of two rectangles, with 40 nm and 100 nm arms.
 */
import { describe, expect, it } from 'vitest';
import { toJson } from '../../engine/text.js';
import { solve, type SolveResult } from '../../engine/solve.js';
import { parseSpecText } from '../../engine/input/load.js';
import { describeWire, wireJson } from '../../engine/wire/describe.js';
import { solveWire, type WireSolveResult } from '../../engine/wire/solve.js';
import { buildWireStructure } from '../../engine/wire/structure.js';
import { spacingObjective } from '../../objectives/spacing.js';
import { expectClose } from './helpers.js';

const HEAD = 'substrate: GaAs\ntemperature: 300 K\n';
const tShape = (arm: number) => `{ kind: t-shape, stem: { material: GaAs, width: 5 nm }, arm: { material: GaAs, width: 5 nm, length: ${arm} nm } }`;
const union = (arm: number) => `{ kind: union, parts: [{ material: GaAs, x: -2.5 nm, y: -20 nm, width: 5 nm, height: 20 nm, continues: true }, { material: GaAs, x: ${-arm / 2} nm, y: 0 nm, width: ${arm} nm, height: 5 nm, continues: true }] }`;
const wire = (shape: string) => parseSpecText(`${HEAD}wire:\n  barrier: Al0.3Ga0.7As\n  shape: ${shape}\n  margin: 6 nm\n`).spec;
/** Electrons only (the holes of this T bind weakly or not at all, see the README): e1 and the next state. */
const electrons = (shape: string): WireSolveResult => solveWire(wire(shape), undefined, { states: { electron: 2, heavy_hole: 0, light_hole: 0 } });

// The parent wells of both drawings are 5 nm GaAs wells in Al0.3Ga0.7As: their level by the exact 1-D solver, same (default non-parabolic) model.
const well5 = solve(parseSpecText(`${HEAD}stack:\n  - { material: Al0.3Ga0.7As, thickness: 20 nm }\n  - { material: GaAs, thickness: 5 nm }\n  - { material: Al0.3Ga0.7As, thickness: 20 nm }\n`).spec).bands.electron.states[0]!.energy_eV;

describe.each([['t-shape', tShape], ['union of rectangles', union]] as const)('5/5 nm GaAs T-wire drawn as a %s', (_name, shape) => {
  const short = electrons(shape(40));
  const long = electrons(shape(100));

  it('the threshold is the 5 nm parent well\'s level (exact 1-D solve of the same well, within 1e-9 eV), reported with each subband\'s binding', () => {
    for (const r of [short, long]) {
      const b = r.bands.electron;
      expect(b.threshold.source).toBe('parent-well');
      expectClose(b.threshold.energy_eV, well5, 1e-9, 'continuum threshold vs the 5 nm well e1');
      expect(b.barrier_eV).toBe(b.threshold.energy_eV);
      for (const s of b.states) expectClose(s.binding_meV, (b.threshold.energy_eV - s.energy_eV) * 1000, 1e-9, `${s.label} binding`);
    }
  });

  it('e1 is the only subband and moves by less than 0.5 meV when the arm grows from 40 to 100 nm', () => {
    expect(short.bands.electron.states.map((s) => s.label)).toEqual(['e1']);
    expect(long.bands.electron.states.map((s) => s.label)).toEqual(['e1']);
    const shift = Math.abs(long.bands.electron.states[0]!.energy_eV - short.bands.electron.states[0]!.energy_eV) * 1000;
    expect(shift, `e1 at 40 vs 100 nm arms: ${shift} meV apart, tolerance 0.5 meV`).toBeLessThan(0.5);
    // Bound by the junction: T-wires bind their electrons by several meV (common practice); 11 meV here.
    expect(short.bands.electron.states[0]!.binding_meV).toBeGreaterThan(5);
  });

  it('the next states are parent-well states that follow the drawn arm (more than 5 meV lower at 100 nm), and a spacing target does not read them', () => {
    const [a, b] = [short, long].map((r) => r.bands.electron.parentWellStates[0]!);
    expect(a!.label).toBe('pw:e1');
    expect(a!.binding_meV).toBeLessThan(short.bands.electron.errorEstimate_meV);
    expect((a!.energy_eV - b!.energy_eV) * 1000, `pw:e1 at 40 nm ${a!.energy_eV} eV, at 100 nm ${b!.energy_eV} eV`).toBeGreaterThan(5);
    const e = spacingObjective.evaluate({ spacing: 'e1-e2', at_least: '1 meV' }, short as unknown as SolveResult);
    expect(e.achieved).toBeNull();
    expect(e.satisfied).toBe(false);
  });

  it('solve --json and the human table carry the threshold, the bindings and the parent-well states', () => {
    const json = JSON.parse(toJson(wireJson(short, false))) as { bands: { electron: { threshold: { energy_eV: number; field: string }; states: { binding_meV: number }[]; parentWellStates: { label: string }[] } } };
    expect(json.bands.electron.threshold.energy_eV).toBe(short.bands.electron.threshold.energy_eV);
    expect(json.bands.electron.states[0]!.binding_meV).toBe(short.bands.electron.states[0]!.binding_meV);
    expect(json.bands.electron.parentWellStates[0]!.label).toBe('pw:e1');
    const text = describeWire(short);
    expect(text).toContain('Continuum threshold per band');
    expect(text).toMatch(/binding meV/);
    expect(text).toMatch(/pw:e1 +0\.7\d{4}/);
  });
});

describe('parent wells of a union', () => {
  it('each continuing rectangle is a well across its short side; a square one counts both ways; the others end where drawn', () => {
    const s = buildWireStructure(wire('{ kind: union, parts: [{ material: GaAs, x: 0 nm, y: 0 nm, width: 30 nm, height: 4 nm, continues: true }, { material: GaAs, x: 0 nm, y: 4 nm, width: 6 nm, height: 6 nm, continues: true }, { material: GaAs, x: 0 nm, y: 10 nm, width: 12 nm, height: 3 nm }] }'), {});
    expect(s.parentWells.map((w) => [w.field, w.thickness_nm, w.across])).toEqual([
      ['wire.shape.parts[0]', 4, 'y'],
      ['wire.shape.parts[1]', 6, 'y'],
      ['wire.shape.parts[1]', 6, 'x'],
    ]);
    // A single rectangle drawn as a union is a closed box: the barrier edge bounds its states, as for kind: rectangle.
    const box = buildWireStructure(wire('{ kind: union, parts: [{ material: GaAs, x: 0 nm, y: 0 nm, width: 10 nm, height: 6 nm }] }'), {});
    expect(box.parentWells).toEqual([]);
    const rect = buildWireStructure(wire('{ kind: rectangle, material: GaAs, width: 10 nm, height: 6 nm }'), {});
    expect(rect.parentWells).toEqual([]);
  });
});
