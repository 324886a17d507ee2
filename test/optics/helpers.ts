/** Solved stacks for the optics tests: a spec text at its nominal values, solved with wavefunctions. */
import { parseSpecText } from '../../engine/input/load.js';
import { settingsOf, solveStructure, type SolveResult } from '../../engine/solve.js';
import { buildStructure, nominalVariables } from '../../engine/structure.js';

/** Layers (material, nm) on a GaAs substrate at T, with a solver section such as "{ valence: parabolic }". */
export function solvedStack(layers: readonly (readonly [string, number])[], options: { readonly T?: number; readonly solver?: string; readonly substrate?: string } = {}): SolveResult {
  const text = [
    `substrate: ${options.substrate ?? 'GaAs'}`,
    `temperature: ${options.T ?? 300} K`,
    ...(options.solver ? [`solver: ${options.solver}`] : []),
    'stack:',
    ...layers.map(([m, t]) => `  - { material: ${m}, thickness: ${t} nm }`),
  ].join('\n');
  const spec = parseSpecText(text, 'optics-test').spec;
  return solveStructure(buildStructure(spec, nominalVariables(spec)), settingsOf(spec));
}

/** A uniform grid of n points from a to b. */
export const grid = (a: number, b: number, n: number): Float64Array => Float64Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
