/**
 * The forward model: spec -> Structure -> band profiles -> bound states -> observables.
 * `solveStructure` is what every design, tolerance and campaign evaluation calls; `solve` is the
 * library entry point for a spec at its nominal variable values.
 */
import { HC_EV_NM, wavenumberPerCm } from './constants.js';
import { buildBandProfile, isPiecewiseConstant, type BandName, type BandProfile } from './profile.js';
import { solveBand, solveBandExtrapolated, wavefunction, type BandSolution } from './solver1d.js';
import { buildStructure, nominalVariables, PARAMETER_SET, type Structure } from './structure.js';
import type { Spec } from './spec/schema.js';
import { parseLength, parseSheetDensity } from './spec/units.js';
import { quasiFermiLevels } from './observables/carriers.js';
import { InputError } from './errors.js';
import { dipoleNm, oscillatorStrength, overlap2, weightedGrid } from './observables/matrix-elements.js';
import { stepHeight2d } from './observables/dos.js';

export const BANDS: readonly BandName[] = ['electron', 'heavy_hole', 'light_hole'];
const PREFIX: Readonly<Record<BandName, string>> = { electron: 'e', heavy_hole: 'hh', light_hole: 'lh' };

export interface SolverSettings {
  /** Energy-dependent electron mass (two-band form). */
  readonly nonparabolic: boolean;
  /** Largest slice (nm) for graded layers and fields; results are Richardson-extrapolated. */
  readonly slice_nm: number;
  /** Upper limit on states per band (Infinity: all bound states). */
  readonly maxStates: number;
  /** Spacing of the z grid on which wavefunctions are sampled for overlaps (nm). */
  readonly grid_nm: number;
}

export const DEFAULT_SETTINGS: SolverSettings = { nonparabolic: true, slice_nm: 0.2, maxStates: Infinity, grid_nm: 0.05 };

export interface StateResult {
  readonly label: string;
  readonly index: number;
  /** Energy on the absolute scale of the parameter set (eV). */
  readonly energy_eV: number;
  /** Energy above (electrons) or below (holes) the band's extremum in the structure (meV). */
  readonly confinement_meV: number;
  /** False for a quasi-bound state: one a field lets leave over or through the downhill barrier. */
  readonly bound: boolean;
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
}

export interface TransitionResult {
  readonly label: string;
  readonly kind: 'interband' | 'intersubband';
  readonly energy_eV: number;
  readonly wavelength_nm: number;
  readonly wavenumber_per_cm: number;
  /** |⟨ψ_i|ψ_j⟩|² (interband envelope overlap; 0 for intersubband pairs of one band by orthogonality). */
  readonly overlap2: number;
  /** ⟨ψ_i|z|ψ_j⟩ (nm), intersubband only. */
  readonly dipole_nm?: number;
  /** Oscillator strength (dimensionless), intersubband only. */
  readonly oscillator_strength?: number;
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
  readonly status: 'ok' | 'no-bound-state';
  readonly message: string;
  readonly structure: Structure;
  readonly parameterSet: string;
  readonly settings: SolverSettings;
  readonly bands: Readonly<Record<BandName, BandResult>>;
  readonly transitions: readonly TransitionResult[];
  readonly dos: { readonly dimension: 2; readonly unit: string; readonly bands: Readonly<Record<BandName, readonly DosStep[]>> };
  /** Present when the spec gives carriers.sheet_density. */
  readonly carriers?: CarrierResult;
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
  };
}

function solveOneBand(structure: Structure, band: BandName, settings: SolverSettings): { profile: BandProfile; solution: BandSolution } {
  const build = (h: number): BandProfile => buildBandProfile(structure, band, { maxSlice_nm: h, nonparabolic: settings.nonparabolic });
  if (settings.maxStates === 0) {
    const profile = build(settings.slice_nm);
    return { profile, solution: { band, sign: profile.sign, states: [], barrier: Math.min(profile.left.V, profile.right.V), evaluations: 0 } };
  }
  const options = Number.isFinite(settings.maxStates) ? { maxStates: settings.maxStates } : {};
  if (isPiecewiseConstant(structure)) {
    const profile = build(settings.slice_nm);
    return { profile, solution: solveBand(profile, options) };
  }
  // Wavefunctions come from the finer profile; energies from the extrapolation.
  return { profile: build(settings.slice_nm / 2), solution: solveBandExtrapolated(build, settings.slice_nm, options) };
}

/**
 * Probability-weighted in-plane mass (∫|ψ|²/m∥ dz)⁻¹ at the state's energy: with two-band
 * non-parabolicity each slice's mass is m∥(1 + α(E − V)), as along z.
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
    acc += sum / (slice.massInPlane * (1 + slice.alpha * (energy - slice.V)));
    norm += sum;
  }
  return norm > 0 ? norm / acc : profile.slices[0]!.massInPlane;
}

/**
 * Fraction of |ψ|² in the downhill outer layer (the first or the last layer, whichever the field
 * pulls lower). Above the open edge a state mostly there is a box state of the contact, not a
 * state of the structure.
 */
function contactShare(structure: Structure, profile: BandProfile, z: Float64Array, psi: Float64Array): number {
  const leftDownhill = profile.slices[0]!.V < profile.slices[profile.slices.length - 1]!.V;
  const a = structure.layers[0]!.thickness_nm;
  const b = structure.total_nm - structure.layers[structure.layers.length - 1]!.thickness_nm;
  let inside = 0;
  let all = 0;
  for (let i = 0; i < z.length; i++) {
    const p = psi[i]! * psi[i]!;
    all += p;
    if (leftDownhill ? z[i]! < a : z[i]! > b) inside += p;
  }
  return all > 0 ? inside / all : 0;
}

/** Spacing (nm) of the grid that sorts states above the open edge when no wavefunctions are sampled. */
const SORT_GRID_NM = 0.25;
/** Extra states asked for under a field, so that contact box states do not push real ones out of a limited count. */
const FIELD_STATE_MARGIN = 3;

const uniformGrid = (length: number, step: number): Float64Array => {
  const n = Math.max(2, Math.round(length / step) + 1);
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = (length * i) / (n - 1);
  return z;
};

/**
 * Solves a resolved structure: every bound state of the three bands and their observables.
 * With `wavefunctions: false` (the inner loop of a search whose targets need only energies) no
 * wavefunction is sampled, so in-plane masses, overlaps, dipoles and oscillator strengths are NaN
 * and the structure's quasi-bound filtering under a field uses energies only.
 */
export interface SolveOptions {
  /** Sample wavefunctions (needed for overlaps, dipoles, in-plane masses); default true. */
  readonly wavefunctions?: boolean;
  /** Solve only the lowest n states of a band (0 skips it); a band not listed gets all its bound states. */
  readonly states?: Partial<Record<BandName, number>>;
}

export function solveStructure(structure: Structure, settings: SolverSettings = DEFAULT_SETTINGS, options: SolveOptions = {}): SolveResult {
  const sample = options.wavefunctions ?? true;
  const z = sample ? uniformGrid(structure.total_nm, settings.grid_nm) : new Float64Array(0);
  const field = structure.field_kV_per_cm !== 0;
  let sortGrid: Float64Array | undefined;

  const bands = {} as Record<BandName, BandResult>;
  const psi = {} as Record<BandName, Float64Array[]>;
  const dosBands = {} as Record<BandName, DosStep[]>;
  for (const band of BANDS) {
    const wanted = options.states?.[band];
    const ask = wanted === undefined ? settings.maxStates : Math.min(settings.maxStates, wanted === 0 || !field ? wanted : wanted + FIELD_STATE_MARGIN);
    const { profile, solution } = solveOneBand(structure, band, { ...settings, maxStates: ask });
    const sign = profile.sign;
    let vmin = Infinity;
    for (const s of profile.slices) vmin = Math.min(vmin, s.V);
    // Under a field the raised outer regions also hold box states of the downhill contact layer:
    // continuum there, not states of the structure, so they are not reported. The same rule holds
    // whether or not wavefunctions are sampled, so a search scores the states solve reports.
    const kept = solution.states.flatMap((s) => {
      const wave = sample ? wavefunction(profile, s.energy, z) : z;
      if (s.energy < profile.openEdge) return [{ s, psi: wave }];
      const grid = sample ? z : (sortGrid ??= uniformGrid(structure.total_nm, SORT_GRID_NM));
      const w = sample ? wave : wavefunction(profile, s.energy, grid);
      return contactShare(structure, profile, grid, w) < 0.5 ? [{ s, psi: wave }] : [];
    }).slice(0, wanted ?? Infinity);
    const waves = kept.map((k) => k.psi);
    const states = kept.map(({ s, psi }, k): StateResult => ({
      label: `${PREFIX[band]}${k + 1}`,
      index: k + 1,
      energy_eV: sign * s.energy,
      confinement_meV: (s.energy - vmin) * 1000,
      bound: s.energy < profile.openEdge,
      nodes: s.nodes,
      mass_inplane: sample ? inPlaneMass(profile, z, psi, s.energy) : NaN,
    }));
    bands[band] = { states, edge_eV: sign * vmin, barrier_eV: sign * profile.openEdge, evaluations: solution.evaluations };
    psi[band] = waves;
    dosBands[band] = states.map((s) => ({ label: s.label, edge_eV: s.energy_eV, mass_inplane: s.mass_inplane, step_per_cm2_per_eV: sample ? stepHeight2d(s.mass_inplane) : NaN }));
  }

  const transitions: TransitionResult[] = [];
  const grid = sample ? weightedGrid(z) : undefined;
  const photon = (dE: number): Pick<TransitionResult, 'energy_eV' | 'wavelength_nm' | 'wavenumber_per_cm'> => ({
    energy_eV: dE, wavelength_nm: HC_EV_NM / dE, wavenumber_per_cm: wavenumberPerCm(dE),
  });
  const electrons = bands.electron.states;
  for (const hole of ['heavy_hole', 'light_hole'] as const) {
    for (const [i, e] of electrons.entries()) {
      for (const [j, h] of bands[hole].states.entries()) {
        transitions.push({ label: `${e.label}-${h.label}`, kind: 'interband', ...photon(e.energy_eV - h.energy_eV), overlap2: grid ? overlap2(psi.electron[i]!, psi[hole][j]!, grid) : NaN });
      }
    }
  }
  for (let i = 0; i < electrons.length; i++) {
    for (let j = i + 1; j < electrons.length; j++) {
      const dE = electrons[j]!.energy_eV - electrons[i]!.energy_eV;
      const d = grid ? dipoleNm(psi.electron[i]!, psi.electron[j]!, grid) : NaN;
      transitions.push({
        label: `${electrons[i]!.label}-${electrons[j]!.label}`, kind: 'intersubband', ...photon(dE),
        overlap2: grid ? overlap2(psi.electron[i]!, psi.electron[j]!, grid) : NaN, dipole_nm: d,
        oscillator_strength: sample ? oscillatorStrength(dE, d, electrons[i]!.mass_inplane) : NaN,
      });
    }
  }

  const missing = BANDS.filter((b) => bands[b].states.length === 0);
  return {
    status: missing.length === 0 || (bands.electron.states.length > 0 && missing.length < 2) ? 'ok' : 'no-bound-state',
    message: missing.length === 0 ? 'all three bands have bound states' : `no bound state in: ${missing.join(', ')}`,
    structure,
    parameterSet: PARAMETER_SET,
    settings,
    bands,
    transitions,
    dos: { dimension: 2, unit: 'states cm^-2 eV^-1 per subband (spin included)', bands: dosBands },
    wavefunctions: { z_nm: z, psi },
  };
}

/**
 * Library entry point for a layer stack: solves a validated spec at its nominal (or given)
 * variable values. A `wire:` cross-section is solved by `solveWire` (engine/wire/solve.ts).
 */
export function solve(spec: Spec, values: Readonly<Record<string, number>> = nominalVariables(spec)): SolveResult {
  if (spec.wire !== undefined) throw new InputError('bad-value', 'wire: this spec describes a wire cross-section; solve it with solveWire (the CLI does so)', 'wire');
  const result = solveStructure(buildStructure(spec, values), settingsOf(spec));
  if (spec.carriers === undefined) return result;
  const n = parseSheetDensity(spec.carriers.sheet_density);
  if (typeof n === 'string') throw new InputError('bad-value', `carriers.sheet_density: ${n}`, 'carriers.sheet_density');
  const carriers = carriersOf(result, n);
  return carriers ? { ...result, carriers } : result;
}

/**
 * Quasi-Fermi levels for n = p injected per unit area, each carrier in equilibrium among its own
 * bound subbands (common practice for lasers under injection), with the probability-weighted
 * in-plane masses. Undefined when electrons or holes have no bound subband or T = 0.
 */
export function carriersOf(r: SolveResult, sheetDensity_cm2: number): CarrierResult | undefined {
  const T = r.structure.temperature_K;
  const holes = [...r.bands.heavy_hole.states, ...r.bands.light_hole.states];
  if (r.bands.electron.states.length === 0 || holes.length === 0 || !(T > 0)) return undefined;
  const q = quasiFermiLevels({
    electronSubbands: r.bands.electron.states.map((s) => ({ energy: s.energy_eV, mass: s.mass_inplane })),
    holeSubbands: holes.map((s) => ({ energy: -s.energy_eV, mass: s.mass_inplane })),
    sheetDensity_cm2,
    temperature_K: T,
  });
  const e1 = r.bands.electron.states[0]!.energy_eV;
  const topHole = Math.max(...holes.map((s) => s.energy_eV));
  return {
    sheet_density_cm2: sheetDensity_cm2,
    temperature_K: T,
    electron_quasi_fermi_eV: q.electron_eV,
    hole_quasi_fermi_eV: q.hole_eV,
    separation_eV: q.separation_eV,
    inversion: q.separation_eV > e1 - topHole,
    note: 'bound subbands only: at densities that fill states near the barrier edge the continuum also holds carriers',
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
