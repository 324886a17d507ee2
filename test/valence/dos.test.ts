import { describe, expect, it } from 'vitest';
import { angularQuadrature, dosMass, holeDispersion, holeDosTable, statesAbove } from '../../engine/valence/dos.js';
import { valenceSubbands } from '../../engine/valence/dispersion.js';
import { holeFermiLevelForDensity, holeSheetDensity, quasiFermiLevels, quasiFermiLevelsMultiband, sheetDensity, type HoleDispersion } from '../../engine/observables/carriers.js';
import { solveStructure } from '../../engine/solve.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { expectWithin, well } from './helpers.js';

/** Parabolic hole branches E = E0 − (ħ²/2m0) k²/m, two per subband, on a k grid (absolute energies). */
function parabolic(subbands: readonly { E0: number; m: number }[], kMax = 1.5, n = 61): HoleDispersion {
  const k = Array.from({ length: n }, (_, i) => (kMax * i) / (n - 1));
  const branches = subbands.flatMap(({ E0, m }) => [0, 1].map(() => k.map((x) => E0 - (HBAR2_OVER_2M0 * x * x) / m)));
  return { k_per_nm: k, directions: [{ weight: 1, branches }] };
}

describe('hole density from dispersions (carriers.ts) against the closed-form parabolic sheet density', () => {
  // n2D = Σ m kT/(πħ²) ln(1 + e^((E_F − E_n)/kT)) in the particle sense (sheetDensity; common practice).
  const bands = [{ E0: -0.80, m: 0.12 }, { E0: -0.83, m: 0.2 }];
  const d = parabolic(bands);
  for (const [F, T] of [[-0.78, 300], [-0.81, 300], [-0.85, 77], [-0.79, 4]] as const) {
    it(`F = ${F} eV, T = ${T} K: exact for E linear in k², the tail included`, () => {
      const want = sheetDensity({ subbands: bands.map((b) => ({ energy: -b.E0, mass: b.m })), fermiLevel_eV: -F, temperature_K: T });
      const got = holeSheetDensity({ dispersion: d, fermiLevel_eV: F, temperature_K: T });
      expect(Math.abs(got / want - 1)).toBeLessThan(1e-10);
    });
  }
  it('round trip through holeFermiLevelForDensity, and the parabolic quasi-Fermi levels are reproduced', () => {
    for (const p of [1e10, 3e12, 1e13]) {
      const F = holeFermiLevelForDensity({ dispersion: d, density_cm2: p, temperature_K: 300 });
      expect(Math.abs(holeSheetDensity({ dispersion: d, fermiLevel_eV: F, temperature_K: 300 }) / p - 1)).toBeLessThan(1e-10);
    }
    const electrons = [{ energy: 0.7, mass: 0.067 }];
    const a = quasiFermiLevels({ electronSubbands: electrons, holeSubbands: bands.map((b) => ({ energy: -b.E0, mass: b.m })), sheetDensity_cm2: 2e12, temperature_K: 300 });
    const b = quasiFermiLevelsMultiband({ electronSubbands: electrons, holeDispersion: d, sheetDensity_cm2: 2e12, temperature_K: 300 });
    expect(Math.abs(a.hole_eV - b.hole_eV)).toBeLessThan(1e-10);
    expect(b.electron_eV).toBe(a.electron_eV);
  });
  it('bad input names the field', () => {
    expect(() => holeSheetDensity({ dispersion: { ...d, directions: [{ weight: 0.5, branches: d.directions[0]!.branches }] }, fermiLevel_eV: -0.8, temperature_K: 300 })).toThrow(/weights must sum to 1/);
    expect(() => holeFermiLevelForDensity({ dispersion: d, density_cm2: -1, temperature_K: 300 })).toThrow(/density_cm2/);
  });
});

describe('state counting and DOS mass (valence/dos.ts)', () => {
  it('parabolic: N(E) = m ΔE/(πħ²) per pair, DOS = m/(πħ²) per pair (2.80e13 cm⁻² eV⁻¹ for m = 0.067, common practice), DOS mass = m', () => {
    const d = parabolic([{ E0: 0, m: 0.067 }]);
    expectWithin(statesAbove(d, -0.05) * 1e14, (0.067 * 0.05) / (2 * Math.PI * HBAR2_OVER_2M0) * 1e14, 1e-3 * 1e11, 'N(−50 meV)');
    const table = holeDosTable(d, [-0.01, -0.02, -0.03]);
    for (const g of table.dos_per_eV_cm2) expectWithin(g, 2.80e13, 0.01e13, 'step height');
  });

  it('the angular quadrature integrates cos 4φ exactly over 0–45° and the axial case is one direction', () => {
    const q = angularQuadrature(false, 2);
    const angle = (x: (typeof q.directions)[number]): number => (x === '[100]' ? 0 : x === '[110]' ? 45 : x) * (Math.PI / 180);
    expect(q.weights.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 15);
    expect(Math.abs(q.directions.reduce((acc: number, x, i) => acc + q.weights[i]! * Math.cos(4 * angle(x)), 0))).toBeLessThan(1e-15);
    expect(Math.abs(q.directions.reduce((acc: number, x, i) => acc + q.weights[i]! * Math.cos(8 * angle(x)), 0))).toBeLessThan(1e-15);
    expect(angularQuadrature(true).directions).toEqual(['[100]']);
  });

  it('In0.2Ga0.8As/GaAs 7 nm at 300 K: hh1 DOS mass in the range reported for strained InGaAs wells, heavier than the axial parabolic mass', () => {
    // Literature: compressive strain makes the in-plane hh mass of InGaAs/GaAs wells light, about
    // 0.1–0.16 m0 near the band edge for 15–25 % In (magneto-optical measurements; the strain-induced
    // lightening predicted by E. Yablonovitch and E. O. Kane, J. Lightwave Technol. 4, 504 (1986);
    // from memory), and a magneto-PLE study of strained (GaIn)As/Ga(PAs) wells (1995; abstract seen)
    // reports the hh in-plane mass falling with strain; unstrained GaAs wells give 0.22–0.51 m0 by
    // cyclotron resonance (H. Zhu et al., Solid State Commun., doi:10.1016/j.ssc.2006.12.006; abstract
    // seen). The range checked for the band-edge DOS mass (5 meV window) is 0.10–0.20 m0.
    const s = well('GaAs', 'In0.2Ga0.8As', 7);
    const q = angularQuadrature(false);
    const r = valenceSubbands(s, { directions: q.directions, kMax_per_nm: 1.2, kPoints: 49 });
    expect(r.directions[0]!.subbands[0]!.label).toBe('hh1');
    const edge = dosMass(r, q.weights, 0, 0.005);
    expect(edge).toBeGreaterThan(0.10);
    expect(edge).toBeLessThan(0.20);
    // Averaged over kT the mass grows (non-parabolic hh1), and the parabolic axial mass of the
    // single-band model, 1/(γ1 + γ2), is lighter.
    const kT = dosMass(r, q.weights, 0, 0.02585);
    expect(kT).toBeGreaterThan(edge);
    const parabolicMass = solveStructure(s).bands.heavy_hole.states[0]!.mass_inplane;
    expect(kT).toBeGreaterThan(1.3 * parabolicMass);
  });

  it('the hole quasi-Fermi level of a 7 nm In0.2Ga0.8As/GaAs well at 2e12 cm⁻² lies deeper with the multiband DOS than with the parabolic one', () => {
    const s = well('GaAs', 'In0.2Ga0.8As', 7);
    const q = angularQuadrature(false);
    const r = valenceSubbands(s, { directions: q.directions, kMax_per_nm: 1.2, kPoints: 49 });
    const single = solveStructure(s);
    const parabolicHoles = [...single.bands.heavy_hole.states, ...single.bands.light_hole.states].map((x) => ({ energy: -x.energy_eV, mass: x.mass_inplane }));
    const electrons = single.bands.electron.states.map((x) => ({ energy: x.energy_eV, mass: x.mass_inplane }));
    const a = quasiFermiLevels({ electronSubbands: electrons, holeSubbands: parabolicHoles, sheetDensity_cm2: 2e12, temperature_K: 300 });
    const b = quasiFermiLevelsMultiband({ electronSubbands: electrons, holeDispersion: holeDispersion(r, q.weights), sheetDensity_cm2: 2e12, temperature_K: 300 });
    // A heavier DOS holds the same holes closer to the band edge: the hole level moves up (less
    // separation), so transparency needs more carriers.
    expect(b.hole_eV).toBeGreaterThan(a.hole_eV);
    expect(b.separation_eV).toBeLessThan(a.separation_eV);
  });
});
