/**
 * Start designs for a multi-start search: n points spread over the box of the free variables.
 * Each point set is a pure function of (kind, n, bounds, seed).
 */

import { InputError } from '../errors.js';
import { Random } from '../random.js';

/** Box of the free variables: one [lower, upper] pair per variable, in that variable's unit. */
export type Bounds = readonly (readonly [number, number])[];

/**
 * 'latin-hypercube': McKay, Beckman & Conover, Technometrics 21, 239 (1979).
 * 'halton': Halton sequence (J. H. Halton, Numer. Math. 2, 84 (1960)) randomised by a
 *   Cranley–Patterson rotation (R. Cranley and T. N. L. Patterson, SIAM J. Numer. Anal. 13, 904
 *   (1976)).
 * 'uniform': independent uniform points, the baseline the other two improve on.
 */
export type StartKind = 'latin-hypercube' | 'halton' | 'uniform';

export const START_KINDS: readonly StartKind[] = ['latin-hypercube', 'halton', 'uniform'];

/**
 * Checks a box: at least one variable, every bound finite, lower < upper.
 * Throws InputError naming the offending variable.
 */
export const checkBounds = (bounds: Bounds, where: string): void => {
  if (bounds.length === 0) {
    throw new InputError('bad-value', `${where}: no free variables, got an empty box; add at least one variable with bounds`);
  }
  bounds.forEach(([lo, hi], i) => {
    if (!Number.isFinite(lo) || !Number.isFinite(hi) || !(lo < hi)) {
      throw new InputError(
        'bad-value',
        `${where}[${i}]: bounds must be finite with lower < upper, got [${String(lo)}, ${String(hi)}]; fix the range of this variable`,
        `${where}[${i}]`,
      );
    }
  });
};

/**
 * Radical inverse φ_b(i) of a non-negative integer i in base b: its base-b digits mirrored about
 * the radix point (van der Corput). φ_2(1) = 1/2, φ_2(2) = 1/4, φ_2(3) = 3/4, φ_3(1) = 1/3.
 */
export const radicalInverse = (index: number, base: number): number => {
  let i = index;
  let inverse = 0;
  let scale = 1 / base;
  while (i > 0) {
    const digit = i % base;
    inverse += digit * scale;
    i = (i - digit) / base;
    scale /= base;
  }
  return inverse;
};

/** First d primes, the Halton bases. */
const firstPrimes = (d: number): readonly number[] => {
  const primes: number[] = [];
  for (let candidate = 2; primes.length < d; candidate += 1) {
    if (primes.every((p) => p * p > candidate || candidate % p !== 0)) primes.push(candidate);
  }
  return primes;
};

/**
 * Point `index` (≥ 1) of the d-dimensional Halton sequence in the unit cube:
 * (φ_2(i), φ_3(i), φ_5(i), …) (Halton 1960). Index 0 is the origin and is never used as a start.
 */
export const haltonPoint = (index: number, d: number): readonly number[] => firstPrimes(d).map((b) => radicalInverse(index, b));

const checkCount = (n: number): void => {
  if (!Number.isInteger(n) || n < 1) {
    throw new InputError('bad-value', `startPoints n: must be a positive integer, got ${String(n)}; ask for at least one start`);
  }
};

/** Unit-cube samples, one row per point. */
const unitLatinHypercube = (n: number, d: number, rng: Random): number[][] => {
  const points = Array.from({ length: n }, () => new Array<number>(d).fill(0));
  const strata = Array.from({ length: n }, (_, i) => i);
  for (let k = 0; k < d; k += 1) {
    // Fisher–Yates shuffle: an independent random assignment of strata to points per dimension.
    for (let i = n - 1; i > 0; i -= 1) {
      const j = rng.int(i + 1);
      const t = strata[i];
      strata[i] = strata[j];
      strata[j] = t;
    }
    for (let i = 0; i < n; i += 1) points[i][k] = (strata[i] + rng.uniform()) / n;
  }
  return points;
};

const unitHalton = (n: number, d: number, rng: Random): number[][] => {
  const bases = firstPrimes(d);
  const shift = bases.map(() => rng.uniform());
  return Array.from({ length: n }, (_, i) =>
    bases.map((b, k) => {
      const u = radicalInverse(i + 1, b) + shift[k];
      return u >= 1 ? u - 1 : u;
    }),
  );
};

const unitUniform = (n: number, d: number, rng: Random): number[][] =>
  Array.from({ length: n }, () => Array.from({ length: d }, () => rng.uniform()));

/**
 * n start points inside the box `bounds`, drawn by `kind` from the stream seeded by `seed`
 * (derive it with deriveSeed(runSeed, …) so it does not depend on scheduling).
 * Unit-cube coordinates u ∈ [0, 1) map to lo + (hi − lo) u, clamped to [lo, hi] against rounding.
 * Latin hypercube: in every dimension each of the n strata [(j)/n, (j+1)/n) of the box holds
 * exactly one point, placed uniformly inside its stratum (McKay, Beckman & Conover 1979).
 * Units: those of each variable. Result: n rows of length bounds.length.
 * Example: startPoints('latin-hypercube', 4, [[0, 1]], 7) has one point in each quarter of [0, 1].
 */
export const startPoints = (kind: StartKind, n: number, bounds: Bounds, seed: number): readonly (readonly number[])[] => {
  checkCount(n);
  checkBounds(bounds, 'startPoints bounds');
  const rng = new Random(seed);
  const d = bounds.length;
  let unit: number[][];
  switch (kind) {
    case 'latin-hypercube':
      unit = unitLatinHypercube(n, d, rng);
      break;
    case 'halton':
      unit = unitHalton(n, d, rng);
      break;
    case 'uniform':
      unit = unitUniform(n, d, rng);
      break;
    default:
      throw new InputError(
        'bad-value',
        `startPoints kind: unknown kind, got "${String(kind)}"; use one of ${START_KINDS.join(', ')}`,
      );
  }
  return Object.freeze(
    unit.map((row) =>
      Object.freeze(
        row.map((u, k) => {
          const [lo, hi] = bounds[k];
          return Math.min(hi, Math.max(lo, lo + (hi - lo) * u));
        }),
      ),
    ),
  );
};
