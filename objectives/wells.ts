/**
 * The wells of a layer stack and the states that live in each, from the |ψ|² weight of every
 * state over each well's region. Targets that name a well, the ensemble of wells' lines and the
 * tolerance analysis of multi-well stacks read it.
 *
 * Wells: layers whose conduction-band edge (at the layer's centre) lies strictly below both
 * neighbours' (one neighbour at the ends): engine/structure.ts wellLayerIndices. Regions:
 * z is split at the midpoints between consecutive wells' centres, so every point belongs to one
 * well and a state's weights sum to 1.
 *
 * Assignment (our rule, stated): states of a band are taken in energy order. A state with at least
 * 90 % of its weight in one well goes to that well; a state spread wider (coupled wells share it)
 * goes to the well with the fewest states so far among those holding at least a tenth of its
 * largest weight (ties: the larger weight, then the earlier well). A run of states degenerate within DEGENERATE_EV
 * (identical wells too far apart to couple: any mix of them is an eigenstate, and the sampled ones
 * are numerically arbitrary) fills, fewest states first, the wells of the kind (same material
 * and thickness) that holds most of the run's weight. For wells far
 * apart this is the well holding the state; for identical wells, whose lowest states spread over
 * all of them (a miniband) or are degenerate, it gives each well one state of the miniband, so
 * "e1 of well[3]" exists in every well and lies within the miniband's width of the single-well e1.
 */
import { BANDS, bandOfLabel } from '../engine/solve.js';
import type { BandName } from '../engine/profile.js';
import { wellLayerIndices } from '../engine/structure.js';
import type { TargetLayer, TargetSource } from './types.js';

export interface Well {
  /** Index of the well layer in the stack. */
  readonly layer: number;
  readonly label: string;
  /** The well's region along z (nm): from the midpoint to the previous well to the midpoint to the next. */
  readonly from_nm: number;
  readonly to_nm: number;
}

/** A state's home well and how much of it lives there. */
export interface StateHome {
  readonly label: string;
  /** Index into wells. */
  readonly well: number;
  /** |ψ|² weight in the home well's region (0–1). */
  readonly weight: number;
  /** Level of the state in its well: 1 for the well's lowest state of this band. */
  readonly level: number;
}

export interface WellStates {
  readonly wells: readonly Well[];
  readonly bands: Readonly<Record<BandName, readonly StateHome[]>>;
}

/** The wells of a stack with their regions (see the file comment). */
export function wellsOf(layers: readonly Pick<TargetLayer, 'bands' | 'thickness_nm' | 'label'>[]): Well[] {
  const starts: number[] = [];
  let z = 0;
  for (const l of layers) { starts.push(z); z += l.thickness_nm; }
  const idx = wellLayerIndices(layers);
  const centre = idx.map((i) => starts[i]! + layers[i]!.thickness_nm / 2);
  return idx.map((i, k) => ({
    layer: i,
    label: layers[i]!.label,
    from_nm: k === 0 ? 0 : (centre[k - 1]! + centre[k]!) / 2,
    to_nm: k === idx.length - 1 ? z : (centre[k]! + centre[k + 1]!) / 2,
  }));
}

/** A state with at least this share of its weight in one well is that well's. */
const LOCALISED = 0.9;
/** A spread state may go to any well holding at least this share of its largest weight. */
const SPREAD = 0.1;
/**
 * States closer than this (eV) are degenerate: far below any coupling that localises a state
 * (two 5 nm GaAs wells 20 nm apart behind Al0.3Ga0.7As split by about 1e-6 eV) and far above the
 * solver's energy resolution (about 1e-12 eV).
 */
const DEGENERATE_EV = 1e-9;

/** |ψ|² weights (sum 1) of one sampled state over the wells' regions, by the trapezoid rule on the grid. */
export function wellWeights(z: Float64Array, psi: Float64Array, wells: readonly Well[]): number[] {
  const w = wells.map(() => 0);
  let total = 0;
  let k = 0;
  for (let i = 0; i + 1 < z.length; i++) {
    const mid = (z[i]! + z[i + 1]!) / 2;
    const piece = ((psi[i]! ** 2 + psi[i + 1]! ** 2) / 2) * (z[i + 1]! - z[i]!);
    while (k + 1 < wells.length && mid >= wells[k]!.to_nm) k++;
    w[k]! += piece;
    total += piece;
  }
  return total > 0 ? w.map((x) => x / total) : w;
}

const cache = new WeakMap<object, WellStates | null>();

/**
 * The wells of a solved stack and each state's home well (see the file comment); null when the
 * result has no layers, no well or no sampled wavefunctions (a search solved without them).
 * Memoised per result.
 */
export function localise(r: TargetSource): WellStates | null {
  const hit = cache.get(r);
  if (hit !== undefined) return hit;
  const layers = r.structure.layers;
  const waves = r.wavefunctions;
  let out: WellStates | null = null;
  if (layers && waves && waves.z_nm.length > 1) {
    const wells = wellsOf(layers);
    if (wells.length > 0) {
      const bands = {} as Record<BandName, StateHome[]>;
      // Wells of one kind (same material and thickness) have the same levels when far apart.
      const kinds = wells.map((w) => `${layers[w.layer]!.formula}|${layers[w.layer]!.thickness_nm.toPrecision(12)}`);
      for (const band of BANDS) {
        const count = wells.map(() => 0);
        const states = r.bands[band].states;
        const weights = states.map((_, k) => {
          const psi = waves.psi[band][k];
          return psi ? wellWeights(waves.z_nm, psi, wells) : wells.map(() => NaN);
        });
        const homes: StateHome[] = [];
        for (let k = 0; k < states.length;) {
          // A run of degenerate states is placed as a group: their weights summed say which wells they span.
          let end = k + 1;
          while (end < states.length && Math.abs(states[end]!.energy_eV - states[end - 1]!.energy_eV) < DEGENERATE_EV) end++;
          const group = weights.slice(k, end);
          // Sampled wavefunctions of degenerate states are arbitrary mixes, so they only say which kind
          // of well the group belongs to (the kind holding most of their weight); its states then fill
          // the wells of that kind, fewest states first.
          const summed = wells.map((_, j) => group.reduce((a, w) => a + (Number.isFinite(w[j]!) ? w[j]! : 0), 0));
          const kind = group.length > 1 ? kinds[summed.indexOf(Math.max(...summed))] : undefined;
          for (let g = 0; g < group.length; g++) {
            const w = group[g]!;
            const top = Math.max(...w);
            const floor = top >= LOCALISED ? top : SPREAD * top;
            const eligible = (j: number): boolean => (kind === undefined ? w[j]! >= floor : kinds[j] === kind);
            let best = -1;
            for (let j = 0; j < wells.length; j++) {
              if (!eligible(j)) continue;
              if (best < 0 || count[j]! < count[best]! || (count[j] === count[best] && w[j]! > w[best]!)) best = j;
            }
            if (best < 0) best = count.indexOf(Math.min(...count));
            count[best]!++;
            homes.push({ label: states[k + g]!.label, well: best, weight: w[best]!, level: count[best]! });
          }
          k = end;
        }
        bands[band] = homes;
      }
      out = { wells, bands };
    }
  }
  cache.set(r, out);
  return out;
}

/** Finds a well by its label ("well[3]") or its 1-based number among the wells; undefined when absent. */
export function findWell(ws: WellStates, which: string | number): number | undefined {
  const k = typeof which === 'number' ? which - 1 : ws.wells.findIndex((w) => w.label === which);
  return k >= 0 && k < ws.wells.length ? k : undefined;
}

/**
 * The energy (eV, absolute) of a well's n-th state of a band, "e1" meaning that well's lowest
 * electron state; undefined when the well has no such state.
 */
export function wellStateEnergy(r: TargetSource, ws: WellStates, well: number, band: BandName, level: number): number | undefined {
  const k = ws.bands[band].findIndex((h) => h.well === well && h.level === level);
  return k < 0 ? undefined : r.bands[band].states[k]!.energy_eV;
}

/**
 * Photon energy (eV) of a transition ("e1-hh1", "e1-e2") between a well's own states; undefined
 * when the well lacks one of them. The label must have passed transitionStates.
 */
export function wellLine(r: TargetSource, ws: WellStates, well: number, transition: string): number | undefined {
  const [a, b] = transition.split('-').map((l) => bandOfLabel(l)!);
  const ea = wellStateEnergy(r, ws, well, a!.band, a!.index);
  const eb = wellStateEnergy(r, ws, well, b!.band, b!.index);
  return ea === undefined || eb === undefined ? undefined : Math.abs(eb - ea);
}

/** One state's home as outputs print it: the well's label ("well[3]"), the |ψ|² weight there and its level in that well. */
export interface StateWell {
  readonly state: string;
  readonly well: string;
  readonly weight: number;
  readonly level: number;
}

/**
 * Every state of a solved multi-well stack labelled by the well it lives in (localise), per band;
 * null for fewer than two wells or without sampled wavefunctions.
 */
export function stateWells(r: TargetSource): Readonly<Record<BandName, readonly StateWell[]>> | null {
  const ws = localise(r);
  if (!ws || ws.wells.length < 2) return null;
  const out = {} as Record<BandName, StateWell[]>;
  for (const band of BANDS) out[band] = ws.bands[band].map((h) => ({ state: h.label, well: ws.wells[h.well]!.label, weight: h.weight, level: h.level }));
  return out;
}

/** Where a state of a stack lives: in its wells, or spread over the guiding and cladding layers around them. */
export type StateRegion = 'well' | 'guide';

export interface StateRegionOf {
  readonly state: string;
  readonly region: StateRegion;
  /** Share (0–1) of the state's |ψ|² over the layers where it can travel (its energy beyond their edge) that lies in well layers. */
  readonly wellShare: number;
}

/** What stateRegions reads: a solved stack with every band's edges per layer and sampled wavefunctions. */
export interface RegionSource {
  readonly bands: Readonly<Record<BandName, { readonly states: readonly { readonly label: string; readonly energy_eV: number }[] }>>;
  readonly structure: { readonly layers: readonly { readonly thickness_nm: number; readonly bands: readonly { readonly Ec: number; readonly Ehh: number; readonly Elh: number }[] }[] };
  readonly wavefunctions?: { readonly z_nm: Float64Array; readonly psi: Readonly<Record<BandName, readonly Float64Array[]>> };
}

const EDGE_KEY = { electron: 'Ec', heavy_hole: 'Ehh', light_hole: 'Elh' } as const;

/**
 * Where each state lives (our rule, stated): a band's wells are the layers whose edge (at the
 * layer's centre) is a local extremum of that band, deeper than both neighbours (the outer layers
 * need one); a state can travel in the layers whose edge it lies beyond (above Ec for electrons,
 * below Ehh/Elh for holes). A state lives in the wells when at least half of its |ψ|² over those
 * layers (trapezoid rule on the sampled grid) lies in well layers; otherwise it spreads over the
 * guiding and cladding layers (a waveguide's states, above the well's own barriers). Tails under
 * the barriers do not count, so a state at the barrier edge of a detector's well stays the well's.
 * Null when the result has no sampled wavefunctions, or a band has no well.
 */
export function stateRegions(r: RegionSource): Readonly<Record<BandName, readonly StateRegionOf[]>> | null {
  const waves = r.wavefunctions;
  const layers = r.structure.layers;
  if (!waves || waves.z_nm.length < 2 || layers.length === 0) return null;
  const starts: number[] = [];
  let total = 0;
  for (const l of layers) { starts.push(total); total += l.thickness_nm; }
  const out = {} as Record<BandName, StateRegionOf[]>;
  for (const band of BANDS) {
    const key = EDGE_KEY[band];
    const sign = band === 'electron' ? 1 : -1;
    // Particle-sense edges: deeper is lower for every band.
    const centre = layers.map((l) => sign * l.bands[Math.floor(l.bands.length / 2)]![key]);
    const lowest = layers.map((l) => Math.min(...l.bands.map((b) => sign * b[key])));
    const wells = new Set(centre.flatMap((e, i) => {
      const nb = [centre[i - 1], centre[i + 1]].filter((x): x is number => x !== undefined);
      return nb.length > 0 && nb.every((x) => e < x) ? [i] : [];
    }));
    if (wells.size === 0) return null;
    out[band] = r.bands[band].states.map((s, k) => {
      const psi = waves.psi[band][k];
      if (!psi) return { state: s.label, region: 'well', wellShare: NaN };
      const weight = layers.map(() => 0);
      let j = 0;
      for (let i = 0; i + 1 < waves.z_nm.length; i++) {
        const mid = (waves.z_nm[i]! + waves.z_nm[i + 1]!) / 2;
        while (j + 1 < layers.length && mid >= starts[j + 1]!) j++;
        weight[j]! += ((psi[i]! ** 2 + psi[i + 1]! ** 2) / 2) * (waves.z_nm[i + 1]! - waves.z_nm[i]!);
      }
      const E = sign * s.energy_eV;
      let free = 0;
      let inWells = 0;
      weight.forEach((w, i) => {
        if (lowest[i]! >= E) return;
        free += w;
        if (wells.has(i)) inWells += w;
      });
      const share = free > 0 ? inWells / free : 1;
      return { state: s.label, region: share >= 0.5 ? 'well' : 'guide', wellShare: share };
    });
  }
  return out;
}
