/**
 * Output paths are checked before the work starts and never hang: under /proc (where Node's
 * recursive mkdir loops for ever) and with a file in the way of a folder, each command exits 2 at
 * once with one line naming the component and the reason. Run as child processes of the bundled
 * executable (what users run; it starts in a fraction of a second, where a cold tsx start of the
 * sources on a loaded machine took minutes) with a timeout, since the old failure was an endless
 * loop inside one synchronous call.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { bundle } from '../../scripts/bundle.js';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const OUT = `dist/outputs-test-${process.pid}`;
// The hang these guard against never ended: 30 s is far beyond the bundle's start.
const run = (args: string[]) => spawnSync(process.execPath, [join(ROOT, OUT, 'wellsmith.js'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 30_000, killSignal: 'SIGKILL' });

describe('impossible output paths', () => {
  beforeAll(() => bundle(OUT));
  afterAll(() => rmSync(join(ROOT, OUT), { recursive: true, force: true }));
  const dir = mkdtempSync(join(tmpdir(), 'ws-out-'));
  const file = join(dir, 'a-file');
  writeFileSync(file, 'x');

  it.each([
    ['report --out under /proc', ['report', 'runs/pump-976.yaml', '--out', '/proc/wellsmith-test/r.html'], /--out: "\/proc\/wellsmith-test" cannot be created here/],
    ['campaign --out under /proc', ['campaign', 'runs/campaign-telecom.yaml', '--out', '/proc/wellsmith-test'], /--out: "\/proc\/wellsmith-test" cannot be created here/],
    ['report --out below a file', ['report', 'runs/pump-976.yaml', '--out', join(file, 'r.html')], /is a file, not a folder/],
    ['solve --plot below a file', ['solve', 'runs/pump-976.yaml', '--plot', join(file, 'b.svg')], /--plot: .* is a file, not a folder/],
    ['design --out under /proc', ['design', 'runs/pump-976.yaml', '--starts', '1', '--out', '/proc/wellsmith-test'], /"\/proc\/wellsmith-test" cannot be created here/],
  ])('%s: exit 2, one line, no hang', (_name, args, message) => {
    const r = run(args);
    expect(r.error, 'finished before the timeout').toBeUndefined();
    expect(r.status, r.stderr).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
