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

export interface Objective<T> {
  /** Name used in --help, errors and reports. */
  readonly kind: string;
  readonly description: string;
  readonly schema: z.ZodType<T>;
  /** True when evaluate reads overlaps, dipoles or oscillator strengths (wavefunctions needed). */
  readonly needsWavefunctions: (target: T) => boolean;
  /** State labels evaluate reads ("e1", "hh2"), or a band name ("electron") for all its states; a search solves only those. */
  readonly statesNeeded: (target: T) => readonly string[];
  /** Throws InputError (naming `field`) for a target that can never be evaluated, e.g. a malformed state label or a layer constraint on a wire. */
  readonly check: (target: T, field: string, geometry: Geometry) => void;
  readonly evaluate: (target: T, result: TargetSource) => Evaluation;
}

/** Missing states are scored as if they sat at their band's continuum edge, plus this much, so the loss stays continuous enough for the simplex and still prefers designs where the state exists. */
export const MISSING_STATE_PENALTY = 1;
