/**
 * A design problem: the spec's free variables and compiled targets, and the evaluation of one
 * candidate (variable values -> structure -> solve -> scored targets). A spec with a `wire:`
 * section is solved as a wire cross-section, on coarse search settings (see searchWireSettings).
 * Numerical trouble in one candidate makes that candidate infeasible (loss +Infinity) and is
 * counted; it never stops a search.
 */
import { InputError } from '../errors.js';
import { compileTargets, scoreTargets, needsWavefunctions, statesNeeded, type CompiledTarget, type Scored } from '../../objectives/index.js';
import type { Geometry } from '../../objectives/types.js';
import type { BandName } from '../profile.js';
import { BANDS, DEFAULT_STATE_LIMIT, solveStructure, settingsOf, type SolveResult, type SolverSettings } from '../solve.js';
import { buildStructure, variablesOf, type VariableInfo } from '../structure.js';
import type { Spec } from '../input/schema.js';
import { buildWireStructure, type WireSettings } from '../wire/structure.js';
import { solveWire, solveWireStructure, type WireSolveResult } from '../wire/solve.js';
import { bandOfLabel } from '../solve.js';
import { hasDoping, dopingOfSpec } from '../poisson/doping.js';
import { dopedOptionsOf, solveDopedStructure, type DopedOptions, type DopedSolveResult } from '../poisson/doped.js';
import { atBias, biasPoints } from '../poisson/bias.js';
import { INTERSUBBAND_ABSORPTION_KINDS } from '../../objectives/absorption-common.js';
import { compilePreferences, preferencesNeedWavefunctions, preferenceStates, preferenceValues, searchScore, type Preference } from './preferences.js';

export interface DesignProblem {
  readonly spec: Spec;
  readonly geometry: Geometry;
  readonly variables: readonly VariableInfo[];
  readonly targets: readonly CompiledTarget[];
  readonly settings: SolverSettings;
  /** Whether targets read overlaps or oscillator strengths (wavefunctions are then sampled during the search). */
  readonly wavefunctions: boolean;
  /** States per band the targets and preferences read (absent band: all). */
  readonly states: Partial<Record<BandName, number>>;
  /** Secondary objectives once the targets are met (spec `prefer:`). */
  readonly preferences: readonly Preference[];
  /** A doped stack's self-consistent settings (engine/poisson/doped.ts); its absorption is computed in the search only when a target reads it. */
  readonly doped?: { readonly options: DopedOptions; readonly absorptionInSearch: boolean };
}

/** A solve of either geometry; objectives read the part they share (objectives/types.ts TargetSource). */
export type DesignSolve = SolveResult | WireSolveResult | DopedSolveResult;

/** Whether a design's solve is of a wire (only a wire result carries |ψ|² maps). */
export const isWireSolve = (r: DesignSolve): r is WireSolveResult => 'maps' in r;

/**
 * Coarsest grid (nm) and loosest edge tolerance (eV) of a wire solve inside a search. Measured on
 * the GaAs/Al0.3Ga0.7As rectangle of runs/wire-spacing.yaml (Node 20, one thread): 1 nm / 2 meV
 * with the two electron and one heavy-hole subbands its targets read takes about 0.1 s per
 * candidate, against about 0.45 s for the spec's own 0.5 nm / 0.5 meV with 3 subbands per band,
 * and moves e1–e2 at 10 × 6 nm by 0.03 meV. The ranked designs are re-solved with the spec's
 * own settings, and re-ranked on that solve.
 */
export const SEARCH_WIRE_GRID_NM = 1;
export const SEARCH_WIRE_TOLERANCE_EV = 2e-3;

/** The spec's wire settings made no finer than the search's. */
export const searchWireSettings = (s: WireSettings): WireSettings =>
  ({ ...s, grid_nm: Math.max(s.grid_nm, SEARCH_WIRE_GRID_NM), tolerance_eV: Math.max(s.tolerance_eV, SEARCH_WIRE_TOLERANCE_EV) });

export function prepareDesign(spec: Spec): DesignProblem {
  const variables = variablesOf(spec);
  if (variables.length === 0) throw new InputError('bad-value', 'vary: a design needs at least one free variable with bounds, e.g. vary: { w: { from: 4 nm, to: 10 nm } }', 'vary');
  const geometry: Geometry = spec.wire === undefined ? 'stack' : 'wire';
  const targets = compileTargets(spec.targets, geometry);
  if (!targets.some((t) => t.objective.kind !== 'constraint')) throw new InputError('bad-value', 'targets: a design needs at least one target, e.g. - { transition: e1-hh1, wavelength: 976 nm, within: 2 nm }', 'targets');
  // Resolve once at the centre of the box so that bad materials or variable references fail here, as input errors, not as infeasible candidates.
  const centre = valuesOf(variables, variables.map((v) => (v.from + v.to) / 2));
  if (geometry === 'wire') buildWireStructure(spec, centre);
  else buildStructure(spec, centre);
  const preferences = compilePreferences(spec);
  const states = statesNeeded(targets);
  for (const label of preferenceStates(preferences)) {
    const b = bandOfLabel(label)!;
    if (states[b.band] !== undefined) states[b.band] = Math.max(states[b.band]!, b.index);
  }
  const settings = settingsOf(spec);
  const doped = geometry === 'stack' && hasDoping(spec) ? { options: dopedOptionsOf(spec, settings), absorptionInSearch: targets.some((t) => INTERSUBBAND_ABSORPTION_KINDS.has(t.objective.kind)) } : undefined;
  return { spec, geometry, variables, targets, settings, wavefunctions: needsWavefunctions(targets) || preferencesNeedWavefunctions(preferences), states, preferences, ...(doped ? { doped } : {}) };
}

export const valuesOf = (variables: readonly VariableInfo[], x: readonly number[]): Record<string, number> =>
  Object.fromEntries(variables.map((v, i) => [v.name, x[i]!]));

/** One candidate: its target loss and the search's score (preferences.ts searchScore; the loss when there are none). */
export type Evaluated =
  | { readonly ok: true; readonly loss: number; readonly score: number; readonly scored: Scored; readonly result: DesignSolve }
  | { readonly ok: false; readonly loss: number; readonly score: number; readonly error: string };

/**
 * States per band a stack's solve must hold for the targets: a band they read whole (absent from
 * problem.states) is solved whole, not cut to the default limit of long stacks (DEFAULT_STATE_LIMIT);
 * with `full`, bands read up to a count within that limit are left to the full solve's default.
 */
function stackStates(problem: DesignProblem, full: boolean): Partial<Record<BandName, number>> {
  const out: Partial<Record<BandName, number>> = {};
  for (const band of BANDS) {
    const n = problem.states[band];
    if (n === undefined) out[band] = Infinity;
    else if (!full || n > DEFAULT_STATE_LIMIT) out[band] = n;
  }
  return out;
}

/** A stack's solve: a doped stack self-consistently at its (first) bias, with its absorption when `absorption`. */
function stackSolve(problem: DesignProblem, values: Readonly<Record<string, number>>, options: { wavefunctions?: boolean; states: Partial<Record<BandName, number>> }, absorption: boolean): SolveResult | DopedSolveResult {
  const structure = buildStructure(problem.spec, values);
  if (!problem.doped) return solveStructure(structure, problem.settings, options);
  const biased = atBias(structure, biasPoints(problem.spec, structure)[0]!);
  const doped = problem.doped.options;
  return solveDopedStructure(biased, dopingOfSpec(problem.spec, structure)!, problem.settings, absorption ? doped : { ...doped, absorption: null }, options);
}

/** The search's solve of a candidate: wells as configured (only the states targets read), wires on coarse settings. */
function searchSolve(problem: DesignProblem, values: Readonly<Record<string, number>>): DesignSolve {
  if (problem.geometry === 'stack') return stackSolve(problem, values, { wavefunctions: problem.wavefunctions, states: stackStates(problem, false) }, problem.doped?.absorptionInSearch ?? false);
  const structure = buildWireStructure(problem.spec, values);
  return solveWireStructure({ ...structure, settings: searchWireSettings(structure.settings) }, { states: problem.states });
}

/** The full solve of a design with the spec's own settings (what `wellsmith solve` reports). */
export function fullSolve(problem: DesignProblem, values: Readonly<Record<string, number>>): DesignSolve {
  return problem.geometry === 'stack' ? stackSolve(problem, values, { states: stackStates(problem, true) }, true) : solveWire(problem.spec, values);
}

export function evaluateDesign(problem: DesignProblem, values: Readonly<Record<string, number>>): Evaluated {
  try {
    const result = searchSolve(problem, values);
    if (result.status === 'unphysical' || result.status === 'not-converged') return { ok: false, loss: Infinity, score: Infinity, error: result.message };
    const scored = scoreTargets(problem.targets, result);
    if (!Number.isFinite(scored.loss)) return { ok: false, loss: Infinity, score: Infinity, error: 'loss is not finite' };
    const prefs = problem.preferences;
    const score = prefs.length && scored.satisfied && !isWireSolve(result) ? searchScore(prefs, scored.loss, true, preferenceValues(prefs, result)) : scored.loss;
    return { ok: true, loss: scored.loss, score, scored, result };
  } catch (e) {
    return { ok: false, loss: Infinity, score: Infinity, error: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
  }
}
