/**
 * What a campaign file is told about itself: a misspelt key, at the top or nested, is refused
 * (exit 2) with the key it was probably meant to be, as in spec files; a sweep range whose end is
 * not on its step grid is run as far as the grid goes with a warning that names the last value and
 * the two ends on the grid, while an end on the grid (up to floating-point residue) draws none.
 * Expected values are worked out by hand from the ranges written below.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseCampaignText } from '../../engine/campaign/campaign.js';
import { cli } from '../../engine/cli/app.js';
import { ROOT, spawnCli, tempDir } from './helpers.js';

const SPEC = `spec: ${JSON.stringify(join(ROOT, 'runs/telecom-1550-inp.yaml'))}`;

function campaignFile(lines: readonly string[]): string {
  const file = join(tempDir('messages'), 'c.yaml');
  writeFileSync(file, `${[SPEC, ...lines].join('\n')}\n`);
  return file;
}

const sweep = (range: string): readonly string[] => parseCampaignText([SPEC, 'sweep:', `  targets[0].wavelength: ${range}`].join('\n'), 'c.yaml', ROOT).warnings;

describe('misspelt keys in a campaign file', () => {
  it.each([
    [['design: { starts: 2 }', 'sweeep:', "  targets[0].wavelength: ['1480 nm']"],
      /^wellsmith: c\.yaml: sweeep: unknown key "sweeep" \(did you mean "sweep"\?\); the keys here are title, kind, spec, design, sweep \(line 3\)$/],
    [['design: { strats: 2 }'], /^wellsmith: c\.yaml: design\.strats: unknown key "strats" \(did you mean "starts"\?\); the keys here are starts, top, seed, evaluations, step \(line 2\)$/],
    [['sweep:', '  targets[0].wavelength: { from: 1480 nm, to: 1600 nm, stpe: 60 nm }'],
      /^wellsmith: c\.yaml: sweep\.targets\[0\]\.wavelength\.stpe: unknown key "stpe" \(did you mean "step"\?\); the keys here are from, to, step \(line \d\); also: sweep\.targets\[0\]\.wavelength\.step: is required/],
  ])('are refused with exit 2 and the key probably meant: %#', async (lines, message) => {
    const file = campaignFile(lines);
    const o = await cli(['campaign', file, '--out', join(file, '..', 'run')]);
    expect(o.code, o.stderr).toBe(2);
    expect(o.stdout).toBe('');
    expect(o.stderr.replace(file, 'c.yaml').trimEnd()).toMatch(message);
  });
});

describe('a sweep path the base spec does not have', () => {
  it('targets[0].wavelenght is an input error before any job runs: exit 2, the path meant, no run folder', async () => {
    const file = campaignFile(['sweep:', "  targets[0].wavelenght: ['1480 nm', '1520 nm']"]);
    const out = join(file, '..', 'run');
    const o = await cli(['campaign', file, '--out', out]);
    expect(o.code, o.stderr).toBe(2);
    expect(o.stdout).toBe('');
    expect(o.stderr.trim().split('\n')).toHaveLength(1);
    expect(o.stderr).toMatch(/targets\[0\]\.wavelenght/);
    expect(o.stderr).toMatch(/did you mean "?wavelength"?/);
    expect(existsSync(out), 'no run folder created').toBe(false);
  });
});

describe('a sweep range whose end is off its step grid', () => {
  it('940…1000 nm in steps of 25 nm stops at 990 nm and says so, naming the ends on the grid (990 or 1015 nm)', () => {
    expect(sweep('{ from: 940 nm, to: 1000 nm, step: 25 nm }')).toEqual([
      'sweep.targets[0].wavelength: the range from 940 nm to 1000 nm in steps of 25 nm ends at 990 nm, short of 1000 nm, which is not on the step grid; write to: 990 nm or to: 1015 nm, or pick a step that divides 60 nm',
    ]);
  });

  it.each([
    '{ from: 940 nm, to: 1000 nm, step: 20 nm }',
    '{ from: 1300 nm, to: 1300.3 nm, step: 0.1 nm }',
    '{ from: 0.1 um, to: 0.3 um, step: 0.1 um }',
    '{ from: 1550 nm, to: 1550 nm, step: 5 nm }',
  ])('an end on the grid draws no warning, floating-point residue included: %s', (range) => {
    // (0.3 − 0.1) / 0.1 is 1.9999999999999998 in binary floating point, one step short of 2 by residue only.
    expect(sweep(range)).toEqual([]);
  });

  it('property: from + k·step never warns; half a step further always warns, naming from + k·step as the last value', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 20_000 }), fc.integer({ min: 1, max: 500 }), fc.integer({ min: 0, max: 40 }), (from10, step100, k) => {
      // Decimal text as a user writes it: from in tenths, step in hundredths of a nm.
      const text = (hundredths: number): string => `${hundredths / 100} nm`;
      const [a, s] = [from10 * 10, step100];
      const on = parseCampaignText([SPEC, 'sweep:', `  targets[0].within: { from: ${text(a)}, to: ${text(a + k * s)}, step: ${text(s)} }`].join('\n'), 'c.yaml', ROOT);
      expect(on.warnings).toEqual([]);
      expect(on.jobs).toHaveLength(k + 1);
      const off = parseCampaignText([SPEC, 'sweep:', `  targets[0].within: { from: ${text(2 * a)}, to: ${text(2 * a + 2 * k * s + s)}, step: ${text(2 * s)} }`].join('\n'), 'c.yaml', ROOT);
      expect(off.jobs).toHaveLength(k + 1);
      expect(off.warnings).toHaveLength(1);
      expect(off.warnings[0]).toContain(`ends at ${text(2 * a + 2 * k * s)}, short of`);
      expect(off.warnings[0]).toContain(`write to: ${text(2 * a + 2 * k * s)} or to: ${text(2 * a + 2 * (k + 1) * s)}`);
    }), { numRuns: 60 });
  });

  it('the command prints it on the warnings channel and goes on (exit 0), here while writing Slurm scripts', async () => {
    const file = campaignFile(['sweep:', '  targets[0].wavelength: { from: 1480 nm, to: 1600 nm, step: 50 nm }']);
    const o = await cli(['campaign', file, '--slurm', '2', '--out', join(file, '..', 'run')]);
    expect(o.code, o.stderr).toBe(0);
    expect(o.stdout).toMatch(/^3 jobs in 2 shards/);
    expect(o.stderr).toBe('wellsmith: warning: sweep.targets[0].wavelength: the range from 1480 nm to 1600 nm in steps of 50 nm ends at 1580 nm, short of 1600 nm, which is not on the step grid; write to: 1580 nm or to: 1630 nm, or pick a step that divides 120 nm\n');
  });
});

describe('warnings of a campaign that runs', () => {
  it('come first, before the first job ends, once each: the off-grid range and the base spec\'s bare number', async () => {
    const dir = tempDir('warnings-first');
    const spec = join(dir, 'base.yaml');
    writeFileSync(spec, readFileSync(join(ROOT, 'runs/telecom-1550-inp.yaml'), 'utf8').replace(/^temperature: .*$/m, 'temperature: 300'));
    const file = join(dir, 'c.yaml');
    writeFileSync(file, [`spec: ${JSON.stringify(spec)}`, 'design: { starts: 2, top: 1, seed: 3, evaluations: 15 }', 'sweep:', '  targets[0].wavelength: { from: 1500 nm, to: 1560 nm, step: 40 nm }', ''].join('\n'));
    const ended = await spawnCli(['campaign', file, '--out', join(dir, 'run')]);
    expect(ended.code, ended.stderr).toBe(0);
    const lines = ended.stderr.trim().split('\n');
    expect(lines[0]).toMatch(/^wellsmith: warning: sweep\.targets\[0\]\.wavelength: the range from 1500 nm to 1560 nm in steps of 40 nm ends at 1540 nm/);
    expect(lines[1]).toMatch(/^wellsmith: warning: spec \(job "wavelength=1500nm" and any others it applies to\): temperature: .*K/);
    expect(lines.filter((l) => /warning/.test(l))).toHaveLength(2);
    expect(lines.slice(2).every((l) => /^\d{4}-\d\d-\d\dT[\d:]+Z campaign: job \d\/2 /.test(l)), lines.join('\n')).toBe(true);
  }, 60_000);
});
