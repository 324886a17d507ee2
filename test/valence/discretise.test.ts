import { describe, expect, it } from 'vitest';
import { bandAt, blockOperators, valenceGrid } from '../../engine/valence/discretise.js';
import { bandWork, highestEigenpairs, type Band } from '../../engine/valence/banded.js';
import { blocksOf, pointCoefficients } from '../../engine/valence/hamiltonian.js';
import { valenceProfile } from '../../engine/valence/profile.js';
import { symmetricEigen } from '../../engine/solver2d/dense.js';
import { stack } from './helpers.js';

/** Dense symmetric matrix of a lower-band matrix. */
function dense(b: Band): Float64Array {
  const out = new Float64Array(b.n * b.n);
  for (let r = 0; r < b.n; r++) for (let c = Math.max(0, r - b.bw); c <= r; c++) {
    const v = b.data[r * (b.bw + 1) + r - c]!;
    out[r * b.n + c] = v;
    out[c * b.n + r] = v;
  }
  return out;
}

/** A reproducible pseudo-random symmetric band matrix (linear congruential sequence). */
function randomBand(n: number, bw: number, seed: number): Band {
  let s = seed >>> 0;
  const data = new Float64Array(n * (bw + 1));
  for (let i = 0; i < data.length; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    data[i] = s / 4294967296 - 0.5;
  }
  return { n, bw, data };
}

describe('highest eigenpairs of a symmetric band matrix against dense Jacobi (engine/solver2d/dense.ts)', () => {
  it('cold start, random matrices of bandwidth 3, 5, 11', () => {
    for (const [n, bw, seed] of [[80, 3, 1], [90, 5, 2], [132, 11, 3]] as const) {
      const b = randomBand(n, bw, seed);
      const want = Array.from(symmetricEigen(dense(b), n).values).reverse().slice(0, 6);
      const got = highestEigenpairs(b, 6, bandWork(n, bw), 1e-12);
      want.forEach((w, i) => expect(Math.abs(got.values[i]! - w)).toBeLessThan(1e-10));
    }
  });

  it('exact pairs (two interleaved copies, as Kramers pairs in the full 4×4) and a warm start from a nearby matrix', () => {
    const base = randomBand(50, 1, 7);
    const n = 100;
    const data = new Float64Array(n * 4);
    // Entry (2i + s, 2j + s) = base(i, j): bandwidth 3, every eigenvalue twice.
    for (let i = 0; i < 50; i++) for (let d = 0; d <= 1; d++) {
      if (i - d < 0) continue;
      for (const sp of [0, 1]) data[(2 * i + sp) * 4 + 2 * d] = base.data[i * 2 + d]!;
    }
    const b: Band = { n, bw: 3, data };
    const want = Array.from(symmetricEigen(dense(b), n).values).reverse().slice(0, 6);
    const cold = highestEigenpairs(b, 6, bandWork(n, 3), 1e-12);
    want.forEach((w, i) => expect(Math.abs(cold.values[i]! - w)).toBeLessThan(1e-10));
    const moved: Band = { n, bw: 3, data: data.map((v, i) => (i % 4 === 0 ? v + 1e-3 * Math.sin(i) : v)) };
    const warm = highestEigenpairs(moved, 6, bandWork(n, 3), 1e-12, cold);
    const want2 = Array.from(symmetricEigen(dense(moved), n).values).reverse().slice(0, 6);
    want2.forEach((w, i) => expect(Math.abs(warm.values[i]! - w)).toBeLessThan(1e-10));
    // The warm start pays for itself: far fewer factorisations than the bisection of the cold one.
    expect(warm.factorisations).toBeLessThan(cold.factorisations / 3);
  });
});

describe('box-integration discretisation', () => {
  // A stack with two kinds of interface (GaAs/AlGaAs and strained InGaAs/GaAs), graded outer cells.
  const s = stack([{ material: 'Al0.3Ga0.7As', thickness_nm: 6 }, { material: 'GaAs', thickness_nm: 2.3 }, { material: 'In0.2Ga0.8As', thickness_nm: 3.1 }, { material: 'Al0.3Ga0.7As', thickness_nm: 5 }]);

  /**
   * The operator assembled row by row from each node's own dual cell, in complex arithmetic with
   * B = i k B1 (module comment of discretise.ts), without assuming any symmetry: its Hermiticity is
   * then a property of the scheme and of the Burt–Foreman ordering, not of the storage.
   */
  function rowwise(model: 'kp4' | 'kp6', phi: number, k: number): { re: Float64Array; im: Float64Array; n: number } {
    const p = valenceProfile(s, { model, maxSlice_nm: 0.5, outer_nm: 0 });
    const g = valenceGrid(p, 0.5);
    const cs = p.slices.map((sl) => pointCoefficients(sl.point, model, phi, false));
    const d = cs[0]!.d;
    const nodes = g.widths.length - 1;
    const n = nodes * d;
    const re = new Float64Array(n * n);
    const im = new Float64Array(n * n);
    const add = (r: number, c: number, vr: number, vi: number): void => {
      re[r * n + c] = re[r * n + c]! + vr;
      im[r * n + c] = im[r * n + c]! + vi;
    };
    for (let i = 0; i < nodes; i++) {
      const hl = g.widths[i]!;
      const hr = g.widths[i + 1]!;
      const L = cs[g.slice[i]!]!;
      const R = cs[g.slice[i + 1]!]!;
      const w = 0.5 * (hl + hr);
      for (let a = 0; a < d; a++) for (let b = 0; b < d; b++) {
        const ab = a * d + b;
        const ba = b * d + a;
        // B = i k B1, B† = −i k B1ᵀ.
        const Bl = k * L.B1[ab]!;
        const Br = k * R.B1[ab]!;
        const BlT = k * L.B1[ba]!;
        const BrT = k * R.B1[ba]!;
        // k_z C k_z and A.
        add(i * d + a, i * d + b, (L.C[ab]! / hl + R.C[ab]! / hr + 0.5 * hl * (L.A0[ab]! + k * k * L.A2[ab]!) + 0.5 * hr * (R.A0[ab]! + k * k * R.A2[ab]!)) / w, 0);
        if (i + 1 < nodes) add(i * d + a, (i + 1) * d + b, -R.C[ab]! / hr / w, 0);
        if (i > 0) add(i * d + a, (i - 1) * d + b, -L.C[ab]! / hl / w, 0);
        // k_z B† ψ → −i[B_r†(ψ_i + ψ_{i+1})/2 − B_l†(ψ_{i−1} + ψ_i)/2]; −i·(−i k B1ᵀ) = −k B1ᵀ.
        add(i * d + a, i * d + b, (-0.5 * BrT + 0.5 * BlT) / w, 0);
        if (i + 1 < nodes) add(i * d + a, (i + 1) * d + b, -0.5 * BrT / w, 0);
        if (i > 0) add(i * d + a, (i - 1) * d + b, 0.5 * BlT / w, 0);
        // B k_z ψ → −i[B_l(ψ_i − ψ_{i−1})/2 + B_r(ψ_{i+1} − ψ_i)/2]; −i·(i k B1) = k B1.
        add(i * d + a, i * d + b, (0.5 * Bl - 0.5 * Br) / w, 0);
        if (i + 1 < nodes) add(i * d + a, (i + 1) * d + b, 0.5 * Br / w, 0);
        if (i > 0) add(i * d + a, (i - 1) * d + b, -0.5 * Bl / w, 0);
      }
    }
    // Symmetrise the generalised problem: x = w^{1/2} ψ.
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) {
      const wr = 0.5 * (g.widths[Math.floor(r / d)]! + g.widths[Math.floor(r / d) + 1]!);
      const wc = 0.5 * (g.widths[Math.floor(c / d)]! + g.widths[Math.floor(c / d) + 1]!);
      const f = Math.sqrt(wr / wc);
      re[r * n + c] = re[r * n + c]! * f;
      im[r * n + c] = im[r * n + c]! * f;
    }
    return { re, im, n };
  }

  it('is Hermitian (here real symmetric) at interfaces and on the graded grid, kp4 and kp6, [100] and 22.5°', () => {
    for (const model of ['kp4', 'kp6'] as const) for (const phi of [0, Math.PI / 8]) {
      const { re, im, n } = rowwise(model, phi, 0.7);
      let worst = 0;
      let scale = 0;
      for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) {
        worst = Math.max(worst, Math.abs(re[r * n + c]! - re[c * n + r]!), Math.abs(im[r * n + c]! + im[c * n + r]!), Math.abs(im[r * n + c]!));
        scale = Math.max(scale, Math.abs(re[r * n + c]!));
      }
      expect(worst).toBeLessThan(1e-14 * scale);
    }
  });

  it('the banded block operators are that matrix: same spectrum as the full operator, split or not', () => {
    const model = 'kp4';
    const { re, n } = rowwise(model, 0, 0.7);
    const top = Array.from(symmetricEigen(re, n).values).reverse().slice(0, 6);
    const p = valenceProfile(s, { model, maxSlice_nm: 0.5, outer_nm: 0 });
    const g = valenceGrid(p, 0.5);
    const full = blockOperators(p, g, model, 0, false, [[0, 1, 2, 3]])[0]!;
    const fb: Band = { n: full.n, bw: full.bw, data: bandAt(full, 0.7, new Float64Array(full.base.length)) };
    const fe = highestEigenpairs(fb, 6, bandWork(fb.n, fb.bw), 1e-12).values;
    const split = blockOperators(p, g, model, 0, false, blocksOf(model)).flatMap((op) => {
      const b: Band = { n: op.n, bw: op.bw, data: bandAt(op, 0.7, new Float64Array(op.base.length)) };
      return Array.from(highestEigenpairs(b, 3, bandWork(b.n, b.bw), 1e-12).values);
    }).sort((a, b) => b - a);
    top.forEach((v, i) => {
      expect(Math.abs(fe[i]! - v)).toBeLessThan(1e-10);
      expect(Math.abs(split[i]! - v)).toBeLessThan(1e-10);
    });
  });
});

describe('the two blocks', () => {
  it('are degenerate in a well symmetric about its centre (so one is solved), and split under a field', async () => {
    const { valenceSubbands } = await import('../../engine/valence/dispersion.js');
    const sym = stack([{ material: 'Al0.3Ga0.7As', thickness_nm: 20 }, { material: 'GaAs', thickness_nm: 8 }, { material: 'Al0.3Ga0.7As', thickness_nm: 20 }]);
    const opts = { kPoints: 9, kMax_per_nm: 0.8, directions: ['[100]', '[110]'] as const };
    const once = valenceSubbands(sym, { ...opts, directions: [...opts.directions] });
    const both = valenceSubbands(sym, { ...opts, directions: [...opts.directions], bothBlocks: true });
    both.directions.forEach((d, di) => d.subbands.forEach((sb, j) => {
      for (let i = 0; i < 9; i++) {
        expect(Math.abs(sb.energy_eV[1][i]! - sb.energy_eV[0][i]!)).toBeLessThan(1e-9);
        expect(Math.abs(once.directions[di]!.subbands[j]!.energy_eV[1][i]! - sb.energy_eV[1][i]!)).toBeLessThan(1e-9);
      }
    }));
    expect(once.factorisations).toBeLessThan(0.7 * both.factorisations);
    const tilted = stack([{ material: 'Al0.3Ga0.7As', thickness_nm: 20 }, { material: 'GaAs', thickness_nm: 8 }, { material: 'Al0.3Ga0.7As', thickness_nm: 20 }], 300, 50);
    const f = valenceSubbands(tilted, { kPoints: 9, kMax_per_nm: 0.8, directions: ['[100]'] });
    const hh1 = f.directions[0]!.subbands[0]!;
    // Kramers-degenerate at k∥ = 0, split at k∥ ≠ 0 by the field's inversion asymmetry.
    expect(Math.abs(hh1.energy_eV[1][0]! - hh1.energy_eV[0][0]!)).toBeLessThan(1e-9);
    expect(Math.abs(hh1.energy_eV[1][4]! - hh1.energy_eV[0][4]!)).toBeGreaterThan(1e-5);
  });
});
