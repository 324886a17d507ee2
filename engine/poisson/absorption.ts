/**
 * Intersubband absorption of the populated electron subbands of a self-consistent doped stack,
 * into bound, quasi-bound and continuum states, with the depolarisation shift of every line.
 *
 * Continuum: the self-consistent profile is extended by `continuum_nm` of its outer barriers on
 * each side and closed by walls 1 eV above the highest state kept, so every state up to `range`
 * above the barrier edge is a discrete state of the box (the continuum discretised; its density
 * of states, and with it the spectrum, converges as the box grows: test/poisson/absorption.test.ts).
 * Initial states are the bound subbands (below the barrier edge); final states every box state above.
 *
 * Matrix elements (two-band electron model of engine/observables/matrix-elements.ts): with
 * p = ψ′/m(E), the transition charge ρ_ij = ψ_iψ_j + (ħ²/2m0)(m(E_i) − m(E_j))/(E_i − E_j) p_i p_j
 * integrates to zero, and its running integral is Q_ij(z) = (ħ²/2m0)(ψ_i p_j − p_i ψ_j)/(E_i − E_j)
 * (the pair's current; our derivation from the two equations). Then z_ij = −∫Q_ij dz (the velocity
 * form) and the depolarisation integral S_ij = ∫ Q_ij²/ε_r dz, ε_r the static permittivity along z.
 * ψ and p are exact on every flat slice: ψ at the slice ends from solver1d's wavefunction, p and the
 * midpoint from the slice's closed-form solutions; integrals by Simpson's rule per slice (slices
 * cut to at most 1.5 rad of phase), the walls' tails in closed form.
 *
 * Depolarisation (T. Ando, A. B. Fowler, F. Stern, Rev. Mod. Phys. 54, 437 (1982), §VII; S. J.
 * Allen, D. C. Tsui, B. Vinter, Solid State Commun. 20, 425 (1976)): the line i→j of a sheet with
 * population difference Δn_ij moves from E_ij to
 *   Ẽ_ij = E_ij √(1 + α_ij),   α_ij = 2 (e²/ε0) Δn_ij S_ij / E_ij
 * (SI form of their α = 8πe²N_s S/(κ̄E) with S = ∫dz [∫^z ψ_iψ_j]²/ε_r, from memory; it reduces to
 * theirs for one permittivity and equals the plasma form ħ²ω_p² = e²Δn f ħ²/(ε ε0 m* L_eff) with
 * L_eff = z_ij²/S). Each line is shifted by its own field, the coupling between lines left out:
 * exact for one populated subband and one dominant line (bound-to-bound detectors); a
 * bound-to-continuum line's collective shift is underestimated. The exchange-correlation
 * ("exciton-like") correction β of the same papers is left out.
 *
 * Absorption of p-polarised light per pass through the stack: each line has the oscillator-strength
 * weight of the golden rule,
 *   η(E) = G (4π² α_fs / n_r) Σ_ij E_ij z_ij² Δn_ij L(E − Ẽ_ij),
 * L the Lorentzian of full width Γ (under a field a quasi-bound final state is a run of box states,
 * so its own width appears in the spectrum), α_fs the
 * fine-structure constant, n_r the background refractive index; G = sin²θ/cos θ for the internal
 * angle θ of the light to the layers' normal (45°: the polished-facet geometry detectors are
 * measured in, G = 1/√2; from air at Brewster's angle, θ = arctan(1/n_r), G = 1/(n_r√(1 + n_r²)),
 * with no reflection loss of p-light; normal-z: G = 1, a field along z) (B. F. Levine, J. Appl.
 * Phys. 74, R1 (1993), §II, from memory). The pass absorbs 1 − e^(−η) (Beer–Lambert over the
 * wells). Units: eV, nm; densities nm⁻² inside, cm⁻² in results.
 */
import { HBAR2_OVER_2M0, HC_EV_NM, KB_EV_PER_K } from '../constants.js';
import type { BandProfile, Slice } from '../profile.js';
import { twoBandFactor } from '../solver1d/slices.js';
import { countStatesBelow, solveBand } from '../solver1d/states.js';
import { wavefunction } from '../solver1d/wavefunction.js';
import { SHEET_CM2_TO_NM2 } from './doping.js';
import { subbandFilling } from './occupation.js';
import { E_OVER_EPS0_V_NM, type PoissonMesh } from './poisson.js';

const C = HBAR2_OVER_2M0;
/** Fine-structure constant (CODATA 2018). */
const ALPHA_FS = 7.2973525693e-3;
/** Height of the box's walls above the highest state kept (eV). */
const WALL_EV = 1;
/** Largest phase √s·L of a box slice at the highest energy kept (rad): p is reconstructed from ψ at its ends, exact while sin √s L stays away from 0. */
const MAX_SLICE_PHASE = 1.5;
/** Lines weaker than this share of the strongest are not listed (they stay in the spectrum). */
const LISTED_SHARE = 1e-3;

export type Coupling = '45deg' | 'brewster' | 'normal-z';

export interface AbsorptionOptions {
  /** Lorentzian FWHM of every line (eV). */
  readonly linewidth_eV: number;
  readonly coupling: Coupling;
  readonly refractiveIndex: number;
  /** Flat barrier added on each side (nm). */
  readonly continuum_nm: number;
  /** Final states kept up to this far above the barrier edge (eV). */
  readonly range_eV: number;
  readonly depolarisation: boolean;
}

/**
 * The flat barrier added on each side by default for a linewidth Γ (eV): 200 nm at 10 meV, longer
 * as the lines narrow, so the box's level spacing stays a small part of Γ (its ripple on the
 * spectrum falls as e^(−πΓ/ΔE)): doubling it moves the peak of a bound-to-continuum detector by
 * under 0.1 meV (test/poisson/absorption.test.ts).
 */
export const continuumFor = (linewidth_eV: number): number => 2 / linewidth_eV;

export const DEFAULT_ABSORPTION: AbsorptionOptions = { linewidth_eV: 0.01, coupling: '45deg', refractiveIndex: 3.3, continuum_nm: 200, range_eV: 0.3, depolarisation: true };

/** One absorption line. */
export interface AbsorptionLine {
  /** "e1-e2" between bound states, "e1-c7" to the 7th box state above the barrier edge. */
  readonly label: string;
  /** Single-particle energy E_j − E_i (eV). */
  readonly energy_eV: number;
  /** With the depolarisation shift (eV). */
  readonly shifted_eV: number;
  readonly dipole_nm: number;
  /** S_ij (nm): ∫Q²/ε_r dz. */
  readonly depolarisation_nm: number;
  /** Population difference n_i − n_j (cm⁻²). */
  readonly population_cm2: number;
  /** Peak absorption of this line alone per pass (fraction, before 1 − e^−η). */
  readonly strength: number;
}

export interface AbsorptionResult {
  readonly status: 'ok' | 'no-populated-subband';
  readonly options: AbsorptionOptions;
  /** sin²θ/cos θ of the coupling geometry. */
  readonly geometry: number;
  /** Peak of the spectrum: photon energy (eV), wavelength (µm), absorption per pass (fraction). */
  readonly peak_eV: number;
  readonly peak_um: number;
  readonly peak_absorption: number;
  /** Full width at half maximum of the spectrum around its peak (meV, and in wavelength µm). */
  readonly fwhm_meV: number;
  readonly fwhm_um: number;
  /** Box states used (the continuum's discretisation) and how many lie above the barrier edge. */
  readonly boxStates: number;
  readonly continuumStates: number;
  readonly lines: readonly AbsorptionLine[];
  /** The spectrum: photon energies (eV) and absorption per pass (fraction). */
  readonly spectrum: { readonly energy_eV: Float64Array; readonly absorption: Float64Array };
}

/** sin²θ/cos θ for the coupling (see the module comment). */
export function couplingFactor(coupling: Coupling, n: number): number {
  switch (coupling) {
    case '45deg': return Math.SQRT1_2;
    case 'brewster': return 1 / (n * Math.sqrt(1 + n * n));
    case 'normal-z': return 1;
  }
}

/** cos(√s x) and sin(√s x)/√s (their hyperbolic forms for s < 0, x for s = 0). */
function basis(s: number, x: number): [number, number] {
  if (s > 0) { const k = Math.sqrt(s); return [Math.cos(k * x), Math.sin(k * x) / k]; }
  if (s < 0) { const k = Math.sqrt(-s); return [Math.cosh(k * x), Math.sinh(k * x) / k]; }
  return [1, x];
}

/** A box slice: the profile slice plus its permittivity and the cell (of the self-consistent solve) it belongs to. */
interface BoxSlice { readonly slice: Slice; readonly eps: number; readonly cell: number }

/** A state of the box sampled at slice ends and midpoints: ψ and p = ψ′/m(E), normalised in the two-band norm. */
interface Sampled {
  readonly energy: number;
  readonly psi: Float64Array;
  readonly p: Float64Array;
  /** Decay constants (1/nm) of the state in the two walls. */
  readonly kL: number; readonly kR: number;
  readonly population: number;
}

/** What the absorption needs from the self-consistent solve. */
export interface AbsorptionInput {
  /** The electron profile of the folded structure on the mesh elements (flat slices). */
  readonly profile: BandProfile;
  readonly mesh: PoissonMesh;
  readonly temperature_K: number;
  /** Cell of each mesh node and each cell's Fermi level (eV, particle sense). */
  readonly cellOfNode: Int32Array;
  readonly fermi: readonly number[];
}

/**
 * The absorption spectrum of a self-consistent electron profile (see the module comment).
 * Status 'no-populated-subband' when no bound subband holds carriers.
 */
export function intersubbandAbsorption(input: AbsorptionInput, options: AbsorptionOptions = DEFAULT_ABSORPTION): AbsorptionResult {
  const { profile, mesh } = input;
  const kT = KB_EV_PER_K * input.temperature_K;
  const edge = profile.openEdge;
  const top = edge + options.range_eV;
  const wall = top + WALL_EV;
  const N = mesh.z.length - 1;
  const lastCell = input.cellOfNode[N]!;
  // Slices of the box: left extension, the stack's elements, right extension, each cut to MAX_SLICE_PHASE at `top`.
  const pieces: BoxSlice[] = [];
  const push = (slice: Slice, eps: number, cell: number): void => {
    const m = slice.mass * twoBandFactor(slice.alpha, top - slice.V);
    const k = Math.sqrt(Math.max(m * (top - slice.V), 0) / C);
    const n = Math.max(1, Math.ceil((k * slice.width_nm) / MAX_SLICE_PHASE));
    for (let j = 0; j < n; j++) pieces.push({ slice: { ...slice, width_nm: slice.width_nm / n }, eps, cell });
  };
  const outer = (r: BandProfile['left'], layer: number): Slice => ({ width_nm: options.continuum_nm, V: r.V, mass: r.mass, alpha: r.alpha, massInPlane: r.massInPlane, layer });
  if (options.continuum_nm > 0) push(outer(profile.left, profile.slices[0]!.layer), mesh.eps[0]!, input.cellOfNode[0]!);
  profile.slices.forEach((s, e) => push(s, mesh.eps[e]!, input.cellOfNode[e]!));
  if (options.continuum_nm > 0) push(outer(profile.right, profile.slices[N - 1]!.layer), mesh.eps[N - 1]!, lastCell);
  const box: BandProfile = {
    ...profile,
    slices: pieces.map((p) => p.slice),
    left: { ...profile.left, V: wall },
    right: { ...profile.right, V: wall },
    openEdge: wall,
  };
  const count = countStatesBelow(box, top);
  const bound = countStatesBelow(box, edge);
  const energies = count > 0 ? solveBand(box, { maxStates: count, tolerance_eV: 1e-10 }).states.map((s) => s.energy) : [];

  const n = pieces.length;
  const edges = new Float64Array(n + 1);
  for (let k = 0; k < n; k++) edges[k + 1] = edges[k]! + pieces[k]!.slice.width_nm;
  const cells = input.fermi.length;
  const sample = (E: number): Sampled => {
    const u = wavefunction(box, E, edges);
    const psi = new Float64Array(2 * n + 1);
    const p = new Float64Array(2 * n + 1);
    let norm = 0;
    let inverseMass = 0;
    const shares = new Float64Array(cells);
    for (let k = 0; k < n; k++) {
      const { slice, cell } = pieces[k]!;
      const L = slice.width_nm;
      const dV = E - slice.V;
      const factor = twoBandFactor(slice.alpha, dV);
      const m = slice.mass * factor;
      const s = (m * dV) / C;
      const [cL, SL] = basis(s, L);
      const [cM, SM] = basis(s, L / 2);
      const u0 = u[k]!;
      const u1 = u[k + 1]!;
      const p0 = (u1 - u0 * cL) / (m * SL);
      const um = u0 * cM + m * p0 * SM;
      const pm = p0 * cM - (s / m) * u0 * SM;
      const p1 = p0 * cL - (s / m) * u0 * SL;
      psi[2 * k] = u0; p[2 * k] = p0;
      psi[2 * k + 1] = um; p[2 * k + 1] = pm;
      psi[2 * k + 2] = u1; p[2 * k + 2] = p1;
      // The valence weight of the two-band norm, (ħ²/2m0) α m where the mass is not on its floor.
      const weight = factor === 1 + slice.alpha * dV ? C * slice.alpha * slice.mass : 0;
      const conduction = (L / 6) * (u0 * u0 + 4 * um * um + u1 * u1);
      norm += conduction + weight * (L / 6) * (p0 * p0 + 4 * pm * pm + p1 * p1);
      inverseMass += conduction / (slice.massInPlane * factor);
      shares[cell] += conduction;
    }
    // The walls' tails ψ_edge e^(−κ|z − wall|), with p = ∓κψ/m there: ∫(ψ² + w p²) = ψ_edge²(1 + w κ²/m²)/(2κ).
    const wallTail = (r: BandProfile['left'], edge: number): { kappa: number; norm: number } => {
      const factor = twoBandFactor(r.alpha, E - r.V);
      const m = r.mass * factor;
      const kappa = Math.sqrt((m * (r.V - E)) / C);
      const weight = factor === 1 + r.alpha * (E - r.V) ? C * r.alpha * r.mass : 0;
      return { kappa, norm: (edge * edge * (1 + (weight * kappa * kappa) / (m * m))) / (2 * kappa) };
    };
    const tl = wallTail(box.left, u[0]!);
    const tr = wallTail(box.right, u[n]!);
    const kL = tl.kappa;
    const kR = tr.kappa;
    norm += tl.norm + tr.norm;
    const scale = 1 / Math.sqrt(norm);
    for (let j = 0; j < psi.length; j++) { psi[j] = psi[j]! * scale; p[j] = p[j]! * scale; }
    let conductionNorm = 0;
    for (let c = 0; c < cells; c++) conductionNorm += shares[c]!;
    const mass = conductionNorm / inverseMass;
    let population = 0;
    for (let c = 0; c < cells; c++) if (shares[c]! > 0) population += (shares[c]! / conductionNorm) * subbandFilling(mass, E, input.fermi[c]!, kT);
    return { energy: E, psi, p, kL, kR, population };
  };
  const states = energies.map(sample);
  const label = (j: number): string => (j < bound ? `e${j + 1}` : `c${j - bound + 1}`);

  const totalPopulation = states.slice(0, bound).reduce((a, s) => a + s.population, 0);
  const geometry = couplingFactor(options.coupling, options.refractiveIndex);
  const prefactor = (geometry * 4 * Math.PI * Math.PI * ALPHA_FS) / options.refractiveIndex;
  const raw: (AbsorptionLine & { width: number })[] = [];
  for (let i = 0; i < bound; i++) {
    const a = states[i]!;
    if (!(a.population > 1e-6 * totalPopulation)) continue;
    for (let j = i + 1; j < states.length; j++) {
      const b = states[j]!;
      const dE = b.energy - a.energy;
      if (!(dE > 0)) continue;
      // Q_ij at every sample point; its integral and ∫Q²/ε_r by Simpson per slice.
      const inverse = C / (a.energy - b.energy);
      let integral = 0;
      let S = 0;
      let q0 = inverse * (a.psi[0]! * b.p[0]! - a.p[0]! * b.psi[0]!);
      const qLeft = q0;
      for (let k = 0; k < n; k++) {
        const L = pieces[k]!.slice.width_nm;
        const qm = inverse * (a.psi[2 * k + 1]! * b.p[2 * k + 1]! - a.p[2 * k + 1]! * b.psi[2 * k + 1]!);
        const q1 = inverse * (a.psi[2 * k + 2]! * b.p[2 * k + 2]! - a.p[2 * k + 2]! * b.psi[2 * k + 2]!);
        integral += (L / 6) * (q0 + 4 * qm + q1);
        S += ((L / 6) * (q0 * q0 + 4 * qm * qm + q1 * q1)) / pieces[k]!.eps;
        q0 = q1;
      }
      // Walls: Q decays as e^(−(κ_i + κ_j)|z − wall|) from its value at the wall.
      integral += qLeft / (a.kL + b.kL) + q0 / (a.kR + b.kR);
      S += (qLeft * qLeft) / (2 * (a.kL + b.kL)) / pieces[0]!.eps + (q0 * q0) / (2 * (a.kR + b.kR)) / pieces[n - 1]!.eps;
      const dipole = -integral;
      const dn = a.population - b.population;
      const shift = options.depolarisation ? 1 + (2 * E_OVER_EPS0_V_NM * dn * S) / dE : 1;
      const shifted = dE * Math.sqrt(Math.max(shift, 0));
      const width = options.linewidth_eV;
      const strength = prefactor * dE * dipole * dipole * dn * (2 / (Math.PI * width));
      raw.push({ label: `${label(i)}-${label(j)}`, energy_eV: dE, shifted_eV: shifted, dipole_nm: dipole, depolarisation_nm: S, population_cm2: dn / SHEET_CM2_TO_NM2, strength, width });
    }
  }
  const empty = { energy_eV: new Float64Array(0), absorption: new Float64Array(0) };
  if (raw.length === 0) {
    return { status: 'no-populated-subband', options, geometry, peak_eV: NaN, peak_um: NaN, peak_absorption: 0, fwhm_meV: NaN, fwhm_um: NaN, boxStates: states.length, continuumStates: states.length - bound, lines: [], spectrum: empty };
  }
  const spectrum = lorentzSpectrum(raw);
  const peak = peakOf(spectrum);
  const strongest = Math.max(...raw.map((l) => Math.abs(l.strength)));
  const lines = raw.filter((l) => Math.abs(l.strength) >= LISTED_SHARE * strongest).map(({ width: _w, ...l }) => l);
  return {
    status: 'ok', options, geometry,
    peak_eV: peak.energy, peak_um: HC_EV_NM / peak.energy / 1000, peak_absorption: peak.value,
    fwhm_meV: (peak.high - peak.low) * 1000, fwhm_um: (HC_EV_NM / peak.low - HC_EV_NM / peak.high) / 1000,
    boxStates: states.length, continuumStates: states.length - bound, lines, spectrum,
  };
}

/** Photon energies per line width at which the spectrum is sampled. */
const SAMPLES_PER_WIDTH = 20;

/** The summed Lorentzians on a grid from 5 widths below the lowest strong line to 5 above the highest, as 1 − e^(−η). */
function lorentzSpectrum(lines: readonly { shifted_eV: number; strength: number; width: number }[]): { energy_eV: Float64Array; absorption: Float64Array } {
  const strongest = Math.max(...lines.map((l) => Math.abs(l.strength)));
  const strong = lines.filter((l) => Math.abs(l.strength) >= LISTED_SHARE * strongest);
  const widest = Math.max(...strong.map((l) => l.width));
  const narrowest = Math.min(...strong.map((l) => l.width));
  const lo = Math.max(narrowest / 2, Math.min(...strong.map((l) => l.shifted_eV)) - 5 * widest);
  const hi = Math.max(...strong.map((l) => l.shifted_eV)) + 5 * widest;
  const step = narrowest / SAMPLES_PER_WIDTH;
  const count = Math.min(20000, Math.ceil((hi - lo) / step) + 1);
  const energy = new Float64Array(count);
  const eta = new Float64Array(count);
  for (let g = 0; g < count; g++) energy[g] = lo + ((hi - lo) * g) / (count - 1);
  for (const l of lines) {
    // strength is the line's peak; the Lorentzian of FWHM w is peak · (w/2)² / ((E − Ẽ)² + (w/2)²).
    const h2 = (l.width / 2) ** 2;
    for (let g = 0; g < count; g++) eta[g] += (l.strength * h2) / ((energy[g]! - l.shifted_eV) ** 2 + h2);
  }
  return { energy_eV: energy, absorption: eta.map((x) => 1 - Math.exp(-x)) };
}

/** The spectrum's highest point (refined by the parabola through its neighbours) and its half-maximum crossings. */
function peakOf(s: { energy_eV: Float64Array; absorption: Float64Array }): { energy: number; value: number; low: number; high: number } {
  const { energy_eV: E, absorption: A } = s;
  let k = 0;
  for (let g = 1; g < A.length; g++) if (A[g]! > A[k]!) k = g;
  let energy = E[k]!;
  let value = A[k]!;
  if (k > 0 && k < A.length - 1) {
    const d = A[k - 1]! - 2 * A[k]! + A[k + 1]!;
    if (d < 0) {
      const t = (0.5 * (A[k - 1]! - A[k + 1]!)) / d;
      energy = E[k]! + t * (E[k + 1]! - E[k]!);
      value = A[k]! - 0.25 * (A[k - 1]! - A[k + 1]!) * t;
    }
  }
  const half = value / 2;
  let low = E[0]!;
  for (let g = k; g > 0; g--) if (A[g - 1]! < half) { low = E[g - 1]! + ((half - A[g - 1]!) / (A[g]! - A[g - 1]!)) * (E[g]! - E[g - 1]!); break; }
  let high = E[E.length - 1]!;
  for (let g = k; g < A.length - 1; g++) if (A[g + 1]! < half) { high = E[g]! + ((A[g]! - half) / (A[g]! - A[g + 1]!)) * (E[g + 1]! - E[g]!); break; }
  return { energy, value, low, high };
}
