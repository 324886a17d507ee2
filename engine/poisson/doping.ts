/**
 * Doping of a stack resolved against its Structure: where the ionised donors and acceptors sit
 * along z (volume densities over layers or parts of them, delta sheets, a background), as plain
 * data the Poisson step integrates exactly. Donors and acceptors are taken fully ionised (common
 * practice for the shallow dopants of detector and modulation-doped structures; a donor level's
 * freeze-out is not modelled). Units: z in nm from the first layer's start, densities nm⁻³
 * (volume) and nm⁻² (sheet), net = donors − acceptors; totals in cm⁻² for reports.
 */
import { InputError } from '../errors.js';
import type { Spec } from '../input/schema.js';
import { parseLength, splitQuantity } from '../input/units.js';
import { stackLayers, type Structure } from '../structure.js';
import { dopingSectionSchema, layerDopingSchema, type BackgroundSpec, type DopingEntrySpec, type DopingSectionSpec, type LayerDopingSpec } from './schema.js';
import type { z } from 'zod';

/** A sheet density in cm⁻² times this is in nm⁻²; a volume density in cm⁻³ times the next is in nm⁻³. */
export const SHEET_CM2_TO_NM2 = 1e-14;
export const VOLUME_CM3_TO_NM3 = 1e-21;

/** A uniformly doped stretch [z0, z1] (nm) with its net ionised density (nm⁻³, donors positive). */
export interface DopedSegment {
  readonly z0_nm: number;
  readonly z1_nm: number;
  readonly density_nm3: number;
  /** Layer index, or −1 for the background. */
  readonly layer: number;
}

/** A delta sheet at z (nm) with its net ionised density (nm⁻², donors positive). */
export interface DopedSheet {
  readonly z_nm: number;
  readonly density_nm2: number;
  readonly layer: number;
}

export interface DopingProfile {
  readonly segments: readonly DopedSegment[];
  readonly sheets: readonly DopedSheet[];
  /** Ionised donors and acceptors per unit area of the whole stack (cm⁻²). */
  readonly donors_cm2: number;
  readonly acceptors_cm2: number;
  /** donors − acceptors (cm⁻²): the free carriers neutrality asks for (electrons if positive, holes if negative). */
  readonly net_cm2: number;
}

/** The doping keys of a stack, per layer of its Structure in order, as the spec writes them. */
export interface DopingInput {
  readonly layers: readonly (LayerDopingSpec | undefined)[];
  /** Where each layer is written ("stack[2].repeat[1]"), for messages; default "layer k". */
  readonly fields?: readonly string[];
  readonly background?: BackgroundSpec;
}

type Density = { readonly kind: 'volume'; readonly value: number } | { readonly kind: 'sheet'; readonly value: number };

const VOLUME_UNITS: Readonly<Record<string, number>> = { 'cm-3': VOLUME_CM3_TO_NM3, 'cm^-3': VOLUME_CM3_TO_NM3, 'cm⁻³': VOLUME_CM3_TO_NM3, '/cm3': VOLUME_CM3_TO_NM3, '/cm^3': VOLUME_CM3_TO_NM3, 'm-3': 1e-27, 'm^-3': 1e-27, 'm⁻³': 1e-27 };
const SHEET_UNITS: Readonly<Record<string, number>> = { 'cm-2': SHEET_CM2_TO_NM2, 'cm^-2': SHEET_CM2_TO_NM2, 'cm⁻²': SHEET_CM2_TO_NM2, '/cm2': SHEET_CM2_TO_NM2, '/cm^2': SHEET_CM2_TO_NM2, 'm-2': 1e-18, 'm^-2': 1e-18, 'm⁻²': 1e-18 };

/**
 * A dopant density as written: "1e18 cm-3" (volume, to nm⁻³) or "5e11 cm-2" (sheet, to nm⁻²);
 * m⁻³ and m⁻² are accepted too. A bare number is refused, since it could be either.
 */
export function parseDopantDensity(raw: string | number, field: string): Density {
  const q = splitQuantity(raw);
  const fail = (what: string): never => { throw new InputError('bad-value', `${field}: ${what}, got ${JSON.stringify(raw)}; write e.g. "1e18 cm-3" for a volume density or "5e11 cm-2" for a sheet`, field); };
  if (!q) return fail('expected a density with its unit');
  if (!(q.value >= 0) || !Number.isFinite(q.value)) return fail('a density must be zero or positive');
  if (q.unit === '') return fail('a density needs its unit (cm-3 for a volume, cm-2 for a sheet)');
  const v = VOLUME_UNITS[q.unit];
  if (v !== undefined) return { kind: 'volume', value: q.value * v };
  const s = SHEET_UNITS[q.unit];
  if (s !== undefined) return { kind: 'sheet', value: q.value * s };
  return fail(`unknown density unit "${q.unit}"`);
}

/** A position inside a layer (nm from its start): nm, Å or ML of the layer's lattice, within [0, thickness]. */
function positionIn(raw: string | number, layer: Structure['layers'][number], field: string): number {
  const l = parseLength(raw);
  if (typeof l === 'string') throw new InputError('bad-value', `${field}: ${l}`, field);
  const nm = 'ml' in l ? l.ml * layer.monolayer_nm : l.nm;
  if (!(nm >= 0 && nm <= layer.thickness_nm * (1 + 1e-12))) throw new InputError('bad-value', `${field}: ${JSON.stringify(raw)} lies outside the layer (0 to ${layer.thickness_nm.toPrecision(6)} nm); give a position from the layer's start`, field);
  return Math.min(nm, layer.thickness_nm);
}

/**
 * The doping profile of a structure from its doping keys (DopingInput): each entry placed in its
 * layer, signed (donors +, acceptors −), with the background spread over the whole stack.
 * Throws InputError naming the field for a malformed density, a position outside its layer, or
 * from/to on a sheet (at on a volume density).
 */
export function resolveDoping(input: DopingInput, structure: Structure): DopingProfile {
  const layers = structure.layers;
  if (input.layers.length !== layers.length) throw new InputError('bad-value', `doping: ${input.layers.length} layer entries for a stack of ${layers.length} layers; give one per layer (undefined for an undoped layer)`);
  const segments: DopedSegment[] = [];
  const sheets: DopedSheet[] = [];
  let donors = 0;
  let acceptors = 0;
  const count = (entry: { donors?: unknown }, amount_nm2: number): void => {
    if (entry.donors !== undefined) donors += amount_nm2; else acceptors += amount_nm2;
  };
  let z0 = 0;
  layers.forEach((layer, i) => {
    const written = input.layers[i];
    const base = `${input.fields?.[i] ?? `layer ${i + 1}`}.doping`;
    const entries: readonly DopingEntrySpec[] = written === undefined ? [] : Array.isArray(written) ? written : [written];
    entries.forEach((e, k) => {
      const field = Array.isArray(written) ? `${base}[${k}]` : base;
      const key = e.donors !== undefined ? 'donors' : 'acceptors';
      const d = parseDopantDensity((e.donors ?? e.acceptors)!, `${field}.${key}`);
      const sign = key === 'donors' ? 1 : -1;
      if (d.kind === 'sheet') {
        for (const k2 of ['from', 'to'] as const) if (e[k2] !== undefined) throw new InputError('bad-value', `${field}.${k2}: a sheet sits at one position; use "at" (from the layer's start), or give a volume density in cm-3`, `${field}.${k2}`);
        const at = e.at === undefined ? layer.thickness_nm / 2 : positionIn(e.at, layer, `${field}.at`);
        sheets.push({ z_nm: z0 + at, density_nm2: sign * d.value, layer: i });
        count(e, d.value);
      } else {
        if (e.at !== undefined) throw new InputError('bad-value', `${field}.at: a volume density spreads over the layer or from..to; remove "at", or give a sheet density in cm-2`, `${field}.at`);
        const a = e.from === undefined ? 0 : positionIn(e.from, layer, `${field}.from`);
        const b = e.to === undefined ? layer.thickness_nm : positionIn(e.to, layer, `${field}.to`);
        if (!(b > a)) throw new InputError('bad-value', `${field}: "from" (${a} nm) must lie below "to" (${b} nm)`, field);
        segments.push({ z0_nm: z0 + a, z1_nm: z0 + b, density_nm3: sign * d.value, layer: i });
        count(e, d.value * (b - a));
      }
    });
    z0 += layer.thickness_nm;
  });
  const bg = input.background;
  if (bg) {
    for (const key of ['donors', 'acceptors'] as const) {
      const raw = bg[key];
      if (raw === undefined) continue;
      const d = parseDopantDensity(raw, `doping.background.${key}`);
      if (d.kind !== 'volume') throw new InputError('bad-value', `doping.background.${key}: a background is a volume density, got ${JSON.stringify(raw)}; write it in cm-3`, `doping.background.${key}`);
      segments.push({ z0_nm: 0, z1_nm: structure.total_nm, density_nm3: (key === 'donors' ? 1 : -1) * d.value, layer: -1 });
      if (key === 'donors') donors += d.value * structure.total_nm; else acceptors += d.value * structure.total_nm;
    }
  }
  return { segments, sheets, donors_cm2: donors / SHEET_CM2_TO_NM2, acceptors_cm2: acceptors / SHEET_CM2_TO_NM2, net_cm2: (donors - acceptors) / SHEET_CM2_TO_NM2 };
}

/** A zod failure as an InputError naming the field under `base`. */
function schemaError(error: z.ZodError, base: string): InputError {
  const issue = error.issues[0]!;
  const path = issue.path.map((p) => (typeof p === 'number' ? `[${p}]` : `.${String(p)}`)).join('');
  const field = `${base}${path}`;
  const what = issue.code === 'unrecognized_keys' ? `unknown key "${issue.keys[0]}"; a doping entry takes donors or acceptors, from, to, at` : issue.message;
  return new InputError('schema', `${field}: ${what}`, field);
}

/** The parsed doping keys of a spec, kept per spec object (a search reads them at every candidate). */
interface SpecDoping {
  readonly input: DopingInput | undefined;
  readonly section: DopingSectionSpec;
}
const parsed = new WeakMap<Spec, SpecDoping>();

function specDoping(spec: Spec): SpecDoping {
  const hit = parsed.get(spec);
  if (hit) return hit;
  const rawSection = (spec as Record<string, unknown>).doping;
  const s = dopingSectionSchema.safeParse(rawSection ?? {});
  if (!s.success) throw schemaError(s.error, 'doping');
  const at = stackLayers(spec);
  const layers = at.map((l) => {
    const raw = (l.layer as Record<string, unknown>).doping;
    if (raw === undefined) return undefined;
    const r = layerDopingSchema.safeParse(raw);
    if (!r.success) throw schemaError(r.error, `${l.field}.doping`);
    return r.data;
  });
  const doped = layers.some((l) => l !== undefined) || s.data.background !== undefined;
  const out: SpecDoping = { input: doped ? { layers, fields: at.map((l) => l.field), background: s.data.background } : undefined, section: s.data };
  parsed.set(spec, out);
  return out;
}

/** True when a spec dopes any layer or gives a background: it is then solved self-consistently (solveDoped). */
export const hasDoping = (spec: Spec): boolean => specDoping(spec).input !== undefined;

/** The spec's top-level `doping:` section (settings of the self-consistent solve), parsed. */
export const dopingSection = (spec: Spec): DopingSectionSpec => specDoping(spec).section;

/** The doping profile of a spec's structure, or undefined when the spec dopes nothing. */
export function dopingOfSpec(spec: Spec, structure: Structure): DopingProfile | undefined {
  const input = specDoping(spec).input;
  return input === undefined ? undefined : resolveDoping(input, structure);
}
