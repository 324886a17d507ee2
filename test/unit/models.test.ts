/**
 * Model choices of the solver section reach the structure, change what they should, and are
 * recorded in every solve. The physics of each form is tested in test/materials/models.test.ts;
 * here the check is the wiring, with directions that follow from the forms (closed-form reasoning).
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, DEFAULT_STRUCTURE_MODELS } from '../../engine/structure.js';
import { findState, solve } from '../../engine/solve.js';
import { nonparabolicity } from '../../materials/nonparabolicity.js';

const spec = (solver: string, temperature = '300 K') => parseSpecText(`
substrate: GaAs
temperature: ${temperature}
${solver ? `solver: { ${solver} }` : ''}
stack:
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
  - { material: GaAs, thickness: 8 nm, label: well }
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
`).spec;

describe('model choices', () => {
  it('defaults are recorded in the structure of every solve', () => {
    const r = solve(spec(''));
    expect(r.structure.models).toEqual(DEFAULT_STRUCTURE_MODELS);
    expect(r.structure.models).toEqual({ nonparabolicity: 'two-band', electronMass: 'low-temperature', lattice: 'linear' });
  });

  it('three-band α is the Kane form of the strained gap, smaller than 1/Eg, and lifts e2 in a GaAs well', () => {
    const two = buildStructure(spec(''), {});
    const three = buildStructure(spec('nonparabolicity: three-band'), {});
    const w2 = two.layers[1]!.bands[0]!;
    const w3 = three.layers[1]!.bands[0]!;
    const gap = w2.Ec - Math.max(w2.Ehh, w2.Elh);
    expect(w2.alpha).toBeCloseTo(1 / gap, 12);
    const m = three.layers[1]!.material;
    expect(w3.alpha).toBeCloseTo(nonparabolicity('three-band', { Eg: gap, Dso: m.Dso, me: m.me }), 12);
    expect(w3.alpha).toBeLessThan(w2.alpha);
    // A smaller α means a lighter mass above the edge: higher confinement for every state above e1's energy scale.
    const e2 = (s: string): number => findState(solve(spec(s)), 'e2')!.energy_eV;
    expect(e2('nonparabolicity: three-band')).toBeGreaterThan(e2(''));
    expect(solve(spec('nonparabolicity: three-band')).structure.models.nonparabolicity).toBe('three-band');
  });

  it('the Kane electron mass at 300 K is lighter than the low-temperature one and raises e1', () => {
    const low = buildStructure(spec(''), {}).layers[1]!.material.me;
    const warm = buildStructure(spec('electron_mass: kane-temperature'), {}).layers[1]!.material.me;
    expect(low).toBeCloseTo(0.067, 12);
    expect(warm).toBeLessThan(low);
    expect(warm).toBeGreaterThan(0.06);
    const e1 = (s: string): number => findState(solve(spec(s)), 'e1')!.confinement_meV;
    expect(e1('electron_mass: kane-temperature')).toBeGreaterThan(e1(''));
  });

  it('the lattice held below 100 K gives a thicker monolayer at 4 K than the linear law, and the same at 300 K', () => {
    const ml = (s: string, t: string): number => buildStructure(spec(s, t), {}).layers[1]!.monolayer_nm;
    expect(ml('lattice: held-below-100K', '4 K')).toBeGreaterThan(ml('', '4 K'));
    expect(ml('lattice: held-below-100K', '300 K')).toBe(ml('', '300 K'));
  });

  it('an unknown choice is one input error naming the key', () => {
    expect(() => spec('nonparabolicity: four-band')).toThrow(/solver\.nonparabolicity/);
  });
});
