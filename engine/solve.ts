/**
 * The forward model: spec -> Structure -> band profiles -> bound states -> observables.
 * `solveStructure` is what every design, tolerance and campaign evaluation calls; `solve` is the
 * library entry point for a spec at its nominal variable values.
 */
import { HC_EV_NM, wavenumberPerCm } from './constants.js';
import { buildBandProfile, isPiecewiseConstant, type BandName, type BandProfile } from './profile.js';
import { twoBandFactor } from './solver1d/slices.js';
import { countStatesBelow, solveBand } from './solver1d/states.js';
import { wavefunction } from './solver1d/wavefunction.js';
import { followResonance, resonanceWavefunction, resonanceWidth, siegertPole, type Pole } from './resonance.js';
import { buildStructure, nominalVariables, PARAMETER_SET, type Structure } from './structure.js';
import type { Spec } from './input/schema.js';
import { parseLength, parseSheetDensity } from './input/units.js';
import { quasiFermiLevels, quasiFermiLevelsMultiband, type HoleDispersion } from './observables/carriers.js';
import { valenceOfSolve, type ValenceSummary } from './valence/summary.js';
import { opticsOfSpec, type OpticsResult } from './optics/optics.js';

/**
 * Longest stack whose valence dispersions `solve` computes (nm): the k·p grid grows with the stack
 * (a 1001-layer superlattice took 25–30 s); beyond it holes keep parabolic masses, said in limits.
 */
export const MAX_VALENCE_STACK_NM = 1000;
import { InputError } from './errors.js';
import { dipoleNm, intersubbandStates, oscillatorStrength, overlap2, weightedGrid } from './observables/matrix-elements.js';
import { permittivityOnGrid, subbandExciton } from './observables/exciton.js';
import { physicalIssues } from './sanity.js';
import { stepHeight2d } from './observables/dos.js';

export const BANDS: readonly BandName[] = ['electron', 'heavy_hole', 'light_hole'];
const PREFIX: Readonly<Record<BandName, string>> = { electron: 'e', heavy_hole: 'hh', light_hole: 'lh' };

export interface SolverSettings {
  /** Energy-dependent electron mass (two-band form). */
  readonly nonparabolic: boolean;
  /**
   * Largest flat slice (nm) under a field or in graded layers: resonances are Richardson-extrapolated
   * over it and its half, and wavefunctions sampled on the finer; bound-state energies come from
   * linear slices (Airy functions, engine/solver1d/states.ts) and do not depend on it.
   */
  readonly slice_nm: number;
  /** Upper limit on states per band (Infinity: all bound states, or the lowest DEFAULT_STATE_LIMIT of a band holding more). */
  readonly maxStates: number;
  /** Spacing of the z grid on which wavefunctions are sampled for overlaps (nm); coarser over a stack longer than MAX_GRID_POINTS of it. */
  readonly grid_nm: number;
  /**
   * Valence model of `solve`'s hole dispersions, DOS and quasi-Fermi levels (absent: 'kp4'); the
   * subband edges at k∥ = 0 are the single-band ones whatever the model, so searches never need it.
   */
  readonly valence?: 'kp4' | 'kp6' | 'parabolic';
  /** Axial approximation for those dispersions (absent: false). */
  readonly valenceAxial?: boolean;
}

/**
 * Defaults. Valence kp4: the hole DOS of strained and unstrained wells is two to three times the
 * parabolic in-plane one (heavy/light-hole mixing), which sets quasi-Fermi levels and the gain
 * condition; kp6 adds the split-off band (it matters for tensile strain and narrow-Δ materials).
 */
export const DEFAULT_SETTINGS: SolverSettings = { nonparabolic: true, slice_nm: 0.2, maxStates: Infinity, grid_nm: 0.05, valence: 'kp4', valenceAxial: false };

export interface StateResult {
  readonly label: string;
  readonly index: number;
  /** Energy on the absolute scale of the parameter set (eV). */
  readonly energy_eV: number;
  /** Energy above (electrons) or below (holes) the band's extremum in the structure (meV). */
  readonly confinement_meV: number;
  /**
   * False for a quasi-bound state: a resonance of the structure that a field lets leave over or
   * through the downhill barrier (engine/resonance.ts); its energy is the real part of the pole.
   */
  readonly bound: boolean;
  /** Width Γ of a quasi-bound state (meV, full width at half maximum; lifetime ħ/Γ); 0 for a bound state. */
  readonly width_meV: number;
  /** Zeros of ψ of the state (for a resonance, of the zero-field state it continues). */
  readonly nodes: number;
  /** Probability-weighted in-plane mass (m0): (∫|ψ|²/m∥ dz)⁻¹. */
  readonly mass_inplane: number;
}

export interface BandResult {
  readonly states: readonly StateResult[];
  /** Band extremum inside the structure (eV, absolute). */
  readonly edge_eV: number;
  /** Continuum edge: the lower (for holes, upper) of the two outer regions (eV, absolute). */
  readonly barrier_eV: number;
  readonly evaluations: number;
  /** Bound states the band holds, given when only the lowest of them were solved (SolveResult.limits says why). */
  readonly bound_states?: number;
}

export interface TransitionResult {
  readonly label: string;
  readonly kind: 'interband' | 'intersubband';
  readonly energy_eV: number;
  readonly wavelength_nm: number;
  readonly wavenumber_per_cm: number;
  /**
   * |⟨ψ_i|ψ_j⟩|²: interband, the envelope overlap; intersubband, in the inner product of the
   * energy-dependent mass (intersubbandStates), 0 by orthogonality.
   */
  readonly overlap2: number;
  /**
   * z_ij (nm), intersubband only: the origin-free velocity form with the energy-dependent mass
   * (intersubbandStates); for a pair with a resonance ∫ψ_i (z − z_c) ψ_j dz on the stack, z_c its centre.
   */
  readonly dipole_nm?: number;
  /**
   * Oscillator strength (2 m_i/ħ²)(E_j − E_i) z_ij², m_i the initial state's mass_inplane
   * (1/⟨i|1/m(z, E_i)|i⟩), intersubband only: Σ_j f_ij = 1 for a parabolic band (Thomas–Reiche–Kuhn),
   * below 1 over the conduction states with non-parabolicity.
   */
  readonly oscillator_strength?: number;
  /**
   * Interband only: exciton binding estimate (eV) of this electron–hole pair (subbandExciton:
   * fractional-dimension model with the envelopes' spread); NaN without wavefunctions or when a
   * layer's permittivity is unknown. The exciton line is energy_eV minus it.
   */
  readonly exciton_binding_eV?: number;
}

export interface DosStep {
  readonly label: string;
  readonly edge_eV: number;
  readonly mass_inplane: number;
  /** Height of this subband's step, m∥/(πħ²), in states cm⁻² eV⁻¹ (spin included). */
  readonly step_per_cm2_per_eV: number;
}

/** Quasi-Fermi levels of an injected, charge-neutral sheet population in the bound subbands. */
export interface CarrierResult {
  readonly sheet_density_cm2: number;
  readonly temperature_K: number;
  /** Absolute energy scale (eV). */
  readonly electron_quasi_fermi_eV: number;
  readonly hole_quasi_fermi_eV: number;
  readonly separation_eV: number;
  /** Separation above the e1-hh1 (or e1-lh1 when lh1 is on top) energy: the Bernard–Duraffourg condition for gain. */
  readonly inversion: boolean;
  readonly note: string;
}

export interface SolveResult {
  /** 'not-converged': a doped stack's self-consistent solve (engine/poisson/doped.ts) stopped at its iteration limit. */
  readonly status: 'ok' | 'no-bound-state' | 'unphysical' | 'not-converged';
  readonly message: string;
  readonly structure: Structure;
  readonly parameterSet: string;
  readonly settings: SolverSettings;
  readonly bands: Readonly<Record<BandName, BandResult>>;
  readonly transitions: readonly TransitionResult[];
  readonly dos: { readonly dimension: 2; readonly unit: string; readonly bands: Readonly<Record<BandName, readonly DosStep[]>> };
  /** Present when the spec gives carriers.sheet_density. */
  readonly carriers?: CarrierResult;
  /** Valence subband dispersions and DOS masses (`solve` with a multiband valence model and bound holes). */
  readonly valence?: ValenceSummary;
  /** Gain, absorption and spontaneous-emission spectra (`solve` of a spec with an `optics:` section). */
  readonly optics?: OpticsResult;
  /**
   * What this solve left out, one sentence each, when it limited itself: a band holding more than
   * DEFAULT_STATE_LIMIT bound states with no limit asked (a long stack, a superlattice) is solved
   * for its lowest ones, of which the lowest LIMITED_TRANSITION_STATES enter transitions (interband
   * pairs only where allowed); a stack longer than MAX_GRID_POINTS grid steps is sampled coarser.
   */
  readonly limits?: readonly string[];
  /** Wavefunctions on a uniform z grid (nm; z = 0 at the first layer's start), per band per state. */
  readonly wavefunctions: { readonly z_nm: Float64Array; readonly psi: Readonly<Record<BandName, readonly Float64Array[]>> };
}

/** Settings from a spec's `solver:` section over the defaults. */
export function settingsOf(spec: Spec): SolverSettings {
  const s = spec.solver ?? {};
  let slice_nm = DEFAULT_SETTINGS.slice_nm;
  if (s.slice !== undefined) {
    const l = parseLength(s.slice);
    if (typeof l === 'string' || 'ml' in l || !(l.nm > 0)) throw new InputError('bad-value', `solver.slice: expected a positive length in nm or Å, got ${JSON.stringify(s.slice)}`, 'solver.slice');
    slice_nm = l.nm;
  }
  return {
    nonparabolic: s.nonparabolic ?? DEFAULT_SETTINGS.nonparabolic,
    slice_nm,
    maxStates: s.max_states ?? DEFAULT_SETTINGS.maxStates,
    grid_nm: DEFAULT_SETTINGS.grid_nm,
    valence: s.valence ?? DEFAULT_SETTINGS.valence,
    valenceAxial: s.valence_axial ?? DEFAULT_SETTINGS.valenceAxial,
  };
}

/** One state of a band as solved: particle energy (eV), width (eV), and its pole when it is a resonance. */
interface SolvedState {
  readonly energy: number;
  readonly width: number;
  readonly nodes: number;
  readonly pole?: Pole;
}

interface SolvedBand {
  /** The flat-sliced profile wavefunctions are sampled on (the finer one under a field or grade), built on first use. */
  readonly profile: () => BandProfile;
  /** Lowest potential and open edge of the band (eV, particle sense). */
  readonly vmin: number;
  readonly openEdge: number;
  readonly sign: 1 | -1;
  readonly states: readonly SolvedState[];
  readonly evaluations: number;
  /** The band's bound-state count when the default limit cut it (see DEFAULT_STATE_LIMIT). */
  readonly limitedFrom?: number;
}

/**
 * States per band solved when neither the spec (solver.max_states) nor the caller limits them and
 * a band holds more bound states than this (a long stack or superlattice: a 1000-layer GaAs/AlGaAs
 * superlattice holds about 800 electron states; the 30-well detector of runs/ 60, all solved): the
 * lowest ones, stated in SolveResult.limits.
 */
export const DEFAULT_STATE_LIMIT = 64;

/**
 * States of a limited band (see DEFAULT_STATE_LIMIT) that enter transitions: its lowest ones. With
 * 64 states in each of three bands every pair would be some 14 000 overlaps and exciton estimates.
 */
export const LIMITED_TRANSITION_STATES = 16;

/**
 * Interband pairs with a limited band that are listed: envelope overlap² at least this. The others
 * are forbidden lines (a superlattice's pairs of different miniband wavevector, parity in a
 * symmetric stack), whose exciton estimates would cost seconds and say nothing.
 */
export const ALLOWED_OVERLAP2 = 1e-4;

/**
 * Most points of the z grid wavefunctions are sampled on: a stack longer than this many grid
 * steps (1 µm at the default 0.05 nm) is sampled more coarsely, stated in SolveResult.limits.
 * Simpson's rule on the grid errs by about (kh)⁴/180: below 1e-5 at 0.25 nm for states bound by
 * up to 0.3 eV in GaAs, where the per-state cost of sampling and of every overlap is five times less.
 */
export const MAX_GRID_POINTS = 20_000;

/**
 * Spacing (eV) that sets how far a state may move in one continuation step: its distance to the
 * nearer zero-field neighbour, or, for a lone state, its depth below the zero-field continuum.
 */
function spacingOf(zero: readonly number[], k: number, barrier: number): number {
  const gaps = [k > 0 ? zero[k]! - zero[k - 1]! : Infinity, k + 1 < zero.length ? zero[k + 1]! - zero[k]! : Infinity];
  const gap = Math.min(...gaps);
  return Number.isFinite(gap) ? gap : barrier - zero[k]!;
}

const uniformGrid = (length: number, step: number): Float64Array => {
  const n = Math.max(2, Math.round(length / step) + 1);
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = (length * i) / (n - 1);
  return z;
};

/**
 * Reach (eV) of the search for a resonance on the finer slicing from its pole on the coarser: going
 * from 0.2 to 0.1 nm slices moves a pole by 1e-8 to 1e-5 eV, while broad resonances of strong fields
 * can have neighbouring poles a few meV away.
 */
const REFINE_REACH = 1e-3;

/** Spacing (nm) of the grid on which a zero-field state's peak is located. */
const ANCHOR_GRID_NM = 0.1;

/** Position of the largest |ψ| on the grid. */
function peakOf(psi: Float64Array, z: Float64Array): number {
  let best = 0;
  for (let i = 1; i < psi.length; i++) if (Math.abs(psi[i]!) > Math.abs(psi[best]!)) best = i;
  return z[best]!;
}

/**
 * The states of one band: bound states (below the open edge) from the exact real solver, under a
 * field or in graded layers on linear slices (Airy transfer, no slicing error to extrapolate);
 * under a field, above them the resonances that continue the remaining zero-field bound states, in
 * order (a state the continuation loses ends the list, so labels keep their zero-field order).
 * Resonance energies are Richardson-extrapolated in the flat slice width; widths come from the
 * finer profile (their slicing error is relative, below 1e-4 at the default 0.2 nm).
 */
function solveOneBand(structure: Structure, band: BandName, settings: SolverSettings, asked: number, limitable: boolean): SolvedBand {
  const build = (h: number, s: Structure = structure): BandProfile => buildBandProfile(s, band, { maxSlice_nm: h, nonparabolic: settings.nonparabolic });
  const flat = isPiecewiseConstant(structure);
  let sampled: BandProfile | undefined;
  const profile = (): BandProfile => (sampled ??= build(flat ? settings.slice_nm : settings.slice_nm / 2));
  const exact = flat ? profile() : buildBandProfile(structure, band, { maxSlice_nm: settings.slice_nm, nonparabolic: settings.nonparabolic, linear: true });
  let vmin = Infinity;
  for (const s of exact.slices) vmin = Math.min(vmin, s.V - 0.5 * Math.abs(s.gradient?.V ?? 0) * s.width_nm);
  // No limit asked: one count sweep says whether the band holds more states than the default limit.
  const total = limitable ? countStatesBelow(exact, exact.openEdge) : 0;
  const ask = total > DEFAULT_STATE_LIMIT ? DEFAULT_STATE_LIMIT : asked;
  const band0 = { profile, vmin, openEdge: exact.openEdge, sign: exact.sign, ...(total > DEFAULT_STATE_LIMIT ? { limitedFrom: total } : {}) };
  const counted = limitable ? 1 : 0;
  if (ask === 0) return { ...band0, states: [], evaluations: counted };
  const options = Number.isFinite(ask) ? { maxStates: ask } : {};
  const asStates = (energies: readonly { energy: number; nodes: number }[]): SolvedState[] => energies.map((e) => ({ energy: e.energy, width: 0, nodes: e.nodes }));
  const bound = solveBand(exact, options);
  const states = asStates(bound.states);
  let evaluations = bound.evaluations + counted;
  const F = structure.field_kV_per_cm;
  if (F === 0 || states.length >= ask) return { ...band0, states, evaluations };
  const h = settings.slice_nm;
  const fine = profile();
  const zeroProfile = build(h, { ...structure, field_kV_per_cm: 0 });
  const zeroSolution = solveBand(zeroProfile, Number.isFinite(ask) ? { maxStates: ask + 1 } : {});
  evaluations += zeroSolution.evaluations;
  const zero = zeroSolution.states.map((x) => x.energy);
  const atFraction = (lambda: number): BandProfile => build(h, { ...structure, field_kV_per_cm: lambda * F });
  const grid = uniformGrid(structure.total_nm, ANCHOR_GRID_NM);
  for (let k = states.length; k < Math.min(ask, zero.length); k++) {
    const seed = { energy_eV: zero[k]!, scale_eV: spacingOf(zero, k, zeroSolution.barrier), anchor_nm: peakOf(wavefunction(zeroProfile, zero[k]!, grid), grid) };
    const coarse = followResonance(atFraction, seed);
    evaluations += coarse.evaluations;
    const c = coarse.pole;
    if (!c || !(c.openLeft || c.openRight)) break;
    // The finer slicing moves a pole by O(h²), far less than REFINE_REACH; a farther pole is another one.
    const refined = siegertPole(fine, c.energy, c.imaginary, seed.anchor_nm, Math.min(REFINE_REACH, seed.scale_eV / 4));
    evaluations += refined.evaluations;
    const f = refined.pole;
    if (!f) break;
    states.push({ energy: f.energy + (f.energy - c.energy) / 3, width: resonanceWidth(fine, f), nodes: k, pole: f });
  }
  return { ...band0, states, evaluations };
}

/**
 * Probability-weighted in-plane mass (∫|ψ|²/m∥ dz)⁻¹ at the state's energy: with two-band
 * non-parabolicity each slice's mass is m∥ · twoBandFactor(α, E − V), as along z.
 */
function inPlaneMass(profile: BandProfile, z: Float64Array, psi: Float64Array, energy: number): number {
  let acc = 0;
  let norm = 0;
  let i = 0;
  let end = 0;
  // Per slice: the sum of |ψ|² over its points, divided once by the slice's mass.
  for (let k = 0; k < profile.slices.length; k++) {
    const slice = profile.slices[k]!;
    end += slice.width_nm;
    const last = k === profile.slices.length - 1;
    let sum = 0;
    for (; i < z.length && (last || z[i]! <= end); i++) sum += psi[i]! * psi[i]!;
    acc += sum / (slice.massInPlane * twoBandFactor(slice.alpha, energy - slice.V));
    norm += sum;
  }
  return norm > 0 ? norm / acc : profile.slices[0]!.massInPlane;
}

/**
 * Solves a resolved structure: every bound state of the three bands and their observables; under a
 * field also the resonances that continue the zero-field bound states (`bound: false`, with their
 * width), never states of the contacts.
 * With `wavefunctions: false` (the inner loop of a search whose targets need only energies) no
 * wavefunction is sampled, so in-plane masses, overlaps, dipoles and oscillator strengths are NaN;
 * energies and widths are the same either way, so a search scores the states solve reports.
 */
export interface SolveOptions {
  /** Sample wavefunctions (needed for overlaps, dipoles, in-plane masses); default true. */
  readonly wavefunctions?: boolean;
  /**
   * Solve only the lowest n states of a band (0 skips it); a band not listed gets all its bound
   * states, or its lowest DEFAULT_STATE_LIMIT when it holds more.
   */
  readonly states?: Partial<Record<BandName, number>>;
  /** Called as the solve proceeds (for a progress display): `done` of `total` steps, `what` names the one just finished. */
  readonly onProgress?: (done: number, total: number, what: string) => void;
}

export function solveStructure(structure: Structure, settings: SolverSettings = DEFAULT_SETTINGS, options: SolveOptions = {}): SolveResult {
  const sample = options.wavefunctions ?? true;
  const step = Math.max(settings.grid_nm, structure.total_nm / MAX_GRID_POINTS);
  const z = sample ? uniformGrid(structure.total_nm, step) : new Float64Array(0);

  const bands = {} as Record<BandName, BandResult>;
  const psi = {} as Record<BandName, Float64Array[]>;
  const dosBands = {} as Record<BandName, DosStep[]>;
  let electronBand: ReturnType<typeof solveOneBand> | undefined;
  const limits: string[] = [];
  const progress = (done: number, what: string): void => options.onProgress?.(done, BANDS.length + 1, what);
  for (const [b, band] of BANDS.entries()) {
    const wanted = options.states?.[band];
    const ask = wanted === undefined ? settings.maxStates : Math.min(settings.maxStates, wanted);
    const solved = solveOneBand(structure, band, settings, ask, wanted === undefined && settings.maxStates === Infinity);
    if (band === 'electron') electronBand = solved;
    const { sign, vmin } = solved;
    const profile = sample ? solved.profile() : undefined;
    const waves = profile ? solved.states.map((s) => (s.pole ? resonanceWavefunction(profile, s.pole, z) : wavefunction(profile, s.energy, z))) : [];
    const states = solved.states.map((s, k): StateResult => ({
      label: `${PREFIX[band]}${k + 1}`,
      index: k + 1,
      energy_eV: sign * s.energy,
      confinement_meV: (s.energy - vmin) * 1000,
      bound: s.pole === undefined,
      width_meV: s.width * 1000,
      nodes: s.nodes,
      mass_inplane: profile ? inPlaneMass(profile, z, waves[k]!, s.energy) : NaN,
    }));
    bands[band] = { states, edge_eV: sign * vmin, barrier_eV: sign * solved.openEdge, evaluations: solved.evaluations, ...(solved.limitedFrom ? { bound_states: solved.limitedFrom } : {}) };
    if (solved.limitedFrom) limits.push(`${band}: the lowest ${states.length} of its ${solved.limitedFrom} bound states (set solver.max_states for more)`);
    progress(b + 1, `${band} states`);
    psi[band] = waves;
    dosBands[band] = states.map((s) => ({ label: s.label, edge_eV: s.energy_eV, mass_inplane: s.mass_inplane, step_per_cm2_per_eV: sample ? stepHeight2d(s.mass_inplane) : NaN }));
  }

  const transitions: TransitionResult[] = [];
  const grid = sample ? weightedGrid(z) : undefined;
  const photon = (dE: number): Pick<TransitionResult, 'energy_eV' | 'wavelength_nm' | 'wavenumber_per_cm'> => ({
    energy_eV: dE, wavelength_nm: HC_EV_NM / dE, wavenumber_per_cm: wavenumberPerCm(dE),
  });
  const electrons = bands.electron.states;
  const permittivity = grid ? permittivityOnGrid(structure.layers, z) : undefined;
  const knownPermittivity = permittivity !== undefined && permittivity.every(Number.isFinite);
  const exciton = (i: number, hole: BandName, j: number): number => (grid && knownPermittivity
    ? subbandExciton({ z, w: grid.w, psiElectron: psi.electron[i]!, psiHole: psi[hole][j]!, massElectron: electrons[i]!.mass_inplane, massHole: bands[hole].states[j]!.mass_inplane, permittivity: permittivity! }).binding_eV
    : NaN);
  if (sample && step > settings.grid_nm) limits.push(`wavefunctions: sampled every ${step.toPrecision(3)} nm (at most ${MAX_GRID_POINTS} steps over the stack), not ${settings.grid_nm} nm`);
  // A band cut by the default limit brings only its lowest states to transitions, and its interband pairs only where allowed.
  const limited = (b: BandName): boolean => bands[b].bound_states !== undefined;
  const inPairs = (b: BandName): number => (limited(b) ? Math.min(LIMITED_TRANSITION_STATES, bands[b].states.length) : bands[b].states.length);
  for (const b of BANDS) if (limited(b)) limits.push(`transitions: only ${b} states 1–${inPairs(b)}, and their interband pairs only where allowed (envelope overlap² ≥ ${ALLOWED_OVERLAP2})`);
  const nE = inPairs('electron');
  for (const hole of ['heavy_hole', 'light_hole'] as const) {
    const allowedOnly = grid !== undefined && (limited('electron') || limited(hole));
    for (const [i, e] of electrons.slice(0, nE).entries()) {
      for (const [j, h] of bands[hole].states.slice(0, inPairs(hole)).entries()) {
        // A pair that would emit at a negative energy exists only in a broken-gap structure (status unphysical): no line.
        if (!(e.energy_eV > h.energy_eV)) continue;
        const o2 = grid ? overlap2(psi.electron[i]!, psi[hole][j]!, grid) : NaN;
        if (allowedOnly && !(o2 >= ALLOWED_OVERLAP2)) continue;
        transitions.push({
          label: `${e.label}-${h.label}`, kind: 'interband', ...photon(e.energy_eV - h.energy_eV),
          overlap2: o2, exciton_binding_eV: exciton(i, hole, j),
        });
      }
    }
  }
  // Bound electron states (listed before any resonance) are orthogonal in the inner product of the
  // energy-dependent mass (intersubbandStates); a resonance has no finite norm there, so a pair with
  // one keeps the single-band integrals on the stack grid, about the stack's centre.
  const bound = electrons.slice(0, nE).filter((s) => s.bound).length;
  const twoBand = sample && bound > 1 ? intersubbandStates(electronBand!.profile(), electronBand!.states.slice(0, bound).map((s) => s.energy)) : undefined;
  const centred = grid ? { z: z.map((x) => x - structure.total_nm / 2), w: grid.w } : undefined;
  for (let i = 0; i < nE; i++) {
    for (let j = i + 1; j < nE; j++) {
      const dE = electrons[j]!.energy_eV - electrons[i]!.energy_eV;
      const both = twoBand !== undefined && j < bound && dE !== 0;
      const d = both ? twoBand.dipole(i, j) : centred ? dipoleNm(psi.electron[i]!, psi.electron[j]!, centred) : NaN;
      transitions.push({
        label: `${electrons[i]!.label}-${electrons[j]!.label}`, kind: 'intersubband', ...photon(dE),
        overlap2: both ? twoBand.overlap(i, j) ** 2 : grid ? overlap2(psi.electron[i]!, psi.electron[j]!, grid) : NaN, dipole_nm: d,
        oscillator_strength: sample ? oscillatorStrength(dE, d, electrons[i]!.mass_inplane) : NaN,
      });
    }
  }

  progress(BANDS.length + 1, 'transitions');
  const missing = BANDS.filter((b) => bands[b].states.length === 0);
  const unphysical = physicalIssues(structure);
  return {
    status: unphysical.length > 0 ? 'unphysical' : missing.length === 0 || (bands.electron.states.length > 0 && missing.length < 2) ? 'ok' : 'no-bound-state',
    message: unphysical.length > 0 ? `outside the model: ${unphysical.join('; ')}` : missing.length === 0 ? 'all three bands have bound states' : `no bound state in: ${missing.join(', ')}`,
    structure,
    parameterSet: PARAMETER_SET,
    settings,
    bands,
    transitions,
    dos: { dimension: 2, unit: 'states cm^-2 eV^-1 per subband (spin included)', bands: dosBands },
    ...(limits.length > 0 ? { limits } : {}),
    wavefunctions: { z_nm: z, psi },
  };
}

/**
 * Library entry point for a layer stack: solves a validated spec at its nominal (or given)
 * variable values. A `wire:` cross-section is solved by `solveWire` (engine/wire/solve.ts).
 */
export function solve(spec: Spec, values: Readonly<Record<string, number>> = nominalVariables(spec), options: Pick<SolveOptions, 'onProgress'> = {}): SolveResult {
  if (spec.wire !== undefined) throw new InputError('bad-value', 'wire: this spec describes a wire cross-section, not a layer stack; solve it as a wire ("wellsmith solve" does)', 'wire');
  const settings = settingsOf(spec);
  const solved = solveStructure(buildStructure(spec, values), settings, options);
  const holeCount = solved.bands.heavy_hole.states.length + solved.bands.light_hole.states.length;
  const model = settings.valence ?? 'kp4';
  const tooLong = solved.structure.total_nm > MAX_VALENCE_STACK_NM;
  const valence = model !== 'parabolic' && holeCount > 0 && solved.status !== 'unphysical' && !tooLong ? valenceOfSolve(solved.structure, model, settings.valenceAxial ?? false, holeCount) : undefined;
  const skipped = model !== 'parabolic' && holeCount > 0 && tooLong
    ? { limits: [...(solved.limits ?? []), `valence: no ${model} dispersions for a stack over ${MAX_VALENCE_STACK_NM} nm (${solved.structure.total_nm.toPrecision(4)} nm); holes with parabolic in-plane masses`] }
    : {};
  const withValence = valence ? { ...solved, valence: valence.summary } : { ...solved, ...skipped };
  const optics = spec.optics === undefined ? null : opticsOfSpec(withValence, spec.optics, spec.carriers?.sheet_density);
  const result = optics ? { ...withValence, optics } : withValence;
  if (spec.carriers === undefined) return result;
  const n = parseSheetDensity(spec.carriers.sheet_density);
  if (typeof n === 'string') throw new InputError('bad-value', `carriers.sheet_density: ${n}`, 'carriers.sheet_density');
  const carriers = carriersOf(result, n, valence?.holes);
  return carriers ? { ...result, carriers } : result;
}

/**
 * Quasi-Fermi levels for n = p injected per unit area, each carrier in equilibrium among its own
 * bound subbands (common practice for lasers under injection): electrons with their
 * probability-weighted in-plane masses, holes from the multiband dispersions when given (the
 * k·p subbands of valenceOfSolve), else with parabolic in-plane masses. Undefined when electrons
 * or holes have no bound subband or T = 0.
 */
export function carriersOf(r: SolveResult, sheetDensity_cm2: number, holeDispersion?: HoleDispersion): CarrierResult | undefined {
  const T = r.structure.temperature_K;
  const holes = [...r.bands.heavy_hole.states, ...r.bands.light_hole.states];
  if (r.bands.electron.states.length === 0 || holes.length === 0 || !(T > 0)) return undefined;
  const electronSubbands = r.bands.electron.states.map((s) => ({ energy: s.energy_eV, mass: s.mass_inplane }));
  const q = holeDispersion
    ? quasiFermiLevelsMultiband({ electronSubbands, holeDispersion, sheetDensity_cm2, temperature_K: T })
    : quasiFermiLevels({ electronSubbands, holeSubbands: holes.map((s) => ({ energy: -s.energy_eV, mass: s.mass_inplane })), sheetDensity_cm2, temperature_K: T });
  const holeModel = holeDispersion && r.valence
    ? `holes from the ${r.valence.model === 'kp4' ? '4×4' : '6×6'} k·p subband dispersions (DOS averaged over ${r.valence.axial ? 'the axial approximation' : '[100] and [110]'})`
    : 'holes with parabolic in-plane masses of the single-band subbands';
  const e1 = r.bands.electron.states[0]!.energy_eV;
  const topHole = Math.max(...holes.map((s) => s.energy_eV));
  return {
    sheet_density_cm2: sheetDensity_cm2,
    temperature_K: T,
    electron_quasi_fermi_eV: q.electron_eV,
    hole_quasi_fermi_eV: q.hole_eV,
    separation_eV: q.separation_eV,
    inversion: q.separation_eV > e1 - topHole,
    note: `${holeModel}; bound subbands only: at densities that fill states near the barrier edge the continuum also holds carriers`,
  };
}

/**
 * A state by its label ("e1", "hh2", "lh1"), or undefined when that state is not bound. Works on
 * any result of the solve shape (wells, wires, the objectives' TargetSource).
 */
export function findState<S extends { readonly label: string }>(r: { readonly bands: Readonly<Record<BandName, { readonly states: readonly S[] }>> }, label: string): S | undefined {
  const b = bandOfLabel(label);
  return b ? r.bands[b.band].states.find((x) => x.label === label) : undefined;
}

/** A transition by its label ("e1-hh1", "e1-e2"), or undefined when a state of it is missing. */
export const findTransition = <T extends { readonly label: string }>(r: { readonly transitions: readonly T[] }, label: string): T | undefined =>
  r.transitions.find((t) => t.label === label);

/** The band a state label belongs to ("hh2" -> heavy_hole), or undefined for a malformed label. */
export function bandOfLabel(label: string): { band: BandName; index: number } | undefined {
  const m = /^(e|hh|lh)([1-9]\d*)$/.exec(label);
  if (!m) return undefined;
  const band = m[1] === 'e' ? 'electron' : m[1] === 'hh' ? 'heavy_hole' : 'light_hole';
  return { band, index: Number(m[2]) };
}
