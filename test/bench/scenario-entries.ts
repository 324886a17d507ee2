/**
 * Whole-command timings of the multi-well scenarios of runs/, as users run them (the bundled CLI,
 * process start included): each must finish in under 10 s on this 2-core machine. Timings belong
 * here, not in tests, where a loaded machine would make them fail at random.
 */
import { spawnSync } from 'node:child_process';
import { ensureBuilt, ROOT } from './entries.js';
import type { BenchEntry } from './harness.js';

const command = (args: readonly string[]): BenchEntry['prepare'] => () => {
  const main = ensureBuilt();
  return {
    policy: { warmup: 0, minRuns: 3, maxRuns: 5, minTime_ms: 1000 },
    run: () => {
      const r = spawnSync(process.execPath, [main, ...args], { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 << 20 });
      if (r.status !== 0) throw new Error(`wellsmith ${args.join(' ')} exited ${r.status}: ${r.stderr.trim()}`);
      return [r.status];
    },
  };
};

export const SCENARIO_ENTRIES: readonly BenchEntry[] = [
  {
    name: 'CLI design runs/laser-1300-sc-mqw.yaml (5-well strain-compensated, repeat construct, 2 workers)',
    target: { text: '< 10 s wall', met: (r) => r.median_ms < 10_000 },
    prepare: command(['design', 'runs/laser-1300-sc-mqw.yaml', '--workers', '2']),
  },
  {
    name: 'CLI solve runs/qwip-30-period.yaml (30 periods, repeat construct)',
    target: { text: '< 10 s wall', met: (r) => r.median_ms < 10_000 },
    prepare: command(['solve', 'runs/qwip-30-period.yaml']),
  },
];
