/** `wellsmith merge OUT DIR...`: joins the run stores of shards into OUT's store; merging again changes nothing. */
import { RunStore } from '../store/store.js';
import { failure, success, type Outcome } from './exit.js';

export function runMerge(args: { readonly out: string; readonly dirs: readonly string[] }): Outcome {
  let target: RunStore | undefined;
  try {
    // Open every source first: a bad one must stop the merge before OUT is created or changed.
    const sources = args.dirs.map((d) => RunStore.open(d, { create: false }));
    const lines: string[] = [];
    try {
      target = RunStore.open(args.out);
      for (const s of sources) {
        if (s.path === target.path) continue;
        const r = target.mergeFrom(s);
        lines.push(`${s.path}: ${r.jobs} jobs and ${r.starts} starts added`);
      }
    } finally {
      for (const s of sources) s.close();
    }
    const jobs = target.jobs();
    const count = (state: string): number => jobs.filter((j) => j.state === state).length;
    lines.push(`${target.path}: ${jobs.length} jobs (${count('done')} done, ${count('failed')} failed, ${count('queued')} queued)`);
    return success(`${lines.join('\n')}\n`);
  } catch (e) {
    return failure(e);
  } finally {
    target?.close();
  }
}
