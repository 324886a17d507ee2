/**
 * Valence subbands of a layered (001) structure in the multiband k·p model: dispersions E(k∥)
 * along in-plane directions, the hh/lh/so character of every state, labels from the k∥ = 0
 * character, and the bulk valence edge of the outer layers (the continuum) at each k∥.
 *
 * Method: Luttinger–Kohn 4×4 or 6×6 Hamiltonian with Bir–Pikus strain and Burt–Foreman ordering
 * (hamiltonian.ts), box-integration discretisation (discretise.ts), highest eigenpairs of the real
 * symmetric banded matrices by inertia counts and Rayleigh-quotient iteration warm-started from the
 * previous k (banded.ts). Where the mirror through k∥ and [001] is a symmetry (axial approximation,
 * or [100]/[110]) the problem splits into two blocks, each holding one state of every Kramers pair
 * at k∥ = 0; elsewhere the full real matrix is solved.
 */
import { symmetricEigen } from '../solver2d/dense.js';
import { InputError } from '../errors.js';
import type { Structure } from '../structure.js';
import { bandAt, blockOperators, valenceGrid, type BlockOperator, type ValenceGrid } from './discretise.js';
import { bandWork, highestEigenpairs, type Band, type Eigenpairs } from './banded.js';
import { bandCount, blocksOf, COMPONENT_BAND, pointCoefficients, type BandKind, type PointCoefficients, type ValenceModel, type ValencePoint } from './hamiltonian.js';
import { valenceProfile, type ValenceProfile } from './profile.js';

/** An in-plane direction: '[100]', '[110]', or an angle from [100] in degrees. */
export type InPlaneDirection = '[100]' | '[110]' | number;

export interface ValenceOptions {
  /** 'kp4' (default) or 'kp6'. */
  readonly model?: ValenceModel;
  /** Axial approximation (in-plane isotropic); default false: full [100]/[110] anisotropy. */
  readonly axial?: boolean;
  /** Directions of k∥; default ['[100]', '[110]']. */
  readonly directions?: readonly InPlaneDirection[];
  /** Largest k∥ (1/nm) and the number of points of the uniform grid from 0; default 1 1/nm, 41. */
  readonly kMax_per_nm?: number;
  readonly kPoints?: number;
  /** Subbands (Kramers pairs) to follow from the top; default 4. */
  readonly subbands?: number;
  /** Grid spacing inside the structure (nm); default 0.2 (with extrapolation from 0.4). */
  readonly grid_nm?: number;
  /** Each outer layer is padded to at least this thickness (nm); default 30. */
  readonly outer_nm?: number;
  /** Cut each cell into this many (grid refinement for extrapolation); default 1. */
  readonly refine?: number;
  /** Solve both blocks even when the structure is mirror-symmetric (for checks); default false. */
  readonly bothBlocks?: boolean;
  /**
   * Richardson extrapolation (default true): energies from the grid of spacing grid_nm and the
   * nested grid twice as coarse, E = (4 E_h − E_2h)/3, removing the h² error of the box scheme;
   * characters from the finer grid.
   */
  readonly extrapolate?: boolean;
  /**
   * Functions to project every state on, e.g. the electron envelopes for optical matrix elements:
   * samples f(z) on an ascending grid z_nm measured from the first layer's start (as a solve's
   * wavefunctions), taken as 0 outside it. Each subband then carries, per branch, function and
   * T(φ)-basis component c, ∫ f(z) ψ_c(z) dz at every k (on the finer grid when extrapolating).
   */
  readonly project?: { readonly z_nm: ArrayLike<number>; readonly functions: readonly ArrayLike<number>[] };
}

/** The options with their defaults filled in (projection aside). */
type Settings = Required<Omit<ValenceOptions, 'project'>>;

export const DEFAULT_VALENCE_OPTIONS = {
  model: 'kp4' as ValenceModel,
  axial: false,
  directions: ['[100]', '[110]'] as readonly InPlaneDirection[],
  kMax_per_nm: 1,
  kPoints: 41,
  subbands: 4,
  grid_nm: 0.2,
  outer_nm: 30,
  refine: 1,
  bothBlocks: false,
  extrapolate: true,
};

/** One valence subband along one direction: two branches (the two states of each Kramers pair at k∥ = 0). */
export interface ValenceSubband {
  /** "hh1", "lh1", "so1": band of the largest k∥ = 0 weight, numbered within that band from the top. */
  readonly label: string;
  readonly kind: BandKind;
  /** Energies (eV, absolute scale, electron energies: holes lie lower) of the branches at each k. */
  readonly energy_eV: readonly [Float64Array, Float64Array];
  /** Squared projections on the hh, lh, so components of each branch at each k (they sum to 1). */
  readonly hh: readonly [Float64Array, Float64Array];
  readonly lh: readonly [Float64Array, Float64Array];
  readonly so: readonly [Float64Array, Float64Array];
  /**
   * With `project`: projections[branch][function][component] at each k, ∫ f ψ_c dz (nm^(1/2) times
   * the unit of f) on the components of the T(φ) basis (hamiltonian.ts blochBasis; 0 outside the
   * branch's block).
   */
  readonly projections?: readonly [readonly (readonly Float64Array[])[], readonly (readonly Float64Array[])[]];
}

export interface ValenceDirection {
  /** '[100]', '[110]' or the angle, e.g. '22.5°'. */
  readonly name: string;
  /** Angle from [100] (rad). */
  readonly angle_rad: number;
  readonly subbands: readonly ValenceSubband[];
  /** Top bulk valence energy of the outer layers at (k∥, k_z = 0) (eV): states below are not confined. */
  readonly continuum_eV: Float64Array;
}

export interface ValenceResult {
  readonly model: ValenceModel;
  readonly axial: boolean;
  readonly k_per_nm: Float64Array;
  readonly directions: readonly ValenceDirection[];
  /** Subbands lying above the continuum at k∥ = 0 (confined), of those computed. */
  readonly confined: number;
  readonly grid: { readonly nodes: number; readonly spacing_nm: number; readonly length_nm: number };
  /** Banded factorisations spent (the work done). */
  readonly factorisations: number;
}

const DEG = Math.PI / 180;

function directionAngle(d: InPlaneDirection, i: number): { name: string; angle: number } {
  if (d === '[100]') return { name: d, angle: 0 };
  if (d === '[110]') return { name: d, angle: Math.PI / 4 };
  if (typeof d !== 'number' || !Number.isFinite(d)) throw new InputError('bad-value', `valence.directions[${i}]: expected "[100]", "[110]" or an angle in degrees, got ${JSON.stringify(d)}`, 'solver.valence');
  return { name: `${d}°`, angle: d * DEG };
}

/** The mirror through k∥ and [001] is a symmetry: axial approximation, or φ a multiple of 45°. */
function hasMirror(angle: number, axial: boolean): boolean {
  if (axial) return true;
  const q = angle / (Math.PI / 4);
  return Math.abs(q - Math.round(q)) < 1e-12;
}

function positive(name: string, v: number, integer: boolean): number {
  if (!(v > 0) || !Number.isFinite(v) || (integer && !Number.isInteger(v))) {
    throw new InputError('bad-value', `valence.${name}: must be a positive ${integer ? 'integer' : 'number'}, got ${v}`, 'solver.valence');
  }
  return v;
}

/** Residual bound of the eigenpairs (eV): eigenvalue errors are about its square over the gap. */
const RESIDUAL_EV = 1e-5;

/** The 2 × `count` highest eigenpairs of one direction's blocks at every k, as branches. */
interface Solved {
  /** values[k][state] highest first and vectors, per block. */
  readonly perBlock: { values: Float64Array[]; vectors: Float64Array[][] }[];
}

/** Values at point i extrapolated from points i−1, i−2, i−3 of a uniform grid (as many as exist). */
function extrapolate(values: readonly Float64Array[], i: number): Float64Array {
  const a = values[i - 1]!;
  if (i === 1) return a;
  const b = values[i - 2]!;
  if (i === 2) return a.map((v, j) => 2 * v - b[j]!);
  const c = values[i - 3]!;
  return a.map((v, j) => 3 * v - 3 * b[j]! + c[j]!);
}

function solveDirection(ops: readonly BlockOperator[], ks: Float64Array, want: number, counter: { n: number }, zero: readonly Eigenpairs[] | undefined, mirrorImage: boolean): Solved {
  const solved = (mirrorImage ? ops.slice(0, 1) : ops).map((op, b) => {
      const data = new Float64Array(op.base.length);
      const band: Band = { n: op.n, bw: op.bw, data };
      const work = bandWork(op.n, op.bw);
      const values: Float64Array[] = [];
      const vectors: Float64Array[][] = [];
      for (let i = 0; i < ks.length; i++) {
        bandAt(op, ks[i]!, data);
        let r: Eigenpairs;
        if (i === 0 && zero) r = zero[b]!;
        else {
          // The first shift of each value: polynomial extrapolation through the last three (or
          // fewer) k points, exact to O(Δk³) on the uniform grid; the start vector is the last one.
          const guess = i === 0 ? undefined : { values: extrapolate(values, i), vectors: vectors[i - 1]! };
          r = highestEigenpairs(band, want, work, RESIDUAL_EV, guess);
          counter.n += r.factorisations;
        }
        values.push(r.values);
        vectors.push([...r.vectors]);
      }
      return { values, vectors };
    });
  // z → −z maps one block onto the other in a structure symmetric about its centre (the two states
  // of each Kramers pair stay degenerate at every k∥): the second block's eigenvalues are the first's,
  // and its vectors the mirror images, with the same band character.
  return { perBlock: mirrorImage ? [solved[0]!, solved[0]!] : solved };
}

/** The profile is symmetric about its centre (widths and parameters mirror), so is its grid. */
function isMirrorSymmetric(p: ValenceProfile): boolean {
  const n = p.slices.length;
  const same = (a: number, b: number): boolean => a === b || Math.abs(a - b) <= 1e-12 * (Math.abs(a) + Math.abs(b));
  for (let i = 0; i < n - 1 - i; i++) {
    const a = p.slices[i]!;
    const b = p.slices[n - 1 - i]!;
    if (!same(a.width_nm, b.width_nm)) return false;
    for (const key of Object.keys(a.point) as (keyof ValencePoint)[]) if (!same(a.point[key], b.point[key])) return false;
  }
  return p.outerSlicesLeft === p.outerSlicesRight;
}

/** Squared projections of a block eigenvector on the hh, lh and so components. */
function characterOf(x: Float64Array, components: readonly number[]): Record<BandKind, number> {
  const m = components.length;
  const perComponent = new Float64Array(m);
  for (let i = 0; i < x.length; i += m) for (let a = 0; a < m; a++) perComponent[a] = perComponent[a]! + x[i + a]! * x[i + a]!;
  const out: Record<BandKind, number> = { hh: 0, lh: 0, so: 0 };
  for (let a = 0; a < m; a++) out[COMPONENT_BAND[components[a]!]!] += perComponent[a]!;
  return out;
}

/** Top eigenvalue of the bulk matrix of a point at (k along φ, k_z = 0), where it is real. */
function bulkTop(c: PointCoefficients, k: number): number {
  const d = c.d;
  const m = new Float64Array(d * d);
  for (let i = 0; i < d * d; i++) m[i] = c.A0[i]! + k * k * c.A2[i]!;
  const e = symmetricEigen(m, d).values;
  return e[d - 1]!;
}

/**
 * The functions to project on, sampled at the grid's unknown nodes and multiplied by √w_i: an
 * eigenvector x = w^{1/2} ψ then gives ∫ f ψ_c dz = Σ_i w_i f(z_i) ψ_c(z_i) = Σ_i x_{i,c} f̃_i (the
 * box rule of the discretisation). Linear interpolation between samples; 0 outside them.
 */
function projector(profile: ValenceProfile, grid: ValenceGrid, project: NonNullable<ValenceOptions['project']>): Float64Array[] {
  const z = project.z_nm;
  const nodes = grid.widths.length - 1;
  return project.functions.map((f, fi) => {
    if (f.length !== z.length) throw new InputError('bad-value', `valence.project.functions[${fi}]: needs one sample per z (${z.length}), got ${f.length}`);
    const out = new Float64Array(nodes);
    let j = 0;
    for (let i = 0; i < nodes; i++) {
      const at = grid.z_nm[i + 1]! - profile.origin_nm;
      if (at < z[0]! || at > z[z.length - 1]!) continue;
      while (j + 2 < z.length && z[j + 1]! < at) j++;
      const t = (at - z[j]!) / (z[j + 1]! - z[j]!);
      const w = 0.5 * (grid.widths[i]! + grid.widths[i + 1]!);
      out[i] = Math.sqrt(w) * (f[j]! + t * (f[j + 1]! - f[j]!));
    }
    return out;
  });
}

/** Projections of one eigenvector (components `components` of d, interleaved per node) on the sampled functions. */
function projectionsOf(x: Float64Array, components: readonly number[], d: number, sampled: readonly Float64Array[]): Float64Array[] {
  const m = components.length;
  return sampled.map((f) => {
    const out = new Float64Array(d);
    for (let i = 0; i < f.length; i++) {
      const fi = f[i]!;
      if (fi === 0) continue;
      for (let a = 0; a < m; a++) out[components[a]!] = out[components[a]!]! + x[i * m + a]! * fi;
    }
    return out;
  });
}

/** Subbands (energies and characters, labelled) along every direction on one grid; projections when `project` is given. */
function directionsOn(profile: ValenceProfile, grid: ValenceGrid, ks: Float64Array, o: Settings, want: number, counter: { n: number }, project?: ValenceOptions['project']): { name: string; angle_rad: number; subbands: ValenceSubband[] }[] {
  const nk = ks.length;
  const d = bandCount(o.model);
  const split = blocksOf(o.model);
  const all = [Array.from({ length: d }, (_, i) => i)];
  // The k∥ = 0 matrices do not depend on φ: solve them once per block layout.
  const zeroOf = new Map<string, readonly Eigenpairs[]>();
  const symmetric = isMirrorSymmetric(profile);

  return o.directions.map((dir, di) => {
    const { name, angle } = directionAngle(dir, di);
    const mirror = hasMirror(angle, o.axial);
    const blocks = mirror ? split : all;
    const perBlockWant = mirror ? want : 2 * want;
    const ops = blockOperators(profile, grid, o.model, angle, o.axial, blocks);
    const key = mirror ? 'split' : 'full';
    let zero = zeroOf.get(key);
    // A structure symmetric about its centre solves the first block only (see solveDirection).
    const mirrorImage = mirror && symmetric && !o.bothBlocks;
    if (!zero) {
      zero = (mirrorImage ? ops.slice(0, 1) : ops).map((op) => {
        const data = bandAt(op, 0, new Float64Array(op.base.length));
        const r = highestEigenpairs({ n: op.n, bw: op.bw, data }, perBlockWant, bandWork(op.n, op.bw), RESIDUAL_EV);
        counter.n += r.factorisations;
        return r;
      });
      zeroOf.set(key, zero);
    }
    const solved = solveDirection(ops, ks, perBlockWant, counter, zero, mirrorImage);
    // Branches: split → (upper block j, lower block j); full → sorted pairs (2j, 2j + 1).
    const branchOf = (j: number, branch: 0 | 1, i: number): { value: number; x: Float64Array; components: readonly number[] } => {
      if (mirror) {
        const b = solved.perBlock[branch]!;
        // A mirror image is read as the first block's state it images: the band character, and the
        // conduction-spin sums of |ê·p|² for in-plane or [001] ê, are invariant under z → −z.
        return { value: b.values[i]![j]!, x: b.vectors[i]![j]!, components: ops[mirrorImage ? 0 : branch]!.components };
      }
      const b = solved.perBlock[0]!;
      return { value: b.values[i]![2 * j + branch]!, x: b.vectors[i]![2 * j + branch]!, components: ops[0]!.components };
    };
    const sampled = project ? projector(profile, grid, project) : null;
    const subbands: ValenceSubband[] = [];
    for (let j = 0; j < want; j++) {
      const energy: [Float64Array, Float64Array] = [new Float64Array(nk), new Float64Array(nk)];
      const ch = { hh: [new Float64Array(nk), new Float64Array(nk)], lh: [new Float64Array(nk), new Float64Array(nk)], so: [new Float64Array(nk), new Float64Array(nk)] };
      // projections[branch][function][component][k]
      const proj = sampled ? ([0, 1] as const).map(() => sampled.map(() => Array.from({ length: d }, () => new Float64Array(nk)))) : null;
      for (const branch of [0, 1] as const) {
        for (let i = 0; i < nk; i++) {
          const s = branchOf(j, branch, i);
          energy[branch][i] = s.value;
          const c = characterOf(s.x, s.components);
          ch.hh[branch]![i] = c.hh;
          ch.lh[branch]![i] = c.lh;
          ch.so[branch]![i] = c.so;
          if (proj) projectionsOf(s.x, s.components, d, sampled!).forEach((p, f) => p.forEach((v, c2) => { proj[branch]![f]![c2]![i] = v; }));
        }
      }
      const w = { hh: ch.hh[0]![0]!, lh: ch.lh[0]![0]!, so: ch.so[0]![0]! };
      const kind: BandKind = w.hh >= w.lh && w.hh >= w.so ? 'hh' : w.lh >= w.so ? 'lh' : 'so';
      subbands.push({ label: kind, kind, energy_eV: energy, hh: [ch.hh[0]!, ch.hh[1]!], lh: [ch.lh[0]!, ch.lh[1]!], so: [ch.so[0]!, ch.so[1]!], ...(proj ? { projections: [proj[0]!, proj[1]!] as const } : {}) });
    }
    const numbered = new Map<BandKind, number>();
    const labelled = subbands.map((s) => {
      const n = (numbered.get(s.kind) ?? 0) + 1;
      numbered.set(s.kind, n);
      return { ...s, label: `${s.kind}${n}` };
    });
    return { name, angle_rad: angle, subbands: labelled };
  });
}

/**
 * Valence subbands of a structure along the requested in-plane directions.
 * Energies on the structure's absolute scale (eV), k in 1/nm; see the module comment for the
 * method and ValenceOptions for the settings. Throws InputError for invalid options.
 * Example: an 8 nm GaAs well between 40 nm Al0.3Ga0.7As barriers at 300 K, kp4 → at k∥ = 0 hh1 at
 * −0.8113 eV (11.3 meV below the GaAs edge), lh1 −0.8310, hh2 −0.8447, hh3 −0.8977 eV.
 */
export function valenceSubbands(structure: Structure, options: ValenceOptions = {}): ValenceResult {
  const { project, ...rest } = options;
  const o: Settings = { ...DEFAULT_VALENCE_OPTIONS, ...rest };
  if (o.model !== 'kp4' && o.model !== 'kp6') throw new InputError('bad-value', `valence.model: must be "kp4" or "kp6", got ${JSON.stringify(o.model)}`, 'solver.valence');
  const h = positive('grid_nm', o.grid_nm, false);
  positive('kMax_per_nm', o.kMax_per_nm, false);
  const nk = positive('kPoints', o.kPoints, true);
  const want = positive('subbands', o.subbands, true);
  const refine = positive('refine', o.refine, true);
  if (!(o.outer_nm >= 0)) throw new InputError('bad-value', `valence.outer_nm: must be 0 or more, got ${o.outer_nm}`, 'solver.valence');
  if (o.directions.length === 0) throw new InputError('bad-value', 'valence.directions: needs at least one direction; give "[100]" and/or "[110]"', 'solver.valence');

  const profile = valenceProfile(structure, { model: o.model, maxSlice_nm: h, outer_nm: o.outer_nm });
  const ks = new Float64Array(nk);
  for (let i = 0; i < nk; i++) ks[i] = nk === 1 ? 0 : (o.kMax_per_nm * i) / (nk - 1);
  const counter = { n: 0 };
  // Nested grids: the fine one cuts every cell of the coarse one in two.
  const fineGrid = o.extrapolate ? valenceGrid(profile, 2 * h, 2 * refine) : valenceGrid(profile, h, refine);
  if (project && !(project.z_nm.length >= 2 && Array.from(project.z_nm).every((v, i, a) => Number.isFinite(v) && (i === 0 || v > a[i - 1]!)))) {
    throw new InputError('bad-value', 'valence.project.z_nm: needs at least two finite, ascending positions (nm)');
  }
  const fine = directionsOn(profile, fineGrid, ks, o, want, counter, project);
  const coarse = o.extrapolate ? directionsOn(profile, valenceGrid(profile, 2 * h, refine), ks, o, want, counter) : null;
  const outerPoints = [profile.slices[0]!.point, profile.slices[profile.slices.length - 1]!.point];
  const directions = fine.map((dir, di): ValenceDirection => {
    const subbands = coarse === null ? dir.subbands : dir.subbands.map((sb, j) => {
      const c = coarse[di]!.subbands[j]!.energy_eV;
      const energy = sb.energy_eV.map((e, b) => e.map((v, i) => (4 * v - c[b]![i]!) / 3)) as [Float64Array, Float64Array];
      return { ...sb, energy_eV: energy };
    });
    const continuum = new Float64Array(nk);
    const outer = outerPoints.map((p) => pointCoefficients(p, o.model, dir.angle_rad, o.axial));
    for (let i = 0; i < nk; i++) continuum[i] = Math.max(...outer.map((c) => bulkTop(c, ks[i]!)));
    return { name: dir.name, angle_rad: dir.angle_rad, subbands, continuum_eV: continuum };
  });
  const first = directions[0]!;
  const confined = first.subbands.filter((s) => s.energy_eV[0][0]! > first.continuum_eV[0]!).length;
  return {
    model: o.model,
    axial: o.axial,
    k_per_nm: ks,
    directions,
    confined,
    grid: { nodes: fineGrid.widths.length - 1, spacing_nm: h / refine, length_nm: fineGrid.z_nm[fineGrid.z_nm.length - 1]! },
    factorisations: counter.n,
  };
}
