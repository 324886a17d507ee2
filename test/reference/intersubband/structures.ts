/**
 * The structures of the intersubband reference checks, as spec text, and their electron profiles
 * built through the public path (parseSpecText → buildStructure → buildBandProfile). The python
 * reference (two_band_kane.py) reads these profiles from print_parameters.ts, so both sides solve the
 * same band parameters; the test checks that the profiles still equal the ones in the fixture.
 * Scenarios invented for the checks.
 */
import { parseSpecText } from '../../../engine/input/load.js';
import { buildStructure, nominalVariables } from '../../../engine/structure.js';
import { buildBandProfile, type BandProfile } from '../../../engine/profile.js';
import { DEFAULT_SETTINGS } from '../../../engine/solve.js';
import type { Spec } from '../../../engine/input/schema.js';

/** A symmetric 10 nm In0.53Ga0.47As well in In0.52Al0.48As, lattice-matched on InP (common practice). */
export const INGAAS_WELL = `
substrate: InP
temperature: 300 K
stack:
  - { material: In0.52Al0.48As, thickness: 20 nm }
  - { material: In0.53Ga0.47As, thickness: 10 nm }
  - { material: In0.52Al0.48As, thickness: 20 nm }
`;

/** A symmetric 15 nm GaAs well in Al0.3Ga0.7As on GaAs: four bound electron states. */
export const GAAS_WELL = `
substrate: GaAs
temperature: 300 K
stack:
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
  - { material: GaAs, thickness: 15 nm }
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
`;

/**
 * The InGaAs well closed by walls 2 eV above its barriers (a custom material, non-parabolicity
 * 0.1/eV so that its mass stays positive 2.5 eV below its edge): the states of the 50 nm box are all
 * bound up to the wall, so sums over states can be taken over the solver's bound states.
 */
export const INGAAS_BOX = `
substrate: InP
temperature: 300 K
materials:
  Wall: { Ec: 2.66 eV, Ev: -8 eV, me: 0.1, mhh: 0.5, mlh: 0.1, lattice: 0.58687 nm, nonparabolicity: 0.1 }
stack:
  - { material: Wall, thickness: 2 nm }
  - { material: In0.52Al0.48As, thickness: 20 nm }
  - { material: In0.53Ga0.47As, thickness: 10 nm }
  - { material: In0.52Al0.48As, thickness: 20 nm }
  - { material: Wall, thickness: 2 nm }
`;

export const STRUCTURES = { ingaas_well: INGAAS_WELL, gaas_well: GAAS_WELL, ingaas_box: INGAAS_BOX } as const;
export type StructureName = keyof typeof STRUCTURES;

export const specOf = (name: StructureName): Spec => parseSpecText(STRUCTURES[name], `${name}.yaml`).spec;

/** The electron profile of a structure as the solver sees it (slices as the default settings cut them). */
export function electronProfile(name: StructureName, nonparabolic: boolean): BandProfile {
  const spec = specOf(name);
  return buildBandProfile(buildStructure(spec, nominalVariables(spec)), 'electron', { maxSlice_nm: DEFAULT_SETTINGS.slice_nm, nonparabolic });
}
