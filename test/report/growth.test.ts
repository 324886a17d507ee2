import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, nominalVariables } from '../../engine/structure.js';
import { growthSheet, parseGrowthRate } from '../../engine/report/growth.js';
import { growthCsv } from '../../engine/report/growth-csv.js';
import { InputError } from '../../engine/errors.js';

const SPEC = `
title: growth sheet check
substrate: GaAs
temperature: 300 K
stack:
  - { material: Al0.30Ga0.70As, thickness: 20 nm, label: barrier }
  - { material: GaAs, thickness: 10 nm, label: spacer }
  - { material: In0.2Ga0.8As, thickness: 7 nm, label: well }
  - { material: GaAsP, P: 0.1, thickness: 5 nm, label: cap }
`;
const spec = parseSpecText(SPEC).spec;
const structure = buildStructure(spec, nominalVariables(spec));

const close = (got: number, expected: number, tol: number, what: string): void => {
  expect(Math.abs(got - expected), `${what}: got ${got}, expected ${expected}, difference ${got - expected}, tolerance ${tol}`).toBeLessThanOrEqual(tol);
};

describe('growth sheet', () => {
  const sheet = growthSheet(structure, { GaAs: '1.0 µm/h', AlAs: '0.5 µm/h', 'In0.2Ga0.8As': '1.2 ML/s' });

  it('times a binary layer by hand: 10 nm of GaAs at 1.0 µm/h takes 36.0 s', () => {
    // Hand calculation: 1.0 µm/h = 1000 nm / 3600 s = 0.277778 nm/s; 10 nm / 0.277778 nm/s = 36.0 s.
    // (In monolayers: a_GaAs/2 = 0.2826625 nm (a = 5.65325 Å, VMR2001, from memory): 35.378 ML at
    // 0.982719 ML/s, the same 36.0 s, since GaAs on GaAs is unstrained.)
    const row = sheet.rows[1]!;
    close(row.rate_ml_per_s!, 0.2777778 / 0.2826625, 1e-6, 'GaAs rate ML/s');
    close(row.time_s!, 36.0, 1e-6, 'GaAs shutter time s');
    expect(row.source).toBe('formula');
    expect(row.note).toBe('');
  });

  it('adds the cells of an alloy and flags the composition they imply', () => {
    // Hand calculation: r_GaAs = 0.982719 ML/s (above); r_AlAs = 0.5 µm/h = 0.138889 nm/s over
    // a_AlAs/2 = 0.283055 nm (a = 5.6611 Å, VMR2001, from memory) = 0.490678 ML/s; both cells open:
    // r = 0.982719 + 0.490678 = 1.473397 ML/s and x_Al = 0.490678 / 1.473397 = 0.33302, not the layer's 0.30.
    // The layer's own monolayer count N (strained on GaAs) gives t = N / 1.473397 s; 20 nm is about
    // 70.6 ML, so t ≈ 47.9 s.
    const row = sheet.rows[0]!;
    close(row.rate_ml_per_s!, 1.473397, 2e-6, 'AlGaAs rate ML/s');
    close(row.time_s!, structure.layers[0]!.monolayers / 1.473397, 1e-4, 'AlGaAs shutter time s');
    close(row.time_s!, 47.9, 0.2, 'AlGaAs shutter time s (rough hand value)');
    expect(row.implied).toBe('Al0.333Ga0.667As');
    expect(row.note).toMatch(/cells give Al0\.333Ga0\.667As, layer is Al0\.3Ga0\.7As/);
    expect(sheet.consistent).toBe(false);
  });

  it('uses a rate keyed by the layer formula, and asks for one where group V is mixed', () => {
    // Hand calculation: t = N / 1.2 ML/s with N the well's monolayers (7 nm ≈ 24 ML → ≈ 20 s).
    const well = sheet.rows[2]!;
    expect(well.source).toBe('formula');
    close(well.time_s!, structure.layers[2]!.monolayers / 1.2, 1e-9, 'well shutter time s');
    const cap = sheet.rows[3]!;
    expect(cap.time_s).toBeNull();
    expect(cap.note).toMatch(/mixed group V/);
    expect(sheet.total_s).toBeNull();
  });

  it('is consistent when the rates match every layer', () => {
    // Hand calculation: x_Al = 0.3 needs r_AlAs = (0.3/0.7) r_GaAs = 0.421165 ML/s with r_GaAs = 0.982719.
    const ok = growthSheet(buildStructure(parseSpecText(SPEC.split('\n').slice(0, 7).join('\n')).spec, {}), { GaAs: '1.0 µm/h', AlAs: '0.421165 ML/s' });
    expect(ok.rows[0]!.implied).toBe('Al0.300Ga0.700As');
    expect(ok.consistent).toBe(true);
    close(ok.total_s!, ok.rows[0]!.time_s! + 36.0, 1e-9, 'total s');
    const csv = growthCsv(ok).trim().split('\n');
    expect(csv[0]).toBe('layer,label,material,thickness_nm,monolayers,rate_from,rate_ML_per_s,rate_nm_per_s,shutter_s,note');
    expect(csv).toHaveLength(4);
    expect(csv[3]!.startsWith('total,')).toBe(true);
  });

  it('rejects a rate without a known unit, naming the field', () => {
    expect(() => parseGrowthRate('3 furlongs', 'growth.rates.GaAs')).toThrow(InputError);
    expect(() => parseGrowthRate('3 furlongs', 'growth.rates.GaAs')).toThrow(/growth\.rates\.GaAs: unknown rate unit "furlongs"/);
    expect(() => parseGrowthRate('-1 ML/s', 'growth.rates.GaAs')).toThrow(/must be positive/);
  });
});
