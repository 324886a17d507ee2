/**
 * The target language as a newcomer meets it, through the command line: each plausible mistake gets
 * its own message — a warning when a guess is read another way, an input error (exit 2, one line)
 * naming the field, the fix and the key probably meant.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';

const dir = mkdtempSync(join(tmpdir(), 'ws-messages-'));
let n = 0;
/** Writes spec text to a fresh file and returns its path. */
const file = (text: string): string => { const f = join(dir, `spec-${n++}.yaml`); writeFileSync(f, text); return f; };

/** A GaAs/Al0.3Ga0.7As well (ours): fast to solve, e1 about 40 meV above the GaAs edge. */
const well = (targets: string, extra = ''): string => `substrate: GaAs
temperature: 300 K
${extra}stack:
  - { material: Al0.3Ga0.7As, thickness: 10 nm }
  - { material: GaAs, thickness: 8 nm, label: well }
  - { material: Al0.3Ga0.7As, thickness: 10 nm }
targets:
${targets}
`;

/** An input error: exit 2 and one line on stderr, which is returned. */
async function refused(argv: string[]): Promise<string> {
  const o = await cli(argv);
  expect(o.code, `${argv.join(' ')}: ${o.stderr}`).toBe(2);
  expect(o.stderr.trim().split('\n'), o.stderr).toHaveLength(1);
  return o.stderr;
}

describe('plausible guesses are not silently read another way', () => {
  it('subband_edge with energy: 50 meV warns that it is an absolute energy below the band and suggests confinement', async () => {
    const o = await cli(['solve', file(well('  - { subband_edge: e1, energy: 50 meV, within: 5 meV }')), '--json']);
    expect(o.code, o.stderr).toBe(0);
    expect(o.stderr).toMatch(/^wellsmith: warning: targets\[0\]\.energy: "50 meV" is an energy on the absolute scale, \d+ meV below the conduction-band minimum .* write confinement: "50 meV" \(line \d+\)$/m);
    // Warnings go to stderr and into --json, never into the human or JSON result text itself.
    const json = JSON.parse(o.stdout) as { warnings: string[] };
    expect(json.warnings).toHaveLength(1);
    expect(json.warnings[0]).toMatch(/write confinement/);
    const plain = await cli(['solve', file(well('  - { subband_edge: e1, confinement: 50 meV, within: 5 meV }'))]);
    expect(plain.stderr, 'the same target with confinement: no warning').toBe('');
  });

  it('numbers without a unit are read in the key\'s default unit, with a warning naming it; the results equal the spelled-out spec', async () => {
    const bare = `title: bare
substrate: GaAs
temperature: 300
field: 10
stack:
  - { material: Al0.3Ga0.7As, thickness: 10 }
  - { material: GaAs, thickness: 8 }
  - { material: Al0.3Ga0.7As, thickness: 10 }
targets:
  - { transition: e1-hh1, wavelength: 830, within: 5 }
  - { spacing: e1-e2, at_least: 0.05 }
`;
    const spelled = bare.replace('temperature: 300', 'temperature: 300 K').replace('field: 10', 'field: 10 kV/cm').replace(/thickness: (\d+) }/g, 'thickness: $1 nm }')
      .replace('wavelength: 830, within: 5', 'wavelength: 830 nm, within: 5 nm').replace('at_least: 0.05', 'at_least: 0.05 eV');
    const a = await cli(['solve', file(bare), '--json']);
    const b = await cli(['solve', file(spelled), '--json']);
    expect(a.code, a.stderr).toBe(0);
    expect(b.stderr).toBe('');
    for (const note of [/temperature: 300 has no unit and is read as 300 K/, /field: 10 has no unit and is read as 10 kV\/cm/, /stack\[0\]\.thickness, stack\[1\]\.thickness, stack\[2\]\.thickness: thicknesses without a unit .* read as nm/,
      /targets\[0\]\.wavelength: 830 has no unit and is read as 830 nm/, /targets\[0\]\.within: 5 has no unit and is read as 5 nm/, /targets\[1\]\.at_least: 0.05 has no unit and is read as 0.05 eV/]) {
      expect(a.stderr).toMatch(note);
    }
    const strip = (s: string): unknown => { const { warnings: _w, ...rest } = JSON.parse(s) as Record<string, unknown>; return rest; };
    expect(strip(a.stdout), 'bare numbers mean exactly what the warning says').toEqual(strip(b.stdout));
    // A transition window takes the goal's unit: "within: 2" under "energy: 120 meV" is 2 meV, not 2 eV.
    const meV = await cli(['design', file(`${well('  - { transition: e1-e2, energy: 120 meV, within: 2 }')}vary: { w: { from: 5 nm, to: 9 nm } }\n`.replace('thickness: 8 nm', 'thickness: w')), '--starts', '2', '--evaluations', '20', '--json']);
    expect(meV.stderr).toMatch(/targets\[0\]\.within: 2 has no unit and is read as 2 meV/);
  });

  it('a spread that may be nm or meV refuses a bare number', async () => {
    const err = await refused(['solve', file(well('  - { ensemble: e1-hh1, at_most: 3 }'))]);
    expect(err).toMatch(/targets\[0\]\.at_most: 3 has no unit, and a spread may be a wavelength or an energy; write e\.g\. "4 nm" or "3 meV"/);
  });
});

describe('mistyped names get "did you mean"', () => {
  it.each([
    ['a top-level key', well('  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm }').replace('temperature:', 'temprature:'), /temprature: unknown key "temprature" \(did you mean "temperature"\?\); the keys here are title, substrate, temperature/],
    ['a layer key', well('  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm }').replace('thickness: 8 nm', 'thicknes: 8 nm'), /stack\[1\]\.thicknes: unknown key "thicknes" \(did you mean "thickness"\?\); a layer takes material, thickness/],
    ['a target key', well('  - { transition: e1-hh1, wavelenght: 830 nm, within: 5 nm }'), /targets\[0\]\.wavelenght: unknown key "wavelenght" for a transition target \(did you mean "wavelength"\?\); a transition target takes transition, energy, wavelength, wavenumber, within/],
    ['a target kind', well('  - { transiton: e1-hh1, wavelength: 830 nm, within: 5 nm }'), /targets\[0\]: no target kind among its keys \(transiton, wavelength, within\) \(did you mean "transition"\?\); a target has one of the keys maximize, .*, transition \("wellsmith targets" shows each with an example\)/],
    ['an enum value', well('  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm }', 'solver: { valence: kp8 }\n'), /solver\.valence: must be one of kp4, kp6, parabolic, got "kp8" \(did you mean "kp4" or "kp6"\?\)/],
  ])('%s', async (_what, text, message) => {
    expect(await refused(['solve', file(text)])).toMatch(message);
  });

  it('commands and options', async () => {
    expect(await refused(['sovle', 'runs/pump-976.yaml'])).toMatch(/"sovle" is not a command \(did you mean "solve"\?\)/);
    expect(await refused(['design', 'runs/pump-976.yaml', '--sed', '3'])).toMatch(/design has no option --sed \(did you mean --seed\?\)/);
    expect(await refused(['targets', 'transiton'])).toMatch(/no target kind "transiton" \(did you mean "transition"\?\)/);
  });
});

describe('validator wording in the tool\'s voice', () => {
  it('several problems: the first three named, with their lines, then how many more', async () => {
    const text = `temprature: 300 K
stack:
  - { material: GaAs, thickness: 8 nm }
solver: { valence: kp8, slice: [1], max_states: -2, nonparabolic: maybe }
carriers: { sheet_densty: 1e12 }
`;
    const err = await refused(['solve', file(text)]);
    expect(err).toMatch(/^wellsmith: solver\.nonparabolic: expected true or false, got "maybe" \(line 4\); also: solver\.slice: .* \(line 4\); solver\.max_states: must be above 0, got -2 \(line 4\) \(and 4 more problems\)$/m);
  });

  it.each([
    ['an empty stack', 'stack: []\n', /stack: must list at least 1 entry, got \[\]/, /Too small/],
    ['a bad variable name', 'vary: { 1w: { from: 4 nm, to: 8 nm } }\nstack:\n  - { material: GaAs, thickness: 1w }\n', /vary\.1w: the name "1w" must be a name of letters, digits and _ that starts with a letter/, /Invalid key in record/],
    ['a negative count', 'stack:\n  - { material: GaAs, thickness: 8 nm }\nsolver: { max_states: 0 }\n', /solver\.max_states: must be above 0, got 0/, /Too small|expected number to be/],
  ])('%s', async (_what, text, message, raw) => {
    const err = await refused(['solve', file(text)]);
    expect(err).toMatch(message);
    expect(err).not.toMatch(raw);
  });
});

describe('inputs that can never work are refused before any work', () => {
  it('a declared but unused variable', async () => {
    const err = await refused(['design', file(`${well('  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm }')}vary: { w: { from: 5 nm, to: 9 nm }, z: { from: 0.1, to: 0.3 } }\n`.replace('thickness: 8 nm', 'thickness: w'))]);
    expect(err).toMatch(/vary\.z: declared but never used: no layer names it, so it cannot change anything; use it .* or remove it \(line \d+\)/);
  });

  it.each([
    ['a state beyond the solver\'s limit', well('  - { subband_edge: e3, confinement: 100 meV, within: 5 meV }', 'solver: { max_states: 2 }\n'), /targets\[0\]: reads e3, but solver\.max_states is 2, so it is never solved; raise solver\.max_states to at least 3/],
    ['a well label no layer has', well('  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm, well: "well[2]" }'), /targets\[0\]\.well: no layer is labelled "well\[2\]" \(labels: layer 1, well, layer 3\)/],
    ['a strain target on a missing label', well('  - { strain: "-1 %", layer: qw, within: "0.1 %" }'), /targets\[0\]\.layer: no layer is labelled "qw"/],
    ['a direct-gap layer beyond the stack', well('  - { constraint: direct_gap, layers: [5] }\n  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm }'), /targets\[0\]\.layers: layer index 5 is beyond the stack \(3 layers, counted from 0\)/],
  ])('%s', async (_what, text, message) => {
    const started = Date.now();
    expect(await refused(['design', file(`${text}vary: { w: { from: 5 nm, to: 9 nm } }\n`.replace('thickness: 8 nm', 'thickness: w'))])).toMatch(message);
    expect(Date.now() - started, 'refused before the search').toBeLessThan(3000);
  });
});

describe('negative option values', () => {
  it('--ml -1:0.5,0:0.5 is the option\'s value, not an option', async () => {
    const o = await cli(['tolerance', file(well('  - { transition: e1-hh1, wavelength: 830 nm, within: 5 nm }')), '--ml', '-1:0.5,0:0.5', '--samples', '20', '--workers', '1', '--json']);
    expect(o.code, o.stderr).toBe(0);
    expect((JSON.parse(o.stdout) as { montecarlo: { model: { monolayers: unknown } } }).montecarlo.model.monolayers).toEqual({ kind: 'table', table: [{ ml: -1, p: 0.5 }, { ml: 0, p: 0.5 }] });
  });
});
