/**
 * minimize() against scipy.optimize.minimize(method='Nelder-Mead') (scipy version recorded in
 * fixtures.json), from the same initial simplex, and against the known minimisers (closed forms).
 * Fixtures: generate.py beside this file.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { minimize } from '../../../engine/design/neldermead.js';
import { mismatch, within } from '../../design/check.js';
import { objectiveOf, type NelderMeadCase } from './functions.js';

const fixtures = JSON.parse(readFileSync(new URL('./fixtures.json', import.meta.url), 'utf8')) as {
  readonly scipy: string;
  readonly cases: readonly NelderMeadCase[];
};

const run = (c: NelderMeadCase) =>
  minimize(objectiveOf(c), c.x0, {
    bounds: c.bounds,
    maxEvaluations: c.maxEvaluations,
    xTolerance: c.xTolerance,
    fTolerance: c.fTolerance,
    initialStep: c.initialStep,
    adaptive: c.adaptive,
  });

// Smooth cases stop with x spread ≤ 1e-8 and f spread ≤ 1e-12. Along the flattest direction of
// the Hessian (λ_min ≈ 0.4 for Rosenbrock at (1, 1), common practice) an f spread of 1e-12
// allows sqrt(2e-12 / 0.4) ≈ 2e-6 in x, so locations are compared to 5e-6 and values to 1e-10.
const X_TOL = 5e-6;
const F_TOL = 1e-10;

const smooth = fixtures.cases.filter((c) => c.function !== 'staircase');
const staircase = fixtures.cases.filter((c) => c.function === 'staircase');

const expectVectorClose = (label: string, got: readonly number[], expected: readonly number[], tol: number): void => {
  got.forEach((v, k) =>
    expect(within(v, expected[k], tol), mismatch(`${label} x[${k}]`, v, expected[k], tol)).toBe(true),
  );
};

describe(`Nelder–Mead against scipy ${fixtures.scipy}`, () => {
  it.each(smooth)('$name: same minimiser and value as scipy and the closed form', (c) => {
    const r = run(c);
    expect(r.status, `${c.name}: status`).toBe('converged');
    expect(c.scipy.success, `${c.name}: scipy did not converge; regenerate the fixture`).toBe(true);
    expectVectorClose(`${c.name} vs scipy`, r.x, c.scipy.x, X_TOL);
    expect(within(r.f, c.scipy.f, F_TOL), mismatch(`${c.name} f vs scipy`, r.f, c.scipy.f, F_TOL)).toBe(true);
    if (c.knownMinimiser !== null) expectVectorClose(`${c.name} vs closed form`, r.x, c.knownMinimiser, X_TOL);
    if (c.knownMinimum !== null) {
      expect(within(r.f, c.knownMinimum, F_TOL), mismatch(`${c.name} f vs closed form`, r.f, c.knownMinimum, F_TOL)).toBe(true);
    }
  });

  // Paths differ in a bounded box (scipy clips trial points, wellsmith maps through a sine), so
  // only the order of the work is compared: within a factor 2 either way.
  it.each(smooth.filter((c) => c.mode === 'bounded'))('$name: evaluation count within 2× of scipy’s', (c) => {
    const r = run(c);
    const ratio = r.evaluations / c.scipy.evaluations;
    expect(ratio >= 0.5 && ratio <= 2, mismatch(`${c.name} evaluations ratio (ours ${r.evaluations}, scipy ${c.scipy.evaluations})`, ratio, 1, 1)).toBe(true);
  });

  // In a box ±1e5 wide around the start the sine map is affine to ~1e-10 and Nelder–Mead is affine
  // invariant, so the runs nearly coincide; rounding splits them only near convergence. 5 % of
  // scipy's counts (observed ≤ 1.1 %). scipy's nit starts at 1, ours at 0.
  it.each(smooth.filter((c) => c.mode === 'equivalent'))('$name: with very wide bounds the work matches unbounded scipy', (c) => {
    const r = run(c);
    const tolEv = 0.05 * c.scipy.evaluations;
    expect(within(r.evaluations, c.scipy.evaluations, tolEv), mismatch(`${c.name} evaluations`, r.evaluations, c.scipy.evaluations, tolEv)).toBe(true);
    const tolIt = 0.05 * c.scipy.iterations;
    expect(within(r.iterations, c.scipy.iterations - 1, tolIt), mismatch(`${c.name} iterations`, r.iterations, c.scipy.iterations - 1, tolIt)).toBe(true);
  });

  // Same cases, first 60 objective values in evaluation order: the same points are visited in the
  // same order, so each value matches scipy's up to the map's departure from affine (~1e-10 in x).
  // Tolerance: relative 1e-6 for large values, plus 1e-10 absolute because near a minimum f moves
  // by |∇f| δx with |∇f| ≲ 1 (observed ≤ 3e-12 there).
  it.each(smooth.filter((c) => c.mode === 'equivalent'))('$name: with very wide bounds the first 60 evaluations follow unbounded scipy', (c) => {
    const trace = c.scipyTrace ?? [];
    expect(trace.length, `${c.name}: fixture has no trace`).toBeGreaterThan(0);
    const seen: number[] = [];
    const f = objectiveOf(c);
    minimize(
      (x) => {
        const v = f(x);
        seen.push(v);
        return v;
      },
      c.x0,
      { bounds: c.bounds, maxEvaluations: trace.length, xTolerance: c.xTolerance, fTolerance: c.fTolerance, initialStep: c.initialStep, adaptive: c.adaptive },
    );
    expect(seen.length).toBe(trace.length);
    seen.forEach((v, i) => {
      const tol = 1e-6 * Math.abs(trace[i]) + 1e-10;
      expect(within(v, trace[i], tol), mismatch(`${c.name} evaluation ${i}`, v, trace[i], tol)).toBe(true);
    });
  });

  it.each(staircase)('$name (monolayer-snapped): reaches the global plateau without throwing', (c) => {
    // Global minimum by enumerating monolayer counts in generate.py (closed form of the plateau);
    // values are sums of squares of multiples of the monolayer, so compared to 1e-12.
    const r = run(c);
    expect(['converged', 'max-evaluations']).toContain(r.status);
    const known = c.knownMinimum ?? Number.NaN;
    expect(within(r.f, known, 1e-12), mismatch(`${c.name} f vs enumerated global minimum`, r.f, known, 1e-12)).toBe(true);
    expect(within(c.scipy.f, known, 1e-12), mismatch(`${c.name} scipy f vs enumerated minimum`, c.scipy.f, known, 1e-12)).toBe(true);
    const ratio = r.evaluations / c.scipy.evaluations;
    expect(ratio >= 0.5 && ratio <= 2, mismatch(`${c.name} evaluations ratio (ours ${r.evaluations}, scipy ${c.scipy.evaluations})`, ratio, 1, 1)).toBe(true);
  });
});
