/**
 * The growth-tolerance section of a report: sensitivity bars, the Monte Carlo histogram of each
 * target quantity with its window and the yield, the distribution table and the monolayer-island
 * lines. Computed here from a spec (`report --tolerance`), or read from `tolerance --json` output,
 * which keeps only the summary of the samples (no histogram then).
 */
import type { TopLevelSpec } from 'vega-lite';
import { InputError } from '../errors.js';
import { fixed, inUnit, sig, signedIn, withUnit } from '../text.js';
import { settingsOf, solveStructure } from '../solve.js';
import type { Spec } from '../input/schema.js';
import { buildStructure } from '../structure.js';
import { runSamples, summarise, tolerance, type ToleranceOptions, type ToleranceResult } from '../tolerance/analyse.js';
import { prepareTolerance, type Measurement } from '../tolerance/measure.js';
import { scoreTargets } from '../../objectives/index.js';
import { escapeHtml, figureHtml, htmlTable, type Section } from './html.js';
import type { ObjectiveRole } from '../../objectives/types.js';
import { worstText } from '../tolerance/describe.js';
import { PALETTE } from './palette.js';
import { renderSvg } from './render.js';


/** A target's window on its quantity's axis: goal ± halfWidth, in the quantity's unit. */
export interface TargetWindow {
  readonly goal: number;
  readonly halfWidth: number;
}

export interface ToleranceReport {
  readonly result: ToleranceResult;
  /** Monte Carlo measurements in sample order; null for a recorded result, which keeps only their summary. */
  readonly samples: readonly Measurement[] | null;
  /** Per quantity (result.quantities order): the target window, or null where there is none (transition energies, one-sided or count targets). */
  readonly windows: readonly (TargetWindow | null)[];
  /** Per quantity: the goal of a constraint (its limit for thickness constraints, zero net strain, zero Γ deficit), else null. */
  readonly goals: readonly (number | null)[];
}

/** Relative agreement two samples must show for a window to be taken as goal ± |value − goal|/|residual|. */
const LINEARITY = 1e-6;

/**
 * The window of each target quantity, read off its residuals: a window target scores
 * r = (value − goal)/halfWidth, so halfWidth = |value − goal|/|r| from the measurement with the
 * largest |r|, accepted only when the measurement with the smallest non-zero |r| gives the same
 * width (one-sided and count targets, whose residuals are not linear in the value, get none).
 */
export function targetWindows(goals: readonly (number | null)[], quantities: number, measurements: readonly Measurement[]): (TargetWindow | null)[] {
  return Array.from({ length: quantities }, (_, k) => {
    const goal = goals[k];
    if (goal === null || goal === undefined) return null;
    const widths = measurements
      .filter((m) => m.ok && Number.isFinite(m.values[k]) && Number.isFinite(m.residuals[k]) && Math.abs(m.residuals[k]!) > 1e-9)
      .map((m) => ({ r: Math.abs(m.residuals[k]!), w: Math.abs(m.values[k]! - goal) / Math.abs(m.residuals[k]!) }))
      .sort((a, b) => a.r - b.r);
    const lo = widths[0];
    const hi = widths[widths.length - 1];
    if (!lo || !hi || lo === hi || !(hi.w > 0) || Math.abs(hi.w - lo.w) > LINEARITY * hi.w) return null;
    return { goal, halfWidth: hi.w };
  });
}

/**
 * Full tolerance analysis of a spec at the given values, keeping the Monte Carlo samples for the
 * histograms: engine/tolerance/analyse.ts `tolerance` for the sensitivities and island lines, and
 * its own `runSamples` and `summarise` for the yield, so `result` is what `tolerance` returns.
 */
export async function toleranceReport(spec: Spec, values: Readonly<Record<string, number>>, options: ToleranceOptions): Promise<ToleranceReport> {
  const base = await tolerance(spec, values, { ...options, samples: 0 });
  if (base.status !== 'ok' || options.samples === 0) return { result: base, samples: null, windows: base.quantities.map(() => null), goals: base.quantities.map(() => null) };
  const samples = await runSamples(spec, values, options);
  const result: ToleranceResult = { ...base, montecarlo: summarise(samples, base.quantities, options.seed, spec, options.growth, values) };
  const problem = prepareTolerance(spec, values);
  const nominal = scoreTargets(problem.targets, solveStructure(buildStructure(spec, values), settingsOf(spec), { wavefunctions: problem.wavefunctions, states: problem.states }));
  const goals = base.quantities.map((q, k) => (q.target && nominal.evaluations[k]?.role === 'target' ? nominal.evaluations[k]!.goal : null));
  const constraintGoals = base.quantities.map((q, k) => (q.target && nominal.evaluations[k]?.role === 'constraint' ? nominal.evaluations[k]!.goal : null));
  return { result, samples, windows: targetWindows(goals, base.quantities.length, [base.nominal, ...samples]), goals: constraintGoals };
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** True for the JSON object `wellsmith tolerance --json` writes. */
export const isToleranceJson = (v: unknown): v is Record<string, unknown> =>
  isRecord(v) && Array.isArray(v.quantities) && Array.isArray(v.sensitivities) && isRecord(v.nominal) && 'montecarlo' in v;

/** toJson (engine/text.ts) writes NaN as null: read it back as NaN wherever a number belongs. */
const num = (v: unknown): number => (typeof v === 'number' ? v : NaN);
const nums = (v: unknown): number[] => (Array.isArray(v) ? v.map(num) : []);

/** A ToleranceReport from `tolerance --json` output (no samples, hence no histograms or windows). */
export function toleranceFromJson(v: Record<string, unknown>, origin: string): ToleranceReport {
  const r = v as unknown as ToleranceResult;
  if (!r.quantities.every((q) => isRecord(q) && typeof q.label === 'string')) {
    throw new InputError('schema', `${origin}: "quantities" must list {label, unit, target} as "wellsmith tolerance --json" writes them; regenerate the file`);
  }
  const mc = r.montecarlo;
  const result: ToleranceResult = {
    ...r,
    nominal: { ...r.nominal, values: nums(r.nominal.values), residuals: nums(r.nominal.residuals) },
    sensitivities: r.sensitivities.map((s) => ({ ...s, minus: nums(s.minus), plus: nums(s.plus), impact: num(s.impact) })),
    montecarlo: mc ? {
      ...mc, yield: num(mc.yield), missing: Array.isArray(mc.missing) ? nums(mc.missing) : r.quantities.map(() => 0),
      distributions: mc.distributions.map((d) => ({ n: num(d.n), mean: num(d.mean), sigma: num(d.sigma), p5: num(d.p5), p50: num(d.p50), p95: num(d.p95) })),
      worst: mc.worst ? { ...mc.worst, values: nums(mc.worst.values), layers: Array.isArray(mc.worst.layers) ? mc.worst.layers : [] } : null,
    } : null,
    islands: (r.islands ?? []).map((w) => ({ ...w, lines: w.lines.map((l) => ({ ...l, energy_eV: nums(l.energy_eV) as unknown as [number, number, number], splitting_meV: nums(l.splitting_meV) as unknown as [number, number], hwhm_meV: num(l.hwhm_meV) })) })),
  };
  return { result, samples: null, windows: result.quantities.map(() => null), goals: result.quantities.map(() => null) };
}

/** Growth errors with a smaller impact (window half-widths) are left out of the bars; the table lists them all. */
export const MIN_IMPACT = 0.01;

const KIND_COLOURS = { domain: ['thickness', 'composition', 'growth-rate', 'temperature'], range: [PALETTE.indigo, PALETTE.amber, PALETTE.rose, PALETTE.sky] };

/**
 * Sensitivity bars: the impact of each one-at-a-time growth error (largest |Δ residual| over the
 * targets, in window half-widths), largest first, with the rule at 1 where one error alone moves a
 * target by half its window.
 */
export function sensitivitySpec(r: ToleranceResult): TopLevelSpec {
  const rows = r.sensitivities.filter((s) => s.impact >= MIN_IMPACT).map((s) => ({ label: s.label, impact: s.impact, kind: s.kind }));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 520,
    height: Math.max(60, 22 * rows.length),
    layer: [
      {
        data: { values: rows },
        mark: { type: 'bar', height: 14 },
        encoding: {
          y: { field: 'label', type: 'nominal', title: null, sort: { field: 'impact', order: 'descending' }, axis: { labelLimit: 400 } },
          x: { field: 'impact', type: 'quantitative', title: 'impact (window half-widths)' },
          color: { field: 'kind', type: 'nominal', title: 'growth error', scale: KIND_COLOURS },
        },
      },
      { data: { values: [{ x: 1 }] }, mark: { type: 'rule', color: PALETTE.ink, strokeDash: [4, 3] }, encoding: { x: { field: 'x', type: 'quantitative' } } },
    ],
  } as TopLevelSpec;
}

export interface HistogramBin { readonly x0: number; readonly x1: number; readonly count: number }

/**
 * Equal-width histogram of the finite values, about `bins` bins over their range. With a window,
 * the width divides the window into whole bins and the edges fall on the window's, so each bin is
 * wholly inside or outside it (a bin includes its lower edge; the top bin also its upper edge).
 */
export function histogram(values: readonly number[], bins = 30, window: TargetWindow | null = null): HistogramBin[] {
  const v = values.filter(Number.isFinite);
  if (v.length === 0) return [];
  const lo = Math.min(...v);
  const hi = Math.max(...v);
  let width = hi > lo ? (hi - lo) / bins : Math.max(Math.abs(lo) * 1e-6, 1e-9);
  let start = lo;
  if (window) {
    const edge = window.goal - window.halfWidth;
    // Bins sized on the plotted span (values and window), so a narrow spread cannot split the window into thousands.
    const span = Math.max(hi, window.goal + window.halfWidth) - Math.min(lo, edge);
    width = (2 * window.halfWidth) / Math.max(1, Math.round((2 * window.halfWidth * bins) / span));
    start = edge - Math.ceil((edge - lo) / width) * width;
  }
  const n = Math.max(1, Math.ceil((hi - start) / width));
  const counts = new Array<number>(n).fill(0);
  for (const x of v) counts[Math.min(n - 1, Math.max(0, Math.floor((x - start) / width)))]! += 1;
  return counts.map((count, i) => ({ x0: start + i * width, x1: start + (i + 1) * width, count }));
}

/** Yield as printed in the report: percent with one decimal. */
export const yieldText = (y: number): string => `yield ${fixed(y * 100, 1)} %`;

/** What a histogram shows: a target with its window, a constraint (its limit, how often it held) or a figure the search maximised. */
export interface HistogramKind {
  readonly role: ObjectiveRole;
  /** Samples that solved but where the quantity does not exist (a state not bound): failures, not drawn. */
  readonly missing: number;
  /** For a constraint: samples in which it held. */
  readonly held?: number;
}

const ROLE_TITLES: Readonly<Record<ObjectiveRole, string>> = { target: 'target', constraint: 'constraint', figure: 'maximised' };

/**
 * Histogram of one quantity over the Monte Carlo samples, titled for what it is: a target with its
 * window shaded and its goal dashed; a constraint with its limit dashed and how often it held; a
 * figure the search maximised, with no window. The nominal value is a solid rule; samples where the
 * quantity does not exist are counted in the subtitle. x in the quantity's unit, y in samples.
 */
export function histogramSpec(label: string, unit: string, values: readonly number[], window: TargetWindow | null, nominal: number, yieldValue: number, kind: HistogramKind = { role: 'target', missing: 0 }, limit: number | null = null): TopLevelSpec {
  const inside = (b: HistogramBin): boolean => window !== null && b.x0 >= window.goal - window.halfWidth - 1e-9 * window.halfWidth && b.x1 <= window.goal + window.halfWidth + 1e-9 * window.halfWidth;
  const bins = histogram(values, 30, window).map((b) => ({ ...b, where: inside(b) ? 'inside the window' : 'outside' }));
  const xs = [...bins.flatMap((b) => [b.x0, b.x1]), ...(window ? [window.goal - window.halfWidth, window.goal + window.halfWidth] : []), ...(Number.isFinite(nominal) ? [nominal] : []), ...(limit !== null ? [limit] : [])];
  const span = Math.max(...xs) - Math.min(...xs) || Math.abs(xs[0] ?? 1) || 1;
  const x = { type: 'quantitative' as const, title: `${label}${unit ? ` (${unit})` : ''}`, scale: { domain: [Math.min(...xs) - 0.04 * span, Math.max(...xs) + 0.04 * span], nice: false, zero: false } };
  const layers: object[] = [];
  if (window) layers.push({ data: { values: [{ a: window.goal - window.halfWidth, b: window.goal + window.halfWidth }] }, mark: { type: 'rect', color: PALETTE.straw, opacity: 0.45 }, encoding: { x: { ...x, field: 'a' }, x2: { field: 'b' } } });
  layers.push({
    data: { values: bins },
    mark: { type: 'rect', stroke: 'white', strokeWidth: 0.5 },
    encoding: {
      x: { ...x, field: 'x0' }, x2: { field: 'x1' }, y: { field: 'count', type: 'quantitative', title: 'samples' },
      color: window
        ? { field: 'where', type: 'nominal', title: null, scale: { domain: ['inside the window', 'outside'], range: [PALETTE.indigo, '#a9a9a9'] }, legend: { orient: 'top-right' } }
        : { value: kind.role === 'figure' ? PALETTE.sky : PALETTE.indigo },
    },
  });
  if (window) layers.push({ data: { values: [{ g: window.goal }] }, mark: { type: 'rule', color: PALETTE.sky, strokeWidth: 2, strokeDash: [5, 3] }, encoding: { x: { ...x, field: 'g' } } });
  if (limit !== null) layers.push({ data: { values: [{ g: limit }] }, mark: { type: 'rule', color: PALETTE.rose, strokeWidth: 2, strokeDash: [5, 3] }, encoding: { x: { ...x, field: 'g' } } });
  if (Number.isFinite(nominal)) layers.push({ data: { values: [{ n: nominal }] }, mark: { type: 'rule', color: PALETTE.ink, strokeWidth: 1.5 }, encoding: { x: { ...x, field: 'n' } } });
  const drawn = values.filter(Number.isFinite).length;
  const what = kind.role === 'constraint'
    ? `held in ${kind.held ?? 0} of ${drawn + kind.missing} samples${limit !== null ? ` · goal ${withUnit(limit, unit)}` : ''}`
    : kind.role === 'figure'
      ? 'no window: the search makes it as large as it can'
      : window ? `window ${withUnit(window.goal, unit)} ± ${withUnit(window.halfWidth, unit)}` : 'no two-sided window';
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: `${ROLE_TITLES[kind.role]}: ${label}`, subtitle: `${yieldText(yieldValue)} · ${drawn} samples${kind.missing ? ` (+ ${kind.missing} where it does not exist, counted as failures)` : ''} · ${what}` },
    width: 560,
    height: 220,
    layer: layers,
  } as TopLevelSpec;
}

/** "; samples where a quantity a target reads does not exist count as failures (…)", or ''. */
function lostText(mc: NonNullable<ToleranceResult['montecarlo']>, q: ToleranceResult['quantities']): string {
  const lost = q.flatMap((x, k) => (x.target && (mc.missing[k] ?? 0) > 0 ? [`${x.label}: ${mc.missing[k]}`] : []));
  return lost.length ? `; samples where a quantity a target reads does not exist count as failures (${lost.join(', ')})` : '';
}

/** The tolerance section of a report. */
export async function toleranceSection(t: ToleranceReport, id = 'tolerance'): Promise<Section> {
  const r = t.result;
  const q = r.quantities;
  if (r.status !== 'ok') return { id, title: 'Growth tolerance', lead: `status ${r.status}: ${r.message}`, html: '' };
  const parts: string[] = [];
  const sens = r.sensitivities;
  const step = (kind: string): string => { const s = sens.find((x) => x.kind === kind); return s ? String(s.step) : '–'; };
  parts.push('<h3>Sensitivities</h3>',
    figureHtml(await renderSvg(sensitivitySpec(r)), `Impact of each growth error applied alone (±1 ML per layer, alloy fraction ±${step('composition')}, growth rate ±${step('growth-rate')} %, temperature ±${step('temperature')} K): the largest |Δ residual| over the targets in window half-widths; the dashed rule at 1 is half a window${sens.some((s) => !(s.impact >= MIN_IMPACT)) ? `; errors below ${MIN_IMPACT} (or that failed to solve) are only in the table` : ''}.`),
    htmlTable(['growth error', ...q.map((x) => `Δ ${x.label} (${x.unit || '–'}) −/+`), 'impact'],
      [...sens].sort((a, b) => (Number.isFinite(b.impact) ? b.impact : -1) - (Number.isFinite(a.impact) ? a.impact : -1))
        .map((s) => [s.label, ...q.map((x, k) => `${signedIn(s.minus[k]!, x.unit)} / ${signedIn(s.plus[k]!, x.unit)}`), fixed(s.impact, 3)]),
      [...q.map((_, k) => k + 1), q.length + 1]));
  const mc = r.montecarlo;
  if (mc) {
    parts.push('<h3>Monte Carlo</h3>',
      `<p class="lead">${mc.samples} samples, seed ${mc.seed}, composition σ ${mc.model.compositionSigma}, growth rate σ ${mc.model.rateSigmaPercent} %: <strong>${yieldText(mc.yield)}</strong> (every target inside its window and every quantity a target reads present)${mc.failures ? `; ${mc.failures} samples failed to solve (counted as failures)` : ''}${lostText(mc, q)}.</p>`);
    if (t.samples) {
      for (const [k, quantity] of q.entries()) {
        if (!quantity.target) continue;
        const values = t.samples.map((s) => s.values[k]!);
        const role = quantity.role ?? 'target';
        // A constraint holds exactly where its residual is zero (objectives/constraints.ts).
        const held = role === 'constraint' ? t.samples.filter((s) => s.ok && s.residuals[k] === 0).length : undefined;
        const limit = role === 'constraint' ? t.goals[k] ?? null : null;
        const caption = role === 'constraint' ? `${quantity.label} over the samples; dashed: the constraint's goal (the limit of a thickness constraint, zero net strain, zero Γ deficit); solid: the nominal design.`
          : role === 'figure' ? `${quantity.label} over the samples: a figure the search maximises, with no window; solid: the nominal design.`
            : `${quantity.label} over the samples (equal bins, edges on the window's); shaded: the target window, dashed: its goal, solid: the nominal design.`;
        parts.push(figureHtml(await renderSvg(histogramSpec(quantity.label, quantity.unit, values, t.windows[k] ?? null, r.nominal.values[k]!, mc.yield, { role, missing: mc.missing[k] ?? 0, ...(held !== undefined ? { held } : {}) }, limit)), caption));
      }
    } else {
      parts.push('<p class="lead">The recorded result keeps only the summary of its samples: run "wellsmith report SPEC --tolerance" for the histograms.</p>');
    }
    parts.push(htmlTable(['quantity', 'unit', 'nominal', 'mean', 'σ', 'p5', 'p50', 'p95', 'missing'],
      mc.distributions.map((d, k) => { const u = q[k]!.unit; return [q[k]!.label, u || '–', inUnit(r.nominal.values[k]!, u), inUnit(d.mean, u), inUnit(d.sigma, u), inUnit(d.p5, u), inUnit(d.p50, u), inUnit(d.p95, u), String(mc.missing[k] ?? 0)]; }), [2, 3, 4, 5, 6, 7, 8]));
    if (mc.worst) parts.push(`<p class="lead">${escapeHtml(worstText(mc.worst, q))}</p>`);
  }
  for (const w of r.islands) {
    parts.push(`<h3>Monolayer islands of layer ${w.layer + 1}${w.label ? ` (${escapeHtml(w.label)})` : ''}</h3>`,
      htmlTable(['transition', 'w − 1 ML (eV)', 'w (eV)', 'w + 1 ML (eV)', 'split −1/0 (meV)', 'split 0/+1 (meV)', 'HWHM est. (meV)'],
        w.lines.map((l) => [l.transition, ...l.energy_eV.map((e) => fixed(e, 5)), fixed(l.splitting_meV[0], 2), fixed(l.splitting_meV[1], 2), fixed(l.hwhm_meV, 2)]), [1, 2, 3, 4, 5, 6]));
  }
  if (r.islands.length > 0) parts.push(`<p class="lead">Lines of a well grown with interruptions, at ${r.islands.map((w) => `${fixed(w.monolayers, 2)} ML of ${fixed(w.monolayer_nm, 4)} nm`).join(', ')} ± 1 ML: islands wider than the exciton give three lines; smaller ones one line of about the HWHM estimate (half the mean 1 ML splitting).</p>`);
  return {
    id, title: 'Growth tolerance',
    lead: `Design ${Object.entries(r.values).map(([k, v]) => `${k} = ${sig(v, 6)}`).join(', ') || '(no variables)'}; nominal: every target ${r.nominal.satisfied ? 'met' : 'NOT met'}.`,
    html: parts.join('\n'),
  };
}
