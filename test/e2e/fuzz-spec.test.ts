/**
 * Fuzz of malformed specs through the solve path: random mutations of a valid spec must end in
 * exit code 2 with a one-line message, or in a valid result whose JSON holds no NaN. Most cases go
 * through `parseSpecText` + `solve` (what `wellsmith solve` runs, without the file); a few hundred
 * go through `cli(['solve', file, '--json'])` with temp files.
 */
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { stringify } from 'yaml';
import { cli } from '../../engine/cli/app.js';
import { parseSpecText } from '../../engine/input/load.js';
import { solve } from '../../engine/solve.js';
import { solveJson } from '../../engine/cli/solve.js';
import { EXIT, failure, success, type Outcome } from '../../engine/cli/exit.js';
import { toJson } from '../../engine/text.js';

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** A small valid spec (a 976 nm-style pump well, ours) that solves in a few ms. */
const BASE: Json = {
  title: 'fuzz base',
  substrate: 'GaAs',
  temperature: '300 K',
  field: '0 kV/cm',
  offsets: { conduction_share: 0.65 },
  materials: { Q: { Ec: 1.4, Ev: 0, me: 0.067, mhh: 0.5, mlh: 0.08, lattice: '0.565 nm' } },
  vary: { w: { from: '4 nm', to: '10 nm', value: '7 nm' }, x: { from: 0.05, to: 0.3, value: 0.2 } },
  stack: [
    { material: 'Al0.3Ga0.7As', thickness: '10 nm', label: 'barrier' },
    { material: 'InGaAs', In: 'x', thickness: 'w', label: 'well' },
    { material: 'GaAs', thickness: '20 ML' },
    { material: 'Al0.3Ga0.7As', thickness: '10 nm' },
  ],
  solver: { nonparabolic: true, slice: '0.2 nm', max_states: 3 },
  targets: [{ transition: 'e1-hh1', wavelength: '976 nm', within: '2 nm' }],
};

type Path = readonly (string | number)[];

function pathsOf(v: Json, prefix: Path = []): Path[] {
  if (v === null || typeof v !== 'object') return [prefix];
  const keys: (string | number)[] = Array.isArray(v) ? v.map((_x, i) => i) : Object.keys(v);
  return [prefix, ...keys.flatMap((k) => pathsOf((v as Record<string | number, Json>)[k]!, [...prefix, k]))];
}
const PATHS = pathsOf(BASE).filter((p) => p.length > 0);
const CONTAINERS = [[], ...PATHS].filter((p) => {
  const v = p.reduce<Json>((o, k) => (o as Record<string | number, Json>)[k]!, BASE);
  return v !== null && typeof v === 'object';
});

/** Copy of `base` with the value at `path` replaced (or deleted when `value` is undefined). */
function mutate(base: Json, path: Path, value: Json | undefined): Json {
  const copy = structuredClone(base);
  const parent = path.slice(0, -1).reduce<Json>((o, k) => (o as Record<string | number, Json>)[k]!, copy) as Record<string | number, Json> | Json[];
  const key = path[path.length - 1]!;
  if (value === undefined) {
    if (Array.isArray(parent)) parent.splice(key as number, 1);
    else delete parent[key as string];
  } else (parent as Record<string | number, Json>)[key] = value;
  return copy;
}

const deep = (depth: number): Json => (depth === 0 ? 1 : { a: [deep(depth - 1)] });

const junk: fc.Arbitrary<Json> = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.integer({ min: -10_000, max: 10_000 }),
  fc.double({ min: -1e4, max: 1e4 }),
  fc.constantFrom(1e9, -1e9, 1e300, 5e4),
  fc.constantFrom(-3, 0, -1e-300, 2, 1.5, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY),
  fc.string({ maxLength: 12 }),
  fc.string({ unit: 'grapheme', maxLength: 8 }),
  fc.constantFrom('-3 nm', 'NaN nm', '1e400 nm', '5 furlongs', '', '∞', '7 ML', '0 nm', '1e5 nm', '3 Å', '300', 'K 300',
    '-4 K', '1e6 K', '2 µm', '20 kV/cm', '1e9 kV/cm', 'nm', 'w', 'x', 'undefined_var', '0x10 nm', '١٠ nm', ' 7 nm ', '7nm'),
  fc.constantFrom('In1.2GaAs', 'Q', 'Xx0.3Ga0.7As', 'AlGaAs', 'Al0.3Ga0.6As', 'InGaAs', 'In0.2Ga0.8As', 'GaAs0.5', 'q', 'GaN', 'Al-0.1Ga1.1As', 'In0.53Ga0.47As', 'AlAs', 'InAs'),
  fc.integer({ min: 1, max: 40 }).map(deep),
  fc.array(fc.oneof(fc.integer(), fc.string({ maxLength: 4 })), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 5 }), fc.oneof(fc.integer(), fc.string({ maxLength: 4 })), { maxKeys: 3 }),
);

/** One to three mutations: replace a value, delete a key, or add an unknown key. */
const mutated: fc.Arbitrary<Json> = fc.array(
  fc.oneof(
    fc.record({ kind: fc.constant('set' as const), path: fc.constantFrom(...PATHS), value: junk }),
    fc.record({ kind: fc.constant('delete' as const), path: fc.constantFrom(...PATHS) }),
    fc.record({ kind: fc.constant('add' as const), path: fc.constantFrom(...CONTAINERS), key: fc.oneof(fc.string({ maxLength: 6 }), fc.constantFrom('Al', 'In', 'thickness', 'zz', '__proto__', 'constructor')), value: junk }),
  ),
  { minLength: 1, maxLength: 3 },
).map((ops) => ops.reduce<Json>((spec, op) => {
  const at = (p: Path): Json | undefined => {
    let o: Json | undefined = spec;
    for (const k of p) {
      if (o === null || typeof o !== 'object') return undefined;
      o = (o as Record<string | number, Json>)[k];
    }
    return o;
  };
  if (op.kind === 'add') {
    const container = at(op.path);
    return container !== null && typeof container === 'object' && !Array.isArray(container) ? mutate(spec, [...op.path, op.key], op.value) : spec;
  }
  if (at(op.path) === undefined) return spec;
  return mutate(spec, op.path, op.kind === 'set' ? op.value : undefined);
}, BASE));

/** What `wellsmith solve FILE --json` returns, for spec text instead of a file. */
function solveText(text: string): Outcome {
  let locate: ((f: string) => number | undefined) | undefined;
  try {
    const loaded = parseSpecText(text, 'fuzz.yaml');
    locate = loaded.locate;
    const r = solve(loaded.spec);
    return success(`${toJson(solveJson(r, false))}\n`, r.status === 'ok' ? EXIT.ok : EXIT.physics);
  } catch (e) {
    return failure(e, locate);
  }
}

function checkOutcome(o: Outcome, text: string): void {
  const where = `spec:\n${text}\nstderr: ${o.stderr}`;
  expect([EXIT.ok, EXIT.physics, EXIT.input], where).toContain(o.code);
  if (o.code === EXIT.input) {
    expect(o.stderr.trimEnd().split('\n'), where).toHaveLength(1);
    // A NaN the user wrote may be echoed in quotes; any other NaN or undefined is the tool's own.
    const own = o.stderr.replace(/"[^"]*"/g, '""');
    expect(own, where).not.toMatch(/\bat .*:\d+|\bundefined\b|\bNaN\b|\[object Object\]/);
    expect(o.stdout).toBe('');
  } else {
    expect(o.stdout, where).not.toMatch(/NaN/);
    expect(() => JSON.parse(o.stdout), where).not.toThrow();
  }
}

const textOf = (spec: Json, asJson: boolean): string => (asJson ? JSON.stringify(spec) : stringify(spec));

describe('malformed specs end in exit code 2 with one line, or in a valid result', () => {
  const dir = mkdtempSync(join(tmpdir(), 'wellsmith-fuzz-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('the unmutated base spec solves (so the fuzz starts from a valid spec)', () => {
    const o = solveText(stringify(BASE));
    expect(o.code, o.stderr).toBe(EXIT.ok);
  });

  it('1000 mutations through parse + solve', () => {
    fc.assert(fc.property(mutated, fc.boolean(), (spec, asJson) => {
      const text = textOf(spec, asJson);
      checkOutcome(solveText(text), text);
    }), { numRuns: 1000, seed: 31 });
  }, 60_000);

  it('300 mutations through cli solve with temp files', async () => {
    let n = 0;
    await fc.assert(fc.asyncProperty(mutated, fc.boolean(), async (spec, asJson) => {
      const text = textOf(spec, asJson);
      const file = join(dir, `spec-${n++}.${asJson ? 'json' : 'yaml'}`);
      writeFileSync(file, text);
      checkOutcome(await cli(['solve', file, '--json']), text);
    }), { numRuns: 300, seed: 32 });
  }, 60_000);
});
