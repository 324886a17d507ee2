/**
 * Campaign files: expansion into named jobs (Cartesian product, last axis fastest), ranges with
 * units, design-option axes, stable hashes, errors that name the field and line, and shards that
 * partition the jobs. Expected values are written out by hand from the files below.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { loadCampaignFile, parseCampaignText } from '../../engine/campaign/campaign.js';
import { inShard } from '../../engine/campaign/run.js';
import { parseShard } from '../../engine/cli/campaign.js';
import { ROOT, tempDir } from './helpers.js';

const BASE = [
  'spec:',
  '  substrate: InP',
  '  vary: { w: { from: 3 nm, to: 9 nm } }',
  '  stack:',
  '    - { material: InP, thickness: 30 nm }',
  '    - { material: In0.53Ga0.47As, thickness: w }',
  '    - { material: InP, thickness: 30 nm }',
  '  targets:',
  '    - { transition: e1-hh1, wavelength: 1550 nm, within: 5 nm }',
];

const parse = (lines: readonly string[]) => parseCampaignText(lines.join('\n'), 'test.yaml', ROOT);

describe('campaign expansion', () => {
  it('takes the Cartesian product of the axes with the last axis fastest, naming each job', () => {
    const c = parse([...BASE,
      'sweep:',
      '  targets[0].wavelength: { from: 1300 nm, to: 1320 nm, step: 10 nm }',
      '  stack[1].material: [In0.53Ga0.47As, In0.60Ga0.40As]']);
    // Expected by hand: 3 wavelengths × 2 materials.
    expect(c.jobs.map((j) => j.name)).toEqual([
      'wavelength=1300nm,material=In0.53Ga0.47As', 'wavelength=1300nm,material=In0.60Ga0.40As',
      'wavelength=1310nm,material=In0.53Ga0.47As', 'wavelength=1310nm,material=In0.60Ga0.40As',
      'wavelength=1320nm,material=In0.53Ga0.47As', 'wavelength=1320nm,material=In0.60Ga0.40As']);
    expect(c.jobs.map((j) => j.index)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(c.jobs[3]!.spec.targets![0]).toMatchObject({ wavelength: '1310 nm' });
    expect(c.jobs[3]!.spec.stack[1]!.material).toBe('In0.60Ga0.40As');
    expect(new Set(c.jobs.map((j) => j.hash)).size).toBe(6);
  });

  it('writes range values without floating-point residue (1300 + k·0.1 nm)', () => {
    const c = parse([...BASE, 'sweep:', '  targets[0].wavelength: { from: 1300 nm, to: 1300.3 nm, step: 0.1 nm }']);
    expect(c.jobs.map((j) => (j.spec.targets![0] as { wavelength: string }).wavelength)).toEqual(['1300 nm', '1300.1 nm', '1300.2 nm', '1300.3 nm']);
  });

  it('sweeps design options and defaults the rest', () => {
    const c = parse([...BASE, 'design: { starts: 3, evaluations: 50 }', 'sweep:', '  design.seed: [1, 2]']);
    expect(c.jobs.map((j) => [j.name, j.options.seed, j.options.starts, j.options.maxEvaluations])).toEqual([['seed=1', 1, 3, 50], ['seed=2', 2, 3, 50]]);
    expect(c.jobs[0]!.hash).not.toBe(c.jobs[1]!.hash);
  });

  it('gives the same job hashes whatever the key order of the file', () => {
    const a = parse([...BASE, 'design: { starts: 3, seed: 5 }']);
    const b = parse(['design: { seed: 5, starts: 3 }', ...BASE]);
    expect(b.jobs.map((j) => j.hash)).toEqual(a.jobs.map((j) => j.hash));
    expect(b.hash).toBe(a.hash);
  });

  it('reads a base spec given as a path relative to the campaign file', () => {
    const dir = tempDir('campaign-path');
    mkdirSync(join(dir, 'specs'));
    writeFileSync(join(dir, 'specs', 'base.yaml'), BASE.slice(1).map((l) => l.slice(2)).join('\n'));
    writeFileSync(join(dir, 'c.yaml'), 'spec: specs/base.yaml\nsweep:\n  targets[0].within: [2 nm, 4 nm]\n');
    expect(loadCampaignFile(join(dir, 'c.yaml')).jobs.map((j) => j.name)).toEqual(['within=2nm', 'within=4nm']);
  });

  it.each([
    [[...BASE, 'sweep:', '  stack[7].material: [GaAs]'], /sweep\.stack\[7\]\.material: the base spec has no "stack\[7\]\.material"/],
    [[...BASE, 'swep: {}'], /swep: unknown key "swep".*\(line 10\)/],
    [[...BASE, 'design: { starts: 0 }'], /design\.starts: .*\(line 10\)/],
    [[...BASE, 'sweep:', '  targets[0].wavelength: { from: 1300 nm, to: 1.6 um, step: 10 nm }'], /share one unit/],
    [[...BASE, 'sweep:', '  stack[1]: [{ material: GaAs }]'], /job "stack=#1": stack\[1\]\.thickness: is required/],
  ])('rejects a bad file with the field (and line) named: %#', (lines, message) => {
    expect(() => parse(lines)).toThrow(message);
  });
});

describe('the base spec file', () => {
  const SECRET = 'TOPSECRET-7f3a9c';

  it.each([
    ['secret.txt', `the password is ${SECRET}\n`, /spec: expected the path of a spec file ending in \.yaml, \.yml, \.json, got "\.\.\/secret\.txt"/],
    ['notes.yaml', `${SECRET} is the code\n`, /spec: ".*notes\.yaml" is not a spec \(a mapping with at least a "stack" list\)/],
    ['list.json', `["${SECRET}"]\n`, /spec: ".*list\.json" is not a spec/],
  ])('never echoes what a file that is not a spec holds: %s', (name, content, message) => {
    const dir = tempDir('campaign-secret');
    mkdirSync(join(dir, 'c'));
    writeFileSync(join(dir, name), content);
    writeFileSync(join(dir, 'c', 'c.yaml'), `spec: ../${name}\n`);
    let thrown: unknown;
    try {
      loadCampaignFile(join(dir, 'c', 'c.yaml'));
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(Error);
    expect((thrown as Error).message).toMatch(message);
    expect((thrown as Error).message).not.toContain(SECRET);
  });

  it('a folder as the base spec is refused by extension, naming what was expected', () => {
    const dir = tempDir('campaign-dotdot');
    writeFileSync(join(dir, 'c.yaml'), 'spec: ../..\n');
    expect(() => loadCampaignFile(join(dir, 'c.yaml'))).toThrow(/spec: expected the path of a spec file ending in \.yaml, \.yml, \.json, got "\.\.\/\.\."/);
  });
});

describe('size limits', () => {
  it('refuses a sweep of 10^8 jobs before expanding it, naming the limit', () => {
    const t0 = performance.now();
    expect(() => parse([...BASE, 'sweep:',
      '  targets[0].wavelength: { from: 1000 nm, to: 1999 nm, step: 1 nm }',
      '  targets[0].within: { from: 1 nm, to: 1000 nm, step: 1 nm }',
      '  design.seed: { from: 1, to: 100, step: 1 }'])).toThrow(/sweep: the axes give 1000 × 1000 × 100 = 100000000 jobs, more than the limit of 100000 per campaign/);
    expect(performance.now() - t0, 'refused at once, not after expanding').toBeLessThan(2000);
  });

  it('refuses a campaign file larger than 4 MiB without parsing it', () => {
    const dir = tempDir('campaign-big');
    const file = join(dir, 'big.yaml');
    writeFileSync(file, `${BASE.join('\n')}\n${'# padding\n'.repeat(420_000)}`);
    expect(() => loadCampaignFile(file)).toThrow(/campaign file ".*big\.yaml" is 4\.0 MiB, more than the limit of 4 MiB/);
  });
});

describe('shards', () => {
  it('parses i/N and rejects anything else', () => {
    expect(parseShard('2/3')).toEqual({ index: 2, count: 3 });
    expect(parseShard(undefined)).toEqual({ index: 1, count: 1 });
    for (const bad of ['0/3', '4/3', '1/0', 'a/b', '2']) expect(() => parseShard(bad), bad).toThrow(/--shard: expected i\/N/);
  });

  it('partition the jobs: every job in exactly one shard, whatever N', () => {
    const c = parse([...BASE, 'sweep:', '  targets[0].wavelength: { from: 1300 nm, to: 1400 nm, step: 10 nm }', '  design.seed: [1, 2, 3]']);
    fc.assert(fc.property(fc.integer({ min: 1, max: 40 }), (n) => {
      const owners = c.jobs.map((j) => Array.from({ length: n }, (_, i) => i + 1).filter((i) => inShard(j, { index: i, count: n })));
      return owners.every((o) => o.length === 1);
    }));
  });
});
