/**
 * Robust ranking of finished designs: each design's Monte Carlo yield under growth errors and its
 * worst single-layer ±1 ML shift; designs re-ranked by yield (highest first), then loss, then
 * their original rank.
 */
import type { Design, DesignResult } from '../design/search.js';
import type { Spec } from '../spec/schema.js';
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
  readonly samples: number;
  readonly worstShift: MonolayerShift | null;
}

export interface RobustResult {
  readonly designs: readonly RobustDesign[];
  readonly seed: number;
  readonly samples: number;
}

/** Yield and worst ±1 ML shift of one design. */
async function assess(spec: Spec, d: Design, options: ToleranceOptions): Promise<Omit<RobustDesign, 'design'>> {
  const problem = prepareTolerance(spec, d.values);
  const nominal = measure(problem);
  if (!nominal.ok) return { yield: 0, samples: options.samples, worstShift: null };
  const mc = summarise(await runSamples(spec, d.values, options), problem.quantities.length, options.seed, spec.stack.length, options.growth);
  const worst = sensitivities(problem, nominal, options.sensitivity).find((s) => s.kind === 'thickness');
  return {
    yield: mc.yield,
    samples: mc.samples,
    worstShift: worst && worst.layer !== null
      ? { label: worst.label, layer: worst.layer, impact: worst.impact, minus: worst.minus[0]!, plus: worst.plus[0]!, unit: problem.quantities[0]!.unit }
      : null,
  };
}

/** Re-ranks a design run's designs by Monte Carlo yield, then loss, then original rank. */
export async function robustRank(spec: Spec, result: DesignResult, options: ToleranceOptions): Promise<RobustResult> {
  const assessed: RobustDesign[] = [];
  for (const d of result.designs) assessed.push({ design: d, ...(await assess(spec, d, options)) });
  assessed.sort((a, b) => b.yield - a.yield || a.design.loss - b.design.loss || a.design.rank - b.design.rank);
  return { designs: assessed, seed: options.seed, samples: options.samples };
}
