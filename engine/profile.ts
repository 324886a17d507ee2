/**
 * The 1-D potential profile the well solver accepts: per band, a sequence of slices of constant
 * potential and mass between two semi-infinite outer regions. Energies are written in the
 * "particle" sense: for holes the potential is −Ev and the energy is measured downward, so one
 * solver serves every band. Energies eV, widths nm, masses m0.
 */
import { HBAR2_OVER_2M0 } from './constants.js';
import type { LayerBands, ResolvedLayer, Structure } from './structure.js';

export type BandName = 'electron' | 'heavy_hole' | 'light_hole';

export interface Slice {
  /** Width in nm (> 0). */
  readonly width_nm: number;
  /** Potential in the particle sense (eV). */
  readonly V: number;
  /** Effective mass along z (m0) at the band edge. */
  readonly mass: number;
  /** Non-parabolicity coefficient (1/eV) of the two-band form m(E) = mass · (1 + alpha (E − V)); 0 for parabolic. */
  readonly alpha: number;
  /** In-plane mass (m0) for the density of states. */
  readonly massInPlane: number;
  /** Index of the layer of the structure this slice belongs to (graded layers and fields split a layer). */
  readonly layer: number;
  /**
   * A linear slice (buildBandProfile's `linear`): dV/dz (eV/nm, particle sense), d(mass)/dz
   * (m0/nm) and d(alpha)/dz (1/(eV nm)), constant across it; V, mass and alpha are then the values
   * at the slice's centre. Absent: the slice is flat (V, mass and alpha constant across it).
   */
  readonly gradient?: SliceGradient;
}

export interface SliceGradient {
  readonly V: number;
  readonly mass: number;
  readonly alpha: number;
}

export interface OuterRegion {
  readonly V: number;
  readonly mass: number;
  readonly alpha: number;
  readonly massInPlane: number;
}

export interface BandProfile {
  readonly band: BandName;
  /** Slices from left (z = 0) to right. */
  readonly slices: readonly Slice[];
  /** Semi-infinite regions beyond the first and last slice (constant potential and mass). */
  readonly left: OuterRegion;
  readonly right: OuterRegion;
  /** +1 for electrons (energy = particle energy), −1 for holes (absolute energy = −particle energy). */
  readonly sign: 1 | -1;
  /**
   * Particle energy above which a state can leave the structure: the lower of the two outer
   * potentials (with a field, the downhill contact's edge). Bound states lie below it; above it the
   * states of the structure are resonances (engine/resonance.ts).
   */
  readonly openEdge: number;
}

/** 1 kV/cm = 1e-4 V/nm: the potential-energy slope of an electron in eV per nm. */
export const KV_PER_CM_TO_EV_PER_NM = 1e-4;

/** A layer's band edges and masses at fraction t of its thickness: linear between its samples. */
export function bandsAtFraction(layer: ResolvedLayer, t: number): LayerBands {
  const s = layer.bands;
  if (s.length === 1) return s[0]!;
  const u = Math.min(Math.max(t, 0), 1) * (s.length - 1);
  const k = Math.min(Math.floor(u), s.length - 2);
  const f = u - k;
  const a = s[k]!;
  const b = s[k + 1]!;
  const mix = (p: number, q: number): number => p + f * (q - p);
  return {
    Ec: mix(a.Ec, b.Ec), Ehh: mix(a.Ehh, b.Ehh), Elh: mix(a.Elh, b.Elh), me: mix(a.me, b.me),
    mhh_z: mix(a.mhh_z, b.mhh_z), mlh_z: mix(a.mlh_z, b.mlh_z), mhh_par: mix(a.mhh_par, b.mhh_par),
    mlh_par: mix(a.mlh_par, b.mlh_par), alpha: mix(a.alpha, b.alpha),
  };
}

/** Particle-sense potential, masses and non-parabolicity of one band at one point. */
export function bandPoint(band: BandName, b: LayerBands, tilt: number, nonparabolic: boolean): OuterRegion {
  switch (band) {
    case 'electron': return { V: b.Ec + tilt, mass: b.me, alpha: nonparabolic ? b.alpha : 0, massInPlane: b.me };
    case 'heavy_hole': return { V: -(b.Ehh + tilt), mass: b.mhh_z, alpha: 0, massInPlane: b.mhh_par };
    case 'light_hole': return { V: -(b.Elh + tilt), mass: b.mlh_z, alpha: 0, massInPlane: b.mlh_par };
  }
}

/** True when a structure needs more than one slice per layer (graded layers or a field). */
export const isPiecewiseConstant = (s: Structure): boolean =>
  s.field_kV_per_cm === 0 && s.layers.every((l) => l.bands.length === 1);

/**
 * Cuts of a linear slice on which the solver's Airy form is not exact (a graded mass, or a
 * two-band mass under a slope): the largest relative change of the mass across one, and the largest
 * phase or decay √(m |E − V|/C)·width over the bound-state window. The solver's error is then of
 * fourth order in the slice (solver1d, carryLinear); measured against 4× finer cuts
 * (test/solver1d/linear.test.ts), GaAs/Al0.3Ga0.7As wells with two-band electrons err by 6e-10 eV at
 * 30 kV/cm and 5e-9 eV at 100 kV/cm, a 0 → 0.3 Al grade by 3e-10 eV.
 */
export const LINEAR_MASS_STEP = 0.05;
export const LINEAR_PHASE = 0.5;

export interface ProfileOptions {
  /** Largest slice (nm) of graded layers and fields when they are sliced (not linear). */
  readonly maxSlice_nm: number;
  readonly nonparabolic: boolean;
  /**
   * Graded layers and a field as linear slices (V, mass, alpha linear in z, `gradient` set), which the solver
   * carries with Airy functions: one slice per uniform layer and per pair of neighbouring grade
   * samples, cut further where the mass varies along z (a graded mass, or the two-band mass
   * m(E − V) with V sloping; see LINEAR_MASS_STEP). Default false: flat slices of at most
   * maxSlice_nm, as wavefunctions, resonances and observables need.
   */
  readonly linear?: boolean;
}

/**
 * The profile of one band: one slice per uniform layer; graded layers and an applied field are
 * cut into slices of at most `maxSlice_nm` with midpoint values (second order in the slice width,
 * which the solver's Richardson step removes), or with `linear` into linear slices that the solver
 * treats exactly (see ProfileOptions). The field tilts every band by e·F·(z − z_c) about the stack's
 * centre z_c; beyond the stack the material is flat (field-free contacts), each outer region at the
 * band edge of its end of the stack. Units: field kV/cm (1 kV/cm = 1e-4 eV/nm for an electron),
 * widths nm, energies eV.
 */
export function buildBandProfile(s: Structure, band: BandName, options: ProfileOptions): BandProfile {
  const slope = s.field_kV_per_cm * KV_PER_CM_TO_EV_PER_NM;
  const zc = s.total_nm / 2;
  const first = s.layers[0]!;
  const last = s.layers[s.layers.length - 1]!;
  const left = bandPoint(band, bandsAtFraction(first, 0), slope * (0 - zc), options.nonparabolic);
  const right = bandPoint(band, bandsAtFraction(last, 1), slope * (s.total_nm - zc), options.nonparabolic);
  const openEdge = Math.min(left.V, right.V);
  const slices: Slice[] = [];
  if (options.linear) slices.push(...linearPieceSlices(linearPieces(s, band, slope, options.nonparabolic), openEdge));
  else {
    let z0 = 0;
    for (const layer of s.layers) {
      const uniform = layer.bands.length === 1 && slope === 0;
      const n = uniform ? 1 : Math.max(1, Math.ceil(layer.thickness_nm / options.maxSlice_nm - 1e-9));
      const w = layer.thickness_nm / n;
      for (let k = 0; k < n; k++) {
        const t = (k + 0.5) / n;
        const p = bandPoint(band, bandsAtFraction(layer, t), slope * (z0 + (k + 0.5) * w - zc), options.nonparabolic);
        slices.push({ width_nm: w, V: p.V, mass: p.mass, alpha: p.alpha, massInPlane: p.massInPlane, layer: layer.index });
      }
      z0 += layer.thickness_nm;
    }
  }
  return { band, slices, left, right, sign: band === 'electron' ? 1 : -1, openEdge };
}

/** A stretch of a profile across which V, mass, alpha and in-plane mass are linear in z: its width and its end values. */
export interface LinearPiece {
  readonly width_nm: number;
  readonly a: OuterRegion;
  readonly b: OuterRegion;
  readonly layer: number;
}

/**
 * Linear pieces as linear slices. A piece on which the solver's Airy form is exact (constant mass,
 * and no two-band mass under a slope) is one slice; any other is cut into equal slices so that the
 * mass (or the two-band factor, through α·ΔV) changes by at most LINEAR_MASS_STEP across one and
 * the phase or decay √(m |E − V|/C)·width stays below LINEAR_PHASE for every energy between the
 * lowest potential and `openEdge` (eV). Each slice carries its centre values and the piece's gradients.
 * Units: nm, eV, m0.
 */
export function linearPieceSlices(pieces: readonly LinearPiece[], openEdge: number): Slice[] {
  let low = openEdge;
  for (const { a, b } of pieces) low = Math.min(low, a.V, b.V);
  const out: Slice[] = [];
  for (const { layer, width_nm: w, a, b } of pieces) {
    let n = 1;
    const exact = a.mass === b.mass && a.alpha === b.alpha && (a.alpha === 0 || a.V === b.V);
    if (!exact) {
      const change = Math.max(Math.abs(b.mass - a.mass) / Math.min(a.mass, b.mass), Math.max(a.alpha, b.alpha) * Math.abs(b.V - a.V));
      const depth = Math.max(Math.abs(a.V - low), Math.abs(b.V - low), Math.abs(a.V - openEdge), Math.abs(b.V - openEdge));
      const m = Math.max(a.mass, b.mass) * (1 + Math.max(a.alpha, b.alpha) * depth);
      const phase = Math.sqrt((m * depth) / HBAR2_OVER_2M0) * w;
      n = Math.max(1, Math.ceil(change / LINEAR_MASS_STEP - 1e-9), Math.ceil(phase / LINEAR_PHASE - 1e-9));
    }
    const gradient: SliceGradient | undefined = a.V === b.V && a.mass === b.mass && a.alpha === b.alpha
      ? undefined : { V: (b.V - a.V) / w, mass: (b.mass - a.mass) / w, alpha: (b.alpha - a.alpha) / w };
    for (let j = 0; j < n; j++) {
      const t = (j + 0.5) / n;
      out.push({
        width_nm: w / n, V: a.V + t * (b.V - a.V), mass: a.mass + t * (b.mass - a.mass), alpha: a.alpha + t * (b.alpha - a.alpha),
        massInPlane: a.massInPlane + t * (b.massInPlane - a.massInPlane), layer, gradient,
      });
    }
  }
  return out;
}

/** The structure's linear pieces: one per uniform layer, one between neighbouring samples of a graded layer. */
function linearPieces(s: Structure, band: BandName, fieldSlope: number, nonparabolic: boolean): LinearPiece[] {
  const zc = s.total_nm / 2;
  const pieces: LinearPiece[] = [];
  let z0 = 0;
  for (const layer of s.layers) {
    const count = Math.max(1, layer.bands.length - 1);
    const w = layer.thickness_nm / count;
    for (let k = 0; k < count; k++) {
      const za = z0 + k * w;
      const a = bandPoint(band, bandsAtFraction(layer, k / count), fieldSlope * (za - zc), nonparabolic);
      const b = bandPoint(band, bandsAtFraction(layer, (k + 1) / count), fieldSlope * (za + w - zc), nonparabolic);
      pieces.push({ layer: layer.index, width_nm: w, a, b });
    }
    z0 += layer.thickness_nm;
  }
  return pieces;
}
