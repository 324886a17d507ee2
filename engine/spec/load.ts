/**
 * Reading a spec: text (YAML or JSON) -> validated Spec, with every error naming the field and,
 * for files, the line. Errors found later (while resolving materials and variables) carry a field
 * path too; `locate` turns it into a line so the CLI can print "(line 14)" for them as well.
 */
import { readFileSync, statSync } from 'node:fs';
import { LineCounter, parseDocument, isMap, isPair, isScalar, type Document } from 'yaml';
import type { z } from 'zod';
import { InputError } from '../errors.js';
import { specSchema, type Spec } from './schema.js';

export interface LoadedSpec {
  readonly spec: Spec;
  /** Where the spec came from (file path, or "<inline>"). */
  readonly origin: string;
  /** 1-based line of a field path such as "stack[2].thickness", when the source has lines. */
  readonly locate: (field: string) => number | undefined;
}

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

function locator(doc: Document, lines: LineCounter): (field: string) => number | undefined {
  return (field) => {
    const path = fieldPath(field);
    // Walk down as far as the document goes: an unknown key's parent still has a line.
    for (let n = path.length; n >= 0; n--) {
      const head = path.slice(0, n);
      const parent = n === 0 ? doc.contents : doc.getIn(head.slice(0, -1), true);
      let range: readonly number[] | null | undefined;
      if (n > 0 && isMap(parent)) {
        const pair = parent.items.find((it) => isPair(it) && isScalar(it.key) && it.key.value === head[n - 1]);
        range = pair && isScalar(pair.key) ? pair.key.range : undefined;
      } else if (n > 0) {
        const node = doc.getIn(head, true) as { range?: readonly number[] } | undefined;
        range = node?.range;
      } else {
        range = (doc.contents as { range?: readonly number[] } | null)?.range;
      }
      if (range) return lines.linePos(range[0] as number).line;
    }
    return undefined;
  };
}

/** A zod issue as "field: what was wrong, got …" (shared by every file format wellsmith reads). */
export function describeIssue(issue: z.core.$ZodIssue): string {
  const field = fieldName(issue.path);
  switch (issue.code) {
    case 'unrecognized_keys':
      return `${fieldName([...issue.path, issue.keys[0] as string])}: unknown key "${issue.keys[0]}"; check its spelling against the spec schema (schema/spec.schema.json)`;
    case 'invalid_type':
      return issue.input === undefined
        ? `${field}: is required (expected ${issue.expected})`
        : `${field}: expected ${issue.expected}, got ${JSON.stringify(issue.input)}`;
    case 'invalid_union':
      if (issue.input === undefined) return `${field}: is required`;
      {
        // A discriminated union (e.g. wire.shape.kind) names its allowed kinds.
        const d = issue as { discriminator?: string; options?: readonly unknown[] };
        if (d.discriminator !== undefined && Array.isArray(d.options)) {
          const got = (issue.input as Record<string, unknown> | null)?.[d.discriminator];
          return `${field}: unknown kind ${JSON.stringify(got)}; use one of ${d.options.map((o) => JSON.stringify(o)).join(', ')}`;
        }
      }
      return `${field}: got ${JSON.stringify(issue.input)}, which is not a number, a quantity with a unit, a variable name or {from, to}`;
    default:
      return `${field}: ${issue.message}${issue.input !== undefined ? `, got ${JSON.stringify(issue.input)}` : ''}`;
  }
}

/** Validates an already-parsed value (e.g. from a library caller). */
export function validateSpec(value: unknown, locate: (field: string) => number | undefined = () => undefined): Spec {
  const r = specSchema.safeParse(value, { reportInput: true });
  if (r.success) return r.data;
  const first = r.error.issues[0] as z.core.$ZodIssue;
  const field = fieldName(first.path);
  const line = locate(first.code === 'unrecognized_keys' ? fieldName([...first.path, first.keys[0] as string]) : field);
  const more = r.error.issues.length > 1 ? ` (and ${r.error.issues.length - 1} more problem${r.error.issues.length > 2 ? 's' : ''})` : '';
  throw new InputError('schema', `${describeIssue(first)}${line ? ` (line ${line})` : ''}${more}`, field);
}

/** YAML (or JSON) text -> plain value and a field-path -> line lookup, for any file wellsmith reads. */
export function parseYamlText(text: string, origin: string): { readonly value: unknown; readonly locate: (field: string) => number | undefined } {
  const lines = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lines, prettyErrors: true, uniqueKeys: true });
  if (doc.errors.length > 0) {
    const e = doc.errors[0]!;
    const line = e.linePos?.[0]?.line;
    throw new InputError('parse', `${origin}: not valid YAML/JSON${line ? ` at line ${line}` : ''}: ${(e.message.split('\n')[0] ?? '').replace(/ at line \d+, column \d+:?$/, '')}`);
  }
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: 100 });
  } catch (e) {
    // yaml refuses documents whose aliases expand beyond maxAliasCount (an "alias bomb").
    throw new InputError('parse', `${origin}: not usable YAML: ${e instanceof Error ? e.message.split('\n')[0] : String(e)}; write the values out instead of nesting aliases`);
  }
  return { value, locate: locator(doc, lines) };
}

/** A campaign file names a base spec and sweeps it; a spec has layers or a wire. */
export const isCampaignFile = (v: Record<string, unknown>): boolean => 'sweep' in v && 'spec' in v && !('stack' in v) && !('wire' in v);

/** A spec has a stack or a wire and no sweep. */
export const isSpecFile = (v: Record<string, unknown>): boolean => ('stack' in v || 'wire' in v) && !('sweep' in v);

/** Parses spec text (YAML, of which JSON is a subset). */
export function parseSpecText(text: string, origin = '<inline>'): LoadedSpec {
  const { value, locate } = parseYamlText(text, origin);
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new InputError('schema', `${origin}: a spec must be a mapping with at least a "stack" list, got ${value === null ? 'an empty file' : Array.isArray(value) ? 'a list' : typeof value}`);
  }
  if (isCampaignFile(value as Record<string, unknown>)) {
    throw new InputError('schema', `${origin}: this is a campaign file (it has "sweep:" and "spec:"), not a spec; run it with "wellsmith campaign ${origin}"`);
  }
  return { spec: validateSpec(value, locate), origin, locate };
}

/** Largest spec file read (bytes): hand-written specs are a few kB; 4 MiB holds ~50 000 layers. */
export const MAX_SPEC_BYTES = 4 * 1048576;

/**
 * Reads a text input (spec, campaign file, report input) of at most maxBytes, checked before it is
 * read so that a wrong file cannot exhaust memory; a failure is one input-error line naming the file.
 */
export function readInputText(path: string, what: string, maxBytes = MAX_SPEC_BYTES): string {
  let size = 0;
  try {
    size = statSync(path).size;
  } catch {
    // Missing or unreadable: the read below names the problem.
  }
  if (size > maxBytes) {
    throw new InputError('io', `${what} "${path}" is ${(size / 1048576).toFixed(1)} MiB, more than the limit of ${maxBytes / 1048576} MiB; check that this is the right file`);
  }
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? ': no such file' : code === 'EISDIR' ? ': it is a folder' : code ? ` (${code})` : '';
    throw new InputError('io', `cannot read ${what} "${path}"${why}; check the path`);
  }
}

/** Reads and parses a spec file. */
export function loadSpecFile(path: string): LoadedSpec {
  return parseSpecText(readInputText(path, 'spec file'), path);
}
