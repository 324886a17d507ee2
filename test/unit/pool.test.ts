import { afterAll, describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { readFileSync } from 'node:fs';
import { designTasks, DEFAULT_DESIGN_OPTIONS } from '../../engine/design/search.js';
import { closePool, runTasks, threadsPay } from '../../engine/pool.js';
import { batchTasks, DEFAULT_GROWTH } from '../../engine/tolerance/montecarlo.js';
import { nominalVariables } from '../../engine/structure.js';

afterAll(closePool);

/** Runs the tasks on this thread alone and with worker threads started at once: the results must agree and threads must have finished some. */
async function expectThreadsAgree(tasks: Parameters<typeof runTasks>[0], what: string): Promise<void> {
  const alone = await runTasks(tasks, { workers: 1 });
  const fromThread: number[] = [];
  const pooled = await runTasks(tasks, { workers: 2, eager: true, onThreadResult: (i) => fromThread.push(i) });
  expect(fromThread.length, `${what} finished by a worker thread`).toBeGreaterThan(0);
  expect(pooled).toEqual(alone);
}

const specOf = (file: string) => parseSpecText(readFileSync(file, 'utf8')).spec;

describe('worker pool', () => {
  it('a cold pool starts threads only for enough work and with a processor to spare (engine/pool.ts threadsPay)', () => {
    // Measured from the command line on the 2-core VM at load 4: 64 design starts, 6.8 s with a
    // fresh thread against 4.6 s without (no idle processor); a thread needs about 3 s of work to pay.
    expect(threadsPay(10_000, 0.9)).toBe(true);
    expect(threadsPay(10_000, 0.1), 'no idle processor beside this thread').toBe(false);
    expect(threadsPay(1_000, 1.0), 'too little work left to repay a thread').toBe(false);
  });

  it('gives the same results in task order from this thread alone and with a worker thread (deterministic tasks)', async () => {
    // Enough work (intersubband targets sample wavefunctions) for a worker thread, which must
    // first load the engine, to finish some tasks itself.
    await expectThreadsAgree(designTasks(specOf('runs/qwip-9um.yaml'), { ...DEFAULT_DESIGN_OPTIONS, starts: 160, maxEvaluations: 60 }), 'design starts');
  }, 120_000);

  it('runs tolerance Monte Carlo batches on a worker thread with the samples of this thread (deterministic per sample)', async () => {
    const spec = specOf('runs/pump-976.yaml');
    await expectThreadsAgree(batchTasks(spec, nominalVariables(spec), DEFAULT_GROWTH, 9, 600, 20), 'Monte Carlo batches');
  }, 120_000);

  it('a thread takes task after task while this thread computes one long task (shared counter; no hand-over through the event loop)', async () => {
    await closePool();
    const tasks = designTasks(specOf('runs/qwip-9um.yaml'), { ...DEFAULT_DESIGN_OPTIONS, starts: 12, maxEvaluations: 60 });
    const alone = await runTasks(tasks, { workers: 1 });
    // 50 ms of blocking per evaluation on this thread: its first start takes about 3 s without one
    // turn of its event loop. Handed over through messages, a thread got two tasks per turn (4 to 6
    // of 12); taking indices itself, it runs all but the one or two started here.
    const pause = new Int32Array(new SharedArrayBuffer(4));
    const fromThread: number[] = [];
    const pooled = await runTasks(tasks, { workers: 2, eager: true, onStep: () => { Atomics.wait(pause, 0, 0, 50); }, onThreadResult: (i) => fromThread.push(i) });
    expect(pooled).toEqual(alone);
    expect(fromThread.length, `tasks from the thread: ${fromThread.join(', ')}`).toBeGreaterThanOrEqual(tasks.length - 3);
  }, 120_000);

  it('once both kept threads have answered, they carry the work (engine/pool.ts)', async () => {
    await closePool();
    const tasks = designTasks(specOf('runs/qwip-9um.yaml'), { ...DEFAULT_DESIGN_OPTIONS, starts: 40, maxEvaluations: 100 });
    const alone = await runTasks(tasks, { workers: 1 });
    const fromThreads: number[] = [];
    // The first calls start one thread beside this one, then add the second (each loads the engine,
    // slowly under tsx); once both have answered a call, they are warm.
    for (let call = 0; call < 8 && fromThreads.at(-1) !== tasks.length; call++) {
      let n = 0;
      const pooled = await runTasks(tasks, { workers: 2, eager: true, onThreadResult: () => n++ });
      expect(pooled, `call ${call + 1}: results as on this thread alone`).toEqual(alone);
      fromThreads.push(n);
    }
    // Warm: the threads run every task; this thread waits.
    expect(fromThreads.at(-1), `tasks kept from threads per call: ${fromThreads.join(', ')}`).toBe(tasks.length);
  }, 120_000);
});
