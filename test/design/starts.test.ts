import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { haltonPoint, radicalInverse, startPoints, START_KINDS, type Bounds } from '../../engine/design/starts.js';
import { InputError } from '../../engine/errors.js';
import { mismatch, within } from './check.js';

/** Random boxes of 1–6 variables with finite lo < hi. */
const boxArb: fc.Arbitrary<Bounds> = fc.array(
  fc.tuple(fc.double({ min: -100, max: 100, noNaN: true }), fc.double({ min: 1e-3, max: 50, noNaN: true })).map(
    ([lo, w]) => [lo, lo + w] as const,
  ),
  { minLength: 1, maxLength: 6 },
);

const inBox = (p: readonly number[], bounds: Bounds): boolean => p.every((v, k) => v >= bounds[k][0] && v <= bounds[k][1]);

describe('radicalInverse and haltonPoint', () => {
  // van der Corput / Halton values by hand: digits mirrored about the radix point (Halton 1960).
  it.each([
    [1, 2, 1 / 2],
    [2, 2, 1 / 4],
    [3, 2, 3 / 4],
    [5, 2, 5 / 8],
    [1, 3, 1 / 3],
    [2, 3, 2 / 3],
    [3, 3, 1 / 9],
    [4, 3, 4 / 9],
    [7, 5, 2 / 5 + 1 / 25],
  ])('φ(%i) in base %i = %f', (i, b, expected) => {
    const got = radicalInverse(i, b);
    expect(within(got, expected, 1e-15), mismatch(`radicalInverse(${i}, ${b})`, got, expected, 1e-15)).toBe(true);
  });

  it('uses the first primes as bases', () => {
    expect(haltonPoint(1, 4)).toEqual([1 / 2, 1 / 3, 1 / 5, 1 / 7]);
  });
});

describe('startPoints', () => {
  it('puts every point of every kind inside the box, n rows of d coordinates', () => {
    fc.assert(
      fc.property(fc.constantFrom(...START_KINDS), fc.integer({ min: 1, max: 40 }), boxArb, fc.nat(), (kind, n, bounds, seed) => {
        const pts = startPoints(kind, n, bounds, seed);
        expect(pts.length).toBe(n);
        for (const p of pts) {
          expect(p.length).toBe(bounds.length);
          expect(inBox(p, bounds), `${kind}: point ${p.join(',')} outside ${JSON.stringify(bounds)}`).toBe(true);
        }
      }),
    );
  });

  it('Latin hypercube: each of the n strata of every dimension holds exactly one point', () => {
    // Defining property of the design (McKay, Beckman & Conover 1979).
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 50 }), boxArb, fc.nat(), (n, bounds, seed) => {
        const pts = startPoints('latin-hypercube', n, bounds, seed);
        bounds.forEach(([lo, hi], k) => {
          const strata = pts.map((p) => Math.min(n - 1, Math.floor((n * (p[k] - lo)) / (hi - lo)))).sort((a, b) => a - b);
          expect(strata, `dimension ${k}, n = ${n}, seed ${seed}`).toEqual(Array.from({ length: n }, (_, i) => i));
        });
      }),
    );
  });

  it('gives identical points for the same seed and different points for another', () => {
    fc.assert(
      fc.property(fc.constantFrom(...START_KINDS), fc.integer({ min: 1, max: 20 }), boxArb, fc.nat(), (kind, n, bounds, seed) => {
        expect(startPoints(kind, n, bounds, seed)).toEqual(startPoints(kind, n, bounds, seed));
        expect(startPoints(kind, n, bounds, seed)).not.toEqual(startPoints(kind, n, bounds, seed + 1));
      }),
    );
  });

  it('Halton: the shifted points keep the unshifted sequence’s differences modulo 1', () => {
    // A Cranley–Patterson rotation adds one shift per dimension modulo 1 (Cranley & Patterson 1976).
    const n = 16;
    const pts = startPoints('halton', n, [[0, 1], [0, 1]], 3);
    for (let i = 1; i < n; i += 1) {
      for (let k = 0; k < 2; k += 1) {
        const got = (((pts[i][k] - pts[0][k]) % 1) + 1) % 1;
        const raw = haltonPoint(i + 1, 2)[k] - haltonPoint(1, 2)[k];
        const expected = ((raw % 1) + 1) % 1;
        expect(within(got, expected, 1e-12), mismatch(`point ${i}, dim ${k}`, got, expected, 1e-12)).toBe(true);
      }
    }
  });

  it('Latin hypercube of 3 points in 2-D is pinned for seed 12345', () => {
    // Pinned from this implementation (STYLE "Pin the work"): a change here changes every run's starts.
    const pts = startPoints('latin-hypercube', 3, [[4, 10], [0, 0.3]], 12345);
    expect(pts.map((p) => p.map((v) => Number(v.toPrecision(12))))).toEqual(PINNED_LHS);
  });

  it('rejects bad input with InputError', () => {
    expect(() => startPoints('latin-hypercube', 0, [[0, 1]], 1)).toThrow(InputError);
    expect(() => startPoints('latin-hypercube', 2.5, [[0, 1]], 1)).toThrow(InputError);
    expect(() => startPoints('halton', 3, [], 1)).toThrow(InputError);
    expect(() => startPoints('halton', 3, [[1, 1]], 1)).toThrow(InputError);
    expect(() => startPoints('uniform', 3, [[0, Number.POSITIVE_INFINITY]], 1)).toThrow(InputError);
    expect(() => startPoints('sobol' as 'halton', 3, [[0, 1]], 1)).toThrow(InputError);
  });
});

const PINNED_LHS: readonly (readonly number[])[] = [
  [9.83424856232, 0.141261629135],
  [7.76721192132, 0.0868508530758],
  [5.31740799817, 0.218414551352],
];
