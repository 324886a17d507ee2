import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure, nominalVariables, type Structure } from '../../engine/structure.js';

export interface LayerDef {
  readonly material: string;
  readonly thickness_nm: number;
}

/** A structure on a GaAs substrate at temperature T from (material, thickness) pairs; field in kV/cm. */
export function stack(layers: readonly LayerDef[], T = 300, field = 0): Structure {
  const text = [
    'title: valence test',
    'substrate: GaAs',
    `temperature: ${T} K`,
    ...(field !== 0 ? [`field: ${field} kV/cm`] : []),
    'stack:',
    ...layers.map((l) => `  - { material: ${l.material}, thickness: ${l.thickness_nm} nm }`),
  ].join('\n');
  const spec = parseSpecText(text, 'valence-test').spec;
  return buildStructure(spec, nominalVariables(spec));
}

/** Barrier / well / barrier. */
export const well = (barrier: string, material: string, width_nm: number, barrier_nm = 40, T = 300): Structure =>
  stack([{ material: barrier, thickness_nm: barrier_nm }, { material, thickness_nm: width_nm }, { material: barrier, thickness_nm: barrier_nm }], T);

/** Prints input, got, expected, difference and tolerance when a comparison fails. */
export function expectWithin(got: number, expected: number, tolerance: number, what: string): void {
  const diff = Math.abs(got - expected);
  if (!(diff <= tolerance)) throw new Error(`${what}: got ${got}, expected ${expected}, difference ${diff.toExponential(3)} > tolerance ${tolerance}`);
}
