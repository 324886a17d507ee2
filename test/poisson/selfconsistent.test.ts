/**
 * The self-consistent loop: charge neutrality (acceptance: to 1e-6 of the donors), independence of
 * the mesh and of the mixing (acceptance: within 0.05 meV), a clear status when it does not
 * converge, bulk doping against the closed form F_{1/2}(η) = N_D/N_c, hard cases (ten uncoupled
 * wells, a wide well at 3e12 cm⁻²) converging, per-well neutrality under bias, and holes.
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, type Structure } from '../../engine/structure.js';
import { settingsOf, solveStructure, DEFAULT_SETTINGS } from '../../engine/solve.js';
import { resolveDoping, type DopingInput } from '../../engine/poisson/doping.js';
import { DEFAULT_SELF_CONSISTENT, selfConsistent, type SelfConsistentOptions } from '../../engine/poisson/selfconsistent.js';
import { dopedOptionsOf, solveDopedStructure } from '../../engine/poisson/doped.js';
import { fermiDiracInverse } from '../../engine/observables/fermi.js';
import { HBAR2_OVER_2M0, KB_EV_PER_K } from '../../engine/constants.js';
import { detectorCase, modulationCase } from '../reference/poisson/structures.js';
import { expectClose } from '../observables/close.js';

const stack = (T: number, layers: string, field = 0): Structure => buildStructure(parseSpecText(`substrate: GaAs\ntemperature: ${T} K\nfield: ${field} kV/cm\nstack:\n${layers}`, 'sc.yaml').spec, {});
const wells = (n: number, barrier_nm: number): string => `  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n${Array.from({ length: n }, (_, i) => `  - { material: GaAs, thickness: 5 nm, label: well }\n  - { material: Al0.3Ga0.7As, thickness: ${i === n - 1 ? 30 : barrier_nm} nm }\n`).join('')}`;
const dopeWells = (s: Structure): DopingInput => ({ layers: s.layers.map((l) => (l.formula === 'GaAs' ? { donors: '1e18 cm-3' } : undefined)) });

/** The reported energies: e1, e2 of the folded structure's solve, E_F and U at a point. */
function figures(s: Structure, doping: ReturnType<typeof resolveDoping>, options: SelfConsistentOptions, at_nm: number): number[] {
  const sc = selfConsistent(s, doping, options);
  expect(sc.status).toBe('converged');
  const e = solveStructure(sc.folded, DEFAULT_SETTINGS, { wavefunctions: false, states: { heavy_hole: 0, light_hole: 0 } }).bands.electron.states;
  const k = sc.mesh.z.findIndex((z) => Math.abs(z - at_nm) < 1e-9);
  expect(k).toBeGreaterThanOrEqual(0);
  return [e[0]!.energy_eV, e[1]!.energy_eV, sc.cells[0]!.fermi_eV, sc.potential[k]!];
}

describe('self-consistent loop', () => {
  it('neutral to 1e-6 of the donors (the modulation-doped and detector wells, 77 and 300 K)', () => {
    for (const c of [modulationCase(77, 5e11), modulationCase(300, 1e12), detectorCase()]) {
      const sc = selfConsistent(c.structure, c.doping, DEFAULT_SELF_CONSISTENT);
      expect(sc.neutrality, c.name).toBeLessThan(1e-6);
      const carried = sc.subbands.reduce((a, s) => a + s.density_cm2, 0) + sc.gas_cm2;
      expectClose(carried, c.doping.net_cm2, { rel: 1e-6 }, `${c.name}: subbands + gas against the donors`);
      expectClose(sc.cells[0]!.carriers_cm2, sc.cells[0]!.dopants_cm2, { rel: 1e-6 }, `${c.name}: the cell`);
    }
  });

  it('mesh 0.5 → 0.25 → 0.125 nm and mixing 1 → 0.3: e1, e2, E_F and U at the well centre move by under 0.05 meV', () => {
    for (const c of [modulationCase(300, 1e12), detectorCase()]) {
      const at = c.name.startsWith('detector') ? 32 : 44;
      const base = figures(c.structure, c.doping, DEFAULT_SELF_CONSISTENT, at);
      const variants: [string, SelfConsistentOptions][] = [['mesh 0.25 nm', { ...DEFAULT_SELF_CONSISTENT, mesh_nm: 0.25 }], ['mesh 0.125 nm', { ...DEFAULT_SELF_CONSISTENT, mesh_nm: 0.125 }], ['mixing 0.3', { ...DEFAULT_SELF_CONSISTENT, mixing: 0.3 }]];
      for (const [what, o] of variants) {
        const got = figures(c.structure, c.doping, o, at);
        ['e1', 'e2', 'E_F', 'U'].forEach((name, i) => expectClose(got[i]!, base[i]!, { abs: 5e-5 }, `${c.name}, ${what}: ${name}`));
      }
    }
  });

  it('not converged: status, iterations and the last residual; the doped solve says so (exit 1) and how to fix it', () => {
    const c = modulationCase(77, 1e12);
    const sc = selfConsistent(c.structure, c.doping, { ...DEFAULT_SELF_CONSISTENT, maxIterations: 2 });
    expect(sc.status).toBe('not-converged');
    expect(sc.iterations).toBe(2);
    expect(sc.residual_eV).toBeGreaterThan(DEFAULT_SELF_CONSISTENT.tolerance_eV);
    const spec = parseSpecText('stack: [{ material: GaAs, thickness: 1 nm }]', 'x.yaml').spec;
    const options = dopedOptionsOf(spec);
    const r = solveDopedStructure(c.structure, c.doping, settingsOf(spec), { ...options, selfConsistent: { ...options.selfConsistent, maxIterations: 2 } });
    expect(r.status).toBe('not-converged');
    expect(r.message).toMatch(/self-consistency not reached in 2 iterations: the potential still changed by \d\.\d\de-\d eV, above the tolerance 1\.0e-6 eV; raise doping\.max_iterations/);
    expect(r.selfConsistent.residual_eV).toBe(sc.residual_eV);
  });

  it('uniformly doped bulk GaAs (no bound state): flat bands and E_F − E_c = kT η with F_{1/2}(η) = N_D/N_c', () => {
    const s = stack(300, '  - { material: GaAs, thickness: 40 nm }\n');
    const sc = selfConsistent(s, resolveDoping({ layers: [{ donors: '1e17 cm-3' }] }, s), DEFAULT_SELF_CONSISTENT);
    expect(sc.status).toBe('converged');
    expect(sc.subbands.length).toBe(0);
    const kT = KB_EV_PER_K * 300;
    const Nc = 2 * ((s.layers[0]!.bands[0]!.me * kT) / (4 * Math.PI * HBAR2_OVER_2M0)) ** 1.5;
    expectClose(sc.cells[0]!.fermi_eV - s.layers[0]!.bands[0]!.Ec, kT * fermiDiracInverse(0.5, 1e-4 / Nc), { abs: 1e-9 }, 'E_F − E_c');
    expect(Math.max(...sc.potential.map(Math.abs))).toBeLessThan(1e-9);
    // With the continuum turned off nothing can hold the electrons.
    const none = selfConsistent(s, resolveDoping({ layers: [{ donors: '1e17 cm-3' }] }, s), { ...DEFAULT_SELF_CONSISTENT, continuum: false });
    expect(none.status).toBe('no-carriers');
  });

  it('hard cases converge: ten uncoupled doped wells (their levels microvolts apart), a 25 nm well with 3e12 cm⁻² at 4 K, a one-sided 2e12 cm⁻² sheet', () => {
    const ten = stack(77, wells(10, 30));
    const r10 = selfConsistent(ten, resolveDoping(dopeWells(ten), ten), DEFAULT_SELF_CONSISTENT);
    expect(r10.status).toBe('converged');
    expect(r10.iterations).toBeLessThanOrEqual(20);
    expect(r10.neutrality).toBeLessThan(1e-6);
    // Every well holds its own doping's electrons to 1 % (the end wells see other neighbours).
    const perWell = r10.subbands.filter((x) => x.energy_eV < 0.8).map((x) => x.density_cm2);
    expect(perWell.length).toBe(10);
    for (const n of perWell) expectClose(n, 5e11, { rel: 0.01 }, 'a well\'s e1 sheet density');
    const wide = stack(4, '  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n  - { material: Al0.3Ga0.7As, thickness: 5 nm }\n  - { material: GaAs, thickness: 25 nm }\n  - { material: Al0.3Ga0.7As, thickness: 5 nm }\n  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n');
    const half = { donors: `${1.5e12 / 5e-7} cm-3` };
    const rw = selfConsistent(wide, resolveDoping({ layers: [undefined, half, undefined, half, undefined] }, wide), DEFAULT_SELF_CONSISTENT);
    expect(rw.status).toBe('converged');
    expect(rw.iterations).toBeLessThanOrEqual(25);
    const one = stack(77, '  - { material: Al0.3Ga0.7As, thickness: 40 nm }\n  - { material: GaAs, thickness: 12 nm }\n  - { material: Al0.3Ga0.7As, thickness: 40 nm }\n');
    const r1 = selfConsistent(one, resolveDoping({ layers: [{ donors: '2e12 cm-2', at: '30 nm' }, undefined, undefined] }, one), DEFAULT_SELF_CONSISTENT);
    expect(r1.status).toBe('converged');
    expect(r1.iterations).toBeLessThanOrEqual(25);
  });

  it('under bias each well is a neutral cell with its own quasi-Fermi level; at zero field one level', () => {
    const biased = stack(77, wells(3, 30), 20);
    const sc = selfConsistent(biased, resolveDoping(dopeWells(biased), biased), DEFAULT_SELF_CONSISTENT);
    expect(sc.status).toBe('converged');
    expect(sc.cells.length).toBe(3);
    for (const cell of sc.cells) expectClose(cell.carriers_cm2, 5e11, { rel: 1e-6 }, `cell ${cell.from_nm}–${cell.to_nm} nm`);
    // A positive field raises the bands towards the last layer: each well's level sits ~70 meV (20 kV/cm × 35 nm) above the previous one's.
    const levels = sc.cells.map((c) => c.fermi_eV);
    expect(levels[1]! - levels[0]!).toBeGreaterThan(0.05);
    const flat = stack(77, wells(3, 30));
    expect(selfConsistent(flat, resolveDoping(dopeWells(flat), flat), DEFAULT_SELF_CONSISTENT).cells.length).toBe(1);
  });

  it('acceptors: holes in the heavy- and light-hole subbands, the Fermi level a few meV into the hh1 subband (below its edge on the absolute scale)', () => {
    const s = stack(77, '  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n  - { material: GaAs, thickness: 5 nm }\n  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n');
    const sc = selfConsistent(s, resolveDoping({ layers: [undefined, { acceptors: '1e18 cm-3' }, undefined] }, s), DEFAULT_SELF_CONSISTENT);
    expect(sc.status).toBe('converged');
    expect(sc.carriers).toBe('holes');
    expect(sc.neutrality).toBeLessThan(1e-6);
    const hh1 = sc.subbands.find((x) => x.band === 'heavy_hole')!;
    expect(sc.cells[0]!.fermi_eV).toBeLessThan(hh1.energy_eV);
    expect(hh1.energy_eV - sc.cells[0]!.fermi_eV).toBeLessThan(0.05);
    expect(hh1.density_cm2).toBeGreaterThan(0.5 * 5e11);
  });
});
