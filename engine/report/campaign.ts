/**
 * The campaign section of a report, from a run store as campaign-read.ts reads it: provenance, the
 * jobs table and, when the sweep moves the goal of a transition target, each done job's achieved
 * value against its goal (the ideal y = x line with the ±window band); otherwise the best loss per
 * job. The store is only read: its records are never rewritten.
 */
import type { TopLevelSpec } from 'vega-lite';
import { fixed, sig } from '../text.js';
import type { CampaignJob, CampaignReport } from './campaign-read.js';
import { figureHtml, htmlTable, type Section } from './html.js';
import { PALETTE } from './palette.js';
import { renderSvg } from './render.js';
import { bestDesigns, campaignDesignSections } from './campaign-plots.js';

/** One plotted point: a done job's achieved value of the swept transition target versus its goal (target unit). */
export interface SweepPoint {
  readonly job: string;
  readonly goal: number;
  readonly achieved: number;
  /** Window half-width (target unit): |achieved − goal| / |residual|. */
  readonly halfWidth: number;
  readonly met: string;
}

/**
 * The swept transition target: the first transition target whose goal differs between done jobs
 * (all in one unit), with one point per done job whose best design reaches a value. Null when no
 * transition goal is swept.
 */
export function sweptTransition(report: CampaignReport): { readonly label: string; readonly unit: string; readonly points: readonly SweepPoint[] } | null {
  const done = report.jobs.filter((j) => j.state === 'done' && j.targets.length > 0);
  const first = done[0];
  if (!first) return null;
  for (const [k, e] of first.targets.entries()) {
    if (!first.transition[k] || e.goal === null) continue;
    const evals = done.map((j) => ({ job: j.name, e: j.targets[k] }));
    if (evals.some((x) => !x.e || x.e.unit !== e.unit || x.e.label !== e.label || x.e.goal === null)) continue;
    if (new Set(evals.map((x) => x.e!.goal)).size < 2) continue;
    // The window is the same expression for every job; read it off any residual that is not zero.
    const widths = evals.map((x) => (x.e!.achieved !== null && Math.abs(x.e!.residual) > 1e-12 ? Math.abs(x.e!.achieved - x.e!.goal!) / Math.abs(x.e!.residual) : NaN));
    const fallback = widths.find(Number.isFinite) ?? 0;
    const points = evals.flatMap((x, i) => (x.e!.achieved === null ? [] : [{
      job: x.job, goal: x.e!.goal!, achieved: x.e!.achieved, halfWidth: Number.isFinite(widths[i]!) ? widths[i]! : fallback,
      met: x.e!.satisfied ? 'target met' : 'target missed',
    }]));
    return { label: e.label, unit: e.unit, points };
  }
  return null;
}

const MET_SCALE = { domain: ['target met', 'target missed'], range: [PALETTE.indigo, PALETTE.amber] };

/**
 * Achieved versus goal of the swept transition target, one point per done job: the ideal y = x
 * line, the ±window band around it, points coloured by whether the target was met. Axes in the
 * target's unit.
 */
export function sweepSpec(label: string, unit: string, points: readonly SweepPoint[]): TopLevelSpec {
  const band = [...points].sort((a, b) => a.goal - b.goal).map((p) => ({ goal: p.goal, lo: p.goal - p.halfWidth, hi: p.goal + p.halfWidth }));
  const values = points.flatMap((p) => [p.goal, p.achieved, p.goal - p.halfWidth, p.goal + p.halfWidth]);
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const pad = 0.05 * (hi - lo || Math.abs(hi) || 1);
  const scale = { domain: [lo - pad, hi + pad], nice: false, zero: false };
  const x = { field: 'goal', type: 'quantitative' as const, title: `goal: ${label} (${unit})`, scale };
  const y = { type: 'quantitative' as const, title: `achieved (${unit})`, scale };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 420,
    height: 420,
    layer: [
      { data: { values: band }, mark: { type: 'area', color: PALETTE.straw, opacity: 0.45 }, encoding: { x, y: { ...y, field: 'lo' }, y2: { field: 'hi' } } },
      { data: { values: band }, mark: { type: 'line', color: PALETTE.sky, strokeDash: [5, 3] }, encoding: { x, y: { ...y, field: 'goal' } } },
      {
        data: { values: points.map((p) => ({ ...p })) },
        mark: { type: 'point', filled: true, size: 70 },
        encoding: { x, y: { ...y, field: 'achieved' }, color: { field: 'met', type: 'nominal', title: null, scale: MET_SCALE }, tooltip: [{ field: 'job' }] },
      },
    ],
  } as TopLevelSpec;
}

/** Best loss of each done job, in job order, coloured by whether every target was met (symlog axis: losses span decades and may be 0). */
export function lossSpec(jobs: readonly CampaignJob[]): TopLevelSpec {
  const values = jobs.flatMap((j) => (j.state === 'done' && j.loss !== null ? [{ job: j.name, loss: j.loss, met: j.satisfied ? 'target met' : 'target missed' }] : []));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 520,
    height: 260,
    data: { values },
    mark: { type: 'point', filled: true, size: 70 },
    encoding: {
      x: { field: 'job', type: 'nominal', title: 'job', sort: null, axis: { labelAngle: -40, labelLimit: 220 } },
      y: { field: 'loss', type: 'quantitative', title: 'best loss Σ w·r² (window half-widths²)', scale: { type: 'symlog' } },
      color: { field: 'met', type: 'nominal', title: null, scale: { ...MET_SCALE, domain: ['target met', 'target missed'] } },
    },
  } as TopLevelSpec;
}

/** The plot of a campaign: achieved versus swept goal when a transition goal is swept, else the best loss per job. */
export function campaignPlotSpec(report: CampaignReport): { readonly spec: TopLevelSpec; readonly caption: string } {
  const swept = sweptTransition(report);
  if (swept) {
    return {
      spec: sweepSpec(swept.label, swept.unit, swept.points),
      caption: `${swept.label} of each done job's best design (${swept.unit}) versus the job's goal: dashed, achieved = goal; shaded, the goal ± the target's window; colour, whether the target was met.`,
    };
  }
  return { spec: lossSpec(report.jobs), caption: 'Best loss Σ w·r² of each done job (residuals in window half-widths; symmetric-log axis); colour, whether every target was met.' };
}

/** Header status of a campaign report. */
export function campaignStatus(report: CampaignReport): { ok: boolean; text: string } {
  const done = report.jobs.filter((j) => j.state === 'done');
  const failed = report.jobs.filter((j) => j.state === 'failed').length;
  const met = done.filter((j) => j.satisfied === true).length;
  return { ok: failed === 0 && done.length === report.jobs.length, text: `${done.length} of ${report.jobs.length} jobs done, ${met} meeting every target${failed > 0 ? `, ${failed} failed` : ''}` };
}

/** The campaign sections: jobs table and the sweep (or loss) plot. */
export async function campaignSections(report: CampaignReport): Promise<Section[]> {
  const rows = report.jobs.map((j) => [String(j.index + 1), j.name, j.state, j.loss === null ? '–' : sig(j.loss, 4), j.satisfied === null ? '–' : j.satisfied ? 'yes' : 'no',
    j.evaluations === null ? '–' : String(j.evaluations), j.state === 'failed' ? (j.message ?? '') : (j.status ?? '')]);
  const jobs: Section = {
    id: 'jobs', title: 'Jobs',
    lead: `${report.jobs.length} jobs; best loss and "all met" of each job's rank-1 design; evaluations of its search.`,
    html: htmlTable(['#', 'job', 'state', 'best loss', 'all met', 'evaluations', 'status'], rows, [0, 3, 5]),
  };
  if (!report.jobs.some((j) => j.state === 'done' && j.loss !== null)) return [jobs];
  const plot = campaignPlotSpec(report);
  const swept = sweptTransition(report);
  const table = swept
    ? htmlTable(['job', `goal (${swept.unit})`, `achieved (${swept.unit})`, `window ± (${swept.unit})`, 'met'],
      swept.points.map((p) => [p.job, sig(p.goal, 6), sig(p.achieved, 6), fixed(p.halfWidth, 3), p.met === 'target met' ? 'yes' : 'no']), [1, 2, 3])
    : '';
  return [jobs, {
    id: 'sweep', title: swept ? `Sweep of ${swept.label}` : 'Best loss per job',
    html: `${figureHtml(await renderSvg(plot.spec), plot.caption)}${table ? `\n${table}` : ''}`,
  }, ...(await campaignDesignSections(report, bestDesigns(report.path)))];
}
