import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';

const dir = mkdtempSync(join(tmpdir(), 'wellsmith-campaign-json-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('campaign --json', () => {
  it('prints the run summary and every job with its ranked designs, and a rerun reuses everything', async () => {
    const first = await cli(['campaign', 'runs/campaign-telecom.yaml', '--out', dir, '--workers', '1', '--json']);
    expect(first.code, first.stderr).toBe(0);
    const r = JSON.parse(first.stdout) as { summary: { jobs: number; ran: number }; jobs: { name: string; state: string; designs: { rank: number; values: Record<string, number> }[] }[] };
    expect(r.summary.jobs).toBe(3);
    expect(r.jobs.map((j) => j.name)).toEqual(['wavelength=1450nm', 'wavelength=1530nm', 'wavelength=1610nm']);
    for (const j of r.jobs) {
      expect(j.state).toBe('done');
      expect(j.designs[0]!.rank).toBe(1);
      expect(Object.keys(j.designs[0]!.values)).toEqual(['w', 'x']);
    }
    const again = JSON.parse((await cli(['campaign', 'runs/campaign-telecom.yaml', '--out', dir, '--workers', '1', '--json'])).stdout) as { summary: { ran: number; alreadyDone: number }; jobs: unknown };
    expect(again.summary).toMatchObject({ ran: 0, alreadyDone: 3 });
    expect(again.jobs).toEqual(r.jobs);
  });
});
