/**
 * One-at-a-time growth sensitivities: each perturbation applied alone in both directions (each
 * layer ±1 ML, each alloy layer's fraction ±Δx, every thickness scaled by 1 ± p, temperature ±ΔT),
 * the shift of every measured quantity, ranked by impact.
 */
import { perturbComposition, buildStructure, type Perturbation, type Structure } from '../structure.js';
import { measure, type Measurement, type ToleranceProblem } from './measure.js';

export interface SensitivityOptions {
  /** Alloy-fraction error Δx (fraction, e.g. 0.01). */
  readonly dx: number;
  /** Growth-rate error p (percent, e.g. 1). */
  readonly ratePercent: number;
  /** Temperature error ΔT (K). */
  readonly dT: number;
}

export const DEFAULT_SENSITIVITY: SensitivityOptions = { dx: 0.01, ratePercent: 1, dT: 5 };

export interface Sensitivity {
  /** "layer 3 (well) thickness ±1 ML", "growth rate ±1 %". */
  readonly label: string;
  readonly kind: 'thickness' | 'composition' | 'growth-rate' | 'temperature';
  /** Stack index for per-layer perturbations, else null. */
  readonly layer: number | null;
  /** Size of the step in its own unit (ML, fraction, %, K). */
  readonly step: number;
  /** Quantity shifts (perturbed − nominal, in each quantity's unit) for −step and +step; NaN where a measurement failed. */
  readonly minus: readonly number[];
  readonly plus: readonly number[];
  /** Largest |Δ residual| over the targets, in window half-widths (1 = the shift alone spans half the window); NaN if a side failed. */
  readonly impact: number;
}

const layerName = (s: Structure, i: number): string => `layer ${i + 1}${s.layers[i]!.label ? ` (${s.layers[i]!.label})` : ''}`;

/** True when a composition error can move this layer's fraction (mixed alloy or graded layer). */
export function hasMixedFraction(s: Structure, i: number): boolean {
  const c = s.layers[i]!.composition;
  return perturbComposition(c, 1e-3) !== c;
}

const perLayer = (n: number, i: number, v: number): number[] => Array.from({ length: n }, (_, k) => (k === i ? v : 0));

interface Step {
  readonly label: string;
  readonly kind: Sensitivity['kind'];
  readonly layer: number | null;
  readonly step: number;
  readonly at: (sign: 1 | -1) => Perturbation;
}

function steps(s: Structure, o: SensitivityOptions): Step[] {
  const n = s.layers.length;
  const out: Step[] = s.layers.map((_, i) => ({ label: `${layerName(s, i)} thickness ±1 ML`, kind: 'thickness', layer: i, step: 1, at: (sign) => ({ thickness_ML: perLayer(n, i, sign) }) }));
  for (let i = 0; i < n; i++) {
    if (hasMixedFraction(s, i)) out.push({ label: `${layerName(s, i)} fraction ±${o.dx}`, kind: 'composition', layer: i, step: o.dx, at: (sign) => ({ composition: perLayer(n, i, sign * o.dx) }) });
  }
  out.push({ label: `growth rate ±${o.ratePercent} %`, kind: 'growth-rate', layer: null, step: o.ratePercent, at: (sign) => ({ thicknessScale: 1 + (sign * o.ratePercent) / 100 }) });
  out.push({ label: `temperature ±${o.dT} K`, kind: 'temperature', layer: null, step: o.dT, at: (sign) => ({ temperature_K: sign * o.dT }) });
  return out;
}

const diff = (a: readonly number[], b: readonly number[]): number[] => a.map((v, k) => v - b[k]!);

/**
 * Sensitivities of the problem's quantities about its nominal values, sorted by impact (largest
 * first; failed perturbations last). Central differences are not formed: growth errors are not
 * small compared with the nonlinearity (a 1 ML step in a 2 nm well), so both one-sided shifts are kept.
 * A temperature step that would go below 0 K is skipped on that side (NaN).
 */
export function sensitivities(problem: ToleranceProblem, nominal: Measurement, options: SensitivityOptions = DEFAULT_SENSITIVITY): readonly Sensitivity[] {
  const structure = buildStructure(problem.spec, problem.values);
  const targetCount = problem.targets.length;
  const rows = steps(structure, options).map((st): Sensitivity => {
    const side = (sign: 1 | -1): Measurement | null =>
      st.kind === 'temperature' && structure.temperature_K + sign * options.dT < 0 ? null : measure(problem, st.at(sign));
    const [m, p] = [side(-1), side(1)];
    const shift = (x: Measurement | null): number[] => (x ? diff(x.values, nominal.values) : nominal.values.map(() => NaN));
    const dr = (x: Measurement | null): number => (x ? Math.max(...x.residuals.slice(0, targetCount).map((r, k) => Math.abs(r - nominal.residuals[k]!))) : NaN);
    return { label: st.label, kind: st.kind, layer: st.layer, step: st.step, minus: shift(m), plus: shift(p), impact: Math.max(dr(m), dr(p)) };
  });
  const key = (x: number): number => (Number.isNaN(x) ? -Infinity : x);
  return rows.map((r, k) => ({ r, k })).sort((a, b) => key(b.r.impact) - key(a.r.impact) || a.k - b.k).map((x) => x.r);
}
