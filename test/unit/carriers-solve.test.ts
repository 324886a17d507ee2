import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { solve } from '../../engine/solve.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { sheetDensity } from '../../engine/observables/carriers.js';

const spec = (T: string, n: string) => parseSpecText(`
substrate: GaAs
temperature: ${T}
carriers: { sheet_density: ${n} }
stack:
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
  - { material: GaAs, thickness: 8 nm }
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
`).spec;

describe('injected carriers in solve', () => {
  it('at low temperature with only e1 filled, E_F − E_e1 = n πħ²/m∥ (2-D degenerate gas, closed form)', () => {
    const n = 1e11;
    const r = solve(spec('2 K', `${n} cm-2`));
    const e1 = r.bands.electron.states[0]!;
    // n = m (E_F − E1)/(πħ²) per unit area with spin: E_F − E1 = n π ħ²/m = n · 2π·(ħ²/2m0)/m, n in nm⁻².
    const expected = ((n * 1e-14) * 2 * Math.PI * HBAR2_OVER_2M0) / e1.mass_inplane;
    const got = r.carriers!.electron_quasi_fermi_eV - e1.energy_eV;
    expect(Math.abs(got - expected), `got ${got} eV, expected ${expected} eV`).toBeLessThan(1e-5);
  });

  it('the electron quasi-Fermi level gives back the injected density; separation grows with density', () => {
    const lo = solve(spec('300 K', '5e11 cm-2'));
    const hi = solve(spec('300 K', '3e12 cm-2'));
    const subbands = hi.bands.electron.states.map((s) => ({ energy: s.energy_eV, mass: s.mass_inplane }));
    const back = sheetDensity({ subbands, fermiLevel_eV: hi.carriers!.electron_quasi_fermi_eV, temperature_K: 300 });
    expect(Math.abs(back / 3e12 - 1)).toBeLessThan(1e-8);
    expect(hi.carriers!.separation_eV).toBeGreaterThan(lo.carriers!.separation_eV);
  });

  it('a bad density is one clear input error', () => {
    expect(() => solve(spec('300 K', '-3 cm-2'))).toThrow(/carriers.sheet_density/);
  });
});

describe('in-plane mass with non-parabolicity', () => {
  it('in a deep well the e1 in-plane mass is the two-band m(1 + α E1) (Nelson, Miller & Kleinman 1987 form)', () => {
    // Custom materials: a 10 eV-deep well so that penetration into the barrier is negligible (< 1 %).
    const { spec: s } = parseSpecText(`
materials:
  W: { Ec: 0 eV, Ev: -1.5 eV, me: 0.067, mhh: 0.5, mlh: 0.08, lattice: 0.565 nm, nonparabolicity: 0.7 }
  B: { Ec: 10 eV, Ev: -11.5 eV, me: 0.067, mhh: 0.5, mlh: 0.08, lattice: 0.565 nm, nonparabolicity: 0 }
stack:
  - { material: B, thickness: 3 nm }
  - { material: W, thickness: 6 nm }
  - { material: B, thickness: 3 nm }
`);
    const e1 = solve(s).bands.electron.states[0]!;
    const expected = 0.067 * (1 + 0.7 * e1.energy_eV);
    expect(Math.abs(e1.mass_inplane / expected - 1), `got ${e1.mass_inplane}, expected ${expected}`).toBeLessThan(0.01);
  });
});
