/**
 * Recorded solves (solve --json) given to `report` are rebuilt through the spec schema and limits:
 * text that reads "NaN" stays text, bad or missing recorded fields and stacks beyond the limits are
 * one-line input errors (exit 2), and graded layers and custom materials re-solve to the recorded
 * energies exactly.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { inputFromText } from '../../engine/report/input.js';


const SPEC = `
title: Infinity
substrate: GaAs
materials:
  deep: { Ec: 1.9 eV, Ev: -0.9 eV, me: 0.09, mhh: 0.4, mlh: 0.1, lattice: 0.565 nm, permittivity: 11 }
stack:
  - { material: deep, thickness: 10 nm, label: NaN }
  - { material: AlGaAs, Al: { from: 0.0, to: 0.2 }, thickness: 5 nm }
  - { material: In0.1Ga0.9As, thickness: 8 nm, label: "-Infinity" }
  - { material: Al0.3Ga0.7As, thickness: 20 nm }
`;

async function recorded(): Promise<string> {
  const dir = mkdtempSync(join(tmpdir(), 'ws-recorded-'));
  writeFileSync(join(dir, 's.yaml'), SPEC);
  const out = await cli(['solve', join(dir, 's.yaml'), '--json']);
  expect(out.code, out.stderr).toBe(0);
  return out.stdout;
}

describe('report of a recorded solve', () => {
  it('keeps labels and titles that read as numbers as text and re-solves graded and custom layers exactly', async () => {
    const text = await recorded();
    const input = inputFromText(text, 's.json');
    expect(input.kind).toBe('solve');
    if (input.kind !== 'solve') return;
    expect(input.result.structure.title).toBe('Infinity');
    expect(input.result.structure.layers.map((l) => l.label)).toEqual(['NaN', 'layer 2', '-Infinity', 'layer 4']);
    const want = (JSON.parse(text) as { bands: Record<string, { states: { energy_eV: number }[] }> }).bands;
    for (const band of ['electron', 'heavy_hole', 'light_hole'] as const) {
      expect(input.result.bands[band].states.map((s) => s.energy_eV), band).toEqual(want[band]!.states.map((s) => s.energy_eV));
    }
  });

  it('refuses a recorded stack beyond the size limit and a record with a missing field, each with exit 2 and one line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-recorded-'));
    const base = JSON.parse(await recorded()) as { structure: { layers: Record<string, unknown>[] } };
    const big = structuredClone(base);
    big.structure.layers[0]!.thickness_nm = 1e5;
    writeFileSync(join(dir, 'big.json'), JSON.stringify(big));
    const missing = structuredClone(base);
    delete missing.structure.layers[1]!.composition;
    writeFileSync(join(dir, 'missing.json'), JSON.stringify(missing));
    const a = await cli(['report', join(dir, 'big.json'), '--out', join(dir, 'a.html')]);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/recorded structure is not a valid stack: stack\[0\]\.thickness: the stack reaches 1\.000e\+5 nm/);
    const b = await cli(['report', join(dir, 'missing.json'), '--out', join(dir, 'b.html')]);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/recorded structure\.layers\[1\]\.composition must be an object/);
    for (const o of [a, b]) expect(o.stderr.trim().split('\n')).toHaveLength(1);
  });
});
