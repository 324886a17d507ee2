/**
 * All ranked designs of a run store as CSV rows: one line per design, one column per variable and,
 * for every target, its achieved value and its goal, each headed by the target's label and unit
 * ("e1-hh1 wavelength (nm)"); text cells cannot start a spreadsheet formula.
 */
import { csvLine as line } from '../text.js';
import type { RunStore } from '../store/store.js';
import type { Evaluation } from '../../objectives/types.js';
import { scoreStoredDesigns } from './score.js';

/**
 * The columns of each of a job's targets: "label (unit)" for the achieved value and "label goal
 * (unit)"; a label the job already has (two targets with one label) gets " #2", " #3" …, so no
 * target's value overwrites another's.
 */
function targetColumns(evaluations: readonly Evaluation[]): { readonly achieved: string; readonly goal: string }[] {
  const seen = new Map<string, number>();
  return evaluations.map((e) => {
    const n = (seen.get(`${e.label}\0${e.unit}`) ?? 0) + 1;
    seen.set(`${e.label}\0${e.unit}`, n);
    const unit = ` (${e.unit || '-'})${n === 1 ? '' : ` #${n}`}`;
    return { achieved: `${e.label}${unit}`, goal: `${e.label} goal${unit}` };
  });
}

export function designsCsv(store: RunStore): string {
  const goals = new Map<string, string>();
  const rows = store.jobs().flatMap((job) => {
    const designs = store.designs(job.name);
    if (designs.length === 0) return [];
    const { scored } = scoreStoredDesigns(job, designs);
    return designs.map((d, k) => {
      const evaluations = scored[k]!.evaluations;
      const columns = targetColumns(evaluations);
      for (const c of columns) goals.set(c.achieved, c.goal);
      return { job, d, values: JSON.parse(d.values_json) as Record<string, number>, reached: new Map(columns.map((c, i) => [c.achieved, evaluations[i]!])) };
    });
  });
  // Variables and targets in order of first appearance: jobs of one campaign may vary different names or have different targets.
  const names = [...new Set(rows.flatMap((r) => Object.keys(r.values)))];
  const targets = [...goals.keys()];
  const out = [line(['job_index', 'job', 'rank', 'loss', 'satisfied', ...names, ...targets.flatMap((t) => [t, goals.get(t)!]), 'start', 'job_status', 'spec_hash'])];
  for (const { job, d, values, reached } of rows) {
    out.push(line([job.idx, d.job, d.rank, d.loss, d.satisfied ? 'yes' : 'no', ...names.map((n) => values[n] ?? NaN),
      ...targets.flatMap((t) => [reached.get(t)?.achieved ?? NaN, reached.get(t)?.goal ?? NaN]), d.start, job.status ?? '', job.hash]));
  }
  return `${out.join('\n')}\n`;
}
