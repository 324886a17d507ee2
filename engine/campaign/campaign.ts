/**
 * A campaign file: one base spec plus sweep axes whose Cartesian product is a list of named,
 * deterministic jobs. Each axis sets one field path of the spec (e.g. `targets[0].wavelength`,
 * `stack[1].material`) or a design option (`design.seed`) to a list of values or a range
 * `{from, to, step}` with a unit. Job order and names depend only on the file, so a job's index
 * (used for sharding) and its spec hash are the same on every machine.
 */
import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { dirname, extname, resolve } from 'node:path';
import { z } from 'zod';
import { InputError } from '../errors.js';
import { DEFAULT_DESIGN_OPTIONS, type DesignOptions } from '../design/search.js';
import { fieldPath, parseYamlText, readInputText, validateSpec } from '../input/load.js';
import { specWarnings } from '../input/check.js';
import { describeIssues } from '../input/issues.js';
import type { Spec } from '../input/schema.js';
import { splitQuantity } from '../input/units.js';

/** Largest campaign file (and base spec it names) read: far above any real one, far below what exhausts memory. */
export const MAX_CAMPAIGN_BYTES = 4 * 1024 * 1024;
/** Most jobs one campaign may expand to (each holds its validated spec, about 2 kB in memory and in the store). */
export const MAX_JOBS = 100_000;
/** What a base spec named by path must end with: a spec, never any other file. */
const SPEC_EXTENSIONS = ['.yaml', '.yml', '.json'];

const scalar = z.union([z.string(), z.number(), z.boolean()]);
const range = z.object({ from: z.union([z.string(), z.number()]), to: z.union([z.string(), z.number()]), step: z.union([z.string(), z.number()]) }).strict();

const designOptionsSchema = z.object({
  starts: z.number().int().min(1).optional(),
  top: z.number().int().min(1).optional(),
  seed: z.number().int().min(0).optional(),
  evaluations: z.number().int().min(10).optional(),
  step: z.number().gt(0).max(0.1).optional(),
}).strict();

/**
 * What a job does with its spec. Only `design` runs today; a Monte-Carlo yield job of the best
 * design (engine/tolerance/) is meant to join as a second kind.
 */
export const JOB_KINDS = ['design'] as const;
export type JobKind = (typeof JOB_KINDS)[number];

export const campaignSchema = z.object({
  title: z.string().optional(),
  kind: z.enum(JOB_KINDS).default('design'),
  /** The base spec: inline, or a path relative to the campaign file. */
  spec: z.union([z.string(), z.record(z.string(), z.unknown())]),
  design: designOptionsSchema.default({}),
  /** Axis path -> values (scalars or whole replacement objects) or a range with a unit. */
  sweep: z.record(z.string(), z.union([z.array(z.union([scalar, z.record(z.string(), z.unknown()), z.array(z.unknown())])).min(1), range])).default({}),
}).strict();

export type CampaignFile = z.infer<typeof campaignSchema>;

export type JobOptions = Pick<DesignOptions, 'starts' | 'top' | 'seed' | 'maxEvaluations' | 'compositionStep'>;

export interface Job {
  /** Position in the expansion (axis order of the file, last axis fastest), 0-based. */
  readonly index: number;
  /** e.g. "wavelength=1310nm,material=InGaAs"; "base" when there are no axes. */
  readonly name: string;
  readonly kind: JobKind;
  readonly spec: Spec;
  readonly options: JobOptions;
  /** sha256 (first 16 hex digits) of the canonical JSON of {kind, spec, options}. */
  readonly hash: string;
}

export interface Campaign {
  readonly title: string;
  readonly origin: string;
  readonly jobs: readonly Job[];
  /** sha256 (16 hex) over the job hashes in order: shard stores of one campaign share it. */
  readonly hash: string;
  /** Notes on what the file may not mean as written (a range whose end is off its step grid), each starting with its field. */
  readonly warnings: readonly string[];
}

/** JSON with object keys sorted, so equal values hash equally whatever their key order. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    return `{${Object.keys(value).sort().filter((k) => (value as Record<string, unknown>)[k] !== undefined)
      .map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

export const hash16 = (text: string): string => createHash('sha256').update(text).digest('hex').slice(0, 16);

interface AxisValue { readonly label: string; readonly value: unknown }
interface Axis { readonly path: string; readonly name: string; readonly values: readonly AxisValue[] }

/** Rounded to 12 significant digits so 1300 + 3·10 is written "1330", not "1330.0000000000002". */
const tidy = (x: number): number => Number(x.toPrecision(12));

/** How far (in steps) a range's end may lie off a whole number of steps and still count as on the grid: decimal-to-binary residue, far below any step a user means. */
const GRID_TOLERANCE = 1e-6;

/**
 * A range's values from `from` in steps of `step` up to `to`; an end that is not on the step grid
 * (940…1000 nm step 25 stops at 990 nm) adds a warning that names the last value and the two ends
 * on the grid around `to`.
 */
function expandRange(path: string, r: z.infer<typeof range>, warnings: string[]): unknown[] {
  const [from, to, step] = [r.from, r.to, r.step].map(splitQuantity);
  if (!from || !to || !step) throw new InputError('bad-value', `sweep.${path}: from, to and step must be numbers or quantities such as "1300 nm", got ${JSON.stringify(r)}`);
  if (from.unit !== to.unit || from.unit !== step.unit) throw new InputError('bad-value', `sweep.${path}: from, to and step must share one unit, got "${from.unit}", "${to.unit}", "${step.unit}"; write them in the same unit`);
  const steps = (to.value - from.value) / step.value;
  const n = Math.floor(steps + GRID_TOLERANCE) + 1;
  if (!(step.value > 0) || !(n >= 1) || n > MAX_JOBS) throw new InputError('bad-value', `sweep.${path}: needs step > 0 and from ≤ to (at most ${MAX_JOBS} values), got from ${r.from}, to ${r.to}, step ${r.step}`);
  const text = (x: number): string => `${tidy(x)}${from.unit ? ` ${from.unit}` : ''}`;
  if (steps - (n - 1) > GRID_TOLERANCE) {
    const last = from.value + (n - 1) * step.value;
    warnings.push(`sweep.${path}: the range from ${text(from.value)} to ${text(to.value)} in steps of ${text(step.value)} ends at ${text(last)}, short of ${text(to.value)}, which is not on the step grid; write to: ${text(last)} or to: ${text(last + step.value)}, or pick a step that divides ${text(to.value - from.value)}`);
  }
  return Array.from({ length: n }, (_, k) => {
    const v = tidy(from.value + k * step.value);
    return from.unit === '' && typeof r.from === 'number' ? v : `${v} ${from.unit}`.trim();
  });
}

const labelOf = (value: unknown, k: number): string =>
  typeof value === 'object' && value !== null ? `#${k + 1}` : String(value).replace(/\s+/g, '');

function axisName(path: string): string {
  const segments = fieldPath(path).filter((p): p is string => typeof p === 'string');
  return segments[segments.length - 1] ?? path;
}

/** Returns a copy of `root` with the value at `path` replaced; the path must already exist. */
function setPath(root: unknown, path: readonly (string | number)[], value: unknown, where: string): unknown {
  if (path.length === 0) return value;
  const [head, ...rest] = path as [string | number, ...(string | number)[]];
  if (Array.isArray(root) && typeof head === 'number' && head < root.length) {
    return root.map((x, i) => (i === head ? setPath(x, rest, value, where) : x));
  }
  if (root !== null && typeof root === 'object' && !Array.isArray(root) && typeof head === 'string' && (head in root || rest.length === 0)) {
    return { ...root, [head]: setPath((root as Record<string, unknown>)[head], rest, value, where) };
  }
  throw new InputError('bad-value', `sweep.${where}: the base spec has no "${where}" to replace; check the path (e.g. "targets[0].wavelength", "stack[1].material")`, `sweep.${where}`);
}

const DESIGN_KEYS: Readonly<Record<string, keyof JobOptions>> = { starts: 'starts', top: 'top', seed: 'seed', evaluations: 'maxEvaluations', step: 'compositionStep' };

function jobOptions(file: CampaignFile): JobOptions {
  return {
    starts: file.design.starts ?? DEFAULT_DESIGN_OPTIONS.starts,
    top: file.design.top ?? DEFAULT_DESIGN_OPTIONS.top,
    seed: file.design.seed ?? DEFAULT_DESIGN_OPTIONS.seed,
    maxEvaluations: file.design.evaluations ?? DEFAULT_DESIGN_OPTIONS.maxEvaluations,
    compositionStep: file.design.step ?? DEFAULT_DESIGN_OPTIONS.compositionStep,
  };
}

/** Expands a validated campaign into its jobs (Cartesian product of the axes, last axis fastest). */
export function expandCampaign(file: CampaignFile, baseSpec: unknown, origin: string, locate: (field: string) => number | undefined = () => undefined): Campaign {
  const warnings: string[] = [];
  const axes: Axis[] = Object.entries(file.sweep).map(([path, v]) => {
    const values = Array.isArray(v) ? v : expandRange(path, v, warnings);
    return { path, name: axisName(path), values: values.map((value, k) => ({ value, label: labelOf(value, k) })) };
  });
  // Counted before anything is expanded: the product grows faster than any one axis.
  const count = axes.reduce((n, a) => n * a.values.length, 1);
  if (count > MAX_JOBS) {
    throw new InputError('bad-value', `sweep: the axes give ${axes.map((a) => a.values.length).join(' × ')} = ${count} jobs, more than the limit of ${MAX_JOBS} per campaign; split the sweep over several campaign files or use coarser steps`, 'sweep');
  }
  let combos: AxisValue[][] = [[]];
  for (const axis of axes) combos = combos.flatMap((c) => axis.values.map((v) => [...c, v]));
  const base = jobOptions(file);
  const seen = new Map<string, number>();
  const specNotes = new Map<string, string>();
  const jobs = combos.map((combo, index): Job => {
    let spec: unknown = baseSpec;
    let options = base;
    combo.forEach((v, a) => {
      const path = axes[a]!.path;
      const option = path.startsWith('design.') ? DESIGN_KEYS[path.slice('design.'.length)] : undefined;
      if (path.startsWith('design.')) {
        if (!option || typeof v.value !== 'number') throw new InputError('bad-value', `sweep.${path}: design options that can be swept are ${Object.keys(DESIGN_KEYS).join(', ')}, each with numbers, got ${JSON.stringify(v.value)}`, `sweep.${path}`);
        options = { ...options, [option]: v.value };
      } else {
        spec = setPath(spec, fieldPath(path), v.value, path);
      }
    });
    const name = combo.length === 0 ? 'base' : combo.map((v, a) => `${axes[a]!.name}=${v.label}`).join(',');
    if (seen.has(name)) throw new InputError('bad-value', `sweep: jobs ${seen.get(name)! + 1} and ${index + 1} would share the name "${name}"; give each axis distinct values`);
    seen.set(name, index);
    let valid: Spec;
    try {
      valid = validateSpec(spec);
    } catch (e) {
      if (e instanceof InputError) {
        const field = typeof file.spec === 'string' ? undefined : `spec.${e.field ?? ''}`;
        const line = field ? locate(field) : undefined;
        throw new InputError(e.code, `${origin}: job "${name}": ${e.message}${line && !/\(line \d+\)/.test(e.message) ? ` (line ${line})` : ''}`);
      }
      throw e;
    }
    // The spec's own warnings (bare numbers read in a default unit…), once each however many jobs share them.
    for (const w of specWarnings(valid)) if (!specNotes.has(w)) specNotes.set(w, name);
    return { index, name, kind: file.kind, spec: valid, options, hash: hash16(canonicalJson({ kind: file.kind, spec: valid, options })) };
  });
  for (const [w, job] of specNotes) warnings.push(`spec${jobs.length > 1 ? ` (job "${job}" and any others it applies to)` : ''}: ${w}`);
  return { title: file.title ?? origin, origin, jobs, hash: hash16(jobs.map((j) => `${j.name}:${j.hash}`).join('\n')), warnings };
}

/**
 * A union's issues taken from the one branch whose type the value has (a mapping under a sweep
 * key is a range, not a list), with their full paths, so a misspelt range key is named as such;
 * unknown keys first, since they explain the keys then missing. Other issues are kept as they are.
 */
function branchIssues(issue: z.core.$ZodIssue): z.core.$ZodIssue[] {
  if (issue.code !== 'invalid_union') return [issue];
  const fitting = issue.errors.filter((b) => !b.some((i) => i.code === 'invalid_type' && i.path.length === 0));
  if (fitting.length !== 1) return [issue];
  const inner = fitting[0]!.flatMap((i) => branchIssues({ ...i, path: [...issue.path, ...i.path] } as z.core.$ZodIssue));
  return [...inner.filter((i) => i.code === 'unrecognized_keys'), ...inner.filter((i) => i.code !== 'unrecognized_keys')];
}


/** Parses campaign text (YAML or JSON); `dir` resolves a base spec given as a path. */
export function parseCampaignText(text: string, origin: string, dir: string): Campaign {
  const { value, locate } = parseYamlText(text, origin);
  const r = campaignSchema.safeParse(value ?? {}, { reportInput: true });
  if (!r.success) {
    const { text, field } = describeIssues(r.error.issues.flatMap(branchIssues), { schema: campaignSchema, reference: 'the campaign schema (schema/campaign.schema.json)', locate });
    throw new InputError('schema', `${origin}: ${text}`, field);
  }
  if (typeof r.data.spec === 'string') {
    const specPath = resolve(dir, r.data.spec);
    // Only a spec file is read, and a file that is not one is never echoed: its content could be anything.
    if (!SPEC_EXTENSIONS.includes(extname(specPath).toLowerCase())) {
      throw new InputError('bad-value', `${origin}: spec: expected the path of a spec file ending in ${SPEC_EXTENSIONS.join(', ')}, got ${JSON.stringify(r.data.spec)}; name the base spec file or write the spec inline${locate('spec') ? ` (line ${locate('spec')})` : ''}`, 'spec');
    }
    const base = parseYamlText(readBounded(specPath, 'base spec'), specPath);
    if (base.value === null || typeof base.value !== 'object' || Array.isArray(base.value)) {
      throw new InputError('schema', `${origin}: spec: "${specPath}" is not a spec (a mapping with at least a "stack" list); check the path`, 'spec');
    }
    return expandCampaign(r.data, base.value, origin);
  }
  return expandCampaign(r.data, r.data.spec, origin, locate);
}

/** Reads a campaign input after checking, without reading it, that it is a file of at most MAX_CAMPAIGN_BYTES. */
function readBounded(path: string, what: string): string {
  let size: number | undefined;
  try {
    const st = statSync(path);
    if (!st.isFile() && !st.isDirectory()) throw new InputError('io', `cannot read ${what} "${path}": it is not a regular file; give the path of a file`);
    size = st.isFile() ? st.size : undefined;
  } catch (e) {
    if (e instanceof InputError) throw e;
    // Missing or unreadable: readInputText names the problem.
  }
  if (size !== undefined && size > MAX_CAMPAIGN_BYTES) {
    throw new InputError('io', `${what} "${path}" is ${(size / 1048576).toFixed(1)} MiB, more than the limit of ${MAX_CAMPAIGN_BYTES / 1048576} MiB; a campaign is one spec and its sweep axes: check that this is the right file`);
  }
  return readInputText(path, what);
}

/** Reads a campaign file. */
export function loadCampaignFile(path: string): Campaign {
  return parseCampaignText(readBounded(path, 'campaign file'), path, dirname(resolve(path)));
}
