/**
 * The Siegert-pole solver (engine/resonance.ts) on hand-made profiles: an analytic three-region
 * resonance, the flux width against the pole's imaginary part, bound states where nothing is open,
 * and its wavefunction.
 */
import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 as C } from '../../engine/constants.js';
import { resonanceWavefunction, resonanceWidth, siegertPole } from '../../engine/resonance.js';
import { solveBand } from '../../engine/solver1d/states.js';
import { wavefunction } from '../../engine/solver1d/wavefunction.js';
import { layer, message, outer, profileOf, trapezoid, uniformGrid } from './helpers.js';

/** Complex numbers as [re, im] for the test's own analytic condition. */
type Cx = readonly [number, number];
const add = (a: Cx, b: Cx): Cx => [a[0] + b[0], a[1] + b[1]];
const sub = (a: Cx, b: Cx): Cx => [a[0] - b[0], a[1] - b[1]];
const mul = (a: Cx, b: Cx): Cx => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: Cx, b: Cx): Cx => { const d = b[0] * b[0] + b[1] * b[1]; return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d]; };
const sqrt = (a: Cx): Cx => { const r = Math.hypot(a[0], a[1]); const t = Math.sqrt((r + Math.abs(a[0])) / 2); return a[0] >= 0 ? [t, a[1] / (2 * t)] : [Math.abs(a[1]) / (2 * t), a[1] < 0 ? -t : t]; };
const exp = (a: Cx): Cx => [Math.exp(a[0]) * Math.cos(a[1]), Math.exp(a[0]) * Math.sin(a[1])];
const sin = (a: Cx): Cx => [Math.sin(a[0]) * Math.cosh(a[1]), Math.cos(a[0]) * Math.sinh(a[1])];
const cos = (a: Cx): Cx => [Math.cos(a[0]) * Math.cosh(a[1]), -Math.sin(a[0]) * Math.sinh(a[1])];

describe('an open well: lead, thin barrier, well, high closed barrier (one mass)', () => {
  // z < 0: lead at V = 0 with the outgoing wave e^{−ikz}; 0 < z < d: barrier V0; d < z < d + L: well
  // at V = Vw; z > d + L: barrier VR, ψ ∝ e^{−κ_R (z − d − L)}. Matching ψ and ψ′ at z = 0, d and d + L
  // gives the pole condition F(E) = 0 below, solved by Newton's method in the complex plane with a
  // numerical derivative (the three-region problem in closed form; E. Merzbacher, Quantum Mechanics,
  // ch. 6–7, for the matching, from memory). The product's pole comes from its slice transfer and
  // secant.
  const [m, V0, d, L, Vw, VR] = [0.067, 0.8, 3, 10, 0.05, 2];
  const profile = profileOf([layer(d, V0, m), layer(L, Vw, m)], outer(0, m), outer(VR, m));
  const condition = (E: Cx): Cx => {
    const k = sqrt([(m * E[0]) / C, (m * E[1]) / C]);
    const kap = sqrt([(m * (V0 - E[0])) / C, (-m * E[1]) / C]);
    const q = sqrt([(m * (E[0] - Vw)) / C, (m * E[1]) / C]);
    const kR = sqrt([(m * (VR - E[0])) / C, (-m * E[1]) / C]);
    // Barrier solution from the lead: ψ(0) = 1, ψ′(0) = −ik → ψ = cosh κz − (ik/κ) sinh κz.
    const ch = mul(add(exp(mul(kap, [d, 0])), exp(mul(kap, [-d, 0]))), [0.5, 0]);
    const sh = mul(sub(exp(mul(kap, [d, 0])), exp(mul(kap, [-d, 0]))), [0.5, 0]);
    const ik: Cx = [-k[1], k[0]];
    const psi = sub(ch, mul(div(ik, kap), sh));
    const dpsi = sub(mul(kap, sh), mul(ik, ch));
    // Well solution with ψ = 1, ψ′ = −κ_R at z = d + L, taken back to z = d:
    // ψ = cos qL + (κ_R/q) sin qL, ψ′ = q sin qL − κ_R cos qL. The Wronskian vanishes at the pole.
    const c = cos(mul(q, [L, 0]));
    const sn = sin(mul(q, [L, 0]));
    const well = add(c, mul(div(kR, q), sn));
    const dwell = sub(mul(q, sn), mul(kR, c));
    return sub(mul(psi, dwell), mul(dpsi, well));
  };
  const newton = (E0: Cx): Cx => {
    let E = E0;
    for (let it = 0; it < 100; it++) {
      const h: Cx = [1e-8, 0];
      const f = condition(E);
      const step = div(f, div(sub(condition(add(E, h)), f), h));
      E = sub(E, step);
      if (Math.hypot(step[0], step[1]) < 1e-14) break;
    }
    return E;
  };

  it('each resonance agrees with the analytic pole within 1e-10 eV, and its flux width with −2 Im E', () => {
    // Newton starts at the levels of the well closed by hard walls, (nπ/L)² C/m above Vw; the
    // product's search starts 2 meV off the pole Newton finds, on the real axis.
    for (const n of [1, 2, 3]) {
      const exact = newton([Vw + (C / m) * ((n * Math.PI) / L) ** 2, 0]);
      const { pole } = siegertPole(profile, exact[0] + 0.002, 0, d + L / 2, 0.1);
      expect(pole, `state ${n}`).toBeDefined();
      expect(Math.hypot(pole!.energy - exact[0], pole!.imaginary - exact[1]), message(`pole ${n}`, { n }, pole!.energy, exact[0], 1e-10)).toBeLessThan(1e-10);
      const width = resonanceWidth(profile, pole!);
      expect(Math.abs(width / (-2 * exact[1]) - 1), message(`Γ${n} flux / −2 Im E`, { n }, width, -2 * exact[1], 1e-6)).toBeLessThan(1e-6);
    }
  });

  it('the two-band mass: the flux width with its energy-derivative density still equals −2 Im E', () => {
    // ρ = |ψ|² + (ħ²/2m0) α m |ψ′/m|² (the module comment): without the second term the flux width
    // of this state (Γ = 0.35 meV) comes out 10 % high.
    const p = profileOf([layer(d, V0, m, 0.5), layer(L, Vw, m, 0.7)], outer(0, m, 0.7), outer(100, m, 0.5));
    const { pole } = siegertPole(p, Vw + (C / m) * (2 * Math.PI / L) ** 2, 0, d + L / 2, 0.1);
    expect(pole).toBeDefined();
    const width = resonanceWidth(p, pole!);
    expect(Math.abs(width / (-2 * pole!.imaginary) - 1), message('Γ flux / −2 Im E', {}, width, -2 * pole!.imaginary, 1e-8)).toBeLessThan(1e-8);
  });
});

describe('with no open side the pole is the bound state', () => {
  const profile = profileOf([layer(20, 0.3, 0.092), layer(8, 0, 0.067, 0.6), layer(20, 0.3, 0.092)], outer(0.3, 0.092, 0.3));
  const bound = solveBand(profile).states;
  it('energies of solveBand within 1e-11 eV, width 0, and the same normalised wavefunction within 1e-8', () => {
    const z = uniformGrid(-10, 58, 0.01);
    for (const s of bound) {
      // A guess off the level, still below the edge: above it the outer regions would be taken as open.
      const { pole } = siegertPole(profile, s.energy + Math.min(1e-4, (0.3 - s.energy) / 2), 0, 24, 0.01);
      expect(pole).toBeDefined();
      expect(Math.abs(pole!.energy - s.energy), message(`E${s.index}`, {}, pole!.energy, s.energy, 1e-11)).toBeLessThan(1e-11);
      expect(pole!.openLeft || pole!.openRight).toBe(false);
      expect(resonanceWidth(profile, pole!)).toBe(0);
      const a = wavefunction(profile, s.energy, z);
      const b = resonanceWavefunction(profile, pole!, z);
      const sign = Math.sign(trapezoid(a, b, 0.01));
      let worst = 0;
      for (let i = 0; i < z.length; i++) worst = Math.max(worst, Math.abs(a[i]! - sign * b[i]!));
      expect(worst, `ψ${s.index}: largest difference`).toBeLessThan(1e-8);
    }
  });
});
