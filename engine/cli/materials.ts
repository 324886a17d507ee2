/** `wellsmith materials [FORMULA] [--on SUBSTRATE] [--temperature T] [--json]`. */
import { BINARIES } from '../../materials/binaries.js';
import { formatFormula, parseFormula, resolveMaterial } from '../../materials/index.js';
import type { ResolvedMaterial } from '../../materials/types.js';
import { InputError } from '../errors.js';
import { parseTemperature } from '../input/units.js';
import { MAX_TEMPERATURE_K } from '../structure.js';
import { failure, success, type Outcome } from './exit.js';
import { fixed, table, toJson } from '../text.js';

export interface MaterialsArgs { readonly formula: string | undefined; readonly on: string | undefined; readonly temperature: string; readonly json: boolean }

function describe(m: ResolvedMaterial): string {
  const rows: [string, string, string][] = [
    ['Γ gap (unstrained)', fixed(m.EgG, 4), 'eV'],
    ['X gap (unstrained)', fixed(m.EgX, 4), 'eV'],
    ['L gap (unstrained)', fixed(m.EgL, 4), 'eV'],
    ['lowest conduction valley', `${m.lowestValley} (${m.indirect ? 'indirect' : 'direct'})`, ''],
    ['spin–orbit splitting', fixed(m.Dso, 4), 'eV'],
    ['Ec (Γ, strained)', fixed(m.Ec, 4), 'eV'],
    ['Ehh (strained)', fixed(m.Ehh, 4), 'eV'],
    ['Elh (strained)', fixed(m.Elh, 4), 'eV'],
    ['Γ gap to top valence edge (strained)', fixed(m.EgStrained, 4), 'eV'],
    ['heavy/light-hole splitting Ehh − Elh', fixed((m.Ehh - m.Elh) * 1000, 2), 'meV'],
    ['electron mass', fixed(m.me, 4), 'm0'],
    ['heavy-hole mass along [001]', fixed(m.mhh_z, 4), 'm0'],
    ['light-hole mass along [001]', fixed(m.mlh_z, 4), 'm0'],
    ['heavy-hole mass in-plane', fixed(m.mhh_par, 4), 'm0'],
    ['light-hole mass in-plane', fixed(m.mlh_par, 4), 'm0'],
    ['lattice constant (relaxed)', fixed(m.a_nm, 5), 'nm'],
    ['monolayer along [001] (strained)', fixed(m.monolayer_nm, 5), 'nm'],
    ['lattice mismatch to substrate', fixed(m.mismatch * 100, 3), '%'],
    ['in-plane strain ε∥', fixed(m.strain_par * 100, 3), '%'],
    ['perpendicular strain ε⊥', fixed(m.strain_perp * 100, 3), '%'],
    ['critical thickness (Matthews–Blakeslee)', m.criticalThickness_nm === Infinity ? '∞' : fixed(m.criticalThickness_nm, 1), 'nm'],
  ];
  const head = `${m.formula} at ${m.temperature_K} K${m.substrate ? ` on ${m.substrate}` : ', unstrained'} (energies on the valence-band-offset scale of Vurgaftman, Meyer & Ram-Mohan 2001)`;
  return `${head}\n${table(['quantity', 'value', 'unit'], rows)}`;
}

export function runMaterials(args: MaterialsArgs): Outcome {
  try {
    const t = parseTemperature(args.temperature);
    if (typeof t === 'string') throw new InputError('bad-value', `--temperature: ${t}`);
    if (!(t >= 0) || t > MAX_TEMPERATURE_K) throw new InputError('bad-value', `--temperature: must lie between 0 and ${MAX_TEMPERATURE_K} K (the range of the Varshni fits), got ${args.temperature}`);
    const substrate = args.on === undefined ? null : parseFormula(args.on);
    if (args.formula === undefined) {
      const all = Object.keys(BINARIES).map((name) => resolveMaterial(parseFormula(name), { temperature_K: t, substrate }));
      if (args.json) return success(`${toJson(all)}\n`);
      const rows = all.map((m) => [m.formula, fixed(m.EgG, 4), fixed(m.EgX, 4), fixed(m.EgL, 4), m.lowestValley, fixed(m.Ec, 4), fixed(Math.max(m.Ehh, m.Elh), 4), fixed(m.me, 4), fixed(m.a_nm, 5)]);
      return success(`Binaries at ${t} K${substrate ? ` strained on ${formatFormula(substrate)}` : ''}\n${table(['material', 'Eg Γ eV', 'Eg X eV', 'Eg L eV', 'lowest', 'Ec eV', 'Ev eV', 'me m0', 'a nm'], rows)}\n`);
    }
    const m = resolveMaterial(parseFormula(args.formula), { temperature_K: t, substrate });
    return success(`${args.json ? toJson(m) : describe(m)}\n`);
  } catch (e) {
    return failure(e);
  }
}
