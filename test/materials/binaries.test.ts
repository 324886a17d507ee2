/**
 * Every stored binary parameter against VMR2001 (I. Vurgaftman, J. R. Meyer, L. R. Ram-Mohan,
 * J. Appl. Phys. 89, 5815 (2001)), Tables I–IX (one per binary). The values below are typed again
 * here, per parameter across materials and in the paper's units (Å, meV/K), independently of
 * materials/binaries.ts, so a typo in either shows. All are from memory: no public copy of the
 * tables was reachable (materials/SOURCES.md).
 */
import { describe, expect, it } from 'vitest';
import { BINARIES, type BinaryName, type BinaryParams } from '../../materials/index.js';
import { expectClose } from './check.js';

type Row = Readonly<Record<BinaryName, number>>;
//                 GaAs      AlAs     InAs     GaP      AlP      InP      GaSb     AlSb     InSb
const VMR2001: Readonly<Record<string, Row>> = {
  a_A:        { GaAs: 5.65325, AlAs: 5.6611, InAs: 6.0583, GaP: 5.4505, AlP: 5.4672, InP: 5.8697, GaSb: 6.0959, AlSb: 6.1355, InSb: 6.4794 },
  da_dT_A:    { GaAs: 3.88e-5, AlAs: 2.90e-5, InAs: 2.74e-5, GaP: 2.92e-5, AlP: 2.92e-5, InP: 2.79e-5, GaSb: 4.72e-5, AlSb: 2.60e-5, InSb: 3.48e-5 },
  EgG:        { GaAs: 1.519, AlAs: 3.099, InAs: 0.417, GaP: 2.886, AlP: 3.63, InP: 1.4236, GaSb: 0.812, AlSb: 2.386, InSb: 0.235 },
  // GaP Γ: not Varshni but 2.886 + 0.1081[1 − coth(164/T)] eV; its row holds a = 0.1081 eV, T1 = 164 K.
  alphaG_meV: { GaAs: 0.5405, AlAs: 0.885, InAs: 0.276, GaP: 0.1081, AlP: 0.5771, InP: 0.363, GaSb: 0.417, AlSb: 0.42, InSb: 0.32 },
  betaG:      { GaAs: 204, AlAs: 530, InAs: 93, GaP: 164, AlP: 372, InP: 162, GaSb: 140, AlSb: 140, InSb: 170 },
  EgX:        { GaAs: 1.981, AlAs: 2.24, InAs: 1.433, GaP: 2.35, AlP: 2.52, InP: 2.384, GaSb: 1.141, AlSb: 1.696, InSb: 0.63 },
  alphaX_meV: { GaAs: 0.46, AlAs: 0.70, InAs: 0.276, GaP: 0.5771, AlP: 0.318, InP: 0.37, GaSb: 0.475, AlSb: 0.39, InSb: 0.32 },
  betaX:      { GaAs: 204, AlAs: 530, InAs: 93, GaP: 372, AlP: 588, InP: 0, GaSb: 94, AlSb: 140, InSb: 170 },
  EgL:        { GaAs: 1.815, AlAs: 2.46, InAs: 1.133, GaP: 2.72, AlP: 3.57, InP: 2.014, GaSb: 0.875, AlSb: 2.329, InSb: 0.93 },
  alphaL_meV: { GaAs: 0.605, AlAs: 0.605, InAs: 0.276, GaP: 0.5771, AlP: 0.318, InP: 0.363, GaSb: 0.597, AlSb: 0.58, InSb: 0.32 },
  betaL:      { GaAs: 204, AlAs: 204, InAs: 93, GaP: 372, AlP: 588, InP: 162, GaSb: 140, AlSb: 140, InSb: 170 },
  Dso:        { GaAs: 0.341, AlAs: 0.28, InAs: 0.39, GaP: 0.08, AlP: 0.07, InP: 0.108, GaSb: 0.76, AlSb: 0.676, InSb: 0.81 },
  me:         { GaAs: 0.067, AlAs: 0.15, InAs: 0.026, GaP: 0.13, AlP: 0.22, InP: 0.0795, GaSb: 0.039, AlSb: 0.14, InSb: 0.0135 },
  gamma1:     { GaAs: 6.98, AlAs: 3.76, InAs: 20.0, GaP: 4.05, AlP: 3.35, InP: 5.08, GaSb: 13.4, AlSb: 5.18, InSb: 34.8 },
  gamma2:     { GaAs: 2.06, AlAs: 0.82, InAs: 8.5, GaP: 0.49, AlP: 0.71, InP: 1.60, GaSb: 4.7, AlSb: 1.19, InSb: 15.5 },
  gamma3:     { GaAs: 2.93, AlAs: 1.42, InAs: 9.2, GaP: 2.93, AlP: 1.23, InP: 2.10, GaSb: 6.0, AlSb: 1.97, InSb: 16.5 },
  Ep:         { GaAs: 28.8, AlAs: 21.1, InAs: 21.5, GaP: 31.4, AlP: 17.7, InP: 20.7, GaSb: 27.0, AlSb: 18.7, InSb: 23.3 },
  F:          { GaAs: -1.94, AlAs: -0.48, InAs: -2.90, GaP: -2.04, AlP: -0.65, InP: -1.31, GaSb: -1.63, AlSb: -0.56, InSb: -0.23 },
  VBO:        { GaAs: -0.80, AlAs: -1.33, InAs: -0.59, GaP: -1.27, AlP: -1.74, InP: -0.94, GaSb: -0.03, AlSb: -0.41, InSb: 0 },
  ac:         { GaAs: -7.17, AlAs: -5.64, InAs: -5.08, GaP: -8.2, AlP: -5.7, InP: -6.0, GaSb: -7.5, AlSb: -4.5, InSb: -6.94 },
  av:         { GaAs: -1.16, AlAs: -2.47, InAs: -1.00, GaP: -1.7, AlP: -3.0, InP: -0.6, GaSb: -0.8, AlSb: -1.4, InSb: -0.36 },
  b:          { GaAs: -2.0, AlAs: -2.3, InAs: -1.8, GaP: -1.6, AlP: -1.5, InP: -2.0, GaSb: -2.0, AlSb: -1.35, InSb: -2.0 },
  C11:        { GaAs: 1221, AlAs: 1250, InAs: 832.9, GaP: 1405, AlP: 1330, InP: 1011, GaSb: 884.2, AlSb: 876.9, InSb: 684.7 },
  C12:        { GaAs: 566, AlAs: 534, InAs: 452.6, GaP: 620.3, AlP: 630, InP: 561, GaSb: 402.6, AlSb: 434.1, InSb: 373.5 },
};

// Stored field and the factor from the paper's unit to the stored one.
const STORED: Readonly<Record<string, readonly [keyof Omit<BinaryParams, 'name' | 'lawG' | 'lawX' | 'lawL'>, number]>> = {
  a_A: ['a_nm', 0.1], da_dT_A: ['da_dT_nm_per_K', 0.1],
  EgG: ['EgG0', 1], EgX: ['EgX0', 1], EgL: ['EgL0', 1],
  Dso: ['Dso', 1], me: ['me', 1], gamma1: ['gamma1', 1], gamma2: ['gamma2', 1], gamma3: ['gamma3', 1],
  Ep: ['Ep', 1], F: ['F', 1], VBO: ['VBO', 1], ac: ['ac', 1], av: ['av', 1], b: ['b', 1], C11: ['C11', 1], C12: ['C12', 1],
};

// Temperature-law rows: (first parameter, second parameter) of each gap's law.
const LAWS: readonly (readonly [string, string, 'lawG' | 'lawX' | 'lawL'])[] = [
  ['alphaG_meV', 'betaG', 'lawG'], ['alphaX_meV', 'betaX', 'lawX'], ['alphaL_meV', 'betaL', 'lawL'],
];
/** The one gap VMR2001 gives a Bose–Einstein law instead of Varshni's (from memory). */
const BOSE_EINSTEIN: Readonly<Partial<Record<BinaryName, string>>> = { GaP: 'lawG' };

describe('binary table against VMR2001 Tables I–IX (from memory)', () => {
  const names = Object.keys(BINARIES) as BinaryName[];
  it('holds exactly the nine zinc-blende binaries', () => {
    expectClose(names.length, 9, 0, 'number of binaries');
  });
  const lawRows = new Set(LAWS.flatMap(([p, q]) => [p, q]));
  for (const [param, row] of Object.entries(VMR2001)) {
    if (lawRows.has(param)) continue;
    it(`${param} of all nine binaries`, () => {
      const [field, factor] = STORED[param]!;
      for (const n of names) {
        const expected = row[n] * factor;
        expectClose(BINARIES[n][field], expected, 1e-12 * Math.max(1, Math.abs(expected)), `${n}.${param}`);
      }
    });
  }
  for (const [first, second, lawField] of LAWS) {
    it(`temperature law of ${lawField.slice(3)} (${first}, ${second}) of all nine binaries`, () => {
      for (const n of names) {
        const law = BINARIES[n][lawField];
        const be = BOSE_EINSTEIN[n] === lawField;
        expect(law.kind, `${n}.${lawField}.kind`).toBe(be ? 'bose-einstein' : 'varshni');
        const [p, q] = law.kind === 'varshni' ? [law.alpha_eV_per_K * 1e3, law.beta_K] : [law.a_eV, law.T1_K];
        expectClose(p, VMR2001[first]![n], 1e-12, `${n}.${first}`);
        expectClose(q, VMR2001[second]![n], 1e-12, `${n}.${second}`);
      }
    });
  }
});
