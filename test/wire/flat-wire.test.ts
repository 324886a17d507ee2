/**
 * A flat wire reduces to its quantum well: an 80 × 6 nm GaAs wire in Al0.3Ga0.7As against the
 * 6 nm well solved exactly in 1-D with the same masses and non-parabolicity, plus the lateral
 * confinement across 80 nm; and the same wire stood on its side, where the hole masses differ.
 */
import { describe, expect, it } from 'vitest';
import type { BandName } from '../../engine/profile.js';
import { solve } from '../../engine/solve.js';
import { parseSpecText } from '../../engine/input/load.js';
import { solveWire, type WireSolveResult } from '../../engine/wire/solve.js';
import { buildWireStructure } from '../../engine/wire/structure.js';
import { expectClose, finiteWellGround } from './helpers.js';

const W = 80;
const H = 6;
const HEAD = 'title: flat wire (test)\nsubstrate: GaAs\ntemperature: 300 K\n';
const wire = (width: number, height: number, solver = '') => parseSpecText(`${HEAD}${solver}wire:
  barrier: Al0.3Ga0.7As
  shape: { kind: rectangle, material: GaAs, width: ${width} nm, height: ${height} nm }
  margin: 6 nm
  states: 1
`).spec;
const wellSpec = (solver = '') => parseSpecText(`${HEAD}${solver}stack:
  - { material: Al0.3Ga0.7As, thickness: 30 nm }
  - { material: GaAs, thickness: ${H} nm }
  - { material: Al0.3Ga0.7As, thickness: 30 nm }
`).spec;
const well = solve(wellSpec());

const flat = solveWire(wire(W, H));
const standing = solveWire(wire(H, W));
// Index 0 is the barrier, 1 the GaAs core (engine/wire/structure.ts).
const [barrier, core] = buildWireStructure(wire(W, H), {}).materials.map((m) => m.bands);

/** Particle-sense potential of a band: Ec, or −Ev for holes (engine/profile.ts). */
const potential = (b: typeof core, band: BandName): number => (band === 'electron' ? b!.Ec : band === 'heavy_hole' ? -b!.Ehh : -b!.Elh);
/** Masses (m0) of a band in the (001) plane and along [001] (materials/masses.ts: axial approximation in the plane). */
const masses = (b: typeof core, band: BandName): { inPlane: number; growth: number } =>
  band === 'electron' ? { inPlane: b!.me, growth: b!.me } : band === 'heavy_hole' ? { inPlane: b!.mhh_par, growth: b!.mhh_z } : { inPlane: b!.mlh_par, growth: b!.mlh_z };

/**
 * The lateral term of the separable (effective-index) estimate: the ground level of a 1-D finite
 * well of width `width`, depth V_barrier − E_well (outside the core column the cross-section is all
 * barrier), with the masses of the direction across it (BenDaniel–Duke matching, closed form,
 * G. Bastard 1988). Electrons: both masses at the well level, m(1 + α(E − V)). Its error, stated
 * for the tolerance: the core mass is used where the well mode also spreads into the barrier
 * (≈ 20 % of it, ≤ 40 % mass contrast), the corners are not separable (≈ h/W): together ≲ 15 % of
 * the term.
 */
function lateral(band: BandName, across: 'inPlane' | 'growth', width: number, eWell: number, nonparabolic = true): number {
  const np = (b: typeof core): number => (band === 'electron' && nonparabolic ? 1 + b!.alpha * (eWell - potential(b, band)) : 1);
  const depth = potential(barrier, band) - eWell;
  return finiteWellGround(width, depth, masses(core, band)[across] * np(core), masses(barrier, band)[across] * np(barrier));
}

const PREFIX: Record<BandName, string> = { electron: 'e', heavy_hole: 'hh', light_hole: 'lh' };

/**
 * The separable estimate's own error, as a fraction of the lateral term (see lateral). Measured here:
 * e1 and hh1 within 10 % of the term, lh1 19 % from it (the light hole's well state spreads most
 * into the barrier). A fixed 15 % covered lh1 only through the wire's error estimate, which was
 * 0.06 meV, 30 times its true error, before that estimate was made to bound the extrapolated value.
 */
const SEPARABLE_ERROR = 0.25;

const particle = (r: WireSolveResult, band: BandName): number => (band === 'electron' ? 1 : -1) * r.bands[band].states[0]!.energy_eV;

describe(`${W} × ${H} nm GaAs wire lying flat (the well is its 6 nm side along [001])`, () => {
  for (const band of ['electron', 'heavy_hole', 'light_hole'] as BandName[]) {
    it(`${PREFIX[band]}1 = E_well(${H} nm) + lateral term within 25 % of the term plus the error estimate`, () => {
      // E_well: the exact 1-D solver (engine/solve.ts, default non-parabolic electrons, like the wire) on the same materials.
      const eWell = (band === 'electron' ? 1 : -1) * well.bands[band].states[0]!.energy_eV;
      const lat = lateral(band, 'inPlane', W, eWell);
      const tolerance = SEPARABLE_ERROR * lat + flat.bands[band].errorEstimate_meV / 1000;
      expectClose(particle(flat, band), eWell + lat, tolerance, `${PREFIX[band]}1 of the flat wire (E_well ${eWell} eV, lateral ${lat * 1000} meV)`);
    });
  }
});

describe('the parabolic setting (solver.nonparabolic: false) on both sides', () => {
  it('e1 = E_well(6 nm) + lateral term, both parabolic, within 15 % of the term plus the error estimate', () => {
    const PARABOLIC = 'solver: { nonparabolic: false }\n';
    const r = solveWire(wire(W, H, PARABOLIC), undefined, { states: { electron: 1, heavy_hole: 0, light_hole: 0 } });
    const eWell = solve(wellSpec(PARABOLIC)).bands.electron.states[0]!.energy_eV;
    const lat = lateral('electron', 'inPlane', W, eWell, false);
    expectClose(particle(r, 'electron'), eWell + lat, 0.15 * lat + r.bands.electron.errorEstimate_meV / 1000, `parabolic e1 (E_well ${eWell} eV, lateral ${lat * 1000} meV)`);
    // The two settings differ by more than the tolerance here, so the comparison is not blind to the choice.
    expect(Math.abs(particle(r, 'electron') - particle(flat, 'electron')), 'parabolic vs non-parabolic e1 (eV)').toBeGreaterThan(5e-4);
  });
});

describe(`the same wire standing (${H} × ${W} nm): holes see their in-plane masses across the 6 nm`, () => {
  for (const band of ['heavy_hole', 'light_hole'] as BandName[]) {
    it(`${PREFIX[band]}1 = E_well(${H} nm, in-plane masses) + lateral term (growth-axis masses), and differs from lying flat`, () => {
      const V0 = potential(barrier, band) - potential(core, band);
      const eWell = potential(core, band) + finiteWellGround(H, V0, masses(core, band).inPlane, masses(barrier, band).inPlane);
      const lat = lateral(band, 'growth', W, eWell);
      const tolerance = 0.15 * lat + standing.bands[band].errorEstimate_meV / 1000;
      expectClose(particle(standing, band), eWell + lat, tolerance, `${PREFIX[band]}1 of the standing wire (E_well ${eWell} eV, lateral ${lat * 1000} meV)`);
      const shift = Math.abs(particle(standing, band) - particle(flat, band));
      expect(shift, `${PREFIX[band]}1 standing vs flat: ${shift * 1000} meV apart, expected more than 5 meV`).toBeGreaterThan(5e-3);
    });
  }

  it('e1 is the same either way (isotropic electron mass) within 1e-6 eV', () => {
    expectClose(particle(standing, 'electron'), particle(flat, 'electron'), 1e-6, 'e1 standing vs flat');
  });
});
