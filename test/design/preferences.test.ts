/**
 * Preferences (engine/design/preferences.ts), near-duplicate merging (duplicates.ts) and robust
 * yields with Wilson intervals (engine/tolerance/robust.ts). Constructed case: the 976 nm pump well
 * (runs/pump-976.yaml) has a valley of (width, indium) pairs that meet its target; preferring the
 * critical-thickness margin must move the top design to a thinner, less strained well than the
 * plain ranking's, and preferring less indium (thickness × fraction) to a smaller indium content.
 * Wilson intervals are checked against scipy's implementation (test/reference/stacks/wilson.py).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadSpecFile, parseSpecText } from '../../engine/input/load.js';
import { design, type DesignResult } from '../../engine/design/search.js';
import { comparePreferences, compilePreferences } from '../../engine/design/preferences.js';
import { nearDuplicates, stackFingerprint } from '../../engine/design/duplicates.js';
import { separatedOrder, wilsonInterval } from '../../engine/tolerance/robust.js';
import { buildStructure } from '../../engine/structure.js';
import { cli } from '../../engine/cli/app.js';
import type { Spec } from '../../engine/input/schema.js';
import type { SolveResult } from '../../engine/solve.js';

const pump = loadSpecFile('runs/pump-976.yaml').spec;
const withPrefs = (prefer: readonly Record<string, unknown>[]): Spec => parseSpecText(JSON.stringify({ ...pump, prefer })).spec;
const run = (spec: Spec, workers = 1): Promise<DesignResult> => design(spec, { starts: 8, seed: 2, top: 5, workers, compositionStep: 0.001, maxEvaluations: 150 });
const indium = (d: DesignResult['designs'][number]): number => (d.result as SolveResult).structure.layers.reduce((a, l) => a + l.thickness_nm * (l.composition.kind === 'alloy' ? l.composition.alloy.III.In ?? 0 : 0), 0);

describe('design preferences', () => {
  it('maximize critical_margin, or minimize indium: the top design changes as expected, deterministically for any worker count', async () => {
    const plain = await run(pump);
    const margin = await run(withPrefs([{ maximize: 'critical_margin' }]));
    const lessIn = await run(withPrefs([{ minimize: 'indium' }]));
    const top = (r: DesignResult): string => `w ${r.designs[0]!.values.w!.toFixed(3)} nm, x ${r.designs[0]!.values.x!.toFixed(3)}, margin ${r.designs[0]!.criticalMargin.toFixed(4)}, In ${indium(r.designs[0]!).toFixed(4)} nm`;
    console.log(`plain top: ${top(plain)}\nmax critical_margin top: ${top(margin)}\nmin indium top: ${top(lessIn)}`);
    for (const r of [plain, margin, lessIn]) expect(r.status).toBe('ok');
    expect(margin.designs[0]!.criticalMargin, 'margin preferred: larger margin than the plain top design').toBeGreaterThan(plain.designs[0]!.criticalMargin + 0.01);
    expect(indium(lessIn.designs[0]!), 'indium preferred: less indium than the plain top design').toBeLessThan(indium(plain.designs[0]!) - 0.01);
    // Among designs meeting the targets the order is the preference's.
    const met = margin.designs.filter((d) => d.satisfied);
    for (let k = 1; k < met.length; k++) expect(met[k - 1]!.criticalMargin, `rank ${k} vs ${k + 1}`).toBeGreaterThanOrEqual(met[k]!.criticalMargin - 0.005);
    expect(margin.designs[0]!.preferences[0]).toEqual({ label: 'max critical margin', value: margin.designs[0]!.criticalMargin, unit: '' });
    const again = await run(withPrefs([{ maximize: 'critical_margin' }]), 2);
    expect(again.designs.map((d) => d.values)).toEqual(margin.designs.map((d) => d.values));
  }, 60_000);

  it('no two ranked designs are near-duplicates (same monolayers, fractions within one step, or mirrored)', async () => {
    const r = await run(pump);
    const prints = r.designs.map((d) => stackFingerprint((d.result as SolveResult).structure));
    for (let i = 0; i < prints.length; i++) for (let j = i + 1; j < prints.length; j++) expect(nearDuplicates(prints[i]!, prints[j]!, 0.001), `designs ${i + 1} and ${j + 1}`).toBe(false);
    // The rule itself: one composition step apart, and a stack grown in reverse, are near-duplicates.
    const a = stackFingerprint(buildStructure(pump, { w: 7, x: 0.2 }));
    expect(nearDuplicates(a, stackFingerprint(buildStructure(pump, { w: 7, x: 0.201 })), 0.001)).toBe(true);
    expect(nearDuplicates(a, stackFingerprint(buildStructure(pump, { w: 7, x: 0.203 })), 0.001)).toBe(false);
    const reversed = parseSpecText(JSON.stringify({ ...pump, stack: [...pump.stack].reverse() })).spec;
    expect(nearDuplicates(a, stackFingerprint(buildStructure(reversed, { w: 7, x: 0.2 })), 0.001)).toBe(true);
  }, 30_000);

  it('lexicographic comparison: a tie within "within" passes to the next preference; a missing value ranks last', () => {
    const prefs = compilePreferences(withPrefs([{ maximize: 'critical_margin', within: 0.05 }, { minimize: 'indium' }]));
    expect(comparePreferences(prefs, [0.50, 2.0], [0.52, 1.0])).toBeGreaterThan(0);
    expect(comparePreferences(prefs, [0.60, 2.0], [0.52, 1.0])).toBeLessThan(0);
    expect(comparePreferences(prefs, [NaN, 1.0], [0.1, 2.0])).toBeGreaterThan(0);
    expect(() => compilePreferences(withPrefs([{ maximize: 'spacing' }]))).toThrow(/prefer\[0\]\.of: spacing needs the states/);
    expect(() => compilePreferences(withPrefs([{ maximize: 'indium', minimize: 'indium' }]))).toThrow(/prefer\[0\]: give exactly one of maximize or minimize/);
  });
});

describe('robust ranking', () => {
  const fixture = JSON.parse(readFileSync(new URL('../reference/stacks/wilson.json', import.meta.url), 'utf8')) as { cases: { k: number; n: number; low: number; high: number }[] };
  it.each(fixture.cases)('Wilson 95 % interval of $k/$n equals scipy\'s', ({ k, n, low, high }) => {
    const w = wilsonInterval(k, n);
    expect(Math.abs(w.low - low), `low: got ${w.low}, expected ${low}`).toBeLessThan(1e-12);
    expect(Math.abs(w.high - high), `high: got ${w.high}, expected ${high}`).toBeLessThan(1e-12);
  });

  it('reorders only where intervals separate', () => {
    const item = (name: string, k: number, n: number) => ({ name, interval: wilsonInterval(k, n) });
    // 60/100 vs 70/100 overlap: design order stands; 95/100 lies above 60/100 and 70/100.
    expect(separatedOrder([item('a', 60, 100), item('b', 70, 100), item('c', 95, 100)]).map((x) => x.name)).toEqual(['c', 'a', 'b']);
    expect(separatedOrder([item('a', 60, 100), item('b', 70, 100)]).map((x) => x.name)).toEqual(['a', 'b']);
  });

  it('design --robust prints yields with their intervals (CLI, small budget)', async () => {
    const o = await cli(['design', 'runs/pump-976.yaml', '--starts', '3', '--evaluations', '60', '--top', '2', '--robust', '--workers', '1', '--json']);
    const robust = (JSON.parse(o.stdout) as { robust: { ranking: { yield: number; yield_interval_95: [number, number] }[] } }).robust;
    for (const r of robust.ranking) expect(r.yield_interval_95[0] <= r.yield && r.yield <= r.yield_interval_95[1], JSON.stringify(r)).toBe(true);
    console.log(`robust: ${robust.ranking.map((r) => `${(r.yield * 100).toFixed(1)} % [${(r.yield_interval_95[0] * 100).toFixed(1)}, ${(r.yield_interval_95[1] * 100).toFixed(1)}]`).join('; ')}`);
  }, 60_000);
});
