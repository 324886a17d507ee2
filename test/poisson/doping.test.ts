/**
 * Doping keys (engine/poisson/schema.ts) resolved against a structure: volume densities over a layer
 * or a part of it, delta sheets, a background, totals per unit area, and input errors that name the
 * field. The spec path is exercised on a spec object carrying the keys (what engine/input/schema.ts
 * will pass once it declares them); the structure comes from the same stack without them.
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { dopingOfSpec, hasDoping, parseDopantDensity, resolveDoping } from '../../engine/poisson/doping.js';
import { layerDopingSchema, dopingSectionSchema } from '../../engine/poisson/schema.js';
import type { Spec } from '../../engine/input/schema.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from '../observables/close.js';

const TEXT = `
substrate: GaAs
temperature: 77 K
stack:
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
  - periods: 2
    repeat:
      - { material: GaAs, thickness: 5 nm, label: well }
      - { material: Al0.3Ga0.7As, thickness: 20 nm, label: barrier }
`;
const spec = parseSpecText(TEXT, 'doping.yaml').spec;
const structure = buildStructure(spec, {});

/** The same spec with doping keys on the repeat's well and a background (as the schema will accept them). */
function withDoping(well: unknown, doping?: unknown): Spec {
  const stack = spec.stack.map((e, i) => (i === 1 ? { ...e, repeat: (e as { repeat: Record<string, unknown>[] }).repeat.map((l, k) => (k === 0 ? { ...l, doping: well } : l)) } : e));
  return { ...spec, stack, ...(doping ? { doping } : {}) } as Spec;
}

const inputError = (f: () => unknown, field: RegExp): void => {
  try { f(); } catch (e) { expect(e).toBeInstanceOf(InputError); expect((e as InputError).message).toMatch(field); return; }
  throw new Error('no InputError');
};

describe('dopant densities', () => {
  it('cm-3 and m-3 are volumes (nm⁻³), cm-2 and m-2 sheets (nm⁻²); a bare number or an unknown unit is refused with the fix', () => {
    for (const [raw, kind, value] of [['1e18 cm-3', 'volume', 1e-3], ['1e24 m-3', 'volume', 1e-3], ['1e18 /cm3', 'volume', 1e-3], ['5e11 cm-2', 'sheet', 5e-3], ['5e15 m^-2', 'sheet', 5e-3]] as const) {
      const d = parseDopantDensity(raw, 'x');
      expect(d.kind, raw).toBe(kind);
      expectClose(d.value, value, { rel: 1e-14 }, raw);
    }
    inputError(() => parseDopantDensity(5e17, 'stack[1].doping.donors'), /stack\[1\]\.doping\.donors: a density needs its unit .*"1e18 cm-3"/);
    inputError(() => parseDopantDensity('5e17 cm3', 'f'), /unknown density unit "cm3"/);
    inputError(() => parseDopantDensity('-1e17 cm-3', 'f'), /zero or positive/);
  });
  it('an entry takes exactly one of donors or acceptors, and only its own keys', () => {
    expect(layerDopingSchema.safeParse({ donors: '1e18 cm-3', acceptors: '1e17 cm-3' }).success).toBe(false);
    expect(layerDopingSchema.safeParse({ from: '1 nm' }).success).toBe(false);
    expect(layerDopingSchema.safeParse({ donors: '1e18 cm-3', spread: 2 }).success).toBe(false);
    expect(layerDopingSchema.safeParse([{ donors: '1e18 cm-3' }, { acceptors: '2e17 cm-3', from: '1 nm', to: '3 nm' }]).success).toBe(true);
    expect(dopingSectionSchema.safeParse({ background: { acceptors: '1e14 cm-3' }, mesh: '0.25 nm', mixing: 0.5 }).success).toBe(true);
    expect(dopingSectionSchema.safeParse({ mixing: 0 }).success).toBe(false);
  });
});

describe('doping resolved on the structure', () => {
  it('volume, part of a layer, sheet and background: positions in nm from the stack start, totals per area', () => {
    const d = resolveDoping({
      layers: [undefined, [{ donors: '1e18 cm-3', from: '1 nm', to: '4 nm' }, { acceptors: '1e17 cm-3' }], { donors: '5e11 cm-2', at: '10 nm' }, undefined, undefined],
      background: { acceptors: '1e14 cm-3' },
    }, structure);
    const want = [[21, 24, 1e-3, 1], [20, 25, -1e-4, 1], [0, 70, -1e-7, -1]];
    expect(d.segments.length).toBe(3);
    d.segments.forEach((s, k) => {
      const [z0, z1, n, layer] = want[k]!;
      expectClose(s.z0_nm, z0!, { abs: 1e-12 }, `segment ${k} start`);
      expectClose(s.z1_nm, z1!, { abs: 1e-12 }, `segment ${k} end`);
      expectClose(s.density_nm3, n!, { rel: 1e-14 }, `segment ${k} density`);
      expect(s.layer).toBe(layer);
    });
    expect(d.sheets.length).toBe(1);
    expectClose(d.sheets[0]!.z_nm, 35, { abs: 1e-12 }, 'sheet position');
    expectClose(d.sheets[0]!.density_nm2, 5e-3, { rel: 1e-14 }, 'sheet density');
    // Donors 1e18 × 3 nm + 5e11 = 8e11; acceptors 1e17 × 5 nm + 1e14 × 70 nm = 5.07e10 cm⁻².
    expectClose(d.donors_cm2, 8e11, { rel: 1e-12 }, 'donors');
    expectClose(d.acceptors_cm2, 5.07e10, { rel: 1e-12 }, 'acceptors');
    expectClose(d.net_cm2, 8e11 - 5.07e10, { rel: 1e-12 }, 'net');
  });
  it('a sheet defaults to the layer centre; positions in ML use the layer\'s own monolayer', () => {
    const d = resolveDoping({ layers: [{ donors: '1e12 cm-2' }, { donors: '1e18 cm-3', to: '4 ML' }, undefined, undefined, undefined] }, structure);
    expect(d.sheets[0]!.z_nm).toBe(10);
    expectClose(d.segments[0]!.z1_nm, 20 + 4 * structure.layers[1]!.monolayer_nm, { rel: 1e-14 }, '4 ML');
  });
  it('errors name the field: a position outside the layer, from after to, at on a volume, from on a sheet', () => {
    const fields = ['stack[0]', 'stack[1].repeat[0]', 'stack[1].repeat[1]', 'stack[1].repeat[0]', 'stack[1].repeat[1]'];
    inputError(() => resolveDoping({ layers: [undefined, { donors: '1e18 cm-3', to: '6 nm' }, undefined, undefined, undefined], fields }, structure), /^stack\[1\]\.repeat\[0\]\.doping\.to: "6 nm" lies outside the layer/);
    inputError(() => resolveDoping({ layers: [undefined, { donors: '1e18 cm-3', from: '3 nm', to: '2 nm' }, undefined, undefined, undefined], fields }, structure), /"from" \(3 nm\) must lie below "to"/);
    inputError(() => resolveDoping({ layers: [{ donors: '1e18 cm-3', at: '2 nm' }, undefined, undefined, undefined, undefined], fields }, structure), /^stack\[0\]\.doping\.at: a volume density/);
    inputError(() => resolveDoping({ layers: [{ donors: '1e12 cm-2', from: '2 nm' }, undefined, undefined, undefined, undefined], fields }, structure), /^stack\[0\]\.doping\.from: a sheet sits at one position/);
    inputError(() => resolveDoping({ layers: [undefined, undefined, undefined, undefined, undefined], background: { donors: '1e11 cm-2' } }, structure), /doping\.background\.donors: a background is a volume density/);
  });
  it('from a spec: a repeat\'s doped well dopes every period; undoped specs have none; a malformed key names its field', () => {
    const doped = withDoping({ donors: '1e18 cm-3' });
    expect(hasDoping(doped)).toBe(true);
    expect(hasDoping(spec)).toBe(false);
    expect(dopingOfSpec(spec, structure)).toBeUndefined();
    const d = dopingOfSpec(doped, structure)!;
    expect(d.segments.map((s) => [s.z0_nm, s.z1_nm])).toEqual([[20, 25], [45, 50]]);
    expectClose(d.net_cm2, 1e12, { rel: 1e-12 }, 'two wells of 5 nm at 1e18 cm⁻³');
    expect(hasDoping(withDoping(undefined, { background: { donors: '1e15 cm-3' } }))).toBe(true);
    inputError(() => dopingOfSpec(withDoping({ donor: '1e18 cm-3' }), structure), /^stack\[1\]\.repeat\[0\]\.doping/);
    inputError(() => dopingOfSpec(withDoping({ donors: '1e18' }), structure), /^stack\[1\]\.repeat\[0\]\.doping\.donors: a density needs its unit/);
    inputError(() => dopingOfSpec(withDoping(undefined, { mesh: '0.5 nm', mixing: 2 }), structure), /^doping\.mixing/);
  });
});
