/**
 * Bounded Nelder–Mead minimisation of a scalar objective over a box of design variables
 * (layer widths in nm, alloy fractions, …), for objectives that are expensive, possibly piecewise
 * flat (monolayer snapping) and possibly infeasible (+Infinity or NaN) at some candidates.
 */

import { InputError } from '../errors.js';
import { checkBounds, type Bounds } from './starts.js';

/**
 * Objective: the loss at a design x (units of each variable). NaN is read as +Infinity.
 * The argument is a buffer owned by the minimiser: read it, do not keep it.
 */
export type ObjectiveFunction = (x: readonly number[]) => number;

export interface NelderMeadOptions {
  /** Box of the variables, one [lower, upper] per coordinate, lower < upper, finite. */
  readonly bounds: Bounds;
  /** Budget of objective evaluations (initial simplex included); never exceeded. */
  readonly maxEvaluations: number;
  /** Absolute spread in x (units of each variable): max |x_i,k − x_best,k| over vertices and coordinates. */
  readonly xTolerance: number;
  /** Absolute spread in f: max |f_i − f_best| over vertices. Stop when both spreads are at or below tolerance. */
  readonly fTolerance: number;
  /** Edge of the initial simplex along each coordinate as a fraction of that coordinate's box width, in (0, 0.5] (default 0.05). */
  readonly initialStep?: number;
  /** Gao–Han dimension-dependent coefficients; default: used when the dimension exceeds 2. */
  readonly adaptive?: boolean;
  /**
   * Stop as soon as the best vertex has f ≤ stopValue (default −Infinity: never): for an objective
   * with a known floor (a sum of squares, 0) no point can do better by more than this, whatever
   * the simplex's spread.
   */
  readonly stopValue?: number;
}

export type NelderMeadStatus = 'converged' | 'stop-value' | 'max-evaluations' | 'no-finite-value';

/** One message per status, for the CLI and the report. */
export const NELDER_MEAD_MESSAGES: Readonly<Record<NelderMeadStatus, string>> = Object.freeze({
  converged: 'simplex spread in x and in f below tolerance',
  'stop-value': 'the best value reached the stop value (the objective\'s floor, within tolerance)',
  'max-evaluations': 'evaluation budget spent before the simplex converged',
  'no-finite-value': 'no finite objective value was found',
});

export interface NelderMeadResult {
  /** Best design found (inside the bounds). */
  readonly x: readonly number[];
  /** Objective at x (+Infinity when no finite value was found). */
  readonly f: number;
  /** Objective evaluations spent. */
  readonly evaluations: number;
  /** Completed Nelder–Mead iterations (each starts with a reflection). */
  readonly iterations: number;
  readonly status: NelderMeadStatus;
}

/** Coefficients of reflection ρ, expansion χ, contraction γ and shrink σ. */
interface Coefficients {
  readonly rho: number;
  readonly chi: number;
  readonly gamma: number;
  readonly sigma: number;
}

/** Standard coefficients (Nelder & Mead, Comput. J. 7, 308 (1965); Lagarias et al. 1998). */
const STANDARD: Coefficients = { rho: 1, chi: 2, gamma: 0.5, sigma: 0.5 };

/** Gao & Han, Comput. Optim. Appl. 51, 259 (2012): ρ = 1, χ = 1 + 2/n, γ = 0.75 − 1/(2n), σ = 1 − 1/n. */
const adaptiveCoefficients = (n: number): Coefficients => ({
  rho: 1,
  chi: 1 + 2 / n,
  gamma: 0.75 - 1 / (2 * n),
  sigma: 1 - 1 / n,
});

/** One simplex vertex: the unbounded variable y, its image x in the box, and f(x). */
interface Vertex {
  y: number[];
  x: number[];
  f: number;
}

const badOption = (what: string, got: unknown, fix: string): InputError =>
  new InputError('bad-value', `minimize ${what}, got ${String(got)}; ${fix}`);

const checkOptions = (x0: readonly number[], options: NelderMeadOptions): void => {
  const { bounds, maxEvaluations, xTolerance, fTolerance, initialStep, adaptive } = options;
  checkBounds(bounds, 'minimize bounds');
  if (x0.length !== bounds.length) {
    throw badOption('x0: needs one value per bounded variable', `${x0.length} values for ${bounds.length} bounds`, 'give x0 and bounds the same length');
  }
  x0.forEach((v, k) => {
    const [lo, hi] = bounds[k];
    if (!(v >= lo && v <= hi)) {
      throw badOption(`x0[${k}]: must lie within [${lo}, ${hi}]`, v, 'start inside the box');
    }
  });
  if (!Number.isInteger(maxEvaluations) || maxEvaluations < 1) {
    throw badOption('maxEvaluations: must be a positive integer', maxEvaluations, 'give a budget of at least n + 1 evaluations');
  }
  if (!(xTolerance >= 0) || !(fTolerance >= 0)) {
    throw badOption('xTolerance/fTolerance: must be non-negative numbers', `${xTolerance}/${fTolerance}`, 'give absolute tolerances such as 1e-6');
  }
  // Up to half the box, one of the two directions from x0 always stays inside.
  if (initialStep !== undefined && !(initialStep > 0 && initialStep <= 0.5)) {
    throw badOption('initialStep: must be a fraction of the box in (0, 0.5]', initialStep, 'use e.g. 0.05');
  }
  if (adaptive === true && x0.length < 2) {
    throw badOption('adaptive: Gao–Han coefficients need at least 2 variables (σ = 0 for one)', `${x0.length} variable`, 'leave adaptive unset');
  }
};

/**
 * Minimise f over a box by the Nelder–Mead simplex method.
 *
 * Method: Nelder & Mead, Comput. J. 7, 308 (1965), in the form analysed by Lagarias, Reeds,
 * Wright & Wright, SIAM J. Optim. 9, 112 (1998): reflection, expansion (accepted if better than
 * the reflected point), outside contraction (accepted if f_c ≤ f_r), inside contraction
 * (accepted if f_cc < f_worst), shrink towards the best vertex; their ordering rules: after a
 * non-shrink step the new vertex is ranked after every vertex of equal value, and after a
 * shrink the old best vertex stays first among ties. Coefficients: standard (ρ, χ, γ, σ) =
 * (1, 2, ½, ½), or those of Gao & Han, Comput. Optim. Appl. 51, 259 (2012) when n > 2 (or as
 * forced by `adaptive`).
 *
 * Bounds: the search runs in unbounded variables y with x = lo + (hi − lo)(1 + sin y)/2, the
 * periodic transformation of M. J. Box, Comput. J. 9, 67 (1966) (from memory). It is chosen over
 * a logistic map because the bounds are reached at finite y (±π/2), where f(x(y)) is smooth and
 * stationary, so an optimum on a bound is a plain interior minimum in y; a logistic map reaches
 * a bound only as y → ±∞ and the simplex stretches without end. The initial simplex is built in
 * x: x0 and, per coordinate k, x0 + s (hi_k − lo_k) e_k (s = initialStep, default 0.05; the step
 * is taken downwards when it would leave the box), then mapped to y by y = asin(2(x − lo)/(hi − lo) − 1).
 *
 * Stopping (as scipy.optimize.minimize's 'Nelder-Mead'): converged when the spread of the simplex
 * in x (max over vertices and coordinates of |x_i − x_best|) ≤ xTolerance and the spread in f
 * ≤ fTolerance; or when the budget of evaluations is spent. A simplex that collapses in x while
 * every vertex is infeasible stops with 'no-finite-value'.
 *
 * Units: x0, bounds and xTolerance in the units of each variable; fTolerance in those of f.
 * Deterministic: same f, x0 and options give the same result.
 * Example: minimize(x => (x[0] - 1) ** 2 + (x[1] + 2) ** 2, [0, 0],
 *   { bounds: [[-5, 5], [-5, 5]], maxEvaluations: 400, xTolerance: 1e-8, fTolerance: 1e-12 })
 *   gives x ≈ [1, −2], f ≈ 0, status 'converged'.
 */
export const minimize = (f: ObjectiveFunction, x0: readonly number[], options: NelderMeadOptions): NelderMeadResult => {
  checkOptions(x0, options);
  const { bounds, maxEvaluations, xTolerance, fTolerance } = options;
  const n = x0.length;
  const step = options.initialStep ?? 0.05;
  const { rho, chi, gamma, sigma } = (options.adaptive ?? n > 2) ? adaptiveCoefficients(n) : STANDARD;
  const lo = bounds.map((b) => b[0]);
  const width = bounds.map((b) => b[1] - b[0]);
  const hi = bounds.map((b) => b[1]);

  let evaluations = 0;
  const evaluate = (x: readonly number[]): number => {
    evaluations += 1;
    const value = f(x);
    return Number.isNaN(value) ? Number.POSITIVE_INFINITY : value;
  };
  /** x(y) into `out`, clamped against rounding so that x never leaves the box. */
  const toX = (y: readonly number[], out: number[]): void => {
    for (let k = 0; k < n; k += 1) {
      const v = lo[k] + width[k] * 0.5 * (1 + Math.sin(y[k]));
      out[k] = v < lo[k] ? lo[k] : v > hi[k] ? hi[k] : v;
    }
  };
  const toY = (x: readonly number[]): number[] =>
    x.map((v, k) => Math.asin(Math.min(1, Math.max(-1, (2 * (v - lo[k])) / width[k] - 1))));

  // Initial simplex in x, evaluated at exactly these points (x0 included as given).
  const simplex: Vertex[] = [];
  for (let j = 0; j <= n && evaluations < maxEvaluations; j += 1) {
    const x = x0.slice();
    if (j > 0) {
      const k = j - 1;
      const up = x[k] + step * width[k];
      x[k] = up <= hi[k] ? up : x[k] - step * width[k];
    }
    simplex.push({ y: toY(x), x, f: evaluate(x) });
  }

  const finish = (status: NelderMeadStatus, iterations: number): NelderMeadResult => {
    let best = simplex[0];
    for (const v of simplex) if (v.f < best.f) best = v;
    const finite = best.f < Number.POSITIVE_INFINITY;
    return Object.freeze({
      x: Object.freeze(best.x.slice()),
      f: best.f,
      evaluations,
      iterations,
      status: finite ? status : 'no-finite-value',
    });
  };
  if (simplex.length < n + 1) return finish('max-evaluations', 0);

  /** Stable insertion sort by f: ties keep their current order (so the kept best stays first). */
  const sortSimplex = (): void => {
    for (let i = 1; i <= n; i += 1) {
      const v = simplex[i];
      let j = i - 1;
      while (j >= 0 && simplex[j].f > v.f) {
        simplex[j + 1] = simplex[j];
        j -= 1;
      }
      simplex[j + 1] = v;
    }
  };
  // Initial order: ties keep construction order, x0 first.
  sortSimplex();

  // Trial buffers, swapped into the simplex when accepted: no allocation per iteration.
  const centroid = new Array<number>(n).fill(0);
  let reflected: Vertex = { y: new Array<number>(n).fill(0), x: new Array<number>(n).fill(0), f: 0 };
  let trial: Vertex = { y: new Array<number>(n).fill(0), x: new Array<number>(n).fill(0), f: 0 };
  /** trial.y = (1 + t) centroid − t y_worst, then x and f. */
  const probe = (into: Vertex, t: number): void => {
    const worst = simplex[n].y;
    for (let k = 0; k < n; k += 1) into.y[k] = (1 + t) * centroid[k] - t * worst[k];
    toX(into.y, into.x);
    into.f = evaluate(into.x);
  };
  /** Replace the worst vertex by v, ranked after all vertices of equal value (LRWW rule); returns the buffer freed. */
  const acceptWorst = (v: Vertex): Vertex => {
    const freed = simplex[n];
    let j = n;
    while (j > 0 && simplex[j - 1].f > v.f) {
      simplex[j] = simplex[j - 1];
      j -= 1;
    }
    simplex[j] = v;
    return freed;
  };
  const converged = (): boolean => {
    const best = simplex[0];
    let xSpread = 0;
    let fSpread = 0;
    for (let i = 1; i <= n; i += 1) {
      const v = simplex[i];
      for (let k = 0; k < n; k += 1) xSpread = Math.max(xSpread, Math.abs(v.x[k] - best.x[k]));
      fSpread = Math.max(fSpread, Math.abs(v.f - best.f));
    }
    if (!(xSpread <= xTolerance)) return false;
    // Infinite values give a NaN or infinite spread; a collapsed all-infeasible simplex is done.
    return fSpread <= fTolerance || best.f === Number.POSITIVE_INFINITY;
  };

  const stopValue = options.stopValue ?? Number.NEGATIVE_INFINITY;
  let iterations = 0;
  for (;;) {
    if (simplex[0].f <= stopValue) return finish('stop-value', iterations);
    if (converged()) return finish('converged', iterations);
    if (evaluations >= maxEvaluations) return finish('max-evaluations', iterations);

    for (let k = 0; k < n; k += 1) centroid[k] = 0;
    for (let i = 0; i < n; i += 1) for (let k = 0; k < n; k += 1) centroid[k] += simplex[i].y[k];
    for (let k = 0; k < n; k += 1) centroid[k] /= n;

    const fBest = simplex[0].f;
    const fSecondWorst = simplex[n - 1].f;
    const fWorst = simplex[n].f;
    probe(reflected, rho);
    let shrink = false;
    if (reflected.f < fBest) {
      if (evaluations >= maxEvaluations) {
        reflected = acceptWorst(reflected);
        return finish('max-evaluations', iterations + 1);
      }
      probe(trial, rho * chi);
      if (trial.f < reflected.f) trial = acceptWorst(trial);
      else reflected = acceptWorst(reflected);
    } else if (reflected.f < fSecondWorst) {
      reflected = acceptWorst(reflected);
    } else {
      if (evaluations >= maxEvaluations) return finish('max-evaluations', iterations);
      if (reflected.f < fWorst) {
        probe(trial, rho * gamma);
        if (trial.f <= reflected.f) trial = acceptWorst(trial);
        else shrink = true;
      } else {
        probe(trial, -gamma);
        if (trial.f < fWorst) trial = acceptWorst(trial);
        else shrink = true;
      }
    }
    if (shrink) {
      const best = simplex[0].y;
      for (let i = 1; i <= n; i += 1) {
        if (evaluations >= maxEvaluations) return finish('max-evaluations', iterations);
        const v = simplex[i];
        for (let k = 0; k < n; k += 1) v.y[k] = best[k] + sigma * (v.y[k] - best[k]);
        toX(v.y, v.x);
        v.f = evaluate(v.x);
      }
      // The kept best vertex stays first among ties (LRWW shrink rule).
      sortSimplex();
    }
    iterations += 1;
  }
};
