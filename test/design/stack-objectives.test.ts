/**
 * Conformance of the stack target kinds of issue 16 (splitting, transition of a named well,
 * ensemble, strain, transparency, strain_balance): schema round trip, residual zero at the target,
 * finite for every candidate (fast-check over designs, including ones where states are missing),
 * and field-naming input errors. The transparency density is checked against the closed form of
 * one parabolic 2-D subband per carrier (common practice: n = (m kT/πħ²) ln(1 + e^((F − E)/kT))).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compileTargets, scoreTargets, OBJECTIVES } from '../../objectives/index.js';
import { transparencyDensity } from '../../objectives/transparency.js';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, nominalVariables } from '../../engine/structure.js';
import { solveStructure, settingsOf, type SolveResult } from '../../engine/solve.js';
import { HBAR2_OVER_2M0, KB_EV_PER_K } from '../../engine/constants.js';
import { InputError } from '../../engine/errors.js';
import type { TargetSource } from '../../objectives/types.js';

const spec = (ml: number, barrier = '20 nm') => parseSpecText(`substrate: GaAs
temperature: 300 K
stack:
  - { material: GaAs, thickness: 20 nm }
  - periods: 3
    repeat:
      - { material: In0.18Ga0.82As, thickness: ${ml} ML, label: well }
      - { material: GaAs, thickness: ${barrier}, label: barrier }
`).spec;
const solved = (ml: number): SolveResult => { const s = spec(ml); return solveStructure(buildStructure(s, nominalVariables(s)), settingsOf(s)); };

/** Each new kind with a target built from what it achieved on r (so the residual must be 0). */
function atTarget(r: SolveResult): Record<string, unknown>[] {
  const e = (t: Record<string, unknown>) => scoreTargets(compileTargets([t]), r).evaluations[0]!;
  const split = e({ splitting: 'hh1-lh1', at_least: '0 meV' }).achieved!;
  const own = e({ transition: 'e1-hh1', well: 'well[2]', energy: '1 eV', within: '1 meV' }).achieved!;
  const spread = e({ ensemble: 'e1-hh1', at_most: '100 meV' }).achieved!;
  const strain = e({ strain: '-1 %', layer: 'well', within: '0.1 %' }).achieved!;
  const n = e({ transparency: 'per_well', at_most: '1e13 cm-2' }).achieved!;
  return [
    { splitting: 'hh1-lh1', at_least: `${split} meV` },
    { transition: 'e1-hh1', well: 'well[2]', energy: `${own} eV`, within: '1 meV' },
    { ensemble: 'e1-hh1', at_most: `${spread} meV` },
    { strain: `${strain} %`, layer: 'well', within: '0.05 %' },
    { transparency: 'per_well', at_most: `${n} cm-2` },
  ];
}

describe('stack target kinds', () => {
  it('every new kind is registered, round-trips its schema and scores residual 0 at its target', () => {
    const r = solved(24);
    const targets = atTarget(r);
    for (const t of targets) {
      const key = Object.keys(t)[0]!;
      const o = OBJECTIVES.find((x) => x.key === key)!;
      expect(o, key).toBeDefined();
      expect(o.objective.description.length).toBeGreaterThan(20);
      expect(o.objective.schema.parse(JSON.parse(JSON.stringify(o.objective.schema.parse(t))))).toEqual(t);
    }
    const ev = scoreTargets(compileTargets(targets), r).evaluations;
    console.log(`at target: ${ev.map((x) => `${x.label} ${x.achieved} ${x.unit} → r ${x.residual}`).join('; ')}`);
    for (const x of ev) expect(x.residual, x.label).toBe(0);
    expect(ev.every((x) => x.satisfied)).toBe(true);
    const balance = scoreTargets(compileTargets([{ constraint: 'strain_balance', within: '0.05 %' }]), r).evaluations[0]!;
    expect(balance.satisfied, `three compressive wells are not balanced: net ${balance.achieved} %`).toBe(false);
  });

  it('evaluations stay finite for any design, missing states included (property)', () => {
    const targets = compileTargets([
      { splitting: 'hh1-lh2', at_least: '10 meV' }, { transition: 'e2-hh2', well: 3, wavelength: '950 nm', within: '5 nm' },
      { ensemble: 'e1-hh1', at_most: '2 nm' }, { strain: '-1.3 %', layer: 'well', within: '0.05 %' },
      { transparency: 'total', at_most: '2e12 cm-2' }, { constraint: 'strain_balance' }, { constraint: 'critical_thickness' },
    ]);
    fc.assert(fc.property(fc.integer({ min: 4, max: 40 }), (ml) => {
      for (const e of scoreTargets(targets, solved(ml)).evaluations) expect(Number.isFinite(e.residual), `${ml} ML: ${e.label} residual ${e.residual}`).toBe(true);
    }), { numRuns: 6, seed: 3 });
  });

  it('input errors name the field', () => {
    const bad: [Record<string, unknown>, RegExp][] = [
      [{ splitting: 'e1-e2', at_least: '1 meV' }, /targets\[0\]\.splitting: both states are of one band/],
      [{ splitting: 'hh1-lh1' }, /targets\[0\]: give at_least and\/or at_most/],
      [{ ensemble: 'e1-hh1', at_most: '2 ML' }, /targets\[0\]\.at_most: expected a positive spread/],
      [{ strain: '-1', layer: 'well', within: '0.1 %' }, /targets\[0\]\.strain: expected a strain in %/],
      [{ transparency: 'per_well', at_most: '1e12 m-2' }, /targets\[0\]\.at_most: unknown sheet-density unit/],
      [{ constraint: 'strain_balance', within: '5 nm' }, /targets\[0\]\.within: expected a positive strain in %/],
      [{ constraint: 'critical_thickness', within: '0.1 %' }, /targets\[0\]\.within: only strain_balance/],
    ];
    for (const [t, pattern] of bad) expect(() => compileTargets([t]), JSON.stringify(t)).toThrow(pattern);
    expect(() => compileTargets([{ transition: 'e1-hh1', well: 2, wavelength: '9 µm', within: '1 µm' }], 'wire')).toThrow(InputError);
  });

  it('transparency density of one electron and one hole subband equals the 2-D closed form', () => {
    const [me, mh, T] = [0.067, 0.35, 300];
    const r = {
      bands: {
        electron: { states: [{ label: 'e1', energy_eV: 1.5, confinement_meV: 10, bound: true, mass_inplane: me }], edge_eV: 1.49, barrier_eV: 1.7 },
        heavy_hole: { states: [{ label: 'hh1', energy_eV: 0, confinement_meV: 5, bound: true, mass_inplane: mh }], edge_eV: 0.005, barrier_eV: -0.1 },
        light_hole: { states: [], edge_eV: 0, barrier_eV: -0.1 },
      },
      transitions: [],
      structure: { temperature_K: T },
    } as TargetSource;
    // At transparency F_e − E_e = −(F_h − E_h) = η kT with me ln(1 + e^η) = mh ln(1 + e^−η).
    const kT = KB_EV_PER_K * T;
    let lo = -20;
    let hi = 20;
    for (let k = 0; k < 200; k++) { const m = (lo + hi) / 2; if (me * Math.log1p(Math.exp(m)) < mh * Math.log1p(Math.exp(-m))) lo = m; else hi = m; }
    const dos = (m: number): number => (m / (Math.PI * 2 * HBAR2_OVER_2M0)) * 1e14; // cm⁻² eV⁻¹, spin included
    const expected = dos(me) * kT * Math.log1p(Math.exp(lo));
    const got = transparencyDensity(r);
    console.log(`transparency density: got ${got.toExponential(4)} cm⁻², closed form ${expected.toExponential(4)} cm⁻²`);
    expect(Math.abs(got / expected - 1), `got ${got}, expected ${expected}, tolerance 1e-6 relative`).toBeLessThan(1e-6);
  });
});
