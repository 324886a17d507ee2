/**
 * `wellsmith design` as a user runs it: bounds and whole monolayers, written designs that `solve`
 * reproduces bit for bit, worker-count independence, and an unreachable target.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';

const SPEC = 'test/fixtures/design/ingaas-two-variable.yaml';
const UNREACHABLE = 'test/fixtures/design/ingaas-unreachable.yaml';
const SMALL = ['--starts', '4', '--evaluations', '80', '--seed', '7', '--top', '3', '--json'];

interface JsonVariable { name: string; kind: string; value: number; nm?: number; ml?: number; atBound: string | null }
interface JsonTransition { label: string; energy_eV: number; wavelength_nm: number }
interface JsonDesign { rank: number; satisfied: boolean; variables: JsonVariable[]; transitions: JsonTransition[]; targets: { achieved: number | null; goal: number; satisfied: boolean }[] }

describe('wellsmith design outputs', () => {
  const dir = mkdtempSync(join(tmpdir(), 'wellsmith-design-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('designs respect the bounds, are whole monolayers, and solve on each written file reproduces them exactly', async () => {
    const out = join(dir, 'out');
    const o = await cli(['design', SPEC, ...SMALL, '--workers', '1', '--out', out]);
    expect(o.code, o.stderr).toBe(0);
    const r = JSON.parse(o.stdout) as { status: string; designs: JsonDesign[] };
    expect(r.status).toBe('ok');
    expect(r.designs.length).toBeGreaterThan(0);
    expect(readdirSync(out)).toEqual(expect.arrayContaining(['ranking.csv', ...r.designs.map((d) => `design-${d.rank}.yaml`)]));
    for (const d of r.designs) {
      const w = d.variables.find((v) => v.name === 'w')!;
      const x = d.variables.find((v) => v.name === 'x')!;
      // Bounds of the fixture: 4–10 nm, 0.05–0.25.
      expect(w.nm!, `design ${d.rank} w = ${w.nm} nm`).toBeGreaterThanOrEqual(4 - 1e-9);
      expect(w.nm!).toBeLessThanOrEqual(10 + 1e-9);
      expect(x.value, `design ${d.rank} x = ${x.value}`).toBeGreaterThanOrEqual(0.05 - 1e-12);
      expect(x.value).toBeLessThanOrEqual(0.25 + 1e-12);
      expect(Math.abs(w.ml! - Math.round(w.ml!)), `design ${d.rank}: ${w.ml} ML is not whole`).toBeLessThan(1e-9);
      // Composition snapped to the grower's step 0.001 (the default --step).
      expect(Math.abs(x.value * 1000 - Math.round(x.value * 1000)), `design ${d.rank}: x = ${x.value}`).toBeLessThan(1e-6);

      const s = await cli(['solve', join(out, `design-${d.rank}.yaml`), '--json']);
      expect(s.code, s.stderr).toBe(0);
      const solved = JSON.parse(s.stdout) as { transitions: JsonTransition[] };
      const byLabel = new Map(solved.transitions.map((t) => [t.label, t]));
      for (const t of d.transitions) {
        const again = byLabel.get(t.label);
        expect(again, `design ${d.rank}: ${t.label} missing from solve`).toBeDefined();
        expect(JSON.stringify(again), `design ${d.rank} ${t.label}`).toBe(JSON.stringify(t));
      }
    }
  }, 60_000);

  it('the same seed gives identical JSON with --workers 1 and --workers 2', async () => {
    const one = await cli(['design', SPEC, ...SMALL, '--workers', '1']);
    const two = await cli(['design', SPEC, ...SMALL, '--workers', '2']);
    expect(one.code, one.stderr).toBe(0);
    expect(two.code, two.stderr).toBe(0);
    expect(two.stdout).toBe(one.stdout);
  }, 60_000);

  it('an unreachable target (700 nm from InGaAs/GaAs) is infeasible: exit 1, the closest value, a variable at its bound', async () => {
    // 700 nm (1.77 eV) lies above the GaAs gap (1.42 eV at 300 K, common practice): no InGaAs well
    // in GaAs reaches it; the closest is the narrowest, least-In well.
    const o = await cli(['design', UNREACHABLE, ...SMALL, '--workers', '1']);
    expect(o.code, o.stderr).toBe(1);
    expect(o.stderr).toBe('');
    const r = JSON.parse(o.stdout) as { status: string; designs: JsonDesign[] };
    expect(r.status).toBe('infeasible');
    const best = r.designs[0]!;
    expect(best.satisfied).toBe(false);
    const achieved = best.targets[0]!.achieved!;
    expect(Number.isFinite(achieved)).toBe(true);
    expect(achieved).toBeGreaterThan(700);
    expect(best.variables.some((v) => v.atBound !== null), JSON.stringify(best.variables)).toBe(true);
    const human = await cli(['design', UNREACHABLE, '--starts', '4', '--evaluations', '80', '--seed', '7', '--workers', '1']);
    expect(human.code).toBe(1);
    expect(human.stdout).toMatch(/infeasible/);
    expect(human.stdout).toMatch(/closest/);
  }, 60_000);
});
