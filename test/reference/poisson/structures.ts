/**
 * The doped structures of the Schrödinger–Poisson reference checks (scenarios invented for the
 * checks), their doping through the product's own functions, and the per-layer electron parameters
 * the python reference (schrodinger_poisson.py) reads from print_parameters.ts, so both sides solve
 * the same band parameters.
 *
 * The modulation-doped well: 30 nm Al0.3Ga0.7As | 10 nm Al0.3Ga0.7As with donors | 8 nm GaAs |
 * 10 nm doped Al0.3Ga0.7As | 30 nm Al0.3Ga0.7As, each doped layer holding half the sheet density.
 * The detector well: 4.5 nm GaAs doped 1e18 cm⁻³ between 30 nm Al0.3Ga0.7As barriers (e2 just below
 * the barrier edge).
 */
import { parseSpecText } from '../../../engine/input/load.js';
import { buildStructure, type Structure } from '../../../engine/structure.js';
import { buildBandProfile } from '../../../engine/profile.js';
import { resolveDoping, type DopingProfile } from '../../../engine/poisson/doping.js';

const modulationSpec = (T: number): string => `
substrate: GaAs
temperature: ${T} K
stack:
  - { material: Al0.3Ga0.7As, thickness: 30 nm }
  - { material: Al0.3Ga0.7As, thickness: 10 nm, label: doped }
  - { material: GaAs, thickness: 8 nm, label: well }
  - { material: Al0.3Ga0.7As, thickness: 10 nm, label: doped }
  - { material: Al0.3Ga0.7As, thickness: 30 nm }
`;

const detectorSpec = `
substrate: GaAs
temperature: 77 K
stack:
  - { material: Al0.3Ga0.7As, thickness: 30 nm }
  - { material: GaAs, thickness: 4.5 nm, label: well }
  - { material: Al0.3Ga0.7As, thickness: 30 nm }
`;

export interface ReferenceCase {
  readonly name: string;
  readonly structure: Structure;
  readonly doping: DopingProfile;
  /** Centre of the well (nm from the stack's start), where the band bending is compared. */
  readonly wellCentre_nm: number;
}

/** The modulation-doped well at temperature T (K) with a total sheet density ns (cm⁻²). */
export function modulationCase(T: number, ns: number): ReferenceCase {
  const structure = buildStructure(parseSpecText(modulationSpec(T), 'modulation.yaml').spec, {});
  const half = { donors: `${ns / 2 / 10e-7} cm-3` };
  return { name: `modulation_${T}K_${ns.toExponential(0)}`, structure, doping: resolveDoping({ layers: [undefined, half, undefined, half, undefined] }, structure), wellCentre_nm: 44 };
}

/** The detector well of runs/ style: 4.5 nm GaAs doped 1e18 cm⁻³ at 77 K. */
export function detectorCase(): ReferenceCase {
  const structure = buildStructure(parseSpecText(detectorSpec, 'detector.yaml').spec, {});
  return { name: 'detector_77K', structure, doping: resolveDoping({ layers: [undefined, { donors: '1e18 cm-3' }, undefined] }, structure), wellCentre_nm: 32.25 };
}

export const REFERENCE_CASES = (): ReferenceCase[] => [modulationCase(77, 5e11), modulationCase(77, 1e12), modulationCase(300, 5e11), modulationCase(300, 1e12), detectorCase()];

/** Per layer: thickness, electron edge, mass, two-band α, in-plane mass, static permittivity, donors (nm⁻³); and the outer regions. */
export function parametersOf(c: ReferenceCase): Record<string, unknown> {
  const p = buildBandProfile(c.structure, 'electron', { maxSlice_nm: 1e6, nonparabolic: true });
  const donors = c.structure.layers.map((_, i) => c.doping.segments.filter((s) => s.layer === i).reduce((a, s) => a + s.density_nm3, 0));
  const region = (r: { V: number; mass: number; alpha: number; massInPlane: number }): Record<string, number> => ({ V: r.V, mass: r.mass, alpha: r.alpha, massInPlane: r.massInPlane });
  return {
    temperature_K: c.structure.temperature_K,
    well_centre_nm: c.wellCentre_nm,
    layers: p.slices.map((s, i) => ({ width_nm: s.width_nm, ...region(s), permittivity: c.structure.layers[i]!.permittivity, donors_nm3: donors[i] })),
    left: region(p.left),
    right: region(p.right),
  };
}
