/** `wellsmith tolerance SPEC`: growth-error sensitivities, Monte Carlo yield and island lines of one design. */
import { InputError } from '../errors.js';
import { loadSpecFile } from '../spec/load.js';
import { nominalVariables } from '../structure.js';
import { tolerance, DEFAULT_TOLERANCE, type ToleranceResult } from '../tolerance/analyse.js';
import type { GrowthModel, MonolayerModel } from '../tolerance/montecarlo.js';
import type { SensitivityOptions } from '../tolerance/sensitivity.js';
import type { RobustResult } from '../tolerance/robust.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { fixed, sig, table, toJson } from './format.js';
import { progressBar } from './progress.js';

export interface ToleranceArgs {
  readonly spec: string;
  readonly samples: number;
  readonly seed: number;
  readonly workers: number;
  readonly dx: number;
  readonly rate: number;
  readonly dT: number;
  /** "-1:0.15,0:0.7,1:0.15" or undefined. */
  readonly mlTable: string;
  readonly mlSigma: number | undefined;
  readonly xSigma: number;
  readonly rateSigma: number;
  /** How the periods of a repeated stack err: 'independent' (default) or 'correlated'. */
  readonly periods?: string | undefined;
  readonly json: boolean;
}

/** Parses "-1:0.15,0:0.7,1:0.15" into a probability table summing to 1 (±1e-6). */
export function parseMonolayerTable(text: string): MonolayerModel {
  const table = text.split(',').map((part) => {
    const m = /^\s*([-+]?\d+)\s*:\s*([\d.eE+-]+)\s*$/.exec(part);
    const p = m ? Number(m[2]) : NaN;
    if (!m || !(p >= 0 && p <= 1)) throw new InputError('bad-value', `--ml: each entry must be "ML:probability" with a whole ML and a probability in [0, 1], got "${part}"; e.g. --ml=-1:0.15,0:0.7,1:0.15`);
    return { ml: Number(m[1]), p };
  });
  const sum = table.reduce((a, r) => a + r.p, 0);
  if (Math.abs(sum - 1) > 1e-6) throw new InputError('bad-value', `--ml: probabilities must sum to 1, got ${sum}; e.g. --ml=-1:0.15,0:0.7,1:0.15`);
  return { kind: 'table', table };
}

const modelText = (m: MonolayerModel): string =>
  m.kind === 'sigma' ? `σ ${m.sigma} ML rounded to whole ML` : m.table.map((r) => `${r.ml >= 0 ? '+' : ''}${r.ml} ML: ${r.p}`).join(', ');

const signed = (x: number, digits: number): string => (Number.isFinite(x) ? `${x >= 0 ? '+' : ''}${x.toFixed(digits)}` : '–');

export function describeTolerance(r: ToleranceResult, title: string | undefined, s: SensitivityOptions): string {
  const q = r.quantities;
  const lines = [title ? `${title}\n` : '', `Design: ${Object.entries(r.values).map(([k, v]) => `${k} = ${sig(v, 6)}`).join(', ') || '(no variables)'}`,
    `Nominal: ${q.map((x, k) => `${x.label} ${sig(r.nominal.values[k]!, 6)} ${x.unit}`).join('; ')}; every target ${r.nominal.satisfied ? 'met' : 'NOT met'}`];
  if (r.status !== 'ok') return [...lines, '', `status: ${r.status}: ${r.message}`].join('\n');
  lines.push('', `Sensitivities (Δx ${s.dx}, growth rate ${s.ratePercent} %, ΔT ${s.dT} K); shifts at −/+ step; impact = largest |Δ residual| in window half-widths`,
    table(['perturbation', ...q.map((x) => `Δ ${x.label} (${x.unit})`), 'impact'],
      r.sensitivities.map((row) => [row.label, ...q.map((_, k) => `${signed(row.minus[k]!, 3)} / ${signed(row.plus[k]!, 3)}`), fixed(row.impact, 3)])));
  const mc = r.montecarlo;
  if (mc) {
    lines.push('', `Monte Carlo: ${mc.samples} samples, seed ${mc.seed}; per layer ${modelText(mc.model.monolayers)}; composition σ ${mc.model.compositionSigma}; growth rate σ ${mc.model.rateSigmaPercent} %`,
      table(['quantity', 'unit', 'mean', 'σ', 'p5', 'p50', 'p95'], mc.distributions.map((d, k) => [q[k]!.label, q[k]!.unit || '-', sig(d.mean, 6), sig(d.sigma, 3), sig(d.p5, 6), sig(d.p50, 6), sig(d.p95, 6)])),
      `yield ${fixed(mc.yield * 100, 1)} % (every target inside its window)${mc.failures ? `; ${mc.failures} samples failed to solve (counted out)` : ''}${mc.model.periods === 'correlated' ? '; periods err alike (correlated)' : ''}`);
    for (const e of mc.ensembles) {
      lines.push(`ensemble of the wells' ${e.transition} lines: σ ${sig(e.sigma_meV, 3)} meV over ${e.lines} lines (inhomogeneous FWHM ${sig(e.fwhm_meV, 3)} meV, Gaussian); within one sample the wells spread by σ ${sig(e.withinSample_meV, 3)} meV`);
    }
    if (mc.worst) {
      const p = mc.worst.perturbation;
      lines.push(`worst sample #${mc.worst.index}: loss ${sig(mc.worst.loss, 3)}; ${q.map((x, k) => `${x.label} ${sig(mc.worst!.values[k]!, 6)}`).join('; ')}; ML errors [${(p.thickness_ML ?? []).join(', ')}], growth rate ${signed(((p.thicknessScale ?? 1) - 1) * 100, 2)} %`);
    }
  }
  for (const w of r.islands) {
    lines.push('', `Monolayer islands of layer ${w.layer + 1}${w.label ? ` (${w.label})` : ''}: ${fixed(w.monolayers, 2)} ML of ${fixed(w.monolayer_nm, 4)} nm; a well is a layer whose Ec is below its neighbours'`,
      table(['transition', 'w−1 ML (eV)', 'w (eV)', 'w+1 ML (eV)', 'split −1/0 (meV)', 'split 0/+1 (meV)', 'HWHM est. (meV)'],
        w.lines.map((l) => [l.transition, ...l.energy_eV.map((e) => fixed(e, 5)), fixed(l.splitting_meV[0], 2), fixed(l.splitting_meV[1], 2), fixed(l.hwhm_meV, 2)])),
      'HWHM estimate: half the mean 1 ML splitting, for islands smaller than the exciton (wider islands give separate lines at the three energies)');
  }
  return lines.join('\n');
}

export async function runTolerance(args: ToleranceArgs): Promise<Outcome> {
  let locate: ((f: string) => number | undefined) | undefined;
  const bar = progressBar('tolerance');
  try {
    for (const [name, v, min, max] of [['--samples', args.samples, 0, 10_000_000], ['--workers', args.workers, 1, 1024]] as const) {
      if (!Number.isInteger(v) || v < min || v > max) throw new InputError('bad-value', `${name}: must be a whole number from ${min} to ${max}, got ${v}`);
    }
    if (!Number.isSafeInteger(args.seed) || args.seed < 0) throw new InputError('bad-value', `--seed: must be a whole number ≥ 0, got ${args.seed}`);
    for (const [name, v, max] of [['--dx', args.dx, 0.2], ['--rate', args.rate, 20], ['--dT', args.dT, 100], ['--x-sigma', args.xSigma, 0.1], ['--rate-sigma', args.rateSigma, 20]] as const) {
      if (!(v >= 0 && v <= max)) throw new InputError('bad-value', `${name}: must lie in [0, ${max}], got ${v}`);
    }
    if (args.mlSigma !== undefined && !(args.mlSigma >= 0 && args.mlSigma <= 5)) throw new InputError('bad-value', `--ml-sigma: must lie in [0, 5] ML, got ${args.mlSigma}`);
    const monolayers = args.mlSigma !== undefined ? { kind: 'sigma', sigma: args.mlSigma } as const : parseMonolayerTable(args.mlTable);
    const periods = args.periods ?? 'independent';
    if (periods !== 'independent' && periods !== 'correlated') throw new InputError('bad-value', `--periods: must be independent or correlated, got "${periods}"; independent draws every period's errors apart, correlated repeats one draw in every period`);
    const growth: GrowthModel = { monolayers, compositionSigma: args.xSigma, rateSigmaPercent: args.rateSigma, periods };
    const sensitivity: SensitivityOptions = { dx: args.dx, ratePercent: args.rate, dT: args.dT };
    const loaded = loadSpecFile(args.spec);
    locate = loaded.locate;
    const result = await tolerance(loaded.spec, nominalVariables(loaded.spec), {
      ...DEFAULT_TOLERANCE, samples: args.samples, seed: args.seed, workers: args.workers, growth, sensitivity,
      onProgress: (done, total) => bar.update(done, total, 'sample batches'),
    });
    bar.stop();
    return success(`${args.json ? toJson(result) : describeTolerance(result, loaded.spec.title, sensitivity)}\n`, result.status === 'ok' ? EXIT.ok : EXIT.physics);
  } catch (e) {
    bar.stop();
    return failure(e, locate);
  }
}

/** The robust ranking as JSON: original rank, yield with its 95 % Wilson interval, samples and worst ±1 ML shift per design, in robust order. */
export const robustJson = (r: RobustResult): unknown => ({
  seed: r.seed,
  samples: r.samples,
  ranking: r.designs.map((d, k) => ({ robust_rank: k + 1, rank: d.design.rank, loss: d.design.loss, yield: d.yield, yield_interval_95: [d.interval.low, d.interval.high], worst_monolayer_shift: d.worstShift })),
});

/** The robust ranking table: yields with their intervals; designs reordered only where intervals separate. */
export function describeRobust(r: RobustResult): string {
  return [`Robust ranking (${r.samples} Monte Carlo samples per design, seed ${r.seed}, default growth errors of "wellsmith tolerance"): a design moves above another only where their 95 % Wilson yield intervals separate; elsewhere the design ranking stands`,
    table(['robust rank', 'rank', 'loss', 'yield', '95 % interval', 'worst ±1 ML layer', 'shift −1 / +1 ML', 'impact'],
      r.designs.map((d, k) => [String(k + 1), String(d.design.rank), sig(d.design.loss, 3), `${fixed(d.yield * 100, 1)} %`, `${fixed(d.interval.low * 100, 1)}–${fixed(d.interval.high * 100, 1)} %`,
        d.worstShift ? d.worstShift.label.replace(/ thickness ±1 ML$/, '') : '–',
        d.worstShift ? `${signed(d.worstShift.minus, 3)} / ${signed(d.worstShift.plus, 3)} ${d.worstShift.unit}` : '–',
        fixed(d.worstShift?.impact, 3)]))].join('\n');
}
