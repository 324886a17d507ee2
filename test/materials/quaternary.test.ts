/**
 * Lattice-matched quaternaries on InP named by their gap wavelength (materials/quaternary.ts): the
 * trade's Q1.1, Q1.25, Q1.3 (InGaAsP; Q-numbers quote the room-temperature gap wavelength, common
 * practice) and AlGaInAs, resolved on the materials model. Acceptance: the gap wavelength at 300 K
 * within 5 nm of the name and the mismatch to InP below 1e-4. The compositions are also compared
 * with the lattice-match relation Ga = 0.1894 As / (0.4184 − 0.013 As) quoted from Adachi (seen in
 * notes, materials/SOURCES.md), an outside check of the lattice-matched line.
 */
import { describe, expect, it } from 'vitest';
import { alloyAt, formatFormula, parseMaterialName, resolveMaterial } from '../../materials/index.js';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { HC_EV_NM } from '../../engine/constants.js';
import { expectClose, expectInputError } from './check.js';

const InP = { III: { In: 1 }, V: { P: 1 } };
const aInP = alloyAt(InP, 300).a_nm;

describe('quaternaries by gap wavelength', () => {
  it.each([
    ['Q1.1', 1100], ['Q1.25', 1250], ['Q1.3', 1300], ['InGaAsP(1.55 µm)', 1550], ['AlGaInAs(1.3 µm)', 1300], ['AlGaInAs(1000 nm)', 1000],
  ] as const)('%s: gap wavelength at 300 K within 5 nm of %d nm, mismatch to InP below 1e-4', (name, nm) => {
    const alloy = parseMaterialName(name);
    const p = alloyAt(alloy, 300);
    const lambda = HC_EV_NM / p.EgG;
    const mismatch = (p.a_nm - aInP) / aInP;
    console.log(`${name} -> ${formatFormula(alloy)}: λg ${lambda.toFixed(2)} nm, mismatch ${mismatch.toExponential(2)}`);
    expectClose(lambda, nm, 5, `${name} (${formatFormula(alloy)}) gap wavelength, nm`);
    expectClose(mismatch, 0, 1e-4, `${name} mismatch to InP`);
    if (name.startsWith('Q') || name.startsWith('InGaAsP')) {
      const As = alloy.V.As!;
      expectClose(alloy.III.Ga!, (0.1894 * As) / (0.4184 - 0.013 * As), 0.005, `${name} Ga against Adachi's lattice-match relation at As = ${As}`);
    }
  });

  it('is shown resolved: a layer written Q1.25 carries its composition as formula, strained by under 1e-4 on InP', () => {
    const spec = parseSpecText('substrate: InP\nstack:\n  - { material: InP, thickness: 10 nm }\n  - { material: Q1.25, thickness: 10 nm }\n').spec;
    const l = buildStructure(spec, {}).layers[1]!;
    expect(l.formula).toBe(formatFormula(parseMaterialName('Q1.25')));
    expect(l.formula).toMatch(/^In0\.\d+Ga0\.\d+As0\.\d+P0\.\d+$/);
    expect(Math.abs(l.material.strain_par)).toBeLessThan(1e-4);
    expect(resolveMaterial(parseMaterialName('Q1.3'), { temperature_K: 300, substrate: InP }).formula).toBe(formatFormula(parseMaterialName('Q1.3')));
  });

  it('refuses wavelengths outside the lattice-matched range and unknown families, naming the field', () => {
    expectInputError(() => parseMaterialName('Q2.0'), 'bad-value', /spans gap wavelengths 0\.9\d+–1\.6\d+ µm/);
    expectInputError(() => parseMaterialName('GaAsSb(1.3 µm)'), 'bad-formula', /InGaAsP or AlGaInAs/);
    const spec = parseSpecText('substrate: InP\nstack:\n  - { material: Q3, thickness: 10 nm }\n').spec;
    expectInputError(() => buildStructure(spec, {}), 'bad-value', /^stack\[0\]\.material: material "Q3"/);
  });
});
