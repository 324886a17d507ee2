import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import fixture from '../reference/observables/simpson.json' with { type: 'json' };
import { dipoleNm, intersubbandStates, oscillatorStrength, overlap2, simpson, sumRuleMass } from '../../engine/observables/matrix-elements.js';
import type { BandProfile } from '../../engine/profile.js';
import { solveBand } from '../../engine/solver1d/states.js';
import { wavefunction } from '../../engine/solver1d/wavefunction.js';
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

/**
 * An asymmetric stepped well with position-dependent mass (invented): outer barriers of different
 * height and mass, a step inside the well. alpha scales every slice's non-parabolicity (0: parabolic).
 */
const steppedWell = (alpha: number): BandProfile => {
  const region = (V: number, mass: number, a: number) => ({ V, mass, alpha: alpha * a, massInPlane: mass });
  const slice = (width_nm: number, V: number, mass: number, a: number, layer: number) => ({ width_nm, ...region(V, mass, a), layer });
  return {
    band: 'electron',
    slices: [slice(6, 0.6, 0.09, 0.6, 0), slice(6, 0.05, 0.05, 1.4, 1), slice(7, 0, 0.045, 1.5, 2), slice(8, 0.45, 0.08, 0.7, 3)],
    left: region(0.6, 0.09, 0.6),
    right: region(0.45, 0.08, 0.7),
    sign: 1,
    openEdge: 0.45,
  };
};

/** Every pair (i < j) of n states. */
const pairs = (n: number): [number, number][] => Array.from({ length: n }, (_, i) => Array.from({ length: n - i - 1 }, (_, k): [number, number] => [i, i + k + 1])).flat();

describe('intersubbandStates', () => {
  it('parabolic limit: dipoles equal ∫ψ_i z ψ_j dz (dipoleNm) and f is oscillatorStrength with sumRuleMass, as before', () => {
    // For α = 0 the inner product is ∫ψ_iψ_j dz and the velocity form equals the position form for
    // eigenstates of the position-dependent-mass Hamiltonian (Hermitian; common practice). Tolerance:
    // Simpson on the 0.008 nm grid is second order across the interfaces, where ψ′ jumps (~1e-6).
    const profile = steppedWell(0);
    const energies = solveBand(profile).states.map((s) => s.energy);
    expect(energies.length).toBeGreaterThanOrEqual(3);
    const states = intersubbandStates(profile, energies);
    const z = Float64Array.from({ length: 8001 }, (_, i) => -20 + (67 * i) / 8000);
    const psi = energies.map((e) => wavefunction(profile, e, z));
    const centred = z.map((x) => x - 13.5);
    const massProfile = Array.from(z, (x) => (x < 6 ? 0.09 : x < 12 ? 0.05 : x < 19 ? 0.045 : 0.08));
    for (const [i, j] of pairs(energies.length)) {
      const before = dipoleNm(psi[i]!, psi[j]!, z);
      expectClose(states.dipole(i, j), before, { rel: 1e-5 }, `stepped well, parabolic: z_${i + 1}${j + 1} (nm)`);
      expectClose(states.position(i, j), dipoleNm(psi[i]!, psi[j]!, centred), { rel: 1e-5 }, `position form z_${i + 1}${j + 1} (nm)`);
      const m = sumRuleMass(psi[i]!, massProfile, z);
      const dE = energies[j]! - energies[i]!;
      expectClose(oscillatorStrength(dE, states.dipole(i, j), m), oscillatorStrength(dE, before, m), { rel: 2e-5 }, `f_${i + 1}${j + 1}`);
    }
  });

  it('with an energy-dependent mass, states are orthogonal in the two-band inner product but not in ∫ψ_iψ_j dz', () => {
    // Closed-form identity (derived in intersubbandStates): (E_i − E_j)⟨i|j⟩ = 0 with the weight
    // (ħ²/2m0) α m on p_i p_j; the plain overlap of states of different operators H(E_i), H(E_j) is not 0.
    const profile = steppedWell(1);
    const energies = solveBand(profile).states.map((s) => s.energy);
    const states = intersubbandStates(profile, energies);
    const z = Float64Array.from({ length: 8001 }, (_, i) => -20 + (67 * i) / 8000);
    const psi = energies.map((e) => wavefunction(profile, e, z));
    let largestPlain = 0;
    for (let i = 0; i < energies.length; i++) {
      expectClose(states.overlap(i, i), 1, { abs: 1e-12 }, `⟨${i + 1}|${i + 1}⟩`);
      for (let j = i + 1; j < energies.length; j++) {
        expectClose(states.overlap(i, j), 0, { abs: 1e-10 }, `⟨${i + 1}|${j + 1}⟩`);
        largestPlain = Math.max(largestPlain, Math.abs(simpson(psi[i]!.map((v, k) => v * psi[j]![k]!), z)));
      }
    }
    expect(largestPlain).toBeGreaterThan(1e-3);
  });

  it('the position form about the centre equals the origin-free velocity form (energy-dependent mass)', () => {
    const profile = steppedWell(1);
    const energies = solveBand(profile).states.map((s) => s.energy);
    const states = intersubbandStates(profile, energies);
    for (const [i, j] of pairs(energies.length)) {
      expectClose(states.position(i, j), states.dipole(i, j), { rel: 1e-9, abs: 1e-12 }, `z_${i + 1}${j + 1}: position vs velocity form (nm)`);
    }
  });

  it('rejects indices out of range, a dipole of one state with itself and non-finite energies', () => {
    const profile = steppedWell(1);
    const states = intersubbandStates(profile, solveBand(profile).states.map((s) => s.energy));
    expect(() => states.dipole(0, states.count)).toThrow(InputError);
    expect(() => states.overlap(-1, 0)).toThrow(InputError);
    expect(() => states.dipole(1, 1)).toThrow(/position\(i, i\)/);
    expect(() => intersubbandStates(profile, [Number.NaN])).toThrow(InputError);
    expect(() => intersubbandStates(profile, [0.5])).toThrow(InputError);
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
