/**
 * The pool's worker: requests and responses are plain data, a union on `type`; an error crosses
 * the thread boundary as {name, code, message}.
 */
import { threadId } from 'node:worker_threads';
import { runStart, type StartOutcome, type StartTask } from './design/start.js';
import { runBatch, type BatchOutcome, type BatchTask } from './tolerance/montecarlo.js';

export type WorkerTask = StartTask | BatchTask;
export type WorkerResult = StartOutcome | BatchOutcome;

/** `thread` is the id of the thread that answered (0 for the main thread), so the pool knows which threads have loaded. */
export type WorkerResponse =
  | { readonly type: 'ok'; readonly value: WorkerResult; readonly thread: number }
  | { readonly type: 'error'; readonly name: string; readonly code: string | undefined; readonly message: string; readonly thread: number };

/** Runs one task; `onStep` is called after each step of a design start (each Nelder–Mead evaluation) on this thread; other tasks report none. */
export function handle(task: WorkerTask, onStep?: () => void): WorkerResult {
  switch (task.type) {
    case 'design-start': return runStart(task, onStep);
    case 'tolerance-batch': return runBatch(task);
  }
}

/** The thread entry point (piscina calls it with the task alone); the pool's own lane passes `onStep` (see handle). */
export default function work(task: WorkerTask, onStep?: () => void): WorkerResponse {
  try {
    return { type: 'ok', value: handle(task, onStep), thread: threadId };
  } catch (e) {
    const err = e instanceof Error ? e : new Error(String(e));
    return { type: 'error', name: err.name, code: (err as { code?: string }).code, message: err.message, thread: threadId };
  }
}
