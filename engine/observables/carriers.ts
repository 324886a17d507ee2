/**
 * Carrier densities of wells and wires under Fermi–Dirac statistics, their inverses (Fermi level
 * for a density) and the quasi-Fermi levels of an injected electron–hole population.
 * Energies eV (particle sense, see engine/profile.ts), masses m0, T in K; sheet densities cm⁻²,
 * line densities cm⁻¹.
 */
import { HBAR2_OVER_2M0, KB_EV_PER_K } from '../constants.js';
import { failBadValue } from '../errors.js';
import { stepHeight2d } from './dos.js';
import type { Subband } from './dos.js';
import { logFermiDirac, rootOfIncreasing } from './fermi.js';
import type { FermiOrder } from './fermi.js';

export type { Subband } from './dos.js';

const NM_PER_CM = 1e7;

const fail = failBadValue;

const checkCommon = (subbands: readonly Subband[], temperature: number, where: string): void => {
  if (subbands.length === 0) fail(`${where}.subbands`, 'needs at least one subband', 'an empty list', 'pass the bound states of the band');
  subbands.forEach((s, i) => {
    if (!Number.isFinite(s.energy)) fail(`${where}.subbands[${i}].energy`, 'must be finite (eV)', s.energy, 'pass the subband edge in eV');
    if (!(s.mass > 0) || !Number.isFinite(s.mass)) fail(`${where}.subbands[${i}].mass`, 'must be positive and finite (m0)', s.mass, 'pass the effective mass in units of m0');
  });
  if (!(temperature > 0) || !Number.isFinite(temperature)) fail(`${where}.temperature_K`, 'must be positive and finite (K)', temperature, 'pass the lattice temperature in kelvin; use a small T such as 0.01 K for the degenerate limit');
};

const checkFinite = (value: number, where: string, unit: string): void => {
  if (!Number.isFinite(value)) fail(where, `must be finite (${unit})`, value, `pass a finite value in ${unit}`);
};

const checkDensity = (value: number, where: string, unit: string): void => {
  if (!(value > 0) || !Number.isFinite(value)) fail(where, `must be positive and finite (${unit})`, value, `pass the carrier density in ${unit}`);
};

/** One summand family of a density: n = Σ_n A_n F_j((E_F − E_n)/kT). */
interface Statistics {
  readonly order: FermiOrder;
  /** ln A_n per subband, A in the density's unit. */
  readonly logPrefactors: readonly number[];
}

/** ln n(E_F) = ln Σ_n A_n F_j(η_n) by log-sum-exp, finite far into the non-degenerate tail. */
const logDensity = (subbands: readonly Subband[], stats: Statistics, kT: number, fermiLevel: number): number => {
  const terms = subbands.map((s, i) => stats.logPrefactors[i] + logFermiDirac(stats.order, (fermiLevel - s.energy) / kT));
  const top = Math.max(...terms);
  return top + Math.log(terms.reduce((sum, t) => sum + Math.exp(t - top), 0));
};

/** ln of m kT/(πħ²) per subband, in cm⁻². */
const sheetStatistics = (subbands: readonly Subband[], kT: number): Statistics => ({
  order: 0,
  logPrefactors: subbands.map((s) => Math.log(stepHeight2d(s.mass) * kT)),
});

/** ln of √(2 m kT π)/(πħ) per subband, in cm⁻¹: √(2m m0 kT)/ħ = √(m kT/(ħ²/2m0)) nm⁻¹. */
const lineStatistics = (subbands: readonly Subband[], kT: number): Statistics => ({
  order: -0.5,
  logPrefactors: subbands.map((s) => Math.log((Math.sqrt((Math.PI * s.mass * kT) / HBAR2_OVER_2M0) / Math.PI) * NM_PER_CM)),
});

/**
 * Fermi level at which ln n = ln target, bracketed from below by the non-degenerate bound
 * n ≤ Σ A_n e^(η_n) (F_j(η) < e^η), so the first guess never overshoots.
 */
const solveFermiLevel = (subbands: readonly Subband[], stats: Statistics, kT: number, target: number): number => {
  const lowest = Math.min(...subbands.map((s) => s.energy));
  const totalPrefactor = stats.logPrefactors.reduce((sum, l) => sum + Math.exp(l), 0);
  const lo = lowest + kT * (Math.log(target) - Math.log(totalPrefactor));
  const hi = Math.max(lo, lowest) + 0.1;
  const logTarget = Math.log(target);
  // 1e-13 kT keeps the density error ≲ 1e-13 relative; 4e-16 |E| is the floating-point floor
  const tolerance = 1e-13 * kT + 4e-16 * Math.max(Math.abs(lo), Math.abs(hi));
  return rootOfIncreasing((ef) => logDensity(subbands, stats, kT, ef) - logTarget, lo, hi, tolerance);
};

/**
 * Sheet density of a well's subbands: n2D = Σ_n (m_n kT/(πħ²)) ln(1 + e^((E_F − E_n)/kT)).
 *
 * The 2-D staircase integrated against the Fermi function, in closed form since F_0(η) =
 * ln(1 + e^η) (common practice); at T → 0 it tends to Σ_n m_n (E_F − E_n)/(πħ²) over occupied
 * subbands. Holes: pass hole subband energies and the hole quasi-Fermi level in the particle
 * sense (energy = −absolute energy, downward from the valence band), and the result is the hole
 * density, because a missing electron at absolute energy E is a hole at −E.
 *
 * @param args.subbands edges (eV, particle sense) and in-plane masses (m0).
 * @param args.fermiLevel_eV Fermi (or quasi-Fermi) level in eV, same sense as the edges.
 * @param args.temperature_K temperature (K, > 0).
 * @returns carriers per cm².
 * @example sheetDensity({ subbands: [{ energy: 0, mass: 0.067 }], fermiLevel_eV: 0, temperature_K: 300 })
 *   // = 2.80e13 × 0.02585 × ln 2 ≈ 5.0e11
 */
export function sheetDensity(args: { readonly subbands: readonly Subband[]; readonly fermiLevel_eV: number; readonly temperature_K: number }): number {
  checkCommon(args.subbands, args.temperature_K, 'sheetDensity');
  checkFinite(args.fermiLevel_eV, 'sheetDensity.fermiLevel_eV', 'eV');
  const kT = KB_EV_PER_K * args.temperature_K;
  return Math.exp(logDensity(args.subbands, sheetStatistics(args.subbands, kT), kT, args.fermiLevel_eV));
}

/**
 * Fermi level giving a sheet density: the inverse of sheetDensity.
 *
 * Safeguarded root finding (bracket widening, then Illinois regula falsi) on ln n2D(E_F) − ln n,
 * which is increasing in E_F; round trip to about 1e-12 relative in density.
 *
 * @param args.subbands edges (eV, particle sense) and in-plane masses (m0).
 * @param args.density_cm2 sheet density (cm⁻², > 0).
 * @param args.temperature_K temperature (K, > 0).
 * @returns Fermi level in eV, same sense as the edges.
 */
export function fermiLevelForSheetDensity(args: { readonly subbands: readonly Subband[]; readonly density_cm2: number; readonly temperature_K: number }): number {
  checkCommon(args.subbands, args.temperature_K, 'fermiLevelForSheetDensity');
  checkDensity(args.density_cm2, 'fermiLevelForSheetDensity.density_cm2', 'cm⁻²');
  const kT = KB_EV_PER_K * args.temperature_K;
  return solveFermiLevel(args.subbands, sheetStatistics(args.subbands, kT), kT, args.density_cm2);
}

/**
 * Line density of a wire's subbands: n1D = Σ_n (√(2 m_n kT π)/(πħ)) F_{-1/2}((E_F − E_n)/kT).
 *
 * From n = ∫ g1 f dE with g1 = √(2m)/(πħ) (E − E_n)^(−1/2): t = (E − E_n)/kT gives
 * √(2m kT)/(πħ) ∫ t^(−1/2)/(1 + e^(t−η)) dt = √(2m kT)/(πħ) Γ(1/2) F_{-1/2}(η) with the normalised
 * F_{-1/2} (engine/observables/fermi.ts). At T → 0, F_{-1/2}(η) → 2√η/√π and n1D → Σ_n (2/π) k_F,n
 * with k_F,n = √(2m(E_F − E_n))/ħ. Holes as for sheetDensity (particle sense).
 *
 * @param args.subbands edges (eV, particle sense) and masses along the wire (m0).
 * @param args.fermiLevel_eV Fermi level (eV).
 * @param args.temperature_K temperature (K, > 0).
 * @returns carriers per cm.
 */
export function lineDensity(args: { readonly subbands: readonly Subband[]; readonly fermiLevel_eV: number; readonly temperature_K: number }): number {
  checkCommon(args.subbands, args.temperature_K, 'lineDensity');
  checkFinite(args.fermiLevel_eV, 'lineDensity.fermiLevel_eV', 'eV');
  const kT = KB_EV_PER_K * args.temperature_K;
  return Math.exp(logDensity(args.subbands, lineStatistics(args.subbands, kT), kT, args.fermiLevel_eV));
}

/**
 * Fermi level giving a line density: the inverse of lineDensity, by the same safeguarded root
 * finding as fermiLevelForSheetDensity.
 *
 * @param args.subbands edges (eV, particle sense) and masses along the wire (m0).
 * @param args.density_cm1 line density (cm⁻¹, > 0).
 * @param args.temperature_K temperature (K, > 0).
 * @returns Fermi level in eV.
 */
export function fermiLevelForLineDensity(args: { readonly subbands: readonly Subband[]; readonly density_cm1: number; readonly temperature_K: number }): number {
  checkCommon(args.subbands, args.temperature_K, 'fermiLevelForLineDensity');
  checkDensity(args.density_cm1, 'fermiLevelForLineDensity.density_cm1', 'cm⁻¹');
  const kT = KB_EV_PER_K * args.temperature_K;
  return solveFermiLevel(args.subbands, lineStatistics(args.subbands, kT), kT, args.density_cm1);
}

/** Quasi-Fermi levels of an injected, charge-neutral electron–hole sheet population. */
export interface QuasiFermiLevels {
  /** Electron quasi-Fermi level, absolute energy scale (eV). */
  readonly electron_eV: number;
  /** Hole quasi-Fermi level, absolute energy scale (eV): minus the particle-sense level. */
  readonly hole_eV: number;
  /** electron_eV − hole_eV (eV); exceeding the transition energy is the condition for gain. */
  readonly separation_eV: number;
}

/**
 * Quasi-Fermi levels for equal injected electron and hole sheet densities n = p.
 *
 * Each band is inverted separately with fermiLevelForSheetDensity (electrons and holes are each
 * in equilibrium among their own subbands, common practice for lasers under injection). Hole
 * subbands (heavy and light holes together) are given in the particle sense, energy = −absolute
 * energy as in engine/profile.ts; the hole level is returned on the absolute scale.
 *
 * @param args.electronSubbands electron edges (eV, absolute) and in-plane masses (m0).
 * @param args.holeSubbands hole edges (eV, particle sense) and in-plane masses (m0).
 * @param args.sheetDensity_cm2 injected density of each carrier (cm⁻², > 0).
 * @param args.temperature_K temperature (K, > 0).
 * @returns both levels (absolute, eV) and their separation.
 */
export function quasiFermiLevels(args: {
  readonly electronSubbands: readonly Subband[];
  readonly holeSubbands: readonly Subband[];
  readonly sheetDensity_cm2: number;
  readonly temperature_K: number;
}): QuasiFermiLevels {
  const electron = fermiLevelForSheetDensity({ subbands: args.electronSubbands, density_cm2: args.sheetDensity_cm2, temperature_K: args.temperature_K });
  const hole = -fermiLevelForSheetDensity({ subbands: args.holeSubbands, density_cm2: args.sheetDensity_cm2, temperature_K: args.temperature_K });
  return { electron_eV: electron, hole_eV: hole, separation_eV: electron - hole };
}

/**
 * In-plane dispersions of hole subbands, as plain data: the same k grid for every direction, and per
 * direction a quadrature weight (the weights sum to 1 over the in-plane angle) and the branches'
 * energies (eV, absolute scale: electron energies, holes lie lower) at each k. Every branch is one
 * state per k (spin is not counted again). engine/valence/dos.ts builds it from the multiband solver.
 */
export interface HoleDispersion {
  readonly k_per_nm: ArrayLike<number>;
  readonly directions: readonly { readonly weight: number; readonly branches: readonly ArrayLike<number>[] }[];
}

const NM2_TO_CM2 = 1e14;

/** Checks a dispersion once: finite energies, k ascending from 0, weights positive and summing to 1. */
function checkDispersion(d: HoleDispersion, where: string): void {
  const k = d.k_per_nm;
  if (k.length < 2) fail(`${where}.k_per_nm`, 'needs at least two points', k.length, 'pass a k grid from 0 outwards');
  for (let i = 0; i < k.length; i++) {
    if (!Number.isFinite(k[i]!) || (i === 0 ? k[0] !== 0 : !(k[i]! > k[i - 1]!))) fail(`${where}.k_per_nm[${i}]`, 'must start at 0 and increase', k[i], 'pass an ascending grid from k = 0 (1/nm)');
  }
  if (d.directions.length === 0) fail(`${where}.directions`, 'needs at least one direction', 0, 'pass the in-plane directions with their weights');
  let sum = 0;
  d.directions.forEach((dir, j) => {
    if (!(dir.weight > 0)) fail(`${where}.directions[${j}].weight`, 'must be positive', dir.weight, 'pass the quadrature weight of the direction');
    sum += dir.weight;
    dir.branches.forEach((b, n) => {
      if (b.length !== k.length) fail(`${where}.directions[${j}].branches[${n}]`, `must have one energy per k (${k.length})`, b.length, 'pass E(k) on the k grid');
      for (let i = 0; i < b.length; i++) if (!Number.isFinite(b[i]!)) fail(`${where}.directions[${j}].branches[${n}][${i}]`, 'must be finite (eV)', b[i], 'pass finite energies');
    });
  });
  if (Math.abs(sum - 1) > 1e-9) fail(`${where}.directions`, 'weights must sum to 1', sum, 'normalise the angular quadrature weights');
}

/**
 * ln of the hole sheet density (ln cm⁻²) at hole quasi-Fermi level F (eV, absolute), from dispersions:
 * p = Σ_dir w Σ_branch (1/2π) ∫ k dk / (1 + e^((F − E(k))/kT)) (one state per branch per (2π)² of
 * k-space area; 1 − f is the hole occupancy). With u = k² and E linear in u between grid points —
 * exact for parabolic bands — each interval integrates in closed form:
 * ∫ du/(1 + e^((F − E)/kT)) = (kT/s)[ln(1 + e^(x_b)) − ln(1 + e^(x_a))], x = (E − F)/kT, s = dE/du;
 * beyond the last point each branch continues with its last slope (the parabolic tail), or adds
 * nothing if it is not falling there. Factored by e^(x_max) so that it stays finite far from the band.
 */
function logHoleDensity(d: HoleDispersion, F: number, kT: number): number {
  const k = d.k_per_nm;
  const n = k.length - 1;
  let xmax = -Infinity;
  for (const dir of d.directions) for (const b of dir.branches) for (let i = 0; i < b.length; i++) xmax = Math.max(xmax, (b[i]! - F) / kT);
  const shift = Math.min(xmax, 0);
  // e^(−shift) ln(1 + e^x), finite for every x: below x = −30 as e^(x − shift)(1 − e^x/2), since
  // e^(−shift) alone may overflow there (shift < −30 only when every x is below it).
  const scale = shift > -30 ? Math.exp(-shift) : 0;
  const sp = (x: number): number => (x > 30 ? (x + Math.log1p(Math.exp(-x))) * scale : x > -30 ? Math.log1p(Math.exp(x)) * scale : Math.exp(x - shift) * (1 - 0.5 * Math.exp(x)));
  let total = 0;
  for (const dir of d.directions) {
    let sum = 0;
    for (const b of dir.branches) {
      let ua = 0;
      let xa = (b[0]! - F) / kT;
      let spa = sp(xa);
      for (let i = 0; i < n; i++) {
        const ub = k[i + 1]! * k[i + 1]!;
        const xb = (b[i + 1]! - F) / kT;
        const spb = sp(xb);
        // Δu (sp_b − sp_a)/(x_b − x_a) = (kT/s)(sp_b − sp_a); nearly flat intervals: the midpoint rule, to avoid 0/0.
        sum += Math.abs(xb - xa) < 1e-9 ? (ub - ua) * Math.exp(0.5 * (xa + xb) - shift) / (1 + Math.exp(0.5 * (xa + xb))) : ((ub - ua) * (spb - spa)) / (xb - xa);
        ua = ub;
        xa = xb;
        spa = spb;
      }
      const s = (b[n]! - b[n - 1]!) / (k[n]! * k[n]! - k[n - 1]! * k[n - 1]!);
      if (s < 0) sum += (-kT / s) * spa;
    }
    total += dir.weight * sum;
  }
  // (1/2π)·(1/2)∫du per branch, nm⁻² → cm⁻².
  return Math.log((total / (4 * Math.PI)) * NM2_TO_CM2) + shift;
}

/**
 * Hole sheet density of multiband valence subbands from their in-plane dispersions (the hole DOS of
 * the k·p solver, engine/valence/), Fermi–Dirac statistics.
 *
 * p = Σ_dir w Σ_branch (1/2π) ∫ k dk [1 − f(E(k))], integrated exactly for E piecewise linear in k²
 * (see logHoleDensity); the angular quadrature is the caller's (weights of the directions).
 *
 * @param args.dispersion k grid (1/nm) and branch energies (eV, absolute) per direction.
 * @param args.fermiLevel_eV hole quasi-Fermi level, absolute scale (eV).
 * @param args.temperature_K temperature (K, > 0).
 * @returns holes per cm².
 */
export function holeSheetDensity(args: { readonly dispersion: HoleDispersion; readonly fermiLevel_eV: number; readonly temperature_K: number }): number {
  checkDispersion(args.dispersion, 'holeSheetDensity.dispersion');
  checkFinite(args.fermiLevel_eV, 'holeSheetDensity.fermiLevel_eV', 'eV');
  if (!(args.temperature_K > 0) || !Number.isFinite(args.temperature_K)) fail('holeSheetDensity.temperature_K', 'must be positive and finite (K)', args.temperature_K, 'pass the temperature in kelvin');
  return Math.exp(logHoleDensity(args.dispersion, args.fermiLevel_eV, KB_EV_PER_K * args.temperature_K));
}

/**
 * Hole quasi-Fermi level (eV, absolute) giving a hole sheet density, the inverse of
 * holeSheetDensity: rootOfIncreasing on ln p(−y) − ln p in y = −F (p falls as F rises).
 *
 * @param args.dispersion as for holeSheetDensity.
 * @param args.density_cm2 hole density (cm⁻², > 0).
 * @param args.temperature_K temperature (K, > 0).
 */
export function holeFermiLevelForDensity(args: { readonly dispersion: HoleDispersion; readonly density_cm2: number; readonly temperature_K: number }): number {
  checkDispersion(args.dispersion, 'holeFermiLevelForDensity.dispersion');
  checkDensity(args.density_cm2, 'holeFermiLevelForDensity.density_cm2', 'cm⁻²');
  if (!(args.temperature_K > 0) || !Number.isFinite(args.temperature_K)) fail('holeFermiLevelForDensity.temperature_K', 'must be positive and finite (K)', args.temperature_K, 'pass the temperature in kelvin');
  const kT = KB_EV_PER_K * args.temperature_K;
  let top = -Infinity;
  for (const dir of args.dispersion.directions) for (const b of dir.branches) top = Math.max(top, b[0]!);
  const target = Math.log(args.density_cm2);
  const y = rootOfIncreasing((v) => logHoleDensity(args.dispersion, -v, kT) - target, -top - 5 * kT, -top + 5 * kT, 1e-13 * kT + 4e-16 * Math.abs(top));
  return -y;
}

/**
 * Quasi-Fermi levels for n = p injected per unit area with multiband holes: electrons from their
 * parabolic subbands (fermiLevelForSheetDensity), holes from the valence dispersions
 * (holeFermiLevelForDensity). Same conventions and result as quasiFermiLevels.
 */
export function quasiFermiLevelsMultiband(args: {
  readonly electronSubbands: readonly Subband[];
  readonly holeDispersion: HoleDispersion;
  readonly sheetDensity_cm2: number;
  readonly temperature_K: number;
}): QuasiFermiLevels {
  const electron = fermiLevelForSheetDensity({ subbands: args.electronSubbands, density_cm2: args.sheetDensity_cm2, temperature_K: args.temperature_K });
  const hole = holeFermiLevelForDensity({ dispersion: args.holeDispersion, density_cm2: args.sheetDensity_cm2, temperature_K: args.temperature_K });
  return { electron_eV: electron, hole_eV: hole, separation_eV: electron - hole };
}

/** The dispersion with every energy negated: electrons at E with level F are holes at −E with level −F. */
const mirrored = (d: HoleDispersion): HoleDispersion => ({
  k_per_nm: d.k_per_nm,
  directions: d.directions.map((dir) => ({ weight: dir.weight, branches: dir.branches.map((b) => Float64Array.from(b, (e) => -e)) })),
});

/**
 * Electron sheet density (cm⁻²) of conduction subbands given by their in-plane dispersions
 * (energies eV, absolute, rising with k; one branch per spin state, so a spin-degenerate subband is
 * listed twice), e.g. non-parabolic subbands: n = Σ_dir w Σ_branch (1/2π) ∫ k dk f(E(k)).
 * By the mirror E → −E, F → −F, f(E; F) = 1 − f(−E; −F), so this is holeSheetDensity of the mirrored
 * dispersion at −F, with the same exact integration (linear in k² between points, the last slope beyond).
 */
export function electronSheetDensity(args: { readonly dispersion: HoleDispersion; readonly fermiLevel_eV: number; readonly temperature_K: number }): number {
  return holeSheetDensity({ dispersion: mirrored(args.dispersion), fermiLevel_eV: -args.fermiLevel_eV, temperature_K: args.temperature_K });
}

/** Electron quasi-Fermi level (eV, absolute) for a sheet density, the inverse of electronSheetDensity. */
export function electronFermiLevelForDensity(args: { readonly dispersion: HoleDispersion; readonly density_cm2: number; readonly temperature_K: number }): number {
  return -holeFermiLevelForDensity({ dispersion: mirrored(args.dispersion), density_cm2: args.density_cm2, temperature_K: args.temperature_K });
}
