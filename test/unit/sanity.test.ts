/**
 * Structures outside the envelope-function model are reported as such (status 'unphysical', exit 1
 * for solve, infeasible candidates for design), and no negative transition energy is ever listed.
 * Facts of the trade (common practice): InAs/GaSb is a broken-gap (type-III) pair; a 14 % mismatched
 * layer cannot be grown pseudomorphically; In0.2Ga0.8As on GaAs relaxes well beyond ~15 nm.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseSpecText } from '../../engine/input/load.js';
import { solve } from '../../engine/solve.js';
import { cli } from '../../engine/cli/app.js';

const stack = (substrate: string, layers: string) => parseSpecText(`substrate: ${substrate}\nstack:\n${layers}`).spec;

describe('physical sanity', () => {
  it('the detector scenario moved onto InSb is unphysical: solve exits 1, design finds no feasible candidate, no negative line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-sanity-'));
    const file = join(dir, 'insb.yaml');
    writeFileSync(file, readFileSync('runs/qwip-9um.yaml', 'utf8').replace(/^substrate:.*$/m, 'substrate: InSb'));
    const solved = await cli(['solve', file, '--json']);
    expect(solved.code).toBe(1);
    const r = JSON.parse(solved.stdout) as { status: string; message: string; transitions: { energy_eV: number; wavelength_nm: number }[] };
    expect(r.status).toBe('unphysical');
    expect(r.message).toMatch(/cannot be grown coherently/);
    for (const t of r.transitions) expect(t.energy_eV > 0 && t.wavelength_nm > 0, JSON.stringify(t)).toBe(true);
    const designed = await cli(['design', file, '--starts', '2', '--json']);
    expect(designed.code).toBe(1);
  });

  it('flags a broken-gap InAs/GaSb pair and a layer ten critical thicknesses thick; a normal pump well passes', () => {
    const broken = solve(stack('GaSb', '  - { material: GaSb, thickness: 10 nm }\n  - { material: InAs, thickness: 8 nm }\n  - { material: GaSb, thickness: 10 nm }'));
    expect(broken.status).toBe('unphysical');
    expect(broken.message).toMatch(/broken-gap alignment/);
    const relaxed = solve(stack('GaAs', '  - { material: GaAs, thickness: 20 nm }\n  - { material: In0.2Ga0.8As, thickness: 200 nm }\n  - { material: GaAs, thickness: 20 nm }'));
    expect(relaxed.status).toBe('unphysical');
    expect(relaxed.message).toMatch(/more than 10 times its critical thickness/);
    const pump = solve(parseSpecText(readFileSync('runs/pump-976.yaml', 'utf8')).spec);
    expect(pump.status).toBe('ok');
  });
});
