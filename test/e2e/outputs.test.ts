/**
 * Output paths are checked before the work starts and never hang: under /proc (where Node's
 * recursive mkdir loops for ever) and with a file in the way of a folder, each command exits 2 at
 * once with one line naming the component and the reason. Run as child processes with a timeout,
 * since the old failure was an endless loop inside one synchronous call.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
// The hang these guard against never ended; the bound only has to exceed a cold start of the CLI
// under tsx on a loaded machine (a fresh clone compiles every module on the first spawn).
const run = (args: string[]) => spawnSync(process.execPath, ['--import', 'tsx', join(ROOT, 'engine/cli/main.ts'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 90_000 });

describe('impossible output paths', () => {
  const dir = mkdtempSync(join(tmpdir(), 'ws-out-'));
  const file = join(dir, 'a-file');
  writeFileSync(file, 'x');

  it.each([
    ['report --out under /proc', ['report', 'runs/pump-976.yaml', '--out', '/proc/wellsmith-test/r.html'], /--out: "\/proc\/wellsmith-test" cannot be created here/],
    ['campaign --out under /proc', ['campaign', 'runs/campaign-telecom.yaml', '--out', '/proc/wellsmith-test'], /--out: "\/proc\/wellsmith-test" cannot be created here/],
    ['report --out below a file', ['report', 'runs/pump-976.yaml', '--out', join(file, 'r.html')], /is a file, not a folder/],
    ['solve --plot below a file', ['solve', 'runs/pump-976.yaml', '--plot', join(file, 'b.svg')], /--plot: .* is a file, not a folder/],
    ['design --out under /proc', ['design', 'runs/pump-976.yaml', '--starts', '1', '--out', '/proc/wellsmith-test'], /"\/proc\/wellsmith-test" cannot be created here/],
  ])('%s: exit 2, one line, no hang', { timeout: 120_000 }, (_name, args, message) => {
    const r = run(args);
    expect(r.error, 'finished before the timeout').toBeUndefined();
    expect(r.status, r.stderr).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
