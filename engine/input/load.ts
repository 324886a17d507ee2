/**
 * Reading a spec: text (YAML or JSON) -> validated Spec, with every error naming the field and,
 * for files, the line. Errors found later (while resolving materials and variables) carry a field
 * path too; `locate` turns it into a line so the CLI can print "(line 14)" for them as well.
 */
import { readFileSync, statSync } from 'node:fs';
import { LineCounter, parseDocument, isMap, isPair, isScalar, type Document } from 'yaml';
import { InputError } from '../errors.js';
import { specSchema, type Spec } from './schema.js';
import { describeIssues, fieldPath } from './issues.js';
import { checkSpec, specWarnings } from './check.js';

export interface LoadedSpec {
  readonly spec: Spec;
  /** Where the spec came from (file path, or "<inline>"). */
  readonly origin: string;
  /** 1-based line of a field path such as "stack[2].thickness", when the source has lines. */
  readonly locate: (field: string) => number | undefined;
  /** Notes on what the spec may not mean as written (engine/input/check.ts specWarnings), each with its field and line. */
  readonly warnings: readonly string[];
}

export { fieldName, fieldPath, describeIssue } from './issues.js';

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

/**
 * Validates an already-parsed value (e.g. from a library caller): the schema (up to
 * LISTED_PROBLEMS problems named in one message), then what the schema cannot see — targets that
 * can never be evaluated, variables no layer uses (engine/input/check.ts).
 */
export function validateSpec(value: unknown, locate: (field: string) => number | undefined = () => undefined): Spec {
  const r = specSchema.safeParse(value, { reportInput: true });
  if (!r.success) {
    const { text, field } = describeIssues(r.error.issues, { schema: specSchema, locate });
    throw new InputError('schema', text, field);
  }
  try {
    checkSpec(r.data);
  } catch (e) {
    const line = e instanceof InputError && e.field ? locate(e.field) : undefined;
    if (line && !/\(line \d+\)/.test((e as Error).message)) throw new InputError((e as InputError).code, `${(e as Error).message} (line ${line})`, (e as InputError).field);
    throw e;
  }
  return r.data;
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
  const spec = validateSpec(value, locate);
  return { spec, origin, locate, warnings: specWarnings(spec, locate) };
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
