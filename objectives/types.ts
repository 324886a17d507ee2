/**
 * One interface for every design target. Each objective module exports its zod schema (the
 * target as written in a spec), a one-line description for --help and reports, and `evaluate`,
 * which turns a solved structure into an achieved value and a normalised residual.
 */
import type { z } from 'zod';
import type { BandName } from '../engine/profile.js';

/** A subband as targets read it (energies eV on the absolute scale, confinement meV). */
export interface TargetState {
  readonly label: string;
  readonly energy_eV: number;
  readonly confinement_meV: number;
  readonly bound: boolean;
  /** Probability-weighted in-plane mass (m0) of a stack's state; NaN when wavefunctions were not sampled. */
  readonly mass_inplane?: number;
}

export interface TargetBand {
  readonly states: readonly TargetState[];
  /** Band extremum of the structure (eV). */
  readonly edge_eV: number;
  /** Continuum edge (eV). */
  readonly barrier_eV: number;
}

export interface TargetTransition {
  readonly label: string;
  readonly energy_eV: number;
  readonly overlap2: number;
  /** Intersubband lines of a layer stack only. */
  readonly oscillator_strength?: number;
  /** Interband lines of a layer stack: exciton binding estimate (eV), NaN when not estimated. */
  readonly exciton_binding_eV?: number;
}

/** Layer data the grower's constraints read; a wire has none (constraints are refused for it at compile time). */
export interface TargetLayer {
  readonly index: number;
  /** Label as resolved ("well[3]" inside a repeat). */
  readonly label: string;
  readonly thickness_nm: number;
  readonly formula: string;
  /** Conduction edge at the layer's samples (the first is enough to find wells). */
  readonly bands: readonly { readonly Ec: number }[];
  readonly material: {
    readonly criticalThickness_nm: number; readonly EgG: number; readonly EgX: number; readonly EgL: number;
    /** Relaxed lattice (nm), in-plane strain and elastic constants (GPa), for the stack's strain checks. */
    readonly a_nm: number; readonly strain_par: number; readonly C11: number; readonly C12: number;
  };
}

/**
 * What objectives read from a solve: the part a well's SolveResult and a wire's WireSolveResult
 * share, plus the stack's layers when there are any. Both results satisfy it structurally.
 */
export interface TargetSource {
  readonly bands: Readonly<Record<BandName, TargetBand>>;
  readonly transitions: readonly TargetTransition[];
  readonly structure: { readonly temperature_K: number; readonly layers?: readonly TargetLayer[]; readonly total_nm?: number; readonly substrate?: string | null };
  /** Sampled wavefunctions of a layer stack (z = 0 at the first layer's start), when the solve sampled them. */
  readonly wavefunctions?: { readonly z_nm: Float64Array; readonly psi: Readonly<Record<BandName, readonly Float64Array[]>> };
}

/** What a spec solves: a layer stack or a wire cross-section (some targets apply to one only). */
export type Geometry = 'stack' | 'wire';

export type ObjectiveRole = 'target' | 'figure' | 'constraint';

export interface Evaluation {
  /** Target label as printed, e.g. "e1-hh1 wavelength". */
  readonly label: string;
  readonly role: ObjectiveRole;
  /** The value reached, in `unit`; null when it does not exist (a state that is not bound). */
  readonly achieved: number | null;
  /** The goal in `unit` (null for figures to maximise). */
  readonly goal: number | null;
  readonly unit: string;
  /**
   * Normalised residual: |residual| ≤ 1 inside the window for targets, 0 when a constraint holds;
   * for figures, 1 − value (their weight is small by default). Finite for every candidate.
   */
  readonly residual: number;
  readonly weight: number;
  readonly satisfied: boolean;
}

/**
 * What a spec tells its targets before any solve: the geometry, the stack's layer labels and the
 * solver's state limit (for checks), and the band extrema at the nominal point (for warnings).
 */
export interface TargetContext {
  readonly geometry: Geometry;
  /** Layer labels as resolved ("well[3]" inside a repeat, "layer 2" when unlabelled); undefined for a wire. */
  readonly labels?: readonly string[];
  /** Most states solved per band (solver.max_states, or wire.states); Infinity when every bound state is. */
  readonly maxStates?: number;
  /** Per band, its extremum and continuum edge (eV, absolute) at the nominal values, when the structure could be built. */
  readonly bands?: Readonly<Record<BandName, { readonly edge_eV: number; readonly barrier_eV: number }>>;
}

export interface Objective<T> {
  /** Name used in --help, errors and reports. */
  readonly kind: string;
  readonly description: string;
  /** The target as written in a spec; its key descriptions and examples go into the JSON Schema and `wellsmith targets`. */
  readonly schema: z.ZodType<T>;
  /** Targets as a spec writes them (YAML flow maps in `wellsmith targets` and the JSON Schema); every registered kind has at least one. */
  readonly examples?: readonly Readonly<Record<string, unknown>>[];
  /** True when evaluate reads overlaps, dipoles or oscillator strengths (wavefunctions needed). */
  readonly needsWavefunctions: (target: T) => boolean;
  /** State labels evaluate reads ("e1", "hh2"), or a band name ("electron") for all its states; a search solves only those. */
  readonly statesNeeded: (target: T) => readonly string[];
  /**
   * Throws InputError (naming `field`) for a target that can never be evaluated, e.g. a malformed
   * state label, a layer constraint on a wire, or (given the context) a label no layer has.
   */
  readonly check: (target: T, field: string, geometry: Geometry, context?: TargetContext) => void;
  /**
   * Notes on a valid target that may not mean what its writer meant: a number without a unit read
   * in the key's default unit, an absolute energy no state of its band can reach. Each note starts
   * with the field it is about.
   */
  readonly warnings?: (target: T, field: string, context: TargetContext) => readonly string[];
  readonly evaluate: (target: T, result: TargetSource) => Evaluation;
}

/** Missing states are scored as if they sat at their band's continuum edge, plus this much, so the loss stays continuous enough for the simplex and still prefers designs where the state exists. */
export const MISSING_STATE_PENALTY = 1;
