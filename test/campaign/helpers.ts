/** Shared pieces of the campaign tests: a tiny campaign (3 jobs × 4 starts), its uninterrupted run, the CLI as a child process. */
import { spawn, type SpawnOptions } from 'node:child_process';
import { mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadCampaignFile } from '../../engine/campaign/campaign.js';
import { runCampaign } from '../../engine/campaign/run.js';
import { RunStore } from '../../engine/store/store.js';

export const ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const MAIN = join(ROOT, 'engine/cli/main.ts');

export const tempDir = (tag: string): string => mkdtempSync(join(tmpdir(), `wellsmith-${tag}-`));

/** The jobs of the tiny campaign, in order. */
export const TINY_JOBS = ['wavelength=1480nm', 'wavelength=1550nm', 'wavelength=1600nm'];

/** Writes the tiny campaign into `dir` and returns its path. */
export function tinyCampaign(dir: string, name = 'tiny.yaml'): string {
  const file = join(dir, name);
  writeFileSync(file, [
    'title: tiny test campaign',
    `spec: ${JSON.stringify(join(ROOT, 'runs/telecom-1550-inp.yaml'))}`,
    'design: { starts: 4, top: 2, seed: 3, evaluations: 20 }',
    'sweep:',
    "  targets[0].wavelength: ['1480 nm', '1550 nm', '1600 nm']",
    '',
  ].join('\n'));
  return file;
}

export type Snapshot = ReturnType<RunStore['snapshot']>;

export function snapshotOf(dir: string): Snapshot {
  const store = RunStore.open(dir, { readonly: true });
  try { return store.snapshot(); } finally { store.close(); }
}

/** The reference: the whole campaign run in this process without interruption. */
export async function referenceRun(file: string, out: string): Promise<Snapshot> {
  return (await referenceRunSized(file, out)).snapshot;
}

/**
 * The reference run, with the sizes its files reached (bytes) just before the store was closed:
 * the store file, its write-ahead log (at its largest then: closing checkpoints and removes it) and
 * the shared-memory index. Disk-full tests set their limits from these.
 */
export async function referenceRunSized(file: string, out: string): Promise<{ snapshot: Snapshot; bytes: { db: number; wal: number; shm: number } }> {
  const store = RunStore.open(out);
  try {
    const summary = await runCampaign(loadCampaignFile(file), store, { workers: 1, shard: { index: 1, count: 1 } });
    if (summary.status !== 'complete' || summary.failed.length > 0) throw new Error(`reference run did not complete: ${JSON.stringify(summary)}`);
    const size = (suffix: string): number => statSync(`${store.path}${suffix}`).size;
    return { snapshot: store.snapshot(), bytes: { db: size(''), wal: size('-wal'), shm: size('-shm') } };
  } finally {
    store.close();
  }
}

export interface Ended { readonly code: number | null; readonly signal: NodeJS.Signals | null; readonly stdout: string; readonly stderr: string }

/**
 * Runs the wellsmith CLI from source as a child process. `shell` is bash text run first (e.g.
 * "ulimit -f 400"); `onSpawn` gets the child (to stop or kill it).
 */
export function spawnCli(args: readonly string[], options: { shell?: string; spawn?: SpawnOptions; onSpawn?: (child: ReturnType<typeof spawn>) => void } = {}): Promise<Ended> {
  const argv = [process.execPath, '--import', 'tsx', MAIN, ...args];
  const [cmd, ...rest] = options.shell === undefined ? argv : ['bash', '-c', `${options.shell}; exec "$0" "$@"`, ...argv];
  return new Promise((resolve, reject) => {
    const child = spawn(cmd!, rest, { cwd: ROOT, ...options.spawn, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout!.on('data', (d: Buffer) => { stdout += d.toString(); });
    child.stderr!.on('data', (d: Buffer) => { stderr += d.toString(); });
    child.on('error', reject);
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
    options.onSpawn?.(child);
  });
}
