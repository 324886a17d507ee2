/**
 * The worker pool (piscina). It owns the queue and shutdown; results come back in task order
 * whatever the completion order, so nothing downstream depends on scheduling. One worker runs
 * the tasks in this thread: no start-up cost and the same results.
 */
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { InputError } from './errors.js';
import work, { type WorkerResponse, type WorkerResult, type WorkerTask } from './worker.js';

export const defaultWorkers = (): number => Math.max(1, availableParallelism());

const isTs = import.meta.url.endsWith('.ts');

function unwrap(r: WorkerResponse): WorkerResult {
  if (r.type === 'ok') return r.value;
  if (r.name === 'InputError') throw new InputError((r.code ?? 'bad-value') as InputError['code'], r.message);
  throw new Error(`worker failed: ${r.name}: ${r.message}`);
}

export interface PoolOptions {
  readonly workers: number;
  /** Called after each finished task with the count done so far. */
  readonly onProgress?: (done: number, total: number, last: WorkerResult) => void;
}

export async function runTasks(tasks: readonly WorkerTask[], options: PoolOptions): Promise<WorkerResult[]> {
  const out: WorkerResult[] = new Array(tasks.length);
  let done = 0;
  const finish = (i: number, r: WorkerResult): void => {
    out[i] = r;
    done++;
    options.onProgress?.(done, tasks.length, r);
  };
  if (options.workers <= 1 || tasks.length <= 1) {
    for (const [i, t] of tasks.entries()) {
      finish(i, unwrap(work(t)));
      // Let timers (progress display, signals) run between tasks.
      await new Promise((resolve) => setImmediate(resolve));
    }
    return out;
  }
  const pool = new Piscina<WorkerTask, WorkerResponse>({
    filename: new URL(isTs ? './worker.ts' : './worker.js', import.meta.url).href,
    execArgv: isTs ? ['--import', import.meta.resolve('tsx')] : [],
    minThreads: Math.min(options.workers, tasks.length),
    maxThreads: Math.min(options.workers, tasks.length),
    idleTimeout: 1000,
  });
  try {
    await Promise.all(tasks.map(async (t, i) => finish(i, unwrap(await pool.run(t)))));
  } finally {
    await pool.destroy();
  }
  return out;
}
