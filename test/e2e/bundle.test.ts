/**
 * The bundled executable (scripts/bundle.ts, what `npm ci` installs as `wellsmith`) behaves as the
 * sources do: same output, its version from any folder, and its worker file serving the pool.
 * It is bundled afresh into a folder of its own under dist/, so node_modules resolve as installed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { bundle } from '../../scripts/bundle.js';
import { cli } from '../../engine/cli/app.js';
import { designTasks, DEFAULT_DESIGN_OPTIONS } from '../../engine/design/search.js';
import { loadSpecFile } from '../../engine/input/load.js';
import { work, type Batch, type ThreadMessage, type WorkerTask } from '../../engine/task.js';
import { ROOT } from '../campaign/helpers.js';

const OUT = `dist/bundle-test-${process.pid}`;
const run = (args: string[], cwd = ROOT) => spawnSync(process.execPath, [join(ROOT, OUT, 'wellsmith.js'), ...args], { cwd, encoding: 'utf8' });

describe('bundled command', () => {
  beforeAll(() => bundle(OUT));
  afterAll(() => rmSync(join(ROOT, OUT), { recursive: true, force: true }));

  it('prints the package version from a folder outside the project', () => {
    const r = run(['--version'], tmpdir());
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.trim()).toBe((JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { version: string }).version);
  });

  it('designs the 976 nm scenario exactly as the sources do (--json byte for byte)', async () => {
    const args = ['design', 'runs/pump-976.yaml', '--starts', '4', '--seed', '3', '--json', '--workers', '1'];
    const r = run(args);
    const here = await cli(args);
    expect(r.status, r.stderr).toBe(here.code);
    expect(r.stdout).toBe(here.stdout);
  });

  it('its worker file runs a search start of a batch on a pool thread with the result of this thread', async () => {
    const { spec } = loadSpecFile(join(ROOT, 'runs/pump-976.yaml'));
    const task: WorkerTask = designTasks(spec, { ...DEFAULT_DESIGN_OPTIONS, starts: 2, maxEvaluations: 40 })[1]!;
    const thread = new Worker(join(ROOT, OUT, 'worker.js'));
    try {
      const answers: ThreadMessage[] = [];
      const ended = new Promise<void>((resolve, reject) => {
        thread.on('error', reject);
        thread.on('message', (m: ThreadMessage) => {
          answers.push(m);
          if (m.type === 'idle') resolve();
        });
      });
      const batch: Batch = { type: 'batch', id: 7, tasks: [task], next: new SharedArrayBuffer(4) };
      thread.postMessage(batch);
      await ended;
      expect(answers.map((m) => m.type), 'loaded, answered, ran out of tasks').toEqual(['ready', 'result', 'idle']);
      const answer = answers[1]!;
      if (answer.type !== 'result') throw new Error('no result');
      const { thread: there, ...fromThread } = answer.response;
      const { thread: main, ...here } = work(task);
      expect(answer.index).toBe(0);
      expect(there, 'id of the answering thread').toBeGreaterThan(main);
      expect(fromThread).toEqual(here);
    } finally {
      await thread.terminate();
    }
  });
});
