/**
 * One interface for every design target. Each objective module exports its zod schema (the
 * target as written in a spec), a one-line description for --help and reports, and `evaluate`,
 * which turns a solved structure into an achieved value and a normalised residual.
 */
import type { z } from 'zod';
import type { SolveResult } from '../engine/solve.js';

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
  /** Throws InputError (naming `field`) for a target that can never be evaluated, e.g. a malformed state label. */
  readonly check: (target: T, field: string) => void;
  readonly evaluate: (target: T, result: SolveResult) => Evaluation;
}

/** Missing states are scored as if they sat at their band's continuum edge, plus this much, so the loss stays continuous enough for the simplex and still prefers designs where the state exists. */
export const MISSING_STATE_PENALTY = 1;
