/**
 * Prints the non-parabolic electron profiles of the reference structures (structures.ts) as JSON,
 * the input of the python reference: node --import tsx print_parameters.ts | python3 two_band_kane.py
 */
import { STRUCTURES, electronProfile, type StructureName } from './structures.js';

const out: Record<string, unknown> = {};
for (const name of Object.keys(STRUCTURES) as StructureName[]) {
  const p = electronProfile(name, true);
  const region = (r: { V: number; mass: number; alpha: number }): { V: number; mass: number; alpha: number } => ({ V: r.V, mass: r.mass, alpha: r.alpha });
  out[name] = { slices: p.slices.map((s) => ({ width_nm: s.width_nm, ...region(s) })), left: region(p.left), right: region(p.right) };
}
process.stdout.write(`${JSON.stringify(out, null, 1)}\n`);
