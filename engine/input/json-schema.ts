/**
 * The shipped JSON Schemas, generated from the same zod schemas that validate the files: the spec
 * (with every target kind of the objectives registry as its own strict object, so an editor
 * completes and checks each target's keys) and the campaign file (whose inline spec refers to the
 * spec schema).
 */
import { z } from 'zod';
import { specSchema } from './schema.js';
import { campaignSchema } from '../campaign/campaign.js';
import { OBJECTIVES } from '../../objectives/index.js';

const BASE = 'https://wellsmith.invalid/schema/';
const generate = (schema: z.ZodType): Record<string, unknown> => z.toJSONSchema(schema, { io: 'input', target: 'draft-2020-12' }) as Record<string, unknown>;

/**
 * One target, as the registry dispatches it: any one of the kinds, each an object that requires
 * its kind's key and allows no other keys, with the kind's description and examples. The JSON
 * Schema form of objectives/index.ts compileTargets (which gives the messages of the CLI).
 */
export function targetJsonSchema(): Record<string, unknown> {
  const kinds = OBJECTIVES.map((o): Record<string, unknown> => {
    const { $schema: _dialect, ...kind } = generate(o.objective.schema);
    return { ...kind, title: o.key, description: o.objective.description, ...(o.objective.examples ? { examples: o.objective.examples } : {}) };
  });
  return { description: 'A design target: one of the kinds below, named by its first key ("wellsmith targets" lists them with examples)', anyOf: kinds };
}

export function specJsonSchema(): Record<string, unknown> {
  const out = generate(specSchema);
  const properties = out.properties as Record<string, Record<string, unknown>>;
  properties.targets = { type: 'array', description: 'Design targets (inverse design): each entry one target kind', items: targetJsonSchema() };
  return {
    ...out,
    $id: `${BASE}spec.schema.json`,
    title: 'wellsmith spec',
    description: 'A layer stack (or wire cross-section) with free variables and design targets.',
  };
}

/** What each campaign key means (engine/campaign/campaign.ts documents them in comments; its zod schema carries no descriptions). */
const CAMPAIGN_KEYS: Readonly<Record<string, string>> = {
  title: 'A name for the campaign, shown in reports and the run store',
  kind: 'What each job does with its spec: design (the only kind today)',
  spec: 'The base spec: the path of a spec file (.yaml, .yml, .json) relative to the campaign file, or the spec written inline',
  design: 'Options of every job\'s design search: starts, top, seed, evaluations (per start) and step (composition step), as for "wellsmith design"',
  sweep: 'Axes of the sweep, keyed by a field path of the base spec ("targets[0].wavelength", "stack[2].material") or a design option ("design.seed"): a list of values, or a range { from, to, step } with one unit. Jobs are the Cartesian product, the last axis fastest',
};

export function campaignJsonSchema(): Record<string, unknown> {
  const out = generate(campaignSchema);
  const properties = out.properties as Record<string, Record<string, unknown>>;
  for (const [key, description] of Object.entries(CAMPAIGN_KEYS)) if (properties[key]) properties[key] = { ...properties[key], description };
  // An inline base spec is a spec: refer to its schema rather than "any object".
  properties.spec = { description: CAMPAIGN_KEYS.spec, anyOf: [{ type: 'string', description: 'Path of the base spec file' }, { $ref: 'spec.schema.json' }] };
  return {
    ...out,
    $id: `${BASE}campaign.schema.json`,
    title: 'wellsmith campaign',
    description: 'A base spec and sweep axes: every combination is a design job of "wellsmith campaign".',
    examples: [{ title: 'telecom sweep', spec: 'telecom-1550-inp.yaml', design: { starts: 4, top: 2, seed: 7, evaluations: 40 }, sweep: { 'targets[0].wavelength': { from: '1450 nm', to: '1610 nm', step: '80 nm' } } }],
  };
}
