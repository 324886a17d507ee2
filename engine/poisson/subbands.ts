/**
 * The Schrödinger step of the self-consistent solve: the structure with the electrostatic
 * potential folded into its band edges, the carriers' band profiles on the Poisson mesh, and their
 * bound subbands with each one's charge distributed over the mesh nodes.
 *
 * Folding: every layer gets one band sample per mesh node, its own band edges there (interpolated
 * between its grade samples) plus U(z), so every later step (fields, resonances, wavefunctions,
 * transitions, plots) reads the folded Structure like any other. Inside the loop the carriers'
 * profiles are built straight from the structure and U (potentialProfile): flat slices per mesh
 * element at the mean of its two nodes, on which the solver (engine/solver1d/states.ts) finds the bound
 * states exactly.
 * Units: eV, nm, m0.
 */
import { HBAR2_OVER_2M0 } from '../constants.js';
import { bandPoint, bandsAtFraction, KV_PER_CM_TO_EV_PER_NM, type BandName, type BandProfile, type OuterRegion, type Slice } from '../profile.js';
import { twoBandFactor } from '../solver1d/slices.js';
import { countStatesBelow, solveBand } from '../solver1d/states.js';
import { wavefunction } from '../solver1d/wavefunction.js';
import type { LayerBands, ResolvedLayer, Structure } from '../structure.js';
import type { PoissonMesh } from './poisson.js';

/**
 * The structure with the electron potential energy U (eV, at the mesh nodes) added to every band
 * edge: each layer sampled at its nodes (a grade between its own samples is read linearly at the
 * nodes). Layers, labels, materials and interfaces are kept; a hole's particle-sense potential
 * moves by −U, as the profile builder's sign makes it.
 */
export function foldPotential(structure: Structure, mesh: PoissonMesh, U: ArrayLike<number>): Structure {
  const layers = structure.layers.map((layer, i): ResolvedLayer => {
    const n = mesh.perLayer[i]!;
    const first = mesh.firstNode[i]!;
    const bands = Array.from({ length: n + 1 }, (_, j): LayerBands => {
      const b = bandsAtFraction(layer, j / n);
      const u = U[first + j]!;
      return { ...b, Ec: b.Ec + u, Ehh: b.Ehh + u, Elh: b.Elh + u };
    });
    return { ...layer, bands };
  });
  return { ...structure, layers };
}

/** A bound state of a carrier band in the folded structure, with its charge over the mesh. */
export interface MeshState {
  readonly band: BandName;
  /** Particle energy (eV). */
  readonly energy: number;
  /** Probability-weighted in-plane mass (m0): (∫|ψ|²/m∥(E) dz / ∫|ψ|² dz)⁻¹ over the stack, the two-band factor applied (as solve.ts). */
  readonly mass: number;
  /**
   * ∫|ψ|² hat_k dz per node (sums to 1): the state's share of each node's load; the tails beyond
   * the stack are placed on its end nodes, so a state's whole charge stays in the stack.
   */
  readonly weights: Float64Array;
}

/** Nodes and element midpoints of the mesh, where states are sampled: z_0, m_0, z_1, …, z_N. */
export function sampleGrid(mesh: PoissonMesh): Float64Array {
  const { z } = mesh;
  const g = new Float64Array(2 * z.length - 1);
  for (let k = 0; k < z.length; k++) {
    g[2 * k] = z[k]!;
    if (k + 1 < z.length) g[2 * k + 1] = 0.5 * (z[k]! + z[k + 1]!);
  }
  return g;
}

/**
 * The profile of one carrier band in the potential U (eV at the mesh nodes): each mesh element cut
 * into `parts` equal flat slices at the midpoint values of the element's linear interpolation (band
 * edges, masses and U between its nodes, the field's tilt at the slice's centre), the outer regions
 * at the stack's ends. It is, number for number, what the profile builder makes of the folded
 * structure with slices of (element / parts), built without making that structure.
 */
export function potentialProfile(structure: Structure, mesh: PoissonMesh, U: ArrayLike<number>, band: BandName, parts: 1 | 2, nonparabolic: boolean): BandProfile {
  const slope = structure.field_kV_per_cm * KV_PER_CM_TO_EV_PER_NM;
  const zc = structure.total_nm / 2;
  const slices: Slice[] = [];
  structure.layers.forEach((layer, l) => {
    const n = mesh.perLayer[l]!;
    const first = mesh.firstNode[l]!;
    let a = bandsAtFraction(layer, 0);
    for (let j = 0; j < n; j++) {
      const b = bandsAtFraction(layer, (j + 1) / n);
      const za = mesh.z[first + j]!;
      const h = mesh.z[first + j + 1]! - za;
      const ua = U[first + j]!;
      const ub = U[first + j + 1]!;
      for (let q = 0; q < parts; q++) {
        const t = (q + 0.5) / parts;
        const shift = ua + t * (ub - ua) + slope * (za + t * h - zc);
        const edge = band === 'electron' ? a.Ec + t * (b.Ec - a.Ec) : band === 'heavy_hole' ? a.Ehh + t * (b.Ehh - a.Ehh) : a.Elh + t * (b.Elh - a.Elh);
        const [mz0, mz1, mp0, mp1] = band === 'electron' ? [a.me, b.me, a.me, b.me] : band === 'heavy_hole' ? [a.mhh_z, b.mhh_z, a.mhh_par, b.mhh_par] : [a.mlh_z, b.mlh_z, a.mlh_par, b.mlh_par];
        slices.push({
          width_nm: h / parts, V: band === 'electron' ? edge + shift : -(edge + shift), mass: mz0 + t * (mz1 - mz0),
          alpha: band === 'electron' && nonparabolic ? a.alpha + t * (b.alpha - a.alpha) : 0, massInPlane: mp0 + t * (mp1 - mp0), layer: layer.index,
        });
      }
      a = b;
    }
  });
  const last = structure.layers.length - 1;
  const left = bandPoint(band, bandsAtFraction(structure.layers[0]!, 0), U[0]! + slope * (0 - zc), nonparabolic);
  const right = bandPoint(band, bandsAtFraction(structure.layers[last]!, 1), U[mesh.z.length - 1]! + slope * (structure.total_nm - zc), nonparabolic);
  return { band, slices, left, right, sign: band === 'electron' ? 1 : -1, openEdge: Math.min(left.V, right.V) };
}

/**
 * Levels closer than this (eV) are one cluster: wells too far apart to couple, whose states the
 * solver cannot tell apart (at exact degeneracy it returns one state twice). Far below any kT of
 * interest, so the cluster's members are equally filled and its charge is that of the wells' own
 * states, which meshStates then solves well by well.
 */
export const CLUSTER_EV = 1e-7;

/** The profile restricted to the elements between nodes a and b (outer regions: the cut slices, or the profile's own at the stack's ends). */
function restricted(profile: BandProfile, a: number, b: number, parts: 1 | 2, last: number): BandProfile {
  const slices = profile.slices.slice(parts * a, parts * b);
  const region = (s: Slice): OuterRegion => ({ V: s.V, mass: s.mass, alpha: s.alpha, massInPlane: s.massInPlane });
  const left = a === 0 ? profile.left : region(slices[0]!);
  const right = b === last ? profile.right : region(slices[slices.length - 1]!);
  return { ...profile, slices, left, right, openEdge: Math.min(left.V, right.V) };
}

/**
 * States of a profile on the nodes a..b of the mesh, with energies in [lo, hi], each sampled and
 * weighted over the whole mesh (zero outside a..b; the tails beyond a and b on those nodes).
 */
function statesOn(profile: BandProfile, halved: BandProfile | undefined, mesh: PoissonMesh, grid: Float64Array, a: number, b: number, lo: number, hi: number, tolerance_eV: number): MeshState[] {
  const N = mesh.z.length - 1;
  const part = a === 0 && b === N ? profile : restricted(profile, a, b, 1, N);
  const count = countStatesBelow(part, Math.min(hi, part.openEdge));
  if (count === 0) return [];
  const halfPart = halved && (a === 0 && b === N ? halved : restricted(halved, a, b, 2, N));
  const coarse = solveBand(part, { maxStates: count, tolerance_eV }).states;
  const fine = halfPart ? solveBand(halfPart, { maxStates: count, tolerance_eV }).states : [];
  const { slices, left, right } = part;
  const z = mesh.z;
  const local = grid.subarray(2 * a, 2 * b + 1).map((x) => x - z[a]!);
  const out: MeshState[] = [];
  coarse.forEach((state, k) => {
    if (state.energy < lo) return;
    const E = fine[k] ? fine[k]!.energy + (fine[k]!.energy - state.energy) / 3 : state.energy;
    // ψ is the mesh profile's own eigenstate: at any other energy the join of the two solutions
    // is no state at all, which matters where wells barely couple (levels microvolts apart).
    const psi = wavefunction(part, state.energy, local);
    const w = new Float64Array(N + 1);
    let norm = 0;
    let inverse = 0;
    for (let e = 0; e < b - a; e++) {
      const h = z[a + e + 1]! - z[a + e]!;
      const fa = psi[2 * e]! ** 2;
      const fm = psi[2 * e + 1]! ** 2;
      const fb = psi[2 * e + 2]! ** 2;
      w[a + e] += (h / 6) * (fa + 2 * fm);
      w[a + e + 1] += (h / 6) * (fb + 2 * fm);
      const sl = slices[e]!;
      const piece = (h / 6) * (fa + 4 * fm + fb);
      norm += piece;
      inverse += piece / (sl.massInPlane * twoBandFactor(sl.alpha, E - sl.V));
    }
    const tail = (r: OuterRegion, edge: number): number => {
      const kappa = Math.sqrt(Math.max(r.mass * twoBandFactor(r.alpha, E - r.V) * (r.V - E), 0) / HBAR2_OVER_2M0);
      return kappa > 0 ? edge / (2 * kappa) : 0;
    };
    w[a] += tail(left, psi[0]! ** 2);
    w[b] += tail(right, psi[2 * (b - a)]! ** 2);
    let total = 0;
    for (let n = a; n <= b; n++) total += w[n]!;
    for (let n = a; n <= b; n++) w[n] = w[n]! / total;
    out.push({ band: profile.band, energy: E, mass: norm / inverse, weights: w });
  });
  return out;
}

/**
 * The bound states of a mesh profile below `upTo` (eV, particle sense; the open edge at most),
 * each with its in-plane mass and nodal charge weights. Method: solveBand (exact on the slices),
 * ψ sampled at nodes and midpoints (wavefunction, normalised over all z), the hat integrals by
 * Simpson's rule per element, the outer tails ψ_edge²/(2κ) in closed form.
 * With `halved` (the same band on slices of half the element), the energies are
 * Richardson-extrapolated from the two slicings, E_{h/2} + (E_{h/2} − E_h)/3: the mean-potential
 * slices err by O(h²), and the extrapolation equals the exact solve on linear slices (the
 * potential linear between nodes, as the final solve reads the folded structure) to ~1e-8 eV; ψ
 * stays the mesh profile's eigenstate.
 * A cluster of levels within CLUSTER_EV of each other is solved again in each of `regions` (the
 * wells' regions, cut at the nearest nodes) and replaced by the regions' states in its window,
 * when they are as many.
 */
export function meshStates(profile: BandProfile, mesh: PoissonMesh, grid: Float64Array, upTo: number, tolerance_eV: number, halved?: BandProfile, regions: readonly { readonly from_nm: number; readonly to_nm: number }[] = []): MeshState[] {
  const N = mesh.z.length - 1;
  const all = statesOn(profile, halved, mesh, grid, 0, N, -Infinity, upTo, tolerance_eV);
  if (regions.length < 2) return all;
  const nodeAt = (x: number): number => {
    let best = 0;
    for (let k = 1; k <= N; k++) if (Math.abs(mesh.z[k]! - x) < Math.abs(mesh.z[best]! - x)) best = k;
    return best;
  };
  const cuts = regions.map((r) => [nodeAt(r.from_nm), nodeAt(r.to_nm)] as const);
  const out: MeshState[] = [];
  for (let i = 0; i < all.length;) {
    let j = i + 1;
    while (j < all.length && all[j]!.energy - all[j - 1]!.energy < CLUSTER_EV) j++;
    if (j - i > 1) {
      const lo = all[i]!.energy - CLUSTER_EV;
      const hi = all[j - 1]!.energy + CLUSTER_EV;
      const local = cuts.flatMap(([a, b]) => statesOn(profile, halved, mesh, grid, a, b, lo, hi, tolerance_eV));
      out.push(...(local.length === j - i ? local : all.slice(i, j)));
    } else out.push(all[i]!);
    i = j;
  }
  return out;
}
