/**
 * The target language is written down in four places that must agree with the registry that
 * evaluates it (objectives/index.ts): the JSON Schema (one strict object per kind), `wellsmith
 * targets`, `wellsmith design --help` and the README. Every kind has an example that the registry
 * accepts; every key has a description.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { compileTargets, OBJECTIVES, targetKeys } from '../../objectives/index.js';
import { campaignJsonSchema, specJsonSchema } from '../../engine/input/json-schema.js';
import { campaignSchema } from '../../engine/campaign/campaign.js';
import { targetKinds } from '../../engine/cli/targets.js';
import { cli } from '../../engine/cli/app.js';

interface KindSchema { title: string; required: string[]; additionalProperties: boolean; properties: Record<string, { description?: string }>; examples?: Record<string, unknown>[] }

const shipped = (name: string): unknown => JSON.parse(readFileSync(new URL(`../../schema/${name}`, import.meta.url), 'utf8'));

describe('the target language', () => {
  const kinds = (specJsonSchema() as { properties: { targets: { items: { anyOf: KindSchema[] } } } }).properties.targets.items.anyOf;

  it('the JSON Schema holds one strict object per registered kind, with its keys, their descriptions and examples', () => {
    expect(kinds.map((k) => k.title)).toEqual(OBJECTIVES.map((o) => o.key));
    for (const [i, k] of kinds.entries()) {
      const o = OBJECTIVES[i]!;
      expect(k.additionalProperties, `${k.title}: strict`).toBe(false);
      expect(k.required, `${k.title}: its key is required`).toContain(o.key);
      expect(Object.keys(k.properties)).toEqual(targetKeys(o.objective));
      for (const [key, p] of Object.entries(k.properties)) expect(p.description, `${k.title}.${key} has a description`).toMatch(/\S/);
      expect(k.examples?.length, `${k.title} has an example`).toBeGreaterThan(0);
      for (const e of k.examples!) {
        expect(Object.keys(e).every((key) => key in k.properties), `${k.title} example ${JSON.stringify(e)}: known keys`).toBe(true);
        expect(k.required.every((key) => key in e), `${k.title} example ${JSON.stringify(e)}: required keys`).toBe(true);
      }
    }
  });

  it('every example is a target the registry accepts, for the geometry it fits', () => {
    for (const o of OBJECTIVES) {
      for (const e of o.objective.examples ?? []) {
        const run = (): unknown => compileTargets([e]);
        expect(run, `${o.key}: ${JSON.stringify(e)}`).not.toThrow();
      }
    }
  });

  it('the shipped schema files equal the generated ones (run "npm run schema" after a change)', () => {
    expect(shipped('spec.schema.json')).toEqual(JSON.parse(JSON.stringify(specJsonSchema())));
    expect(shipped('campaign.schema.json')).toEqual(JSON.parse(JSON.stringify(campaignJsonSchema())));
  });

  it('the campaign schema describes every key, refers an inline spec to the spec schema, and its example is a valid campaign file', () => {
    const c = campaignJsonSchema() as { properties: Record<string, { description?: string; anyOf?: { $ref?: string }[] }>; examples: unknown[] };
    for (const [key, p] of Object.entries(c.properties)) expect(p.description, `campaign ${key}`).toMatch(/\S/);
    expect(c.properties.spec!.anyOf!.some((x) => x.$ref === 'spec.schema.json')).toBe(true);
    for (const e of c.examples) expect(campaignSchema.safeParse(e).success).toBe(true);
  });

  it('"wellsmith targets" lists every kind with an example; "targets KIND" every key', async () => {
    const all = await cli(['targets']);
    expect(all.code).toBe(0);
    for (const k of targetKinds()) {
      expect(all.stdout).toContain(`  ${k.kind}: ${k.description}`);
      expect(all.stdout).toContain(`keys: ${k.keys.map((x) => (x.required ? x.key : `[${x.key}]`)).join(', ')}`);
    }
    const one = await cli(['targets', 'subband_edge']);
    for (const key of ['subband_edge', 'confinement', 'energy', 'within', 'weight']) expect(one.stdout).toMatch(new RegExp(`^\\s+\\*?\\s+${key}\\s+\\S`, 'm'));
    expect(one.stdout).toContain('- { subband_edge: e1, confinement: 40 meV, within: 5 meV }');
    const json = JSON.parse((await cli(['targets', '--json'])).stdout) as { kind: string }[];
    expect(json.map((k) => k.kind)).toEqual(OBJECTIVES.map((o) => o.key));
  });

  it('"design --help" closes with every kind and its keys', async () => {
    // yargs prints help itself, through console.log.
    const printed: string[] = [];
    const spy = vi.spyOn(console, 'log').mockImplementation((...a: unknown[]) => { printed.push(a.join(' ')); });
    try {
      await cli(['design', '--help']);
    } finally {
      spy.mockRestore();
    }
    // Help is wrapped to the terminal's width: compare with runs of white space made one space.
    const help = printed.join('\n').replace(/\s+/g, ' ');
    for (const k of targetKinds()) expect(help).toContain(`keys: ${k.keys.map((x) => (x.required ? x.key : `[${x.key}]`)).join(', ')}`);
  });

  it('the README\'s target section names every kind and every key of it', () => {
    const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    const section = readme.slice(readme.indexOf('### Targets'), readme.indexOf('###', readme.indexOf('### Targets') + 4));
    expect(section.length, 'README has a "### Targets" section').toBeGreaterThan(100);
    for (const k of targetKinds()) {
      expect(section, `README names ${k.kind}`).toContain(`\`${k.kind}\``);
      for (const x of k.keys) expect(section, `README names ${k.kind}'s key ${x.key}`).toMatch(new RegExp(`\`${x.key}\``));
    }
  });
});
