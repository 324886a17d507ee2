import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { sampleCrossSection, solveCrossSection, solveCrossSectionConverged } from '../../engine/solver2d.js';
import { expectClose, finiteWellGround } from './helpers.js';

const V0 = 0.3;
const MW = 0.067;
const MB = 0.092;
const well = { V: 0, mass: MW };
const barrier = { V: V0, mass: MB };

describe('wide rectangle: the quantum-well limit', () => {
  it('an 8 nm × 60 nm finite rectangle lies within 0.5 meV of E_qw(8 nm) + E_qw(60 nm) (separable limit)', () => {
    // V = 0 inside |x| < 4, |y| < 30, V0 outside: separable except in the barrier corners, where
    // both tails are small, so E → E_qw(Lx) + E_qw(Ly); for Ly → ∞ E_qw(Ly) → ħ²π²/(2 m_w Ly²).
    // E_qw: 1-D BenDaniel–Duke even-state equation, solved in helpers.ts (closed form, Bastard 1988).
    const material = (x: number, y: number) => (Math.abs(x) < 4 && Math.abs(y) < 30 ? well : barrier);
    const r = solveCrossSectionConverged(
      (h) => sampleCrossSection({ x0_nm: -12, y0_nm: -38, width_nm: 24, height_nm: 76 }, h, material),
      1,
      { h_nm: 0.5 },
    );
    const limit = finiteWellGround(8, V0, MW, MB) + finiteWellGround(60, V0, MW, MB);
    expectClose(r.energies[0], limit, 5e-4, 'ground state of 8 × 60 nm finite rectangle');
  });
});

describe('T-shaped cross-section (two perpendicular finite wells crossing)', () => {
  it('its ground state lies below the ground states of both parent wells (common practice), parents solved as 2-D slabs', () => {
    const w = 6;
    const side = 60;
    const frame = { x0_nm: -side / 2, y0_nm: -side / 2, width_nm: side, height_nm: side };
    // Arm: the slab |y| < w/2 across the box; stem: |x| < w/2 for y < 0, joined to the arm.
    const arm = (x: number, y: number) => (Math.abs(y) < w / 2 ? well : barrier);
    const stemSlab = (x: number, y: number) => (Math.abs(x) < w / 2 ? well : barrier);
    const tee = (x: number, y: number) => (Math.abs(y) < w / 2 || (Math.abs(x) < w / 2 && y < 0) ? well : barrier);
    const h = 0.5;
    const eArm = solveCrossSection(sampleCrossSection(frame, h, arm), 1).energies[0];
    const eStem = solveCrossSection(sampleCrossSection(frame, h, stemSlab), 1).energies[0];
    const eTee = solveCrossSection(sampleCrossSection(frame, h, tee), 1).energies[0];
    // The slab in a 60 nm box is the 1-D well plus the box's lateral term ħ²π²/(2 m_w (60 nm)²).
    const lateral = (HBAR2_OVER_2M0 * Math.PI ** 2) / (MW * side * side);
    expectClose(eArm, finiteWellGround(w, V0, MW, MB) + lateral, 1e-3, 'arm slab against the 1-D well plus lateral term');
    expect(eTee < Math.min(eArm, eStem), `T ground ${eTee} eV not below parents ${eArm}, ${eStem} eV`).toBe(true);
  });
});
