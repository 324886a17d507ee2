/**
 * The forward model of a doped stack: spec -> Structure -> self-consistent Schrödinger–Poisson
 * solve (selfconsistent.ts) -> the ordinary solve of the folded structure (engine/solve.ts: every
 * band's states, transitions, DOS, resonances under bias) -> intersubband absorption
 * (absorption.ts), at each bias of the spec (bias.ts). `solveDoped` is the library entry point for
 * a spec with doping; `solveDopedStructure` is what a design search evaluates.
 */
import { InputError } from '../errors.js';
import { settingsOf, solveStructure, type SolveOptions, type SolveResult, type SolverSettings } from '../solve.js';
import type { Spec } from '../input/schema.js';
import { KV_PER_CM_TO_EV_PER_NM } from '../profile.js';
import { parseEnergy, parseLength } from '../input/units.js';
import { buildStructure, nominalVariables, type Structure } from '../structure.js';
import { continuumFor, DEFAULT_ABSORPTION, intersubbandAbsorption, type AbsorptionOptions, type AbsorptionResult } from './absorption.js';
import { atBias, biasPoints, fieldPoint, type BiasPoint } from './bias.js';
import { dopingOfSpec, dopingSection, type DopingProfile } from './doping.js';
import { DEFAULT_MESH_NM } from './poisson.js';
import { absorptionSchema } from './schema.js';
import { DEFAULT_SELF_CONSISTENT, selfConsistent, type Cell, type CarrierKind, type SelfConsistentOptions, type SelfConsistentState } from './selfconsistent.js';
import { potentialProfile } from './subbands.js';

/** The boundary conditions of the Poisson step, as every result states them. */
export const BOUNDARY_CONDITIONS = 'no field and U = 0 at the first layer\'s start; the stack is neutral, so no field at its end either (field-free, neutral contacts); an applied bias is the uniform field of the structure, the contacts flat';

/** How a doped stack is solved: the self-consistent loop's settings, and the absorption's (null: not computed). */
export interface DopedOptions {
  readonly selfConsistent: SelfConsistentOptions;
  readonly absorption: AbsorptionOptions | null;
}

/** A subband of the self-consistent solve with its label and sheet density. */
export interface DopedSubband {
  readonly label: string;
  readonly energy_eV: number;
  readonly mass_inplane: number;
  readonly density_cm2: number;
}

/** What the self-consistent step reached, with the potential along z. */
export interface SelfConsistency {
  readonly status: SelfConsistentState['status'];
  readonly iterations: number;
  readonly residual_eV: number;
  readonly tolerance_eV: number;
  readonly maxIterations: number;
  readonly mixing: number;
  readonly mesh_nm: number;
  readonly continuum: boolean;
  readonly boundary: string;
  readonly carriers: CarrierKind;
  /** Fermi level (eV, absolute), of the first cell when under bias the wells have their own. */
  readonly fermi_eV: number;
  readonly cells: readonly Cell[];
  readonly subbands: readonly DopedSubband[];
  /** Carriers of the semiclassical gas above the barrier edge (cm⁻²). */
  readonly gas_cm2: number;
  /** |net charge| / |net doping| of the solved stack. */
  readonly neutrality: number;
  readonly doping: { readonly donors_cm2: number; readonly acceptors_cm2: number; readonly net_cm2: number };
  /** Along z at the mesh nodes: U = −eφ (eV) and the majority band's edge with U and the bias (eV, absolute). */
  readonly profile: { readonly z_nm: readonly number[]; readonly potential_eV: readonly number[]; readonly band_eV: readonly number[] };
}

/** A solve of a doped stack: the folded structure's solve plus the self-consistency, the bias and the absorption. */
export interface DopedSolveResult extends Omit<SolveResult, 'status'> {
  /** 'not-converged': the self-consistent loop stopped at doping.max_iterations (exit 1); the rest as SolveResult. */
  readonly status: SolveResult['status'] | 'not-converged';
  readonly selfConsistent: SelfConsistency;
  readonly bias: BiasPoint;
  /** Electron intersubband absorption (n-type stacks, when asked). */
  readonly absorption?: AbsorptionResult;
}

/** One bias point of a sweep, as `solve` reports it. */
export interface BiasSummary {
  readonly bias: BiasPoint;
  readonly status: DopedSolveResult['status'];
  readonly message: string;
  readonly selfConsistent: SelfConsistency;
  readonly states: readonly { readonly label: string; readonly energy_eV: number; readonly bound: boolean; readonly width_meV: number }[];
  readonly absorption?: Pick<AbsorptionResult, 'status' | 'peak_eV' | 'peak_um' | 'peak_absorption' | 'fwhm_meV' | 'fwhm_um'>;
}

/** A doped spec's solve at its first bias, with every bias point summarised when it lists more than one. */
export interface DopedSpecResult extends DopedSolveResult {
  readonly sweep?: readonly BiasSummary[];
}

const lengthOf = (raw: string | number | undefined, fallback: number, field: string): number => {
  if (raw === undefined) return fallback;
  const l = parseLength(raw);
  if (typeof l === 'string' || 'ml' in l || !(l.nm >= 0)) throw new InputError('bad-value', `${field}: expected a length in nm or Å, got ${JSON.stringify(raw)}`, field);
  return l.nm;
};
const energyOf = (raw: string | number | undefined, fallback: number, field: string): number => {
  if (raw === undefined) return fallback;
  const e = parseEnergy(raw);
  if (typeof e === 'string' || !(e > 0)) throw new InputError('bad-value', `${field}: expected a positive energy such as "8 meV", got ${JSON.stringify(raw)}`, field);
  return e;
};

/** A spec's doped-solve settings: `doping:` (self-consistency) and `absorption:` over the defaults, with the solver's non-parabolicity. */
export function dopedOptionsOf(spec: Spec, settings: SolverSettings = settingsOf(spec)): DopedOptions {
  const d = dopingSection(spec);
  const mesh = lengthOf(d.mesh, DEFAULT_MESH_NM, 'doping.mesh');
  if (!(mesh > 0)) throw new InputError('bad-value', `doping.mesh: must be positive, got ${JSON.stringify(d.mesh)}`, 'doping.mesh');
  const selfConsistent: SelfConsistentOptions = {
    mesh_nm: mesh,
    tolerance_eV: energyOf(d.tolerance, DEFAULT_SELF_CONSISTENT.tolerance_eV, 'doping.tolerance'),
    maxIterations: d.max_iterations ?? DEFAULT_SELF_CONSISTENT.maxIterations,
    mixing: d.mixing ?? DEFAULT_SELF_CONSISTENT.mixing,
    continuum: d.continuum ?? DEFAULT_SELF_CONSISTENT.continuum,
    nonparabolic: settings.nonparabolic,
  };
  const raw = (spec as Record<string, unknown>).absorption;
  const parsed = absorptionSchema.safeParse(raw ?? {});
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const field = ['absorption', ...issue.path.map(String)].join('.');
    throw new InputError('schema', `${field}: ${issue.code === 'unrecognized_keys' ? `unknown key "${issue.keys[0]}"` : issue.message}`, field);
  }
  const a = parsed.data;
  const linewidth = energyOf(a.linewidth, DEFAULT_ABSORPTION.linewidth_eV, 'absorption.linewidth');
  return {
    selfConsistent,
    absorption: {
      linewidth_eV: linewidth,
      coupling: a.coupling ?? DEFAULT_ABSORPTION.coupling,
      refractiveIndex: a.refractive_index ?? DEFAULT_ABSORPTION.refractiveIndex,
      continuum_nm: lengthOf(a.continuum, continuumFor(linewidth), 'absorption.continuum'),
      range_eV: energyOf(a.range, DEFAULT_ABSORPTION.range_eV, 'absorption.range'),
      depolarisation: a.depolarisation ?? DEFAULT_ABSORPTION.depolarisation,
    },
  };
}

const PREFIX = { electron: 'e', heavy_hole: 'hh', light_hole: 'lh' } as const;

/** Labels of the loop's subbands in energy order per band (e1, e2…; hh1…; lh1…), as the solve labels them. */
function labelled(sc: SelfConsistentState): DopedSubband[] {
  const seen: Record<string, number> = {};
  return sc.subbands.map((s) => {
    seen[s.band] = (seen[s.band] ?? 0) + 1;
    return { label: `${PREFIX[s.band]}${seen[s.band]}`, energy_eV: s.energy_eV, mass_inplane: s.mass_inplane, density_cm2: s.density_cm2 };
  });
}

/** The self-consistency summary of a loop state. */
function summary(sc: SelfConsistentState, doping: DopingProfile): SelfConsistency {
  const o = sc.options;
  const z = Array.from(sc.mesh.z);
  const slope = sc.folded.field_kV_per_cm * KV_PER_CM_TO_EV_PER_NM;
  const zc = sc.folded.total_nm / 2;
  // The majority band's edge at each node: the layer to the node's right (the last node: its left).
  const band: number[] = [];
  sc.folded.layers.forEach((layer, l) => {
    const n = sc.mesh.perLayer[l]!;
    const count = l === sc.folded.layers.length - 1 ? n + 1 : n;
    for (let j = 0; j < count; j++) {
      const b = layer.bands[j]!;
      band.push((sc.carriers === 'holes' ? Math.max(b.Ehh, b.Elh) : b.Ec) + slope * (z[band.length]! - zc));
    }
  });
  return {
    status: sc.status, iterations: sc.iterations, residual_eV: sc.residual_eV, tolerance_eV: o.tolerance_eV, maxIterations: o.maxIterations,
    mixing: o.mixing, mesh_nm: o.mesh_nm, continuum: o.continuum, boundary: BOUNDARY_CONDITIONS, carriers: sc.carriers,
    fermi_eV: sc.cells[0]!.fermi_eV, cells: sc.cells, subbands: labelled(sc), gas_cm2: sc.gas_cm2, neutrality: sc.neutrality,
    doping: { donors_cm2: doping.donors_cm2, acceptors_cm2: doping.acceptors_cm2, net_cm2: doping.net_cm2 },
    profile: { z_nm: z, potential_eV: Array.from(sc.potential), band_eV: band },
  };
}

/**
 * Solves a doped structure at its own field (the bias): the self-consistent loop, then solveStructure
 * on the folded structure (so the solve's states, transitions and wavefunctions are those of the
 * self-consistent potential), then the absorption when options.absorption is set and the carriers
 * are electrons. The result's `structure` is the folded one (its band edges include U).
 */
export function solveDopedStructure(structure: Structure, doping: DopingProfile, settings: SolverSettings, options: DopedOptions, solveOptions: SolveOptions = {}): DopedSolveResult {
  const sc = selfConsistent(structure, doping, options.selfConsistent);
  const solved = solveStructure(sc.folded, settings, solveOptions);
  const consistency = summary(sc, doping);
  const bias = fieldPoint(structure.field_kV_per_cm, structure.total_nm);
  const base = { ...solved, selfConsistent: consistency, bias };
  if (sc.status === 'not-converged') {
    return { ...base, status: 'not-converged', message: `self-consistency not reached in ${sc.iterations} iterations: the potential still changed by ${sc.residual_eV.toExponential(2)} eV, above the tolerance ${sc.options.tolerance_eV.toExponential(1)} eV; raise doping.max_iterations or lower doping.mixing` };
  }
  if (sc.status === 'no-carriers') {
    return { ...base, status: 'no-bound-state', message: `the ${sc.carriers} of the doping have no bound state and the continuum is turned off (doping.continuum: false); nothing can hold them` };
  }
  if (options.absorption === null || sc.carriers !== 'electrons') return base;
  const absorption = intersubbandAbsorption({
    profile: potentialProfile(structure, sc.mesh, sc.potential, 'electron', 1, sc.options.nonparabolic),
    mesh: sc.mesh, temperature_K: structure.temperature_K, cellOfNode: sc.cellOfNode, fermi: sc.cells.map((c) => c.fermi_eV),
  }, options.absorption);
  return { ...base, absorption };
}

/** The compact record of one bias point. */
export const biasSummary = (r: DopedSolveResult): BiasSummary => ({
  bias: r.bias, status: r.status, message: r.message, selfConsistent: r.selfConsistent,
  states: Object.values(r.bands).flatMap((b) => b.states.map((s) => ({ label: s.label, energy_eV: s.energy_eV, bound: s.bound, width_meV: s.width_meV }))),
  ...(r.absorption ? { absorption: { status: r.absorption.status, peak_eV: r.absorption.peak_eV, peak_um: r.absorption.peak_um, peak_absorption: r.absorption.peak_absorption, fwhm_meV: r.absorption.fwhm_meV, fwhm_um: r.absorption.fwhm_um } } : {}),
});

/**
 * Library entry point for a doped layer stack: the solve at the spec's first bias (or its field),
 * and when `bias:` lists several, every point summarised in `sweep` (the first included).
 * Throws InputError when the spec dopes nothing (use solve), describes a wire, or has bad doping keys.
 */
export function solveDoped(spec: Spec, values: Readonly<Record<string, number>> = nominalVariables(spec)): DopedSpecResult {
  if (spec.wire !== undefined) throw new InputError('bad-value', 'doping: doped structures are solved as layer stacks; a wire takes no doping', 'doping');
  const structure = buildStructure(spec, values);
  const doping = dopingOfSpec(spec, structure);
  if (!doping) throw new InputError('bad-value', 'doping: the spec dopes no layer and gives no background; add "doping:" to a layer, or solve it as an undoped stack', 'doping');
  const settings = settingsOf(spec);
  const options = dopedOptionsOf(spec, settings);
  const points = biasPoints(spec, structure);
  const results = points.map((p) => solveDopedStructure(atBias(structure, p), doping, settings, options));
  const first = results[0]!;
  return points.length > 1 ? { ...first, sweep: results.map(biasSummary) } : first;
}
