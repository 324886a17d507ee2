/**
 * Carrier statistics of the self-consistent solve against closed forms: the 2-D subband filling
 * (F_0(η) = ln(1 + e^η), common practice), the semiclassical gas above a barrier (its three regimes
 * meeting, and the complete integral (√π/2) F_{1/2}(η) of engine/observables/fermi.ts, J. S.
 * Blakemore, Solid-State Electron. 25, 1067 (1982)), the scaled complementary error function
 * (erfcx(1) = e·erfc(1) = 0.42758357615580700, and its asymptotic series, Abramowitz and Stegun
 * 7.1.23), and derivatives against finite differences.
 */
import { describe, expect, it } from 'vitest';
import { erfcx, gasDensity, gasSite, gasSlope, incompleteHalf, neutralLevel, sheetDos, subbandFilling, subbandSlope } from '../../engine/poisson/occupation.js';
import { fermiDirac } from '../../engine/observables/fermi.js';
import { HBAR2_OVER_2M0, KB_EV_PER_K } from '../../engine/constants.js';
import { expectClose } from '../observables/close.js';

const SQRT_PI = Math.sqrt(Math.PI);

/** ∫_0^b √t/(1 + e^(t − η)) dt by composite Simpson after t = s² (a smooth integrand), 20000 intervals. */
function lowerPart(eta: number, b: number): number {
  const n = 20000;
  const top = Math.sqrt(b);
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const s = (top * i) / n;
    const f = 2 * s * s / (1 + Math.exp(s * s - eta));
    sum += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * f;
  }
  return (sum * top) / (3 * n);
}

describe('subband filling', () => {
  it('m/(πħ²) = 0.2799 nm⁻² eV⁻¹ (2.80e13 cm⁻² eV⁻¹) for m = 0.067 (common practice)', () => {
    expectClose(sheetDos(0.067), 0.067 / (2 * Math.PI * HBAR2_OVER_2M0), { rel: 1e-15 }, 'sheetDos');
    expectClose(sheetDos(0.067) * 1e14, 2.80e13, { rel: 2e-3 }, 'in cm⁻² eV⁻¹');
  });
  it('F = E: (m/πħ²) kT ln 2; degenerate limit at kT = 0; slope against a finite difference', () => {
    const kT = KB_EV_PER_K * 300;
    expectClose(subbandFilling(0.067, 0.1, 0.1, kT), sheetDos(0.067) * kT * Math.LN2, { rel: 1e-14 }, 'ln 2');
    expectClose(subbandFilling(0.067, 0.1, 0.13, 0), sheetDos(0.067) * 0.03, { rel: 1e-14 }, 'T = 0');
    expect(subbandFilling(0.067, 0.1, 0.09, 0)).toBe(0);
    for (const F of [0.05, 0.1, 0.2]) {
      const d = 1e-6;
      expectClose(subbandSlope(0.067, 0.1, F, kT), (subbandFilling(0.067, 0.1, F + d, kT) - subbandFilling(0.067, 0.1, F - d, kT)) / (2 * d), { rel: 1e-7 }, `slope at F = ${F}`);
    }
  });
});

describe('semiclassical gas', () => {
  it('from the band edge up it is the complete (√π/2) F_{1/2}(η), and its slope (√π/2) F_{-1/2}(η)', () => {
    for (const eta of [-30, -5, -1, 0, 2, 10, 40]) {
      const I = incompleteHalf(eta, 0);
      expectClose(I.value, (SQRT_PI / 2) * fermiDirac(0.5, eta), { rel: 1e-10 }, `value at η = ${eta}`);
      expectClose(I.slope, (SQRT_PI / 2) * fermiDirac(-0.5, eta), { rel: 1e-9 }, `slope at η = ${eta}`);
    }
  });
  it('above a barrier (b > 0) it is the complete integral less ∫_0^b (Simpson)', () => {
    for (const [eta, b] of [[-3, 1], [0, 2.5], [5, 3], [12, 8]] as const) {
      expectClose(incompleteHalf(eta, b).value, (SQRT_PI / 2) * fermiDirac(0.5, eta) - lowerPart(eta, b), { rel: 1e-9 }, `η = ${eta}, b = ${b}`);
    }
  });
  it('erfcx: e·erfc(1), erfcx(0) = 1, the asymptotic series at 30, and the two branches meeting at 2', () => {
    expect(erfcx(0)).toBe(1);
    expectClose(erfcx(1), 0.427583576155807, { rel: 1e-13 }, 'erfcx(1)');
    const x = 30;
    const t = 1 / (2 * x * x);
    expectClose(erfcx(x), (1 / (x * SQRT_PI)) * (1 - t + 3 * t * t - 15 * t * t * t), { rel: 1e-11 }, 'asymptotic at 30');
    expectClose(erfcx(2 - 1e-12), erfcx(2), { rel: 1e-11 }, 'continuity at 2');
  });
  it('the non-degenerate series, the F_{1/2} form and the quadrature agree where they meet (F 2 kT below the gas)', () => {
    const kT = KB_EV_PER_K * 300;
    for (const b of [0, 0.5, 4, 30]) {
      const site = gasSite(0.0919, 1.0, 1.0 + b * kT, kT);
      const from = site.from;
      const below = gasDensity(site, from - 2 * kT - 1e-13, kT);
      const above = gasDensity(site, from - 2 * kT + 1e-13, kT);
      expectClose(below, above, { rel: 1e-9 }, `density across the switch, b = ${b}`);
      const sb = gasSlope(site, from - 2 * kT - 1e-13, kT);
      const sa = gasSlope(site, from - 2 * kT + 1e-13, kT);
      expectClose(sb, sa, { rel: 1e-8 }, `slope across the switch, b = ${b}`);
      for (const F of [from - 10 * kT, from - kT, from + 3 * kT]) {
        const d = 1e-7;
        expectClose(gasSlope(site, F, kT), (gasDensity(site, F + d, kT) - gasDensity(site, F - d, kT)) / (2 * d), { rel: 1e-6 }, `slope at F − from = ${((F - from) / kT).toFixed(0)} kT, b = ${b}`);
      }
    }
  });
  it('GaAs bulk at the band edge at 300 K: n = N_c F_{1/2}(0), N_c = 2(m kT/2πħ²)^(3/2) = 4.35e17 cm⁻³ for m = 0.067 (common practice)', () => {
    const kT = KB_EV_PER_K * 300;
    const site = gasSite(0.067, 0, 0, kT);
    const Nc = 2 * ((0.067 * kT) / (4 * Math.PI * HBAR2_OVER_2M0)) ** 1.5;
    expectClose(gasDensity(site, 0, kT), Nc * fermiDirac(0.5, 0), { rel: 1e-12 }, 'n at η = 0');
    expectClose(Nc * 1e21, 4.35e17, { rel: 0.01 }, 'N_c of GaAs in cm⁻³');
  });
});

describe('neutral level', () => {
  it('finds the Fermi level of a sheet density: two subbands, 1e12 cm⁻², 77 K, round trip to 1e-10 relative', () => {
    const kT = KB_EV_PER_K * 77;
    const carriers = (F: number): number => subbandFilling(0.067, 0.03, F, kT) + subbandFilling(0.07, 0.1, F, kT);
    const F = neutralLevel(carriers, 1e12 * 1e-14, 0, kT);
    expectClose(carriers(F), 1e-2, { rel: 1e-10 }, 'carriers at the level found');
  });
});
