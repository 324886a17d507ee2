/** Specs shared by the tolerance tests (invented structures; custom materials make closed forms apply). */
import { parseSpecText } from '../../engine/input/load.js';
import type { Spec } from '../../engine/input/schema.js';

/**
 * A very deep square well of custom materials: 50 eV barriers for both bands, one mass (1 m0)
 * everywhere, no non-parabolicity, monolayer 0.25 nm (lattice 0.5 nm). Electron decay constant in
 * the barrier κ = √(V/(ħ²/2m)) ≈ 36 nm⁻¹, so the wave leaks about 1/κ ≈ 0.03 nm each side.
 */
export function deepWell(widthML: number, target = '{ subband_edge: e1, energy: 10 meV, within: 1 meV }'): Spec {
  return parseSpecText(`
materials:
  W: { Ec: 0, Ev: -1, me: 1, mhh: 1, mlh: 1, lattice: 0.5 nm, nonparabolicity: 0 }
  B: { Ec: 50, Ev: -51, me: 1, mhh: 1, mlh: 1, lattice: 0.5 nm, nonparabolicity: 0 }
solver: { nonparabolic: false }
vary:
  w: { from: 1 ML, to: 200 ML, value: ${widthML} ML }
stack:
  - { material: B, thickness: 2 nm }
  - { material: W, thickness: w, label: well }
  - { material: B, thickness: 2 nm }
targets:
  - ${target}
`, 'deep-well').spec;
}

/** A GaAs well of a whole number of monolayers between Al(x)Ga(1−x)As barriers, at temperature T. */
export function gaasWell(widthML: number, al: number, temperature: string, target: string): Spec {
  return parseSpecText(`
temperature: ${temperature}
stack:
  - { material: Al${al}Ga${Number((1 - al).toFixed(4))}As, thickness: 20 nm }
  - { material: GaAs, thickness: ${widthML} ML, label: well }
  - { material: Al${al}Ga${Number((1 - al).toFixed(4))}As, thickness: 20 nm }
targets:
  - ${target}
`, 'gaas-well').spec;
}
