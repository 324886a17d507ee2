/**
 * The 1-D potential profile the well solver accepts: per band, a sequence of slices of constant
 * potential and mass between two semi-infinite outer regions. Energies are written in the
 * "particle" sense: for holes the potential is −Ev and the energy is measured downward, so one
 * solver serves every band. Energies eV, widths nm, masses m0.
 */
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
const KV_PER_CM_TO_EV_PER_NM = 1e-4;

function bandsAt(layer: ResolvedLayer, t: number): LayerBands {
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
function bandPoint(band: BandName, b: LayerBands, tilt: number, nonparabolic: boolean): OuterRegion {
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
 * The profile of one band: one slice per uniform layer; graded layers and an applied field are
 * cut into slices of at most `maxSlice_nm` with midpoint values (second order in the slice width,
 * which the solver's Richardson step removes). The field tilts every band by e·F·(z − z_c) about
 * the stack's centre z_c; beyond the stack the material is flat (field-free contacts), each outer
 * region at the band edge of its end of the stack. Units: field kV/cm (1 kV/cm = 1e-4 eV/nm for
 * an electron), widths nm, energies eV.
 */
export function buildBandProfile(s: Structure, band: BandName, options: { readonly maxSlice_nm: number; readonly nonparabolic: boolean }): BandProfile {
  const slope = s.field_kV_per_cm * KV_PER_CM_TO_EV_PER_NM;
  const zc = s.total_nm / 2;
  const slices: Slice[] = [];
  let z0 = 0;
  for (const layer of s.layers) {
    const uniform = layer.bands.length === 1 && slope === 0;
    const n = uniform ? 1 : Math.max(1, Math.ceil(layer.thickness_nm / options.maxSlice_nm - 1e-9));
    const w = layer.thickness_nm / n;
    for (let k = 0; k < n; k++) {
      const t = (k + 0.5) / n;
      const p = bandPoint(band, bandsAt(layer, t), slope * (z0 + (k + 0.5) * w - zc), options.nonparabolic);
      slices.push({ width_nm: w, V: p.V, mass: p.mass, alpha: p.alpha, massInPlane: p.massInPlane, layer: layer.index });
    }
    z0 += layer.thickness_nm;
  }
  const first = s.layers[0]!;
  const last = s.layers[s.layers.length - 1]!;
  const left = bandPoint(band, bandsAt(first, 0), slope * (0 - zc), options.nonparabolic);
  const right = bandPoint(band, bandsAt(last, 1), slope * (s.total_nm - zc), options.nonparabolic);
  return { band, slices, left, right, sign: band === 'electron' ? 1 : -1, openEdge: Math.min(left.V, right.V) };
}
