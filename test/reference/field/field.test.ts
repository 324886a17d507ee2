/**
 * The applied field through the whole pipeline: profile slicing, the flat contacts, Richardson
 * extrapolation and quasi-bound flagging, checked against an independent finite-difference solve
 * (test/solver1d/fd-reference.ts) and against the quadratic quantum-confined Stark effect
 * (D. A. B. Miller et al., Phys. Rev. Lett. 53, 2173 (1984)). Resonances themselves: resonances.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../../engine/input/load.js';
import { solve, findState, findTransition } from '../../../engine/solve.js';
import { buildStructure } from '../../../engine/structure.js';
import { buildBandProfile } from '../../../engine/profile.js';
import { fdExtrapolated } from '../../solver1d/fd-reference.js';

const spec = (field: number, extra = '') => parseSpecText(`
substrate: GaAs
temperature: 300 K
field: ${field} kV/cm
solver: { nonparabolic: false }
stack:
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
  - { material: GaAs, thickness: 10 nm }
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
${extra}`).spec;

describe('electric field along z', () => {
  it('energies agree with an independent finite-difference solve of the tilted profile within 0.05 meV', () => {
    for (const field of [30, 60]) {
      const s = spec(field);
      const r = solve(s);
      for (const band of ['electron', 'heavy_hole'] as const) {
        const profile = buildBandProfile(buildStructure(s, {}), band, { maxSlice_nm: 0.05, nonparabolic: false });
        // Below the downhill (open) edge the FD spectrum holds exactly the states that stay bound.
        const fd = fdExtrapolated(profile, 0.05, 10, profile.openEdge);
        const ours = r.bands[band].states.filter((x) => x.bound).map((x) => profile.sign * x.energy_eV);
        expect(ours.length, `${band} at ${field} kV/cm: bound states`).toBeGreaterThan(0);
        expect(ours.length, `${band} at ${field} kV/cm: count against FD`).toBe(fd.length);
        for (const [k, e] of ours.entries()) {
          const diff = Math.abs(e - fd[k]!);
          expect(diff, `${band} state ${k + 1} at ${field} kV/cm: got ${e}, FD ${fd[k]}, diff ${diff} eV, tol 5e-5`).toBeLessThan(5e-5);
        }
      }
    }
  });

  it('e1-hh1 red-shifts quadratically at low field, the same for ±F in a symmetric well (QCSE, Miller 1984)', () => {
    const e = (f: number): number => findTransition(solve(spec(f)), 'e1-hh1')!.energy_eV;
    const e0 = e(0);
    const d1 = e0 - e(10);
    const d2 = e0 - e(20);
    expect(d1).toBeGreaterThan(0);
    expect(Math.abs(d2 / d1 - 4), `shift ratio at 2F/F: ${d2 / d1}, expected 4 (second-order perturbation)`).toBeLessThan(0.1);
    expect(Math.abs(e(-20) - e(20))).toBeLessThan(1e-9);
  });

  it('a field that pulls a state above the downhill edge flags it quasi-bound instead of dropping it', () => {
    // Thin claddings and a strong field: the downhill contact edge falls below e2 of the well.
    const s = parseSpecText(`
substrate: GaAs
field: 150 kV/cm
solver: { nonparabolic: false }
stack:
  - { material: Al0.3Ga0.7As, thickness: 4 nm }
  - { material: GaAs, thickness: 12 nm }
  - { material: Al0.3Ga0.7As, thickness: 4 nm }
`).spec;
    const r = solve(s);
    const states = r.bands.electron.states;
    expect(states.some((x) => !x.bound), JSON.stringify(states)).toBe(true);
    expect(findState(r, 'e1')!.bound).toBe(true);
    for (const x of states) expect(x.bound).toBe(x.energy_eV < r.bands.electron.barrier_eV);
  });
});

describe('a search and solve see the same states under a field', () => {
  it('energies-only solves of a limited count report the states a full solve reports', async () => {
    const { solveStructure, settingsOf } = await import('../../../engine/solve.js');
    for (const [w, F] of [[6.5, 20], [5.0, 5], [8, 40]] as const) {
      const s = parseSpecText(`
substrate: GaAs
temperature: 77 K
field: ${F} kV/cm
stack:
  - { material: Al0.26Ga0.74As, thickness: 30 nm }
  - { material: GaAs, thickness: ${w} nm }
  - { material: Al0.26Ga0.74As, thickness: 30 nm }
`).spec;
      const full = solve(s).bands.electron.states.slice(0, 2);
      const light = solveStructure(buildStructure(s, {}), settingsOf(s), { wavefunctions: false, states: { electron: 2, heavy_hole: 0, light_hole: 0 } }).bands.electron.states;
      expect(light.map((x) => [x.label, x.energy_eV, x.bound]), `${w} nm at ${F} kV/cm`).toEqual(full.map((x) => [x.label, x.energy_eV, x.bound]));
    }
  });

  it('a quasi-bound state above the barrier edge does not meet an at_barrier_edge target', async () => {
    const { compileTargets, scoreTargets } = await import('../../../objectives/index.js');
    const s = parseSpecText(`
substrate: GaAs
temperature: 77 K
field: 20 kV/cm
stack:
  - { material: Al0.26Ga0.74As, thickness: 30 nm }
  - { material: GaAs, thickness: 6.5 nm }
  - { material: Al0.26Ga0.74As, thickness: 30 nm }
targets:
  - { at_barrier_edge: e2, within: 10 meV }
`).spec;
    const r = solve(s);
    expect(findState(r, 'e2')!.bound).toBe(false);
    const e = scoreTargets(compileTargets(s.targets), r).evaluations[0]!;
    expect(e.satisfied).toBe(false);
    expect(Math.abs(e.residual)).toBeGreaterThan(1);
  });
});
