import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors.js';
import { Random, deriveSeed, murmur3Words } from '../../engine/random.js';
import { mismatch, within } from './check.js';

interface XoshiroFixture {
  readonly seed: number;
  readonly uint32: readonly number[];
}
const fixtures = JSON.parse(
  readFileSync(new URL('../reference/neldermead/fixtures.json', import.meta.url), 'utf8'),
) as { readonly xoshiro128starstar: readonly XoshiroFixture[] };

describe('murmur3Words', () => {
  // MurmurHash3_x86_32 verification vectors from Appleby's SMHasher (from memory); a 32-bit word
  // w stands for its 4 little-endian bytes.
  const vectors: readonly { words: number[]; seed: number; hash: number; what: string }[] = [
    { words: [], seed: 0, hash: 0, what: '"" seed 0' },
    { words: [], seed: 1, hash: 0x514e28b7, what: '"" seed 1' },
    { words: [], seed: 0xffffffff, hash: 0x81f16f39, what: '"" seed 0xffffffff' },
    { words: [0], seed: 0, hash: 0x2362f9de, what: '"\\0\\0\\0\\0" seed 0' },
    { words: [0xffffffff], seed: 0, hash: 0x76293b50, what: '"\\xff\\xff\\xff\\xff" seed 0' },
    { words: [0x61616161], seed: 0x9747b28c, hash: 0x5a97808a, what: '"aaaa" seed 0x9747b28c' },
    { words: [0x87654321], seed: 0, hash: 0xf55b516b, what: '"\\x21\\x43\\x65\\x87" seed 0' },
    { words: [0x87654321], seed: 0x5082edee, hash: 0x2362f9de, what: '"\\x21\\x43\\x65\\x87" seed 0x5082edee' },
  ];
  it.each(vectors)('hashes $what', ({ words, seed, hash, what }) => {
    const got = murmur3Words(words, seed);
    expect(got, `${what}: got 0x${got.toString(16)}, expected 0x${hash.toString(16)}`).toBe(hash);
  });
});

describe('Random (xoshiro128**)', () => {
  // Outputs of a python port of Blackman & Vigna's published C code, seeded the
  // documented way (test/reference/neldermead/generate.py).
  it.each(fixtures.xoshiro128starstar)('matches the reference stream for seed $seed', ({ seed, uint32 }) => {
    const rng = new Random(seed);
    const got = uint32.map(() => rng.nextUint32());
    expect(got, `seed ${seed}: got ${got.join(',')}, expected ${uint32.join(',')}`).toEqual(uint32);
  });

  it('gives uniform() in [0, 1) with mean 1/2 and variance 1/12', () => {
    // Moments of U(0,1) (common practice); tolerance 5 standard errors.
    const rng = new Random(deriveSeed(7, 1));
    const n = 200_000;
    let sum = 0;
    let sum2 = 0;
    let outside = 0;
    for (let i = 0; i < n; i += 1) {
      const u = rng.uniform();
      if (!(u >= 0 && u < 1)) outside += 1;
      sum += u;
      sum2 += u * u;
    }
    expect(outside, 'uniform() values outside [0, 1)').toBe(0);
    const mean = sum / n;
    const variance = sum2 / n - mean * mean;
    const tolMean = 5 * Math.sqrt(1 / 12 / n);
    expect(within(mean, 0.5, tolMean), mismatch('mean of 2e5 uniforms', mean, 0.5, tolMean)).toBe(true);
    // The sample variance of U(0,1) has standard error sqrt((μ4 − σ⁴)/n) = sqrt(1/(180 n)).
    const tolVar = 5 * Math.sqrt(1 / 180 / n);
    expect(within(variance, 1 / 12, tolVar), mismatch('variance of 2e5 uniforms', variance, 1 / 12, tolVar)).toBe(true);
  });

  it('gives normal() with mean 0, variance 1 and P(|z| < 1) = 0.6826895', () => {
    // Standard normal facts (common practice); tolerances 5 standard errors.
    const rng = new Random(deriveSeed(7, 2));
    const n = 200_000;
    let sum = 0;
    let sum2 = 0;
    let inside = 0;
    for (let i = 0; i < n; i += 1) {
      const z = rng.normal();
      sum += z;
      sum2 += z * z;
      if (Math.abs(z) < 1) inside += 1;
    }
    const mean = sum / n;
    const variance = sum2 / n - mean * mean;
    const p = inside / n;
    const pExpected = 0.6826894921;
    expect(within(mean, 0, 5 / Math.sqrt(n)), mismatch('mean of 2e5 normals', mean, 0, 5 / Math.sqrt(n))).toBe(true);
    const tolVar = 5 * Math.sqrt(2 / n);
    expect(within(variance, 1, tolVar), mismatch('variance of 2e5 normals', variance, 1, tolVar)).toBe(true);
    const tolP = 5 * Math.sqrt((pExpected * (1 - pExpected)) / n);
    expect(within(p, pExpected, tolP), mismatch('fraction with |z| < 1', p, pExpected, tolP)).toBe(true);
  });

  it('gives int(n) on {0..n-1} with every value about equally often', () => {
    // Multinomial counts: each of 7 values has mean N/7 and sd sqrt(N p (1 − p)); 5 sd (common practice).
    const rng = new Random(99);
    const n = 7;
    const draws = 70_000;
    const counts = new Array<number>(n).fill(0);
    let outside = 0;
    for (let i = 0; i < draws; i += 1) {
      const k = rng.int(n);
      if (Number.isInteger(k) && k >= 0 && k < n) counts[k] += 1;
      else outside += 1;
    }
    expect(outside, 'int(7) values outside {0..6}').toBe(0);
    const expected = draws / n;
    const tol = 5 * Math.sqrt(draws * (1 / n) * (1 - 1 / n));
    counts.forEach((c, k) => expect(within(c, expected, tol), mismatch(`count of value ${k}`, c, expected, tol)).toBe(true));
  });

  it('rejects a bad int(n) and a non-integer seed with InputError', () => {
    const rng = new Random(1);
    for (const bad of [0, -1, 2.5, Number.NaN, 2 ** 33]) expect(() => rng.int(bad), `int(${bad})`).toThrow(InputError);
    expect(() => new Random(0.5)).toThrow(InputError);
  });

  it('replays the same stream for the same seed', () => {
    fc.assert(
      fc.property(fc.integer({ min: -(2 ** 40), max: 2 ** 40 }), (seed) => {
        const a = new Random(seed);
        const b = new Random(seed);
        for (let i = 0; i < 16; i += 1) {
          expect(a.uniform()).toBe(b.uniform());
          expect(a.normal()).toBe(b.normal());
        }
      }),
    );
  });
});

describe('deriveSeed', () => {
  it('is a deterministic function of (runSeed, path) in [0, 2^32)', () => {
    fc.assert(
      fc.property(fc.maxSafeInteger(), fc.array(fc.maxSafeNat(), { maxLength: 4 }), (run, path) => {
        const a = deriveSeed(run, ...path);
        expect(a).toBe(deriveSeed(run, ...path));
        expect(Number.isInteger(a) && a >= 0 && a < 2 ** 32, `deriveSeed(${run}, ${path.join(', ')}) = ${a}`).toBe(true);
      }),
    );
  });

  it('gives distinct seeds to indices 0..19999 of one run (the hash is a bijection in each word)', () => {
    const seen = new Set<number>();
    for (let i = 0; i < 20_000; i += 1) seen.add(deriveSeed(20240611, i));
    expect(seen.size).toBe(20_000);
  });

  it('separates different paths, orders and lengths', () => {
    fc.assert(
      fc.property(fc.nat(), fc.nat({ max: 2 ** 31 }), fc.nat({ max: 2 ** 31 }), (run, i, j) => {
        fc.pre(i !== j);
        expect(deriveSeed(run, i)).not.toBe(deriveSeed(run, j));
        expect(deriveSeed(run, i, j)).not.toBe(deriveSeed(run, j, i));
        expect(deriveSeed(run + 1, i)).not.toBe(deriveSeed(run, i));
      }),
    );
    expect(deriveSeed(5)).not.toBe(deriveSeed(5, 0));
  });

  it('spreads consecutive indices evenly over 16 bins of [0, 2^32)', () => {
    // Chi-square with 15 degrees of freedom: mean 15, sd sqrt(30); 99.99th percentile ≈ 42.6
    // (common practice); a weak hash would pile consecutive indices into few bins.
    const bins = new Array<number>(16).fill(0);
    const n = 16_000;
    for (let i = 0; i < n; i += 1) bins[deriveSeed(1, i) >>> 28] += 1;
    const expected = n / 16;
    const chi2 = bins.reduce((s, c) => s + (c - expected) ** 2 / expected, 0);
    expect(chi2 < 42.6, `chi-square of 16 bins: got ${chi2}, expected below 42.6 (bins ${bins.join(',')})`).toBe(true);
  });

  it('rejects a non-integer run seed or index with InputError', () => {
    expect(() => deriveSeed(1.5)).toThrow(InputError);
    expect(() => deriveSeed(1, Number.NaN)).toThrow(InputError);
    expect(() => deriveSeed(1, 2 ** 60)).toThrow(InputError);
  });
});
