/**
 * What a tolerance analysis measures on one (possibly perturbed) structure: the achieved value of
 * every target of the spec (through the objectives registry) and the photon energy of every
 * transition a target names. Only the states the targets read are solved.
 */
import { compileTargets, needsWavefunctions, scoreTargets, statesNeeded, type CompiledTarget } from '../../objectives/index.js';
import type { BandName } from '../profile.js';
import { InputError } from '../errors.js';
import { findTransition, settingsOf, solveStructure, type SolverSettings } from '../solve.js';
import type { Spec } from '../spec/schema.js';
import { buildStructure, type Perturbation } from '../structure.js';

/** One measured quantity: a target's achieved value, or a named transition's energy. */
export interface Quantity {
  /** "e1-hh1 wavelength" (a target) or "e1-hh1 energy" (a transition the targets name). */
  readonly label: string;
  readonly unit: string;
  /** True for the achieved value of a target (its window decides the yield). */
  readonly target: boolean;
}

export interface ToleranceProblem {
  readonly spec: Spec;
  readonly values: Readonly<Record<string, number>>;
  readonly targets: readonly CompiledTarget[];
  readonly transitions: readonly string[];
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

const transitionOf = (t: CompiledTarget): string | undefined => {
  const raw = (t.target as { transition?: unknown }).transition;
  return typeof raw === 'string' ? raw : undefined;
};

/** Compiles the spec's targets and fixes the measured quantities (from a nominal solve's labels). */
export const WIRE_TOLERANCE_MESSAGE = 'wire: growth-tolerance analysis covers layer stacks only (monolayer and composition errors of layers); wire cross-sections are not perturbed yet';

export function prepareTolerance(spec: Spec, values: Readonly<Record<string, number>>): ToleranceProblem {
  if (spec.wire !== undefined) throw new InputError('bad-value', WIRE_TOLERANCE_MESSAGE, 'wire');
  const targets = compileTargets(spec.targets);
  if (targets.length === 0) throw new InputError('bad-value', 'targets: a tolerance analysis measures the targets, got none; add e.g. - { transition: e1-hh1, wavelength: 976 nm, within: 2 nm }', 'targets');
  const transitions = [...new Set(targets.flatMap((t) => transitionOf(t) ?? []))];
  const settings = settingsOf(spec);
  const wavefunctions = needsWavefunctions(targets);
  const states = statesNeeded(targets);
  const nominal = scoreTargets(targets, solveStructure(buildStructure(spec, values), settings, { wavefunctions, states }));
  const quantities: Quantity[] = [
    ...nominal.evaluations.map((e) => ({ label: e.label, unit: e.unit, target: true })),
    ...transitions.map((label) => ({ label: `${label} energy`, unit: 'meV', target: false })),
  ];
  return { spec, values, targets, transitions, quantities, settings, wavefunctions, states };
}

/** Builds, solves and scores the structure with the given growth errors; numerical trouble is a failed measurement, not an exception. */
export function measure(problem: ToleranceProblem, perturbation: Perturbation = {}): Measurement {
  try {
    const result = solveStructure(buildStructure(problem.spec, problem.values, perturbation), problem.settings, { wavefunctions: problem.wavefunctions, states: problem.states });
    const scored = scoreTargets(problem.targets, result);
    const values = [
      ...scored.evaluations.map((e) => e.achieved ?? NaN),
      ...problem.transitions.map((label) => (findTransition(result, label)?.energy_eV ?? NaN) * 1000),
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
