/**
 * Static (low-frequency) relative permittivity ε_s of the III–V binaries at 300 K, and of their
 * alloys by linear interpolation over the binaries (the form the handbook's alloy relations take,
 * e.g. AlxGa1−xAs 12.90 − 2.84x). Used by the exciton estimate and by electrostatics.
 *
 * Values: NSM Archive, Ioffe Institute, "Semiconductors on NSM", basic parameters at 300 K —
 * seen for GaAs 12.90 and AlAs 10.06 (AlGaAs 12.90 − 2.84x), InP 12.5, GaP 11.1 (GaInP
 * 12.5 − 1.4x), InSb 16.8 and GaSb 15.7 (GaInSb 16.8 − 1.1x); InAs 15.15, AlP 9.8 and AlSb 12.04
 * from memory of the same archive.
 */
import type { Alloy } from './types.js';

export const STATIC_PERMITTIVITY: Readonly<Record<string, number>> = Object.freeze({
  GaAs: 12.9, AlAs: 10.06, InAs: 15.15,
  GaP: 11.1, AlP: 9.8, InP: 12.5,
  GaSb: 15.7, AlSb: 12.04, InSb: 16.8,
});

/**
 * ε_s of an alloy: Σ x_III · y_V · ε(III-V) over its binaries (linear in each fraction).
 * Example: Al0.3Ga0.7As → 0.3 · 10.06 + 0.7 · 12.9 = 12.048. Undefined when a binary has no value.
 */
export function staticPermittivity(alloy: Alloy): number | undefined {
  let eps = 0;
  for (const [III, x] of Object.entries(alloy.III)) {
    for (const [V, y] of Object.entries(alloy.V)) {
      const e = STATIC_PERMITTIVITY[III + V];
      if (e === undefined) return undefined;
      eps += x * y * e;
    }
  }
  return eps;
}
