/**
 * Linear slices (fields and grades carried with Airy functions, engine/solver1d.ts carryLinear)
 * against test/reference/field/linear_wells.json (generator linear_wells.py beside it): exact
 * Airy-function roots from scipy where the pieces have constant masses, and an O(h^6)
 * finite-difference solve (two Richardson steps, a fixed point in E for the two-band mass) where
 * the mass varies along z. Also the Prüfer counting guarantee on linear slices, the fourth-order
 * error of a slice whose mass varies, and agreement with the flat-slice solve.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { linearPieceSlices, type BandProfile, type LinearPiece, type OuterRegion, type Slice } from '../../engine/profile.js';
import { countStatesBelow, solveBand } from '../../engine/solver1d/states.js';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { buildBandProfile } from '../../engine/profile.js';

interface Case {
  readonly name: string;
  readonly method: 'airy' | 'fd';
  readonly pieces: readonly [number, number, number, number, number, number, number][];
  readonly left: readonly [number, number, number];
  readonly right: readonly [number, number, number];
  readonly energies: readonly number[];
}
const fixture = JSON.parse(readFileSync(new URL('../reference/field/linear_wells.json', import.meta.url), 'utf8')) as { cases: Case[] };

const region = (V: number, mass: number, alpha: number): OuterRegion => ({ V, mass, alpha, massInPlane: mass });
const piecesOf = (c: Case): LinearPiece[] => c.pieces.map(([w, va, vb, ma, mb, aa, ab], layer) => ({ width_nm: w, a: region(va, ma, aa), b: region(vb, mb, ab), layer }));

/** The fixture case as a linear-slice profile, cut by the rules buildBandProfile uses, then each slice cut into `split` equal ones. */
function profileOf(c: Case, split = 1): BandProfile {
  const left = region(...c.left);
  const right = region(...c.right);
  const openEdge = Math.min(left.V, right.V);
  const slices = linearPieceSlices(piecesOf(c), openEdge).flatMap((sl) => Array.from({ length: split }, (_, k): Slice => {
    const g = sl.gradient;
    const dz = ((k + 0.5) / split - 0.5) * sl.width_nm;
    return g ? { ...sl, width_nm: sl.width_nm / split, V: sl.V + g.V * dz, mass: sl.mass + g.mass * dz, alpha: sl.alpha + g.alpha * dz } : { ...sl, width_nm: sl.width_nm / split };
  }));
  return { band: 'electron', slices, left, right, sign: 1, openEdge };
}

describe('linear slices against independent references', () => {
  for (const c of fixture.cases) {
    // Exact Airy roots: only rounding separates the two. FD at O(h^6) is good to about 1e-11 eV (its
    // Richardson step); where the mass varies ours errs at fourth order in the cut, 2.5e-9 to 9e-9 eV
    // at the default cut (0.2 nm flat slices with Richardson, the method before, erred by up to 2e-8 eV).
    const tol = c.method === 'airy' ? 1e-11 : 2e-8;
    it(`${c.name}: ${c.energies.length} levels within ${tol} eV of the ${c.method === 'airy' ? 'scipy Airy roots' : 'FD reference'}`, () => {
      const got = solveBand(profileOf(c)).states.map((s) => s.energy);
      expect(got.length, `${c.name}: bound states, got ${got.length}, reference ${c.energies.length}`).toBe(c.energies.length);
      got.forEach((e, k) => {
        const diff = Math.abs(e - c.energies[k]!);
        expect(diff, `${c.name} E${k + 1}: got ${e}, reference ${c.energies[k]}, diff ${diff}, tolerance ${tol}`).toBeLessThan(tol);
      });
    });
  }

  it('counts states exactly on linear slices: N(E) equals the reference levels below E (29-level triangular well and the rest)', () => {
    for (const c of fixture.cases) {
      const p = profileOf(c);
      const lo = Math.min(...c.pieces.flatMap((x) => [x[1], x[2]]));
      for (let k = 0; k <= 400; k++) {
        const E = lo + ((p.openEdge - lo) * k) / 400;
        const want = c.energies.filter((x) => x < E).length;
        // Energies within 1e-9 eV of a level are left out: the reference's last digits decide them.
        if (c.energies.some((x) => Math.abs(x - E) < 1e-9)) continue;
        expect(countStatesBelow(p, E), `${c.name}: N(${E})`).toBe(want);
      }
    }
  });
});

describe('linear slices: order and agreement', () => {
  it('where the mass varies, the error falls fourth-order with the cut (halving every piece: about 16×)', () => {
    const c = fixture.cases.find((x) => x.name.startsWith('10 nm well, two-band'))!;
    const err = (split: number): number => Math.abs(solveBand(profileOf(c, split)).states[1]!.energy - c.energies[1]!);
    const e1 = err(1);
    const e2 = err(2);
    const e4 = err(4);
    // Each slice of the default cut split into 1, 2, 4: measured 1.6e-9, 9.7e-11, 6.7e-12 eV.
    expect(e1 / e2, `errors ${e1}, ${e2}, ${e4}`).toBeGreaterThan(10);
    expect(e2 / e4, `errors ${e1}, ${e2}, ${e4}`).toBeGreaterThan(10);
  });

  it('random tilted and graded stacks: the same bound states as fine flat slices, within 5e-6 eV (property)', () => {
    // Flat slices of 0.02 nm err at second order (about 1e-6 eV here); both count every state.
    fc.assert(fc.property(
      fc.integer({ min: 2, max: 12 }), fc.integer({ min: -150, max: 150 }), fc.double({ min: 0.1, max: 0.4, noNaN: true }), fc.boolean(), fc.boolean(),
      (well, field, x, graded, nonparabolic) => {
        const spec = parseSpecText(`
substrate: GaAs
field: ${field} kV/cm
solver: { nonparabolic: ${nonparabolic} }
stack:
  - { material: Al${x.toFixed(3)}Ga${(1 - x).toFixed(3)}As, thickness: 15 nm }
  ${graded ? `- { material: AlGaAs, Al: { from: ${x.toFixed(3)}, to: 0 }, thickness: 5 nm }` : ''}
  - { material: GaAs, thickness: ${well} nm }
  - { material: Al${x.toFixed(3)}Ga${(1 - x).toFixed(3)}As, thickness: 15 nm }
`).spec;
        const st = buildStructure(spec, {});
        for (const band of ['electron', 'heavy_hole'] as const) {
          const linear = solveBand(buildBandProfile(st, band, { maxSlice_nm: 0.2, nonparabolic, linear: true })).states;
          const flatProfile = buildBandProfile(st, band, { maxSlice_nm: 0.02, nonparabolic });
          const flat = solveBand(flatProfile).states;
          // A state within the flat slicing's error of the open edge may be bound in one and not the other.
          const sure = (list: readonly { energy: number }[]): number => list.filter((x) => x.energy < flatProfile.openEdge - 1e-5).length;
          expect(sure(linear), `${band}, ${well} nm, ${field} kV/cm: states`).toBe(sure(flat));
          for (let k = 0; k < Math.min(linear.length, flat.length); k++) expect(Math.abs(linear[k]!.energy - flat[k]!.energy), `${band} ${k + 1}`).toBeLessThan(5e-6);
        }
      }), { numRuns: 25, seed: 18 });
  });
});
