/**
 * `wellsmith merge OUT DIR...`: joins the run stores of shards into OUT's store; merging again
 * changes nothing. Every source is read only and checked whole (integrity, schema, stored JSON)
 * before OUT is created or changed: a damaged shard is refused by name and OUT stays as it was.
 */
import { RunStore } from '../store/store.js';
import { failure, success, type Outcome } from './exit.js';

export function runMerge(args: { readonly out: string; readonly dirs: readonly string[] }): Outcome {
  let target: RunStore | undefined;
  const sources: RunStore[] = [];
  try {
    for (const d of args.dirs) {
      const s = RunStore.open(d, { readonly: true });
      sources.push(s);
      s.verify();
    }
    const lines: string[] = [];
    target = RunStore.open(args.out);
    for (const s of sources) {
      if (s.path === target.path) continue;
      const r = target.mergeFrom(s);
      lines.push(`${s.path}: ${r.jobs} jobs and ${r.starts} starts added`);
    }
    const jobs = target.jobs();
    const count = (state: string): number => jobs.filter((j) => j.state === state).length;
    lines.push(`${target.path}: ${jobs.length} jobs (${count('done')} done, ${count('failed')} failed, ${count('queued')} queued)`);
    return success(`${lines.join('\n')}\n`);
  } catch (e) {
    return failure(e);
  } finally {
    for (const s of sources) s.close();
    target?.close();
  }
}
