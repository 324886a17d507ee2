/**
 * Anderson mixing for a fixed point x = g(x) (the self-consistent potential): from the current
 * input x_k and residual f_k = g(x_k) − x_k, with the last `depth` differences Δx_j, Δf_j of inputs
 * and residuals,
 *   γ = argmin ‖f_k − ΔF γ‖₂,   x_{k+1} = x_k + β f_k − (ΔX + β ΔF) γ
 * (D. G. Anderson, J. ACM 12, 547 (1965); the form of V. Eyert, J. Comput. Phys. 124, 271 (1996)).
 * With no history it is the damped step x_k + β f_k. The small least-squares problem is solved by
 * its normal equations with a relative ridge of 1e-12 (the columns of a converging history become
 * nearly parallel).
 */

export interface Mixer {
  /** The next input from the current input x and its residual f = g(x) − x (same length). */
  next(x: Float64Array, f: Float64Array): Float64Array;
}

/** Solves a small dense system A x = r in place (A and r are overwritten) by Gaussian elimination with partial pivoting. */
export function solveDense(A: Float64Array[], r: Float64Array): Float64Array {
  const m = r.length;
  for (let c = 0; c < m; c++) {
    let p = c;
    for (let i = c + 1; i < m; i++) if (Math.abs(A[i]![c]!) > Math.abs(A[p]![c]!)) p = i;
    [A[c], A[p]] = [A[p]!, A[c]!];
    [r[c], r[p]] = [r[p]!, r[c]!];
    for (let i = c + 1; i < m; i++) {
      const q = A[i]![c]! / A[c]![c]!;
      for (let j = c; j < m; j++) A[i]![j] = A[i]![j]! - q * A[c]![j]!;
      r[i] = r[i]! - q * r[c]!;
    }
  }
  const x = new Float64Array(m);
  for (let i = m - 1; i >= 0; i--) {
    let s = r[i]!;
    for (let j = i + 1; j < m; j++) s -= A[i]![j]! * x[j]!;
    x[i] = s / A[i]![i]!;
  }
  return x;
}

/** An Anderson mixer with parameter beta (0 < β ≤ 1) keeping `depth` previous steps. */
export function andersonMixer(beta: number, depth: number): Mixer {
  const dx: Float64Array[] = [];
  const df: Float64Array[] = [];
  let lastX: Float64Array | undefined;
  let lastF: Float64Array | undefined;
  return {
    next(x, f) {
      const n = x.length;
      if (lastX && lastF) {
        const a = new Float64Array(n);
        const b = new Float64Array(n);
        for (let i = 0; i < n; i++) { a[i] = x[i]! - lastX[i]!; b[i] = f[i]! - lastF[i]!; }
        dx.push(a);
        df.push(b);
        if (dx.length > depth) { dx.shift(); df.shift(); }
      }
      lastX = Float64Array.from(x);
      lastF = Float64Array.from(f);
      const out = new Float64Array(n);
      for (let i = 0; i < n; i++) out[i] = x[i]! + beta * f[i]!;
      const m = df.length;
      if (m === 0) return out;
      const dot = (p: Float64Array, q: Float64Array): number => { let s = 0; for (let i = 0; i < n; i++) s += p[i]! * q[i]!; return s; };
      const A = df.map((p) => Float64Array.from(df, (q) => dot(p, q)));
      let trace = 0;
      for (let j = 0; j < m; j++) trace += A[j]![j]!;
      if (!(trace > 0)) return out;
      for (let j = 0; j < m; j++) A[j]![j]! += 1e-12 * trace;
      const gamma = solveDense(A, Float64Array.from(df, (p) => dot(p, f)));
      for (let j = 0; j < m; j++) {
        const g = gamma[j]!;
        if (!Number.isFinite(g)) continue;
        const a = dx[j]!;
        const b = df[j]!;
        for (let i = 0; i < n; i++) out[i] = out[i]! - g * (a[i]! + beta * b[i]!);
      }
      return out;
    },
  };
}
