/**
 * States under a field that can leave the structure: resonances of the well (Siegert poles,
 * engine/resonance.ts), checked against an independent finite-difference calculation with exterior
 * complex scaling (ecs_resonances.py beside this file), against the Gamow/WKB tunnelling rate
 * through a thick tilted barrier, and on the intersubband detector of the issue that reported
 * contact box states in their place.
 */
import { describe, expect, it } from 'vitest';
import fixture from './ecs_resonances.json' with { type: 'json' };
import { parseSpecText } from '../../../engine/input/load.js';
import { findState, findTransition, solve } from '../../../engine/solve.js';
import type { Spec } from '../../../engine/input/schema.js';
import { HBAR2_OVER_2M0 as C } from '../../../engine/constants.js';
import { mismatch } from '../../design/check.js';

interface Layer { readonly thickness_nm: number; readonly V_eV: number; readonly mass: number; readonly alpha: number }

/** A spec of custom materials reproducing the fixture's layers: electrons take V as Ec, heavy holes as −Ev. */
function fixtureSpec(layers: readonly Layer[], field: number, sign: number, nonparabolic: boolean): Spec {
  const names = new Map<string, string>();
  const materials: Record<string, unknown> = {};
  const stack = layers.map((l) => {
    const key = JSON.stringify(l);
    if (!names.has(key)) {
      const name = `M${names.size}`;
      names.set(key, name);
      materials[name] = sign > 0
        ? { Ec: l.V_eV, Ev: l.V_eV - 1.5, me: l.mass, mhh: 0.5, mlh: 0.08, lattice: '0.565 nm', nonparabolicity: l.alpha }
        : { Ec: 1, Ev: -l.V_eV, me: 0.067, mhh: l.mass, mlh: 0.08, lattice: '0.565 nm' };
    }
    return { material: names.get(key)!, thickness: `${l.thickness_nm} nm` };
  });
  return { materials, temperature: '77 K', field: `${field} kV/cm`, solver: { nonparabolic }, stack } as unknown as Spec;
}

describe('resonance energies and widths against exterior complex scaling (ecs_resonances.py)', () => {
  // The reference is a different method (a linear non-Hermitian eigenproblem on a grid, resonances
  // told from the rotated continuum by their independence of the rotation angle), Richardson-
  // extrapolated from h = 0.05 and 0.025 nm, whose own h → h/2 change is below 1e-5 eV in E and 0.1 %
  // in Γ before extrapolation. Agreement seen: 2e-9 eV in E, 2.2e-4 of Γ (the 250 kV/cm case); the
  // tolerances are 1e-7 eV and 0.1 %, for widths from 1.6e-11 eV to 17 meV.
  it.each(fixture.cases)('$name', (c) => {
    const r = solve(fixtureSpec(c.layers, c.field_kV_per_cm, c.sign, c.nonparabolic));
    const band = c.sign > 0 ? 'electron' : 'heavy_hole';
    const s = r.bands[band].states[c.state - 1]!;
    expect(s, `${c.name}: state ${c.state} missing`).toBeDefined();
    expect(s.bound, `${c.name}: a resonance`).toBe(false);
    const energy = c.sign * s.energy_eV;
    expect(Math.abs(energy - c.energy_eV), mismatch(`${c.name}: Re E (eV)`, energy, c.energy_eV, 1e-7)).toBeLessThanOrEqual(1e-7);
    const width = s.width_meV / 1000;
    const tol = 0.001 * c.width_eV;
    expect(Math.abs(width - c.width_eV), mismatch(`${c.name}: Γ (eV)`, width, c.width_eV, tol)).toBeLessThanOrEqual(tol);
  });
});

describe('tunnelling width through a thick tilted barrier against the Gamow/WKB rate', () => {
  // Γ ≈ (ħ/T_cl) · 4k̃κ̃/(k̃² + κ̃²) · exp(−2∫κ dz): the attempt rate of the classical round trip in
  // the well, T_cl = 2∫dz/v, times the transmission of a barrier entered through one abrupt interface
  // (the rectangular barrier's T ≈ 16k²κ²/(k² + κ²)² e^{−2κd} has one such factor per interface,
  // with k̃ = k/m, κ̃ = κ/m for BenDaniel–Duke matching) and left at a smooth turning point, where
  // the WKB connection adds none (G. Gamow, Z. Phys. 51, 204 (1928); E. Merzbacher, Quantum
  // Mechanics (Wiley), ch. 7 for the rectangular barrier, from memory). The WKB action is exact
  // in the limit of large S; held to a factor 2 (the O(1) prefactor of a semiclassical rate),
  // over widths from 1e-17 to 1e-7 eV.
  const mw = 0.067;
  const mb = 0.09;
  const cases = [
    { w: 10, F: 50, Vb: 0.25, clad: 200 },
    { w: 10, F: 120, Vb: 0.25, clad: 200 },
    { w: 6, F: 100, Vb: 0.3, clad: 100 },
    { w: 8, F: 60, Vb: 0.2, clad: 150 },
  ];
  it.each(cases)('$w nm well, $Vb eV barriers, $F kV/cm: e1 width', ({ w, F, Vb, clad }) => {
    const spec = parseSpecText(`
materials:
  W: { Ec: 0 eV, Ev: -1.5 eV, me: ${mw}, mhh: 0.5, mlh: 0.08, lattice: 0.565 nm }
  B: { Ec: ${Vb} eV, Ev: -1.6 eV, me: ${mb}, mhh: 0.5, mlh: 0.08, lattice: 0.565 nm }
temperature: 77 K
field: ${F} kV/cm
solver: { nonparabolic: false }
stack:
  - { material: B, thickness: ${clad} nm }
  - { material: W, thickness: ${w} nm }
  - { material: B, thickness: ${clad} nm }
`).spec;
    const e1 = findState(solve(spec), 'e1')!;
    expect(e1.bound).toBe(false);
    const E = e1.energy_eV;
    const zc = clad + w / 2;
    const slope = F * 1e-4;
    const V = (z: number): number => (z < clad || z > clad + w ? Vb : 0) + slope * (z - zc);
    const dz = 1e-3;
    let period = 0; // T_cl/ħ in 1/eV: 2∫dz/(ħv), ħv = 2√(C (E − V)/m)
    for (let z = clad + dz / 2; z < clad + w; z += dz) if (E > V(z)) period += dz / Math.sqrt((C * (E - V(z))) / mw);
    let action = 0;
    for (let z = clad - dz / 2; z > 0 && V(z) > E; z -= dz) action += dz * Math.sqrt((mb * (V(z) - E)) / C);
    const k = Math.sqrt((mw * (E - V(clad + 1e-9))) / C) / mw;
    const kappa = Math.sqrt((mb * (V(clad - 1e-9) - E)) / C) / mb;
    const wkb = ((4 * k * kappa) / (k * k + kappa * kappa)) * Math.exp(-2 * action) / period;
    const ratio = e1.width_meV / 1000 / wkb;
    expect(ratio, mismatch(`${w} nm / ${Vb} eV / ${F} kV/cm: Γ / Γ_WKB (Γ_WKB = ${wkb} eV, S = ${action})`, ratio, 1, 1)).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(2);
  });
});

const detector = (field: number, nonparabolic = true, cladding = 30): Spec => parseSpecText(`
substrate: GaAs
temperature: 77 K
field: ${field} kV/cm
solver: { nonparabolic: ${nonparabolic} }
stack:
  - { material: Al0.26Ga0.74As, thickness: ${cladding} nm }
  - { material: GaAs, thickness: 5.2 nm }
  - { material: Al0.26Ga0.74As, thickness: ${cladding} nm }
`).spec;

describe('the bound-to-quasi-bound detector of the issue: 5.2 nm GaAs in Al0.26Ga0.74As at 77 K', () => {
  // Issue 12 item 5 measured e1-e2 = 152 meV, f = 0.74 at zero field, then 182 meV and f = 0.003 at
  // 10 kV/cm and 210 meV at 30 kV/cm: a box state of the contact layer in place of the resonance.
  // The resonance's own shift is small: e2 lies 9.5 meV below the barrier edge here, weakly enough
  // bound that the shift is beyond second order (−1.2 meV at 10 kV/cm, −1.8 meV at 30; a tight
  // second-order estimate holds only for deeper states, see stark.test.ts), so the bound is 3 meV,
  // ten times below the contact states' 30–60 meV.
  const zero = solve(detector(0));
  const e12 = findTransition(zero, 'e1-e2')!.energy_eV;
  it.each([10, 30])('%s kV/cm: e1-e2 within 3 meV of zero field, e2 a resonance with a width, no contact state', (F) => {
    for (const cladding of [30, 50]) {
      const r = solve(detector(F, true, cladding));
      const t = findTransition(r, 'e1-e2')!;
      expect(Math.abs(t.energy_eV - e12), mismatch(`${F} kV/cm, ${cladding} nm claddings: e1-e2 (eV)`, t.energy_eV, e12, 0.003)).toBeLessThanOrEqual(0.003);
      const e2 = findState(r, 'e2')!;
      expect(e2.bound).toBe(false);
      expect(e2.width_meV).toBeGreaterThan(0);
      expect(e2.energy_eV).toBeGreaterThan(r.bands.electron.barrier_eV);
      // The zero-field well holds two states, so the field reports two, not the contact's box states.
      expect(r.bands.electron.states.map((s) => s.label)).toEqual(['e1', 'e2']);
    }
  });

  it('solve without wavefunctions and with a limited count reports the same energies and widths', async () => {
    const { solveStructure, settingsOf } = await import('../../../engine/solve.js');
    const { buildStructure } = await import('../../../engine/structure.js');
    const spec = detector(30);
    const full = solve(spec).bands.electron.states;
    const light = solveStructure(buildStructure(spec, {}), settingsOf(spec), { wavefunctions: false, states: { electron: 2, heavy_hole: 0, light_hole: 0 } }).bands.electron.states;
    expect(light.map((s) => [s.label, s.energy_eV, s.width_meV, s.bound])).toEqual(full.map((s) => [s.label, s.energy_eV, s.width_meV, s.bound]));
  });
});

describe('intersubband oscillator strength of a resonance', () => {
  // A quasi-bound state narrower than its spacing is still the well's state: its e1-e2 oscillator
  // strength stays within 30 % of the zero-field value (issue 12 acceptance; physically the dipole
  // of a state that keeps its shape). The spacing is the smaller of e2 − e1 and e2's depth below the
  // zero-field barrier edge, the scale on which a field reshapes e2. Parabolic masses: the
  // non-parabolic dipole is reworked elsewhere. Fields up to 120 kV/cm.
  const wells = [
    { w: 6.5, x: 0.25, clad: 30 },
    { w: 8, x: 0.3, clad: 20 },
    { w: 6, x: 0.35, clad: 20 },
    { w: 5, x: 0.4, clad: 10 },
    { w: 5.2, x: 0.26, clad: 30 },
  ];
  const spec = (w: number, x: number, clad: number, F: number): Spec => parseSpecText(`
substrate: GaAs
temperature: 77 K
field: ${F} kV/cm
solver: { nonparabolic: false }
stack:
  - { material: Al${x}Ga${Number((1 - x).toFixed(2))}As, thickness: ${clad} nm }
  - { material: GaAs, thickness: ${w} nm }
  - { material: Al${x}Ga${Number((1 - x).toFixed(2))}As, thickness: ${clad} nm }
`).spec;
  it.each(wells)('$w nm GaAs / Al$x: f(e1-e2) within 30 % while Γ(e2) < spacing', ({ w, x, clad }) => {
    const r0 = solve(spec(w, x, clad, 0));
    const f0 = findTransition(r0, 'e1-e2')!.oscillator_strength!;
    const e2 = findState(r0, 'e2')!;
    const spacing_meV = 1000 * Math.min(findTransition(r0, 'e1-e2')!.energy_eV, r0.bands.electron.barrier_eV - e2.energy_eV);
    let checked = 0;
    for (const F of [2, 5, 10, 20, 30, 50, 80, 120]) {
      const r = solve(spec(w, x, clad, F));
      const s = findState(r, 'e2');
      if (s === undefined || s.width_meV >= spacing_meV) continue;
      const f = findTransition(r, 'e1-e2')!.oscillator_strength!;
      expect(Math.abs(f / f0 - 1), mismatch(`${w} nm / Al${x}, ${F} kV/cm (Γ ${s.width_meV} meV, spacing ${spacing_meV} meV): f/f0`, f / f0, 1, 0.3)).toBeLessThanOrEqual(0.3);
      checked++;
    }
    expect(checked).toBeGreaterThan(0);
  });
});
