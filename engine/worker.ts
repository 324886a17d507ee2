/**
 * A pool thread (engine/pool.ts): it says when it has loaded the engine, then for each batch takes
 * task indices from the shared counter until none is left, posting each response as it ends.
 */
import { parentPort } from 'node:worker_threads';
import { takeNext, work, type Batch, type ThreadMessage } from './task.js';

const port = parentPort;
if (port) {
  const post = (m: ThreadMessage): void => port.postMessage(m);
  port.on('message', (batch: Batch) => {
    const next = new Int32Array(batch.next);
    for (let i = takeNext(next); i < batch.tasks.length; i = takeNext(next)) {
      post({ type: 'result', id: batch.id, index: i, response: work(batch.tasks[i]!) });
    }
    post({ type: 'idle', id: batch.id });
  });
  post({ type: 'ready' });
}
