import { afterAll, describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/spec/load.js';
import { readFileSync } from 'node:fs';
import { designTasks, DEFAULT_DESIGN_OPTIONS } from '../../engine/design/search.js';
import { closePool, runTasks } from '../../engine/pool.js';

afterAll(closePool);

describe('worker pool', () => {
  it('gives the same results in task order from this thread alone and with a worker thread (deterministic tasks)', async () => {
    // Enough work (intersubband targets sample wavefunctions) for a worker thread, which must
    // first load the engine, to finish some tasks itself.
    const { spec } = parseSpecText(readFileSync('runs/qwip-9um.yaml', 'utf8'));
    const tasks = designTasks(spec, { ...DEFAULT_DESIGN_OPTIONS, starts: 160, maxEvaluations: 60 });
    const alone = await runTasks(tasks, { workers: 1 });
    const fromThread: number[] = [];
    const pooled = await runTasks(tasks, { workers: 2, eager: true, onThreadResult: (i) => fromThread.push(i) });
    expect(fromThread.length, 'tasks finished by the worker thread').toBeGreaterThan(0);
    expect(pooled).toEqual(alone);
  }, 120_000);
});
