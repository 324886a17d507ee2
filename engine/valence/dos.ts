/**
 * Hole density of states from the multiband valence dispersions: the angular quadrature of the
 * in-plane directions, the dispersion in the plain form the carrier statistics take
 * (engine/observables/carriers.ts HoleDispersion), the number of states above an energy, the DOS
 * table and the DOS-averaged mass of each subband.
 *
 * Counting: each branch (one state of a Kramers pair) holds one state per (2π)² of k-space area, so
 * the states above E per unit area are N(E) = Σ_branch (1/2π) ⟨∫ k dk Θ(E_b(k) − E)⟩_φ, with the
 * radial integral exact for E piecewise linear in k² between grid points and ⟨⟩_φ the quadrature.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import type { HoleDispersion } from '../observables/carriers.js';
import { InputError } from '../errors.js';
import type { InPlaneDirection, ValenceResult } from './dispersion.js';

/**
 * Directions and weights of the angular average over k∥: the (001) valence subbands repeat every 90°
 * and are even about [100] and [110] (the cubic symmetry of the Luttinger Hamiltonian), so the
 * average over 0–45° suffices; the trapezoid rule on M + 1 equally spaced angles is exact for the
 * harmonics cos 4nφ with n < 2M (it is the rectangle rule of a periodic function; common practice).
 * M = 2 gives 0°, 22.5°, 45° with weights 1/4, 1/2, 1/4. In the axial approximation one direction
 * carries weight 1.
 */
export function angularQuadrature(axial: boolean, intervals = 2): { readonly directions: readonly InPlaneDirection[]; readonly weights: readonly number[] } {
  if (axial) return { directions: ['[100]'], weights: [1] };
  if (!(Number.isInteger(intervals) && intervals >= 1)) throw new InputError('bad-value', `valence.dos_directions: must be a positive integer, got ${intervals}`, 'solver.valence');
  const directions: InPlaneDirection[] = [];
  const weights: number[] = [];
  for (let j = 0; j <= intervals; j++) {
    directions.push(j === 0 ? '[100]' : j === intervals ? '[110]' : (45 * j) / intervals);
    weights.push((j === 0 || j === intervals ? 0.5 : 1) / intervals);
  }
  return { directions, weights };
}

/**
 * The dispersions of `subbands` (indices from the top; default all) of a valence result as a
 * HoleDispersion, with `weights` for its directions in order (e.g. from angularQuadrature).
 */
export function holeDispersion(r: ValenceResult, weights: readonly number[], subbands?: readonly number[]): HoleDispersion {
  if (weights.length !== r.directions.length) throw new InputError('bad-value', `holeDispersion.weights: one weight per direction (${r.directions.length}), got ${weights.length}`);
  const pick = subbands ?? r.directions[0]!.subbands.map((_, i) => i);
  return {
    k_per_nm: r.k_per_nm,
    directions: r.directions.map((d, j) => ({ weight: weights[j]!, branches: pick.flatMap((i) => [d.subbands[i]!.energy_eV[0], d.subbands[i]!.energy_eV[1]]) })),
  };
}

/** ∫ k dk over the part of [k_a, k_b] where E(k) > level, E linear in u = k²; half the u-length. */
function areaAbove(ua: number, ub: number, ea: number, eb: number, level: number): number {
  const above = (e: number): boolean => e > level;
  if (above(ea) && above(eb)) return 0.5 * (ub - ua);
  if (!above(ea) && !above(eb)) return 0;
  const uc = ua + ((level - ea) / (eb - ea)) * (ub - ua);
  return 0.5 * (above(ea) ? uc - ua : ub - uc);
}

/**
 * States per nm² above `level` (eV) in a dispersion: N(E) of the module comment, over the k grid
 * (states beyond the last k are not counted).
 */
export function statesAbove(d: HoleDispersion, level: number): number {
  const k = d.k_per_nm;
  let total = 0;
  for (const dir of d.directions) {
    let sum = 0;
    for (const b of dir.branches) for (let i = 0; i + 1 < k.length; i++) sum += areaAbove(k[i]! * k[i]!, k[i + 1]! * k[i + 1]!, b[i]!, b[i + 1]!, level);
    total += dir.weight * sum;
  }
  return total / (2 * Math.PI);
}

/**
 * Hole DOS on the bins between consecutive `energies_eV` (ascending or descending): g = |ΔN/ΔE| in
 * states per eV per cm² (spin included through the two branches), reported at the bin centres.
 */
export function holeDosTable(d: HoleDispersion, energies_eV: readonly number[]): { readonly energy_eV: Float64Array; readonly dos_per_eV_cm2: Float64Array } {
  const n = energies_eV.length - 1;
  const energy = new Float64Array(Math.max(0, n));
  const dos = new Float64Array(Math.max(0, n));
  let prev = statesAbove(d, energies_eV[0]!);
  for (let i = 0; i < n; i++) {
    const next = statesAbove(d, energies_eV[i + 1]!);
    energy[i] = 0.5 * (energies_eV[i]! + energies_eV[i + 1]!);
    dos[i] = (Math.abs(next - prev) / Math.abs(energies_eV[i + 1]! - energies_eV[i]!)) * 1e14;
    prev = next;
  }
  return { energy_eV: energy, dos_per_eV_cm2: dos };
}

/**
 * DOS-averaged mass (m0) of one subband (both branches) within `window_eV` below its highest energy:
 * the mass of the parabolic subband holding as many states in that window,
 * m = πħ² N(E_top − ΔE)/ΔE = 2π (ħ²/2m0) N/ΔE with N per nm² (2-D DOS m/(πħ²), common practice).
 * Returns NaN when the subband does not fall by `window_eV` within the k grid (the count would be cut).
 */
export function dosMass(r: ValenceResult, weights: readonly number[], subband: number, window_eV: number): number {
  const d = holeDispersion(r, weights, [subband]);
  let top = -Infinity;
  let lastMax = -Infinity;
  for (const dir of d.directions) for (const b of dir.branches) {
    for (let i = 0; i < b.length; i++) top = Math.max(top, b[i]!);
    lastMax = Math.max(lastMax, b[b.length - 1]!);
  }
  const level = top - window_eV;
  if (lastMax > level) return NaN;
  return (2 * Math.PI * HBAR2_OVER_2M0 * statesAbove(d, level)) / window_eV;
}
