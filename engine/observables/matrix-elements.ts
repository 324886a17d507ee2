/**
 * Optical matrix elements between envelope functions sampled on a shared z grid: overlaps
 * (interband strength), dipoles and oscillator strengths (intersubband strength).
 * Lengths nm, wavefunctions nm^(−1/2) normalised to ∫ψ² dz = 1 by the caller, energies eV, masses m0.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import { failBadValue } from '../errors.js';

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
