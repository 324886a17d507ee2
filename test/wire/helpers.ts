/** Shared pieces of the wire tests: a spec built from custom materials, and a tolerance-carrying comparison. */
import { parseSpecText } from '../../engine/input/load.js';
import type { Spec } from '../../engine/input/schema.js';

export { expectClose, finiteWellGround } from '../solver2d/helpers.js';

/**
 * A wire spec with custom materials W (well) and B (barrier): electron edge 0 in W and V0 in B,
 * masses mw / mb for every band, and the valence edge far below so the hole bands stay cheap.
 * Parabolic (solver.nonparabolic: false) unless asked, so closed forms of constant mass apply.
 */
export function customWire(shape: string, opts: { V0: number; mw: number; mb: number; extra?: string; nonparabolic?: boolean }): Spec {
  return parseSpecText(`
solver: { nonparabolic: ${opts.nonparabolic ?? false} }
materials:
  W: { Ec: 0, Ev: -1.5, me: ${opts.mw}, mhh: ${opts.mw}, mlh: ${opts.mw}, lattice: 0.565 nm }
  B: { Ec: ${opts.V0}, Ev: -1.6, me: ${opts.mb}, mhh: ${opts.mb}, mlh: ${opts.mb}, lattice: 0.565 nm }
wire:
  barrier: B
  shape: ${shape}
${opts.extra ?? ''}
`).spec;
}
