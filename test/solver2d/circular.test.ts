import { describe, expect, it } from 'vitest';
import { sampleCrossSection, solveCrossSection, solveCrossSectionConverged } from '../../engine/solver2d.js';
import fixture from '../reference/solver2d/circular_wire.json' with { type: 'json' };
import { expectClose } from './helpers.js';

const a = fixture.radius_nm;
const material = (x: number, y: number) =>
  x * x + y * y < a * a ? { V: fixture.V_well_eV, mass: fixture.mass_well } : { V: fixture.V_barrier_eV, mass: fixture.mass_barrier };
const square = (side: number) => ({ x0_nm: -side / 2, y0_nm: -side / 2, width_nm: side, height_nm: side });

// Each l ≥ 1 level is twofold (cos lφ, sin lφ); the fixture lists l = 0, 1, 2 from exact Bessel matching.
const expected = fixture.states
  .flatMap((s) => (s.l === 0 ? [s] : [s, s]))
  .sort((p, q) => p.E_eV - q.E_eV);

describe('finite-barrier circular wire (fixture: exact Bessel matching, circular_wire.py)', () => {
  it('lowest six levels within 0.5 meV after Richardson extrapolation', () => {
    const r = solveCrossSectionConverged((h) => sampleCrossSection(square(30), h, material), expected.length, { h_nm: 0.5 });
    expect(r.status).toBe('converged');
    expect(r.errorEstimate_eV).toBeLessThan(5e-4);
    r.energies.forEach((e, k) => expectClose(e, expected[k].E_eV, 5e-4, `circular wire l=${expected[k].l} n=${expected[k].n}`));
  });

  it('the outer Dirichlet wall is irrelevant: a 30 nm and a 38 nm box (8 and 12 nm of barrier around the disc) agree within 0.05 meV', () => {
    const small = solveCrossSection(sampleCrossSection(square(30), 0.5, material), expected.length).energies;
    const large = solveCrossSection(sampleCrossSection(square(38), 0.5, material), expected.length).energies;
    small.forEach((e, k) => expectClose(e, large[k], 5e-5, `box 30 vs 38 nm, level ${k}`));
  });
});
