/** `wellsmith solve SPEC`: states, transitions and 2-D DOS steps of a fixed structure. */
import { loadSpecFile } from '../input/load.js';
import { solve, BANDS, type SolveResult } from '../solve.js';
import { describeModels, expandStack, nominalVariables, type Structure } from '../structure.js';
import { stateRegions, stateWells, type StateRegion } from '../../objectives/wells.js';
import { noteLongWork, progressShown } from './progress.js';
import { describeOffsetRule, INTERFACE_HEADER, interfaceRow } from '../lineup.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { fixed, inUnit, table, toJson, withUnit } from '../text.js';
import { describeWire, wireJson } from '../wire/describe.js';
import { solveWire } from '../wire/solve.js';
import { hasDoping } from '../poisson/doping.js';
import { solveDoped } from '../poisson/doped.js';
import { describeDoped } from '../poisson/format.js';
import { describeOptics } from '../optics/describe.js';

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

/** Interband lines weaker than this are left out of the human table. */
const WEAK_OVERLAP2 = 0.01;

/** Where each state lives (objectives/wells.ts stateRegions), as a lookup "e2" -> region; empty when unknown. */
function regionLookup(r: SolveResult): Map<string, StateRegion> {
  const regions = stateRegions(r);
  return new Map(regions ? BANDS.flatMap((b) => regions[b].map((x) => [x.state, x.region] as const)) : []);
}

/** The states table of one region: band, state, energies, and (several wells) the well each lives in. */
function statesTable(r: SolveResult, labels: ReadonlySet<string>): string {
  const wells = stateWells(r);
  const home = new Map(wells ? BANDS.flatMap((b) => wells[b].map((w) => [w.state, w.well] as const)) : []);
  const rows = BANDS.flatMap((b) => r.bands[b].states.filter((s) => labels.has(s.label)).map((s) => [b.replace('_', ' '), s.label, ...(wells ? [home.get(s.label) ?? '–'] : []),
    inUnit(s.energy_eV, 'eV'), inUnit(s.confinement_meV, 'meV'), s.bound ? 'yes' : 'quasi', s.bound ? '–' : inUnit(s.width_meV, 'meV'), inUnit(s.mass_inplane, 'm0')]));
  return table(['band', 'state', ...(wells ? ['well'] : []), 'energy eV', 'confinement meV', 'bound', 'Γ meV', 'm∥ m0'], rows);
}

const interbandTable = (lines: readonly SolveResult['transitions'][number][]): string =>
  table(['transition', 'energy eV', 'wavelength nm', 'overlap²', 'E_b meV'], lines.map((t) => [t.label, inUnit(t.energy_eV, 'eV'), inUnit(t.wavelength_nm, 'nm'), inUnit(t.overlap2, ''), inUnit((t.exciton_binding_eV ?? NaN) * 1000, 'meV')]));

export function describeSolve(r: SolveResult): string {
  const out: string[] = [];
  if (r.structure.title) out.push(r.structure.title, '');
  out.push(describeStructure(r.structure), '');
  const region = regionLookup(r);
  const all = BANDS.flatMap((b) => r.bands[b].states.map((s) => s.label));
  const guide = new Set(all.filter((l) => region.get(l) === 'guide'));
  const own = new Set(all.filter((l) => !guide.has(l)));
  const quasi = BANDS.some((b) => r.bands[b].states.some((s) => !s.bound));
  out.push(`States${guide.size ? ' of the wells' : ''} (energies on the absolute scale; confinement from the band extremum${quasi ? '; quasi-bound states are resonances of the well under the field, Γ their width (FWHM), lifetime ħ/Γ' : ''})`, statesTable(r, own), '');
  if (guide.size) out.push('States of the guiding and cladding layers (above the wells\' barriers, spread over the layers around them: a waveguide\'s states, not the wells\')', statesTable(r, guide), '');
  // The table keeps the lines a designer reads; --json lists every pair.
  const inter = r.transitions.filter((t) => t.kind === 'interband');
  const strong = inter.filter((t) => t.overlap2 >= WEAK_OVERLAP2);
  const hidden = inter.length - strong.length;
  const ofWells = (t: SolveResult['transitions'][number]): boolean => t.label.split('-').every((l) => own.has(l));
  if (inter.length > 0) {
    out.push(`Interband transitions${guide.size ? ' between well states' : ''} (overlap² ≥ ${WEAK_OVERLAP2}${hidden ? `; ${hidden} weaker ones in --json` : ''}; E_b: exciton binding estimate, the exciton line lies E_b below)`, interbandTable(strong.filter(ofWells)), '');
    const others = strong.filter((t) => !ofWells(t));
    if (others.length) out.push('Interband transitions involving guiding/cladding-layer states (overlap² ≥ 0.01)', interbandTable(others), '');
  }
  const isb = r.transitions.filter((t) => t.kind === 'intersubband' && t.label.startsWith('e1-'));
  if (isb.length > 0) out.push('Intersubband transitions from e1 (all pairs in --json)', table(['transition', 'energy meV', 'wavelength µm', 'wavenumber cm⁻¹', 'dipole nm', 'osc. strength'], isb.map((t) => [t.label, inUnit(t.energy_eV * 1000, 'meV'), inUnit(t.wavelength_nm / 1000, 'µm'), inUnit(t.wavenumber_per_cm, 'cm⁻¹'), fixed(t.dipole_nm, 4), inUnit(t.oscillator_strength, '')])), '');
  const dosRows = BANDS.flatMap((b) => r.dos.bands[b].map((d) => [d.label, inUnit(d.edge_eV, 'eV'), inUnit(d.mass_inplane, 'm0'), inUnit(d.step_per_cm2_per_eV, 'cm⁻² eV⁻¹')]));
  out.push(`2-D density of states: one step per subband (${r.dos.unit})`, table(['subband', 'edge eV', 'm∥ m0', 'step cm⁻² eV⁻¹'], dosRows));
  if (r.carriers) {
    const c = r.carriers;
    out.push('', `Injected carriers n = p = ${withUnit(c.sheet_density_cm2, 'cm⁻²')} at ${c.temperature_K} K: quasi-Fermi levels ${inUnit(c.electron_quasi_fermi_eV, 'eV')} eV (electrons), ${inUnit(c.hole_quasi_fermi_eV, 'eV')} eV (holes), separation ${inUnit(c.separation_eV, 'eV')} eV — ${c.inversion ? 'above' : 'below'} the band-edge transition (${c.inversion ? 'gain possible' : 'no inversion'}); ${c.note}`);
  }
  if (r.optics) out.push('', describeOptics(r.optics));
  if (r.limits) out.push('', ...r.limits.map((l) => `limited: ${l}`));
  if (r.status !== 'ok') out.push('', `status: ${r.status}: ${r.message}`);
  return out.join('\n');
}

/** Stacks with more layers than this get a note that their solve takes minutes (see MAX_LAYERS: 1000 layers took 36 s, 2000 about 2 min). */
const LONG_STACK_LAYERS = 1500;

export function runSolve(args: SolveArgs): Outcome {
  let locate: ((f: string) => number | undefined) | undefined;
  const bar = progressShown('solve');
  try {
    const loaded = loadSpecFile(args.spec);
    locate = loaded.locate;
    const warnings = loaded.warnings;
    if (loaded.spec.wire !== undefined) {
      const wire = solveWire(loaded.spec, nominalVariables(loaded.spec), { onProgress: (done, total, what) => bar.update(done, total, what) });
      bar.stop();
      return success(`${args.json ? toJson({ ...(wireJson(wire, args.maps ?? false) as object), warnings }) : describeWire(wire)}\n`, wire.status === 'ok' ? EXIT.ok : EXIT.physics, warnings);
    }
    if (hasDoping(loaded.spec)) {
      const doped = solveDoped(loaded.spec);
      bar.stop();
      return success(`${args.json ? toJson({ ...(solveJson(doped, args.wavefunctions) as object), warnings }) : `${describeSolve(doped)}\n${describeDoped(doped)}`}\n`, doped.status === 'ok' ? EXIT.ok : EXIT.physics, warnings);
    }
    const layers = expandStack(loaded.spec).length;
    noteLongWork(`solving ${layers} layers`, layers > LONG_STACK_LAYERS ? 119 * (layers / 2000) ** 1.2 : 0, '2000 layers took about 2 min on a 2-core machine');
    const result = solve(loaded.spec, nominalVariables(loaded.spec), { onProgress: (done, total, what) => bar.update(done, total, what) });
    bar.stop();
    return success(`${args.json ? toJson({ ...(solveJson(result, args.wavefunctions) as object), state_regions: stateRegions(result), warnings }) : describeSolve(result)}\n`, result.status === 'ok' ? EXIT.ok : EXIT.physics, warnings);
  } catch (e) {
    bar.stop();
    return failure(e, locate);
  }
}
