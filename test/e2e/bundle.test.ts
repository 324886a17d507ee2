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
import { Piscina } from 'piscina';
import { bundle } from '../../scripts/bundle.js';
import { cli } from '../../engine/cli/app.js';
import { designTasks, DEFAULT_DESIGN_OPTIONS } from '../../engine/design/search.js';
import { loadSpecFile } from '../../engine/input/load.js';
import work, { type WorkerResponse, type WorkerTask } from '../../engine/worker.js';
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

  it('its worker file runs a search start on a pool thread with the result of this thread', async () => {
    const { spec } = loadSpecFile(join(ROOT, 'runs/pump-976.yaml'));
    const task: WorkerTask = designTasks(spec, { ...DEFAULT_DESIGN_OPTIONS, starts: 2, maxEvaluations: 40 })[1]!;
    const pool = new Piscina<WorkerTask, WorkerResponse>({ filename: pathToFileURL(join(ROOT, OUT, 'worker.js')).href, minThreads: 1, maxThreads: 1 });
    try {
      const { thread, ...there } = await pool.run(task);
      const { thread: main, ...here } = work(task);
      expect(thread, 'id of the answering thread').toBeGreaterThan(main);
      expect(there).toEqual(here);
    } finally {
      await pool.destroy();
    }
  });
});
