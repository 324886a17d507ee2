import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bulkEmbedding, blocksOf, pointCoefficients, type ValencePoint } from '../../engine/valence/hamiltonian.js';
import { shearFromSplit } from '../../engine/valence/profile.js';
import { symmetricEigen } from '../../engine/solver2d/dense.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { alloyAt, biaxialStrain, edgeShifts, lightHoleShift, parseFormula } from '../../materials/index.js';

const eigenvalues = (m: Float64Array, n: number): number[] => Array.from(symmetricEigen(m, n).values);

/** GaAs Luttinger parameters (VMR2001, from memory) at its unstrained edge. */
const GAAS: ValencePoint = { Ehh: -0.8, Elh: -0.8, gamma1: 6.98, gamma2: 2.06, gamma3: 2.93, Dso: 0.341, Qe: 0 };

/**
 * Bulk Luttinger dispersion, closed form (J. M. Luttinger, Phys. Rev. 102, 1030 (1956); S. L. Chuang,
 * Physics of Optoelectronic Devices, Sec. 4.5; from memory):
 * E = Ev − (ħ²/2m0)[γ1 k² ∓ √(4γ2² k⁴ + 12(γ3² − γ2²)(kx²ky² + ky²kz² + kz²kx²))].
 */
function luttinger(p: ValencePoint, kx: number, ky: number, kz: number): [number, number] {
  const k2 = kx * kx + ky * ky + kz * kz;
  const root = Math.sqrt(4 * p.gamma2 ** 2 * k2 * k2 + 12 * (p.gamma3 ** 2 - p.gamma2 ** 2) * (kx * kx * ky * ky + ky * ky * kz * kz + kz * kz * kx * kx));
  return [p.Ehh - HBAR2_OVER_2M0 * (p.gamma1 * k2 - root), p.Ehh - HBAR2_OVER_2M0 * (p.gamma1 * k2 + root)];
}

describe('bulk 4×4 Hamiltonian against the closed-form Luttinger dispersion', () => {
  it('every direction of k, random Luttinger parameters (property)', () => {
    fc.assert(fc.property(
      fc.double({ min: 3, max: 20, noNaN: true }), fc.double({ min: 0.1, max: 0.45, noNaN: true }), fc.double({ min: -0.3, max: 0.3, noNaN: true }),
      fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), fc.double({ min: 0, max: 0.8, noNaN: true }), fc.double({ min: -0.8, max: 0.8, noNaN: true }),
      (g1, r2, w, phi, k, kz) => {
        // γ2 = r2·γ1 (< γ1/2 keeps both bands falling), warping γ3 − γ2 = w·γ2.
        const g2 = r2 * g1;
        const p: ValencePoint = { ...GAAS, gamma1: g1, gamma2: g2, gamma3: g2 * (1 + w) };
        const e = eigenvalues(bulkEmbedding(pointCoefficients(p, 'kp4', phi, false), k, kz), 8);
        const [up, down] = luttinger(p, k * Math.cos(phi), k * Math.sin(phi), kz);
        // Each band twice (Kramers), twice again (the real embedding): 4 × down then 4 × up.
        for (let i = 0; i < 4; i++) expect(Math.abs(e[i]! - down)).toBeLessThan(1e-12);
        for (let i = 4; i < 8; i++) expect(Math.abs(e[i]! - up)).toBeLessThan(1e-12);
      },
    ), { numRuns: 200, seed: 13 });
  });

  it('axial approximation: in-plane isotropic with γ̄ = (γ2 + γ3)/2, and exact along [100] when γ2 = γ3', () => {
    const at = (phi: number): number[] => eigenvalues(bulkEmbedding(pointCoefficients(GAAS, 'kp4', phi, true), 0.5, 0.2), 8);
    const a = at(0);
    for (const phi of [0.3, Math.PI / 4, 1.2]) at(phi).forEach((v, i) => expect(Math.abs(v - a[i]!)).toBeLessThan(1e-12));
    const spherical = { ...GAAS, gamma3: GAAS.gamma2 };
    const e = eigenvalues(bulkEmbedding(pointCoefficients(spherical, 'kp4', 0.7, true), 0.5, 0.3), 8);
    const [up, down] = luttinger(spherical, 0.5 * Math.cos(0.7), 0.5 * Math.sin(0.7), 0.3);
    expect(Math.abs(e[0]! - down)).toBeLessThan(1e-12);
    expect(Math.abs(e[7]! - up)).toBeLessThan(1e-12);
  });
});

describe('6×6 model', () => {
  it('k = 0 edges of strained In0.2Ga0.8As on GaAs equal the Bir–Pikus edges of materials/strain.ts (Chuang PRB 43, 9649)', () => {
    const p = alloyAt(parseFormula('In0.2Ga0.8As'), 300);
    const sub = alloyAt(parseFormula('GaAs'), 300);
    const s = biaxialStrain(p.a_nm, sub.a_nm, p.C11, p.C12);
    const sh = edgeShifts(p, s);
    const Ehh = p.VBO + sh.dEhh;
    const Elh = p.VBO + sh.dElh;
    const point: ValencePoint = { Ehh, Elh, gamma1: p.gamma1, gamma2: p.gamma2, gamma3: p.gamma3, Dso: p.Dso, Qe: shearFromSplit(Elh - Ehh, p.Dso) };
    expect(Math.abs(point.Qe - sh.Qe)).toBeLessThan(1e-14);
    const e = eigenvalues(bulkEmbedding(pointCoefficients(point, 'kp6', 0, false), 0, 0), 12);
    // so (×4), lh (×4), hh (×4), ascending; compressive: hh on top.
    const Ev = p.VBO - p.av * s.trace;
    const so = Ev + 0.5 * (sh.Qe - p.Dso - Math.sqrt(p.Dso ** 2 + 2 * p.Dso * sh.Qe + 9 * sh.Qe ** 2));
    expect(Math.abs(e[11]! - Ehh)).toBeLessThan(1e-12);
    expect(Math.abs(e[7]! - Elh)).toBeLessThan(1e-12);
    expect(Math.abs(e[7]! - (Ev + lightHoleShift(sh.Qe, p.Dso)))).toBeLessThan(1e-12);
    expect(Math.abs(e[0]! - so)).toBeLessThan(1e-12);
  });

  it('unstrained: the split-off band lies Δso below, and the upper bands follow Luttinger as Δso → ∞', () => {
    const e = eigenvalues(bulkEmbedding(pointCoefficients(GAAS, 'kp6', 0, false), 0, 0), 12);
    expect(Math.abs(e[0]! - (GAAS.Ehh - GAAS.Dso))).toBeLessThan(1e-12);
    const far = { ...GAAS, Dso: 1e6 };
    const f = eigenvalues(bulkEmbedding(pointCoefficients(far, 'kp6', 0.4, false), 0.4, 0.3), 12);
    const [up, down] = luttinger(far, 0.4 * Math.cos(0.4), 0.4 * Math.sin(0.4), 0.3);
    expect(Math.abs(f[11]! - up)).toBeLessThan(1e-7);
    expect(Math.abs(f[4]! - down)).toBeLessThan(1e-7);
  });
});

describe('T(φ) basis: real matrices, and two blocks where the mirror symmetry holds', () => {
  const coupling = (model: 'kp4' | 'kp6', phi: number, axial: boolean): number => {
    const c = pointCoefficients({ ...GAAS, Qe: -0.03 }, model, phi, axial);
    const [u, l] = blocksOf(model);
    let worst = 0;
    for (const M of [c.A0, c.A2, c.B1, c.C]) for (const i of u!) for (const j of l!) worst = Math.max(worst, Math.abs(M[i * c.d + j]!), Math.abs(M[j * c.d + i]!));
    return worst;
  };
  it('axial at any angle and full along [100], [110] decouple to rounding; full at 22.5° does not', () => {
    for (const model of ['kp4', 'kp6'] as const) {
      for (const phi of [0.3, 1.1, 2.5]) expect(coupling(model, phi, true)).toBeLessThan(1e-15);
      for (const phi of [0, Math.PI / 4, Math.PI / 2, -Math.PI / 4]) expect(coupling(model, phi, false)).toBeLessThan(1e-15);
      expect(coupling(model, Math.PI / 8, false)).toBeGreaterThan(1e-4);
    }
  });
});
