/**
 * The forward model of a quantum wire: WireStructure -> per band a cross-section grid -> bound
 * subbands (engine/solver2d.ts, Richardson-extrapolated) -> transitions with 2-D overlaps, the
 * 1-D density of states and |ψ|² maps. The result has the shape of a well's SolveResult where
 * the two mean the same (bands[…].states[] with label, energy_eV, confinement_meV, bound;
 * barrier_eV; transitions[]; structure.temperature_K), so objectives that read only those work
 * on wires too.
 */
import { HC_EV_NM, wavenumberPerCm } from '../constants.js';
import { InputError } from '../errors.js';
import type { BandName } from '../profile.js';
import type { Spec } from '../spec/schema.js';
import type { TransitionResult } from '../solve.js';
import { nominalVariables, PARAMETER_SET } from '../structure.js';
import { sampleCrossSection, solveCrossSectionConverged, type CrossSectionBox, type CrossSectionMaterial } from '../solver2d.js';
import { dos1d } from '../observables/dos.js';
import { buildWireStructure, materialAt, type WireMaterial, type WireSettings, type WireStructure } from './structure.js';
import { commonGrid, overlap2d, type MapGrid } from './grid.js';

const BANDS: readonly BandName[] = ['electron', 'heavy_hole', 'light_hole'];
const PREFIX: Readonly<Record<BandName, string>> = { electron: 'e', heavy_hole: 'hh', light_hole: 'lh' };

export interface WireStateResult {
  readonly label: string;
  readonly index: number;
  /** Subband edge on the absolute scale of the parameter set (eV). */
  readonly energy_eV: number;
  /** Edge above (electrons) or below (holes) the band's extremum in the cross-section (meV). */
  readonly confinement_meV: number;
  /** Always true: only states below the barrier's band edge are reported. */
  readonly bound: boolean;
  /** Probability-weighted mass along the wire axis, (∫|ψ|²/m dx dy)⁻¹ (m0): the mass of the 1-D dispersion. */
  readonly mass_axis: number;
}

export interface WireBandResult {
  readonly states: readonly WireStateResult[];
  /** Band extremum in the cross-section (eV, absolute). */
  readonly edge_eV: number;
  /** Band edge of the barrier material: the continuum edge (eV, absolute). */
  readonly barrier_eV: number;
  /** Eigen-solver iterations over all grids. */
  readonly evaluations: number;
  /** Estimated error of the extrapolated edges (meV) and whether Richardson extrapolation was clean. */
  readonly errorEstimate_meV: number;
  readonly extrapolated: boolean;
  readonly converged: boolean;
}

/**
 * An interband transition of a wire: the well's transition shape without the intersubband fields.
 * overlap2 is |∫ψ_i ψ_j dx dy|²; for a degenerate level only the sum over its partners is basis-independent.
 */
export type WireTransition = Omit<TransitionResult, 'dipole_nm' | 'oscillator_strength'>;

export interface WireDosSubband {
  readonly label: string;
  readonly edge_eV: number;
  readonly mass_axis: number;
  /** √(2m)/(πħ) of this subband: g1 = prefactor·(E − Eₙ)^(−1/2), states cm⁻¹ eV^(−1/2) (spin included). */
  readonly prefactor_per_cm_per_sqrt_eV: number;
}

export interface WireDos {
  readonly dimension: 1;
  readonly unit: string;
  readonly broadening_eV: number;
  readonly bands: Readonly<Record<BandName, readonly WireDosSubband[]>>;
  /** Lorentzian-broadened g1 sampled from below the first edge to the barrier edge; energies absolute (eV). */
  readonly curves: Readonly<Record<BandName, { readonly energies_eV: readonly number[]; readonly states_per_cm_per_eV: readonly number[] }>>;
}

export interface WireSolveResult {
  readonly status: 'ok' | 'no-bound-state' | 'not-converged';
  readonly message: string;
  readonly structure: WireStructure;
  readonly parameterSet: string;
  readonly settings: WireSettings;
  readonly bands: Readonly<Record<BandName, WireBandResult>>;
  readonly transitions: readonly WireTransition[];
  readonly dos: WireDos;
  /** |ψ|² of every reported state (1/nm², Σ|ψ|² dx dy = 1) on one grid shared by all bands. */
  readonly maps: { readonly grid: MapGrid; readonly psi2: Readonly<Record<BandName, readonly Float64Array[]>> };
}

/**
 * Potential (particle sense: −Ev for holes, see engine/profile.ts) and masses of a band.
 *
 * Electron: isotropic Γ mass. Holes: the cross-section spans the growth axis z and one in-plane
 * direction, where the axial approximation gives 1/m_z = γ1 ∓ 2γ2 and 1/m∥ = γ1 ± γ2 (heavy/light);
 * a scalar-mass equation cannot hold both, so the cross-section uses the mean inverse mass
 * 1/m = (1/m_z + 1/m∥)/2 (= γ1 ∓ γ2/2), which keeps the sum of the two kinetic terms right for a
 * state of equal extent in both directions, and ignores heavy/light mixing. Along the wire axis
 * (in the growth plane) the free motion has the in-plane mass m∥.
 */
export function bandMaterial(m: WireMaterial, band: BandName): { readonly V: number; readonly mass: number; readonly axis: number } {
  const b = m.bands;
  switch (band) {
    case 'electron':
      return { V: b.Ec, mass: b.me, axis: b.me };
    case 'heavy_hole':
      return { V: -b.Ehh, mass: 2 / (1 / b.mhh_z + 1 / b.mhh_par), axis: b.mhh_par };
    case 'light_hole':
      return { V: -b.Elh, mass: 2 / (1 / b.mlh_z + 1 / b.mlh_par), axis: b.mlh_par };
  }
}

/** The outer box: the shape's bounds plus the margin, widened to a whole number of coarse cells so every refined grid nests in it. */
export function wireBox(s: WireStructure): CrossSectionBox {
  const h = s.settings.grid_nm;
  const side = (lo: number, hi: number): [number, number] => {
    const cells = Math.ceil((hi - lo + 2 * s.settings.margin_nm) / h - 1e-9);
    const mid = (lo + hi) / 2;
    return [mid - (cells * h) / 2, cells * h];
  };
  const [x0, w] = side(s.bounds.x0, s.bounds.x1);
  const [y0, hgt] = side(s.bounds.y0, s.bounds.y1);
  return { x0_nm: x0, y0_nm: y0, width_nm: w, height_nm: hgt };
}

export interface WireSolveOptions {
  /** Subbands sought in a band instead of settings.states (0 skips the band: no states, no envelopes); a design search asks only for what its targets read. */
  readonly states?: Partial<Record<BandName, number>>;
}

/**
 * Bound subbands, transitions, 1-D DOS and |ψ|² maps of a wire structure.
 *
 * Per band, the cross-section is sampled (cell-averaged V and m) at h, h/2 (and h/4) and solved
 * with solveCrossSectionConverged (BenDaniel–Duke, Richardson-extrapolated to the tolerance);
 * the outer wall is a hard (Dirichlet) wall `margin` outside the shape, so a state within about
 * one decay length ħ/√(2mΔ) of the barrier edge is pushed up slightly. States at or above the
 * barrier edge are box states of the wall, not of the wire, and are dropped. Units: eV, nm, m0.
 */
export function solveWireStructure(structure: WireStructure, options: WireSolveOptions = {}): WireSolveResult {
  const settings = structure.settings;
  const box = wireBox(structure);
  const bands = {} as Record<BandName, WireBandResult>;
  const raw = {} as Partial<Record<BandName, { psi: readonly Float64Array[]; nx: number; ny: number }>>;
  const wanted = (band: BandName): number => options.states?.[band] ?? settings.states;
  if (BANDS.every((b) => wanted(b) === 0)) throw new InputError('bad-value', 'states: every band is skipped (0 states); ask for at least one subband of one band', 'states');
  for (const band of BANDS) {
    const table = structure.materials.map((m) => bandMaterial(m, band));
    const sign = band === 'electron' ? 1 : -1;
    const barrier = table[0]!.V;
    const vmin = Math.min(...table.map((t) => t.V));
    if (wanted(band) === 0) {
      bands[band] = { states: [], edge_eV: sign * vmin, barrier_eV: sign * barrier, evaluations: 0, errorEstimate_meV: 0, extrapolated: false, converged: true };
      continue;
    }
    const at = (x: number, y: number): CrossSectionMaterial => table[materialAt(structure, x, y)]!;
    const build = (h: number) => sampleCrossSection(box, h, at);
    const r = solveCrossSectionConverged(build, wanted(band), { h_nm: settings.grid_nm, tolerance_eV: settings.tolerance_eV });
    const [nx, ny] = r.gridSize;
    const dx = box.width_nm / (nx + 1);
    const dy = box.height_nm / (ny + 1);
    const dxdy = dx * dy;
    const kept = r.energies.flatMap((e, k) => (e < barrier ? [{ e, psi: r.psi[k]! }] : []));
    // 1/m along the axis at each node, for the probability-weighted axis mass.
    const axis = new Float64Array(nx * ny);
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) axis[i + nx * j] = 1 / table[materialAt(structure, box.x0_nm + (i + 1) * dx, box.y0_nm + (j + 1) * dy)]!.axis;
    const states = kept.map(({ e, psi }, k): WireStateResult => {
      let inv = 0;
      for (let n = 0; n < psi.length; n++) inv += psi[n]! * psi[n]! * axis[n]! * dxdy;
      return { label: `${PREFIX[band]}${k + 1}`, index: k + 1, energy_eV: sign * e, confinement_meV: (e - vmin) * 1000, bound: true, mass_axis: 1 / inv };
    });
    bands[band] = {
      states,
      edge_eV: sign * vmin,
      barrier_eV: sign * barrier,
      evaluations: r.iterations,
      errorEstimate_meV: r.errorEstimate_eV * 1000,
      extrapolated: r.extrapolated,
      converged: r.status === 'converged',
    };
    raw[band] = { psi: kept.map((k) => k.psi), nx, ny };
  }

  const solved = BANDS.filter((b) => raw[b] !== undefined);
  const common = commonGrid(box, solved.map((b) => raw[b]!), (x, y) => materialAt(structure, x, y));
  const psi: Record<BandName, Float64Array[]> = { electron: [], heavy_hole: [], light_hole: [] };
  for (const [k, band] of solved.entries()) psi[band] = common.psi[k]!;

  const transitions: WireTransition[] = [];
  const photon = (dE: number): Pick<WireTransition, 'energy_eV' | 'wavelength_nm' | 'wavenumber_per_cm'> => ({ energy_eV: dE, wavelength_nm: HC_EV_NM / dE, wavenumber_per_cm: wavenumberPerCm(dE) });
  const electrons = bands.electron.states;
  for (const hole of ['heavy_hole', 'light_hole'] as const) {
    for (const [i, e] of electrons.entries()) {
      for (const [j, h] of bands[hole].states.entries()) {
        transitions.push({ label: `${e.label}-${h.label}`, kind: 'interband', ...photon(e.energy_eV - h.energy_eV), overlap2: overlap2d(psi.electron[i]!, psi[hole][j]!, common.grid) });
      }
    }
  }
  for (let i = 0; i < electrons.length; i++) {
    for (let j = i + 1; j < electrons.length; j++) {
      transitions.push({ label: `${electrons[i]!.label}-${electrons[j]!.label}`, kind: 'intersubband', ...photon(electrons[j]!.energy_eV - electrons[i]!.energy_eV), overlap2: overlap2d(psi.electron[i]!, psi.electron[j]!, common.grid) });
    }
  }

  const psi2 = {} as Record<BandName, Float64Array[]>;
  for (const band of BANDS) psi2[band] = psi[band].map((v) => v.map((x) => x * x));

  const missing = solved.filter((b) => bands[b].states.length === 0);
  const unconverged = BANDS.filter((b) => !bands[b].converged);
  // Same rule as wells: a missing light-hole (or heavy-hole) band alone is common under strain and not a failure.
  const bound = missing.length === 0 || (bands.electron.states.length > 0 && missing.length < 2);
  return {
    status: !bound ? 'no-bound-state' : unconverged.length > 0 ? 'not-converged' : 'ok',
    message: [
      missing.length === 0 ? 'all three bands have bound states' : `no bound state in: ${missing.join(', ')}`,
      ...(unconverged.length > 0 ? [`eigen-solver hit its iteration cap in: ${unconverged.join(', ')}`] : []),
    ].join('; '),
    structure,
    parameterSet: PARAMETER_SET,
    settings,
    bands,
    transitions,
    dos: wireDos(bands, settings.broadening_eV),
    maps: { grid: common.grid, psi2 },
  };
}

const DOS_POINTS = 201;

/**
 * The 1-D density of states of each band: per subband √(2m)/(πħ) with m the axis mass, and the
 * Lorentzian-broadened sum Σ √(2m)/(πħ)(E − Eₙ)^(−1/2) (dos1d, engine/observables/dos.ts) on
 * DOS_POINTS energies from 10 Γ before the first edge to the barrier edge. Holes are evaluated in
 * the particle sense and reported on the absolute scale.
 */
function wireDos(bands: Readonly<Record<BandName, WireBandResult>>, gamma: number): WireDos {
  const steps = {} as Record<BandName, WireDosSubband[]>;
  const curves = {} as Record<BandName, { energies_eV: number[]; states_per_cm_per_eV: number[] }>;
  for (const band of BANDS) {
    const sign = band === 'electron' ? 1 : -1;
    const r = bands[band];
    const subbands = r.states.map((s) => ({ energy: sign * s.energy_eV, mass: s.mass_axis }));
    steps[band] = r.states.map((s, k) => ({
      label: s.label, edge_eV: s.energy_eV, mass_axis: s.mass_axis,
      prefactor_per_cm_per_sqrt_eV: dos1d({ subbands: [subbands[k]!], energies_eV: [subbands[k]!.energy + 1] })[0]!,
    }));
    if (subbands.length === 0) {
      curves[band] = { energies_eV: [], states_per_cm_per_eV: [] };
      continue;
    }
    const lo = subbands[0]!.energy - 10 * gamma;
    const hi = Math.max(sign * r.barrier_eV, lo + 20 * gamma);
    const energies = Array.from({ length: DOS_POINTS }, (_, k) => lo + ((hi - lo) * k) / (DOS_POINTS - 1));
    curves[band] = { energies_eV: energies.map((e) => sign * e), states_per_cm_per_eV: [...dos1d({ subbands, energies_eV: energies, broadening: { kind: 'lorentzian', gamma_eV: gamma } })] };
  }
  return { dimension: 1, unit: 'states cm^-1 eV^-1 (spin included)', broadening_eV: gamma, bands: steps, curves };
}

/** Library entry point for a spec with a `wire:` section, at the given (default: nominal) variable values. */
export function solveWire(spec: Spec, values: Readonly<Record<string, number>> = nominalVariables(spec), options: WireSolveOptions = {}): WireSolveResult {
  return solveWireStructure(buildWireStructure(spec, values), options);
}
