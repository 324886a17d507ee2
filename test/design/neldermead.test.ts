import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { minimize, NELDER_MEAD_MESSAGES, type NelderMeadOptions, type NelderMeadResult } from '../../engine/design/neldermead.js';
import { startPoints, type Bounds } from '../../engine/design/starts.js';
import { InputError } from '../../engine/errors.js';
import { deriveSeed } from '../../engine/random.js';
import { MONOLAYER_NM, TEST_FUNCTIONS } from '../reference/neldermead/functions.js';
import { mismatch, within } from './check.js';

const STATUSES = Object.keys(NELDER_MEAD_MESSAGES);

/** A box of 1–5 variables, a start inside it (by fractions), and a quadratic centre that may lie outside. */
const problemArb = fc
  .array(
    fc.record({
      lo: fc.double({ min: -20, max: 20, noNaN: true }),
      width: fc.double({ min: 1e-2, max: 30, noNaN: true }),
      start: fc.double({ min: 0, max: 1, noNaN: true }),
      centre: fc.double({ min: -0.5, max: 1.5, noNaN: true }),
      weight: fc.double({ min: 0.01, max: 100, noNaN: true }),
    }),
    { minLength: 1, maxLength: 5 },
  )
  .map((rows) => ({
    bounds: rows.map((r) => [r.lo, r.lo + r.width] as const) as Bounds,
    x0: rows.map((r) => Math.min(r.lo + r.width, r.lo + r.start * r.width)),
    centre: rows.map((r) => r.lo + r.centre * r.width),
    weights: rows.map((r) => r.weight),
  }));

const quadratic =
  (centre: readonly number[], weights: readonly number[]) =>
  (x: readonly number[]): number =>
    x.reduce((s, v, k) => s + weights[k] * (v - centre[k]) ** 2, 0);

const inBox = (x: readonly number[], bounds: Bounds): boolean => x.every((v, k) => v >= bounds[k][0] && v <= bounds[k][1]);

const options = (bounds: Bounds, extra: Partial<NelderMeadOptions> = {}): NelderMeadOptions => ({
  bounds,
  maxEvaluations: 300,
  xTolerance: 1e-7,
  fTolerance: 1e-10,
  ...extra,
});

describe('minimize: properties', () => {
  it('returns a point inside the bounds with f(result) ≤ f(x0) and f equal to the objective there', () => {
    fc.assert(
      fc.property(problemArb, fc.boolean(), ({ bounds, x0, centre, weights }, adaptive) => {
        const f = quadratic(centre, weights);
        const r = minimize(f, x0, options(bounds, { adaptive: adaptive && x0.length >= 2 }));
        expect(inBox(r.x, bounds), `x ${r.x.join(',')} outside ${JSON.stringify(bounds)}`).toBe(true);
        expect(r.f <= f(x0), mismatch(`f(result) vs f(x0) from ${x0.join(',')}`, r.f, f(x0), 0)).toBe(true);
        expect(r.f).toBe(f(r.x));
        expect(r.evaluations).toBeLessThanOrEqual(300);
        expect(STATUSES).toContain(r.status);
      }),
      { numRuns: 150 },
    );
  });

  it('never crashes on NaN or ±Infinity values, and stays in bounds', () => {
    // Infeasible candidates: NaN everywhere, NaN on alternate cells of a 4-per-side grid, or
    // +Infinity on every third cell.
    fc.assert(
      fc.property(problemArb, fc.integer({ min: 0, max: 3 }), ({ bounds, x0, centre, weights }, pattern) => {
        const q = quadratic(centre, weights);
        const f = (x: readonly number[]): number => {
          const cell = x.reduce((s, v, k) => s + Math.floor((4 * (v - bounds[k][0])) / (bounds[k][1] - bounds[k][0])), 0);
          if (pattern === 0) return Number.NaN;
          if (pattern === 1 && cell % 2 === 1) return Number.NaN;
          if (pattern === 2 && cell % 3 === 0) return Number.POSITIVE_INFINITY;
          return q(x);
        };
        const r = minimize(f, x0, options(bounds, { maxEvaluations: 120 }));
        expect(inBox(r.x, bounds)).toBe(true);
        expect(STATUSES).toContain(r.status);
        expect(Number.isNaN(r.f), 'f must never be NaN').toBe(false);
        if (pattern === 0) {
          expect(r.status).toBe('no-finite-value');
          expect(r.f).toBe(Number.POSITIVE_INFINITY);
        }
        const f0 = Number.isNaN(f(x0)) ? Number.POSITIVE_INFINITY : f(x0);
        expect(r.f <= f0).toBe(true);
      }),
      { numRuns: 120 },
    );
  });

  it('is deterministic: the same problem gives the identical result', () => {
    fc.assert(
      fc.property(problemArb, ({ bounds, x0, centre, weights }) => {
        const f = quadratic(centre, weights);
        expect(minimize(f, x0, options(bounds))).toEqual(minimize(f, x0, options(bounds)));
      }),
      { numRuns: 50 },
    );
  });

  it('counts every objective call in evaluations', () => {
    fc.assert(
      fc.property(problemArb, ({ bounds, x0, centre, weights }) => {
        let calls = 0;
        const q = quadratic(centre, weights);
        const r = minimize((x) => ((calls += 1), q(x)), x0, options(bounds));
        expect(r.evaluations).toBe(calls);
      }),
      { numRuns: 50 },
    );
  });
});

describe('minimize: stop value', () => {
  it('on a sum of squares with a reachable floor it stops once f ≤ stopValue, in no more evaluations (property)', () => {
    let stopped = 0;
    fc.assert(
      fc.property(problemArb, ({ bounds, x0, weights }) => {
        // A centre inside the box: the floor 0 is reachable.
        const centre = bounds.map(([lo, hi]) => lo + 0.37 * (hi - lo));
        const f = quadratic(centre, weights);
        const full = minimize(f, x0, options(bounds, { xTolerance: 1e-9, fTolerance: 1e-14 }));
        const early = minimize(f, x0, options(bounds, { xTolerance: 1e-9, fTolerance: 1e-14, stopValue: 1e-6 }));
        if (early.status === 'stop-value') {
          stopped++;
          expect(early.f, `f at the stop: ${early.f}`).toBeLessThanOrEqual(1e-6);
          expect(early.evaluations, `evaluations ${early.evaluations} with the stop value, ${full.evaluations} without`).toBeLessThanOrEqual(full.evaluations);
        } else {
          // Never reached within the budget: the run is the same as without a stop value.
          expect(early).toEqual(full);
        }
        expect(inBox(early.x, bounds)).toBe(true);
      }),
      { numRuns: 60, seed: 7 },
    );
    expect(stopped, 'runs that reached the stop value within the budget').toBeGreaterThan(30);
  });

  it('leaves a run whose floor is out of reach unchanged (default: no stop value)', () => {
    const bounds: Bounds = [[-5, 5], [-5, 5]];
    const f = (x: readonly number[]): number => 1 + (x[0]! - 1) ** 2 + (x[1]! + 2) ** 2;
    expect(minimize(f, [0, 0], options(bounds, { stopValue: 1e-6 }))).toEqual(minimize(f, [0, 0], options(bounds)));
  });
});

describe('minimize: cases', () => {
  it('finds a minimum on a corner of the box (closed form: clipped centre)', () => {
    // Separable quadratic: the box-constrained minimiser is the centre clipped to the box (common practice).
    const f = quadratic([-3, 7], [1, 4]);
    const r = minimize(f, [0.5, 0.5], options([[0, 1], [0, 1]], { maxEvaluations: 500, xTolerance: 1e-9, fTolerance: 1e-12 }));
    expect(r.status).toBe('converged');
    [0, 1].forEach((v, k) => expect(within(r.x[k], v, 1e-6), mismatch(`corner x[${k}]`, r.x[k], v, 1e-6)).toBe(true));
    expect(within(r.f, 9 + 4 * 36, 1e-5), mismatch('corner f', r.f, 153, 1e-5)).toBe(true);
  });

  it('gives the same result with adaptive on or off in 2-D (Gao–Han coefficients reduce to 1, 2, ½, ½)', () => {
    const f = (x: readonly number[]) => TEST_FUNCTIONS.rosenbrock(x, {});
    const o = options([[-5, 5], [-5, 5]], { maxEvaluations: 1000 });
    expect(minimize(f, [-1.2, 1], { ...o, adaptive: true })).toEqual(minimize(f, [-1.2, 1], { ...o, adaptive: false }));
  });

  it('stops at the evaluation budget with status max-evaluations and never exceeds it', () => {
    const f = (x: readonly number[]) => TEST_FUNCTIONS.rosenbrock(x, {});
    for (const budget of [1, 2, 3, 17, 50]) {
      const r = minimize(f, [-1.2, 1], options([[-5, 5], [-5, 5]], { maxEvaluations: budget }));
      expect(r.status, `budget ${budget}`).toBe('max-evaluations');
      expect(r.evaluations, `budget ${budget}`).toBe(budget);
      expect(r.f <= f([-1.2, 1])).toBe(true);
    }
  });

  it('keeps x0 on a constant objective (LRWW tie rules: x0 ranks first, the best survives shrinks)', () => {
    // Lagarias et al. 1998: ties keep the initial order and a shrink keeps the old best first; on
    // a plateau every step is an inside contraction that fails, then a shrink towards x0.
    const x0 = [0.37, 0.61, 0.12];
    const r = minimize(() => 1, x0, options([[0, 1], [0, 1], [0, 1]], { maxEvaluations: 2000, xTolerance: 1e-8 }));
    expect(r.status).toBe('converged');
    expect(r.x).toEqual(x0);
  });

  it('stops early on an everywhere-infeasible objective once the simplex has collapsed', () => {
    const r = minimize(() => Number.NaN, [0.2, 0.3, 0.4], options([[0, 1], [0, 1], [0, 1]], { maxEvaluations: 10_000, xTolerance: 1e-6 }));
    expect(r.status).toBe('no-finite-value');
    expect(r.evaluations).toBeLessThan(10_000);
  });

  it('handles a start on the bounds', () => {
    const f = quadratic([0.3, 0.6], [1, 1]);
    const r = minimize(f, [1, 0], options([[0, 1], [0, 1]], { maxEvaluations: 500, xTolerance: 1e-9, fTolerance: 1e-14 }));
    expect(r.status).toBe('converged');
    [0.3, 0.6].forEach((v, k) => expect(within(r.x[k], v, 1e-6), mismatch(`x[${k}]`, r.x[k], v, 1e-6)).toBe(true));
  });

  it('rejects bad input with InputError', () => {
    const f = quadratic([0], [1]);
    const ok = options([[0, 1]]);
    expect(() => minimize(f, [2], ok)).toThrow(InputError);
    expect(() => minimize(f, [0.5, 0.5], ok)).toThrow(InputError);
    expect(() => minimize(f, [0.5], options([[1, 0]]))).toThrow(InputError);
    expect(() => minimize(f, [0.5], { ...ok, maxEvaluations: 0 })).toThrow(InputError);
    expect(() => minimize(f, [0.5], { ...ok, xTolerance: Number.NaN })).toThrow(InputError);
    expect(() => minimize(f, [0.5], { ...ok, initialStep: 0.7 })).toThrow(InputError);
    expect(() => minimize(f, [0.5], { ...ok, adaptive: true })).toThrow(InputError);
  });
});

describe('multi-start search: pinned work (STYLE "Pin the work")', () => {
  // Pinned from this implementation: a change of these numbers is a change of behaviour to review.
  const runStarts = (fn: (x: readonly number[]) => number, bounds: Bounds, seed: number, n: number): readonly NelderMeadResult[] =>
    startPoints('latin-hypercube', n, bounds, deriveSeed(seed, 0)).map((x0) =>
      minimize(fn, x0, { bounds, maxEvaluations: 400, xTolerance: 1e-6, fTolerance: 1e-10 }),
    );

  it('monolayer staircase, 6 Latin-hypercube starts from run seed 2024', () => {
    // Enumerated global minimum of the staircase (generate.py's method) for targets 6.1, 8.3 nm in [4, 10] nm.
    const targets = [6.1, 8.3];
    const bounds: Bounds = [[4, 10], [4, 10]];
    const results = runStarts((x) => TEST_FUNCTIONS.staircase(x, { targets }), bounds, 2024, 6);
    const best = results.reduce((a, b) => (b.f < a.f ? b : a));
    const evaluations = results.reduce((s, r) => s + r.evaluations, 0);
    const globalMin = targets.reduce((s, t) => {
      let m = Number.POSITIVE_INFINITY;
      for (let k = Math.round(4 / MONOLAYER_NM); k <= Math.round(10 / MONOLAYER_NM); k += 1) m = Math.min(m, (k * MONOLAYER_NM - t) ** 2);
      return s + m;
    }, 0);
    expect(within(best.f, globalMin, 1e-12), mismatch('best staircase value', best.f, globalMin, 1e-12)).toBe(true);
    expect(evaluations, 'total evaluations (pinned)').toBe(PINNED_STAIRCASE_EVALUATIONS);
  });

  it('Rosenbrock 2-D, 4 Latin-hypercube starts from run seed 7', () => {
    const results = runStarts((x) => TEST_FUNCTIONS.rosenbrock(x, {}), [[-2, 2], [-1, 3]], 7, 4);
    const best = results.reduce((a, b) => (b.f < a.f ? b : a));
    expect(results.map((r) => r.evaluations), 'evaluations per start (pinned)').toEqual(PINNED_ROSENBROCK_EVALUATIONS);
    // Relative 1e-9: the run is bitwise reproducible on one engine; the margin only absorbs a
    // last-bit difference of Math.sin between JavaScript engines.
    const tol = 1e-9 * PINNED_ROSENBROCK_BEST;
    expect(within(best.f, PINNED_ROSENBROCK_BEST, tol), mismatch('best value (pinned)', best.f, PINNED_ROSENBROCK_BEST, tol)).toBe(true);
    // And it is the Rosenbrock minimum (1, 1), f = 0 (closed form).
    expect(best.x.every((v) => within(v, 1, 1e-5)), `best x ${best.x.join(',')}`).toBe(true);
  });
});

const PINNED_STAIRCASE_EVALUATIONS = 572;
const PINNED_ROSENBROCK_EVALUATIONS: readonly number[] = [186, 141, 133, 130];
const PINNED_ROSENBROCK_BEST = 2.174237797064276e-14;
