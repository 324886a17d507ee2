/**
 * Validator issues in wellsmith's voice. zod reports what it checked ("Too small: expected array to
 * have >=1 items", "Invalid key in record"); a user needs the field, what it must be, what was
 * written and, for a mistyped key, the key that was probably meant. Every file wellsmith reads
 * (specs, campaign files, recorded results) goes through describeIssue.
 */
import type { z } from 'zod';
import { didYouMean } from './suggest.js';

/** "stack[2].thickness" -> ["stack", 2, "thickness"]. */
export function fieldPath(field: string): (string | number)[] {
  const out: (string | number)[] = [];
  for (const m of field.matchAll(/([^.[\]]+)|\[(\d+)\]/g)) out.push(m[2] !== undefined ? Number(m[2]) : (m[1] as string));
  return out;
}

/** ["stack", 2, "thickness"] -> "stack[2].thickness". */
export function fieldName(path: readonly PropertyKey[]): string {
  let s = '';
  for (const p of path) s += typeof p === 'number' ? `[${p}]` : s === '' ? String(p) : `.${String(p)}`;
  return s === '' ? '(top level)' : s;
}

/** The definition zod keeps on every schema (its public types do not expose it). */
interface Def {
  readonly type: string;
  readonly shape?: Readonly<Record<string, z.ZodType>>;
  readonly innerType?: z.ZodType;
  readonly element?: z.ZodType;
  readonly valueType?: z.ZodType;
  readonly options?: readonly z.ZodType[];
  readonly in?: z.ZodType;
  readonly catchall?: z.ZodType;
}
const defOf = (s: z.ZodType): Def => (s as unknown as { _zod: { def: Def } })._zod.def;

/** The schema itself with optional/default/nullable/pipe wrappers taken off. */
function unwrap(s: z.ZodType): z.ZodType {
  let cur = s;
  for (let k = 0; k < 16; k++) {
    const d = defOf(cur);
    const inner = d.type === 'pipe' ? d.in : d.innerType;
    if (!inner) return cur;
    cur = inner;
  }
  return cur;
}

/** The keys an object schema (or every object of a union) allows, in declaration order; [] for other schemas. */
export function objectKeys(schema: z.ZodType): string[] {
  const d = defOf(unwrap(schema));
  if (d.type === 'object' && d.shape) return Object.keys(d.shape);
  if (d.type === 'union' && d.options) return [...new Set(d.options.flatMap(objectKeys))];
  return [];
}

/** The schema at a path below `schema` (array indices, object keys, record values), or undefined. */
export function schemaAt(schema: z.ZodType, path: readonly PropertyKey[]): z.ZodType | undefined {
  let cur: z.ZodType | undefined = schema;
  for (const p of path) {
    if (!cur) return undefined;
    const d = defOf(unwrap(cur));
    if (typeof p === 'number') cur = d.element;
    else if (d.type === 'object') cur = d.shape?.[String(p)] ?? d.catchall;
    else if (d.type === 'record') cur = d.valueType;
    else if (d.type === 'union') cur = d.options?.map((o) => schemaAt(o, [p])).find((x) => x !== undefined);
    else return undefined;
  }
  return cur;
}

/** A value as a message quotes it: JSON, cut to a readable length. */
export function quote(value: unknown): string {
  let s: string;
  try {
    s = JSON.stringify(value) ?? String(value);
  } catch {
    s = String(value);
  }
  return s.length > 60 ? `${s.slice(0, 57)}…` : s;
}

const TYPE_NAMES: Readonly<Record<string, string>> = {
  number: 'a number', int: 'a whole number', string: 'text', boolean: 'true or false', array: 'a list', object: 'a mapping of keys to values',
  record: 'a mapping of keys to values', literal: 'a fixed value', null: 'nothing',
};
const typeName = (t: string): string => TYPE_NAMES[t] ?? t;

/** What a union accepts, from the types its options expected. */
function unionExpects(issue: z.core.$ZodIssueInvalidUnion): string {
  const expected = new Set(issue.errors.flatMap((branch) => branch.filter((i) => i.code === 'invalid_type' && i.path.length === 0).map((i) => (i as z.core.$ZodIssueInvalidType).expected as string)));
  if (expected.has('object') && expected.has('number')) return 'a fraction from 0 to 1, the name of a vary variable, or a grade { from: 0.1, to: 0.3 }';
  if (expected.has('number') && expected.has('string')) return 'a number or a quantity with its unit, such as "10 nm"';
  return [...expected].map(typeName).join(' or ') || 'one of the allowed forms';
}

/** Whether a key is a layer's element fraction (In, Al, Ga, As…): a chemical symbol. */
const isElementKey = (key: string): boolean => /^[A-Z][a-z]?$/.test(key);

/** The key of a layer (or repeat entry) a path ends on — stack[i].KEY, stack[i].repeat[j].KEY … — or undefined. */
function layerExtraKey(path: readonly PropertyKey[]): string | undefined {
  if (path[0] !== 'stack' || path.length < 3 || path.length % 2 === 0) return undefined;
  for (let k = 1; k < path.length - 1; k += 2) {
    if (typeof path[k] !== 'number' || (k + 1 < path.length - 1 && path[k + 1] !== 'repeat')) return undefined;
  }
  const last = path[path.length - 1];
  return typeof last === 'string' ? last : undefined;
}

/** The keys a layer takes besides element fractions. */
const LAYER_KEYS = ['material', 'thickness', 'label', 'strain', 'repeat', 'periods', 'per_period'];

export interface IssueOptions {
  /** The schema the issue came from: unknown keys then get "did you mean" and the keys allowed there. */
  readonly schema?: z.ZodType;
  /** Where the allowed keys are documented, for unknown keys. */
  readonly reference?: string;
}

/** The keys allowed at `path`, as a message lists them. */
const allowedList = (keys: readonly string[]): string => (keys.length > 20 ? `${keys.slice(0, 20).join(', ')}, …` : keys.join(', '));

/** A zod issue as "field: what was wrong, got …; what to do". */
export function describeIssue(issue: z.core.$ZodIssue, options: IssueOptions = {}): string {
  const field = fieldName(issue.path);
  const got = issue.input === undefined ? '' : `, got ${quote(issue.input)}`;
  const reference = options.reference ?? 'the spec schema (schema/spec.schema.json)';
  // A layer's extra keys are element fractions; any other key there is most likely a typing error.
  const key = layerExtraKey(issue.path);
  if (key !== undefined && !isElementKey(key) && !LAYER_KEYS.includes(key) && issue.code !== 'custom') {
    return `${field}: unknown key "${key}"${didYouMean(key, LAYER_KEYS)}; a layer takes material, thickness, label, strain and element fractions such as In: 0.2`;
  }
  switch (issue.code) {
    case 'unrecognized_keys': {
      const unknown = issue.keys[0] as string;
      const allowed = options.schema ? objectKeys(schemaAt(options.schema, issue.path) ?? options.schema) : [];
      const more = issue.keys.length > 1 ? ` (also ${issue.keys.slice(1).map((k) => `"${k}"`).join(', ')})` : '';
      return `${fieldName([...issue.path, unknown])}: unknown key "${unknown}"${more}${didYouMean(unknown, allowed)}; ${allowed.length ? `the keys here are ${allowedList(allowed)}` : `check its spelling against ${reference}`}`;
    }
    case 'invalid_type':
      if (issue.input === undefined) return `${field}: is required (${typeName(issue.expected)})`;
      return `${field}: expected ${typeName(issue.expected)}${got}`;
    case 'invalid_union': {
      if (issue.input === undefined) return `${field}: is required`;
      // A discriminated union (e.g. wire.shape.kind) names its allowed kinds.
      const d = issue as { discriminator?: string; options?: readonly unknown[] };
      if (d.discriminator !== undefined && Array.isArray(d.options)) {
        const kind = (issue.input as Record<string, unknown> | null)?.[d.discriminator];
        const kinds = d.options.map(String);
        return `${field}: unknown kind ${quote(kind)}${didYouMean(String(kind), kinds)}; use one of ${kinds.map((o) => `"${o}"`).join(', ')}`;
      }
      return `${field}: expected ${unionExpects(issue)}${got}`;
    }
    case 'too_small': {
      const min = Number(issue.minimum);
      if (issue.origin === 'array') return `${field}: must list at least ${min} entr${min === 1 ? 'y' : 'ies'}${got}`;
      if (issue.origin === 'string') return `${field}: must not be empty`;
      return `${field}: must be ${issue.inclusive ? 'at least' : 'above'} ${min}${got}`;
    }
    case 'too_big': {
      const max = Number(issue.maximum);
      if (issue.origin === 'array') return `${field}: must list at most ${max} entries, got ${Array.isArray(issue.input) ? issue.input.length : 'more'}`;
      if (issue.origin === 'string') return `${field}: must be at most ${max} characters long`;
      return `${field}: must be ${issue.inclusive ? 'at most' : 'below'} ${max}${got}`;
    }
    case 'invalid_value': {
      const values = issue.values.map(String);
      return `${field}: must be one of ${values.join(', ')}${got}${didYouMean(String(issue.input), values)}`;
    }
    case 'invalid_format':
      // Our patterns carry their own message ("must be a name of letters…"); zod's own starts with "Invalid".
      return `${field}: ${issue.message.startsWith('Invalid') ? `has the wrong form (${issue.format})` : issue.message}${got}`;
    case 'invalid_key': {
      const inner = issue.issues[0];
      const why = inner && !inner.message.startsWith('Invalid') ? inner.message : 'is not an allowed name';
      return `${field}: the name ${quote(issue.path[issue.path.length - 1])} ${why}`;
    }
    case 'invalid_element':
      return `${field}: an entry is not allowed${got}`;
    case 'not_multiple_of':
      return `${field}: must be a multiple of ${String(issue.divisor)}${got}`;
    default:
      return `${field}: ${issue.message}${got}`;
  }
}

/** How many problems a message lists before "and N more". */
export const LISTED_PROBLEMS = 3;

/**
 * Several issues as one line: the first in full, then up to LISTED_PROBLEMS − 1 more after "also:",
 * then "(and N more problems)". Issues on a field already described are folded into it.
 */
export function describeIssues(issues: readonly z.core.$ZodIssue[], options: IssueOptions & { readonly locate?: (field: string) => number | undefined } = {}): { text: string; field: string } {
  const seen = new Set<string>();
  const parts: string[] = [];
  let first = '';
  for (const issue of issues) {
    const field = issue.code === 'unrecognized_keys' ? fieldName([...issue.path, issue.keys[0] as string]) : fieldName(issue.path);
    if (seen.has(field)) continue;
    seen.add(field);
    if (parts.length === 0) first = field;
    const line = options.locate?.(field);
    parts.push(`${describeIssue(issue, options)}${line ? ` (line ${line})` : ''}`);
  }
  const shown = parts.slice(0, LISTED_PROBLEMS);
  const rest = parts.length - shown.length;
  const text = shown.length > 1 ? `${shown[0]}; also: ${shown.slice(1).join('; ')}` : (shown[0] ?? '');
  return { text: `${text}${rest > 0 ? ` (and ${rest} more problem${rest > 1 ? 's' : ''})` : ''}`, field: first };
}
