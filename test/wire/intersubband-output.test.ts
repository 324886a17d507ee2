/**
 * What a user sees of a wire's intersubband lines and of a wire solve's progress: the --json
 * fields (dipoles x and y, oscillator strength per polarisation), the text table, the HTML report's
 * columns, and the grid-by-grid progress a terminal bar is fed from.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { parseSpecText } from '../../engine/input/load.js';
import { solveWire, type WireTransition } from '../../engine/wire/solve.js';
import { wireFromJson, wireSections } from '../../engine/report/wire.js';
import { MIN_OSCILLATOR_STRENGTH, MIN_OVERLAP2 } from '../../engine/report/defaults.js';
import { fixed, inUnit } from '../../engine/text.js';

// A coarse GaAs wire, 10 nm wide and 6 nm high, in Al0.3Ga0.7As (ours): e2 is excited across the
// width, e3 along growth.
const SPEC = `
substrate: GaAs
wire:
  barrier: Al0.3Ga0.7As
  shape: { kind: rectangle, material: GaAs, width: 10 nm, height: 6 nm }
  grid: 1 nm
  margin: 4 nm
  states: 3
`;

describe('wire intersubband lines in the outputs', () => {
  const dir = mkdtempSync(join(tmpdir(), 'ws-wire-isb-'));
  const spec = join(dir, 'wire.yaml');
  writeFileSync(spec, SPEC);

  it('solve --json, the text table and the report show x and y dipoles and the oscillator strength of each polarisation', async () => {
    const solved = await cli(['solve', spec, '--json', '--maps']);
    expect(solved.code, solved.stderr).toBe(0);
    const r = JSON.parse(solved.stdout);
    const lines: WireTransition[] = r.transitions.filter((t: WireTransition) => t.kind === 'intersubband');
    expect(lines.map((t) => t.label)).toEqual(['e1-e2', 'e1-e3', 'e2-e3']);
    for (const t of lines) {
      for (const key of ['dipole_x_nm', 'dipole_y_nm', 'oscillator_strength_x', 'oscillator_strength_y'] as const) expect(Number.isFinite(t[key]), `${t.label}.${key}`).toBe(true);
    }
    const [e12, e13] = lines as [WireTransition, WireTransition];
    // Common practice: the width's excitation is x-polarised, the height's along growth (y).
    expect(e12.oscillator_strength_x! > 0.5 && e12.oscillator_strength_y! < 1e-6, `e1-e2 f_x ${e12.oscillator_strength_x}, f_y ${e12.oscillator_strength_y}`).toBe(true);
    expect(e13.oscillator_strength_y! > 0.5 && e13.oscillator_strength_x! < 1e-6, `e1-e3 f_x ${e13.oscillator_strength_x}, f_y ${e13.oscillator_strength_y}`).toBe(true);

    const text = await cli(['solve', spec]);
    expect(text.code, text.stderr).toBe(0);
    expect(text.stdout).toContain('Intersubband transitions from e1');
    const header = text.stdout.split('\n').find((l) => l.startsWith('transition') && l.includes('|x_ij| nm'));
    expect(header, text.stdout).toBeDefined();
    for (const column of ['energy meV', 'wavelength µm', '|y_ij| nm', 'f (x-pol.)', 'f (y-pol.)']) expect(header).toContain(column);
    const row = text.stdout.split('\n').find((l) => l.startsWith('e1-e2 ') && l.includes(fixed(Math.abs(e12.dipole_x_nm!), 4)));
    expect(row, text.stdout).toBeDefined();
    for (const cell of [inUnit(e12.energy_eV * 1000, 'meV'), inUnit(e12.wavelength_nm / 1000, 'µm'), inUnit(e12.oscillator_strength_x, '')]) expect(row).toContain(cell);

    const json = join(dir, 'wire.json');
    writeFileSync(json, solved.stdout);
    const out = join(dir, 'wire.html');
    const report = await cli(['report', json, '--out', out]);
    expect(report.code, report.stderr).toBe(0);
    const html = readFileSync(out, 'utf8');
    for (const column of ['|x_ij| (nm)', '|z_ij| (nm)', 'f, x-polarised', 'f, z-polarised']) expect(html).toContain(`>${column}</th>`);
    expect(html).toContain(`<td class="num">${inUnit(e13.oscillator_strength_y, '')}</td>`);
    // e2-e3 is forbidden in both polarisations and left out, as weak lines are for wells, and counted with the weak interband pairs.
    expect(html).not.toContain('<td>e2-e3</td>');
    const weak = r.transitions.filter((t: WireTransition) => (t.kind === 'interband' ? t.overlap2 < MIN_OVERLAP2 : Math.max(t.oscillator_strength_x!, t.oscillator_strength_y!) < MIN_OSCILLATOR_STRENGTH));
    expect(html).toContain(`(${weak.length} weaker pairs left out;`);
  }, 60_000);

  it('a result written before wire solves recorded dipoles reports the energies and says how to get the rest', async () => {
    const solved = await cli(['solve', spec, '--json', '--maps']);
    const old = JSON.parse(solved.stdout);
    for (const t of old.transitions) for (const key of ['dipole_x_nm', 'dipole_y_nm', 'oscillator_strength_x', 'oscillator_strength_y']) delete t[key];
    const sections = await wireSections(wireFromJson(old, 'old.json'));
    const html = sections.find((s) => s.id === 'transitions')!.html;
    expect(html).toContain('<td>e2-e3</td>');
    expect(html).not.toContain('f, x-polarised');
    expect(html).toContain('solve the spec again');
  }, 60_000);
});

describe('wire solve progress', () => {
  it('reports each grid of each band as it starts, then done = total', () => {
    // A tolerance tight enough that the bands need their h/4 grid, which the total then grows by.
    const spec = parseSpecText(SPEC.replace('states: 3', 'states: 2\n  tolerance: 0.01 meV')).spec;
    const calls: { done: number; total: number; what: string }[] = [];
    const r = solveWire(spec, undefined, { onProgress: (done, total, what) => calls.push({ done, total, what }) });
    expect(r.status).toBe('ok');
    const last = calls.at(-1)!;
    expect(last.done).toBe(last.total);
    calls.forEach((c, k) => {
      expect(c.done, `call ${k}: ${c.what}`).toBe(k);
      if (k < calls.length - 1) expect(c.done < c.total && /^(electron|heavy hole|light hole): grid [\d.]+ nm, \d+×\d+ nodes$/.test(c.what), `call ${k}: ${c.done}/${c.total} ${c.what}`).toBe(true);
    });
    // Three grids per band (2h, h, h/2), and one more for each band that needed h/4.
    const grids = calls.length - 1;
    expect(grids).toBeGreaterThanOrEqual(9);
    expect(last.total).toBe(grids);
    for (const band of ['electron', 'heavy hole', 'light hole']) expect(calls.filter((c) => c.what.startsWith(`${band}:`)).length, band).toBeGreaterThanOrEqual(3);
  });
});
