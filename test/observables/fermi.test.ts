import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import fixture from '../reference/observables/fermi_dirac.json' with { type: 'json' };
import { fermiDirac, fermiDiracInverse, logFermiDirac, rootOfIncreasing } from '../../engine/observables/fermi.js';
import type { FermiOrder } from '../../engine/observables/fermi.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from './close.js';

const HALF_ORDERS: readonly (-0.5 | 0.5)[] = [-0.5, 0.5];
const ORDERS: readonly FermiOrder[] = [-0.5, 0, 0.5];
/** Γ(j+2) for j = −1/2, 0, 1/2: Γ(3/2) = √π/2, Γ(2) = 1, Γ(5/2) = 3√π/4. */
const GAMMA_J_PLUS_2 = new Map<number, number>([
  [-0.5, Math.sqrt(Math.PI) / 2],
  [0, 1],
  [0.5, (3 * Math.sqrt(Math.PI)) / 4],
]);

describe('fermiDirac: closed forms at η = 0', () => {
  // ζ(1/2) = −1.4603545088095868, ζ(3/2) = 2.6123753486854883 (from memory, standard values);
  // F_{-1/2}(0) = (1 − √2) ζ(1/2), F_{1/2}(0) = (1 − 2^(−1/2)) ζ(3/2) (closed forms, eta function
  // identity F_j(0) = (1 − 2^(−j)) ζ(j+1)).
  it('F_{-1/2}(0) = (1 − √2) ζ(1/2) = 0.6048986434', () => {
    expectClose(fermiDirac(-0.5, 0), (1 - Math.SQRT2) * -1.4603545088095868, { rel: 1e-12 }, 'F_{-1/2}(0)');
    expectClose(fermiDirac(-0.5, 0), 0.6048986434, { abs: 1e-10 }, 'F_{-1/2}(0) printed value');
  });
  it('F_{1/2}(0) = (1 − 2^(−1/2)) ζ(3/2) = 0.7651470246', () => {
    expectClose(fermiDirac(0.5, 0), (1 - Math.SQRT1_2) * 2.6123753486854883, { rel: 1e-12 }, 'F_{1/2}(0)');
    expectClose(fermiDirac(0.5, 0), 0.7651470246, { abs: 1e-10 }, 'F_{1/2}(0) printed value');
  });
  it('F_0(0) = ln 2 (closed form)', () => {
    expectClose(fermiDirac(0, 0), Math.LN2, { rel: 1e-15 }, 'F_0(0)');
  });
});

describe('fermiDirac: scipy quad fixture (test/reference/observables/fermi_dirac_fixture.py)', () => {
  // The brief asks for 1e-9 relative over η ∈ [−40, 60]; the fixture agrees with an independent
  // 30-digit polylog evaluation to 1e-15, so a 1e-11 tolerance leaves room only for our own error.
  for (const row of fixture.rows) {
    it(`η = ${row.eta}`, () => {
      expectClose(fermiDirac(-0.5, row.eta), row.Fm12, { rel: 1e-11 }, `F_{-1/2}(${row.eta})`);
      expectClose(fermiDirac(0, row.eta), row.F0, { rel: 1e-13 }, `F_0(${row.eta})`);
      expectClose(fermiDirac(0.5, row.eta), row.F12, { rel: 1e-11 }, `F_{1/2}(${row.eta})`);
      expectClose(logFermiDirac(0.5, row.eta), Math.log(row.F12), { abs: 1e-11 }, `ln F_{1/2}(${row.eta})`);
    });
  }
});

describe('fermiDirac: limits and identities', () => {
  it('non-degenerate series F_j(η) = Σ (−1)^(k+1) e^(kη) / k^(j+1) for η ≤ −1 (Blakemore 1982)', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ORDERS), fc.double({ min: -40, max: -1, noNaN: true }), (j, eta) => {
        let series = 0;
        for (let k = 1; k <= 60; k++) series += ((k % 2 === 1 ? 1 : -1) * Math.exp(k * eta)) / k ** (j + 1);
        expectClose(fermiDirac(j, eta), series, { rel: 1e-12 }, `F_${j}(${eta})`);
      }),
    );
  });

  it('F_j(η) → e^η for η ≪ 0, and logFermiDirac stays finite where e^η underflows', () => {
    for (const j of ORDERS) {
      // first correction is −e^η / 2^(j+1), so the relative gap is below e^η
      for (const eta of [-20, -30, -40]) expectClose(fermiDirac(j, eta) / Math.exp(eta), 1, { abs: Math.exp(eta) }, `F_${j}(${eta}) e^−η`);
      expectClose(logFermiDirac(j, -1000), -1000, { abs: 1e-12 }, `ln F_${j}(−1000)`);
    }
  });

  it('F_j(η) → η^(j+1)/Γ(j+2) for η ≫ 0 with relative gap ≤ 1.5/η² (Sommerfeld: (π²/6) j(j+1)/η²)', () => {
    for (const j of ORDERS) {
      for (const eta of [60, 200, 1e3, 1e4]) {
        const limit = eta ** (j + 1) / (GAMMA_J_PLUS_2.get(j) ?? Number.NaN);
        expectClose(fermiDirac(j, eta) / limit, 1, { abs: 1.5 / eta ** 2 }, `F_${j}(${eta}) / degenerate limit`);
      }
    }
  });

  it('dF_{1/2}/dη = F_{-1/2} and dF_0/dη = F_{-1} = 1/(1 + e^(−η)) (central differences, step 1e-4)', () => {
    fc.assert(
      fc.property(fc.double({ min: -40, max: 150, noNaN: true }), (eta) => {
        const h = 1e-4;
        const d12 = (fermiDirac(0.5, eta + h) - fermiDirac(0.5, eta - h)) / (2 * h);
        // truncation h² F'''/6 and rounding 1e-16 F/h both stay below 1e-7 relative here
        expectClose(d12, fermiDirac(-0.5, eta), { rel: 1e-7 }, `dF_{1/2}/dη at ${eta}`);
        const d0 = (fermiDirac(0, eta + h) - fermiDirac(0, eta - h)) / (2 * h);
        expectClose(d0, 1 / (1 + Math.exp(-eta)), { rel: 1e-7 }, `dF_0/dη at ${eta}`);
      }),
    );
  });

  it('is continuous across the switch to the Sommerfeld expansion at η = 100', () => {
    for (const j of HALF_ORDERS) {
      // the slope F_(j−1)(100) < 1 moves F by under 2e-12 across the 2e-12 gap
      expectClose(fermiDirac(j, 100 + 1e-12), fermiDirac(j, 100 - 1e-12), { rel: 1e-12 }, `F_${j} at 100 ± 1e-12`);
    }
  });
});

describe('fermiDiracInverse', () => {
  it('round-trips η → F_j(η) → η over [−40, 60] to 1e-9', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ORDERS), fc.double({ min: -40, max: 60, noNaN: true }), (j, eta) => {
        expectClose(fermiDiracInverse(j, fermiDirac(j, eta)), eta, { abs: 1e-9 * Math.max(1, Math.abs(eta)) }, `inverse F_${j} at η = ${eta}`);
      }),
    );
  });
  it('inverts F_0 in closed form: F_0 = ln 2 → η = 0', () => {
    expectClose(fermiDiracInverse(0, Math.LN2), 0, { abs: 1e-15 }, 'inverse F_0(ln 2)');
  });
  it('rejects non-positive values and unsupported orders with InputError', () => {
    expect(() => fermiDiracInverse(0.5, 0)).toThrow(InputError);
    expect(() => fermiDirac(1 as FermiOrder, 0)).toThrow(InputError);
    expect(() => fermiDirac(0.5, Number.NaN)).toThrow(InputError);
  });
});

describe('rootOfIncreasing', () => {
  it('finds x³ = c from a starting interval that does not bracket the root', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e3, max: 1e3, noNaN: true }), (c) => {
        const x = rootOfIncreasing((v) => v * v * v - c, 0, 1, 1e-12);
        expectClose(x, Math.cbrt(c), { abs: 1e-10 }, `cube root of ${c}`);
      }),
    );
  });
});
