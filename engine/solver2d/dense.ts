/**
 * Small dense symmetric eigen-solver for the Rayleigh–Ritz step of the sparse solver and for
 * tiny grids.
 */

/** Eigen-decomposition of a real symmetric matrix: eigenvalues ascending, eigenvectors as columns. */
export interface SymmetricEigen {
  /** Eigenvalues, ascending (units of the matrix). */
  readonly values: Float64Array;
  /** Orthonormal eigenvectors, column k in entries k, n + k, 2n + k, … (row-major n × n). */
  readonly vectors: Float64Array;
}

/**
 * Eigenvalues and eigenvectors of a real symmetric n × n matrix (row-major).
 *
 * Cyclic Jacobi rotations with the threshold strategy and the stable rotation formulas of
 * H. Rutishauser, Numer. Math. 9, 1 (1966) (also Wilkinson & Reinsch, Handbook for Automatic
 * Computation II, contribution II/1): each rotation zeros one off-diagonal pair; sweeps repeat
 * until the off-diagonal part is below rounding relative to the diagonal. Jacobi is chosen over
 * tridiagonal QL because it delivers eigenvectors orthonormal to rounding and small eigenvalues to
 * high relative accuracy, and the projected problems here are at most a few tens in size.
 * Only the upper triangle is read. Cost O(n³) per sweep, typically 6–10 sweeps.
 *
 * Example: [[2, 1], [1, 2]] → values [1, 3], vectors ±[1, −1]/√2 and ±[1, 1]/√2.
 */
export function symmetricEigen(matrix: ArrayLike<number>, n: number): SymmetricEigen {
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      a[i * n + j] = matrix[i * n + j];
      a[j * n + i] = matrix[i * n + j];
    }
  }
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = a[i * n + i];

  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += d[i] * d[i];
      for (let j = i + 1; j < n; j++) off += a[i * n + j] * a[i * n + j];
    }
    if (off === 0 || off <= 1e-32 * diag) break;
    // Early sweeps skip small elements (Rutishauser's threshold) so large ones are removed first.
    const threshold = sweep < 3 ? (0.2 * Math.sqrt(off)) / (n * n) : 0;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (Math.abs(apq) <= threshold || apq === 0) continue;
        const theta = (d[q] - d[p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        const tau = s / (1 + c);
        d[p] -= t * apq;
        d[q] += t * apq;
        a[p * n + q] = 0;
        a[q * n + p] = 0;
        for (let r = 0; r < n; r++) {
          if (r === p || r === q) continue;
          const arp = a[r * n + p];
          const arq = a[r * n + q];
          const np = arp - s * (arq + tau * arp);
          const nq = arq + s * (arp - tau * arq);
          a[r * n + p] = np;
          a[p * n + r] = np;
          a[r * n + q] = nq;
          a[q * n + r] = nq;
        }
        for (let r = 0; r < n; r++) {
          const vrp = v[r * n + p];
          const vrq = v[r * n + q];
          v[r * n + p] = vrp - s * (vrq + tau * vrp);
          v[r * n + q] = vrq + s * (vrp - tau * vrq);
        }
      }
    }
  }

  const order = Array.from({ length: n }, (_, k) => k).sort((x, y) => d[x] - d[y]);
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  order.forEach((src, k) => {
    values[k] = d[src];
    for (let r = 0; r < n; r++) vectors[r * n + k] = v[r * n + src];
  });
  return { values, vectors };
}
