/**
 * Layers given by their strain (`strain:` on a ternary name) and strain variables: the builder
 * solves the free fraction so that the in-plane strain on the substrate is the one asked. Closed
 * form (Vegard's law, common practice): a(x) = x a_InAs + (1 − x) a_GaAs and ε∥ = (a_s − a)/a give
 * x = (a_s/(1 + ε) − a_GaAs)/(a_InAs − a_GaAs), with the VMR2001 lattice constants at 300 K
 * (from memory: 0.605830 and 0.565325 nm).
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, nominalVariables, variablesOf } from '../../engine/structure.js';
import { design } from '../../engine/design/search.js';
import { expectClose } from '../materials/check.js';

const spec = (strain: string, vary = '') => parseSpecText(`substrate: GaAs
temperature: 300 K
${vary}stack:
  - { material: GaAs, thickness: 20 nm }
  - { material: InGaAs, strain: ${strain}, thickness: 6 nm, label: well }
  - { material: GaAs, thickness: 20 nm }
`).spec;

describe('strain as a layer property and a variable', () => {
  it.each([-0.5, -1, -1.5])('InGaAs at %d % on GaAs: the In fraction of Vegard\'s law and ε∥ as asked', (eps) => {
    const l = buildStructure(spec(`"${eps} %"`), {}).layers[1]!;
    const aIn = 0.60583;
    const aGa = 0.565325;
    const x = (aGa / (1 + eps / 100) - aGa) / (aIn - aGa);
    expect(l.composition.kind).toBe('alloy');
    expectClose(l.composition.kind === 'alloy' ? l.composition.alloy.III.In! : NaN, x, 1e-9, `In fraction for ${eps} %`);
    expectClose(l.material.strain_par * 100, eps, 1e-9, 'ε∥ (%)');
  });

  it('a strain variable in % drives the composition; designs can target it', async () => {
    const s = spec('s', 'vary:\n  s: { from: -1.6 %, to: -0.4 %, value: -1.2 % }\n');
    expect(variablesOf(s)[0]).toMatchObject({ name: 's', kind: 'strain', unit: '%' });
    expectClose(buildStructure(s, nominalVariables(s)).layers[1]!.material.strain_par * 100, -1.2, 1e-9, 'ε∥ at s = −1.2 %');
    const target = parseSpecText(JSON.stringify({ ...s, targets: [{ strain: '-0.8 %', layer: 'well', within: '0.02 %' }, { constraint: 'critical_thickness' }] })).spec;
    const r = await design(target, { starts: 3, seed: 1, top: 1, workers: 1, compositionStep: 0.001, maxEvaluations: 60 });
    console.log(`strain design: s = ${r.designs[0]!.values.s} %, achieved ${r.designs[0]!.evaluations[0]!.achieved} %`);
    expect(r.status).toBe('ok');
    expectClose(r.designs[0]!.values.s!, -0.8, 0.02, 'designed strain (%)');
  });

  it('refuses strains out of reach, non-ternary names and fractions beside a strain, naming the field', () => {
    expect(() => buildStructure(spec('"-9 %"'), {})).toThrow(/^stack\[1\]\.strain: -9\.00 % is out of reach of InGaAs on GaAs \(from 0\.00 % to -6\.69 %\)/);
    expect(() => buildStructure(parseSpecText('substrate: GaAs\nstack:\n  - { material: InGaAsP, strain: "-1 %", thickness: 5 nm }\n').spec, {})).toThrow(/stack\[0\]\.strain: a strain sets the free fraction of a ternary/);
    expect(() => buildStructure(parseSpecText('substrate: GaAs\nstack:\n  - { material: InGaAs, In: 0.2, strain: "-1 %", thickness: 5 nm }\n').spec, {})).toThrow(/stack\[0\]\.In: a layer given by its strain takes no fractions/);
    expect(() => buildStructure(parseSpecText('stack:\n  - { material: InGaAs, strain: "-1 %", thickness: 5 nm }\n').spec, {})).toThrow(/stack\[0\]\.strain: a strain needs a substrate/);
  });
});
