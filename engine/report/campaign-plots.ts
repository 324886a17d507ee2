/**
 * The design curves of a campaign report, read from its run store: each job's best design against
 * the sweep value that made the job — the designed variables (the curve a grower reads off: well
 * width and composition against target wavelength), and every windowed target's achieved-minus-goal
 * with its ±window drawn — one panel per variable or target (rows) and per value of any further
 * sweep axis (columns). The sweep values come from the job names the campaign gives its jobs
 * ("wavelength=1310nm,material=InGaAs": engine/campaign/campaign.ts). The store is only read.
 */
import type { TopLevelSpec } from 'vega-lite';
import { RunStore } from '../store/store.js';
import type { Spec } from '../input/schema.js';
import { splitQuantity } from '../input/units.js';
import { variablesOf } from '../structure.js';
import type { CampaignReport } from './campaign-read.js';
import { figureHtml, type Section } from './html.js';
import { PALETTE } from './palette.js';
import { renderSvg } from './render.js';

/** A job's best design as this module reads it from the store: its variable values and their units. */
export interface JobDesign {
  readonly values: Readonly<Record<string, number>>;
  /** Per variable: 'nm', 'ML', '%' or '' (a fraction). */
  readonly units: Readonly<Record<string, string>>;
}

/** The rank-1 design of every job of a run store that has one, keyed by job name. */
export function bestDesigns(path: string): Map<string, JobDesign> {
  const store = RunStore.open(path, { create: false, readonly: true });
  try {
    const specs = new Map(store.jobs().map((j) => [j.name, j.spec_json]));
    const out = new Map<string, JobDesign>();
    for (const d of store.designs()) {
      if (d.rank !== 1) continue;
      const spec = JSON.parse(specs.get(d.job) ?? '{}') as Spec;
      const units = Object.fromEntries(variablesOf(spec).map((v) => [v.name, v.unit]));
      out.set(d.job, { values: JSON.parse(d.values_json) as Record<string, number>, units });
    }
    return out;
  } finally {
    store.close();
  }
}

/** A sweep axis as the job names show it: its name, and for a numeric axis its unit. */
export interface SweepAxis {
  readonly name: string;
  /** True when every job's value reads as a number (with one unit). */
  readonly numeric: boolean;
  readonly unit: string;
}

/** "wavelength=1310nm,material=InGaAs" -> [["wavelength", "1310nm"], ["material", "InGaAs"]]; null for "base" or a name of another shape. */
export function jobCoordinates(name: string): [string, string][] | null {
  const parts = name.split(',').map((p) => p.split('='));
  return parts.every((p) => p.length === 2 && p[0]!.length > 0) ? parts.map((p) => [p[0]!, p[1]!]) : null;
}

/** The axes of a campaign's jobs (the first numeric one first, the x axis of the plots), or null when the names carry none. */
export function sweepAxes(jobs: readonly string[]): SweepAxis[] | null {
  const coords = jobs.map(jobCoordinates);
  const first = coords[0];
  if (!first || coords.some((c) => !c || c.length !== first.length || c.some(([n], i) => n !== first[i]![0]))) return null;
  const axes = first.map(([name], i): SweepAxis => {
    const q = coords.map((c) => splitQuantity(c![i]![1]));
    const unit = q[0]?.unit ?? '';
    return { name, numeric: q.every((x) => x !== null && x.unit === unit), unit };
  });
  const x = axes.findIndex((a) => a.numeric);
  return x <= 0 ? axes : [axes[x]!, ...axes.filter((_, i) => i !== x)];
}

/** One job's point: its x (the first numeric axis' value), the other axes' values as one panel name, and what is plotted. */
interface Point { readonly job: string; readonly x: number; readonly panel: string; readonly row: string; readonly y: number }

function pointsOf(report: CampaignReport, axes: readonly SweepAxis[]): { job: string; x: number; panel: string }[] {
  return report.jobs.flatMap((j) => {
    const c = new Map(jobCoordinates(j.name) ?? []);
    const x = splitQuantity(c.get(axes[0]!.name) ?? '')?.value;
    if (x === undefined || j.state !== 'done') return [];
    const panel = axes.slice(1).map((a) => `${a.name} = ${c.get(a.name)}`).join(', ') || 'all jobs';
    return [{ job: j.name, x, panel }];
  });
}

/** Small multiples of y against the sweep value: one row per `row`, one column per panel, points joined in sweep order. */
function curvesSpec(points: readonly Point[], xTitle: string, yTitle: string, band: readonly { row: string; panel: string; x: number; lo: number; hi: number }[] | null): TopLevelSpec {
  const x = { field: 'x', type: 'quantitative' as const, title: xTitle, scale: { zero: false, nice: false } };
  const y = { field: 'y', type: 'quantitative' as const, title: yTitle, scale: { zero: false } };
  const rows = [...new Set(points.map((p) => p.row))];
  const panels = [...new Set(points.map((p) => p.panel))];
  const data = [...points.map((p) => ({ ...p, kind: 'point' })), ...(band ?? []).map((b) => ({ ...b, kind: 'band' }))];
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    data: { values: data },
    facet: {
      row: { field: 'row', type: 'nominal', title: null, sort: rows, header: { labelAngle: 0, labelAlign: 'left', labelOrient: 'top', labelFontSize: 11 } },
      ...(panels.length > 1 ? { column: { field: 'panel', type: 'nominal', title: null, sort: panels } } : {}),
    },
    spec: {
      width: panels.length > 1 ? 260 : 520,
      height: 150,
      layer: [
        ...(band ? [
          { transform: [{ filter: "datum.kind === 'band'" }], mark: { type: 'area', color: PALETTE.straw, opacity: 0.5 }, encoding: { x, y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' } } },
          { transform: [{ filter: "datum.kind === 'band'" }], mark: { type: 'rule', color: PALETTE.sky, strokeDash: [5, 3] }, encoding: { y: { datum: 0, type: 'quantitative' } } },
        ] : []),
        { transform: [{ filter: "datum.kind === 'point'" }], mark: { type: 'line', color: PALETTE.indigo, point: { filled: true, size: 40 } }, encoding: { x, y, order: { field: 'x' } } },
      ],
    },
    resolve: { scale: { y: 'independent' } },
  } as TopLevelSpec;
}

/** The variables' design curves: one row per variable, in its unit. */
export function variableCurvesSpec(report: CampaignReport, designs: ReadonlyMap<string, JobDesign>, axes: readonly SweepAxis[]): TopLevelSpec | null {
  const points = pointsOf(report, axes).flatMap((p) => {
    const d = designs.get(p.job);
    return d ? Object.entries(d.values).map(([name, value]) => ({ ...p, row: `${name}${d.units[name] ? ` (${d.units[name]})` : ' (fraction)'}`, y: value })) : [];
  });
  return points.length ? curvesSpec(points, `${axes[0]!.name}${axes[0]!.unit ? ` (${axes[0]!.unit})` : ''}`, 'designed value', null) : null;
}

/**
 * Achieved minus goal of every target with a window, one row per target, with the window ±w
 * shaded (w = |achieved − goal|/|residual|, the target's half-width; a job whose residual is zero
 * takes the others' width) and zero dashed. In the target's unit.
 */
export function offsetCurvesSpec(report: CampaignReport, axes: readonly SweepAxis[]): TopLevelSpec | null {
  const points: Point[] = [];
  const band: { row: string; panel: string; x: number; lo: number; hi: number }[] = [];
  for (const p of pointsOf(report, axes)) {
    const job = report.jobs.find((j) => j.name === p.job)!;
    for (const e of job.targets) {
      if (e.role !== 'target' || e.goal === null || e.achieved === null || !['nm', 'µm', 'meV', 'eV', 'cm⁻¹'].includes(e.unit)) continue;
      const row = `${e.label} (${e.unit})`;
      const w = Math.abs(e.residual) > 1e-12 ? Math.abs(e.achieved - e.goal) / Math.abs(e.residual) : NaN;
      points.push({ ...p, row, y: e.achieved - e.goal });
      band.push({ row, panel: p.panel, x: p.x, lo: -w, hi: w });
    }
  }
  // A design exactly on its goal tells no width: it takes its row's.
  const widthOf = new Map(band.filter((b) => Number.isFinite(b.hi)).map((b) => [b.row, b.hi]));
  const filled = band.map((b) => (Number.isFinite(b.hi) ? b : { ...b, lo: -(widthOf.get(b.row) ?? 0), hi: widthOf.get(b.row) ?? 0 })).sort((a, b) => a.x - b.x);
  return points.length ? curvesSpec(points, `${axes[0]!.name}${axes[0]!.unit ? ` (${axes[0]!.unit})` : ''}`, 'achieved − goal', filled) : null;
}

/**
 * The design-curve sections of a campaign report: variables and achieved-minus-goal against the
 * first numeric sweep axis; none when the sweep has no numeric axis or no job is done.
 */
export async function campaignDesignSections(report: CampaignReport, designs: ReadonlyMap<string, JobDesign>): Promise<Section[]> {
  const axes = sweepAxes(report.jobs.map((j) => j.name));
  if (!axes || !axes[0]!.numeric) return [];
  const extra = axes.length > 1 ? `; one column per value of ${axes.slice(1).map((a) => a.name).join(', ')}` : '';
  const out: Section[] = [];
  const variables = variableCurvesSpec(report, designs, axes);
  if (variables) {
    out.push({
      id: 'design-curves', title: `Designed variables against ${axes[0]!.name}`,
      lead: `Each done job's best design: every free variable against the swept ${axes[0]!.name}${extra}.`,
      html: figureHtml(await renderSvg(variables), `Variables of each job's rank-1 design (lengths in nm or ML, fractions without unit, strains in %) versus ${axes[0]!.name}; one row per variable.`),
    });
  }
  const offsets = offsetCurvesSpec(report, axes);
  if (offsets) {
    out.push({
      id: 'target-offsets', title: `Achieved minus goal against ${axes[0]!.name}`,
      lead: `How far each job's best design lands from each target's goal, with the target's window${extra}.`,
      html: figureHtml(await renderSvg(offsets), 'Achieved − goal of every windowed target (its unit); shaded, ± the window half-width; dashed, on goal.'),
    });
  }
  return out;
}
