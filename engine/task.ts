/**
 * What the pool runs: tasks and responses are plain data, a union on `type`; an error crosses the
 * thread boundary as {name, code, message}. A batch is how the pool hands tasks to a thread
 * (engine/worker.ts): every lane takes the next task index from one shared counter, so a thread
 * never waits for the main thread, which may be computing for seconds without turning its event loop.
 */
import { threadId } from 'node:worker_threads';
import { runStart, type StartOutcome, type StartTask } from './design/start.js';
import { runBatch, type BatchOutcome, type BatchTask } from './tolerance/montecarlo.js';

export type WorkerTask = StartTask | BatchTask;
export type WorkerResult = StartOutcome | BatchOutcome;

/** `thread` is the id of the thread that answered (0 for the main thread), so the pool knows which threads have worked. */
export type WorkerResponse =
  | { readonly type: 'ok'; readonly value: WorkerResult; readonly thread: number }
  | { readonly type: 'error'; readonly name: string; readonly code: string | undefined; readonly message: string; readonly thread: number };

/** Main thread to worker thread: the tasks of one call and the counter (an Int32Array's buffer) from which every lane takes the next index. */
export interface Batch {
  readonly type: 'batch';
  readonly id: number;
  readonly tasks: readonly WorkerTask[];
  readonly next: SharedArrayBuffer;
}

/** Worker thread to main thread: loaded; one task's response; the batch's counter ran out. */
export type ThreadMessage =
  | { readonly type: 'ready' }
  | { readonly type: 'result'; readonly id: number; readonly index: number; readonly response: WorkerResponse }
  | { readonly type: 'idle'; readonly id: number };

/** Takes the next task index of a batch (any lane, any thread); `tasks.length` or more when none is left. */
export const takeNext = (next: Int32Array): number => Atomics.add(next, 0, 1);

/** Runs one task; `onStep` is called after each step of a design start (each Nelder–Mead evaluation); other tasks report none. */
export function handle(task: WorkerTask, onStep?: () => void): WorkerResult {
  switch (task.type) {
    case 'design-start': return runStart(task, onStep);
    case 'tolerance-batch': return runBatch(task);
  }
}

/** One task, its error caught into the response. */
export function work(task: WorkerTask, onStep?: () => void): WorkerResponse {
  try {
    return { type: 'ok', value: handle(task, onStep), thread: threadId };
  } catch (e) {
    const err = e instanceof Error ? e : new Error(String(e));
    return { type: 'error', name: err.name, code: (err as { code?: string }).code, message: err.message, thread: threadId };
  }
}
