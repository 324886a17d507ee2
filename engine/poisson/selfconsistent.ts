/**
 * The self-consistent Schrödinger–Poisson loop of a doped stack (Hartree approximation): with the
 * potential U, the carriers' bound subbands (subbands.ts), the Fermi level that makes the stack
 * neutral (occupation.ts), and the predictor step (predictor.ts: Poisson with the carriers' charge
 * answering a change of U where it happens, A. Trellakis et al., J. Appl. Phys. 81, 7880 (1997))
 * give the next U; Anderson mixing (mixing.ts, parameter β, six steps kept) accelerates this map
 * until the largest change of U between an iteration's input and output is below the tolerance
 * (default 1e-6 eV). Near the fixed point (residual under 100 tolerances) the subband energies are
 * Richardson-extrapolated from two slicings (subbands.ts meshStates), so the converged levels are
 * those the final solve of the folded structure reports. Levels of uncoupled identical wells that
 * the solver cannot tell apart are solved well by well (subbands.ts, CLUSTER_EV).
 * Status 'converged', or 'not-converged' after maxIterations with the last residual (exit 1), or
 * 'no-carriers' when nothing can hold the carriers.
 *
 * Carriers: the majority type of the net doping, electrons (donors − acceptors > 0) in the
 * conduction band or holes in the heavy- and light-hole bands (compensated layers are fine; a stack
 * with separate n and p regions, a junction, is outside this model: its minority carriers are not
 * counted). Exchange and correlation are left out.
 * Equilibrium (no field): one Fermi level for the whole stack. Under a bias field a stack of two or
 * more wells is split into cells, one per well (the regions of objectives/wells.ts), each neutral
 * with its own quasi-Fermi level, as the wells of a biased detector keep their doping's electrons
 * (common practice); a state shared by cells takes from each the occupation of that cell's level
 * weighted by its share there. A single well, or cells without net majority doping, keep one level.
 * Units: eV, nm, K; densities nm⁻² inside, cm⁻² in results.
 */
import { KB_EV_PER_K } from '../constants.js';
import { bandsAtFraction, KV_PER_CM_TO_EV_PER_NM, type BandName } from '../profile.js';
import type { LayerBands, Structure } from '../structure.js';
import { wellsOf } from '../../objectives/wells.js';
import type { DopingProfile } from './doping.js';
import { SHEET_CM2_TO_NM2 } from './doping.js';
import { andersonMixer } from './mixing.js';
import { EMPTY_KT, gasBound, gasDensity, gasSite, neutralLevel, subbandFilling } from './occupation.js';
import { predictPotential, type GasPoint } from './predictor.js';
import { dopingLoads, poissonMesh, solvePoisson, type PoissonMesh } from './poisson.js';
import { foldPotential, meshStates, potentialProfile, sampleGrid, type MeshState } from './subbands.js';


/** Gas sites that together hold less than this share of a cell's carriers are left out of its neutrality (and its charge). */
const NEGLIGIBLE = 1e-10;

/** The extrapolated subband energies are used from a residual this many tolerances down. */
const ACCURATE_FROM = 100;

/** Previous steps the Anderson mixer keeps. */
const ANDERSON_DEPTH = 6;

export interface SelfConsistentOptions {
  /** Largest Poisson element (nm). */
  readonly mesh_nm: number;
  /** Convergence: max |U_out − U_in| over the nodes (eV). */
  readonly tolerance_eV: number;
  readonly maxIterations: number;
  /** Anderson mixing parameter β. */
  readonly mixing: number;
  /** Carriers above the barrier edge as a semiclassical gas. */
  readonly continuum: boolean;
  /** Two-band electron mass. */
  readonly nonparabolic: boolean;
}

export const DEFAULT_SELF_CONSISTENT: SelfConsistentOptions = { mesh_nm: 0.5, tolerance_eV: 1e-6, maxIterations: 200, mixing: 1, continuum: true, nonparabolic: true };

/** The carriers a doped stack holds: those of its net doping's sign. */
export type CarrierKind = 'electrons' | 'holes' | 'none';

/** A subband as the loop left it: its energy (eV, absolute), in-plane mass, sheet density. */
export interface SubbandOccupation {
  readonly band: BandName;
  /** Energy on the absolute scale (eV). */
  readonly energy_eV: number;
  readonly mass_inplane: number;
  readonly density_cm2: number;
}

/** One neutral cell: the whole stack, or under bias one well's region. */
export interface Cell {
  readonly from_nm: number;
  readonly to_nm: number;
  /** Fermi (or quasi-Fermi) level, absolute energy scale (eV). */
  readonly fermi_eV: number;
  /** Net ionised dopants of the cell (cm⁻², majority sign positive). */
  readonly dopants_cm2: number;
  /** Carriers the cell holds at its level: subbands by their share in it plus its gas (cm⁻²). */
  readonly carriers_cm2: number;
}

export interface SelfConsistentState {
  readonly status: 'converged' | 'not-converged' | 'no-carriers';
  readonly iterations: number;
  /** max |U_out − U_in| (eV) of the last iteration. */
  readonly residual_eV: number;
  readonly options: SelfConsistentOptions;
  readonly carriers: CarrierKind;
  readonly mesh: PoissonMesh;
  /** Electron potential energy −eφ at the nodes (eV), the input of the last iteration (what the states were solved in). */
  readonly potential: Float64Array;
  /** The structure with U folded into its band edges (subbands.ts foldPotential). */
  readonly folded: Structure;
  readonly cells: readonly Cell[];
  /** Cell of each mesh node. */
  readonly cellOfNode: Int32Array;
  readonly subbands: readonly SubbandOccupation[];
  /** Carriers of the semiclassical gas (cm⁻²). */
  readonly gas_cm2: number;
  /** Net charge left in the stack relative to the ionised majority dopants: |Σ charge| / |net doping|. */
  readonly neutrality: number;
}

/** Bands of a carrier kind. */
const bandsOf = (kind: CarrierKind): readonly BandName[] => (kind === 'electrons' ? ['electron'] : kind === 'holes' ? ['heavy_hole', 'light_hole'] : []);

/** Particle-sense band edge (absolute edge shifted by the field tilt) and density-of-states mass of a band at one sample. */
const edgeOf = (band: BandName, b: LayerBands, tilt: number): number => (band === 'electron' ? b.Ec + tilt : band === 'heavy_hole' ? -(b.Ehh + tilt) : -(b.Elh + tilt));
const dosMassOf = (band: BandName, b: LayerBands): number => (band === 'electron' ? b.me : band === 'heavy_hole' ? Math.cbrt(b.mhh_z * b.mhh_par * b.mhh_par) : Math.cbrt(b.mlh_z * b.mlh_par * b.mlh_par));


/**
 * The cells of a stack: one unless the structure is under a field with two or more wells whose
 * regions each hold net majority doping (see the module comment). Returns node → cell and the cell bounds.
 */
function cellsOf(structure: Structure, mesh: PoissonMesh, majorityLoads: Float64Array): { of: Int32Array; bounds: { from: number; to: number }[] } {
  const one = { of: new Int32Array(mesh.z.length), bounds: [{ from: 0, to: structure.total_nm }] };
  if (structure.field_kV_per_cm === 0) return one;
  const wells = wellsOf(structure.layers);
  if (wells.length < 2) return one;
  const of = new Int32Array(mesh.z.length);
  const net = new Array<number>(wells.length).fill(0);
  for (let k = 0; k < mesh.z.length; k++) {
    let c = 0;
    while (c < wells.length - 1 && mesh.z[k]! >= wells[c]!.to_nm) c++;
    of[k] = c;
    net[c] += majorityLoads[k]!;
  }
  return net.every((x) => x > 0) ? { of, bounds: wells.map((w) => ({ from: w.from_nm, to: w.to_nm })) } : one;
}

/**
 * Solves a doped structure self-consistently (see the module comment). The structure's field is the
 * applied bias (its linear potential is added by the profile builder); the doping is neutralised
 * by carriers of its net sign. Returns the converged state, or the last one with status
 * 'not-converged' and its residual, or 'no-carriers' when the carriers have nowhere to go (no bound
 * state and the continuum turned off).
 */
export function selfConsistent(structure: Structure, doping: DopingProfile, options: SelfConsistentOptions = DEFAULT_SELF_CONSISTENT): SelfConsistentState {
  const mesh = poissonMesh(structure.layers, options.mesh_nm);
  const dopants = dopingLoads(mesh, doping);
  const N = mesh.z.length;
  const kind: CarrierKind = doping.net_cm2 > 0 ? 'electrons' : doping.net_cm2 < 0 ? 'holes' : 'none';
  const sign = kind === 'holes' ? -1 : 1;
  const majority = dopants.map((b) => sign * b);
  const { of: cellOf, bounds } = cellsOf(structure, mesh, majority);
  const cellCount = bounds.length;
  const wanted = new Array<number>(cellCount).fill(0);
  for (let k = 0; k < N; k++) wanted[cellOf[k]!] += majority[k]!;
  const kT = KB_EV_PER_K * structure.temperature_K;
  const bands = bandsOf(kind);
  const grid = sampleGrid(mesh);
  // Regions of the wells, where clusters of uncoupled wells' levels are solved well by well (meshStates).
  const wells = wellsOf(structure.layers);
  const slope = structure.field_kV_per_cm * KV_PER_CM_TO_EV_PER_NM;
  const zc = structure.total_nm / 2;

  let U: Float64Array = new Float64Array(N);
  const mixer = andersonMixer(options.mixing, ANDERSON_DEPTH);
  const fermi = new Array<number>(cellCount).fill(Number.NaN);
  let residual = Infinity;
  let iterations = 0;
  let states: MeshState[] = [];
  let populations: number[] = [];
  let gas = new Float64Array(N);
  // Subband energies Richardson-extrapolated from the mesh and half-mesh slicings (meshStates) once
  // the loop is near its fixed point on the mesh slices alone, which are cheaper and as good for the charge.
  let accurate = false;

  // One pass: states and carriers in U, the neutral levels, and the predicted potential.
  const pass = (): Float64Array | null => {
    const known = fermi.every(Number.isFinite);
    const upTo = known && kT > 0 ? Math.max(...fermi) + EMPTY_KT * kT : known ? Math.max(...fermi) : Infinity;
    const twoBand = (b: BandName): boolean => options.nonparabolic && b === 'electron';
    const profiles = bands.map((b) => potentialProfile(structure, mesh, U, b, 1, twoBand(b)));
    states = profiles.flatMap((p, i) => meshStates(p, mesh, grid, upTo, 1e-10, accurate ? potentialProfile(structure, mesh, U, bands[i]!, 2, twoBand(bands[i]!)) : undefined, wells));
    const share = states.map((s) => {
      const w = new Array<number>(cellCount).fill(0);
      for (let k = 0; k < N; k++) w[cellOf[k]!] += s.weights[k]!;
      return w;
    });
    const points: GasPoint[] = [];
    if (options.continuum) {
      profiles.forEach((p, bi) => {
        let e = 0;
        structure.layers.forEach((layer, l) => {
          const n = mesh.perLayer[l]!;
          for (let j = 0; j < n; j++, e++) {
            const h = mesh.z[e + 1]! - mesh.z[e]!;
            const cell = cellOf[e]!;
            for (let side = 0; side < 2; side++) {
              const sample = bandsAtFraction(layer, (j + side) / n);
              const node = e + side;
              points.push({ node, cell, weight: h / 2, site: gasSite(dosMassOf(bands[bi]!, sample), edgeOf(bands[bi]!, sample, U[node]! + slope * (mesh.z[node]! - zc)), p.openEdge, kT) });
            }
          }
        });
      });
    }
    if (states.length === 0 && points.length === 0) return null;
    for (let c = 0; c < cellCount; c++) {
      if (!(wanted[c]! > 0)) continue;
      const inCell = points.filter((g) => g.cell === c);
      const inShare = share.map((w) => w[c]!);
      const carriers = (F: number): number => {
        let n = 0;
        for (let i = 0; i < states.length; i++) if (inShare[i]! > 0) n += inShare[i]! * subbandFilling(states[i]!.mass, states[i]!.energy, F, kT);
        // A site holding below NEGLIGIBLE of the cell's carriers (per site, by its bound) is skipped.
        const floor = (NEGLIGIBLE * wanted[c]!) / Math.max(inCell.length, 1);
        for (let g = 0; g < inCell.length; g++) {
          const p = inCell[g]!;
          if (F < p.site.from && p.weight * gasBound(p.site, F, kT) < floor) continue;
          n += p.weight * gasDensity(p.site, F, kT);
        }
        return n;
      };
      let guess = fermi[c]!;
      if (!Number.isFinite(guess)) {
        guess = Infinity;
        for (const s of states) guess = Math.min(guess, s.energy);
        for (const g of inCell) guess = Math.min(guess, g.site.from);
      }
      fermi[c] = neutralLevel(carriers, wanted[c]!, guess, kT);
    }
    populations = states.map((s, i) => share[i]!.reduce((sum, w, c) => sum + (w > 0 && wanted[c]! > 0 ? w * subbandFilling(s.mass, s.energy, fermi[c]!, kT) : 0), 0));
    gas = new Float64Array(N);
    const perCell = new Array<number>(cellCount).fill(0);
    for (const g of points) perCell[g.cell]++;
    for (const g of points) {
      const c = g.cell;
      if (!(wanted[c]! > 0)) continue;
      const F = fermi[c]!;
      if (F < g.site.from && g.weight * gasBound(g.site, F, kT) < (NEGLIGIBLE * wanted[c]!) / perCell[c]!) continue;
      gas[g.node] += g.weight * gasDensity(g.site, F, kT);
    }
    const counted = points.filter((g) => wanted[g.cell]! > 0 && !(fermi[g.cell]! < g.site.from && g.weight * gasBound(g.site, fermi[g.cell]!, kT) < (NEGLIGIBLE * wanted[g.cell]!) / perCell[g.cell]!));
    return predictPotential({ mesh, potential: U, dopants, sign, states, share, gas: counted, wanted, kT, fermi }).potential;
  };

  const finish = (status: SelfConsistentState['status']): SelfConsistentState => {
    let charge = 0;
    for (let k = 0; k < N; k++) charge += majority[k]!;
    const carried = populations.reduce((a, b) => a + b, 0) + gas.reduce((a, b) => a + b, 0);
    const net = Math.abs(doping.net_cm2) * SHEET_CM2_TO_NM2;
    return {
      status, iterations, residual_eV: residual, options, carriers: kind, mesh, potential: U, folded: foldPotential(structure, mesh, U), cellOfNode: cellOf,
      cells: bounds.map((b, c) => {
        let inCell = 0;
        states.forEach((s) => { let w = 0; for (let k = 0; k < N; k++) if (cellOf[k] === c) w += s.weights[k]!; inCell += w * (wanted[c]! > 0 ? subbandFilling(s.mass, s.energy, fermi[c]!, kT) : 0); });
        for (let k = 0; k < N; k++) if (cellOf[k] === c) inCell += gas[k]!;
        return { from_nm: b.from, to_nm: b.to, fermi_eV: sign * fermi[c]!, dopants_cm2: wanted[c]! / SHEET_CM2_TO_NM2, carriers_cm2: inCell / SHEET_CM2_TO_NM2 };
      }),
      subbands: states.map((s, i) => ({ band: s.band, energy_eV: (s.band === 'electron' ? 1 : -1) * s.energy, mass_inplane: s.mass, density_cm2: populations[i]! / SHEET_CM2_TO_NM2 })),
      gas_cm2: gas.reduce((a, b) => a + b, 0) / SHEET_CM2_TO_NM2,
      neutrality: net > 0 ? Math.abs(charge - carried) / net : 0,
    };
  };

  if (kind === 'none') {
    U = solvePoisson(mesh, dopants);
    residual = 0;
    return finish('converged');
  }
  while (iterations < options.maxIterations) {
    iterations++;
    const out = pass();
    if (out === null) return finish('no-carriers');
    const f = new Float64Array(N);
    residual = 0;
    for (let k = 0; k < N; k++) { f[k] = out[k]! - U[k]!; residual = Math.max(residual, Math.abs(f[k]!)); }
    if (residual <= options.tolerance_eV && accurate) return finish('converged');
    // Near the fixed point the extrapolated energies take over (they move it by ~0.05 meV at most).
    if (residual <= ACCURATE_FROM * options.tolerance_eV) accurate = true;
    // The last state is reported with the input it was solved in, whose output missed the tolerance.
    if (iterations === options.maxIterations) break;
    U = mixer.next(U, f);
  }
  return finish('not-converged');
}
