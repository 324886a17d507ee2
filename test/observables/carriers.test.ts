import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import fixture from '../reference/observables/carriers.json' with { type: 'json' };
import {
  fermiLevelForLineDensity,
  fermiLevelForSheetDensity,
  lineDensity,
  quasiFermiLevels,
  sheetDensity,
} from '../../engine/observables/carriers.js';
import type { Subband } from '../../engine/observables/carriers.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from './close.js';

const WELL: readonly Subband[] = [
  { energy: 0.03, mass: 0.067 },
  { energy: 0.11, mass: 0.067 },
  { energy: 0.02, mass: 0.35 },
];

const subbandsArb = fc.array(
  fc.record({ energy: fc.double({ min: 0, max: 0.3, noNaN: true }), mass: fc.double({ min: 0.02, max: 1, noNaN: true }) }),
  { minLength: 1, maxLength: 5 },
);

describe('sheetDensity and lineDensity against scipy quad of DOS × Fermi function (carriers_fixture.py)', () => {
  for (const c of fixture.cases) {
    it(`E_F = ${c.fermiLevel_eV} eV, T = ${c.temperature_K} K`, () => {
      const args = { fermiLevel_eV: c.fermiLevel_eV, temperature_K: c.temperature_K };
      expectClose(sheetDensity({ subbands: fixture.well, ...args }), c.n2d_cm2, { rel: 1e-10 }, `n2D ${JSON.stringify(args)}`);
      expectClose(lineDensity({ subbands: fixture.wire, ...args }), c.n1d_cm1, { rel: 1e-10 }, `n1D ${JSON.stringify(args)}`);
    });
  }
});

describe('T → 0 limits (closed forms)', () => {
  // At T = 0.01 K, kT = 8.6e-7 eV; with E_F at least 2 meV from every edge η ≥ 2300, so the
  // Fermi tails (e^(−η)) vanish and the Sommerfeld correction to F_{-1/2} is π²/(24η²) < 1e-7.
  const awayFromEdges = (subbands: readonly Subband[], ef: number): boolean => subbands.every((s) => Math.abs(ef - s.energy) > 2e-3);

  it('n2D → Σ m_n (E_F − E_n)/(πħ²) over occupied subbands (common practice)', () => {
    fc.assert(
      fc.property(subbandsArb, fc.double({ min: 0.01, max: 0.4, noNaN: true }), (subbands, ef) => {
        fc.pre(awayFromEdges(subbands, ef) && subbands.some((s) => s.energy < ef));
        // m m0/(πħ²) = m/(2π ħ²/(2m0)) nm⁻² eV⁻¹, ×1e14 per cm²
        const expected = subbands.reduce((n, s) => n + (ef > s.energy ? (s.mass * (ef - s.energy)) / (2 * Math.PI * HBAR2_OVER_2M0) : 0), 0) * 1e14;
        expectClose(sheetDensity({ subbands, fermiLevel_eV: ef, temperature_K: 0.01 }), expected, { rel: 1e-9 }, `n2D ${JSON.stringify({ subbands, ef })}`);
      }),
    );
  });

  it('n1D → Σ (2/π) k_F,n with k_F = √(2m(E_F − E_n))/ħ (common practice)', () => {
    fc.assert(
      fc.property(subbandsArb, fc.double({ min: 0.01, max: 0.4, noNaN: true }), (subbands, ef) => {
        fc.pre(awayFromEdges(subbands, ef) && subbands.some((s) => s.energy < ef));
        // k_F = √(m (E_F − E_n)/(ħ²/2m0)) nm⁻¹, ×1e7 per cm
        const expected = subbands.reduce((n, s) => n + (ef > s.energy ? (2 / Math.PI) * Math.sqrt((s.mass * (ef - s.energy)) / HBAR2_OVER_2M0) : 0), 0) * 1e7;
        expectClose(lineDensity({ subbands, fermiLevel_eV: ef, temperature_K: 0.01 }), expected, { rel: 1e-6 }, `n1D ${JSON.stringify({ subbands, ef })}`);
      }),
    );
  });
});

describe('monotonicity and inverses (properties)', () => {
  it('both densities increase with E_F', () => {
    fc.assert(
      fc.property(
        subbandsArb,
        fc.double({ min: -0.2, max: 0.5, noNaN: true }),
        fc.double({ min: 1e-4, max: 0.1, noNaN: true }),
        fc.double({ min: 50, max: 500, noNaN: true }),
        (subbands, ef, step, t) => {
          const a = { subbands, temperature_K: t };
          const n2 = [sheetDensity({ ...a, fermiLevel_eV: ef }), sheetDensity({ ...a, fermiLevel_eV: ef + step })];
          const n1 = [lineDensity({ ...a, fermiLevel_eV: ef }), lineDensity({ ...a, fermiLevel_eV: ef + step })];
          expect(n2[1] > n2[0], `n2D at ${ef} then ${ef + step} eV, T ${t} K: ${n2}`).toBe(true);
          expect(n1[1] > n1[0], `n1D at ${ef} then ${ef + step} eV, T ${t} K: ${n1}`).toBe(true);
        },
      ),
    );
  });

  it('fermiLevelForSheetDensity round-trips to 1e-9 relative in density', () => {
    fc.assert(
      fc.property(subbandsArb, fc.double({ min: 8, max: 13.5, noNaN: true }), fc.double({ min: 0.01, max: 600, noNaN: true }), (subbands, logN, t) => {
        const n = 10 ** logN;
        const ef = fermiLevelForSheetDensity({ subbands, density_cm2: n, temperature_K: t });
        expectClose(sheetDensity({ subbands, fermiLevel_eV: ef, temperature_K: t }), n, { rel: 1e-9 }, `n2D(E_F(${n} cm⁻², ${t} K))`);
      }),
    );
  });

  it('fermiLevelForLineDensity round-trips to 1e-9 relative in density', () => {
    fc.assert(
      fc.property(subbandsArb, fc.double({ min: 3, max: 7, noNaN: true }), fc.double({ min: 0.01, max: 600, noNaN: true }), (subbands, logN, t) => {
        const n = 10 ** logN;
        const ef = fermiLevelForLineDensity({ subbands, density_cm1: n, temperature_K: t });
        expectClose(lineDensity({ subbands, fermiLevel_eV: ef, temperature_K: t }), n, { rel: 1e-9 }, `n1D(E_F(${n} cm⁻¹, ${t} K))`);
      }),
    );
  });
});

describe('quasiFermiLevels', () => {
  it('mirror-image electron and hole subbands put the two levels symmetric about mid-gap', () => {
    // absolute scale: valence edge 0, conduction edge 1.5 eV; electron subband at 1.53 and hole
    // subband at −0.03 (particle sense +0.03), same mass: the levels mirror about 0.75 eV
    const electronSubbands = [{ energy: 1.53, mass: 0.067 }];
    const holeSubbands = [{ energy: 0.03, mass: 0.067 }];
    for (const n of [1e10, 1e12, 5e12]) {
      const q = quasiFermiLevels({ electronSubbands, holeSubbands, sheetDensity_cm2: n, temperature_K: 300 });
      expectClose(q.electron_eV + q.hole_eV, 1.5, { abs: 1e-12 }, `F_e + F_h at ${n} cm⁻²`);
      expectClose(q.separation_eV, q.electron_eV - q.hole_eV, { abs: 0 }, 'separation');
    }
  });

  it('gives back the injected density in each band and widens with injection', () => {
    const electronSubbands = [{ energy: 1.45, mass: 0.067 }, { energy: 1.55, mass: 0.067 }];
    const holeSubbands = [{ energy: 0.008, mass: 0.11 }, { energy: 0.03, mass: 0.08 }, { energy: 0.035, mass: 0.2 }];
    let previous = -Infinity;
    for (const n of [1e11, 1e12, 3e12, 1e13]) {
      const q = quasiFermiLevels({ electronSubbands, holeSubbands, sheetDensity_cm2: n, temperature_K: 300 });
      expectClose(sheetDensity({ subbands: electronSubbands, fermiLevel_eV: q.electron_eV, temperature_K: 300 }), n, { rel: 1e-9 }, `electrons at ${n}`);
      // holes: particle-sense level is −hole_eV
      expectClose(sheetDensity({ subbands: holeSubbands, fermiLevel_eV: -q.hole_eV, temperature_K: 300 }), n, { rel: 1e-9 }, `holes at ${n}`);
      expect(q.separation_eV > previous, `separation at ${n}: ${q.separation_eV} after ${previous}`).toBe(true);
      previous = q.separation_eV;
    }
  });
});

describe('input checks', () => {
  it('rejects empty subband lists, non-positive T and densities with InputError', () => {
    expect(() => sheetDensity({ subbands: [], fermiLevel_eV: 0, temperature_K: 300 })).toThrow(InputError);
    expect(() => sheetDensity({ subbands: WELL, fermiLevel_eV: 0, temperature_K: 0 })).toThrow(InputError);
    expect(() => fermiLevelForSheetDensity({ subbands: WELL, density_cm2: -1, temperature_K: 300 })).toThrow(InputError);
    expect(() => lineDensity({ subbands: WELL, fermiLevel_eV: Number.NaN, temperature_K: 300 })).toThrow(InputError);
  });
});
