/**
 * The Poisson step against closed forms (acceptance: to 1e-9 eV): a sheet's linear field, two
 * opposite sheets (a capacitor), and a symmetric doped slab's parabola between two compensating
 * sheets, across layers of different static permittivity; then random slabs and sheets on random
 * meshes, against the piecewise-quadratic closed form of Gauss's law,
 *   ε_r(z) dU/dz = (e/ε0) Q(z),  Q(z) = net charge per area left of z,  U(0) = 0,
 * which linear finite elements must meet exactly at the nodes.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dopingLoads, E_OVER_EPS0_V_NM, poissonMesh, solvePoisson } from '../../engine/poisson/poisson.js';
import type { DopingProfile } from '../../engine/poisson/doping.js';
import { ELEMENTARY_CHARGE_C, EPSILON0_F_PER_M } from '../../engine/constants.js';
import { expectClose } from '../observables/close.js';

/** Al0.3Ga0.7As | GaAs | Al0.3Ga0.7As static permittivities (materials/dielectric.ts: 12.9 − 2.84x). */
const LAYERS = [{ thickness_nm: 20, permittivity: 12.048 }, { thickness_nm: 10, permittivity: 12.9 }, { thickness_nm: 20, permittivity: 12.048 }];
const K = E_OVER_EPS0_V_NM;

const profile = (segments: DopingProfile['segments'], sheets: DopingProfile['sheets']): DopingProfile => ({ segments, sheets, donors_cm2: 0, acceptors_cm2: 0, net_cm2: 0 });

/**
 * U at z by the closed form: between consecutive breakpoints (layer edges, slab edges, sheets) Q is
 * linear and ε constant, so each piece adds (Q_a Δ + N Δ²/2)/ε exactly.
 */
function closedForm(layers: typeof LAYERS, d: DopingProfile, z: number): number {
  const edges = [0];
  for (const l of layers) edges.push(edges[edges.length - 1]! + l.thickness_nm);
  const eps = (x: number): number => layers[Math.min(edges.findIndex((e) => e > x) - 1, layers.length - 1)]!.permittivity;
  const density = (x: number): number => d.segments.reduce((n, s) => n + (x > s.z0_nm && x < s.z1_nm ? s.density_nm3 : 0), 0);
  const breaks = [...new Set([...edges, ...d.segments.flatMap((s) => [s.z0_nm, s.z1_nm]), ...d.sheets.map((s) => s.z_nm), z])].filter((x) => x >= 0 && x <= z).sort((a, b) => a - b);
  let U = 0;
  let Q = d.sheets.filter((s) => s.z_nm === 0).reduce((q, s) => q + s.density_nm2, 0);
  for (let i = 0; i + 1 < breaks.length; i++) {
    const a = breaks[i]!;
    const b = breaks[i + 1]!;
    const mid = (a + b) / 2;
    const N = density(mid);
    U += (K * (Q * (b - a) + (N * (b - a) ** 2) / 2)) / eps(mid);
    Q += N * (b - a) + d.sheets.filter((s) => s.z_nm === b).reduce((q, s) => q + s.density_nm2, 0);
  }
  return U;
}

function checkNodes(h: number, d: DopingProfile, what: string): number {
  const mesh = poissonMesh(LAYERS, h);
  const U = solvePoisson(mesh, dopingLoads(mesh, d));
  let worst = 0;
  mesh.z.forEach((z, k) => {
    const exact = closedForm(LAYERS, d, z);
    worst = Math.max(worst, Math.abs(U[k]! - exact));
    expectClose(U[k]!, exact, { abs: 1e-9 }, `${what}, mesh ${h} nm, node z = ${z} nm`);
  });
  return worst;
}

describe('Poisson step against closed forms (to 1e-9 eV)', () => {
  it('e/ε0 in V·nm from CODATA 2018 (1.602176634e-19 C / 8.8541878128e-12 F/m = 18.0951282 V·nm)', () => {
    expectClose(K, (ELEMENTARY_CHARGE_C / EPSILON0_F_PER_M) * 1e9, { rel: 1e-15 }, 'E_OVER_EPS0_V_NM');
    expectClose(K, 18.0951282, { rel: 1e-8 }, 'e/ε0');
  });

  it('a sheet of 1e12 cm⁻² off the nodes: U = 0 before it, linear after it with slope (e/ε0)σ/ε_r in each layer', () => {
    const sigma = 1e12 * 1e-14;
    const d = profile([], [{ z_nm: 13.37, density_nm2: sigma, layer: 0 }]);
    for (const h of [0.5, 0.37, 2.5]) checkNodes(h, d, 'sheet');
    const mesh = poissonMesh(LAYERS, 0.5);
    const U = solvePoisson(mesh, dopingLoads(mesh, d));
    // The closed form itself: slope K σ/ε per nm in each layer after the sheet.
    const at = (z: number): number => U[mesh.z.findIndex((x) => Math.abs(x - z) < 1e-9)]!;
    expectClose(at(25) - at(20), (K * sigma * 5) / 12.9, { abs: 1e-12 }, 'slope in GaAs (12.9)');
    expectClose(at(45) - at(40), (K * sigma * 5) / 12.048, { abs: 1e-12 }, 'slope in Al0.3Ga0.7As (12.048)');
    expect(at(10)).toBe(0);
  });

  it('two opposite sheets (a capacitor): the field between them only', () => {
    const sigma = 5e11 * 1e-14;
    const d = profile([], [{ z_nm: 17.3, density_nm2: sigma, layer: 0 }, { z_nm: 33.9, density_nm2: -sigma, layer: 2 }]);
    for (const h of [0.5, 1.3]) checkNodes(h, d, 'capacitor');
    const mesh = poissonMesh(LAYERS, 0.5);
    const U = solvePoisson(mesh, dopingLoads(mesh, d));
    // Beyond the second sheet the field is zero: U is flat at K σ Σ d/ε.
    const plateau = K * sigma * ((20 - 17.3) / 12.048 + 10 / 12.9 + (33.9 - 30) / 12.048);
    expectClose(U[U.length - 1]!, plateau, { abs: 1e-12 }, 'plateau after the capacitor');
  });

  it('symmetric doping: a doped GaAs layer between compensating sheets bends the band as a parabola, (e/ε0) N d²/(2ε_r) from its centre', () => {
    const N = 1e18 * 1e-21;
    const d = profile([{ z0_nm: 20, z1_nm: 30, density_nm3: N, layer: 1 }], [{ z_nm: 0, density_nm2: -N * 5, layer: 0 }, { z_nm: 50, density_nm2: -N * 5, layer: 2 }]);
    for (const h of [0.5, 0.25, 5]) checkNodes(h, d, 'doped slab');
    const mesh = poissonMesh(LAYERS, 0.25);
    const U = solvePoisson(mesh, dopingLoads(mesh, d));
    const at = (z: number): number => U[mesh.z.findIndex((x) => Math.abs(x - z) < 1e-9)]!;
    for (const dz of [1, 2.5, 5]) expectClose(at(25 + dz) - at(25), (K * N * dz * dz) / (2 * 12.9), { abs: 1e-12 }, `parabola at ${dz} nm from the centre`);
    // Symmetric: the field vanishes at the centre, U(25 − d) = U(25 + d); in the undoped barrier the
    // field of the enclosed charge (−N·5 + N·10 nm), linear.
    expectClose(at(22), at(28), { abs: 1e-12 }, 'symmetry');
    expectClose(at(45) - at(40), (K * N * 5 * 5) / 12.048, { abs: 1e-12 }, 'linear in the barrier after the slab');
  });

  it('random slabs and sheets on random meshes: every node exact (fast-check, 60 cases)', () => {
    const arb = fc.record({
      h: fc.double({ min: 0.05, max: 4, noNaN: true }),
      slabs: fc.array(fc.record({ a: fc.double({ min: 0, max: 49, noNaN: true }), w: fc.double({ min: 0.01, max: 20, noNaN: true }), n: fc.double({ min: -2e-3, max: 2e-3, noNaN: true }) }), { maxLength: 3 }),
      sheets: fc.array(fc.record({ z: fc.double({ min: 0, max: 50, noNaN: true }), s: fc.double({ min: -0.03, max: 0.03, noNaN: true }) }), { maxLength: 3 }),
    });
    let worst = 0;
    fc.assert(fc.property(arb, ({ h, slabs, sheets }) => {
      const d = profile(
        slabs.map((s) => ({ z0_nm: s.a, z1_nm: Math.min(50, s.a + s.w), density_nm3: s.n, layer: 0 })),
        sheets.map((s) => ({ z_nm: s.z, density_nm2: s.s, layer: 0 })),
      );
      worst = Math.max(worst, checkNodes(h, d, 'random'));
    }), { numRuns: 60, seed: 15 });
    expect(worst).toBeLessThan(1e-9);
  });
});
