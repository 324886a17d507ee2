/**
 * The two multi-well scenarios of runs/ (invented): the 1.3 µm strain-compensated 5-well
 * AlGaInAs/InP active region, designed end to end with the default search, and the 30-period
 * intersubband detector, solved with every well's own line. Both use the repeat construct; their
 * run times (under 10 s each) are measured by `npm run bench` (test/bench/scenario-entries.ts), not
 * here, where a loaded machine would fail them at random.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { loadSpecFile } from '../../engine/input/load.js';
import { solve } from '../../engine/solve.js';
import { compileTargets, scoreTargets } from '../../objectives/index.js';
import { stateWells } from '../../objectives/wells.js';

describe('multi-well scenarios', () => {
  it('runs/laser-1300-sc-mqw.yaml: design with the default search meets 1300 nm, strain balance and the stack critical thickness', async () => {
    expect(readFileSync('runs/laser-1300-sc-mqw.yaml', 'utf8')).toMatch(/periods: 5\n\s+repeat:/);
    const o = await cli(['design', 'runs/laser-1300-sc-mqw.yaml', '--workers', '2', '--json']);
    const r = JSON.parse(o.stdout) as { status: string; designs: { satisfied: boolean; targets: { label: string; achieved: number }[]; preferences: { label: string; value: number }[] }[] };
    const best = r.designs[0]!;
    expect(o.code, o.stderr).toBe(0);
    expect(best.satisfied, `status ${r.status}; top design ${best.targets.map((t) => `${t.label} ${t.achieved.toFixed(4)}`).join(', ')}`).toBe(true);
  }, 120_000);

  it('runs/qwip-30-period.yaml: 30 wells, each with its own e1-e2 line', () => {
    const spec = loadSpecFile('runs/qwip-30-period.yaml').spec;
    expect(spec.stack[1]).toMatchObject({ periods: 30 });
    const r = solve(spec);
    const homes = stateWells(r)!.electron;
    const ev = scoreTargets(compileTargets(spec.targets), r).evaluations;
    // Every well holds one state of the e1 miniband and one of the e2 miniband: its own e1 and e2.
    for (let k = 1; k <= 30; k++) expect(homes.filter((h) => h.well === `well[${k}]`).map((h) => h.level), `well[${k}]: e1 and e2`).toEqual([1, 2]);
    expect(ev.every((e) => e.satisfied), JSON.stringify(ev)).toBe(true);
  }, 120_000);
});
