/**
 * Growable designs: a continuous optimum is moved to the lattice a grower can realise — whole
 * monolayers for thicknesses and wire dimensions (of the material each one sizes), a composition
 * step (default 0.001) for fractions, STRAIN_STEP_PERCENT for strains — by evaluating the neighbouring lattice points (floor and
 * ceiling in every variable) and keeping the best.
 */
import { buildStructure, type VariableInfo } from '../structure.js';
import { buildWireStructure } from '../wire/structure.js';
import { evaluateDesign, valuesOf, type DesignProblem, type Evaluated } from './problem.js';

/** Above this many variables only the nearest lattice point is tried in the extra dimensions (2^d grows fast). */
const MAX_CORNER_DIMENSIONS = 8;

export interface SnapOptions {
  /** Grid of alloy fractions (default 0.001). */
  readonly compositionStep: number;
}

/**
 * Grid of strain variables (%): 0.01 % of strain is a composition step of about 0.0014 in InGaAs
 * on GaAs (7.2 % between the ends), the order of the default composition step.
 */
export const STRAIN_STEP_PERCENT = 0.01;

/** Floor/ceil grid values of one fraction (or strain) variable inside its bounds. */
function fractionChoices(v: VariableInfo, x: number, step: number): number[] {
  const lo = Math.ceil(v.from / step - 1e-9);
  const hi = Math.floor(v.to / step + 1e-9);
  const k = x / step;
  const ks = [Math.floor(k), Math.ceil(k)].map((q) => Math.min(Math.max(q, lo), hi));
  return [...new Set(ks)].map((q) => Number((q * step).toFixed(12)));
}

/** Floor/ceil whole-monolayer values of one length variable (in its own unit) inside its bounds. */
function lengthChoices(v: VariableInfo, x: number, monolayer_nm: number): number[] {
  const perUnit = v.unit === 'ML' ? 1 : monolayer_nm;
  const lo = Math.ceil(v.from / perUnit - 1e-9);
  const hi = Math.floor(v.to / perUnit + 1e-9);
  const k = x / perUnit;
  const ks = lo > hi ? [Math.round(k)] : [Math.floor(k), Math.ceil(k)].map((q) => Math.min(Math.max(q, lo), hi));
  return [...new Set(ks)].map((q) => (v.unit === 'ML' ? q : q * monolayer_nm));
}

/** The monolayer (nm) of the first layer (or wire part) whose size is the variable `name`, in the structure at `values`. */
function monolayerOf(problem: DesignProblem, values: Readonly<Record<string, number>>, name: string): number {
  if (problem.geometry === 'wire') return buildWireStructure(problem.spec, values).lengthVariables[name]!.monolayer_nm;
  return buildStructure(problem.spec, values).layers.find((l) => l.thicknessVariable === name)!.monolayer_nm;
}

export interface Snapped {
  readonly values: Readonly<Record<string, number>>;
  readonly evaluated: Evaluated;
  /** Lattice points evaluated. */
  readonly evaluations: number;
}

/** The best lattice neighbour of a continuous point x (one value per problem variable). */
export function snapToLattice(problem: DesignProblem, x: readonly number[], options: SnapOptions): Snapped {
  const vars = problem.variables;
  // Compositions first: the monolayer of a strained layer depends on them.
  const fractionSets = vars.map((v, i) => (v.kind === 'length' ? [x[i]!] : fractionChoices(v, x[i]!, v.kind === 'strain' ? STRAIN_STEP_PERCENT : options.compositionStep)));
  let best: Snapped | undefined;
  let evaluations = 0;
  for (const fractions of corners(fractionSets, x)) {
    const base = valuesOf(vars, fractions);
    const sets = vars.map((v, i) => {
      if (v.kind !== 'length') return [fractions[i]!];
      const ml = v.unit === 'ML' ? 1 : safeMonolayer(problem, base, v.name);
      return ml === undefined ? [x[i]!] : lengthChoices(v, x[i]!, ml);
    });
    for (const point of corners(sets, x)) {
      const values = valuesOf(vars, point);
      const evaluated = evaluateDesign(problem, values);
      evaluations++;
      if (!best || evaluated.score < best.evaluated.score) best = { values, evaluated, evaluations: 0 };
    }
  }
  return { ...best!, evaluations };
}

function safeMonolayer(problem: DesignProblem, values: Readonly<Record<string, number>>, name: string): number | undefined {
  try {
    return monolayerOf(problem, values, name);
  } catch {
    return undefined;
  }
}

/** Cartesian product of per-variable choices; beyond MAX_CORNER_DIMENSIONS varying ones, the rest take the choice nearest x. */
function corners(sets: readonly number[][], x: readonly number[]): number[][] {
  let varying = 0;
  const pruned = sets.map((s, i) => {
    if (s.length < 2) return s;
    if (++varying <= MAX_CORNER_DIMENSIONS) return s;
    return [s.reduce((a, b) => (Math.abs(b - x[i]!) < Math.abs(a - x[i]!) ? b : a))];
  });
  let out: number[][] = [[]];
  for (const s of pruned) out = out.flatMap((p) => s.map((v) => [...p, v]));
  return out;
}
