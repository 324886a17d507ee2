/**
 * resolveMaterial and customMaterial: trade facts, the Varshni law, closed-form masses, and bad input.
 */
import { describe, expect, it } from 'vitest';
import { customMaterial, parseFormula, resolveMaterial, type Alloy } from '../../materials/index.js';
import { expectClose, expectInputError } from './check.js';

const GaAs = parseFormula('GaAs');
const at = (a: Alloy, T: number, substrate: Alloy | null = null) => resolveMaterial(a, { temperature_K: T, substrate });

describe('GaAs', () => {
  it('Eg(300 K) = 1.4225 ± 0.001 eV (Varshni with VMR2001 GaAs values: 1.519 − 0.5405e-3·300²/504)', () => {
    expectClose(at(GaAs, 300).EgG, 1.4225, 0.001, 'GaAs EgΓ(300 K)');
  });
  it('Eg(0 K) is the tabulated 1.519 eV (VMR2001 Table I, from memory)', () => {
    expectClose(at(GaAs, 0).EgG, 1.519, 1e-12, 'GaAs EgΓ(0 K)');
  });
  it('monolayer on GaAs at 300 K is a/2 = 0.2827 ± 0.0001 nm (common practice)', () => {
    expectClose(at(GaAs, 300, GaAs).monolayer_nm, 0.2827, 1e-4, 'GaAs monolayer');
  });
  it('edges sit on the VMR2001 scale: Ev = VBO = −0.80 eV, Ec = Ev + EgΓ', () => {
    const m = at(GaAs, 300, GaAs);
    expectClose(m.Ehh, -0.8, 1e-12, 'Ehh'); expectClose(m.Elh, -0.8, 1e-12, 'Elh');
    expectClose(m.Ec, -0.8 + m.EgG, 1e-12, 'Ec');
  });
  it('hole masses from γ1 = 6.98, γ2 = 2.06 (closed forms, common practice / Chuang)', () => {
    const m = at(GaAs, 300);
    expectClose(m.mhh_z, 1 / (6.98 - 4.12), 1e-12, 'mhh_z');
    expectClose(m.mlh_z, 1 / (6.98 + 4.12), 1e-12, 'mlh_z');
    expectClose(m.mhh_par, 1 / (6.98 + 2.06), 1e-12, 'mhh_par');
    expectClose(m.mlh_par, 1 / (6.98 - 2.06), 1e-12, 'mlh_par');
  });
  it('a free-standing layer has no substrate, no strain and infinite critical thickness', () => {
    const m = at(parseFormula('In0.2Ga0.8As'), 300);
    expect(m.substrate).toBe(null);
    expectClose(m.strain_par, 0, 0, 'ε∥');
    expect(m.criticalThickness_nm).toBe(Infinity);
  });
});

describe('valleys', () => {
  it('AlAs is indirect with its X valley lowest (VMR2001 gaps: X 2.24 < L 2.46 < Γ 3.099 eV at 0 K)', () => {
    const m = at(parseFormula('AlAs'), 300);
    expect(m.indirect).toBe(true);
    expect(m.lowestValley).toBe('X');
  });
  it('GaSb stays direct (Γ 0.812 < L 0.875 eV at 0 K)', () => {
    const m = at(parseFormula('GaSb'), 0);
    expect(m.indirect).toBe(false);
    expect(m.lowestValley).toBe('Γ');
  });
});

describe('bad input', () => {
  it('negative temperature', () => expectInputError(() => at(GaAs, -5), 'bad-value', /temperature: .*got -5/));
  it('non-finite temperature', () => expectInputError(() => at(GaAs, Infinity), 'bad-value', /temperature: .*got Infinity/));
  it('0 K is allowed', () => expectClose(at(GaAs, 0).temperature_K, 0, 0, 'T'));
  it('unknown substrate element', () =>
    expectInputError(() => at(GaAs, 300, { III: { Xy: 1 }, V: { As: 1 } }), 'bad-formula', /substrate "XyAs": unknown element "Xy"/));
  it('substrate without parameters', () =>
    expectInputError(() => at(GaAs, 300, { III: { Ga: 1 }, V: { N: 1 } }), 'unknown-material', /substrate "GaN": no parameters for GaN/));
  it('layer fractions not summing to 1', () =>
    expectInputError(() => at({ III: { In: 0.3, Ga: 0.6 }, V: { As: 1 } }, 300), 'bad-formula', /group-III fractions sum to 0\.9/));
});

describe('customMaterial', () => {
  const def = { name: 'well', Ec: 0.5, Ev: -0.9, me: 0.067, mhh: 0.35, mlh: 0.09, a_nm: 0.5653 };
  it('takes the user edges as given: Ehh = Elh = Ev, Eg = Ec − Ev, unstrained, direct', () => {
    const m = customMaterial(def);
    expectClose(m.EgStrained, 1.4, 1e-12, 'Eg'); expectClose(m.Ehh, -0.9, 0, 'Ehh'); expectClose(m.Elh, -0.9, 0, 'Elh');
    expectClose(m.mhh_par, 0.35, 0, 'mhh_par defaults to mhh'); expectClose(m.monolayer_nm, 0.28265, 1e-12, 'monolayer');
    expect(m.indirect).toBe(false);
    expect(m.criticalThickness_nm).toBe(Infinity);
  });
  it('rejects Ec below Ev', () => expectInputError(() => customMaterial({ ...def, Ec: -1 }), 'bad-value', /Ec must lie above Ev/));
  it('rejects a non-positive mass', () => expectInputError(() => customMaterial({ ...def, me: 0 }), 'bad-value', /me must be a positive mass, got 0/));
  it('rejects a missing edge given as NaN', () => expectInputError(() => customMaterial({ ...def, Ec: NaN }), 'bad-value', /Ec must be a finite energy, got NaN/));
});
