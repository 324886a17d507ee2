/**
 * What a tolerance analysis measures on one (possibly perturbed) structure: the achieved value of
 * every target of the spec (through the objectives registry) and the photon energy of every
 * transition a target names. Only the states the targets read are solved.
 */
import { compileTargets, needsWavefunctions, scoreTargets, statesNeeded, type CompiledTarget } from '../../objectives/index.js';
import type { ObjectiveRole } from '../../objectives/types.js';
import type { BandName } from '../profile.js';
import { InputError } from '../errors.js';
import { bandOfLabel, findTransition, settingsOf, solveStructure, type SolverSettings } from '../solve.js';
import { localise, wellLine, wellsOf } from '../../objectives/wells.js';
import type { Spec } from '../input/schema.js';
import { buildStructure, type Perturbation } from '../structure.js';

/** One measured quantity: a target's achieved value, a named transition's energy, or that line in one well. */
export interface Quantity {
  /** "e1-hh1 wavelength" (a target), "e1-hh1 energy" (a transition the targets name) or "e1-hh1 energy of well[3]". */
  readonly label: string;
  readonly unit: string;
  /** True for the achieved value of a target, constraint or figure (an evaluation of the spec's targets). */
  readonly target: boolean;
  /** For those: the evaluation's role (objectives/types.ts): a target with a window, a constraint, or a figure to maximise. */
  readonly role?: ObjectiveRole;
  /** For a well's own line: the transition and the well's label. */
  readonly well?: { readonly transition: string; readonly label: string };
}

export interface ToleranceProblem {
  readonly spec: Spec;
  readonly values: Readonly<Record<string, number>>;
  readonly targets: readonly CompiledTarget[];
  /** Lines whose photon energy is a quantity of its own (those no target already measures as an energy). */
  readonly transitions: readonly string[];
  /** Lines followed in every well of a multi-well stack (every line the targets name); empty for one well. */
  readonly wellLines: readonly string[];
  /** Wells of a multi-well stack (labels, in stack order) whose own lines are measured; empty for one well. */
  readonly wells: readonly string[];
  readonly quantities: readonly Quantity[];
  readonly settings: SolverSettings;
  readonly wavefunctions: boolean;
  readonly states: Partial<Record<BandName, number>>;
}

/** One measurement: values in the order of problem.quantities (NaN where a state is missing). */
export interface Measurement {
  readonly ok: boolean;
  readonly values: readonly number[];
  /** Normalised residuals of the targets (window half-widths), in target order. */
  readonly residuals: readonly number[];
  readonly loss: number;
  readonly satisfied: boolean;
  readonly error?: string;
}

/** The transition a target names (a transition, figure or ensemble target). */
const transitionOf = (t: CompiledTarget): string | undefined => {
  const raw = (t.target as { transition?: unknown; ensemble?: unknown }).transition ?? (t.target as { ensemble?: unknown }).ensemble;
  return typeof raw === 'string' ? raw : undefined;
};

/** Compiles the spec's targets and fixes the measured quantities (from a nominal solve's labels). */
export const WIRE_TOLERANCE_MESSAGE = 'wire: growth-tolerance analysis covers layer stacks only (monolayer and composition errors of layers); wire cross-sections are not perturbed yet';

export function prepareTolerance(spec: Spec, values: Readonly<Record<string, number>>): ToleranceProblem {
  if (spec.wire !== undefined) throw new InputError('bad-value', WIRE_TOLERANCE_MESSAGE, 'wire');
  const targets = compileTargets(spec.targets);
  if (targets.length === 0) throw new InputError('bad-value', 'targets: a tolerance analysis measures the targets, got none; add e.g. - { transition: e1-hh1, wavelength: 976 nm, within: 2 nm }', 'targets');
  const named = [...new Set(targets.flatMap((t) => transitionOf(t) ?? []))];
  const settings = settingsOf(spec);
  const structure = buildStructure(spec, values);
  // Several wells: every well's own line is followed, which needs the wavefunctions and every state of the bands it reads.
  const wells = wellsOf(structure.layers).map((w) => w.label);
  const perWell = wells.length > 1 && named.length > 0;
  const wavefunctions = perWell || needsWavefunctions(targets);
  const states = perWell ? withBands(statesNeeded(targets), named) : statesNeeded(targets);
  const nominal = scoreTargets(targets, solveStructure(structure, settings, { wavefunctions, states }));
  // A target that already measures a line's energy ("e1-e2 energy" in meV or eV) is that line's row: no second one.
  const transitions = named.filter((line) => !nominal.evaluations.some((e) => e.label === `${line} energy`));
  const quantities: Quantity[] = [
    ...nominal.evaluations.map((e) => ({ label: e.label, unit: e.unit, target: true, role: e.role })),
    ...transitions.map((label) => ({ label: `${label} energy`, unit: 'meV', target: false })),
    ...(perWell ? named.flatMap((line) => wells.map((w) => ({ label: `${line} energy of ${w}`, unit: 'meV', target: false, well: { transition: line, label: w } }))) : []),
  ];
  return { spec, values, targets, transitions, wellLines: perWell ? named : [], wells: perWell ? wells : [], quantities, settings, wavefunctions, states };
}

/** The states map with every band of the given transitions solved in full (a well's e1 may be any state). */
function withBands(states: Partial<Record<BandName, number>>, transitions: readonly string[]): Partial<Record<BandName, number>> {
  const out = { ...states };
  for (const t of transitions) for (const l of t.split('-')) delete out[bandOfLabel(l)!.band];
  return out;
}

/** Builds, solves and scores the structure with the given growth errors; numerical trouble is a failed measurement, not an exception. */
export function measure(problem: ToleranceProblem, perturbation: Perturbation = {}): Measurement {
  try {
    const result = solveStructure(buildStructure(problem.spec, problem.values, perturbation), problem.settings, { wavefunctions: problem.wavefunctions, states: problem.states });
    const scored = scoreTargets(problem.targets, result);
    const ws = problem.wells.length ? localise(result) : null;
    const values = [
      ...scored.evaluations.map((e) => e.achieved ?? NaN),
      ...problem.transitions.map((label) => (findTransition(result, label)?.energy_eV ?? NaN) * 1000),
      ...(problem.wells.length ? problem.wellLines.flatMap((line) => problem.wells.map((_, k) => (ws && k < ws.wells.length ? wellLine(result, ws, k, line) ?? NaN : NaN) * 1000)) : []),
    ];
    const ok = Number.isFinite(scored.loss);
    return { ok, values, residuals: scored.evaluations.map((e) => e.residual), loss: ok ? scored.loss : Infinity, satisfied: ok && scored.satisfied };
  } catch (e) {
    // Bad input shows at the nominal point; a growth error that makes a layer vanish (thickness ≤ 0)
    // only fails its own sample, which counts as outside every window.
    const nominal = Object.keys(perturbation).length === 0;
    if (e instanceof InputError && nominal) throw e;
    return { ok: false, values: problem.quantities.map(() => NaN), residuals: problem.targets.map(() => NaN), loss: Infinity, satisfied: false, error: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
  }
}
