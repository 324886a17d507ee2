/**
 * The worker pool: W lanes for a call's tasks, results in task order whatever the completion
 * order, so nothing downstream depends on scheduling. Every lane takes the next task index from one
 * shared counter (engine/task.ts Batch): a thread never waits for this thread to hand it work,
 * though this thread may compute for seconds (one start of a gain or wire design) without turning
 * its event loop.
 *
 * Cold (threads not yet started, or started in this call): this thread is one of the W lanes,
 * beside W − 1 threads, so a search never waits for threads to load the engine (0.1–0.3 s) and
 * warm up their JIT (their first hundreds of evaluations run 2–3× slower); W = 1 needs no thread.
 * Threads start only when they pay (threadsPay): enough work left, and a processor that other
 * processes leave free beside this thread; so in a fresh process --workers 2 is not slower than
 * --workers 1 on a busy machine. The question is asked between tasks and between the steps of a
 * task this thread runs, so a long first task does not delay it.
 * Warm (all W threads kept from earlier calls, each having answered): the W threads carry the work
 * and this thread only waits, since on W cores a (W + 1)-th lane only slows the others (measured,
 * 2 cores, a 64-start search: W threads 0.75–0.83 s, this thread beside one thread 0.88–0.94 s).
 * The W-th thread starts in the first call after the others have answered.
 * Every task is deterministic, so which lane runs it never changes a result.
 */
import { availableParallelism, cpus } from 'node:os';
import { Worker } from 'node:worker_threads';
import { InputError } from './errors.js';
import { takeNext, work, type Batch, type ThreadMessage, type WorkerResponse, type WorkerResult, type WorkerTask } from './task.js';

export const defaultWorkers = (): number => Math.max(1, availableParallelism());

const isTs = import.meta.url.endsWith('.ts');

function unwrap(r: WorkerResponse): WorkerResult {
  if (r.type === 'ok') return r.value;
  if (r.name === 'InputError') throw new InputError((r.code ?? 'bad-value') as InputError['code'], r.message);
  throw new Error(`worker failed: ${r.name}: ${r.message}`);
}

/**
 * When a cold pool first decides whether threads pay: by then this thread's pace is known from its
 * first tasks (a design start takes 20–80 ms) or from the time its first task has taken so far,
 * and the processors' idle time has been sampled.
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

/** One pool thread and what this thread knows of it. */
interface Lane {
  readonly worker: Worker;
  /** Settles when the thread has loaded the engine (its 'ready'), or has failed to. */
  readonly loaded: Promise<void>;
  /** Whether it has answered a task: loaded and warmed up. */
  answered: boolean;
  /** Batches sent and not yet run out for it. */
  pending: number;
  /** Settles when `pending` is 0. */
  idle: Promise<void>;
  endIdle: () => void;
}

/**
 * The process's worker threads, kept between calls so that a campaign, a robust ranking or a
 * library user running many searches pays thread start-up and JIT warm-up once. Threads are
 * unreferenced between calls, so they never keep the process alive.
 */
let shared: { readonly threads: number; readonly lanes: Lane[] } | undefined;

/** The calls under way, by batch id: where their threads' results and failures go. */
const calls = new Map<number, { readonly result: (index: number, response: WorkerResponse) => void; readonly fail: (error: Error) => void }>();
let batchIds = 0;

function startLane(): Lane {
  const worker = isTs
    // From the sources (tests, tsx): the thread registers tsx's loader before importing its entry,
    // which Node would otherwise refuse for its .ts extension.
    ? new Worker(`import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))}).then((tsx) => { tsx.register(); return import(${JSON.stringify(new URL('./worker.ts', import.meta.url).href)}); })`, { eval: true })
    : new Worker(new URL('./worker.js', import.meta.url));
  let ready: () => void = () => undefined;
  const lane: Lane = {
    worker,
    loaded: new Promise<void>((resolve) => { ready = resolve; }),
    answered: false,
    pending: 0,
    idle: Promise.resolve(),
    endIdle: () => undefined,
  };
  worker.on('message', (m: ThreadMessage) => {
    if (m.type === 'ready') ready();
    else if (m.type === 'idle') {
      if (--lane.pending === 0) lane.endIdle();
    } else {
      lane.answered = true;
      calls.get(m.id)?.result(m.index, m.response);
    }
  });
  // A thread that fails outside a task (it could not load, ran out of memory) fails the calls under
  // way, and the pool is started afresh by the next call.
  const lost = (error: Error): void => {
    ready();
    lane.endIdle();
    if (shared?.lanes.includes(lane)) {
      const others = shared.lanes.filter((l) => l !== lane);
      shared = undefined;
      void stopLanes(others);
    }
    for (const c of calls.values()) c.fail(error);
  };
  worker.on('error', lost);
  worker.on('exit', (code) => lost(new Error(`a worker thread stopped (exit code ${code})`)));
  return lane;
}

/** Hands a batch to a thread. */
function send(lane: Lane, batch: Batch): void {
  if (lane.pending++ === 0) lane.idle = new Promise<void>((resolve) => { lane.endIdle = resolve; });
  lane.worker.postMessage(batch);
}

/** Threads are referenced while any call runs (the process waits for its tasks), unreferenced after. */
function hold(): void {
  for (const l of shared?.lanes ?? []) {
    if (calls.size > 0) l.worker.ref();
    else l.worker.unref();
  }
}

/**
 * Terminating a thread while it is still loading the engine can abort the process inside V8's
 * module instantiation, so a lane is stopped only after it has loaded and ended its batch, or after
 * LOAD_WAIT_MS at most.
 */
const LOAD_WAIT_MS = 5000;
async function stopLanes(lanes: readonly Lane[]): Promise<void> {
  await Promise.all(lanes.map(async (l) => {
    l.worker.removeAllListeners('exit');
    l.worker.on('exit', () => undefined);
    await Promise.race([Promise.all([l.loaded, l.idle]), new Promise((resolve) => setTimeout(resolve, LOAD_WAIT_MS).unref())]);
    await l.worker.terminate();
  }));
}

/** Stops the shared threads (tests and long-lived hosts that want them gone). */
export async function closePool(): Promise<void> {
  const old = shared;
  shared = undefined;
  if (old) await stopLanes(old.lanes);
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
  const n = tasks.length;
  const out: WorkerResult[] = new Array(n);
  const finished = new Uint8Array(n);
  const next = new Int32Array(new SharedArrayBuffer(4));
  let done = 0;
  let failed = false;
  let settle: (error?: unknown) => void = () => undefined;
  const all = new Promise<void>((resolve, reject) => {
    settle = (error) => {
      if (error === undefined) resolve();
      else {
        failed = true;
        reject(error);
      }
    };
  });
  let wake: () => void = () => undefined;
  const finish = (i: number, r: WorkerResult): void => {
    if (finished[i]) return;
    finished[i] = 1;
    out[i] = r;
    done++;
    options.onProgress?.(done, n, r);
    wake();
    if (done === n) settle();
  };
  /** Runs task i on this thread; `afterStep` is called after each of its steps, after onStep. */
  const runHere = async (i: number, afterStep?: () => void): Promise<void> => {
    const step = options.onStep;
    const hook = step ? (afterStep ? () => { step(i); afterStep(); } : () => step(i)) : afterStep;
    finish(i, unwrap(work(tasks[i]!, hook)));
    // Let thread results, timers (progress display) and signals in between tasks.
    await new Promise((resolve) => setImmediate(resolve));
  };
  const threads = Math.min(options.workers, n);
  const started = performance.now();
  if (threads <= 1) {
    for (let i = 0; i < n; i++) await runHere(i);
    earlierWorkMs += performance.now() - started;
    return out;
  }
  const kept = shared?.threads === threads ? shared : undefined;
  const answered = kept ? kept.lanes.filter((l) => l.answered).length : 0;
  // Warm: every one of the W threads has answered before. Growing: the W − 1 threads have; this
  // call starts the W-th, which is cold, so this thread still works.
  const warm = answered >= threads;
  const id = ++batchIds;
  let lanes: Lane[] | undefined;
  const startThreads = (): void => {
    if (lanes || done === n) return;
    if (!kept) {
      if (shared) void stopLanes(shared.lanes);
      shared = { threads, lanes: [] };
    }
    const pool = shared!;
    const wanted = answered >= threads - 1 && kept ? threads : threads - 1;
    while (pool.lanes.length < wanted) pool.lanes.push(startLane());
    lanes = pool.lanes;
    hold();
    const batch: Batch = { type: 'batch', id, tasks, next: next.buffer as SharedArrayBuffer };
    for (const l of lanes) send(l, batch);
  };
  calls.set(id, {
    result: (index, response) => {
      try {
        const r = unwrap(response);
        if (!finished[index]) options.onThreadResult?.(index);
        finish(index, r);
      } catch (e) {
        settle(e);
      }
    },
    fail: (error) => settle(error),
  });
  // A failure after this call has ended is nobody's to handle.
  all.catch(() => undefined);
  // Threads start when the work left (at this thread's pace, plus earlier calls' work in this
  // process) would repay them and other processes have left a processor free beside this thread.
  let decided = false;
  let since = started;
  let othersSince = othersMs();
  let checkAt = started + DECISION_MS;
  const consider = (): void => {
    if (decided || lanes) return;
    const now = performance.now();
    if (now < checkAt) return;
    const elapsed = now - started;
    // With no task finished yet, each one takes longer than the time so far: ask again later.
    const remaining = (elapsed / Math.max(done, 1)) * (n - done - (done === 0 ? 1 : 0));
    if (done > 0 && remaining + earlierWorkMs <= MIN_REMAINING_FOR_THREADS_MS) {
      decided = true;
      return;
    }
    if (threadsPay(remaining + earlierWorkMs, spareProcessors(othersSince, since, now))) startThreads();
    else {
      since = now;
      othersSince = othersMs();
      checkAt = now + RECHECK_MS;
    }
  };
  if (options.eager || kept) startThreads();
  const here = async (): Promise<void> => {
    // While threads work through the tasks this thread waits (warm), or takes its share (cold).
    for (let i = warm ? n : takeNext(next); i < n && !failed; i = takeNext(next)) {
      await runHere(i, consider);
      consider();
    }
  };
  try {
    await here();
    // Also when this thread has done every task: a thread that failed fails the call.
    await all;
  } finally {
    // A failed call leaves nothing for the threads to take.
    Atomics.store(next, 0, n);
    calls.delete(id);
    wake();
    hold();
    earlierWorkMs += performance.now() - started;
  }
  return out;
}
