/**
 * Growth tolerance of one design: one-at-a-time sensitivities, Monte Carlo yield with
 * distributions of every measured quantity and the worst sample, and the monolayer-island lines
 * of each well. A design whose nominal structure cannot be evaluated is a result with status
 * 'no-finite-value', not an exception.
 */
import { runTasks, type PoolOptions } from '../pool.js';
import type { Spec } from '../input/schema.js';
import { buildStructure, hasCompositionError, type Perturbation } from '../structure.js';
import { islandLines, type WellIslands } from './islands.js';
import { measure, prepareTolerance, type Measurement, type Quantity } from './measure.js';
import { batchTasks, distribution, drawKeys, samplePerturbation, DEFAULT_GROWTH, type BatchOutcome, type Distribution, type GrowthModel } from './montecarlo.js';
import { sensitivities, DEFAULT_SENSITIVITY, type Sensitivity, type SensitivityOptions } from './sensitivity.js';

export interface ToleranceOptions {
  readonly samples: number;
  readonly seed: number;
  readonly workers: number;
  readonly growth: GrowthModel;
  readonly sensitivity: SensitivityOptions;
  /** Samples per pool task. */
  readonly batch: number;
  /** Compute the island lines (skipped by robust ranking, which needs only yield and shifts). */
  readonly islands: boolean;
  readonly onProgress?: PoolOptions['onProgress'];
}

export const DEFAULT_TOLERANCE: Omit<ToleranceOptions, 'workers'> = {
  samples: 1000, seed: 1, growth: DEFAULT_GROWTH, sensitivity: DEFAULT_SENSITIVITY, batch: 125, islands: true,
};

/** Most Monte Carlo samples a command runs: at a few ms per sample on a 2-core machine, already hours of work. */
export const MAX_SAMPLES = 10_000_000;

export type ToleranceStatus = 'ok' | 'no-finite-value';

export const TOLERANCE_MESSAGES: Readonly<Record<ToleranceStatus, string>> = {
  ok: 'nominal design evaluated; sensitivities and yield computed',
  'no-finite-value': 'the nominal design cannot be evaluated (a state the targets read does not exist or the solve failed)',
};

export interface WorstSample {
  readonly index: number;
  readonly loss: number;
  readonly values: readonly number[];
  readonly perturbation: Perturbation;
  /** Its growth errors per layer as grown: label, whole-ML error, and the alloy-fraction error where the layer has a mixed fraction (else null). */
  readonly layers: readonly { readonly label: string; readonly ml: number; readonly dx: number | null }[];
}

export interface MonteCarlo {
  readonly samples: number;
  readonly seed: number;
  readonly model: GrowthModel;
  /**
   * Fraction of samples, in [0, 1], with every target inside its window (Evaluation.satisfied) and
   * every target, constraint and figure quantity present: a sample that loses a state a target reads
   * (e2 no longer bound) is a failure, never dropped.
   */
  readonly yield: number;
  /** Samples whose solve failed or whose loss was not finite (counted as failures). */
  readonly failures: number;
  /** Per quantity: samples that solved but where it does not exist (a state not bound); those of target quantities count as failures. */
  readonly missing: readonly number[];
  /** Per quantity, in problem order. */
  readonly distributions: readonly Distribution[];
  /** The sample with the largest loss (first such index on ties); failed samples count as infinite loss. */
  readonly worst: WorstSample | null;
  /** Per transition followed in every well of a multi-well stack: the spread of the wells' lines. */
  readonly ensembles: readonly EnsembleSpread[];
}

/**
 * The inhomogeneous spread of a multi-well stack's line: every well's own line in every sample
 * pooled (the wells a wafer's photoluminescence adds up, over the wafers the samples stand for),
 * and the spread across the wells of one sample, averaged over the samples.
 */
export interface EnsembleSpread {
  readonly transition: string;
  /** Lines pooled (finite ones) and their σ (meV, sample σ, n − 1); FWHM = 2√(2 ln 2) σ (Gaussian). */
  readonly lines: number;
  readonly sigma_meV: number;
  readonly fwhm_meV: number;
  /** σ across the wells within one sample (meV), averaged over the samples with ≥ 2 finite lines. */
  readonly withinSample_meV: number;
}

/** FWHM of a Gaussian per unit σ: 2√(2 ln 2). */
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** The ensemble spreads of the per-well quantities (measure.ts), by transition in quantity order. */
export function ensembleSpreads(samples: readonly Measurement[], quantities: readonly Quantity[]): EnsembleSpread[] {
  const lines = [...new Set(quantities.flatMap((q) => (q.well ? [q.well.transition] : [])))];
  return lines.map((transition) => {
    const idx = quantities.flatMap((q, k) => (q.well?.transition === transition ? [k] : []));
    const pooled = distribution(samples.flatMap((s) => idx.map((k) => s.values[k]!)));
    const within = samples.map((s) => distribution(idx.map((k) => s.values[k]!))).filter((d) => d.n > 1);
    return {
      transition,
      lines: pooled.n,
      sigma_meV: pooled.sigma,
      fwhm_meV: FWHM_PER_SIGMA * pooled.sigma,
      withinSample_meV: within.length ? within.reduce((a, d) => a + d.sigma, 0) / within.length : NaN,
    };
  });
}

export interface ToleranceResult {
  readonly status: ToleranceStatus;
  readonly message: string;
  readonly values: Readonly<Record<string, number>>;
  readonly quantities: readonly Quantity[];
  readonly nominal: Measurement;
  readonly sensitivities: readonly Sensitivity[];
  readonly montecarlo: MonteCarlo | null;
  readonly islands: readonly WellIslands[];
}

/** Whether a sample meets every target with every target quantity present (see MonteCarlo.yield). */
export const passes = (s: Measurement, quantities: readonly Quantity[]): boolean => s.satisfied && quantities.every((q, k) => !q.target || Number.isFinite(s.values[k]));

/** A sample's growth errors per layer as grown, with the layers' labels; a composition error only where the layer has a mixed fraction. */
function layerErrors(spec: Spec, values: Readonly<Record<string, number>>, p: Perturbation): WorstSample['layers'] {
  const layers = buildStructure(spec, values).layers;
  return layers.map((l, i) => ({ label: l.label, ml: p.thickness_ML?.[i] ?? 0, dx: hasCompositionError(l.composition) ? (p.composition?.[i] ?? 0) : null }));
}

/** Summarises sample measurements (ordered by sample index) of the spec's quantities at the design's values. */
export function summarise(samples: readonly Measurement[], quantities: readonly Quantity[], seed: number, spec: Spec, model: GrowthModel, values: Readonly<Record<string, number>>): MonteCarlo {
  const quantityCount = quantities.length;
  let worst = -1;
  samples.forEach((s, i) => { if (worst < 0 || s.loss > samples[worst]!.loss) worst = i; });
  const w = samples[worst];
  const perturbation = w ? samplePerturbation(seed, worst, drawKeys(spec, model), model) : undefined;
  return {
    samples: samples.length,
    seed,
    model,
    yield: samples.length ? samples.filter((s) => passes(s, quantities)).length / samples.length : 0,
    failures: samples.filter((s) => !s.ok).length,
    missing: quantities.map((_, q) => samples.filter((s) => s.ok && !Number.isFinite(s.values[q])).length),
    distributions: Array.from({ length: quantityCount }, (_, q) => distribution(samples.map((s) => s.values[q]!))),
    worst: w && perturbation ? { index: worst, loss: w.loss, values: w.values, perturbation, layers: layerErrors(spec, values, perturbation) } : null,
    ensembles: ensembleSpreads(samples, quantities),
  };
}

/** Monte Carlo samples of a design on the pool, in sample order. */
export async function runSamples(spec: Spec, values: Readonly<Record<string, number>>, options: Pick<ToleranceOptions, 'samples' | 'seed' | 'workers' | 'growth' | 'batch' | 'onProgress'>): Promise<Measurement[]> {
  const tasks = batchTasks(spec, values, options.growth, options.seed, options.samples, options.batch);
  const outcomes = (await runTasks(tasks, { workers: options.workers, ...(options.onProgress ? { onProgress: options.onProgress } : {}) })) as BatchOutcome[];
  return outcomes.flatMap((o) => o.samples);
}

/** Full tolerance analysis of the spec at the given variable values. */
export async function tolerance(spec: Spec, values: Readonly<Record<string, number>>, options: ToleranceOptions): Promise<ToleranceResult> {
  const problem = prepareTolerance(spec, values);
  const nominal = measure(problem);
  const base = { values, quantities: problem.quantities, nominal };
  if (!nominal.ok) return { status: 'no-finite-value', message: TOLERANCE_MESSAGES['no-finite-value'], ...base, sensitivities: [], montecarlo: null, islands: [] };
  const samples = options.samples > 0 ? await runSamples(spec, values, options) : [];
  return {
    status: 'ok',
    message: TOLERANCE_MESSAGES.ok,
    ...base,
    sensitivities: sensitivities(problem, nominal, options.sensitivity),
    montecarlo: options.samples > 0 ? summarise(samples, problem.quantities, options.seed, spec, options.growth, values) : null,
    islands: options.islands ? islandLines(spec, values, problem.settings) : [],
  };
}
