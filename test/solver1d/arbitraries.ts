/**
 * fast-check generators of random parabolic multi-layer band profiles for the solver tests.
 * Widths are whole multiples of 0.1 nm so that the finite-difference reference tiles them exactly.
 */

import fc from 'fast-check';
import type { BandProfile } from '../../engine/profile.js';
import { layer, outer, profileOf } from './helpers.js';

export interface StackOptions {
  readonly maxLayers: number;
  /** Constant mass everywhere (m0) instead of random masses. */
  readonly constantMass?: number;
}

export const stackArb = (o: StackOptions): fc.Arbitrary<BandProfile> => {
  const massArb = o.constantMass === undefined ? fc.double({ min: 0.05, max: 0.12, noNaN: true }) : fc.constant(o.constantMass);
  const layerArb = fc.record({
    tenths: fc.integer({ min: 5, max: 80 }),
    V: fc.double({ min: 0, max: 0.35, noNaN: true }),
    mass: massArb,
  });
  return fc
    .record({
      layers: fc.array(layerArb, { minLength: 1, maxLength: o.maxLayers }),
      VL: fc.double({ min: 0.3, max: 0.45, noNaN: true }),
      VR: fc.double({ min: 0.3, max: 0.45, noNaN: true }),
      mL: massArb,
      mR: massArb,
    })
    .map((r) => profileOf(r.layers.map((l) => layer(l.tenths / 10, l.V, l.mass)), outer(r.VL, r.mL), outer(r.VR, r.mR)));
};

/** The same stack read from right to left. */
export const reversed = (p: BandProfile): BandProfile => ({ ...p, slices: [...p.slices].reverse(), left: p.right, right: p.left });

/** Every potential (slices and outer regions) moved by dV (eV). */
export const shifted = (p: BandProfile, dV: number): BandProfile => ({
  ...p,
  slices: p.slices.map((s) => ({ ...s, V: s.V + dV })),
  left: { ...p.left, V: p.left.V + dV },
  right: { ...p.right, V: p.right.V + dV },
});

/** Total width of the slices (nm). */
export const stackWidth = (p: BandProfile): number => p.slices.reduce((w, s) => w + s.width_nm, 0);
