/**
 * Child process of creation.test.ts: creates run stores in PARENT/run-0, run-1, … until it is
 * killed, the way `campaign` (RunStore.open) or `merge` (its target) create them.
 * Usage: node --import tsx store-creator.ts PARENT campaign|merge
 */
import { join } from 'node:path';
import { runMerge } from '../../engine/cli/merge.js';
import { RunStore } from '../../engine/store/store.js';

const [parent, how] = process.argv.slice(2) as [string, string];
for (let i = 0; ; i++) {
  const out = join(parent, `run-${i}`);
  if (how === 'merge') {
    const r = runMerge({ out, dirs: [] });
    if (r.code !== 0) throw new Error(r.stderr);
  } else {
    RunStore.open(out).close();
  }
}
