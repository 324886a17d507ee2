import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { symmetricEigen } from '../../engine/solver2d.js';
import { expectClose } from './helpers.js';

describe('symmetricEigen (dense Jacobi for Rayleigh–Ritz)', () => {
  it('2×2 [[2,1],[1,2]] has eigenvalues 1 and 3 (closed form)', () => {
    const { values, vectors } = symmetricEigen([2, 1, 1, 2], 2);
    expectClose(values[0], 1, 1e-14, '[[2,1],[1,2]] λ1');
    expectClose(values[1], 3, 1e-14, '[[2,1],[1,2]] λ2');
    expectClose(Math.abs(vectors[0]), Math.SQRT1_2, 1e-14, 'first eigenvector component');
    expectClose(vectors[0] * vectors[2], -0.5, 1e-14, 'first eigenvector is ±[1,−1]/√2');
  });

  it('tridiagonal (−1, 2, −1) of size n has eigenvalues 2 − 2cos(kπ/(n+1)) (closed form, common practice)', () => {
    for (const n of [1, 5, 17, 40]) {
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) {
        a[i * n + i] = 2;
        if (i + 1 < n) {
          a[i * n + i + 1] = -1;
          a[(i + 1) * n + i] = -1;
        }
      }
      const { values } = symmetricEigen(a, n);
      for (let k = 1; k <= n; k++) expectClose(values[k - 1], 2 - 2 * Math.cos((k * Math.PI) / (n + 1)), 1e-13, `n=${n} k=${k}`);
    }
  });

  it('the all-ones n×n matrix has eigenvalue n once and 0 (n−1 times) (closed form: rank one)', () => {
    const n = 9;
    const { values } = symmetricEigen(new Float64Array(n * n).fill(1), n);
    for (let k = 0; k < n - 1; k++) expectClose(values[k], 0, 1e-13, `ones λ${k}`);
    expectClose(values[n - 1], n, 1e-13, 'ones λmax');
  });

  it('random symmetric matrices: A v = λ v, V orthonormal, trace preserved (definition of the eigen-decomposition)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 24 }),
        fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 576, maxLength: 576 }),
        (n, raw) => {
          const a = new Float64Array(n * n);
          for (let i = 0; i < n; i++) for (let j = i; j < n; j++) a[i * n + j] = a[j * n + i] = raw[i * 24 + j];
          const { values, vectors } = symmetricEigen(a, n);
          let trace = 0;
          for (let i = 0; i < n; i++) trace += a[i * n + i];
          expectClose(values.reduce((s, v) => s + v, 0), trace, 1e-10 * (1 + Math.abs(trace)) + 1e-9, `n=${n} trace`);
          for (let k = 0; k < n; k++) {
            if (k > 0) expect(values[k] >= values[k - 1], `n=${n}: values not ascending at ${k}`).toBe(true);
            for (let i = 0; i < n; i++) {
              let av = 0;
              for (let j = 0; j < n; j++) av += a[i * n + j] * vectors[j * n + k];
              expectClose(av, values[k] * vectors[i * n + k], 1e-10 * 100, `n=${n} residual row ${i} vector ${k}`);
            }
            for (let l = 0; l <= k; l++) {
              let d = 0;
              for (let i = 0; i < n; i++) d += vectors[i * n + k] * vectors[i * n + l];
              expectClose(d, k === l ? 1 : 0, 1e-12, `n=${n} ⟨v${k}, v${l}⟩`);
            }
          }
        },
      ),
      { numRuns: 20, seed: 7 },
    );
  });
});
