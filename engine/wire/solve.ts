/**
 * The forward model of a quantum wire: WireStructure -> per band a cross-section grid -> states
 * (engine/solver2d.ts, Richardson-extrapolated) -> the continuum threshold (the barrier edge, or
 * the lowest level of the parent wells, solved exactly in 1-D) -> wire subbands (the states bound
 * below it) -> transitions (interband 2-D overlaps; intersubband dipoles and oscillator strengths
 * for light polarised across the wire, engine/wire/dipoles.ts), the 1-D density of states and |ψ|² maps. The result
 * has the shape of a well's SolveResult where the two mean the same (bands[…].states[] with
 * label, energy_eV, confinement_meV, bound; barrier_eV, the continuum edge; transitions[];
 * structure.temperature_K), so objectives that read only those work on wires too, and they see
 * wire subbands only.
 *
 * Axes: the cross-section is (x, y) with y the growth axis [001] (the report draws it as z) and
 * x the in-plane direction across the wire; the wire axis is the other in-plane direction.
 */
import { HC_EV_NM, wavenumberPerCm } from '../constants.js';
import { InputError } from '../errors.js';
import type { BandName, BandProfile } from '../profile.js';
import { solveBand } from '../solver1d/states.js';
import type { Spec } from '../input/schema.js';
import type { TransitionResult } from '../solve.js';
import { nominalVariables, PARAMETER_SET } from '../structure.js';
import { sampleCrossSection, solveCrossSectionConverged, type CrossSectionBox, type CrossSectionGrid, type CrossSectionMaterial } from '../solver2d.js';
import { dos1d } from '../observables/dos.js';
import { buildWireStructure, materialAt, type ParentWell, type WireMaterial, type WireSettings, type WireStructure } from './structure.js';
import { commonGrid, overlap2d, type MapGrid } from './grid.js';
import { wireMatrixElements, type WireMatrixElements } from './dipoles.js';
import { oscillatorStrength } from '../observables/matrix-elements.js';
import { fixed } from '../text.js';

const BANDS: readonly BandName[] = ['electron', 'heavy_hole', 'light_hole'];
const PREFIX: Readonly<Record<BandName, string>> = { electron: 'e', heavy_hole: 'hh', light_hole: 'lh' };

export interface WireStateResult {
  readonly label: string;
  readonly index: number;
  /** Subband edge on the absolute scale of the parameter set (eV). */
  readonly energy_eV: number;
  /** Edge above (electrons) or below (holes) the band's extremum in the cross-section (meV). */
  readonly confinement_meV: number;
  /** Always true: only states bound below the continuum threshold are wire subbands. */
  readonly bound: boolean;
  /** Depth below the continuum threshold (band's barrier_eV), into the gap (meV): positive for a wire subband. */
  readonly binding_meV: number;
  /**
   * Probability-weighted mass along the wire axis at the subband edge, (∫|ψ|²/m(E) dx dy)⁻¹ (m0),
   * with the two-band m(E) = m(1 + α(E − V)) for a non-parabolic band: the mass of the 1-D dispersion.
   */
  readonly mass_axis: number;
}

/**
 * A state of the cross-section at or above the continuum threshold but below the barrier edge:
 * a state of the drawn parent wells (their 2-D continuum cut off by the drawing), not a wire
 * subband. Its energy moves with the drawn lengths; targets never read it.
 */
export interface ParentWellState {
  /** "pw:e1", "pw:hh2"…: numbered within the band, never a subband label. */
  readonly label: string;
  readonly energy_eV: number;
  /** Negative or below the error estimate: how far it lies below the threshold (meV). */
  readonly binding_meV: number;
  /** Spec field of the part holding most of |ψ|² ("wire.shape.arm", "wire.barrier"…) and that share. */
  readonly where: string;
  readonly share: number;
}

/** The 1-D ground level of a parent well, in the same model as the cross-section. */
export interface ParentWellLevel {
  readonly field: string;
  readonly formula: string;
  readonly thickness_nm: number;
  readonly across: 'x' | 'y';
  /** Mass across the well (m0) at the band edge. */
  readonly mass: number;
  /** Lowest level (eV, absolute), or null when the part binds no state of this band. */
  readonly ground_eV: number | null;
}

/** Where a band's continuum starts: the wire subbands lie below it. */
export interface WireThreshold {
  /** The threshold (eV, absolute): equal to the band's barrier_eV. */
  readonly energy_eV: number;
  /** 'barrier': the barrier material's edge (rectangle, circle, or no parent well binds); 'parent-well': the lowest parent-well level. */
  readonly source: 'barrier' | 'parent-well';
  /** The parent well setting it (its field), or "wire.barrier". */
  readonly field: string;
  /** Band edge of the barrier material (eV, absolute). */
  readonly barrierEdge_eV: number;
  readonly parentWells: readonly ParentWellLevel[];
}

export interface WireBandResult {
  readonly states: readonly WireStateResult[];
  /** Band extremum in the cross-section (eV, absolute). */
  readonly edge_eV: number;
  /** The continuum edge (eV, absolute): the threshold, i.e. the lowest parent-well level or the barrier material's edge. */
  readonly barrier_eV: number;
  readonly threshold: WireThreshold;
  /** States between the threshold and the barrier edge: states of the parent wells, not subbands. */
  readonly parentWellStates: readonly ParentWellState[];
  /** Eigen-solver iterations over all grids. */
  readonly evaluations: number;
  /** Estimated error of the extrapolated edges (meV) and whether Richardson extrapolation was clean. */
  readonly errorEstimate_meV: number;
  readonly extrapolated: boolean;
  readonly converged: boolean;
}

/**
 * A transition of a wire: the well's transition shape, with the intersubband strength given for
 * each polarisation across the wire instead of along z. overlap2 is |∫ψ_i ψ_j dx dy|² (interband;
 * 0 by orthogonality between states of one band). For a degenerate level (e2 and e3 of a square
 * wire) the solver's basis is arbitrary: only sums over its partners are basis-independent.
 */
export interface WireTransition extends Omit<TransitionResult, 'dipole_nm' | 'oscillator_strength'> {
  /** Intersubband only: ⟨i|x|j⟩ (nm, signed), x across the wire in the growth plane (engine/wire/dipoles.ts). */
  readonly dipole_x_nm?: number;
  /** Intersubband only: ⟨i|y|j⟩ (nm, signed), y the growth axis [001] (z in the report). */
  readonly dipole_y_nm?: number;
  /**
   * Intersubband only: oscillator strength for light polarised along x, (2 m_x,i/ħ²)(E_j − E_i) x_ij²
   * (oscillatorStrength, engine/observables/matrix-elements.ts) with the sum-rule mass
   * m_x,i = 1/⟨i|1/m_x(E_i)|i⟩, the wells' normalisation: Σ_j f_ij = 1 for a parabolic band
   * (Thomas–Reiche–Kuhn), i.e. m0/m* per polarisation in units of the free-electron f.
   */
  readonly oscillator_strength_x?: number;
  /** Intersubband only: the same for light polarised along y (growth axis), with m_y,i. */
  readonly oscillator_strength_y?: number;
}

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
  /** Lorentzian-broadened g1 of the subbands sampled from below the first edge to the continuum threshold; energies absolute (eV). */
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

/** Particle-sense potential (eV), masses along x, y and the wire axis (m0) and non-parabolicity (1/eV) of a band in one material. */
export interface WireBandMaterial {
  readonly V: number;
  /** Mass across the wire in the growth plane (x). */
  readonly mass: number;
  /** Mass along the growth axis [001] (y). */
  readonly massY: number;
  /** Mass along the wire axis (in the growth plane). */
  readonly axis: number;
  readonly alpha: number;
}

/**
 * Potential (particle sense: −Ev for holes, see engine/profile.ts), masses and non-parabolicity
 * of a band in one material of the cross-section.
 *
 * y is the growth axis [001]. Electrons: the isotropic Γ mass, with the two-band α when the
 * settings ask for it (as for a well). Holes: the diagonal of the Luttinger Hamiltonian with J
 * quantised along [001] (J. M. Luttinger, Phys. Rev. 102, 1030 (1956); the single-band reduction
 * of S. L. Chuang, Physics of Optoelectronic Devices, ch. 4, from memory), P ± Q with P = γ1 k²,
 * Q = γ2 (k∥² − 2k_z²) (k∥ in the (001) plane, k_z along [001], ħ²/2m0 units): along [001]
 * m_hh = 1/(γ1 − 2γ2), m_lh = 1/(γ1 + 2γ2) (mhh_z, mlh_z); every direction in the (001) plane,
 * across the wire (x) and along it, has 1/(γ1 + γ2) and 1/(γ1 − γ2) (mhh_par, mlh_par,
 * materials/masses.ts). The diagonal is isotropic in the (001) plane, so a wire along [110] and
 * one along [100] get the same masses: the in-plane anisotropy (γ3 ≠ γ2) lives only in the
 * heavy/light-hole coupling terms R and S, which this single-band model leaves out together with
 * the mixing itself (the axial approximation of the in-plane masses). Every part of the
 * cross-section shares the [001] growth axis: a part grown along another axis (an arm overgrown
 * on a cleaved (110) edge) is not represented. Holes are parabolic, as in wells.
 */
export function bandMaterial(m: WireMaterial, band: BandName, nonparabolic: boolean): WireBandMaterial {
  const b = m.bands;
  switch (band) {
    case 'electron':
      return { V: b.Ec, mass: b.me, massY: b.me, axis: b.me, alpha: nonparabolic ? b.alpha : 0 };
    case 'heavy_hole':
      return { V: -b.Ehh, mass: b.mhh_par, massY: b.mhh_z, axis: b.mhh_par, alpha: 0 };
    case 'light_hole':
      return { V: -b.Elh, mass: b.mlh_par, massY: b.mlh_z, axis: b.mlh_par, alpha: 0 };
  }
}

/**
 * Lowest level (particle sense, eV) of a parent well: the part's material, `thickness` across it,
 * in the barrier material, solved exactly by the 1-D transfer solver (engine/solver1d/states.ts) with the
 * masses across it (massY when it lies along y, else mass) and the same α. The cross-section
 * energies it is compared with are Richardson-extrapolated to zero grid spacing, i.e. estimates
 * of the same continuum equation this solves exactly; undefined when the part binds nothing.
 */
function parentWellGround(well: ParentWell, inside: WireBandMaterial, barrier: WireBandMaterial, band: BandName): number | undefined {
  const across = (t: WireBandMaterial): number => (well.across === 'y' ? t.massY : t.mass);
  const outer = { V: barrier.V, mass: across(barrier), alpha: barrier.alpha, massInPlane: barrier.axis };
  const profile: BandProfile = {
    band,
    slices: [{ width_nm: well.thickness_nm, V: inside.V, mass: across(inside), alpha: inside.alpha, massInPlane: inside.axis, layer: 0 }],
    left: outer,
    right: outer,
    sign: band === 'electron' ? 1 : -1,
    openEdge: barrier.V,
  };
  return solveBand(profile, { maxStates: 1 }).states[0]?.energy;
}

/** The continuum threshold of a band in the particle sense (energies in eV, particle sense; see absolute). */
function wireThreshold(structure: WireStructure, table: readonly WireBandMaterial[], band: BandName): WireThreshold {
  const barrier = table[0]!;
  const parentWells = structure.parentWells.map((w): ParentWellLevel => ({
    field: w.field,
    formula: structure.materials[w.material]!.formula,
    thickness_nm: w.thickness_nm,
    across: w.across,
    mass: w.across === 'y' ? table[w.material]!.massY : table[w.material]!.mass,
    ground_eV: parentWellGround(w, table[w.material]!, barrier, band) ?? null,
  }));
  let lowest: ParentWellLevel | undefined;
  for (const w of parentWells) if (w.ground_eV !== null && w.ground_eV < barrier.V && (!lowest || w.ground_eV < lowest.ground_eV!)) lowest = w;
  return lowest
    ? { energy_eV: lowest.ground_eV!, source: 'parent-well', field: lowest.field, barrierEdge_eV: barrier.V, parentWells }
    : { energy_eV: barrier.V, source: 'barrier', field: 'wire.barrier', barrierEdge_eV: barrier.V, parentWells };
}

/** A particle-sense threshold on the absolute scale (holes: −E). */
const absolute = (t: WireThreshold, sign: number): WireThreshold => ({
  ...t,
  energy_eV: sign * t.energy_eV,
  barrierEdge_eV: sign * t.barrierEdge_eV,
  parentWells: t.parentWells.map((w) => ({ ...w, ground_eV: w.ground_eV === null ? null : sign * w.ground_eV })),
});

/**
 * Where a wire's grids lie. `box` is the region the cells tile: the shape's extent cut along each
 * axis into an even number of cells of `spacing` (the largest at most the grid setting h), and an
 * even number of them on either side, as many as fit in the margin; `rest` is the part of the
 * margin left beyond it (nm, per axis, under two cells), through which ψ falls to the hard wall,
 * which so stays exactly `margin` outside the shape on every grid. The grids at 2h (the error
 * estimate's), h, h/2 and h/4 then nest, and the outer interfaces of the shape (all the interfaces
 * of a rectangle) lie on their cell faces, where the operator's flux is exact and the energies
 * converge cleanly in h² (engine/solver2d.ts sampleCrossSection).
 */
export function wireBox(s: WireStructure): { readonly box: CrossSectionBox; readonly spacing: readonly [number, number]; readonly rest: readonly [number, number] } {
  const h = s.settings.grid_nm;
  const axis = (lo: number, hi: number): { start: number; size: number; step: number; rest: number } => {
    const inner = 2 * Math.max(1, Math.ceil((hi - lo) / (2 * h) - 1e-9));
    const step = (hi - lo) / inner;
    const outer = 2 * Math.floor(s.settings.margin_nm / (2 * step) + 1e-9);
    return { start: lo - outer * step, size: (inner + 2 * outer) * step, step, rest: Math.max(0, s.settings.margin_nm - outer * step) };
  };
  const x = axis(s.bounds.x0, s.bounds.x1);
  const y = axis(s.bounds.y0, s.bounds.y1);
  return { box: { x0_nm: x.start, y0_nm: y.start, width_nm: x.size, height_nm: y.size }, spacing: [x.step, y.step], rest: [x.rest, y.rest] };
}

export interface WireSolveOptions {
  /** Subbands sought in a band instead of settings.states (0 skips the band: no states, no envelopes); a design search asks only for what its targets read. */
  readonly states?: Partial<Record<BandName, number>>;
  /**
   * Called as each grid of each band is built for its solve, with the grids done, the grids
   * expected (three per band, one more when a band needs h/4) and what is being solved; and once at
   * the end with done = total. A grid counts as started when solveCrossSectionConverged builds it.
   */
  readonly onProgress?: (done: number, total: number, what: string) => void;
}

/** Grids a band's converged solve takes unless it needs h/4: 2h, h and h/2 (solveCrossSectionConverged). */
const GRIDS_PER_BAND = 3;

/**
 * Wire subbands, the continuum threshold, transitions, 1-D DOS and |ψ|² maps of a wire structure.
 *
 * Per band, the cross-section is sampled (cell-averaged V and masses, see bandMaterial for the
 * mass tensor) on cell-centred grids aligned with the shape (wireBox) at 2h, h, h/2 (and h/4) and
 * solved with solveCrossSectionConverged (BenDaniel–Duke,
 * non-parabolic electrons self-consistent per state when the settings ask, Richardson-extrapolated
 * to the tolerance); the outer wall is a hard (Dirichlet) wall `margin` outside the shape, so a
 * state within about one decay length ħ/√(2mΔ) of the barrier edge is pushed up slightly.
 *
 * The continuum threshold is the barrier edge for a rectangle or circle; for a t-shape or a union
 * it is the lowest 1-D level of the parent wells (each drawn arm, stem or rectangle extended
 * without end along its long direction; a square rectangle both ways), if below the barrier edge:
 * the 2-D continuum of such a well starts there, and states of the cross-section above it are
 * its states cut off by the drawn lengths. Only states bound below the threshold by more than the
 * band's error estimate are wire subbands (e1, hh1…); the others below the barrier edge are
 * reported as parent-well states (pw:e1…), and those at or above the barrier edge, box states of
 * the outer wall, are dropped. Intersubband lines (electron pairs) carry ⟨i|x|j⟩, ⟨i|y|j⟩ on the
 * electron band's finest grid (wireMatrixElements, in the two-band inner product when the band
 * is non-parabolic) and the oscillator strength of each polarisation with the line's
 * (extrapolated) energy and the initial state's sum-rule mass along that axis. Units: eV, nm, m0.
 */
export function solveWireStructure(structure: WireStructure, options: WireSolveOptions = {}): WireSolveResult {
  const settings = structure.settings;
  const { box, spacing, rest } = wireBox(structure);
  const bands = {} as Record<BandName, WireBandResult>;
  const raw = {} as Partial<Record<BandName, { psi: readonly Float64Array[]; nx: number; ny: number }>>;
  const wanted = (band: BandName): number => options.states?.[band] ?? settings.states;
  if (BANDS.every((b) => wanted(b) === 0)) throw new InputError('bad-value', 'states: every band is skipped (0 states); ask for at least one subband of one band', 'states');
  let gridsBuilt = 0;
  let gridsExpected = GRIDS_PER_BAND * BANDS.filter((b) => wanted(b) > 0).length;
  let electronLines: WireMatrixElements | undefined;
  for (const band of BANDS) {
    const table = structure.materials.map((m) => bandMaterial(m, band, settings.nonparabolic));
    const sign = band === 'electron' ? 1 : -1;
    const barrier = table[0]!.V;
    const vmin = Math.min(...table.map((t) => t.V));
    const threshold = wireThreshold(structure, table, band);
    const edge = threshold.energy_eV;
    if (wanted(band) === 0) {
      bands[band] = { states: [], edge_eV: sign * vmin, barrier_eV: sign * edge, threshold: absolute(threshold, sign), parentWellStates: [], evaluations: 0, errorEstimate_meV: 0, extrapolated: false, converged: true };
      continue;
    }
    const at = (x: number, y: number): CrossSectionMaterial => table[materialAt(structure, x, y)]!;
    // Grids at multiples of the aligned spacings (build(h) scales both by h / grid_nm), the wall `rest` beyond the cells.
    const build = (h: number): CrossSectionGrid => {
      const g = sampleCrossSection(box, [(spacing[0] * h) / settings.grid_nm, (spacing[1] * h) / settings.grid_nm], at);
      return { ...g, wall_nm: [0.5 * g.dx_nm + rest[0], 0.5 * g.dy_nm + rest[1]] };
    };
    let bandGrids = 0;
    const tracked = (h: number): CrossSectionGrid => {
      const g = build(h);
      if (++bandGrids > GRIDS_PER_BAND) gridsExpected++;
      options.onProgress?.(gridsBuilt++, gridsExpected, `${band.replace('_', ' ')}: grid ${fixed(g.dx_nm, 3)} nm, ${g.nx}×${g.ny} nodes`);
      return g;
    };
    const r = solveCrossSectionConverged(tracked, wanted(band), { h_nm: settings.grid_nm, tolerance_eV: settings.tolerance_eV });
    const [nx, ny] = r.gridSize;
    const dx = box.width_nm / nx;
    const dy = box.height_nm / ny;
    const dxdy = dx * dy;
    const region = new Int32Array(nx * ny);
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) region[i + nx * j] = materialAt(structure, box.x0_nm + (i + 0.5) * dx, box.y0_nm + (j + 0.5) * dy);
    const inBand = r.energies.flatMap((e, k) => (e < barrier ? [{ e, psi: r.psi[k]! }] : []));
    // Bound by more than the error estimate: a state of the parent wells just above the threshold must not pass for a subband through discretisation error.
    const isSubband = (e: number): boolean => edge - e > r.errorEstimate_eV;
    const kept = inBand.filter((s) => isSubband(s.e));
    const states = kept.map(({ e, psi }, k): WireStateResult => {
      // 1/m along the axis at each node at the state's energy, for the probability-weighted axis mass.
      let inv = 0;
      for (let n = 0; n < psi.length; n++) {
        const t = table[region[n]!]!;
        inv += (psi[n]! * psi[n]! * dxdy) / (t.axis * (1 + t.alpha * (e - t.V)));
      }
      return { label: `${PREFIX[band]}${k + 1}`, index: k + 1, energy_eV: sign * e, confinement_meV: (e - vmin) * 1000, bound: true, binding_meV: (edge - e) * 1000, mass_axis: 1 / inv };
    });
    const parentWellStates = inBand.filter((s) => !isSubband(s.e)).map(({ e, psi }, k): ParentWellState => {
      const shares = new Float64Array(structure.materials.length);
      for (let n = 0; n < psi.length; n++) shares[region[n]!] += psi[n]! * psi[n]! * dxdy;
      const most = shares.indexOf(Math.max(...shares));
      return { label: `pw:${PREFIX[band]}${k + 1}`, energy_eV: sign * e, binding_meV: (edge - e) * 1000, where: structure.materials[most]!.field.replace(/\.material$/, ''), share: shares[most]! };
    });
    bands[band] = {
      states,
      edge_eV: sign * vmin,
      barrier_eV: sign * edge,
      threshold: absolute(threshold, sign),
      parentWellStates,
      evaluations: r.iterations,
      errorEstimate_meV: r.errorEstimate_eV * 1000,
      extrapolated: r.extrapolated,
      converged: r.status === 'converged',
    };
    raw[band] = { psi: kept.map((k) => k.psi), nx, ny };
    if (band === 'electron' && kept.length > 1) {
      // The grid the states were solved on, built again at its spacing (the first grid's cell count over this one's).
      const finest = build((settings.grid_nm * Math.round(box.width_nm / spacing[0])) / nx);
      electronLines = wireMatrixElements(finest, kept.map((k) => k.e), kept.map((k) => k.psi));
    }
  }
  options.onProgress?.(gridsExpected, gridsExpected, 'transitions and density of states');

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
  // Set whenever there are two or more electron subbands, i.e. any intersubband pair.
  const lines = electronLines;
  for (let i = 0; lines && i < electrons.length; i++) {
    const mass = lines.mass(i);
    for (let j = i + 1; j < electrons.length; j++) {
      const dE = electrons[j]!.energy_eV - electrons[i]!.energy_eV;
      const d = lines.dipole(i, j);
      transitions.push({
        label: `${electrons[i]!.label}-${electrons[j]!.label}`, kind: 'intersubband', ...photon(dE), overlap2: overlap2d(psi.electron[i]!, psi.electron[j]!, common.grid),
        dipole_x_nm: d.x, dipole_y_nm: d.y, oscillator_strength_x: oscillatorStrength(dE, d.x, mass.x), oscillator_strength_y: oscillatorStrength(dE, d.y, mass.y),
      });
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
      missing.length === 0 ? 'all three bands have wire subbands' : `no state bound below the continuum threshold in: ${missing.join(', ')}`,
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
 * DOS_POINTS energies from 10 Γ before the first edge to the continuum threshold. Holes are evaluated in
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
