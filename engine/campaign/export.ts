/** All ranked designs of a run store as CSV rows: one line per design, one column per variable; text cells cannot start a spreadsheet formula. */
import { csvLine as line } from '../text.js';
import type { RunStore } from '../store/store.js';

export function designsCsv(store: RunStore): string {
  const jobs = new Map(store.jobs().map((j) => [j.name, j]));
  const designs = store.designs().map((d) => ({ ...d, values: JSON.parse(d.values_json) as Record<string, number> }));
  // Variables in order of first appearance: alternative stacks of one campaign may vary different names.
  const names = [...new Set(designs.flatMap((d) => Object.keys(d.values)))];
  const rows = [line(['job_index', 'job', 'rank', 'loss', 'satisfied', ...names, 'start', 'job_status', 'spec_hash'])];
  for (const d of designs) {
    const job = jobs.get(d.job)!;
    rows.push(line([job.idx, d.job, d.rank, d.loss, d.satisfied ? 'yes' : 'no', ...names.map((n) => d.values[n] ?? NaN), d.start, job.status ?? '', job.hash]));
  }
  return `${rows.join('\n')}\n`;
}
