/** `wellsmith tolerance SPEC`: growth-error sensitivities, Monte Carlo yield and island lines of one design. */
import { InputError } from '../errors.js';
import { loadSpecFile } from '../input/load.js';
import { nominalVariables } from '../structure.js';
import { tolerance, DEFAULT_TOLERANCE, MAX_SAMPLES, type ToleranceResult } from '../tolerance/analyse.js';
import type { GrowthModel, MonolayerModel } from '../tolerance/montecarlo.js';
import type { SensitivityOptions } from '../tolerance/sensitivity.js';
import { measure, prepareTolerance } from '../tolerance/measure.js';
import type { Spec } from '../input/schema.js';
import type { RobustResult } from '../tolerance/robust.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { fixed, inUnit, sig, signed, signedIn, table, toJson, withUnit } from '../text.js';
import { worstText } from '../tolerance/describe.js';
import { noteLongWork, progressShown } from './progress.js';

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

/** "; 37 samples lose a quantity a target reads (e1-e2 energy 37) and count as failures", or '' when none does. */
function missingText(mc: NonNullable<ToleranceResult['montecarlo']>, q: ToleranceResult['quantities']): string {
  const lost = q.flatMap((x, k) => (x.target && (mc.missing[k] ?? 0) > 0 ? [`${x.label} missing in ${mc.missing[k]}`] : []));
  return lost.length ? `; failures include samples where a quantity a target reads does not exist (${lost.join(', ')})` : '';
}

export function describeTolerance(r: ToleranceResult, title: string | undefined, s: SensitivityOptions): string {
  const q = r.quantities;
  const lines = [title ? `${title}\n` : '', `Design: ${Object.entries(r.values).map(([k, v]) => `${k} = ${sig(v, 6)}`).join(', ') || '(no variables)'}`,
    `Nominal: ${q.map((x, k) => `${x.label} ${Number.isFinite(r.nominal.values[k]) ? withUnit(r.nominal.values[k]!, x.unit) : 'missing'}`).join('; ')}; every target ${r.nominal.satisfied ? 'met' : 'NOT met'}`];
  if (r.status !== 'ok') return [...lines, '', `status: ${r.status}: ${r.message}`].join('\n');
  lines.push('', `Sensitivities (Δx ${s.dx}, growth rate ${s.ratePercent} %, ΔT ${s.dT} K); shifts at −/+ step; impact = largest |Δ residual| in window half-widths`,
    table(['perturbation', ...q.map((x) => `Δ ${x.label} (${x.unit})`), 'impact'],
      r.sensitivities.map((row) => [row.label, ...q.map((x, k) => `${signedIn(row.minus[k]!, x.unit)} / ${signedIn(row.plus[k]!, x.unit)}`), fixed(row.impact, 3)])));
  const mc = r.montecarlo;
  if (mc) {
    lines.push('', `Monte Carlo: ${mc.samples} samples, seed ${mc.seed}; per layer ${modelText(mc.model.monolayers)}; composition σ ${mc.model.compositionSigma}; growth rate σ ${mc.model.rateSigmaPercent} %`,
      table(['quantity', 'unit', 'mean', 'σ', 'p5', 'p50', 'p95', 'missing'], mc.distributions.map((d, k) => [q[k]!.label, q[k]!.unit || '-', inUnit(d.mean, q[k]!.unit), inUnit(d.sigma, q[k]!.unit), inUnit(d.p5, q[k]!.unit), inUnit(d.p50, q[k]!.unit), inUnit(d.p95, q[k]!.unit), String(mc.missing[k] ?? 0)])),
      `yield ${fixed(mc.yield * 100, 1)} % (every target inside its window, every quantity a target reads present)${missingText(mc, q)}${mc.failures ? `; ${mc.failures} samples failed to solve (counted as failures)` : ''}${mc.model.periods === 'correlated' ? '; periods err alike (correlated)' : ''}`);
    for (const e of mc.ensembles) {
      lines.push(`ensemble of the wells' ${e.transition} lines: σ ${sig(e.sigma_meV, 3)} meV over ${e.lines} lines (inhomogeneous FWHM ${sig(e.fwhm_meV, 3)} meV, Gaussian); within one sample the wells spread by σ ${sig(e.withinSample_meV, 3)} meV`);
    }
    if (mc.worst) lines.push(worstText(mc.worst, q));
  }
  for (const w of r.islands) {
    lines.push('', `Monolayer islands of layer ${w.layer + 1}${w.label ? ` (${w.label})` : ''}: ${fixed(w.monolayers, 2)} ML of ${fixed(w.monolayer_nm, 4)} nm; a well is a layer whose Ec is below its neighbours'`,
      table(['transition', 'w−1 ML (eV)', 'w (eV)', 'w+1 ML (eV)', 'split −1/0 (meV)', 'split 0/+1 (meV)', 'HWHM est. (meV)'],
        w.lines.map((l) => [l.transition, ...l.energy_eV.map((e) => fixed(e, 5)), fixed(l.splitting_meV[0], 2), fixed(l.splitting_meV[1], 2), fixed(l.hwhm_meV, 2)])),
      'HWHM estimate: half the mean 1 ML splitting, for islands smaller than the exciton (wider islands give separate lines at the three energies)');
  }
  return lines.join('\n');
}

/** Seconds one Monte Carlo sample takes here: the nominal structure measured after a first, warming measurement. */
function measureSeconds(spec: Spec, values: Readonly<Record<string, number>>): number {
  const problem = prepareTolerance(spec, values);
  measure(problem);
  const t0 = performance.now();
  measure(problem);
  return (performance.now() - t0) / 1000;
}

export async function runTolerance(args: ToleranceArgs): Promise<Outcome> {
  let locate: ((f: string) => number | undefined) | undefined;
  const bar = progressShown('tolerance');
  try {
    for (const [name, v, min, max] of [['--samples', args.samples, 0, MAX_SAMPLES], ['--workers', args.workers, 1, 1024]] as const) {
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
    const values = nominalVariables(loaded.spec);
    const each = measureSeconds(loaded.spec, values);
    noteLongWork(`this tolerance analysis`, (each * args.samples) / args.workers, `${args.samples} samples at ${each.toPrecision(2)} s each on ${args.workers} worker${args.workers > 1 ? 's' : ''}; fewer --samples take less`);
    const result = await tolerance(loaded.spec, values, {
      ...DEFAULT_TOLERANCE, samples: args.samples, seed: args.seed, workers: args.workers, growth, sensitivity,
      onProgress: (done, total) => bar.update(done, total, 'sample batches'),
    });
    bar.stop();
    return success(`${args.json ? toJson({ ...result, warnings: loaded.warnings }) : describeTolerance(result, loaded.spec.title, sensitivity)}\n`, result.status === 'ok' ? EXIT.ok : EXIT.physics, loaded.warnings);
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
