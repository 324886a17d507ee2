/** Size limits checked before work starts (a spec of millions of layers used to run out of memory after minutes). */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { MAX_SPEC_BYTES } from '../../engine/input/load.js';

describe('input size limits', () => {
  it('a spec file above the limit is refused at once with exit 2, naming the limit', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-limits-'));
    const line = '  - { material: GaAs, thickness: 1 nm }\n';
    const file = join(dir, 'huge.yaml');
    writeFileSync(file, `stack:\n${line.repeat(Math.ceil(MAX_SPEC_BYTES / line.length) + 1)}`);
    const started = Date.now();
    const out = await cli(['solve', file]);
    expect(out.code).toBe(2);
    expect(out.stderr).toMatch(/MiB, more than the limit of 4 MiB/);
    expect(Date.now() - started, 'refused before parsing (parsing it took minutes)').toBeLessThan(10_000);
  });
});
