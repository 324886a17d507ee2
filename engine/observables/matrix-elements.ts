/**
 * Optical matrix elements between envelope functions sampled on a shared z grid: overlaps
 * (interband strength), dipoles and oscillator strengths (intersubband strength); and, from a band
 * profile and its state energies, intersubband matrix elements with an energy-dependent mass
 * (intersubbandStates). Lengths nm, wavefunctions nm^(−1/2) normalised to ∫ψ² dz = 1 by the
 * caller, energies eV, masses m0.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import { failBadValue } from '../errors.js';
import type { BandProfile } from '../profile.js';
import { twoBandFactor } from '../solver1d/slices.js';
import { wavefunction } from '../solver1d/wavefunction.js';

const fail = failBadValue;

const checkGrid = (z: ArrayLike<number>, where: string): void => {
  if (z.length < 3) fail(`${where}.z`, 'needs at least 3 grid points', z.length, 'sample the wavefunctions on a finer grid');
  for (let i = 0; i < z.length; i++) {
    if (!Number.isFinite(z[i])) fail(`${where}.z[${i}]`, 'must be finite (nm)', z[i], 'pass grid positions in nm');
    if (i > 0 && !(z[i] > z[i - 1])) fail(`${where}.z[${i}]`, 'must increase strictly', `${z[i]} after ${z[i - 1]}`, 'sort the grid and drop repeated points');
  }
};

const checkSamples = (y: ArrayLike<number>, n: number, where: string): void => {
  if (y.length !== n) fail(where, `must have one sample per grid point (${n})`, `${y.length} samples`, 'sample every function on the same z grid');
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) fail(`${where}[${i}]`, 'must be finite', y[i], 'check the wavefunction for overflow');
  }
};

/**
 * ∫ y dz by composite Simpson on a possibly non-uniform grid.
 *
 * Each pair of intervals (h0, h1) uses the quadratic through its three points:
 * (h0 + h1)/6 [(2 − h1/h0) y0 + (h0 + h1)²/(h0 h1) y1 + (2 − h0/h1) y2]; an odd number of intervals
 * ends with the last interval integrated on the quadratic through the last three points
 * (the scheme of scipy.integrate.simpson since SciPy 1.11, after D. Cartwright). Error O(h⁴) for
 * smooth y: on uniform grids halving the step divides it by ≈ 16; on a 400-point grid across a
 * well a bound-state product is integrated to ~1e-10 relative.
 *
 * @param y samples (any unit).
 * @param z strictly increasing grid (nm), same length, at least 3 points.
 * @returns the integral in unit(y) · nm.
 */
export function simpson(y: ArrayLike<number>, z: ArrayLike<number>): number {
  const w = simpsonWeights(z);
  checkSamples(y, z.length, 'simpson.y');
  let sum = 0;
  for (let i = 0; i < w.length; i++) sum += w[i]! * y[i]!;
  return sum;
}

/**
 * The weights of composite Simpson on a grid (see simpson): ∫ y dz ≈ Σ w_i y_i. A solve samples
 * every wavefunction on one grid, so its overlaps and dipoles are dot products with one set of
 * weights instead of a quadrature each. Checks the grid (finite, strictly increasing, ≥ 3 points).
 */
export function simpsonWeights(z: ArrayLike<number>): Float64Array {
  checkGrid(z, 'simpson');
  const w = new Float64Array(z.length);
  const intervals = z.length - 1;
  const pairs = Math.floor(intervals / 2);
  for (let p = 0; p < pairs; p++) {
    const i = 2 * p;
    const h0 = z[i + 1]! - z[i]!;
    const h1 = z[i + 2]! - z[i + 1]!;
    const hs = h0 + h1;
    w[i] += (hs / 6) * (2 - h1 / h0);
    w[i + 1] += (hs / 6) * ((hs * hs) / (h0 * h1));
    w[i + 2] += (hs / 6) * (2 - h0 / h1);
  }
  if (intervals % 2 === 1) {
    const n = z.length - 1;
    const h0 = z[n - 1]! - z[n - 2]!;
    const h1 = z[n]! - z[n - 1]!;
    w[n] += (2 * h1 * h1 + 3 * h0 * h1) / (6 * (h0 + h1));
    w[n - 1] += (h1 * h1 + 3 * h0 * h1) / (6 * h0);
    w[n - 2] -= (h1 * h1 * h1) / (6 * h0 * (h0 + h1));
  }
  return w;
}

/** A grid with its Simpson weights, checked once (see simpsonWeights). */
export interface WeightedGrid {
  readonly z: ArrayLike<number>;
  readonly w: Float64Array;
}

export const weightedGrid = (z: ArrayLike<number>): WeightedGrid => ({ z, w: simpsonWeights(z) });

const weightsOf = (grid: ArrayLike<number> | WeightedGrid): WeightedGrid => ('w' in grid ? grid : weightedGrid(grid));

/** Lengths are checked up front; a non-finite sample surfaces as a non-finite integral. */
const checkPair = (psiA: ArrayLike<number>, psiB: ArrayLike<number>, grid: WeightedGrid, where: string): void => {
  const n = grid.w.length;
  if (psiA.length !== n || psiB.length !== n) fail(where, `needs one sample per grid point (${n})`, `${psiA.length} and ${psiB.length} samples`, 'sample every function on the same z grid');
};

const finiteOr = (x: number, where: string): number => (Number.isFinite(x) ? x : fail(where, 'integral is not finite', x, 'check the wavefunctions and the grid for NaN, overflow or repeated points'));

/**
 * Squared envelope overlap |∫ψA ψB dz|², the envelope part of an interband (e.g. e1–hh1)
 * transition strength (common practice; Bastard 1988). Dimensionless, 1 for identical states,
 * 0 between states of opposite parity in a symmetric well.
 *
 * @param psiA, psiB real envelope functions (nm^(−1/2)), normalised, sampled on z.
 * @param z grid (nm), strictly increasing, or a weightedGrid of it; Simpson rule (see simpson).
 */
export function overlap2(psiA: ArrayLike<number>, psiB: ArrayLike<number>, z: ArrayLike<number> | WeightedGrid): number {
  const g = weightsOf(z);
  checkPair(psiA, psiB, g, 'overlap2');
  const w = g.w;
  let sum = 0;
  for (let i = 0; i < w.length; i++) sum += w[i]! * psiA[i]! * psiB[i]!;
  const s = finiteOr(sum, 'overlap2');
  return s * s;
}

/**
 * Dipole matrix element z_ij = ∫ψ_i z ψ_j dz, in nm.
 *
 * For orthogonal states (i ≠ j in one band) the choice of origin drops out; for i = j it is the
 * mean position on the grid's origin. Infinite well of width L: z_12 = 16L/(9π²) in magnitude.
 *
 * @param psiI, psiJ real envelope functions (nm^(−1/2)) of the same band, sampled on z.
 * @param z grid (nm), strictly increasing, or a weightedGrid of it; Simpson rule (see simpson).
 * @returns z_ij (nm), signed.
 */
export function dipoleNm(psiI: ArrayLike<number>, psiJ: ArrayLike<number>, z: ArrayLike<number> | WeightedGrid): number {
  const g = weightsOf(z);
  checkPair(psiI, psiJ, g, 'dipoleNm');
  const { w, z: zs } = g;
  let sum = 0;
  for (let i = 0; i < w.length; i++) sum += w[i]! * psiI[i]! * psiJ[i]! * zs[i]!;
  return finiteOr(sum, 'dipoleNm');
}

/**
 * Oscillator strength of an intersubband transition, f_ij = (2 m ΔE/ħ²) z_ij² (dimensionless).
 *
 * Computed as m ΔE z²/(ħ²/2m0). With the Thomas–Reiche–Kuhn sum rule Σ_j f_ij = 1 for a constant
 * mass (common practice). Which mass: with a position-dependent mass the commutator
 * [z, [H, z]] = −ħ²/m(z) gives Σ_j (E_j − E_i) z_ij² = (ħ²/2)⟨i|1/m(z)|i⟩, so the mass that keeps
 * the sum rule exact is 1/⟨i|1/m|i⟩, the probability-weighted inverse mass of the initial state
 * (sumRuleMass); the well's mass overstates f when the state leaks into heavier barriers.
 *
 * @param deltaE_eV transition energy E_j − E_i (eV; negative for emission gives f < 0).
 * @param dipole_nm z_ij (nm).
 * @param mass_m0 effective mass (m0, > 0).
 * @example oscillatorStrength(0.1, 2, 0.067) // ≈ 0.7034
 */
export function oscillatorStrength(deltaE_eV: number, dipole_nm: number, mass_m0: number): number {
  if (!Number.isFinite(deltaE_eV)) fail('oscillatorStrength.deltaE_eV', 'must be finite (eV)', deltaE_eV, 'pass E_j − E_i in eV');
  if (!Number.isFinite(dipole_nm)) fail('oscillatorStrength.dipole_nm', 'must be finite (nm)', dipole_nm, 'pass the dipole matrix element in nm');
  if (!(mass_m0 > 0) || !Number.isFinite(mass_m0)) fail('oscillatorStrength.mass_m0', 'must be positive and finite (m0)', mass_m0, 'pass the effective mass in units of m0');
  return (mass_m0 * deltaE_eV * dipole_nm * dipole_nm) / HBAR2_OVER_2M0;
}

/**
 * The mass that makes the Thomas–Reiche–Kuhn sum rule exact for a position-dependent mass:
 * m_i = 1/⟨i|1/m(z)|i⟩ = 1/∫|ψ_i|²/m(z) dz (see oscillatorStrength), divided by ∫|ψ_i|² dz so that
 * the sampling's small normalisation error does not bias it.
 *
 * @param psi initial-state envelope (nm^(−1/2)), normalised, sampled on z.
 * @param massProfile mass at each grid point (m0, > 0).
 * @param z grid (nm), strictly increasing.
 * @returns mass in m0; equals m for a constant mass m.
 */
export function sumRuleMass(psi: ArrayLike<number>, massProfile: ArrayLike<number>, z: ArrayLike<number>): number {
  checkSamples(psi, z.length, 'sumRuleMass.psi');
  checkSamples(massProfile, z.length, 'sumRuleMass.massProfile');
  for (let i = 0; i < massProfile.length; i++) {
    if (!(massProfile[i] > 0)) fail(`sumRuleMass.massProfile[${i}]`, 'must be positive (m0)', massProfile[i], 'pass the effective mass at every grid point');
  }
  const w = simpsonWeights(z);
  let inverse = 0;
  let norm = 0;
  for (let k = 0; k < w.length; k++) {
    inverse += (w[k]! * psi[k]! * psi[k]!) / massProfile[k]!;
    norm += w[k]! * psi[k]! * psi[k]!;
  }
  return norm / inverse;
}

/**
 * Gauss–Legendre nodes and weights of order n on [−1, 1]: the roots of P_n by Newton's method from
 * cos(π(k + 3/4)/(n + 1/2)), weights 2/((1 − x²) P_n′(x)²) (Abramowitz & Stegun 25.4.29).
 */
function gaussLegendre(n: number): { readonly x: Float64Array; readonly w: Float64Array } {
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  const legendre = (t: number): { p: number; dp: number } => {
    let p0 = 1;
    let p1 = t;
    for (let j = 2; j <= n; j++) {
      const p2 = ((2 * j - 1) * t * p1 - (j - 1) * p0) / j;
      p0 = p1;
      p1 = p2;
    }
    return { p: p1, dp: (n * (t * p1 - p0)) / (t * t - 1) };
  };
  for (let k = 0; k < n; k++) {
    let t = Math.cos((Math.PI * (k + 0.75)) / (n + 0.5));
    for (let it = 0; it < 50; it++) {
      const { p, dp } = legendre(t);
      const dt = p / dp;
      t -= dt;
      if (Math.abs(dt) <= 1e-16) break;
    }
    x[k] = t;
    w[k] = 2 / ((1 - t * t) * legendre(t).dp ** 2);
  }
  return { x, w };
}

/** Eight nodes per panel integrate degree 15 exactly; with a phase of at most PANEL_PHASE per state in a panel a product of two states is integrated to ~1e-13 relative. */
const GL = gaussLegendre(8);
const PANEL_PHASE = 2;

/**
 * The two solutions of one slice at a given energy and their derivatives at x (nm from the slice's
 * left edge): out = [f1, f2, f1′, f2′]. With s = m(E)(E − V)/(ħ²/2m0): cos √s x and sin(√s x)/√s
 * (cosh, sinh for s < 0, a series near s x² = 0); across a long evanescent slice (κL ≥ 1)
 * e^(−κx) and e^(−κ(L−x)), which stay bounded where cosh and sinh would lose one of the two.
 */
function slicePair(s: number, L: number, x: number, out: Float64Array): void {
  if (s < 0 && Math.sqrt(-s) * L >= 1) {
    const k = Math.sqrt(-s);
    const a = Math.exp(-k * x);
    const b = Math.exp(-k * (L - x));
    out[0] = a; out[1] = b; out[2] = -k * a; out[3] = k * b;
    return;
  }
  const t = s * x * x;
  let c: number;
  let S: number;
  if (Math.abs(t) < 1e-6) {
    c = 1 - t / 2 + (t * t) / 24;
    S = x * (1 - t / 6 + (t * t) / 120);
  } else if (s > 0) {
    const k = Math.sqrt(s);
    c = Math.cos(k * x);
    S = Math.sin(k * x) / k;
  } else {
    const k = Math.sqrt(-s);
    c = Math.cosh(k * x);
    S = Math.sinh(k * x) / k;
  }
  out[0] = c; out[1] = S; out[2] = -s * S; out[3] = c;
}

/** Intersubband matrix elements between the bound states of one band (see intersubbandStates). Indices are 0-based in the order of the energies given. */
export interface IntersubbandStates {
  readonly count: number;
  /** ⟨i|j⟩ in the inner product of the energy-dependent mass: δ_ij for eigenstates (to the accuracy of their energies). */
  overlap(i: number, j: number): number;
  /** ⟨i|z − z_c|j⟩ (nm) in the same inner product, z_c the centre of the stack; for i = j the mean position. */
  position(i: number, j: number): number;
  /** Dipole z_ij (nm, signed) in the velocity form, for states of different energy; origin-free. */
  dipole(i: number, j: number): number;
}

/** A bound state sampled on the quadrature nodes: ψ and p = ψ′/m(E) in the slices, ψ and decay constant at each outer edge. */
interface NodeState {
  readonly energy: number;
  readonly psi: Float64Array;
  readonly p: Float64Array;
  readonly psiL: number; readonly kL: number; readonly mL: number;
  readonly psiR: number; readonly kR: number; readonly mR: number;
}

/** Mass (m0) of a region at energy E: the profile's two-band law, as the solver uses it. */
const massAt = (r: { readonly mass: number; readonly alpha: number; readonly V: number }, E: number): number => r.mass * twoBandFactor(r.alpha, E - r.V);

/**
 * (ħ²/2m0) [m(Ea) − m(Eb)]/(Ea − Eb) of a region (eV nm² · m0/eV), its derivative for Ea = Eb: the weight
 * of p_a p_b in the inner product. (ħ²/2m0) α m for the two-band law, where it is not floored.
 */
function currentWeight(r: { readonly mass: number; readonly alpha: number; readonly V: number }, Ea: number, Eb: number): number {
  if (Ea !== Eb) return (HBAR2_OVER_2M0 * (massAt(r, Ea) - massAt(r, Eb))) / (Ea - Eb);
  const d = Ea - r.V;
  return twoBandFactor(r.alpha, d) === 1 + r.alpha * d ? HBAR2_OVER_2M0 * r.alpha * r.mass : 0;
}

/**
 * Intersubband overlaps, positions and dipoles of bound states of one band with an energy-dependent
 * mass m(z, E) (the two-band law of the profile's slices), in the inner product in which its
 * states are orthogonal.
 *
 * Inner product (our derivation): with p = ψ′/m(E) (continuous at interfaces, BenDaniel–Duke),
 * subtracting the equations −(ħ²/2m0)p_i′ + Vψ_i = E_i ψ_i of two states, each multiplied by the
 * other and integrated, gives (E_i − E_j)⟨i|j⟩ = 0 with
 *   ⟨i|j⟩ = ∫ [ψ_i ψ_j + (ħ²/2m0) (m(E_i) − m(E_j))/(E_i − E_j) p_i p_j] dz,
 * the norm taking ∂m/∂E. For the two-band law m(E) = m (1 + α(E − V)) the weight is (ħ²/2m0) α m:
 * the squared valence component |φ|² of the two-band Kane Hamiltonian [[V, A†], [A, V − 1/α]],
 * A = −iħP d/dz, ħ²P² = (ħ²/2m0)/(αm) per slice, whose conduction row, with φ = Aψ/(E − V + 1/α)
 * eliminated, is the single-band equation (E. O. Kane, J. Phys. Chem. Solids 1, 249 (1957);
 * G. Bastard, Wave Mechanics Applied to Semiconductor Heterostructures (1988); C. Sirtori,
 * F. Capasso, J. Faist, S. Scandolo, Phys. Rev. B 50, 8663 (1994) for intersubband transitions,
 * from memory). Position acts on both components: z_ij = ⟨i|z|j⟩ with the same weight, and the
 * same subtraction with z inserted gives the origin-free velocity form
 *   z_ij = (ħ²/2m0) ∫ (ψ_i p_j − p_i ψ_j) dz / (E_j − E_i),
 * for a constant mass ħ²/(2ΔE)⟨i|(1/m(E_i) + 1/m(E_j)) d/dz|j⟩ (Sirtori et al.'s form, from
 * memory). For α = 0 both are ∫ψ_i z ψ_j dz with ∫ψ² = 1 (dipoleNm). Oscillator strength:
 * oscillatorStrength(E_j − E_i, z_ij, m_i) with the initial state's mass 1/⟨i|1/m(z, E_i)|i⟩
 * (sumRuleMass at E_i). For α = 0 Σ_j f_ij = 1 (Thomas–Reiche–Kuhn); with α > 0 the sum over the
 * conduction states alone is below 1: the two-band Hamiltonian's [z, [H, z]] vanishes, so
 * conduction and valence-like states together sum to 0.
 *
 * Numerics: ψ from solver1d's wavefunction on composite 8-point Gauss–Legendre panels inside each
 * slice (at most PANEL_PHASE of phase or decay per state per panel), p from ψ on each slice's nodes
 * by a least-squares fit to the slice's two closed-form solutions at E (so ψ′ jumps at interfaces
 * as BenDaniel–Duke requires), the outer tails in closed form. Products are integrated to ~1e-12.
 *
 * @param profile band profile (eV, nm, m0), as solved.
 * @param energies bound-state energies of the profile (particle sense, eV), below both outer potentials.
 * @returns matrix elements between the states, normalised in that inner product.
 * @example for the 10 nm In0.53Ga0.47As/In0.52Al0.48As well on InP at 300 K, dipole(0, 1) ≈ −2.269 nm.
 */
export function intersubbandStates(profile: BandProfile, energies: readonly number[]): IntersubbandStates {
  const where = 'intersubbandStates';
  energies.forEach((e, k) => {
    if (!Number.isFinite(e)) fail(`${where}.energies[${k}]`, 'must be finite (eV)', e, 'pass bound-state energies from solveBand');
  });
  const { slices, left, right } = profile;
  const n = slices.length;
  const edge = new Float64Array(n + 1);
  for (let k = 0; k < n; k++) edge[k + 1] = edge[k]! + slices[k]!.width_nm;
  const zEnd = edge[n]!;
  const zc = zEnd / 2;
  const sOf = (k: number, E: number): number => (massAt(slices[k]!, E) * (E - slices[k]!.V)) / HBAR2_OVER_2M0;

  // Nodes: z = 0, the Gauss–Legendre nodes of every panel, z = zEnd (the tails start from the two ends).
  const panels = new Int32Array(n);
  let interior = 0;
  for (let k = 0; k < n; k++) {
    let phase = 0;
    for (const E of energies) phase = Math.max(phase, Math.sqrt(Math.abs(sOf(k, E))) * slices[k]!.width_nm);
    panels[k] = Math.max(1, Math.ceil(phase / PANEL_PHASE));
    interior += panels[k]! * GL.x.length;
  }
  const zq = new Float64Array(interior + 2);
  const wq = new Float64Array(interior);
  const start = new Int32Array(n + 1);
  let q = 0;
  for (let k = 0; k < n; k++) {
    start[k] = q;
    const h = slices[k]!.width_nm / panels[k]!;
    for (let pn = 0; pn < panels[k]!; pn++) {
      for (let g = 0; g < GL.x.length; g++) {
        zq[q + 1] = edge[k]! + h * (pn + (1 + GL.x[g]!) / 2);
        wq[q] = (h / 2) * GL.w[g]!;
        q++;
      }
    }
  }
  start[n] = q;
  zq[interior + 1] = zEnd;

  const pair = new Float64Array(4);
  const states: NodeState[] = energies.map((E) => {
    const all = wavefunction(profile, E, zq);
    const psi = all.subarray(1, interior + 1);
    const p = new Float64Array(interior);
    for (let k = 0; k < n; k++) {
      const L = slices[k]!.width_nm;
      const s = sOf(k, E);
      let g11 = 0; let g12 = 0; let g22 = 0; let r1 = 0; let r2 = 0;
      for (let i = start[k]!; i < start[k + 1]!; i++) {
        slicePair(s, L, zq[i + 1]! - edge[k]!, pair);
        g11 += pair[0]! * pair[0]!; g12 += pair[0]! * pair[1]!; g22 += pair[1]! * pair[1]!;
        r1 += pair[0]! * psi[i]!; r2 += pair[1]! * psi[i]!;
      }
      const det = g11 * g22 - g12 * g12;
      const a = (r1 * g22 - r2 * g12) / det;
      const b = (r2 * g11 - r1 * g12) / det;
      const me = massAt(slices[k]!, E);
      for (let i = start[k]!; i < start[k + 1]!; i++) {
        slicePair(s, L, zq[i + 1]! - edge[k]!, pair);
        p[i] = (a * pair[2]! + b * pair[3]!) / me;
      }
    }
    const mL = massAt(left, E);
    const mR = massAt(right, E);
    return {
      energy: E, psi, p,
      psiL: all[0]!, kL: Math.sqrt((mL * (left.V - E)) / HBAR2_OVER_2M0), mL,
      psiR: all[interior + 1]!, kR: Math.sqrt((mR * (right.V - E)) / HBAR2_OVER_2M0), mR,
    };
  });

  /**
   * ∫ (z − z_c)^power [ψ_a ψ_b + w_ab p_a p_b] dz, power 0 or 1 (unnormalised). In the outer regions
   * ψ = ψ_edge e^(∓κ(z − z_edge)) and p = ±κψ/m(E), so the tails are single exponentials:
   * ∫_{−∞}^0 e^{sz} = 1/s, ∫_{−∞}^0 (z − z_c) e^{sz} = −1/s² − z_c/s, ∫_{zEnd}^∞ e^{−s(z − zEnd)} = 1/s,
   * ∫_{zEnd}^∞ (z − z_c) e^{−s(z − zEnd)} = (zEnd − z_c)/s + 1/s².
   */
  const product = (a: NodeState, b: NodeState, power: 0 | 1): number => {
    let sum = 0;
    for (let k = 0; k < n; k++) {
      const w = currentWeight(slices[k]!, a.energy, b.energy);
      let part = 0;
      for (let i = start[k]!; i < start[k + 1]!; i++) {
        const f = a.psi[i]! * b.psi[i]! + w * a.p[i]! * b.p[i]!;
        part += wq[i]! * (power === 0 ? f : (zq[i + 1]! - zc) * f);
      }
      sum += part;
    }
    const sL = a.kL + b.kL;
    const sR = a.kR + b.kR;
    const tailL = (a.psiL * b.psiL * (1 + (currentWeight(left, a.energy, b.energy) * a.kL * b.kL) / (a.mL * b.mL))) / sL;
    const tailR = (a.psiR * b.psiR * (1 + (currentWeight(right, a.energy, b.energy) * a.kR * b.kR) / (a.mR * b.mR))) / sR;
    return power === 0 ? sum + tailL + tailR : sum + tailL * (-1 / sL - zc) + tailR * (zEnd - zc + 1 / sR);
  };
  const scale = states.map((s) => 1 / Math.sqrt(product(s, s, 0)));

  const index = (i: number, what: string): NodeState => {
    if (!Number.isInteger(i) || i < 0 || i >= states.length) fail(`${where}.${what}`, `must be a state index from 0 to ${states.length - 1}`, i, 'pass the 0-based index of a state whose energy was given');
    return states[i]!;
  };
  return {
    count: states.length,
    overlap: (i, j) => product(index(i, 'overlap'), index(j, 'overlap'), 0) * scale[i]! * scale[j]!,
    position: (i, j) => product(index(i, 'position'), index(j, 'position'), 1) * scale[i]! * scale[j]!,
    dipole(i, j) {
      const a = index(i, 'dipole');
      const b = index(j, 'dipole');
      const dE = b.energy - a.energy;
      if (dE === 0) fail(`${where}.dipole`, 'needs two states of different energy', `${a.energy} and ${b.energy} eV`, 'use position(i, i) for the mean position of one state');
      let sum = 0;
      for (let k = 0; k < interior; k++) sum += wq[k]! * (a.psi[k]! * b.p[k]! - a.p[k]! * b.psi[k]!);
      sum += (a.psiL * b.psiL * (b.kL / b.mL - a.kL / a.mL)) / (a.kL + b.kL);
      sum += (a.psiR * b.psiR * (a.kR / a.mR - b.kR / b.mR)) / (a.kR + b.kR);
      return ((HBAR2_OVER_2M0 * sum) / dE) * scale[i]! * scale[j]!;
    },
  };
}
