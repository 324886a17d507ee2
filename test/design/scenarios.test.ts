/**
 * The two multi-well scenarios of runs/ (invented): the 1.3 µm strain-compensated 5-well
 * AlGaInAs/InP active region, designed end to end with the default search, and the 30-period
 * intersubband detector, solved with every well's own line. Both use the repeat construct and must
 * each run in under 10 s (in-process, so without Node's start-up).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { loadSpecFile } from '../../engine/spec/load.js';
import { solve } from '../../engine/solve.js';
import { compileTargets, scoreTargets } from '../../objectives/index.js';
import { stateWells } from '../../objectives/wells.js';

describe('multi-well scenarios', () => {
  it('runs/laser-1300-sc-mqw.yaml: design with the default search meets 1300 nm, strain balance and the stack critical thickness in under 10 s', async () => {
    expect(readFileSync('runs/laser-1300-sc-mqw.yaml', 'utf8')).toMatch(/periods: 5\n\s+repeat:/);
    const t0 = performance.now();
    const o = await cli(['design', 'runs/laser-1300-sc-mqw.yaml', '--workers', '2', '--json']);
    const seconds = (performance.now() - t0) / 1000;
    const r = JSON.parse(o.stdout) as { status: string; designs: { satisfied: boolean; targets: { label: string; achieved: number }[]; preferences: { label: string; value: number }[] }[] };
    const best = r.designs[0]!;
    console.log(`laser-1300 design: ${seconds.toFixed(2)} s, status ${r.status}; top design ${best.targets.map((t) => `${t.label} ${t.achieved.toFixed(4)}`).join(', ')}; ${best.preferences.map((p) => `${p.label} ${p.value.toFixed(4)}`).join(', ')}`);
    expect(o.code, o.stderr).toBe(0);
    expect(best.satisfied).toBe(true);
    expect(seconds).toBeLessThan(10);
  }, 30_000);

  it('runs/qwip-30-period.yaml: 30 wells, each with its own e1-e2 line, solved in under 10 s', () => {
    const spec = loadSpecFile('runs/qwip-30-period.yaml').spec;
    expect(spec.stack[1]).toMatchObject({ periods: 30 });
    const t0 = performance.now();
    const r = solve(spec);
    const seconds = (performance.now() - t0) / 1000;
    const homes = stateWells(r)!.electron;
    const ev = scoreTargets(compileTargets(spec.targets), r).evaluations;
    console.log(`qwip-30 solve: ${seconds.toFixed(2)} s; ${new Set(homes.map((h) => h.well)).size} wells; ${ev.map((e) => `${e.label} ${e.achieved?.toFixed(4)} ${e.unit}`).join(', ')}`);
    // Every well holds one state of the e1 miniband and one of the e2 miniband: its own e1 and e2.
    for (let k = 1; k <= 30; k++) expect(homes.filter((h) => h.well === `well[${k}]`).map((h) => h.level), `well[${k}]: e1 and e2`).toEqual([1, 2]);
    expect(ev.every((e) => e.satisfied), JSON.stringify(ev)).toBe(true);
    expect(seconds).toBeLessThan(10);
  }, 30_000);
});
