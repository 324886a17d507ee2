/**
 * Bad input to the 1-D solver is an InputError naming the field; an empty spectrum is a result.
 */

import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors.js';
import { countStatesBelow, solveBand } from '../../engine/solver1d/states.js';
import { wavefunction } from '../../engine/solver1d/wavefunction.js';
import { layer, outer, profileOf } from './helpers.js';

const well = profileOf([layer(8, 0, 0.067)], outer(0.3, 0.092));

const thrown = (f: () => unknown): InputError => {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError, none was thrown');
};

describe('input errors', () => {
  it.each([
    ['profile.slices[0].width_nm', profileOf([layer(-1, 0, 0.067)], outer(0.3, 0.092))],
    ['profile.slices[0].mass', profileOf([layer(5, 0, 0)], outer(0.3, 0.092))],
    ['profile.slices[0].V', profileOf([layer(5, Number.NaN, 0.067)], outer(0.3, 0.092))],
    ['profile.left.mass', profileOf([layer(5, 0, 0.067)], outer(0.3, -0.1), outer(0.3, 0.092))],
    ['profile.slices[0].alpha', profileOf([layer(5, 0, 0.067, -10)], outer(0.3, 0.092))],
    // The two-band alpha is 1/Eg: a negative one would make the mass fall with E and void the count.
    ['profile.right.alpha', profileOf([layer(5, 0, 0.067)], outer(0.3, 0.092), outer(0.3, 0.092, -0.1))],
  ])('%s is named in the error', (field, p) => {
    const e = thrown(() => solveBand(p));
    expect(e.field).toBe(field);
    expect(e.message.startsWith(`${field}: `)).toBe(true);
    expect(e.message).toContain('got');
  });

  it('options, energies and grids are checked', () => {
    expect(thrown(() => solveBand(well, { maxStates: 0 })).field).toBe('options.maxStates');
    expect(thrown(() => solveBand(well, { tolerance_eV: -1 })).field).toBe('options.tolerance_eV');
    expect(thrown(() => wavefunction(well, 0.3, new Float64Array([0]))).field).toBe('energy');
    expect(thrown(() => wavefunction(well, 0.05, new Float64Array([Number.NaN]))).field).toBe('z_nm[0]');
    expect(thrown(() => countStatesBelow(well, Number.NaN)).field).toBe('energy');
    const sloped = profileOf([{ ...layer(10, 0, 0.067), gradient: { V: 0.01, mass: 0, alpha: 0 } }], outer(0.3, 0.092));
    expect(thrown(() => wavefunction(sloped, 0.05, new Float64Array([1]))).field).toBe('profile.slices[0].gradient');
    expect(thrown(() => solveBand(profileOf([{ ...layer(10, 0, 0.067), gradient: { V: Number.NaN, mass: 0, alpha: 0 } }], outer(0.3, 0.092)))).field).toBe('profile.slices[0].gradient.V');
    // A mass gradient that turns the mass negative inside the slice is refused, not only a bad centre value.
    expect(thrown(() => solveBand(profileOf([{ ...layer(10, 0, 0.067), gradient: { V: 0, mass: 0.02, alpha: 0 } }], outer(0.3, 0.092)))).field).toBe('profile.slices[0].gradient.mass');
  });
});

describe('physics that cannot be satisfied is a result', () => {
  it('a barrier-only profile has no bound state (empty list, barrier reported)', () => {
    const s = solveBand(profileOf([layer(5, 0.4, 0.09)], outer(0.3, 0.092)));
    expect(s.states).toEqual([]);
    expect(s.barrier).toBe(0.3);
  });
  it('maxStates keeps the lowest states', () => {
    const all = solveBand(well).states;
    const one = solveBand(well, { maxStates: 1 }).states;
    expect(one).toEqual([all[0]]);
  });
  it('countStatesBelow is 0 at the well bottom and the total at and above the barrier', () => {
    const total = solveBand(well).states.length;
    expect(countStatesBelow(well, 0)).toBe(0);
    expect(countStatesBelow(well, 0.3)).toBe(total);
    expect(countStatesBelow(well, 5)).toBe(total);
  });
});
