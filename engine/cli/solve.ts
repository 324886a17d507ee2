/** `wellsmith solve SPEC`: states, transitions and 2-D DOS steps of a fixed structure. */
import { loadSpecFile } from '../spec/load.js';
import { solve, BANDS, type SolveResult } from '../solve.js';
import { describeModels, type Structure } from '../structure.js';
import { describeOffsetRule, type InterfaceOffset } from '../lineup.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { fixed, sig, table, toJson } from './format.js';
import { describeWire, wireJson } from '../wire/describe.js';
import { solveWire } from '../wire/solve.js';

export interface SolveArgs {
  readonly spec: string; readonly json: boolean; readonly wavefunctions: boolean;
  /** Wire specs: include the cross-section grid, the |ψ|² maps and the sampled 1-D DOS in --json. */
  readonly maps?: boolean;
}

/** The machine-readable form: everything but the sampled wavefunctions unless asked. */
export function solveJson(r: SolveResult, withWavefunctions: boolean): unknown {
  const { wavefunctions, ...rest } = r;
  return withWavefunctions ? r : rest;
}

export function describeStructure(s: Structure): string {
  const head = `T = ${s.temperature_K} K · substrate ${s.substrate ?? 'none (unstrained)'} · field ${s.field_kV_per_cm} kV/cm\noffsets: ${describeOffsetRule(s.offsetRule)}\nmodels: ${describeModels(s.models)}`;
  const rows = s.layers.map((l) => {
    const b = l.bands[Math.floor(l.bands.length / 2)]!;
    return [String(l.index + 1), l.label, l.formula, fixed(l.thickness_nm, 3), fixed(l.monolayers, 2), fixed(b.Ec, 4), fixed(b.Ehh, 4), fixed(b.Elh, 4),
      fixed(l.material.strain_par * 100, 3), l.material.criticalThickness_nm === Infinity ? '∞' : fixed(l.material.criticalThickness_nm, 1)];
  });
  const layers = table(['#', 'layer', 'material', 'thickness nm', 'ML', 'Ec eV', 'Ehh eV', 'Elh eV', 'ε∥ %', 'h_c nm'], rows);
  if (s.interfaces.length === 0) return `${head}\n${layers}`;
  return `${head}\n${layers}\n\nInterfaces (strained edges, upper layer minus lower; Qc = ΔEc/ΔEg of the strained gaps)\n${table(INTERFACE_HEADER, s.interfaces.map(interfaceRow))}`;
}

export const INTERFACE_HEADER = ['layers', 'ΔEc meV', 'ΔEhh meV', 'ΔElh meV', 'ΔEg meV', 'Qc', 'hh', 'lh'];

/** One interface as table cells (shared by the terminal table and the report). */
export const interfaceRow = (i: InterfaceOffset): string[] => [`${i.left + 1}|${i.right + 1}`, fixed(i.dEc_meV, 1), fixed(i.dEhh_meV, 1), fixed(i.dElh_meV, 1), fixed(i.dEg_meV, 1),
  i.conduction_share === null ? '–' : fixed(i.conduction_share, 3), `type ${i.heavy_hole_type}`, `type ${i.light_hole_type}`];

/** Interband lines weaker than this are left out of the human table. */
const WEAK_OVERLAP2 = 0.01;

export function describeSolve(r: SolveResult): string {
  const out: string[] = [];
  if (r.structure.title) out.push(r.structure.title, '');
  out.push(describeStructure(r.structure), '');
  const stateRows = BANDS.flatMap((b) => r.bands[b].states.map((s) => [b.replace('_', ' '), s.label, fixed(s.energy_eV, 5), fixed(s.confinement_meV, 2), s.bound ? 'yes' : 'quasi', s.bound ? '–' : sig(s.width_meV, 3), fixed(s.mass_inplane, 4)]));
  const quasi = BANDS.some((b) => r.bands[b].states.some((s) => !s.bound));
  out.push(`States (energies on the absolute scale; confinement from the band extremum${quasi ? '; quasi-bound states are resonances of the well under the field, Γ their width (FWHM), lifetime ħ/Γ' : ''})`, table(['band', 'state', 'energy eV', 'confinement meV', 'bound', 'Γ meV', 'm∥ m0'], stateRows), '');
  // The table keeps the lines a designer reads; --json lists every pair.
  const inter = r.transitions.filter((t) => t.kind === 'interband');
  const strong = inter.filter((t) => t.overlap2 >= WEAK_OVERLAP2);
  const hidden = inter.length - strong.length;
  if (inter.length > 0) out.push(`Interband transitions (overlap² ≥ ${WEAK_OVERLAP2}${hidden ? `; ${hidden} weaker ones in --json` : ''}; E_b: exciton binding estimate, the exciton line lies E_b below)`, table(['transition', 'energy eV', 'wavelength nm', 'overlap²', 'E_b meV'], strong.map((t) => [t.label, fixed(t.energy_eV, 5), fixed(t.wavelength_nm, 2), fixed(t.overlap2, 4), fixed((t.exciton_binding_eV ?? NaN) * 1000, 2)])), '');
  const isb = r.transitions.filter((t) => t.kind === 'intersubband' && t.label.startsWith('e1-'));
  if (isb.length > 0) out.push('Intersubband transitions from e1 (all pairs in --json)', table(['transition', 'energy meV', 'wavelength µm', 'wavenumber cm⁻¹', 'dipole nm', 'osc. strength'], isb.map((t) => [t.label, fixed(t.energy_eV * 1000, 2), fixed(t.wavelength_nm / 1000, 3), fixed(t.wavenumber_per_cm, 1), fixed(t.dipole_nm, 4), fixed(t.oscillator_strength, 4)])), '');
  const dosRows = BANDS.flatMap((b) => r.dos.bands[b].map((d) => [d.label, fixed(d.edge_eV, 5), fixed(d.mass_inplane, 4), sig(d.step_per_cm2_per_eV, 4)]));
  out.push(`2-D density of states: one step per subband (${r.dos.unit})`, table(['subband', 'edge eV', 'm∥ m0', 'step cm⁻² eV⁻¹'], dosRows));
  if (r.carriers) {
    const c = r.carriers;
    out.push('', `Injected carriers n = p = ${sig(c.sheet_density_cm2, 3)} cm⁻² at ${c.temperature_K} K: quasi-Fermi levels ${fixed(c.electron_quasi_fermi_eV, 4)} eV (electrons), ${fixed(c.hole_quasi_fermi_eV, 4)} eV (holes), separation ${fixed(c.separation_eV, 4)} eV — ${c.inversion ? 'above' : 'below'} the band-edge transition (${c.inversion ? 'gain possible' : 'no inversion'}); ${c.note}`);
  }
  if (r.status !== 'ok') out.push('', `status: ${r.status}: ${r.message}`);
  return out.join('\n');
}

export function runSolve(args: SolveArgs): Outcome {
  let locate: ((f: string) => number | undefined) | undefined;
  try {
    const loaded = loadSpecFile(args.spec);
    locate = loaded.locate;
    if (loaded.spec.wire !== undefined) {
      const wire = solveWire(loaded.spec);
      return success(`${args.json ? toJson(wireJson(wire, args.maps ?? false)) : describeWire(wire)}\n`, wire.status === 'ok' ? EXIT.ok : EXIT.physics);
    }
    const result = solve(loaded.spec);
    return success(`${args.json ? toJson(solveJson(result, args.wavefunctions)) : describeSolve(result)}\n`, result.status === 'ok' ? EXIT.ok : EXIT.physics);
  } catch (e) {
    return failure(e, locate);
  }
}
