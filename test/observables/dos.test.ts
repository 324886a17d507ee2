import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import fixture from '../reference/observables/dos.json' with { type: 'json' };
import { dos1d, dos2d, dos3d, erf, stepHeight2d } from '../../engine/observables/dos.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from './close.js';

/** Trapezoid integral of samples g on a uniform grid of step h. */
const trapezoid = (g: readonly number[], h: number): number => h * (g.reduce((a, b) => a + b, 0) - 0.5 * (g[0] + g[g.length - 1]));
const grid = (from: number, to: number, n: number): number[] => Array.from({ length: n + 1 }, (_, i) => from + ((to - from) * i) / n);

describe('dos2d', () => {
  it('m = 0.067 m0 gives 2.80e13 states per eV per cm² per subband (common practice)', () => {
    expectClose(stepHeight2d(0.067), 2.8e13, { rel: 0.005 }, 'm/(πħ²) at m = 0.067');
    const [below, above] = dos2d({ subbands: [{ energy: 0.1, mass: 0.067 }], energies_eV: [0.0999, 0.1001] });
    expect(below).toBe(0);
    expectClose(above, stepHeight2d(0.067), { rel: 1e-15 }, 'one step above the edge');
  });

  it('the staircase g2/L of an infinite well touches the bulk g3 at every edge E_n = n² E_1 (common practice)', () => {
    const mass = 0.067;
    const widthNm = 10;
    const e1 = (HBAR2_OVER_2M0 * Math.PI ** 2) / (mass * widthNm ** 2);
    const subbands = [1, 2, 3, 4, 5].map((n) => ({ energy: n * n * e1, mass }));
    const edges = subbands.map((s) => s.energy);
    const g2 = dos2d({ subbands, energies_eV: edges });
    const g3 = dos3d({ edge_eV: 0, mass, energies_eV: edges });
    const lengthCm = widthNm * 1e-7;
    edges.forEach((e, i) => expectClose(g2[i] / lengthCm, g3[i], { rel: 1e-12 }, `g2/L vs g3 at E_${i + 1} = ${e} eV`));
    // between edges the staircase lies below the envelope
    const mid = edges.slice(0, -1).map((e, i) => 0.5 * (e + edges[i + 1]));
    const g2mid = dos2d({ subbands, energies_eV: mid });
    const g3mid = dos3d({ edge_eV: 0, mass, energies_eV: mid });
    mid.forEach((e, i) => expect(g2mid[i] / lengthCm < g3mid[i], `g2/L < g3 at ${e} eV`).toBe(true));
  });

  it('Gaussian and Lorentzian broadening match numerical convolution (dos_fixture.py, scipy quad)', () => {
    const gauss = dos2d({ subbands: fixture.well, energies_eV: fixture.energies_eV, broadening: { kind: 'gaussian', sigma_eV: fixture.sigma_eV } });
    const lor = dos2d({ subbands: fixture.well, energies_eV: fixture.energies_eV, broadening: { kind: 'lorentzian', gamma_eV: fixture.gamma2_eV } });
    const scale = stepHeight2d(0.067);
    fixture.energies_eV.forEach((e, i) => {
      expectClose(gauss[i], fixture.g2_gaussian[i], { rel: 1e-10, abs: 1e-12 * scale }, `gaussian g2 at ${e} eV`);
      expectClose(lor[i], fixture.g2_lorentzian[i], { rel: 1e-10, abs: 1e-12 * scale }, `lorentzian g2 at ${e} eV`);
    });
  });

  it('broadening conserves the number of states in a window symmetric about the edge (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 0.02, noNaN: true }),
        fc.constantFrom<'gaussian' | 'lorentzian'>('gaussian', 'lorentzian'),
        (width, kind) => {
          const edge = 0.1;
          const half = 12 * width;
          const n = 4000;
          const energies = grid(edge - half, edge + half, n);
          const broadening = kind === 'gaussian' ? { kind, sigma_eV: width } : { kind, gamma_eV: width };
          const g = dos2d({ subbands: [{ energy: edge, mass: 0.067 }], energies_eV: energies, broadening });
          const sharp = stepHeight2d(0.067) * half;
          // the broadened minus sharp step is odd about the edge; the trapezoid rule on the
          // symmetric grid cancels it except for the kink at the edge, error ≲ 1e-4 relative
          expectClose(trapezoid(g, (2 * half) / n), sharp, { rel: 1e-4 }, `${kind} width ${width} eV`);
        },
      ),
      { numRuns: 30 },
    );
  });
});

describe('dos1d', () => {
  it('equals √(2m)/(πħ) (E − E_n)^(−1/2) per subband (common practice) and is 0 below the edge', () => {
    const mass = 0.067;
    const [below, at, above] = dos1d({ subbands: [{ energy: 0.05, mass }], energies_eV: [0.04, 0.05, 0.06] });
    expect(below).toBe(0);
    expect(at).toBe(Number.POSITIVE_INFINITY);
    // √(2 m m0)/ħ = √(m/(ħ²/2m0)) nm⁻¹ eV^(−1/2); ×1e7 per cm
    expectClose(above, (Math.sqrt(mass / HBAR2_OVER_2M0) / Math.PI / Math.sqrt(0.01)) * 1e7, { rel: 1e-14 }, 'g1 at 10 meV above edge');
  });

  it('Lorentzian broadening matches numerical convolution (dos_fixture.py, scipy quad)', () => {
    const g = dos1d({ subbands: fixture.wire, energies_eV: fixture.energies_eV, broadening: { kind: 'lorentzian', gamma_eV: fixture.gamma1_eV } });
    fixture.energies_eV.forEach((e, i) => expectClose(g[i], fixture.g1_lorentzian[i], { rel: 1e-9 }, `lorentzian g1 at ${e} eV`));
  });

  it('Lorentzian broadening conserves the number of states: ∫ g1 → sharp count 2√(2m)(E − E_n)^(1/2)/(πħ) (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 5e-3, noNaN: true }), (gamma) => {
        const mass = 0.067;
        const top = 0.5;
        // the window starts at −20 eV; the Lorentzian tail below it holds √(2(r + ε)) = Γ/√20 states (in units
        // of the prefactor), ≤ 8e-4 of the 2√top above
        const energies = grid(-20, top, 400000);
        const g = dos1d({ subbands: [{ energy: 0, mass }], energies_eV: energies, broadening: { kind: 'lorentzian', gamma_eV: gamma } });
        const sharp = ((2 * Math.sqrt(mass / HBAR2_OVER_2M0)) / Math.PI) * Math.sqrt(top) * 1e7;
        // and the broadened count at `top` exceeds 2√top by Γ²/(8 top²) ≤ 1e-4 relative: 2e-3 covers both
        expectClose(trapezoid(g, (top + 20) / 400000), sharp, { rel: 2e-3 }, `Γ = ${gamma} eV`);
      }),
      { numRuns: 5 },
    );
  });
});

describe('erf', () => {
  it('matches scipy.special.erf (dos_fixture.py)', () => {
    for (const { x, erf: expected } of fixture.erf) expectClose(erf(x), expected, { rel: 1e-14, abs: 1e-16 }, `erf(${x})`);
  });
});

describe('input checks', () => {
  it('rejects non-positive masses and widths with InputError', () => {
    expect(() => dos2d({ subbands: [{ energy: 0, mass: -1 }], energies_eV: [0] })).toThrow(InputError);
    expect(() => dos2d({ subbands: [{ energy: 0, mass: 0.1 }], energies_eV: [0], broadening: { kind: 'gaussian', sigma_eV: 0 } })).toThrow(InputError);
    expect(() => dos1d({ subbands: [{ energy: Number.NaN, mass: 0.1 }], energies_eV: [0] })).toThrow(InputError);
    expect(() => dos3d({ edge_eV: 0, mass: 0.1, energies_eV: [Number.POSITIVE_INFINITY] })).toThrow(InputError);
  });
});
