/**
 * The subbands an optical spectrum needs, tabulated on one in-plane k grid: the conduction subbands
 * with their non-parabolic in-plane dispersion, the valence subbands (multiband k·p, or parabolic),
 * and for every conduction–valence pair, branch and direction the transition's TE and TM factors
 * (momentum.ts) at each k. Built from a solve with sampled wavefunctions.
 *
 * Conduction subbands: the envelope φ_n of the solve at k∥ = 0, and the in-plane dispersion of the
 * energy-dependent (two-band) mass the solve uses along z: E = E_n + ε with
 * ε = (ħ²k²/2m0) ⟨1/m∥(E)⟩, ⟨1/m∥(E)⟩ = Σ_slices P_s/(m∥_s (1 + α_s (E − V_s))), P_s the probability
 * of φ_n in slice s (D. F. Nelson, R. C. Miller and D. A. Kleinman, Phys. Rev. B 35, 7770 (1987)
 * treat the in-plane non-parabolicity of a subband this way, from memory); at k∥ = 0 it is the
 * solve's mass_inplane. The envelope is kept at its k∥ = 0 shape (common practice).
 *
 * Valence subbands, 'kp4'/'kp6': engine/valence on the same k grid along [100] and [110] (weights
 * ½, ½, as the solve's hole DOS) or one direction in the axial approximation, each state projected on
 * every φ_n √Ep (valence/dispersion.ts `project`). 'parabolic': the single-band hh and lh subbands
 * of the solve with their in-plane masses and the k∥ = 0 factors (hh 3/2, 0; lh 1/2, 2) times the
 * Ep-weighted envelope overlap², the same at every k.
 * Units: eV, nm, 1/nm, masses m0.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import { InputError } from '../errors.js';
import type { HoleDispersion } from '../observables/carriers.js';
import { weightedGrid } from '../observables/matrix-elements.js';
import { buildBandProfile, type BandProfile } from '../profile.js';
import type { SolveResult } from '../solve.js';
import { twoBandFactor } from '../solver1d/slices.js';
import { wellLayerIndices } from '../structure.js';
import { valenceSubbands } from '../valence/dispersion.js';
import { angularQuadrature, holeDispersion } from '../valence/dos.js';
import { MAX_VALENCE_SUBBANDS, VALENCE_K_MAX_PER_NM, VALENCE_K_POINTS } from '../valence/summary.js';
import { EDGE_FACTORS, kaneEnergyOnGrid, polarisationFactors } from './momentum.js';

export type OpticalModel = 'kp4' | 'kp6' | 'parabolic';

export interface OpticalBandOptions {
  /** Valence model; default the solve's (settings.valence, else kp4). */
  readonly model?: OpticalModel;
  /** Axial approximation (one in-plane direction); default the solve's. */
  readonly axial?: boolean;
  /** k grid: uniform from 0 to kMax_per_nm (1/nm) with kPoints points; default the solve's valence grid (1.2 1/nm, 49). */
  readonly kMax_per_nm?: number;
  readonly kPoints?: number;
  /** Valence discretisation (engine/valence ValenceOptions); default 0.2 nm with Richardson extrapolation. */
  readonly grid_nm?: number;
  readonly extrapolate?: boolean;
  /** Kane energy (eV) for every layer instead of the materials' own. */
  readonly kaneEnergy_eV?: number;
  /** Valence subbands followed from the top, at most; default MAX_VALENCE_SUBBANDS (the solve's). */
  readonly maxSubbands?: number;
}

/**
 * One conduction–valence pair along one direction and one valence branch, tables on the k grid;
 * where the two branches of the Kramers pair coincide at every k (a well symmetric about its
 * centre, or parabolic holes) one entry holds both, with their factors summed.
 */
export interface OpticalPair {
  /** Index into OpticalBands.electronLabels / holeLabels. */
  readonly electron: number;
  readonly hole: number;
  /** The valence branch; 'both' for the merged entry of coinciding branches. */
  readonly branch: 0 | 1 | 'both';
  /** Conduction and valence energies (eV, absolute). */
  readonly Ec: Float64Array;
  readonly Ev: Float64Array;
  /** TE and TM factors (eV; |ê·p|² = (m0/6)·factor, momentum.ts), summed over the conduction spin. */
  readonly te: Float64Array;
  readonly tm: Float64Array;
}

export interface OpticalDirection {
  readonly name: string;
  readonly angle_rad: number;
  /** Weight of this direction in the in-plane average (they sum to 1). */
  readonly weight: number;
  readonly pairs: readonly OpticalPair[];
}

export interface OpticalBands {
  readonly model: OpticalModel;
  readonly axial: boolean;
  readonly nonparabolic: boolean;
  readonly temperature_K: number;
  readonly k_per_nm: Float64Array;
  readonly electronLabels: readonly string[];
  readonly holeLabels: readonly string[];
  readonly directions: readonly OpticalDirection[];
  /** Conduction dispersions (energies rising; each subband twice, one branch per spin) for the electron quasi-Fermi level. */
  readonly electrons: HoleDispersion;
  /** Valence dispersions for the hole quasi-Fermi level. */
  readonly holes: HoleDispersion;
  /** Thickness the material gain is referred to (nm): the sum over the well layers (indices into the structure's layers). */
  readonly well_nm: number;
  readonly wells: readonly number[];
  /** Lowest conduction-to-valence energy at k∥ = 0 (eV): the band-edge transition. */
  readonly edge_eV: number;
  /** In-plane masses (m0) of e1 and of the top hole subband, and the well's static permittivity, for band-gap renormalisation. */
  readonly reducedMass: number;
  readonly permittivity: number;
}

/** Probability of a sampled envelope in each slice of a profile (normalised to their sum). */
function sliceWeights(profile: BandProfile, z: Float64Array, psi: Float64Array): Float64Array {
  const out = new Float64Array(profile.slices.length);
  let i = 0;
  let end = 0;
  let total = 0;
  for (let k = 0; k < profile.slices.length; k++) {
    end += profile.slices[k]!.width_nm;
    const last = k === profile.slices.length - 1;
    let sum = 0;
    for (; i < z.length && (last || z[i]! <= end); i++) sum += psi[i]! * psi[i]!;
    out[k] = sum;
    total += sum;
  }
  return out.map((p) => p / total);
}

/**
 * In-plane dispersion (eV, absolute) of a conduction subband at edge E0 on the k grid: the
 * energy-dependent mass of the module comment; ε(k) solved by bisection-safeguarded Newton steps
 * on the increasing f(ε) = ε − (ħ²k²/2m0)⟨1/m∥(E0 + ε)⟩, which is bracketed by [0, (ħ²k²/2m0)⟨1/m∥(E0)⟩].
 */
export function conductionDispersion(profile: BandProfile, weights: Float64Array, E0: number, ks: ArrayLike<number>): Float64Array {
  const inverseMass = (E: number): number => {
    let s = 0;
    profile.slices.forEach((sl, k) => { s += weights[k]! / (sl.massInPlane * twoBandFactor(sl.alpha, E - sl.V)); });
    return s;
  };
  const out = new Float64Array(ks.length);
  for (let i = 0; i < ks.length; i++) {
    const t = HBAR2_OVER_2M0 * ks[i]! * ks[i]!;
    let lo = 0;
    let hi = t * inverseMass(E0);
    let e = i > 0 ? Math.min(Math.max(out[i - 1]! - E0, lo), hi) : 0;
    for (let it = 0; it < 60 && hi - lo > 1e-13 * (1 + hi); it++) {
      const f = e - t * inverseMass(E0 + e);
      if (f === 0) break;
      if (f < 0) lo = e;
      else hi = e;
      const h = 1e-7 * (1 + e);
      const slope = 1 - (t * (inverseMass(E0 + e + h) - inverseMass(E0 + e - h))) / (2 * h);
      const next = e - f / slope;
      e = next > lo && next < hi ? next : 0.5 * (lo + hi);
    }
    out[i] = E0 + e;
  }
  return out;
}

/** ∫ f g dz on the solve's grid (Simpson). */
const dot = (f: ArrayLike<number>, g: ArrayLike<number>, w: Float64Array): number => {
  let s = 0;
  for (let i = 0; i < w.length; i++) s += w[i]! * f[i]! * g[i]!;
  return s;
};

/**
 * The optical subbands of a solved stack (see the module comment), or null when a band has no bound
 * state (no interband transition). Throws InputError when the solve sampled no wavefunctions, for a
 * wire, or when a custom layer's Kane energy cannot be derived (momentum.ts kaneEnergy).
 */
export function opticalBands(r: SolveResult, options: OpticalBandOptions = {}): OpticalBands | null {
  const s = r.structure;
  const z = r.wavefunctions.z_nm;
  if (z.length < 3) throw new InputError('bad-value', 'optics: needs a solve with sampled wavefunctions (solveStructure with wavefunctions: true)');
  const electrons = r.bands.electron.states.map((st, i) => ({ st, psi: r.wavefunctions.psi.electron[i]! })).filter((e) => e.st.bound);
  const singleHoles = [...r.bands.heavy_hole.states.map((st, i) => ({ st, psi: r.wavefunctions.psi.heavy_hole[i]!, kind: 'hh' as const })),
    ...r.bands.light_hole.states.map((st, i) => ({ st, psi: r.wavefunctions.psi.light_hole[i]!, kind: 'lh' as const }))].filter((h) => h.st.bound);
  if (electrons.length === 0 || singleHoles.length === 0) return null;
  const model: OpticalModel = options.model ?? r.settings.valence ?? 'kp4';
  const axial = options.axial ?? r.settings.valenceAxial ?? false;
  const kMax = options.kMax_per_nm ?? VALENCE_K_MAX_PER_NM;
  const nk = options.kPoints ?? VALENCE_K_POINTS;
  if (!(kMax > 0) || !(Number.isInteger(nk) && nk >= 3)) throw new InputError('bad-value', `optics: the k grid needs kMax > 0 and at least 3 points, got ${kMax} 1/nm and ${nk}`);
  const ks = new Float64Array(nk).map((_, i) => (kMax * i) / (nk - 1));

  const Ep = kaneEnergyOnGrid(s, z, options.kaneEnergy_eV);
  const weighted = electrons.map((e) => e.psi.map((v, i) => v * Math.sqrt(Ep[i]!)));
  const profile = buildBandProfile(s, 'electron', { maxSlice_nm: r.settings.slice_nm, nonparabolic: r.settings.nonparabolic });
  const Ec = electrons.map((e) => conductionDispersion(profile, sliceWeights(profile, z, e.psi), e.st.energy_eV, ks));
  const q = angularQuadrature(axial, 1);

  let holeLabels: string[];
  let holes: HoleDispersion;
  let directions: OpticalDirection[];
  if (model === 'parabolic') {
    const grid = weightedGrid(z);
    holeLabels = singleHoles.map((h) => h.st.label);
    const Ev = singleHoles.map((h) => ks.map((k) => h.st.energy_eV - (HBAR2_OVER_2M0 * k * k) / h.st.mass_inplane));
    holes = { k_per_nm: ks, directions: [{ weight: 1, branches: Ev.flatMap((e) => [e, e]) }] };
    const pairs: OpticalPair[] = [];
    electrons.forEach((_, n) => singleHoles.forEach((h, j) => {
      const o2 = dot(weighted[n]!, h.psi, grid.w) ** 2;
      const f = EDGE_FACTORS[h.kind];
      pairs.push({ electron: n, hole: j, branch: 'both', Ec: Ec[n]!, Ev: Ev[j]!, te: new Float64Array(nk).fill(2 * f.te * o2), tm: new Float64Array(nk).fill(2 * f.tm * o2) });
    }));
    directions = [{ name: 'parabolic (isotropic)', angle_rad: 0, weight: 1, pairs }];
  } else {
    const subbands = Math.min(singleHoles.length, options.maxSubbands ?? MAX_VALENCE_SUBBANDS);
    const v = valenceSubbands(s, {
      model, axial, directions: q.directions, kMax_per_nm: kMax, kPoints: nk, subbands,
      ...(options.grid_nm !== undefined ? { grid_nm: options.grid_nm } : {}),
      ...(options.extrapolate !== undefined ? { extrapolate: options.extrapolate } : {}),
      project: { z_nm: z, functions: weighted },
    });
    holeLabels = v.directions[0]!.subbands.map((sb) => sb.label);
    holes = holeDispersion(v, q.weights);
    const amplitudes = new Float64Array(model === 'kp4' ? 4 : 6);
    directions = v.directions.map((dir, di) => {
      const pairs: OpticalPair[] = [];
      electrons.forEach((_, n) => dir.subbands.forEach((sb, j) => {
        const factors = ([0, 1] as const).map((branch) => {
          const te = new Float64Array(nk);
          const tm = new Float64Array(nk);
          const proj = sb.projections![branch][n]!;
          for (let i = 0; i < nk; i++) {
            for (let c = 0; c < amplitudes.length; c++) amplitudes[c] = proj[c]![i]!;
            const f = polarisationFactors(model, dir.angle_rad, amplitudes);
            te[i] = f.te;
            tm[i] = f.tm;
          }
          return { te, tm };
        });
        // Coinciding branches (the mirror image of a symmetric well) make one entry: half the work later.
        const same = sb.energy_eV[0].every((e, i) => e === sb.energy_eV[1][i]);
        if (same) pairs.push({ electron: n, hole: j, branch: 'both', Ec: Ec[n]!, Ev: sb.energy_eV[0], te: factors[0]!.te.map((v, i) => v + factors[1]!.te[i]!), tm: factors[0]!.tm.map((v, i) => v + factors[1]!.tm[i]!) });
        else for (const branch of [0, 1] as const) pairs.push({ electron: n, hole: j, branch, Ec: Ec[n]!, Ev: sb.energy_eV[branch], ...factors[branch]! });
      }));
      return { name: dir.name, angle_rad: dir.angle_rad, weight: q.weights[di]!, pairs };
    });
  }

  const wells = wellLayerIndices(s.layers);
  const wellIdx = wells.length > 0 ? wells : s.layers.length > 2 ? s.layers.slice(1, -1).map((l) => l.index) : s.layers.map((l) => l.index);
  const topHole = singleHoles.reduce((a, b) => (b.st.energy_eV > a.st.energy_eV ? b : a));
  const e1 = electrons[0]!.st;
  let edge = Infinity;
  for (const dir of directions) for (const p of dir.pairs) edge = Math.min(edge, p.Ec[0]! - p.Ev[0]!);
  const permittivities = wellIdx.map((i) => s.layers[i]!.permittivity).filter(Number.isFinite);
  return {
    model, axial: model === 'parabolic' ? true : axial, nonparabolic: r.settings.nonparabolic, temperature_K: s.temperature_K,
    k_per_nm: ks,
    electronLabels: electrons.map((e) => e.st.label),
    holeLabels,
    directions,
    electrons: { k_per_nm: ks, directions: [{ weight: 1, branches: Ec.flatMap((e) => [e, e]) }] },
    holes,
    well_nm: wellIdx.reduce((sum, i) => sum + s.layers[i]!.thickness_nm, 0),
    wells: wellIdx,
    edge_eV: edge,
    reducedMass: 1 / (1 / e1.mass_inplane + 1 / topHole.st.mass_inplane),
    permittivity: permittivities.length > 0 ? permittivities.reduce((a, b) => a + b, 0) / permittivities.length : NaN,
  };
}
