/**
 * The 1-D solver against closed forms and equations solved independently in the test.
 */

import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 as C } from '../../engine/constants.js';
import { solveBand } from '../../engine/solver1d/states.js';
import { layer, message, midpointSlices, near, outer, profileOf, rootsOf } from './helpers.js';

const energies = (s: { states: readonly { energy: number }[] }): number[] => s.states.map((x) => x.energy);

/**
 * Energies Richardson-extrapolated in the slice width (midpoint slicing is second order):
 * E ≈ E(h/2) + (E(h/2) − E(h))/3 (L. F. Richardson, Phil. Trans. R. Soc. A 210, 307 (1911)).
 */
const extrapolated = (build: (h: number) => ReturnType<typeof profileOf>, h: number, maxStates: number): number[] => {
  const coarse = energies(solveBand(build(h), { maxStates }));
  return energies(solveBand(build(h / 2), { maxStates })).map((e, k) => e + (e - coarse[k]!) / 3);
};

/**
 * Square well of width L (V = 0, mass mw, alpha aw) in barriers V0 (mass mb, alpha ab), BenDaniel–Duke
 * matching (BenDaniel and Duke, Phys. Rev. 152, 683 (1966); G. Bastard, Wave Mechanics Applied to
 * Semiconductor Heterostructures (1988), ch. III): even k tan(kL/2)/mw = κ/mb, odd −k cot(kL/2)/mw = κ/mb,
 * written pole-free as k sin/mw − κ cos/mb = 0 and k cos/mw + κ sin/mb = 0, with the two-band masses
 * mw(E) = mw (1 + aw E), mb(E) = mb (1 + ab (E − V0)) inserted when alpha ≠ 0, the latter kept
 * above mb · floor when a floor is given.
 */
function squareWellLevels(L: number, V0: number, mw: number, mb: number, aw = 0, ab = 0, floor = -Infinity): number[] {
  const parts = (E: number): [number, number, number, number] => {
    const mwE = mw * (1 + aw * E);
    const mbE = mb * Math.max(1 + ab * (E - V0), floor);
    return [Math.sqrt((mwE * E) / C), Math.sqrt((mbE * (V0 - E)) / C), mwE, mbE];
  };
  const even = (E: number): number => {
    const [k, kap, a, b] = parts(E);
    return (k * Math.sin((k * L) / 2)) / a - (kap * Math.cos((k * L) / 2)) / b;
  };
  const odd = (E: number): number => {
    const [k, kap, a, b] = parts(E);
    return (k * Math.cos((k * L) / 2)) / a + (kap * Math.sin((k * L) / 2)) / b;
  };
  return [...rootsOf(even, 1e-12, V0 * (1 - 1e-12), 20000), ...rootsOf(odd, 1e-12, V0 * (1 - 1e-12), 20000)].sort((x, y) => x - y);
}

describe('finite square well with mass mismatch (BenDaniel–Duke matching)', () => {
  // GaAs-like well in Al0.3Ga0.7As-like barriers: V0 = 0.3 eV, mw = 0.067, mb = 0.092 (common practice, rounded).
  for (const L of [3, 8, 15]) {
    it(`L = ${L} nm: every level, even and odd, within 1e-10 eV of the transcendental roots`, () => {
      const expected = squareWellLevels(L, 0.3, 0.067, 0.092);
      const got = energies(solveBand(profileOf([layer(L, 0, 0.067)], outer(0.3, 0.092))));
      expect(got.length, message('state count', { L }, got.length, expected.length, 0)).toBe(expected.length);
      expect(expected.length).toBeGreaterThanOrEqual(L === 3 ? 1 : 2);
      got.forEach((e, k) => {
        expect(near(e, expected[k]!, 1e-10), message(`E${k + 1}`, { L }, e, expected[k]!, 1e-10)).toBe(true);
      });
    });
  }

  // Newton on the mismatch with its analytic derivative: 20 sweeps (Brent without the derivative took 32).
  it('pins the work for the 10 nm well (20 evaluations, three states)', () => {
    const s = solveBand(profileOf([layer(10, 0, 0.067)], outer(0.3, 0.092)));
    expect(s.states.length).toBe(3);
    expect(s.evaluations).toBe(20);
  });

  // The same well clad in 20 nm of its barrier material on each side: the same problem, so the same
  // levels (the closed form above); the claddings only test that the refinement stays smooth there.
  // Matched at the right edge alone, the mismatch is a step there and Brent fell back to bisection:
  // 132 evaluations, and levels off by up to 5e-13 eV; Brent at the well's edge took 38.
  it('clad in 20 nm barrier slices: the levels of the bare well within 1e-12 eV, in 20 evaluations', () => {
    const bare = energies(solveBand(profileOf([layer(10, 0, 0.067)], outer(0.3, 0.092))));
    const clad = solveBand(profileOf([layer(20, 0.3, 0.092), layer(10, 0, 0.067), layer(20, 0.3, 0.092)], outer(0.3, 0.092)));
    expect(clad.states.length).toBe(bare.length);
    clad.states.forEach((st, k) => {
      expect(near(st.energy, bare[k]!, 1e-12), message(`E${k + 1}`, { clad: '20 nm' }, st.energy, bare[k]!, 1e-12)).toBe(true);
    });
    expect(clad.evaluations).toBe(20);
  });
});

describe('infinite-barrier limit', () => {
  // E_n = ħ²π²n²/(2mL²) (common practice). For a finite barrier V0 of the same mass the exact condition is
  // kL = nπ − 2 atan(k/κ) (both parities), i.e. an effective width L + 2/κ to first order in k/κ with a
  // remainder of order (k/κ)³; so E_n (1 + 2/(κL))² / E∞ − 1 = O((k/κ)²) and the error against E∞ falls as V0^−1/2.
  const L = 10;
  const m = 0.067;
  for (const V0 of [1e3, 1e5]) {
    it(`V0 = ${V0} eV: penetration formula holds to (k/κ)²; levels lie below E∞`, () => {
      const got = energies(solveBand(profileOf([layer(L, 0, m)], outer(V0, m)), { maxStates: 4 }));
      got.forEach((e, k) => {
        const n = k + 1;
        const eInf = (C * Math.PI * Math.PI * n * n) / (m * L * L);
        const kap = Math.sqrt((m * (V0 - e)) / C);
        const kk = Math.sqrt((m * e) / C);
        const corrected = e * (1 + 2 / (kap * L)) ** 2;
        const tol = 2 * (kk / kap) ** 2 * eInf;
        expect(e).toBeLessThan(eInf);
        expect(near(corrected, eInf, tol), message(`E${n} (1 + 2/κL)²`, { V0, L, m }, corrected, eInf, tol)).toBe(true);
      });
    });
  }
  it('the error against E∞ falls as V0^−1/2 (ratio 10 per factor 100 in V0, within 1%)', () => {
    const err = (V0: number): number => {
      const e = solveBand(profileOf([layer(L, 0, m)], outer(V0, m)), { maxStates: 1 }).states[0]!.energy;
      return (C * Math.PI * Math.PI) / (m * L * L) - e;
    };
    const ratio = err(1e3) / err(1e5);
    expect(near(ratio, 10, 0.1), message('error ratio', { V0: [1e3, 1e5] }, ratio, 10, 0.1)).toBe(true);
  });
});

describe('parabolic well, sliced at midpoints and Richardson-extrapolated', () => {
  // V = a z²: E_n = ħω (n + ½) with ħω = 2 √(a ħ²/(2m0) / m) (common practice).
  const m = 0.067;
  const hw = 0.02;
  const a = (hw * hw * m) / (4 * C);
  const W = 60;
  const build = (h: number) => {
    const slices = midpointSlices((z) => a * (z - W) ** 2, 0, 2 * W, h, m);
    return profileOf(slices, outer(a * W * W, m));
  };
  it('E_n = ħω (n + ½) for n = 0..4 within 1e-7 eV after extrapolation from h = 1 nm', () => {
    const got = extrapolated(build, 1, 5);
    expect(got.length).toBe(5);
    got.forEach((e, n) => {
      const expected = hw * (n + 0.5);
      expect(near(e, expected, 1e-7), message(`E${n}`, { hw, h: 1 }, e, expected, 1e-7)).toBe(true);
    });
  });
  it('midpoint slicing is second order: halving h cuts the error fourfold (ratio 4 ± 0.2)', () => {
    const e = (h: number) => solveBand(build(h), { maxStates: 1 }).states[0]!.energy - hw / 2;
    const ratio = e(2) / e(1);
    expect(near(ratio, 4, 0.2), message('error ratio E(h)/E(h/2)', { h: 2 }, ratio, 4, 0.2)).toBe(true);
  });
});

describe('triangular well: hard wall and a uniform field', () => {
  // E_n = (ħ²(eF)²/2m)^{1/3} a_n with Airy zeros a_n from Abramowitz & Stegun Table 10.13 (from memory:
  // 2.33810741, 4.08794944, 5.52055983, 6.78670809). The wall is a barrier of 1e6 eV; its penetration depth
  // 1/κ moves the wall outwards, which for V = F z lowers every level by F/κ (from the effective width L + 2/κ
  // above). Residual after that correction: (F/κ)·(k/κ) ≪ 1e-7 eV.
  const airy = [2.33810741, 4.08794944, 5.52055983, 6.78670809];
  const m = 0.067;
  const F = 0.01; // eV/nm = 100 kV/cm
  const W = 80;
  const Vwall = 1e6;
  const build = (h: number) => profileOf(midpointSlices((z) => F * z, 0, W, h, m), outer(Vwall, m), outer(F * W, m));
  const expected = (e: number, k: number): number => Math.cbrt((C * F * F) / m) * airy[k]! - F / Math.sqrt((m * (Vwall - e)) / C);
  it('E_1..E_4 within 1e-6 eV (flat slices, Richardson from h = 0.2 nm)', () => {
    extrapolated(build, 0.2, 4).forEach((e, k) => {
      expect(near(e, expected(e, k), 1e-6), message(`E${k + 1}`, { F, m }, e, expected(e, k), 1e-6)).toBe(true);
    });
  });
  it('E_1..E_4 within 1e-8 eV on one linear slice (Airy transfer; the Airy zeros are given to 1e-8)', () => {
    const slope = profileOf([{ ...layer(W, (F * W) / 2, m), gradient: { V: F, mass: 0, alpha: 0 } }], outer(Vwall, m), outer(F * W, m));
    const got = energies(solveBand(slope, { maxStates: 4 }));
    expect(got.length).toBe(4);
    got.forEach((e, k) => {
      expect(near(e, expected(e, k), 1e-8), message(`E${k + 1}`, { F, m }, e, expected(e, k), 1e-8)).toBe(true);
    });
  });
});

describe('symmetric double well: tunnel splitting', () => {
  /**
   * Independent even/odd solve: with the middle of the barrier at z = 0, even states start there as
   * (ψ, ψ′/m) = (cosh κz, κ sinh κz / mb), odd as (sinh κz, κ cosh κz / mb); the well (width w) is crossed
   * with the closed-form cos/sin solution, and the outer barrier requires ψ′/m = −κψ/mb (BenDaniel–Duke).
   */
  function doubleWellLevels(w: number, b: number, V0: number, mw: number, mb: number): { even: number[]; odd: number[] } {
    const f = (parity: 0 | 1) => (E: number): number => {
      const k = Math.sqrt((mw * E) / C);
      const kap = Math.sqrt((mb * (V0 - E)) / C);
      const z1 = b / 2;
      const u = parity === 0 ? Math.cosh(kap * z1) : Math.sinh(kap * z1);
      const p = ((parity === 0 ? Math.sinh(kap * z1) : Math.cosh(kap * z1)) * kap) / mb;
      const u2 = u * Math.cos(k * w) + ((mw * p) / k) * Math.sin(k * w);
      const p2 = p * Math.cos(k * w) - (k / mw) * u * Math.sin(k * w);
      return p2 + (kap / mb) * u2;
    };
    return { even: rootsOf(f(0), 1e-12, V0 * (1 - 1e-12), 20000), odd: rootsOf(f(1), 1e-12, V0 * (1 - 1e-12), 20000) };
  }
  for (const b of [1, 3, 6]) {
    it(`w = 6 nm, barrier ${b} nm: E2 − E1 and E4 − E3 within 1e-10 eV`, () => {
      const [V0, mw, mb, w] = [0.25, 0.067, 0.088, 6];
      const ref = doubleWellLevels(w, b, V0, mw, mb);
      const got = energies(solveBand(profileOf([layer(w, 0, mw), layer(b, V0, mb), layer(w, 0, mw)], outer(V0, mb))));
      const expected = [...ref.even, ...ref.odd].sort((x, y) => x - y);
      expect(got.length).toBe(expected.length);
      for (const k of [0, 2]) {
        if (k + 1 >= got.length) continue;
        const split = got[k + 1]! - got[k]!;
        const splitRef = ref.odd[k / 2]! - ref.even[k / 2]!;
        expect(near(split, splitRef, 1e-10), message(`splitting E${k + 2} − E${k + 1}`, { b }, split, splitRef, 1e-10)).toBe(true);
      }
      got.forEach((e, k) => expect(near(e, expected[k]!, 1e-10), message(`E${k + 1}`, { b }, e, expected[k]!, 1e-10)).toBe(true));
    });
  }
  it('a 2 nm splitting is larger than a 6 nm one by roughly e^{2κΔb} (within a factor 2)', () => {
    const [V0, mw, mb, w] = [0.25, 0.067, 0.088, 6];
    const split = (b: number) => {
      const e = energies(solveBand(profileOf([layer(w, 0, mw), layer(b, V0, mb), layer(w, 0, mw)], outer(V0, mb)), { maxStates: 2 }));
      return { d: e[1]! - e[0]!, kap: Math.sqrt((mb * (V0 - e[0]!)) / C) };
    };
    const s2 = split(2);
    const s6 = split(6);
    const ratio = s2.d / s6.d;
    const expected = Math.exp(s2.kap * 4); // splitting ∝ e^{−κb} (common practice, tight-binding overlap)
    expect(ratio / expected, message('splitting ratio / e^{κΔb}', { b: [2, 6] }, ratio, expected, 2)).toBeGreaterThan(0.5);
    expect(ratio / expected).toBeLessThan(2);
  });
});

describe('Kronig–Penney minibands of a finite superlattice', () => {
  // cos(qd) = cos(ka) cosh(κb) + ½ (mw κ/(mb k) − mb k/(mw κ)) sin(ka) sinh(κb), d = a + b
  // (Kronig and Penney, Proc. R. Soc. A 130, 499 (1931), with the BenDaniel–Duke mass ratio: Bastard (1988)).
  const [a, b, V0, mw, mb] = [5, 2, 0.25, 0.067, 0.088];
  const kp = (E: number): number => {
    const k = Math.sqrt((mw * E) / C);
    const kap = Math.sqrt((mb * (V0 - E)) / C);
    const r = (mw * kap) / (mb * k);
    return Math.cos(k * a) * Math.cosh(kap * b) + 0.5 * (r - 1 / r) * Math.sin(k * a) * Math.sinh(kap * b);
  };
  const edges = [...rootsOf((E) => kp(E) - 1, 1e-9, V0 - 1e-9, 20000), ...rootsOf((E) => kp(E) + 1, 1e-9, V0 - 1e-9, 20000)]
    .sort((x, y) => x - y);
  const stack = (N: number) => {
    const slices = [];
    for (let i = 0; i < N; i++) {
      if (i > 0) slices.push(layer(b, V0, mb));
      slices.push(layer(a, 0, mw));
    }
    return profileOf(slices, outer(V0, mb));
  };
  it('the KP equation gives a first miniband below the barrier', () => {
    expect(edges.length).toBeGreaterThanOrEqual(2);
    expect(edges[1]! - edges[0]!).toBeGreaterThan(0.005);
  });
  for (const N of [5, 10, 20]) {
    it(`N = ${N} periods: exactly N states inside the first miniband [${edges[0]?.toFixed(5)}, ${edges[1]?.toFixed(5)}] eV`, () => {
      const got = energies(solveBand(stack(N)));
      const [lo, hi] = [edges[0]!, edges[1]!];
      const inside = got.filter((e) => e >= lo - 1e-9 && e <= hi + 1e-9);
      expect(inside.length, message('states in band', { N }, inside.length, N, 0)).toBe(N);
      expect(got.filter((e) => e < lo - 1e-9).length).toBe(0);
    });
  }
  it('the band edges are approached as N grows (gaps to the edges shrink roughly as 1/N²)', () => {
    const gap = (N: number): [number, number] => {
      const e = energies(solveBand(stack(N), { maxStates: N }));
      return [e[0]! - edges[0]!, edges[1]! - e[N - 1]!];
    };
    const g10 = gap(10);
    const g40 = gap(40);
    const width = edges[1]! - edges[0]!;
    for (const side of [0, 1]) {
      expect(g40[side]!).toBeGreaterThan(0);
      expect(g40[side]!).toBeLessThan(g10[side]! / 6);
      expect(g40[side]!, message('gap to the edge at N = 40', { side }, g40[side]!, 0, 0.01 * width)).toBeLessThan(0.01 * width);
    }
  });
});

describe('non-parabolic mass (two-band form)', () => {
  // Same BenDaniel–Duke matching with m(E) = mass (1 + alpha (E − V)) inserted (Nelson, Miller and Kleinman,
  // Phys. Rev. B 35, 7770 (1987) for the form). alpha values of the order of GaAs's (~0.6 /eV, from memory).
  const [L, V0, mw, mb] = [8, 0.3, 0.067, 0.092];
  for (const [aw, ab] of [[0.6, 0.3], [1.0, 0.0]] as const) {
    it(`alpha well ${aw}, barrier ${ab} /eV: every level within 1e-10 eV of the matching roots`, () => {
      const expected = squareWellLevels(L, V0, mw, mb, aw, ab);
      const got = energies(solveBand(profileOf([layer(L, 0, mw, aw)], outer(V0, mb, ab))));
      expect(got.length).toBe(expected.length);
      got.forEach((e, k) => expect(near(e, expected[k]!, 1e-10), message(`E${k + 1}`, { aw, ab }, e, expected[k]!, 1e-10)).toBe(true));
    });
  }
  it('alpha → 0 recovers the parabolic levels linearly (E(2α) − E0 = 2 (E(α) − E0) within 1%)', () => {
    // alpha in the well only: the well mass grows with E, so every level must come down.
    const solve = (alpha: number) => energies(solveBand(profileOf([layer(L, 0, mw, alpha)], outer(V0, mb))));
    const e0 = solve(0);
    const e1 = solve(1e-4);
    const e2 = solve(2e-4);
    e0.forEach((e, k) => {
      const d1 = e1[k]! - e;
      const d2 = e2[k]! - e;
      expect(d1).toBeLessThan(0); // a heavier mass lowers the level
      expect(near(d2 / d1, 2, 0.02), message(`E${k + 1} slope ratio`, { alpha: [1e-4, 2e-4] }, d2 / d1, 2, 0.02)).toBe(true);
    });
  });

  it('a barrier deeper than its own gap: the two-band mass is floored at 0.1 and every level matches the floored matching within 1e-10 eV', () => {
    // V0 = 3 eV above the well with alpha = 0.5 /eV (a 2 eV gap): below E = 1.2 eV the barrier's two-band
    // factor 1 + alpha (E − V0) falls under 0.1 and then below zero, where the single-band mass has no
    // meaning; the product keeps it at 0.1 (engine/solver1d.ts, twoBandFactor). This was refused as
    // bad input ("makes the mass non-positive") although such depths are reached by every state of a
    // well under a field across thick claddings.
    const [Ld, V0, mw, mb, ab] = [8, 3, 0.067, 0.092, 0.5];
    const expected = squareWellLevels(Ld, V0, mw, mb, 0, ab, 0.1);
    const got = energies(solveBand(profileOf([layer(Ld, 0, mw)], outer(V0, mb, ab))));
    expect(got.length, message('state count', { V0, ab }, got.length, expected.length, 0)).toBe(expected.length);
    expect(expected.filter((e) => 1 + ab * (e - V0) < 0.1).length).toBeGreaterThan(1);
    got.forEach((e, k) => expect(near(e, expected[k]!, 1e-10), message(`E${k + 1}`, { V0, ab }, e, expected[k]!, 1e-10)).toBe(true));
  });
});
