/**
 * The repeat construct of stacks (engine/input/schema.ts, engine/structure.ts expandStack): a
 * repeated stack solves bit-identically to the same layers written out, labels carry the period,
 * per_period variables take one value per period, and errors name the field as written (with its
 * line). The closed-form check here is identity: the same layers must give the same numbers.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, nominalVariables, variablesOf } from '../../engine/structure.js';
import { solve, BANDS } from '../../engine/solve.js';
import { designSpec } from '../../engine/design/write.js';
import { cli } from '../../engine/cli/app.js';

const head = `substrate: GaAs
temperature: 300 K
vary:
  w: { from: 4 nm, to: 9 nm, value: 6 nm }
`;
const period = ['{ material: Al0.3Ga0.7As, thickness: 8 nm, label: barrier }', '{ material: In0.1Ga0.9As, thickness: w, label: well }'];
const repeated = parseSpecText(`${head}stack:
  - { material: Al0.3Ga0.7As, thickness: 15 nm, label: cladding }
  - periods: 5
    repeat:
${period.map((l) => `      - ${l}`).join('\n')}
  - { material: Al0.3Ga0.7As, thickness: 15 nm, label: cladding }
`).spec;
const written = parseSpecText(`${head}stack:
  - { material: Al0.3Ga0.7As, thickness: 15 nm, label: cladding }
${Array.from({ length: 5 }, () => period.map((l) => `  - ${l}`).join('\n')).join('\n')}
  - { material: Al0.3Ga0.7As, thickness: 15 nm, label: cladding }
`).spec;

describe('repeat blocks', () => {
  it('a 5-period repeat solves bit-identically to its layers written out (every state energy and line)', () => {
    const a = solve(repeated);
    const b = solve(written);
    for (const band of BANDS) {
      expect(a.bands[band].states.length, band).toBe(b.bands[band].states.length);
      a.bands[band].states.forEach((s, k) => expect(Object.is(s.energy_eV, b.bands[band].states[k]!.energy_eV), `${band} ${s.label}: ${s.energy_eV} vs ${b.bands[band].states[k]!.energy_eV}`).toBe(true));
    }
    expect(a.transitions.map((t) => t.energy_eV)).toEqual(b.transitions.map((t) => t.energy_eV));
    expect(a.transitions.map((t) => t.overlap2)).toEqual(b.transitions.map((t) => t.overlap2));
    console.log(`repeat vs written out: ${a.bands.electron.states.length} electron, ${a.bands.heavy_hole.states.length} hh, ${a.bands.light_hole.states.length} lh states, e1 ${a.bands.electron.states[0]!.energy_eV} eV in both`);
  });

  it('labels carry the period (well[3]; nested repeats well[2.1]) and layers keep the written field', () => {
    const s = buildStructure(repeated, nominalVariables(repeated));
    expect(s.layers.map((l) => l.label)).toEqual(['cladding', ...Array.from({ length: 5 }, (_, k) => [`barrier[${k + 1}]`, `well[${k + 1}]`]).flat(), 'cladding']);
    expect(s.layers[6]!.field).toBe('stack[1].repeat[1]');
    expect(s.layers[6]!.period).toEqual({ entry: 1, period: 3, periods: 5 });
    const nested = parseSpecText(`stack:
  - periods: 2
    repeat:
      - { material: Al0.3Ga0.7As, thickness: 5 nm, label: b }
      - periods: 2
        repeat: [{ material: GaAs, thickness: 3 nm, label: well }, { material: Al0.3Ga0.7As, thickness: 2 nm, label: s }]
`).spec;
    expect(buildStructure(nested, {}).layers.map((l) => l.label)).toEqual(['b[1]', 'well[1.1]', 's[1.1]', 'well[1.2]', 's[1.2]', 'b[2]', 'well[2.1]', 's[2.1]', 'well[2.2]', 's[2.2]']);
  });

  it('per_period variables give each period its own value, equal to separate variables written out, and designs write them as a list', () => {
    const per = parseSpecText(`substrate: GaAs
vary:
  w: { from: 4 nm, to: 9 nm, value: [5 nm, 6 nm, 7 nm] }
stack:
  - { material: Al0.3Ga0.7As, thickness: 15 nm }
  - periods: 3
    per_period: [w]
    repeat:
      - { material: In0.1Ga0.9As, thickness: w, label: well }
      - { material: Al0.3Ga0.7As, thickness: 8 nm }
`).spec;
    expect(variablesOf(per).map((v) => v.name)).toEqual(['w[1]', 'w[2]', 'w[3]']);
    expect(buildStructure(per, nominalVariables(per)).layers.filter((l) => l.label.startsWith('well')).map((l) => [l.label, l.thickness_nm, l.thicknessVariable])).toEqual([['well[1]', 5, 'w[1]'], ['well[2]', 6, 'w[2]'], ['well[3]', 7, 'w[3]']]);
    const again = designSpec(per, { 'w[1]': 4.5, 'w[2]': 5.5, 'w[3]': 8 });
    expect(again.vary!.w!.value).toEqual(['4.5 nm', '5.5 nm', '8 nm']);
    expect(nominalVariables(again)).toEqual({ 'w[1]': 4.5, 'w[2]': 5.5, 'w[3]': 8 });
  });

  it('errors name the field as written, with its line, through the CLI', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'wellsmith-repeat-'));
    const file = join(dir, 'bad.yaml');
    writeFileSync(file, `substrate: GaAs
stack:
  - { material: GaAs, thickness: 10 nm }
  - periods: 4
    repeat:
      - { material: Al0.3Ga0.7As, thickness: 5 nm }
      - { material: GaAs, thickness: -3 nm }
`);
    const o = await cli(['solve', file]);
    expect(o.code).toBe(2);
    expect(o.stderr).toMatch(/^wellsmith: stack\[1\]\.repeat\[1\]\.thickness: must be positive, got "-3 nm" \(line 7\)\n$/);
    writeFileSync(file, 'stack:\n  - periods: 2\n    repeat:\n      - { material: GaAs }\n');
    const m = await cli(['solve', file]);
    expect(m.stderr).toMatch(/stack\[0\]\.repeat\[0\]\.thickness: is required for a layer .*\(line 4\)/);
    writeFileSync(file, 'vary:\n  w: { from: 1 nm, to: 2 nm, value: 1 nm }\nstack:\n  - { material: GaAs, thickness: w }\n  - periods: 2\n    per_period: [w]\n    repeat:\n      - { material: GaAs, thickness: w }\n');
    const p = await cli(['solve', file]);
    expect(p.stderr).toMatch(/stack\[0\]\.thickness: variable "w" takes one value per period of the repeat at stack\[1\]/);
  });
});
