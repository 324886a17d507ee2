/**
 * Seeded pseudo-random numbers whose streams depend only on (run seed, index path), never on
 * which worker runs a start or in which order starts finish.
 *
 * Generator: xoshiro128** (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number
 * generators", ACM Trans. Math. Softw. 47(4), 36 (2021)), 128 bits of state, period 2¹²⁸ − 1,
 * 32-bit outputs. Seeding and seed derivation use MurmurHash3_x86_32 and its finaliser fmix32
 * (A. Appleby, SMHasher, public domain, 2011).
 */

import { InputError } from './errors.js';

const TWO_POW_32 = 4294967296;
const TWO_POW_MINUS_53 = 1 / 9007199254740992;
const GOLDEN_GAMMA_32 = 0x9e3779b9;

/** MurmurHash3 finaliser fmix32: a bijection of 32-bit words with full avalanche (Appleby 2011). */
export const fmix32 = (h: number): number => {
  let x = h >>> 0;
  x ^= x >>> 16;
  x = Math.imul(x, 0x85ebca6b);
  x ^= x >>> 13;
  x = Math.imul(x, 0xc2b2ae35);
  x ^= x >>> 16;
  return x >>> 0;
};

const rotl32 = (x: number, r: number): number => ((x << r) | (x >>> (32 - r))) >>> 0;

/**
 * MurmurHash3_x86_32 of a sequence of 32-bit words (each word read as its 4 little-endian bytes).
 * Words are reduced modulo 2³²; the result is an unsigned 32-bit integer.
 * Reference vector (Appleby's SMHasher, from memory): the word 0x61616161 ("aaaa") with seed
 * 0x9747b28c hashes to 0x5a97808a.
 */
export const murmur3Words = (words: readonly number[], seed: number): number => {
  let h = seed >>> 0;
  for (const w of words) {
    let k = Math.imul(w >>> 0, 0xcc9e2d51);
    k = rotl32(k >>> 0, 15);
    k = Math.imul(k, 0x1b873593);
    h ^= k;
    h = rotl32(h >>> 0, 13);
    h = (Math.imul(h, 5) + 0xe6546b64) >>> 0;
  }
  h ^= words.length * 4;
  return fmix32(h);
};

const checkSeedWord = (value: number, where: string): void => {
  if (!Number.isSafeInteger(value)) {
    throw new InputError(
      'bad-value',
      `${where}: must be an integer seed or index (|value| < 2^53), got ${String(value)}; pass a whole number`,
    );
  }
};

/** Low and high 32-bit words of a safe integer (two's complement for negatives), injective. */
const pushWords = (out: number[], value: number): void => {
  out.push(value >>> 0, Math.floor(value / TWO_POW_32) >>> 0);
};

/**
 * Seed of the stream at `path` under `runSeed` (e.g. deriveSeed(run, startIndex) or
 * deriveSeed(run, designIndex, sampleIndex)), an unsigned 32-bit integer.
 * Method: MurmurHash3_x86_32 over the 64-bit words of (runSeed, ...path), hash seed 0; the word
 * count enters the hash, so deriveSeed(s) and deriveSeed(s, 0) differ.
 * All arguments must be safe integers; the result depends on nothing else. Every step of the hash
 * is a bijection of its 32-bit state, so with all other arguments fixed, distinct values of any
 * one argument below 2³² give distinct seeds.
 * Example: deriveSeed(42, 0) !== deriveSeed(42, 1).
 */
export const deriveSeed = (runSeed: number, ...path: number[]): number => {
  checkSeedWord(runSeed, 'deriveSeed runSeed');
  const words: number[] = [];
  pushWords(words, runSeed);
  path.forEach((p, i) => {
    checkSeedWord(p, `deriveSeed path[${i}]`);
    pushWords(words, p);
  });
  return murmur3Words(words, 0);
};

/**
 * A seeded xoshiro128** stream. State is four 32-bit words filled from the seed by a Weyl
 * sequence through fmix32 (the splitmix construction), so nearby seeds give unrelated streams and
 * the state is never all zero (fmix32 is a bijection and the four inputs differ).
 */
export class Random {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal = Number.NaN;

  /** @param seed any safe integer (only its low 32 bits are used; derive seeds with deriveSeed). */
  constructor(seed: number) {
    checkSeedWord(seed, 'Random seed');
    const base = seed >>> 0;
    this.s0 = fmix32(base + GOLDEN_GAMMA_32);
    this.s1 = fmix32(base + 2 * GOLDEN_GAMMA_32);
    this.s2 = fmix32(base + 3 * GOLDEN_GAMMA_32);
    this.s3 = fmix32(base + 4 * GOLDEN_GAMMA_32);
  }

  /** Next 32-bit output of xoshiro128** (Blackman & Vigna 2021), an unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl32(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 = (this.s2 ^ this.s0) >>> 0;
    this.s3 = (this.s3 ^ this.s1) >>> 0;
    this.s1 = (this.s1 ^ this.s2) >>> 0;
    this.s0 = (this.s0 ^ this.s3) >>> 0;
    this.s2 = (this.s2 ^ t) >>> 0;
    this.s3 = rotl32(this.s3, 11);
    return result;
  }

  /** Uniform double in [0, 1) with 53 random bits (upper 27 + 26 bits of two outputs). */
  uniform(): number {
    const a = this.nextUint32() >>> 5;
    const b = this.nextUint32() >>> 6;
    return (a * 67108864 + b) * TWO_POW_MINUS_53;
  }

  /**
   * Standard normal deviate (mean 0, variance 1) by the polar method of G. Marsaglia and
   * T. A. Bray, SIAM Rev. 6, 260 (1964); the second deviate of each pair is kept for the next call.
   */
  normal(): number {
    if (!Number.isNaN(this.spareNormal)) {
      const spare = this.spareNormal;
      this.spareNormal = Number.NaN;
      return spare;
    }
    for (;;) {
      const u = 2 * this.uniform() - 1;
      const v = 2 * this.uniform() - 1;
      const s = u * u + v * v;
      if (s > 0 && s < 1) {
        const factor = Math.sqrt((-2 * Math.log(s)) / s);
        this.spareNormal = v * factor;
        return u * factor;
      }
    }
  }

  /**
   * Integer uniform on {0, …, n − 1} for a positive integer n ≤ 2³²: ⌊n · uniform()⌋, whose bias
   * is below n / 2⁵³ (≤ 5e-7 for the largest n), far under any Monte-Carlo resolution here.
   */
  int(n: number): number {
    if (!Number.isInteger(n) || n < 1 || n > TWO_POW_32) {
      throw new InputError(
        'bad-value',
        `Random.int: n must be an integer in [1, 2^32], got ${String(n)}; pass the number of choices`,
      );
    }
    return Math.floor(n * this.uniform());
  }
}
