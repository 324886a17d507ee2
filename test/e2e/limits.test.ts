/** Size limits checked before work starts (a spec of millions of layers used to run out of memory after minutes). */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { MAX_SPEC_BYTES } from '../../engine/input/load.js';
import { MAX_SAMPLES } from '../../engine/tolerance/analyse.js';

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

  it('--samples above its maximum is refused before any sample runs, naming the limit', async () => {
    const started = Date.now();
    const out = await cli(['tolerance', 'runs/pump-976.yaml', '--samples', String(MAX_SAMPLES * 10)]);
    expect(out.code).toBe(2);
    expect(out.stderr.trim().split('\n')).toHaveLength(1);
    expect(out.stderr).toMatch(/--samples/);
    expect(out.stderr).toContain(String(MAX_SAMPLES).slice(0, 2));
    expect(Date.now() - started, 'refused at once').toBeLessThan(10_000);
  });

  it('a wire grid of more than 400 nodes a side is refused before solving, naming the limit and the fix', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-limits-'));
    const file = join(dir, 'fine-wire.yaml');
    writeFileSync(file, [
      'substrate: GaAs',
      'wire:',
      '  barrier: Al0.3Ga0.7As',
      '  shape: { kind: rectangle, material: GaAs, width: 10 nm, height: 6 nm }',
      '  grid: 0.02 nm',
      '  margin: 6 nm',
    ].join('\n'));
    const out = await cli(['solve', file]);
    expect(out.code).toBe(2);
    expect(out.stderr).toMatch(/wire\.grid: .*more than 400 nodes a side; give a coarser grid/);
  });
});
