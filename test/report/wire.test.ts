import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { WIRE_SPEC } from './well-spec.js';


describe('wire report', () => {
  it('reports solve --json --maps output and refuses it without the maps', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-report-wire-'));
    const spec = join(dir, 'wire.yaml');
    writeFileSync(spec, WIRE_SPEC);
    for (const maps of [true, false]) {
      const solved = await cli(['solve', spec, '--json', ...(maps ? ['--maps'] : [])]);
      expect(solved.code, solved.stderr).toBe(0);
      const json = join(dir, `wire-${maps}.json`);
      writeFileSync(json, solved.stdout);
      const out = join(dir, `wire-${maps}.html`);
      const report = await cli(['report', json, '--out', out]);
      if (!maps) {
        expect(report.code, `without --maps: ${report.stderr}`).toBe(2);
        expect(report.stderr).toContain('--maps');
        continue;
      }
      expect(report.code, report.stderr).toBe(0);
      const html = readFileSync(out, 'utf8');
      // Materials map, |ψ|² maps and the 1-D DOS; axes carry units (common practice).
      expect(html.match(/<svg\b/g)?.length).toBe(3);
      for (const id of ['cross-section', 'maps', 'states', 'transitions', 'dos']) expect(html).toContain(`<section id="${id}">`);
      expect(html).toContain('x (nm)');
      expect(html).toContain('e1 (');
    }
  }, 30_000);
});
