import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { effectiveBohrRadius, effectiveRydberg, fractionalDimensionBinding, wellExciton } from '../../engine/observables/exciton.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from './close.js';

const GAAS = { reducedMass: 0.058, dielectricConstant: 12.9 };

describe('fractional-dimensional binding energy (X.-F. He, Phys. Rev. B 43, 2063 (1991))', () => {
  it('gives Ry* at α = 3 and 4 Ry* at α = 2 exactly (hydrogen in 3-D and 2-D, closed forms)', () => {
    expect(fractionalDimensionBinding(3, 0.005)).toBe(0.005);
    expect(fractionalDimensionBinding(2, 0.005)).toBe(0.02);
  });

  it('wellExciton reaches the 2-D limit at zero width and the 3-D limit for a wide well', () => {
    const ry = effectiveRydberg(GAAS.reducedMass, GAAS.dielectricConstant);
    expectClose(wellExciton({ effectiveWidth_nm: 0, ...GAAS }).binding_eV, 4 * ry, { rel: 1e-15 }, 'L* = 0');
    expectClose(wellExciton({ effectiveWidth_nm: 2000, ...GAAS }).binding_eV, ry, { rel: 1e-15 }, 'L* = 2 µm');
  });

  it('binding falls as the well widens (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 100, noNaN: true }), fc.double({ min: 0.01, max: 10, noNaN: true }), (w, dw) => {
        const narrow = wellExciton({ effectiveWidth_nm: w, ...GAAS }).binding_eV;
        const wide = wellExciton({ effectiveWidth_nm: w + dw, ...GAAS }).binding_eV;
        expect(wide < narrow, `E_b(${w + dw} nm) = ${wide} vs E_b(${w} nm) = ${narrow}`).toBe(true);
      }),
    );
  });
});

describe('GaAs values', () => {
  it('Ry* = 13.6057 eV · μ/ε_r² = 4.742 meV and a_B = 11.77 nm for μ = 0.058, ε_r = 12.9 (closed form)', () => {
    expectClose(effectiveRydberg(0.058, 12.9), (13.6057 * 0.058) / 12.9 ** 2, { rel: 1e-5 }, 'Ry*');
    expectClose(effectiveBohrRadius(0.058, 12.9), (0.0529177 * 12.9) / 0.058, { rel: 1e-6 }, 'a_B');
  });

  it('is within 15 % of the measured bulk GaAs exciton binding ≈ 4.2 meV (from memory)', () => {
    // the hydrogenic model with these textbook inputs overestimates by ≈ 13 %: the inputs, not the
    // formula, set this gap (μ ≈ 0.051 would reproduce 4.2 meV), so the tolerance is 15 %
    expectClose(effectiveRydberg(GAAS.reducedMass, GAAS.dielectricConstant), 4.2e-3, { rel: 0.15 }, 'bulk GaAs Ry*');
  });

  it('5–10 nm GaAs/AlGaAs wells bind at 8–10 meV (R. C. Miller et al., Phys. Rev. B 24, 1134 (1981)) within a loose band', () => {
    // L* = L + 3 nm: ≈ 1.5 nm envelope penetration into Al0.3Ga0.7As barriers on each side (from
    // memory, rough). Band 7–12 meV = the measured 8–10 meV widened by the model's ~20 % accuracy.
    for (const widthNm of [5, 7, 10]) {
      const eb = wellExciton({ effectiveWidth_nm: widthNm + 3, ...GAAS }).binding_eV;
      expect(eb > 7e-3 && eb < 12e-3, `L = ${widthNm} nm: E_b = ${(eb * 1e3).toFixed(2)} meV, expected 7–12 meV`).toBe(true);
    }
  });
});

describe('input checks', () => {
  it('rejects out-of-range dimensions, masses and widths with InputError', () => {
    expect(() => fractionalDimensionBinding(1.5, 0.005)).toThrow(InputError);
    expect(() => effectiveRydberg(0, 12.9)).toThrow(InputError);
    expect(() => wellExciton({ effectiveWidth_nm: -1, ...GAAS })).toThrow(InputError);
  });
});
