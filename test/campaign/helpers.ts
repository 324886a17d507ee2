/** Shared pieces of the campaign tests: a tiny campaign (3 jobs × 4 starts) and its uninterrupted run. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadCampaignFile } from '../../engine/campaign/campaign.js';
import { runCampaign } from '../../engine/campaign/run.js';
import { RunStore } from '../../engine/store/store.js';

export const ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const MAIN = join(ROOT, 'engine/cli/main.ts');

export const tempDir = (tag: string): string => mkdtempSync(join(tmpdir(), `wellsmith-${tag}-`));

/** Writes the tiny campaign into `dir` and returns its path. */
export function tinyCampaign(dir: string): string {
  const file = join(dir, 'tiny.yaml');
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
  const store = RunStore.open(dir, { create: false });
  try { return store.snapshot(); } finally { store.close(); }
}

/** The reference: the whole campaign run in this process without interruption. */
export async function referenceRun(file: string, out: string): Promise<Snapshot> {
  const store = RunStore.open(out);
  try {
    const summary = await runCampaign(loadCampaignFile(file), store, { workers: 1, shard: { index: 1, count: 1 } });
    if (summary.status !== 'complete' || summary.failed.length > 0) throw new Error(`reference run did not complete: ${JSON.stringify(summary)}`);
    return store.snapshot();
  } finally {
    store.close();
  }
}
