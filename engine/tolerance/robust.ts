/**
 * Robust ranking of finished designs: each design's Monte Carlo yield under growth errors, with its
 * 95 % Wilson score interval, and its worst single-layer ±1 ML shift. A design moves above one
 * ranked before it only when its yield interval lies wholly above the other's: yields whose
 * intervals overlap are not told apart by the samples, and the design ranking stands there.
 */
import type { Design, DesignResult } from '../design/search.js';
import type { Spec } from '../input/schema.js';
import { measure, prepareTolerance } from './measure.js';
import { summarise, runSamples, type ToleranceOptions } from './analyse.js';
import { sensitivities } from './sensitivity.js';

export interface MonolayerShift {
  /** Sensitivity label of the layer, e.g. "layer 3 (well) thickness ±1 ML". */
  readonly label: string;
  readonly layer: number;
  /** Largest |Δ residual| of any target for that layer at ±1 ML (window half-widths). */
  readonly impact: number;
  /** Shifts of the first target's achieved value at −1 and +1 ML (its unit). */
  readonly minus: number;
  readonly plus: number;
  readonly unit: string;
}

export interface RobustDesign {
  readonly design: Design;
  readonly yield: number;
  /** 95 % Wilson score interval of the yield. */
  readonly interval: { readonly low: number; readonly high: number };
  readonly samples: number;
  readonly worstShift: MonolayerShift | null;
}

export interface RobustResult {
  readonly designs: readonly RobustDesign[];
  readonly seed: number;
  readonly samples: number;
}

/** z of a two-sided 95 % normal interval. */
const Z95 = 1.959963984540054;

/**
 * Wilson score interval of a binomial proportion k/n at normal quantile z (E. B. Wilson, J. Am.
 * Stat. Assoc. 22, 209 (1927)): (p + z²/2n ± z √(p(1 − p)/n + z²/4n²)) / (1 + z²/n), p = k/n.
 * Unlike p ± z√(p(1−p)/n) it stays inside [0, 1] and is not empty at p = 0 or 1. n = 0 gives [0, 1].
 * Example: 8 of 10 at z = 1.96 → [0.490, 0.943].
 */
export function wilsonInterval(k: number, n: number, z = Z95): { low: number; high: number } {
  if (n <= 0) return { low: 0, high: 1 };
  const p = k / n;
  const z2 = z * z;
  const centre = p + z2 / (2 * n);
  const half = z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  const d = 1 + z2 / n;
  return { low: Math.max(0, (centre - half) / d), high: Math.min(1, (centre + half) / d) };
}

/**
 * Reorders designs (given in design-rank order) so that one precedes another by yield only where
 * their intervals separate: adjacent designs swap while the later one's interval lies wholly above
 * the earlier one's, until none does (each swap removes an inversion, so this ends).
 */
export function separatedOrder<T extends { readonly interval: { readonly low: number; readonly high: number } }>(items: readonly T[]): T[] {
  const out = [...items];
  for (let swapped = true; swapped;) {
    swapped = false;
    for (let i = 0; i + 1 < out.length; i++) {
      if (out[i + 1]!.interval.low > out[i]!.interval.high) {
        [out[i], out[i + 1]] = [out[i + 1]!, out[i]!];
        swapped = true;
      }
    }
  }
  return out;
}

/** Yield and worst ±1 ML shift of one design. */
async function assess(spec: Spec, d: Design, options: ToleranceOptions): Promise<Omit<RobustDesign, 'design'>> {
  const problem = prepareTolerance(spec, d.values);
  const nominal = measure(problem);
  if (!nominal.ok) return { yield: 0, interval: wilsonInterval(0, options.samples), samples: options.samples, worstShift: null };
  const mc = summarise(await runSamples(spec, d.values, options), problem.quantities, options.seed, spec, options.growth, d.values);
  const worst = sensitivities(problem, nominal, options.sensitivity).find((s) => s.kind === 'thickness');
  return {
    yield: mc.yield,
    interval: wilsonInterval(Math.round(mc.yield * mc.samples), mc.samples),
    samples: mc.samples,
    worstShift: worst && worst.layer !== null
      ? { label: worst.label, layer: worst.layer, impact: worst.impact, minus: worst.minus[0]!, plus: worst.plus[0]!, unit: problem.quantities[0]!.unit }
      : null,
  };
}

/** Re-ranks a design run's designs by Monte Carlo yield where the yields' Wilson intervals separate (separatedOrder), keeping the design order elsewhere. */
export async function robustRank(spec: Spec, result: DesignResult, options: ToleranceOptions): Promise<RobustResult> {
  const assessed: RobustDesign[] = [];
  for (const d of result.designs) assessed.push({ design: d, ...(await assess(spec, d, options)) });
  return { designs: separatedOrder(assessed), seed: options.seed, samples: options.samples };
}
