/**
 * The multiband valence model in `solve`: dispersions and DOS masses in the result, the hole
 * quasi-Fermi level from the k·p dispersions, and the transparency density of a strained pump well.
 * The heavier multiband hole DOS raises the transparency density of InGaAs/GaAs wells over the
 * parabolic axial-mass estimate (common practice: hole DOS masses of 0.1–0.2 m0 against the 0.08–0.09
 * of the axial approximation; e.g. E. Yablonovitch and E. O. Kane, J. Lightwave Technol. 4, 504
 * (1986), from memory).
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { carriersOf, findTransition, solve, type SolveResult } from '../../engine/solve.js';
import { buildStructure } from '../../engine/structure.js';
import { valenceOfSolve } from '../../engine/valence/summary.js';

const well = (valence: string) => parseSpecText(`
substrate: GaAs
temperature: 300 K
solver: { valence: ${valence} }
stack:
  - { material: GaAs, thickness: 20 nm }
  - { material: In0.2Ga0.8As, thickness: 7 nm }
  - { material: GaAs, thickness: 20 nm }
`).spec;

/** Sheet density (cm⁻²) at which the quasi-Fermi separation reaches the e1-hh1 edge, by bisection in log n. */
function transparency(r: SolveResult, holes: Parameters<typeof carriersOf>[2]): number {
  const edge = findTransition(r, 'e1-hh1')!.energy_eV;
  let lo = 1e10;
  let hi = 1e13;
  for (let i = 0; i < 50; i++) {
    const mid = Math.sqrt(lo * hi);
    if (carriersOf(r, mid, holes)!.separation_eV > edge) hi = mid; else lo = mid;
  }
  return Math.sqrt(lo * hi);
}

describe('multiband valence in solve', () => {
  it('reports the kp4 dispersions along [100] and [110] with DOS masses, and nothing under the parabolic model', () => {
    const r = solve(well('kp4'));
    expect(r.valence?.model).toBe('kp4');
    expect(r.valence!.directions.map((d) => d.name)).toEqual(['[100]', '[110]']);
    const hh1 = r.valence!.dos_mass.find((m) => m.label === 'hh1')!;
    expect(hh1.window_5meV_m0).toBeGreaterThan(0.1);
    expect(hh1.window_5meV_m0).toBeLessThan(0.2);
    expect(solve(well('parabolic')).valence).toBeUndefined();
  });

  it('raises the transparency density of a 7 nm In0.2Ga0.8As/GaAs well over the parabolic-hole estimate, and says which model it used', () => {
    const parabolic = solve(well('parabolic'));
    const kp = solve(well('kp4'));
    const holes = valenceOfSolve(kp.structure, 'kp4', false, kp.bands.heavy_hole.states.length + kp.bands.light_hole.states.length).holes;
    const nParabolic = transparency(parabolic, undefined);
    const nKp = transparency(kp, holes);
    // Measured and computed transparency densities of such wells lie near 1e12 cm⁻² at 300 K (common practice, from memory).
    expect(nKp / nParabolic, `transparency ${nKp.toExponential(3)} (kp4) vs ${nParabolic.toExponential(3)} cm⁻² (parabolic)`).toBeGreaterThan(1.3);
    expect(nKp).toBeGreaterThan(5e11);
    expect(nKp).toBeLessThan(2e12);
    const withCarriers = solve(parseSpecText(`
substrate: GaAs
carriers: { sheet_density: 2e12 cm-2 }
stack:
  - { material: GaAs, thickness: 20 nm }
  - { material: In0.2Ga0.8As, thickness: 7 nm }
  - { material: GaAs, thickness: 20 nm }
`).spec);
    expect(withCarriers.carriers!.note).toMatch(/4×4 k·p subband dispersions/);
  });

  it('a custom material without a split-off energy is refused by kp6 as an input error naming the setting', () => {
    const spec = parseSpecText(`
materials:
  w: { Ec: 1.5 eV, Ev: 0 eV, me: 0.067, mhh: 0.35, mlh: 0.09 }
  b: { Ec: 1.8 eV, Ev: -0.15 eV, me: 0.08, mhh: 0.4, mlh: 0.1 }
solver: { valence: kp6 }
stack:
  - { material: b, thickness: 10 nm }
  - { material: w, thickness: 8 nm }
  - { material: b, thickness: 10 nm }
`).spec;
    expect(() => solve(spec)).toThrow(/split-off|kp6/);
    expect(buildStructure(spec, {}).layers).toHaveLength(3);
  });
});
