/**
 * The worker pool (piscina). It owns the queue and shutdown; results come back in task order
 * whatever the completion order, so nothing downstream depends on scheduling. This thread is one
 * of the W workers: it takes tasks from the same queue as W − 1 pool threads, so it works while
 * they start up (loading the engine costs a thread ~0.1–0.3 s), and W = 1 needs no thread at all.
 * When this thread runs out of new tasks it also runs tasks still waiting in a thread that has not
 * started yet; the first result to arrive is kept. Every task is deterministic, so which lane runs
 * it never changes a result.
 */
import { availableParallelism } from 'node:os';
import { InputError } from './errors.js';
import work, { type WorkerResponse, type WorkerResult, type WorkerTask } from './worker.js';

export const defaultWorkers = (): number => Math.max(1, availableParallelism());

const isTs = import.meta.url.endsWith('.ts');

function unwrap(r: WorkerResponse): WorkerResult {
  if (r.type === 'ok') return r.value;
  if (r.name === 'InputError') throw new InputError((r.code ?? 'bad-value') as InputError['code'], r.message);
  throw new Error(`worker failed: ${r.name}: ${r.message}`);
}

/** A thread takes roughly this long to load the engine here (0.1–0.3 s measured on 2 cores), before its JIT warms up. */
const THREAD_START_DELAY_MS = 300;
/** Threads are started only when, at this thread's pace so far, more than this much work remains: less would not repay loading and warming them up. */
const MIN_REMAINING_FOR_THREADS_MS = 500;

type Pool = import('piscina').Piscina<WorkerTask, WorkerResponse>;

/**
 * The process's worker threads, kept between calls so that a campaign, a robust ranking or a
 * library user running many searches pays thread start-up and JIT warm-up once. Threads are
 * unreferenced between calls, so they never keep the process alive.
 */
let shared: { readonly threads: number; readonly pool: Pool; loaded: Promise<unknown> | undefined } | undefined;

/**
 * Destroying a thread while it is still loading the engine can abort the process inside V8's
 * module instantiation, so a pool is destroyed only after its first task has come back (the
 * thread has loaded), or after LOAD_WAIT_MS at most.
 */
const LOAD_WAIT_MS = 5000;
async function destroyLoaded(entry: { readonly pool: Pool; loaded: Promise<unknown> | undefined }): Promise<void> {
  if (entry.loaded) await Promise.race([entry.loaded.catch(() => undefined), new Promise((resolve) => setTimeout(resolve, LOAD_WAIT_MS).unref())]);
  await entry.pool.destroy();
}

function threadPool(Piscina: typeof import('piscina').Piscina, threads: number): Pool {
  if (shared?.threads === threads) return shared.pool;
  if (shared) void destroyLoaded(shared);
  const pool: Pool = new Piscina<WorkerTask, WorkerResponse>({
    filename: new URL(isTs ? './worker.ts' : './worker.js', import.meta.url).href,
    execArgv: isTs ? ['--import', import.meta.resolve('tsx')] : [],
    minThreads: threads,
    maxThreads: threads,
    // Tasks are synchronous, so a second task sent ahead waits inside the thread and starts the
    // moment the first ends, instead of waiting for this thread to pause and hand it over.
    concurrentTasksPerWorker: 2,
  });
  shared = { threads, pool, loaded: undefined };
  return pool;
}

/** Referenced while a call runs (the process waits for its tasks), unreferenced after. */
function hold(pool: Pool, busy: boolean): void {
  for (const t of pool.threads) {
    if (busy) t.ref();
    else t.unref();
  }
}

/** Stops the shared threads (tests and long-lived hosts that want them gone). */
export async function closePool(): Promise<void> {
  const old = shared;
  shared = undefined;
  if (old) await destroyLoaded(old);
}

export interface PoolOptions {
  readonly workers: number;
  /** Start worker threads at once instead of only when the work left would repay them (tests of the thread path). */
  readonly eager?: boolean;
  /** Diagnostics: called with the task index whenever a worker thread's result is the one kept. */
  readonly onThreadResult?: (index: number) => void;
  /** Called after each finished task with the count done so far. */
  readonly onProgress?: (done: number, total: number, last: WorkerResult) => void;
}

export async function runTasks(tasks: readonly WorkerTask[], options: PoolOptions): Promise<WorkerResult[]> {
  const out: WorkerResult[] = new Array(tasks.length);
  const state = new Uint8Array(tasks.length); // 0 waiting, 1 sent to a thread, 2 done
  let done = 0;
  let next = 0;
  const take = (): number => (next < tasks.length ? next++ : -1);
  let settle: (error?: unknown) => void = () => undefined;
  const finished = new Promise<void>((resolve, reject) => { settle = (error) => (error === undefined ? resolve() : reject(error)); });
  const finish = (i: number, r: WorkerResult): void => {
    if (state[i] === 2) return;
    state[i] = 2;
    out[i] = r;
    done++;
    options.onProgress?.(done, tasks.length, r);
    if (done === tasks.length) settle();
  };
  const here = async (): Promise<void> => {
    for (;;) {
      let i = take();
      if (i < 0) i = state.indexOf(1);
      if (i < 0) return;
      finish(i, unwrap(work(tasks[i]!)));
      // Let pool results, timers (progress display) and signals in between tasks.
      await new Promise((resolve) => setImmediate(resolve));
    }
  };
  const threads = Math.min(options.workers, tasks.length) - 1;
  if (threads <= 0) {
    await here();
    return out;
  }
  // Threads start only once this thread has worked for about as long as starting one takes
  // (loading the engine and warming it up): a search that finishes sooner never pays for them.
  // A pool already warm from an earlier call in this process is used at once.
  let pool: Pool | undefined;
  const startThreads = async (): Promise<void> => {
    if (done === tasks.length) return;
    // Loaded only when threads are needed: a one-worker run never pays for it.
    const { Piscina } = await import('piscina');
    if (done === tasks.length) return;
    const p = threadPool(Piscina, threads);
    pool = p;
    hold(p, true);
    const lane = async (): Promise<void> => {
      for (let i = take(); i >= 0 && done < tasks.length; i = take()) {
        state[i] = 1;
        const run = p.run(tasks[i]!);
        if (shared?.pool === p) shared.loaded ??= run;
        const response = await run.catch((e: unknown) => (state[i] === 2 ? null : Promise.reject(e)));
        if (response && state[i] !== 2) {
          options.onThreadResult?.(i);
          finish(i, unwrap(response));
        }
      }
    };
    // Two tasks in flight per thread: the next one is already queued when a thread finishes,
    // instead of waiting for this thread to pause between its own tasks to hand it one.
    for (let k = 0; k < 2 * threads; k++) lane().catch(settle);
  };
  const started = performance.now();
  const timer = setTimeout(() => {
    const elapsed = performance.now() - started;
    const remaining = done > 0 ? (elapsed / done) * (tasks.length - done) : Infinity;
    if (options.eager || shared?.threads === threads || remaining > MIN_REMAINING_FOR_THREADS_MS) startThreads().catch(settle);
  }, options.eager || shared?.threads === threads ? 0 : THREAD_START_DELAY_MS);
  try {
    here().catch(settle);
    if (tasks.length > 0) await finished;
  } finally {
    clearTimeout(timer);
    if (pool) hold(pool, false);
  }
  return out;
}
