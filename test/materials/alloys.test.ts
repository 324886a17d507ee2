/**
 * Alloy interpolation: closed-form ternary and quaternary values with the VMR2001 bowings (J. Appl.
 * Phys. 89, 5815 (2001), Sec. IV, from memory), the bowings of hole masses and offsets, trade facts
 * at 300 K, and boundary properties of the interpolation (alloys.ts).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BINARIES, alloyAt, alloyParams, parseFormula, type Alloy } from '../../materials/index.js';
import { FIELDS, type Values } from '../../materials/ternaries.js';
import { expectClose } from './check.js';

function expectSameParams(got: Values, want: Values, rel: number, input: string): void {
  for (const f of FIELDS) expectClose(got[f], want[f], rel * Math.max(1, Math.abs(want[f])), `${input} .${f}`);
}

describe('ternary closed forms (VMR2001 ternary interpolation, bowing from memory)', () => {
  it('Al0.3Ga0.7As Γ gap at 0 K uses the composition-dependent bowing −0.127 + 1.310x', () => {
    // VMR2001: Eg = x Eg(AlAs) + (1−x) Eg(GaAs) − x(1−x)(−0.127 + 1.310x), with 3.099 and 1.519 eV.
    const x = 0.3;
    const expected = x * 3.099 + (1 - x) * 1.519 - x * (1 - x) * (-0.127 + 1.31 * x);
    expectClose(alloyParams(parseFormula('Al0.3Ga0.7As')).EgG0, expected, 1e-12, 'Al0.3Ga0.7As EgG0');
  });
  it('In0.53Ga0.47As electron mass bows by 0.0091 m0 (VMR2001, from memory)', () => {
    const expected = 0.53 * 0.026 + 0.47 * 0.067 - 0.53 * 0.47 * 0.0091;
    expectClose(alloyParams(parseFormula('In0.53Ga0.47As')).me, expected, 1e-12, 'In0.53Ga0.47As me');
  });
  it('Luttinger parameters are linear where no hole-mass bowing is given (AlGaAs), the lattice constant always (Vegard)', () => {
    // GaInAs bows its hole masses since the issue-12 fix, so its γ1 is no longer linear (see below).
    const p = alloyParams(parseFormula('Al0.3Ga0.7As'));
    expectClose(p.gamma1, 0.3 * 3.76 + 0.7 * 6.98, 1e-12, 'Al0.3Ga0.7As γ1');
    expectClose(p.gamma2, 0.3 * 0.82 + 0.7 * 2.06, 1e-12, 'Al0.3Ga0.7As γ2');
    expectClose(alloyParams(parseFormula('In0.53Ga0.47As')).a_nm, 0.53 * 0.60583 + 0.47 * 0.565325, 1e-12, 'In0.53Ga0.47As a');
  });
});

describe('bowings of hole masses and offsets (VMR2001 Sec. IV, from memory)', () => {
  // [001] masses of the binaries from their Luttinger parameters (VMR2001 Tables, from memory).
  const hh = (g1: number, g2: number): number => 1 / (g1 - 2 * g2);
  const lh = (g1: number, g2: number): number => 1 / (g1 + 2 * g2);
  it('Ga0.5In0.5As [001] masses follow the bowed-mass form with C_hh = −0.145, C_lh = 0.0202 m0', () => {
    const x = 0.5;
    const mhh = x * hh(6.98, 2.06) + (1 - x) * hh(20.0, 8.5) - x * (1 - x) * -0.145;
    const mlh = x * lh(6.98, 2.06) + (1 - x) * lh(20.0, 8.5) - x * (1 - x) * 0.0202;
    const p = alloyParams(parseFormula('Ga0.5In0.5As'));
    expectClose(1 / (p.gamma1 - 2 * p.gamma2), mhh, 1e-12, 'Ga0.5In0.5As m_hh[001]');
    expectClose(1 / (p.gamma1 + 2 * p.gamma2), mlh, 1e-12, 'Ga0.5In0.5As m_lh[001]');
    // The bowing matters: linear Luttinger parameters would give m_hh 0.341 and m_lh 0.0416 m0.
    expectClose(mhh, 0.3778, 5e-4, 'bowed m_hh'); expectClose(mlh, 0.0535, 5e-4, 'bowed m_lh');
  });
  it('GaInAs keeps the valence-band warping γ3 − γ2 linear (our choice, alloys.ts)', () => {
    fc.assert(fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (x) => {
      const p = alloyParams({ III: { Ga: x, In: 1 - x }, V: { As: 1 } });
      expectClose(p.gamma3 - p.gamma2, x * (2.93 - 2.06) + (1 - x) * (9.2 - 8.5), 1e-12, `Ga${x}InAs γ3 − γ2`);
    }), { numRuns: 50 });
  });
  it('Al0.5In0.5P valence-band offset bows by −0.19 eV: VBO = ½(−1.74) + ½(−0.94) + ¼·0.19', () => {
    const p = alloyParams(parseFormula('Al0.5In0.5P'));
    expectClose(p.VBO, 0.5 * -1.74 + 0.5 * -0.94 + 0.25 * 0.19, 1e-12, 'Al0.5In0.5P VBO');
    expectClose(p.VBO - (0.5 * -1.74 + 0.5 * -0.94), 0.0475, 1e-12, 'bowing raises the VBO by 47.5 meV');
  });
});

describe('quaternary closed forms (alloys.ts interpolate; binaries and bowings of VMR2001, from memory)', () => {
  it('In0.72Ga0.28As0.61P0.39 Γ gap at 0 K: bilinear binaries minus both sublattices\' bowings (Moon et al. form)', () => {
    const x = 0.28; const y = 0.61; // Ga, As
    const bilinear = x * y * 1.519 + x * (1 - y) * 2.886 + (1 - x) * y * 0.417 + (1 - x) * (1 - y) * 1.4236;
    const III = x * (1 - x) * (y * 0.477 + (1 - y) * 0.65); // GaInAs, GaInP
    const V = y * (1 - y) * (x * 0.19 + (1 - x) * 0.10); // GaAsP, InAsP
    expectClose(alloyParams(parseFormula('In0.72Ga0.28As0.61P0.39')).EgG0, bilinear - III - V, 1e-12, 'InGaAsP EgG0');
  });
  it('Al0.2Ga0.27In0.53As Γ gap at 0 K: the three pair bowings, AlGaAs taken at the projection u = (1 + x_Al − x_Ga)/2', () => {
    const al = 0.2; const ga = 0.27; const inn = 0.53;
    const u = (1 + al - ga) / 2;
    const linear = al * 3.099 + ga * 1.519 + inn * 0.417;
    const bow = al * ga * (-0.127 + 1.31 * u) + ga * inn * 0.477 + al * inn * 0.70;
    expectClose(alloyParams(parseFormula('Al0.2Ga0.27In0.53As')).EgG0, linear - bow, 1e-12, 'AlGaInAs EgG0');
  });
});

describe('facts of the trade at 300 K', () => {
  it('In0.53Ga0.47As is lattice-matched to InP within 0.1 % (common practice)', () => {
    const a = alloyAt(parseFormula('In0.53Ga0.47As'), 300).a_nm;
    const aInP = alloyAt(parseFormula('InP'), 300).a_nm;
    expectClose((a - aInP) / aInP, 0, 1e-3, 'In0.53Ga0.47As vs InP mismatch');
  });
  it('In0.53Ga0.47As gap ≈ 0.74 eV (common practice), ±0.01 eV', () => {
    expectClose(alloyAt(parseFormula('In0.53Ga0.47As'), 300).EgG, 0.74, 0.01, 'In0.53Ga0.47As EgΓ(300 K)');
  });
  it('AlxGa1−xAs Γ–X crossover lies between x = 0.40 and 0.45 (common practice)', () => {
    const d = (x: number): number => {
      const p = alloyAt({ III: { Al: x, Ga: 1 - x }, V: { As: 1 } }, 300);
      return p.EgG - p.EgX;
    };
    expect(d(0.40) < 0 && d(0.45) > 0, `EgΓ − EgX at x=0.40: ${d(0.40)}, at x=0.45: ${d(0.45)}; expected a sign change`).toBe(true);
  });
});

const frac = fc.double({ min: 0, max: 1, noNaN: true });
const params = (a: Alloy): Values => alloyParams(a);

describe('properties of the interpolation', () => {
  const ternaries: readonly [string, string, string, 'III' | 'V'][] = [
    ['Al', 'Ga', 'As', 'III'], ['In', 'Ga', 'As', 'III'], ['In', 'Al', 'As', 'III'], ['In', 'Ga', 'P', 'III'],
    ['Al', 'In', 'P', 'III'], ['Al', 'Ga', 'Sb', 'III'], ['In', 'Ga', 'Sb', 'III'],
    ['As', 'P', 'Ga', 'V'], ['As', 'P', 'In', 'V'], ['As', 'Sb', 'Ga', 'V'], ['As', 'Sb', 'In', 'V'], ['As', 'Sb', 'Al', 'V'],
  ];
  it('a ternary at fraction 0 or 1 equals its binary', () => {
    for (const [p, q, c, side] of ternaries) {
      for (const x of [0, 1]) {
        const mix = { [p]: x, [q]: 1 - x };
        const alloy: Alloy = side === 'III' ? { III: mix, V: { [c]: 1 } } : { III: { [c]: 1 }, V: mix };
        const el = x === 1 ? p : q;
        const bin = (side === 'III' ? el + c : c + el) as keyof typeof BINARIES;
        expectSameParams(params(alloy), BINARIES[bin], 1e-15, `${p}${x}${q}${1 - x} with ${c}`);
      }
    }
  });
  it('InGaAsP on its edges equals the bounding ternaries (y=1 InGaAs, y=0 InGaP, x=1 InAsP, x=0 GaAsP)', () => {
    fc.assert(fc.property(frac, (t) => {
      const q = (x: number, y: number): Values => params({ III: { In: x, Ga: 1 - x }, V: { As: y, P: 1 - y } });
      expectSameParams(q(t, 1), params({ III: { In: t, Ga: 1 - t }, V: { As: 1 } }), 1e-12, `In${t}GaAs1P0`);
      expectSameParams(q(t, 0), params({ III: { In: t, Ga: 1 - t }, V: { P: 1 } }), 1e-12, `In${t}GaAs0P1`);
      expectSameParams(q(1, t), params({ III: { In: 1 }, V: { As: t, P: 1 - t } }), 1e-12, `In1Ga0As${t}P`);
      expectSameParams(q(0, t), params({ III: { Ga: 1 }, V: { As: t, P: 1 - t } }), 1e-12, `In0Ga1As${t}P`);
    }), { numRuns: 60 });
  });
  it('AlGaInAs with one element at 0 equals the ternary of the other two', () => {
    fc.assert(fc.property(frac, (t) => {
      const q = (al: number, ga: number, inn: number): Values => params({ III: { Al: al, Ga: ga, In: inn }, V: { As: 1 } });
      expectSameParams(q(0, 1 - t, t), params({ III: { In: t, Ga: 1 - t }, V: { As: 1 } }), 1e-12, `Al0 In${t}`);
      expectSameParams(q(t, 1 - t, 0), params({ III: { Al: t, Ga: 1 - t }, V: { As: 1 } }), 1e-12, `In0 Al${t}`);
      expectSameParams(q(t, 0, 1 - t), params({ III: { Al: t, In: 1 - t }, V: { As: 1 } }), 1e-12, `Ga0 Al${t}`);
    }), { numRuns: 60 });
  });
  it('a quaternary near a corner tends to the binary (no jump at the corner)', () => {
    const eps = 1e-7;
    const near = params({ III: { In: 1 - eps, Ga: eps }, V: { As: 1 - eps, P: eps } });
    expectSameParams(near, BINARIES.InAs, 1e-5, 'In(1−ε)Ga(ε)As(1−ε)P(ε)');
  });
  it('alloy lattice constant stays between its binaries (Vegard)', () => {
    fc.assert(fc.property(frac, frac, (x, y) => {
      const a = params({ III: { In: x, Ga: 1 - x }, V: { As: y, P: 1 - y } }).a_nm;
      const lo = Math.min(BINARIES.GaP.a_nm, BINARIES.InAs.a_nm);
      const hi = Math.max(BINARIES.GaP.a_nm, BINARIES.InAs.a_nm);
      expect(a >= lo - 1e-15 && a <= hi + 1e-15, `In${x}GaAs${y}P: a = ${a}, expected in [${lo}, ${hi}]`).toBe(true);
    }), { numRuns: 100 });
  });
});
