/**
 * `wellsmith targets [KIND]`: the target language, read from the objectives registry — every kind
 * with its keys (required or optional, with their descriptions) and examples as a spec writes them.
 * The same text closes `wellsmith design --help`; the JSON Schema carries the same keys.
 */
import { stringify } from 'yaml';
import type { z } from 'zod';
import { OBJECTIVES, targetKeys } from '../../objectives/index.js';
import type { Objective } from '../../objectives/types.js';
import { InputError } from '../errors.js';
import { schemaAt } from '../input/issues.js';
import { didYouMean } from '../input/suggest.js';
import { failure, success, type Outcome } from './exit.js';
import { toJson } from '../text.js';

export interface TargetKey {
  readonly key: string;
  readonly required: boolean;
  readonly description: string;
}

/** One target kind as listed: its distinguishing key, description, keys and examples. */
export interface TargetKind {
  readonly kind: string;
  readonly description: string;
  readonly keys: readonly TargetKey[];
  readonly examples: readonly Readonly<Record<string, unknown>>[];
}

function keysOf(objective: Objective<unknown>): TargetKey[] {
  return targetKeys(objective).map((key) => {
    const s = schemaAt(objective.schema, [key]) as z.ZodType;
    return { key, required: !s.safeParse(undefined).success, description: s.description ?? '' };
  });
}

/** Every registered target kind, in dispatch order. */
export const targetKinds = (): TargetKind[] =>
  OBJECTIVES.map((o) => ({ kind: o.key, description: o.objective.description, keys: keysOf(o.objective), examples: o.objective.examples ?? [] }));

/** A target as one YAML flow map, as it sits under "targets:". */
export const flowYaml = (target: Readonly<Record<string, unknown>>): string => stringify(target, { collectionStyle: 'flow' }).trim();

/** The short listing: one line per kind with its keys and one example (the close of "design --help"). */
export function targetsSummary(): string {
  return targetKinds().map((k) => [
    `  ${k.kind}: ${k.description}`,
    `      keys: ${k.keys.map((x) => (x.required ? x.key : `[${x.key}]`)).join(', ')}`,
    ...k.examples.slice(0, 1).map((e) => `      e.g.  - ${flowYaml(e)}`),
  ].join('\n')).join('\n');
}

/** The full entry of one kind: every key with its description, every example. */
export function describeKind(k: TargetKind): string {
  const width = Math.max(...k.keys.map((x) => x.key.length));
  return [
    `${k.kind}: ${k.description}`,
    '',
    'keys (required ones marked *):',
    ...k.keys.map((x) => `  ${x.required ? '*' : ' '} ${x.key.padEnd(width)}  ${x.description}`),
    '',
    'examples (under "targets:" in a spec):',
    ...k.examples.map((e) => `  - ${flowYaml(e)}`),
  ].join('\n');
}

const TARGETS_INTRO = 'Targets go under "targets:" in a spec, one mapping per target; the key that names the kind comes first. Keys in [brackets] are optional. Quantities take their unit ("976 nm", "5 meV"); "wellsmith targets KIND" shows every key of a kind.';

export function runTargets(args: { readonly kind: string | undefined; readonly json: boolean }): Outcome {
  try {
    const kinds = targetKinds();
    if (args.kind === undefined) return success(`${args.json ? toJson(kinds) : `${TARGETS_INTRO}\n\n${targetsSummary()}`}\n`);
    const k = kinds.find((x) => x.kind === args.kind);
    if (!k) throw new InputError('bad-value', `targets: no target kind "${args.kind}"${didYouMean(args.kind, kinds.map((x) => x.kind))}; the kinds are ${kinds.map((x) => x.kind).join(', ')}`);
    return success(`${args.json ? toJson(k) : describeKind(k)}\n`);
  } catch (e) {
    return failure(e);
  }
}
