import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, mixAlloys } from '../../engine/structure.js';
import { buildBandProfile } from '../../engine/profile.js';
import { parseFormula, resolveMaterial } from '../../materials/index.js';
import { solve } from '../../engine/solve.js';

describe('offset rule', () => {
  it('a conduction-band share Q puts ΔEc = Q·ΔEg at an unstrained GaAs/AlGaAs interface and is recorded', () => {
    const { spec } = parseSpecText(`
offsets: { conduction_share: 0.65, reference: GaAs }
stack:
  - { material: Al0.3Ga0.7As, thickness: 10 nm }
  - { material: GaAs, thickness: 8 nm }
`);
    const s = buildStructure(spec, {});
    const [b, w] = [s.layers[0]!.bands[0]!, s.layers[1]!.bands[0]!];
    const dEc = b.Ec - w.Ec;
    const dEv = w.Ehh - b.Ehh;
    expect(Math.abs(dEc / (dEc + dEv) - 0.65)).toBeLessThan(1e-12);
    expect(solve(spec).structure.offsetRule).toEqual({ kind: 'conduction-share', share: 0.65, reference: 'GaAs', gap: 'unstrained' });
  });
});

describe('graded layers', () => {
  it('band edges along a graded AlGaAs layer match the material resolved at the local composition within 0.05 meV', () => {
    const { spec } = parseSpecText(`
substrate: GaAs
stack:
  - { material: GaAs, thickness: 5 nm }
  - { material: AlGaAs, Al: { from: 0.0, to: 0.45 }, thickness: 20 nm }
  - { material: Al0.45Ga0.55As, thickness: 5 nm }
`);
    const structure = buildStructure(spec, {});
    const profile = buildBandProfile(structure, 'electron', { maxSlice_nm: 0.25, nonparabolic: false });
    const graded = profile.slices.filter((x) => x.layer === 1);
    const from = parseFormula('GaAs');
    const to = parseFormula('Al0.45Ga0.55As');
    fc.assert(fc.property(fc.integer({ min: 0, max: graded.length - 1 }), (k) => {
      const t = (k + 0.5) / graded.length;
      const m = resolveMaterial(mixAlloys(from, to, t), { temperature_K: 300, substrate: parseFormula('GaAs') });
      return Math.abs(graded[k]!.V - m.Ec) < 5e-5;
    }), { numRuns: 40, seed: 7 });
  });
});

describe('composition errors', () => {
  it('move the In/Ga pair of InGaAs, leave binaries alone, and move both ends of a grade that starts at a binary', async () => {
    const { shiftComposition, perturbComposition } = await import('../../engine/structure.js');
    const a = shiftComposition(parseFormula('In0.2Ga0.8As'), 0.01);
    expect(a.III.In).toBeCloseTo(0.21, 12);
    expect(a.III.Ga).toBeCloseTo(0.79, 12);
    const gaas = parseFormula('GaAs');
    expect(shiftComposition(gaas, 0.01)).toBe(gaas);
    const graded = { kind: 'graded' as const, from: mixAlloys(parseFormula('Al0.3Ga0.7As'), parseFormula('Al0.3Ga0.7As'), 0) , to: parseFormula('Al0.3Ga0.7As') };
    const fromBinary = { kind: 'graded' as const, from: mixAlloys(gaas, parseFormula('Al0.3Ga0.7As'), 0), to: parseFormula('Al0.3Ga0.7As') };
    const moved = perturbComposition(fromBinary, 0.01);
    expect(moved.kind === 'graded' && moved.from.III.Al).toBeCloseTo(0.01, 12);
    expect(moved.kind === 'graded' && moved.to.III.Al).toBeCloseTo(0.31, 12);
    expect(perturbComposition(graded, 0)).toBe(graded);
  });
});
