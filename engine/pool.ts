/**
 * The worker pool (piscina). It owns the queue and shutdown; results come back in task order
 * whatever the completion order, so nothing downstream depends on scheduling.
 *
 * Cold (threads not yet started, or started in this call): this thread is one of the W lanes,
 * beside W − 1 threads, so a search never waits for threads to load the engine (0.1–0.3 s) and
 * warm up their JIT (their first hundreds of evaluations run 2–3× slower); W = 1 needs no thread.
 * Threads start only when they pay (threadsPay): enough work left, and a processor that other
 * processes leave free beside this thread; so in a fresh process --workers 2 is not slower than
 * --workers 1 on a busy machine.
 * Warm (all W threads kept from earlier calls, each having answered): the W threads carry the work
 * and this thread only hands out tasks, since on W cores a (W + 1)-th lane only slows the others
 * (measured, 2 cores, a 64-start search: W threads 0.75–0.83 s, this thread beside one thread
 * 0.88–0.94 s). The W-th thread starts in the first call after the others have answered. At the
 * end this thread also runs tasks still queued in a thread; the first result to arrive is kept.
 * Every task is deterministic, so which lane runs it never changes a result.
 */
import { availableParallelism, cpus } from 'node:os';
import { InputError } from './errors.js';
import work, { type WorkerResponse, type WorkerResult, type WorkerTask } from './worker.js';

export const defaultWorkers = (): number => Math.max(1, availableParallelism());

const isTs = import.meta.url.endsWith('.ts');

function unwrap(r: WorkerResponse): WorkerResult {
  if (r.type === 'ok') return r.value;
  if (r.name === 'InputError') throw new InputError((r.code ?? 'bad-value') as InputError['code'], r.message);
  throw new Error(`worker failed: ${r.name}: ${r.message}`);
}

/**
 * When a cold pool first decides whether threads pay: by then this thread's pace is known from its
 * first tasks (a design start takes 20–80 ms) and the processors' idle time has been sampled.
 */
const DECISION_MS = 150;
/** Later decisions, while much work remains but no processor was idle: the machine's load changes. */
const RECHECK_MS = 500;
/**
 * Spare processors (see spareProcessors) a cold pool needs to see before it starts threads. Another
 * thread only pays where a processor would otherwise idle: on a machine whose processors other work
 * keeps busy, a fresh thread's engine load and JIT warm-up (a third more CPU time in all) only
 * slow this thread down. Measured from the command line on the shared 2-core VM at load 4:
 * 64 starts of the intersubband scenario took 6.8 s with a thread, 4.6 s without.
 */
const MIN_SPARE_PROCESSORS = 0.5;

/**
 * Whether starting threads pays in a cold pool: enough work left (ms at this thread's pace) to
 * repay a thread's engine load and JIT warm-up, and a processor that idles beside this thread
 * (spare processors measured over the last window). Pure, for the decision's tests.
 */
export const threadsPay = (remaining_ms: number, spareProcessors: number): boolean =>
  remaining_ms > MIN_REMAINING_FOR_THREADS_MS && spareProcessors >= MIN_SPARE_PROCESSORS;

/**
 * Processor time spent by other processes so far (ms, summed over processors): all busy time
 * (os.cpus) less this process's own (process.cpuUsage, its V8 compiler and collector threads
 * included). A fresh process keeps both cores of a 2-core machine busy for its first second on its
 * own, so counting idle time alone read "no spare processor" on an idle machine and started the
 * thread 1.9 s into a 3.9 s run (measured, 128 starts of the intersubband scenario).
 */
const othersMs = (): number => {
  const busy = cpus().reduce((a, c) => a + c.times.user + c.times.nice + c.times.sys + c.times.irq, 0);
  const own = process.cpuUsage();
  return busy - (own.user + own.system) / 1000;
};

/** Processors neither this thread nor other processes used over a window from `othersSince` (ms) to `now`. */
const spareProcessors = (othersSince: number, since: number, now: number): number =>
  availableParallelism() - 1 - (othersMs() - othersSince) / (now - since);
/**
 * In a process without threads yet, they are started only when, at this thread's pace so far,
 * more than this much work remains: less does not repay loading and warming them up. Measured on
 * the 2-core VM from the command line (process start included): the intersubband scenario's 64
 * starts took 2.0 s on this thread alone and 2.4 s with a thread started at 0.3 s; 256 starts, 4.4 s
 * alone and 3.8 s with the thread.
 */
const MIN_REMAINING_FOR_THREADS_MS = 3000;
/** Time this process has spent in earlier calls (ms): a host that keeps searching (a campaign, a robust ranking) counts it towards the work threads would repay. */
let earlierWorkMs = 0;

type Pool = import('piscina').Piscina<WorkerTask, WorkerResponse>;

/**
 * The process's worker threads, kept between calls so that a campaign, a robust ranking or a
 * library user running many searches pays thread start-up and JIT warm-up once. Threads are
 * unreferenced between calls, so they never keep the process alive.
 */
let shared: {
  /** W: the pool grows to W threads (W − 1 while cold). */
  readonly threads: number;
  readonly pool: Pool;
  loaded: Promise<unknown> | undefined;
  /** Threads that have answered a task (their ids): loaded and working. */
  readonly answered: Set<number>;
  /** Tasks sent and not yet answered, including ones a call no longer waits for (this thread ran them first). */
  readonly inflight: Set<Promise<unknown>>;
} | undefined;

/**
 * Destroying a thread while it is still loading the engine can abort the process inside V8's
 * module instantiation, and destroying one that is still computing a task makes piscina throw
 * (uncaught) when its answer arrives, so a pool is destroyed only after its first task has come
 * back (the thread has loaded) and its tasks in flight have ended, or after LOAD_WAIT_MS at most.
 */
const LOAD_WAIT_MS = 5000;
async function destroyLoaded(entry: { readonly pool: Pool; loaded: Promise<unknown> | undefined; readonly inflight: Set<Promise<unknown>> }): Promise<void> {
  const settled = Promise.allSettled([...(entry.loaded ? [entry.loaded] : []), ...entry.inflight]);
  await Promise.race([settled, new Promise((resolve) => setTimeout(resolve, LOAD_WAIT_MS).unref())]);
  await entry.pool.destroy();
}

function threadPool(Piscina: typeof import('piscina').Piscina, threads: number): Pool {
  if (shared?.threads === threads) return shared.pool;
  if (shared) void destroyLoaded(shared);
  const pool: Pool = new Piscina<WorkerTask, WorkerResponse>({
    filename: new URL(isTs ? './worker.ts' : './worker.js', import.meta.url).href,
    execArgv: isTs ? ['--import', import.meta.resolve('tsx')] : [],
    // W − 1 threads to begin with; piscina adds the W-th when a call sends tasks for W threads,
    // and never retires a thread (each keeps its warm JIT).
    minThreads: threads - 1,
    maxThreads: threads,
    idleTimeout: Infinity,
    // Tasks are synchronous, so a second task sent ahead waits inside the thread and starts the
    // moment the first ends, instead of waiting for this thread to pause and hand it over.
    concurrentTasksPerWorker: 2,
  });
  shared = { threads, pool, loaded: undefined, answered: new Set(), inflight: new Set() };
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
  /**
   * Called on this thread after each step of a task it runs itself (a design start's Nelder–Mead
   * evaluations), with the task's index: while this thread computes, timers cannot fire, so a
   * progress display is kept current from here. Never called for tasks a worker thread runs.
   */
  readonly onStep?: (task: number) => void;
}

export async function runTasks(tasks: readonly WorkerTask[], options: PoolOptions): Promise<WorkerResult[]> {
  const out: WorkerResult[] = new Array(tasks.length);
  const state = new Uint8Array(tasks.length); // 0 waiting, 1 sent to a thread, 2 done
  let done = 0;
  let next = 0;
  const take = (): number => (next < tasks.length ? next++ : -1);
  let settle: (error?: unknown) => void = () => undefined;
  const finished = new Promise<void>((resolve, reject) => { settle = (error) => (error === undefined ? resolve() : reject(error)); });
  let wake: () => void = () => undefined;
  const finish = (i: number, r: WorkerResult): void => {
    if (state[i] === 2) return;
    state[i] = 2;
    out[i] = r;
    done++;
    options.onProgress?.(done, tasks.length, r);
    wake();
    if (done === tasks.length) settle();
  };
  const threads = Math.min(options.workers, tasks.length);
  const kept = shared?.threads === threads ? shared : undefined;
  // Warm: every one of the W threads has answered before. Growing: the W − 1 threads have; this
  // call starts the W-th, which is cold, so this thread still works.
  const warm = kept !== undefined && kept.answered.size >= threads;
  const lanes = 2 * (kept !== undefined && kept.answered.size >= threads - 1 ? threads : threads - 1);
  let steals = 0;
  const here = async (): Promise<void> => {
    for (;;) {
      // While the threads work through new tasks this thread waits: on W cores a (W + 1)-th lane
      // only slows the others. At the end it runs tasks still queued in a thread: all of them while
      // no thread has loaded, else one per thread (each has one queued behind the one it runs),
      // newest first, the least likely to have started.
      let i = warm ? -1 : take();
      if (i < 0 && next < tasks.length) {
        await new Promise<void>((resolve) => { wake = resolve; });
        continue;
      }
      if (i < 0 && (!warm || steals < threads)) {
        i = state.lastIndexOf(1);
        steals++;
      }
      if (i < 0) return;
      const step = options.onStep;
      finish(i, unwrap(work(tasks[i]!, step && (() => step(i)))));
      // Let pool results, timers (progress display) and signals in between tasks.
      await new Promise((resolve) => setImmediate(resolve));
    }
  };
  if (threads <= 1) {
    const t0 = performance.now();
    await here();
    earlierWorkMs += performance.now() - t0;
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
        const entry = shared?.pool === p ? shared : undefined;
        if (entry) {
          entry.loaded ??= run;
          entry.inflight.add(run);
          const forget = (): void => { entry.inflight.delete(run); };
          run.then(forget, forget);
        }
        const response = await run.catch((e: unknown) => (state[i] === 2 ? null : Promise.reject(e)));
        if (response && entry) entry.answered.add(response.thread);
        if (response && state[i] !== 2) {
          options.onThreadResult?.(i);
          finish(i, unwrap(response));
        }
      }
    };
    // Two tasks in flight per thread: the next one is already queued when a thread finishes,
    // instead of waiting for this thread to hand it one.
    for (let k = 0; k < lanes; k++) lane().catch(settle);
  };
  // Threads start when the work left (at this thread's pace, plus earlier calls' work in this
  // process) would repay them and other processes have left a processor free beside this thread;
  // while the work left is large and none is free, the question is asked again every RECHECK_MS.
  const started = performance.now();
  let timer: ReturnType<typeof setTimeout> | undefined;
  const decide = (since: number, othersSince: number): void => {
    timer = undefined;
    if (done === tasks.length) return;
    const now = performance.now();
    const elapsed = now - started;
    // With no task finished yet, each one takes longer than the time so far.
    const remaining = (elapsed / Math.max(done, 1)) * (tasks.length - done - (done === 0 ? 1 : 0));
    if (remaining + earlierWorkMs <= MIN_REMAINING_FOR_THREADS_MS) return;
    if (threadsPay(remaining + earlierWorkMs, spareProcessors(othersSince, since, now))) startThreads().catch(settle);
    else {
      const othersNow = othersMs();
      timer = setTimeout(() => decide(now, othersNow), RECHECK_MS);
    }
  };
  if (options.eager || kept) timer = setTimeout(() => startThreads().catch(settle), 0);
  else {
    const others0 = othersMs();
    timer = setTimeout(() => decide(started, others0), DECISION_MS);
  }
  try {
    here().catch(settle);
    if (tasks.length > 0) await finished;
  } finally {
    clearTimeout(timer);
    wake();
    if (pool) hold(pool, false);
    earlierWorkMs += performance.now() - started;
  }
  return out;
}
