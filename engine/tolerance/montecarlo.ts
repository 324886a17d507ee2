/**
 * Monte Carlo growth yield. Each sample draws, from its own stream Random(deriveSeed(seed, i)),
 * a whole-monolayer error for every layer, an alloy-fraction error for every layer (applied where
 * the layer has a mixed fraction) and one growth-rate error; builds, solves and scores that
 * structure. In a repeated stack the user picks how periods err: 'independent' (every period's
 * layers draw their own errors, as random shutter and flux noise does) or 'correlated' (each layer
 * of the period draws once and every period repeats it, as a systematic calibration error does). Samples run in batches on the worker pool; because every sample's stream depends
 * only on (seed, index), results are identical for any worker count or batch size.
 */
import { deriveSeed, Random } from '../random.js';
import type { Spec } from '../input/schema.js';
import { stackLayers, type Perturbation } from '../structure.js';
import { measure, prepareTolerance, type Measurement } from './measure.js';

/** Per-layer monolayer error model: a table of probabilities, or a Gaussian σ (ML) rounded to whole ML. */
export type MonolayerModel =
  | { readonly kind: 'table'; readonly table: readonly { readonly ml: number; readonly p: number }[] }
  | { readonly kind: 'sigma'; readonly sigma: number };

export interface GrowthModel {
  readonly monolayers: MonolayerModel;
  /** σ of each layer's alloy-fraction error (fraction). */
  readonly compositionSigma: number;
  /** σ of the growth-rate error (percent), one draw per sample for every layer. */
  readonly rateSigmaPercent: number;
  /** How the periods of a repeat err: each on its own, or all alike (default independent). */
  readonly periods?: 'independent' | 'correlated';
}

export const DEFAULT_GROWTH: GrowthModel = {
  monolayers: { kind: 'table', table: [{ ml: -1, p: 0.15 }, { ml: 0, p: 0.7 }, { ml: 1, p: 0.15 }] },
  compositionSigma: 0.005,
  rateSigmaPercent: 1,
};

function drawMonolayers(r: Random, m: MonolayerModel): number {
  if (m.kind === 'sigma') return m.sigma === 0 ? 0 : Math.round(m.sigma * r.normal());
  const u = r.uniform();
  let acc = 0;
  for (const row of m.table) {
    acc += row.p;
    if (u < acc) return row.ml;
  }
  return m.table[m.table.length - 1]!.ml;
}

/**
 * Which draw each layer of the grown stack takes: its own (independent periods, and every layer
 * outside repeats), or, for correlated periods, the one of its layer as written in the repeat
 * (every period shares it).
 */
export function drawKeys(spec: Spec, model: GrowthModel): readonly string[] {
  return stackLayers(spec).map((l, i) => (model.periods === 'correlated' && l.period !== null ? l.field : String(i)));
}

/**
 * The growth errors of sample `index` for layers keyed by drawKeys: per distinct key (in order of
 * first appearance) one ML draw then one composition draw, then the growth-rate draw. Draws are
 * consumed whatever the σ's, and a zero σ multiplies its deviate by 0, so a zero-σ sample is the
 * nominal structure exactly. Without repeats every key is distinct: one draw pair per layer.
 */
export function samplePerturbation(seed: number, index: number, keys: readonly string[], model: GrowthModel): Perturbation {
  const r = new Random(deriveSeed(seed, index));
  const drawn = new Map<string, { ml: number; x: number }>();
  const thickness_ML: number[] = [];
  const composition: number[] = [];
  for (const key of keys) {
    let d = drawn.get(key);
    if (!d) {
      d = { ml: drawMonolayers(r, model.monolayers), x: model.compositionSigma * r.normal() };
      drawn.set(key, d);
    }
    thickness_ML.push(d.ml);
    composition.push(d.x);
  }
  return { thickness_ML, composition, thicknessScale: 1 + (model.rateSigmaPercent * r.normal()) / 100 };
}

export interface BatchTask {
  readonly type: 'tolerance-batch';
  readonly spec: Spec;
  readonly values: Readonly<Record<string, number>>;
  readonly model: GrowthModel;
  readonly seed: number;
  readonly first: number;
  readonly count: number;
}

export interface BatchOutcome {
  readonly type: 'tolerance-batch';
  readonly first: number;
  readonly samples: readonly Measurement[];
}

/** Runs samples first … first + count − 1 (the pool's unit of work). */
export function runBatch(task: BatchTask): BatchOutcome {
  const problem = prepareTolerance(task.spec, task.values);
  const keys = drawKeys(task.spec, task.model);
  const samples: Measurement[] = [];
  for (let i = task.first; i < task.first + task.count; i++) samples.push(measure(problem, samplePerturbation(task.seed, i, keys, task.model)));
  return { type: 'tolerance-batch', first: task.first, samples };
}

/** Splits N samples into pool tasks of at most `size` samples each. */
export function batchTasks(spec: Spec, values: Readonly<Record<string, number>>, model: GrowthModel, seed: number, samples: number, size: number): BatchTask[] {
  const out: BatchTask[] = [];
  for (let first = 0; first < samples; first += size) out.push({ type: 'tolerance-batch', spec, values, model, seed, first, count: Math.min(size, samples - first) });
  return out;
}

export interface Distribution {
  /** Samples with a finite value (missing states are excluded). */
  readonly n: number;
  readonly mean: number;
  /** Sample standard deviation (n − 1 in the denominator). */
  readonly sigma: number;
  readonly p5: number;
  readonly p50: number;
  readonly p95: number;
}

/**
 * Percentile by linear interpolation between order statistics, x[(n−1)q] (definition 7 of
 * R. J. Hyndman and Y. Fan, Am. Stat. 50, 361 (1996), the numpy default). Input sorted ascending.
 */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/**
 * Mean, σ (sample, n − 1) and 5/50/95 % percentiles of the finite values. Mean and σ by Welford's
 * update (B. P. Welford, Technometrics 4, 419 (1962)): equal values give exactly their value and
 * σ = 0, where a plain sum divided by n can miss the value by an ulp and leave σ ~ 1e-15.
 */
export function distribution(values: readonly number[]): Distribution {
  const v = values.filter(Number.isFinite).sort((a, b) => a - b);
  const n = v.length;
  let mean = 0;
  let m2 = 0;
  for (let k = 0; k < n; k++) {
    const d = v[k]! - mean;
    mean += d / (k + 1);
    m2 += d * (v[k]! - mean);
  }
  const sigma = n > 1 ? Math.sqrt(m2 / (n - 1)) : n === 1 ? 0 : NaN;
  return { n, mean: n ? mean : NaN, sigma, p5: quantile(v, 0.05), p50: quantile(v, 0.5), p95: quantile(v, 0.95) };
}
