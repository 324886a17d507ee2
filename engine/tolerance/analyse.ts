/**
 * Growth tolerance of one design: one-at-a-time sensitivities, Monte Carlo yield with
 * distributions of every measured quantity and the worst sample, and the monolayer-island lines
 * of each well. A design whose nominal structure cannot be evaluated is a result with status
 * 'no-finite-value', not an exception.
 */
import { runTasks, type PoolOptions } from '../pool.js';
import type { Spec } from '../spec/schema.js';
import type { Perturbation } from '../structure.js';
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
}

export interface MonteCarlo {
  readonly samples: number;
  readonly seed: number;
  readonly model: GrowthModel;
  /** Fraction of samples with every target inside its window (Evaluation.satisfied), in [0, 1]. */
  readonly yield: number;
  /** Samples whose solve failed or whose loss was not finite (counted as out of the windows). */
  readonly failures: number;
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

/** Summarises sample measurements (ordered by sample index) of the spec's quantities. */
export function summarise(samples: readonly Measurement[], quantities: readonly Quantity[], seed: number, spec: Spec, model: GrowthModel): MonteCarlo {
  const quantityCount = quantities.length;
  let worst = -1;
  samples.forEach((s, i) => { if (worst < 0 || s.loss > samples[worst]!.loss) worst = i; });
  const w = samples[worst];
  return {
    samples: samples.length,
    seed,
    model,
    yield: samples.length ? samples.filter((s) => s.satisfied).length / samples.length : 0,
    failures: samples.filter((s) => !s.ok).length,
    distributions: Array.from({ length: quantityCount }, (_, q) => distribution(samples.map((s) => s.values[q]!))),
    worst: w ? { index: worst, loss: w.loss, values: w.values, perturbation: samplePerturbation(seed, worst, drawKeys(spec, model), model) } : null,
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
    montecarlo: options.samples > 0 ? summarise(samples, problem.quantities, options.seed, spec, options.growth) : null,
    islands: options.islands ? islandLines(spec, values, problem.settings) : [],
  };
}
