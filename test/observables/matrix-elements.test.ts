import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import fixture from '../reference/observables/simpson.json' with { type: 'json' };
import { dipoleNm, oscillatorStrength, overlap2, simpson, sumRuleMass } from '../../engine/observables/matrix-elements.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from './close.js';

/** Uniform grid of n + 1 points on [a, b]. */
const grid = (a: number, b: number, n: number): number[] => Array.from({ length: n + 1 }, (_, i) => a + ((b - a) * i) / n);

/** Infinite-well state n on [−L/2, L/2]: √(2/L) sin(nπ(z + L/2)/L), parity (−1)^(n+1) (closed form). */
const wellState = (n: number, L: number, z: readonly number[]): number[] => z.map((x) => Math.sqrt(2 / L) * Math.sin((n * Math.PI * (x + L / 2)) / L));

describe('simpson', () => {
  it('matches scipy.integrate.simpson on non-uniform grids, odd and even point counts (simpson_fixture.py)', () => {
    for (const c of fixture.cases) expectClose(simpson(c.y, c.z), c.integral, { rel: 1e-12, abs: 1e-14 }, `${c.z.length} points`);
  });

  it('is fourth order: halving the step divides the error of ∫0^π sin = 2 by ≈ 16 (common practice)', () => {
    const error = (n: number): number => Math.abs(simpson(grid(0, Math.PI, n).map(Math.sin), grid(0, Math.PI, n)) - 2);
    const ratio = error(16) / error(32);
    expectClose(ratio, 16, { abs: 1 }, 'error(h)/error(h/2)');
  });
});

describe('infinite well (closed forms)', () => {
  const L = 8;
  const z = grid(-L / 2, L / 2, 3000);

  it('z_12 = 16L/(9π²) in magnitude and |z_1n| = 8Ln/(π²(n² − 1)²) for even n (common practice)', () => {
    const psi1 = wellState(1, L, z);
    expectClose(Math.abs(dipoleNm(psi1, wellState(2, L, z), z)), (16 * L) / (9 * Math.PI ** 2), { rel: 1e-10 }, 'z_12, L = 8 nm');
    for (const n of [4, 6, 10]) {
      expectClose(Math.abs(dipoleNm(psi1, wellState(n, L, z), z)), (8 * L * n) / (Math.PI ** 2 * (n * n - 1) ** 2), { rel: 1e-8 }, `z_1${n}, L = 8 nm`);
    }
  });

  it('parity: zero dipole between equal parities, zero overlap between opposite parities (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 12 }), (m, n) => {
        const a = wellState(m, L, z);
        const b = wellState(n, L, z);
        // the grid is symmetric about 0, so odd integrands cancel to rounding (≈ 1e-15)
        if ((m + n) % 2 === 0) expectClose(dipoleNm(a, b, z), 0, { abs: 1e-12 }, `z_${m}${n}`);
        else expectClose(overlap2(a, b, z), 0, { abs: 1e-24 }, `|<${m}|${n}>|²`);
      }),
    );
  });

  it('overlap of a normalised state with itself is 1', () => {
    expectClose(overlap2(wellState(3, L, z), wellState(3, L, z), z), 1, { rel: 1e-12 }, '|<3|3>|²');
  });

  it('Thomas–Reiche–Kuhn sum rule Σ_j f_1j = 1 (common practice) with dipoles from dipoleNm', () => {
    const mass = 0.067;
    const e1 = (HBAR2_OVER_2M0 * Math.PI ** 2) / (mass * L * L);
    const psi1 = wellState(1, L, z);
    let sum = 0;
    for (let n = 2; n <= 60; n++) sum += oscillatorStrength((n * n - 1) * e1, dipoleNm(psi1, wellState(n, L, z), z), mass);
    // f_1n = 64 n²/(π²(n² − 1)³) for even n; the omitted tail n > 60 is ≈ 64/(6π² · 60³) = 5e-6
    expectClose(sum, 1, { abs: 2e-5 }, 'Σ_{j=2..60} f_1j');
    expectClose(oscillatorStrength(3 * e1, dipoleNm(psi1, wellState(2, L, z), z), mass), 256 / (27 * Math.PI ** 2), { rel: 1e-9 }, 'f_12 = 256/(27π²) ≈ 0.961');
  });
});

describe('sumRuleMass', () => {
  it('returns 1/⟨1/m⟩; for 1/m = a + b cos(2πz/L) on the well ground state ⟨1/m⟩ = a − b/2 (closed form)', () => {
    const L = 10;
    const z = grid(-L / 2, L / 2, 800);
    const psi = wellState(1, L, z);
    const a = 1 / 0.067;
    const b = 3;
    const massProfile = z.map((x) => 1 / (a + b * Math.cos((2 * Math.PI * (x + L / 2)) / L)));
    expectClose(sumRuleMass(psi, massProfile, z), 1 / (a - b / 2), { rel: 1e-10 }, 'sum-rule mass');
    expectClose(sumRuleMass(psi, z.map(() => 0.067), z), 0.067, { rel: 1e-14 }, 'constant mass');
  });
});

describe('input checks', () => {
  it('rejects mismatched lengths, unsorted grids and non-positive masses with InputError', () => {
    expect(() => overlap2([1, 2, 3], [1, 2], [0, 1, 2])).toThrow(InputError);
    expect(() => dipoleNm([1, 2, 3], [1, 2, 3], [0, 2, 1])).toThrow(InputError);
    expect(() => simpson([1, 2], [0, 1])).toThrow(InputError);
    expect(() => oscillatorStrength(0.1, 1, 0)).toThrow(InputError);
    expect(() => sumRuleMass([1, 1, 1], [0.1, -1, 0.1], [0, 1, 2])).toThrow(InputError);
  });
});
