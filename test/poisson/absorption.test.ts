/**
 * Intersubband absorption: the depolarisation shift of a single populated subband against the
 * closed form of T. Ando, A. B. Fowler, F. Stern, Rev. Mod. Phys. 54, 437 (1982) and S. J. Allen,
 * D. C. Tsui, B. Vinter, Solid State Commun. 20, 425 (1976), Ẽ = E21 √(1 + 2(e²/ε0) n S/(ε E21)),
 * with S = ∫[∫^z ψ1ψ2]² computed here independently for a square well (and tending to the
 * infinite well's 5L/(9π²), our derivation, as the barrier rises); the Thomas–Reiche–Kuhn sum
 * Σ_j E_1j z_1j² = ħ²/2m over the discretised continuum (completeness); the continuum's
 * convergence with the box; dipoles against the two-band matrix elements of
 * engine/observables/matrix-elements.ts; coupling factors; and a line under bias.
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { resolveDoping } from '../../engine/poisson/doping.js';
import { DEFAULT_SELF_CONSISTENT, selfConsistent } from '../../engine/poisson/selfconsistent.js';
import { couplingFactor, DEFAULT_ABSORPTION, intersubbandAbsorption, type AbsorptionOptions } from '../../engine/poisson/absorption.js';
import { poissonMesh, E_OVER_EPS0_V_NM } from '../../engine/poisson/poisson.js';
import { potentialProfile } from '../../engine/poisson/subbands.js';
import { intersubbandStates } from '../../engine/observables/matrix-elements.js';
import { solveBand } from '../../engine/solver1d/states.js';
import type { BandProfile } from '../../engine/profile.js';
import { HBAR2_OVER_2M0 as C } from '../../engine/constants.js';
import { modulationCase } from '../reference/poisson/structures.js';
import { expectClose } from '../observables/close.js';

const M = 0.067;
const L = 10;
const EPS = 12.9;

/** A square well of width L between outer regions at V0 (eV), mass M everywhere, on a 0.05 nm mesh. */
function squareWell(V0: number): { profile: BandProfile; mesh: ReturnType<typeof poissonMesh> } {
  const mesh = poissonMesh([{ thickness_nm: L, permittivity: EPS }], 0.05);
  const region = { V: V0, mass: M, alpha: 0, massInPlane: M };
  const slices = Array.from({ length: mesh.z.length - 1 }, () => ({ width_nm: L / (mesh.z.length - 1), V: 0, mass: M, alpha: 0, massInPlane: M, layer: 0 }));
  return { profile: { band: 'electron', slices, left: region, right: region, sign: 1, openEdge: V0 }, mesh };
}

/**
 * e1, e2 of a square well of depth V (the even and odd roots of k tan(kL/2) = κ, −k cot(kL/2) = κ,
 * bisection) and, by direct quadrature of the analytic ψ1ψ2 over ±(L/2 + 40/κ), z12 and
 * S = ∫[∫^z ψ1ψ2 dz']² dz.
 */
function analytic(V: number): { e1: number; e2: number; z12: number; S: number } {
  const k = (E: number): number => Math.sqrt((M * E) / C);
  const kappa = (E: number): number => Math.sqrt((M * (V - E)) / C);
  const root = (f: (E: number) => number, lo: number, hi: number): number => {
    for (let i = 0; i < 200; i++) { const mid = (lo + hi) / 2; if (f(lo) * f(mid) <= 0) hi = mid; else lo = mid; }
    return (lo + hi) / 2;
  };
  const even = (E: number): number => k(E) * Math.sin((k(E) * L) / 2) - kappa(E) * Math.cos((k(E) * L) / 2);
  const odd = (E: number): number => -k(E) * Math.cos((k(E) * L) / 2) - kappa(E) * Math.sin((k(E) * L) / 2);
  const cap = (n: number): number => Math.min(V, (C * (n * Math.PI) ** 2) / (M * L * L)) * (1 - 1e-12);
  const e1 = root(even, 1e-9, cap(1));
  const e2 = root(odd, cap(1), cap(2));
  const psi = (E: number, parity: 0 | 1) => (z: number): number => {
    const q = k(E); const p = kappa(E); const a = Math.abs(z);
    const inside = parity === 0 ? Math.cos(q * z) : Math.sin(q * z);
    const edge = parity === 0 ? Math.cos((q * L) / 2) : Math.sin((q * L) / 2);
    return a <= L / 2 ? inside : (parity === 1 && z < 0 ? -1 : 1) * edge * Math.exp(-p * (a - L / 2));
  };
  const p1 = psi(e1, 0); const p2 = psi(e2, 1);
  const half = L / 2 + 40 / kappa(e2);
  const n = 400000;
  const h = (2 * half) / n;
  let n1 = 0; let n2 = 0;
  for (let i = 0; i <= n; i++) { const z = -half + i * h; const w = i === 0 || i === n ? 0.5 : 1; n1 += w * p1(z) ** 2 * h; n2 += w * p2(z) ** 2 * h; }
  const c = 1 / Math.sqrt(n1 * n2);
  let Q = 0; let S = 0; let z12 = 0; let prev = 0;
  for (let i = 0; i <= n; i++) {
    const z = -half + i * h;
    const f = c * p1(z) * p2(z);
    if (i > 0) Q += 0.5 * (prev + f) * h;
    prev = f;
    const w = i === 0 || i === n ? 0.5 : 1;
    S += w * Q * Q * h;
    z12 += w * z * f * h;
  }
  return { e1, e2, z12, S };
}

const options = (over: Partial<AbsorptionOptions>): AbsorptionOptions => ({ ...DEFAULT_ABSORPTION, ...over });

describe('depolarisation shift of one populated subband (Ando, Fowler & Stern; Allen, Tsui & Vinter)', () => {
  it('10 nm square well, 1e12 cm⁻² in e1 at 4 K: S and z12 equal the analytic ones, the line moves to E21 √(1 + α), S → 5L/(9π²) as the barrier rises', () => {
    const n = 1e12 * 1e-14;
    const range = 0.5;
    const gaps: number[] = [];
    for (const V0 of [3, 10, 40]) {
      const { profile, mesh } = squareWell(V0);
      // The box's walls stand range + 1 eV above the outer regions: the well the analytic form solves.
      const wall = V0 + range + 1;
      const ref = analytic(wall);
      const fermi = ref.e1 + n / (M / (2 * Math.PI * C));
      const a = intersubbandAbsorption({ profile, mesh, temperature_K: 4, cellOfNode: new Int32Array(mesh.z.length), fermi: [fermi] }, options({ continuum_nm: 0, range_eV: range, linewidth_eV: 0.005 }));
      const line = a.lines.find((l) => l.label === 'e1-e2')!;
      expectClose(line.energy_eV, ref.e2 - ref.e1, { abs: 1e-9 }, `V0 ${V0}: E21`);
      expectClose(Math.abs(line.dipole_nm), Math.abs(ref.z12), { rel: 1e-6 }, `V0 ${V0}: |z12|`);
      expectClose(line.depolarisation_nm * EPS, ref.S, { rel: 1e-6 }, `V0 ${V0}: S`);
      expectClose(line.population_cm2, 1e12, { rel: 1e-6 }, `V0 ${V0}: n1 − n2`);
      const alpha = (2 * E_OVER_EPS0_V_NM * n * ref.S) / (EPS * (ref.e2 - ref.e1));
      expectClose(line.shifted_eV, (ref.e2 - ref.e1) * Math.sqrt(1 + alpha), { abs: 1e-9 }, `V0 ${V0}: depolarised line`);
      // The spectrum's peak is that line (the next allowed one, e1-e4, lies ~0.9 eV higher).
      expectClose(a.peak_eV, line.shifted_eV, { abs: 5e-5 }, `V0 ${V0}: peak`);
      expect(alpha).toBeGreaterThan(0.08);
      gaps.push(Math.abs(ref.S / ((5 * L) / (9 * Math.PI * Math.PI)) - 1));
    }
    // Infinite-well limit: the penetration 1/κ shrinks as the barrier rises.
    expect(gaps[2]!).toBeLessThan(gaps[1]!);
    expect(gaps[1]!).toBeLessThan(gaps[0]!);
    expect(gaps[2]!).toBeLessThan(0.03);
  });

  it('Thomas–Reiche–Kuhn: Σ_j E_1j z_1j² over bound and box states reaches ħ²/2m to 0.5 % (the discretised continuum is complete)', () => {
    const { profile, mesh } = squareWell(0.3);
    const a = intersubbandAbsorption({ profile, mesh, temperature_K: 4, cellOfNode: new Int32Array(mesh.z.length), fermi: [0.02] }, options({ continuum_nm: 60, range_eV: 6, linewidth_eV: 0.01, depolarisation: false }));
    const sum = a.lines.filter((l) => l.label.startsWith('e1-')).reduce((s, l) => s + l.energy_eV * l.dipole_nm ** 2, 0);
    expectClose(sum, C / M, { rel: 5e-3 }, 'Σ E z² against ħ²/2m');
  });
});

describe('absorption of a self-consistent detector well', () => {
  const detector = (w: number, x: number, field = 0) => {
    const s = buildStructure(parseSpecText(`substrate: GaAs\ntemperature: 77 K\nfield: ${field} kV/cm\nstack:\n  - { material: Al${x}Ga${(1 - x).toFixed(2)}As, thickness: 30 nm }\n  - { material: GaAs, thickness: ${w} nm }\n  - { material: Al${x}Ga${(1 - x).toFixed(2)}As, thickness: 30 nm }\n`, 'det.yaml').spec, {});
    const sc = selfConsistent(s, resolveDoping({ layers: [undefined, { donors: '1e18 cm-3' }, undefined] }, s), DEFAULT_SELF_CONSISTENT);
    return { input: { profile: potentialProfile(s, sc.mesh, sc.potential, 'electron', 1, true), mesh: sc.mesh, temperature_K: 77, cellOfNode: sc.cellOfNode, fermi: sc.cells.map((c) => c.fermi_eV) }, sc };
  };

  it('bound-to-continuum (4 nm GaAs in Al0.25Ga0.75As, only e1 bound): doubling the box moves the peak by < 0.1 meV and the FWHM by < 1 meV', () => {
    const { input } = detector(4, 0.25);
    const a = intersubbandAbsorption(input, options({ continuum_nm: 200 }));
    const b = intersubbandAbsorption(input, options({ continuum_nm: 400 }));
    expect(a.continuumStates).toBeGreaterThan(100);
    expectClose(b.peak_eV, a.peak_eV, { abs: 1e-4 }, 'peak 200 → 400 nm');
    expectClose(b.fwhm_meV, a.fwhm_meV, { abs: 1 }, 'FWHM 200 → 400 nm');
    expectClose(b.peak_absorption, a.peak_absorption, { rel: 0.01 }, 'peak absorption');
    // A bound-to-continuum line is broad: several times the 10 meV linewidth.
    expect(a.fwhm_meV).toBeGreaterThan(30);
  });

  it('dipoles equal the two-band matrix elements of intersubbandStates (the modulation-doped 8 nm well, e1-e2)', () => {
    const c = modulationCase(77, 1e12);
    const sc = selfConsistent(c.structure, c.doping, DEFAULT_SELF_CONSISTENT);
    const profile = potentialProfile(c.structure, sc.mesh, sc.potential, 'electron', 1, true);
    const a = intersubbandAbsorption({ profile, mesh: sc.mesh, temperature_K: 77, cellOfNode: sc.cellOfNode, fermi: sc.cells.map((x) => x.fermi_eV) }, DEFAULT_ABSORPTION);
    const line = a.lines.find((l) => l.label === 'e1-e2')!;
    const bound = intersubbandStates(profile, solveBand(profile, { maxStates: 2 }).states.map((x) => x.energy));
    // Simpson per 0.5 nm slice against 8-point Gauss–Legendre panels: 1e-5 relative.
    expectClose(Math.abs(line.dipole_nm), Math.abs(bound.dipole(0, 1)), { rel: 1e-5 }, 'z12');
  });

  it('coupling: 45° gives sin²θ/cos θ = 1/√2, Brewster from air 1/(n√(1 + n²)); the spectrum scales with it', () => {
    expectClose(couplingFactor('45deg', 3.3), Math.SQRT1_2, { rel: 1e-15 }, '45°');
    expectClose(couplingFactor('brewster', 3.3), 1 / (3.3 * Math.sqrt(1 + 3.3 * 3.3)), { rel: 1e-15 }, 'Brewster');
    const { input } = detector(4.5, 0.3);
    const a = intersubbandAbsorption(input, options({ coupling: '45deg', continuum_nm: 100 }));
    const b = intersubbandAbsorption(input, options({ coupling: 'normal-z', continuum_nm: 100 }));
    const line = (r: typeof a): number => r.lines.find((l) => l.label === 'e1-e2')!.strength;
    expectClose(line(a) / line(b), Math.SQRT1_2, { rel: 1e-12 }, 'line strength ratio');
  });

  it('under 20 kV/cm the detector\'s e2 is a resonance: its line is still there, broadened beyond the 10 meV linewidth', () => {
    const { input } = detector(4.5, 0.3, 20);
    const a = intersubbandAbsorption(input, DEFAULT_ABSORPTION);
    expect(a.status).toBe('ok');
    expect(a.fwhm_meV).toBeGreaterThan(12);
    const zero = intersubbandAbsorption(detector(4.5, 0.3).input, DEFAULT_ABSORPTION);
    expectClose(a.peak_eV, zero.peak_eV, { abs: 0.01 }, 'peak moves by less than 10 meV');
  });
});

