/**
 * Spec + values of the free variables -> Structure: a frozen list of layers with materials
 * resolved at the temperature and strained on the substrate, thicknesses in nm and monolayers,
 * and the band-offset rule that was applied. Everything downstream (profiles, solvers, designs)
 * starts from this value; it is plain data so it can cross to a worker thread.
 */
import { InputError } from './errors.js';
import { repeatOf, type LayerSpec, type Spec, type StackEntry } from './input/schema.js';
import { parseField, parseLength, parseTemperature, splitQuantity, parseEnergy, type Length } from './input/units.js';
import { alloyFromName, alloyAt as alloyParamsAt, customMaterial, DEFAULT_MODELS, formatFormula, GROUP_III, GROUP_V, parseMaterialName, type Alloy } from '../materials/index.js';
import type { MaterialModels, ResolvedMaterial } from '../materials/types.js';
import { nonparabolicity, type NonparabolicityModel } from '../materials/nonparabolicity.js';
import { staticPermittivity } from '../materials/dielectric.js';
import { resolveMaterialCached } from './material-cache.js';
import { edgesOf, interfaceOffsets, shareEdges, type InterfaceOffset, type OffsetRule, type ShareGap } from './lineup.js';

export type { OffsetRule } from './lineup.js';

/** Band edges and masses of one point of a layer, as the profile builder needs them. */
export interface LayerBands {
  readonly Ec: number;
  readonly Ehh: number;
  readonly Elh: number;
  readonly me: number;
  readonly mhh_z: number; readonly mlh_z: number;
  readonly mhh_par: number; readonly mlh_par: number;
  /** Two-band electron non-parabolicity α = 1/Eg (1/eV). */
  readonly alpha: number;
}

/** Where a layer's composition comes from, kept so graded layers can be re-resolved along z. */
export type LayerComposition =
  | { readonly kind: 'alloy'; readonly alloy: Alloy }
  | { readonly kind: 'graded'; readonly from: Alloy; readonly to: Alloy }
  | { readonly kind: 'custom'; readonly name: string };

export interface ResolvedLayer {
  readonly index: number;
  /** The layer's label; inside a repeat with its period, e.g. "well[3]" (nested: "well[2.1]"). */
  readonly label: string;
  /** Where the layer is written in the spec, e.g. "stack[2].repeat[1]" (every period of a repeat shares it). */
  readonly field: string;
  /** Top-level repeat this layer belongs to: its stack index and the 1-based period; null outside repeats. */
  readonly period: { readonly entry: number; readonly period: number; readonly periods: number } | null;
  /** The vary variable (per period: "w[3]") that sets this layer's thickness, if any. */
  readonly thicknessVariable: string | null;
  /** Canonical formula ("In0.2Ga0.8As"), "Al0.1→0.3Ga…As" style for graded layers, or the custom name. */
  readonly formula: string;
  readonly composition: LayerComposition;
  readonly thickness_nm: number;
  /** Thickness in monolayers of this layer's strained lattice (a⊥/2 along [001]). */
  readonly monolayers: number;
  readonly monolayer_nm: number;
  /** Material at the layer's centre (graded layers: the mid composition). */
  readonly material: ResolvedMaterial;
  /** Static relative permittivity ε_s (materials/dielectric.ts, or the custom material's); NaN when unknown. */
  readonly permittivity: number;
  /**
   * Band edges after the offset rule, sampled evenly from the layer's start to its end: one sample
   * for a uniform layer, GRADE_SAMPLES for a graded one (bowing makes edges non-linear in
   * composition, so the profile interpolates between samples rather than between the ends).
   */
  readonly bands: readonly LayerBands[];
}

export interface Structure {
  readonly title: string;
  readonly substrate: string | null;
  readonly temperature_K: number;
  readonly field_kV_per_cm: number;
  readonly offsetRule: OffsetRule;
  /** Material-model choices (non-parabolicity form, electron mass at temperature, lattice law). */
  readonly models: StructureModels;
  readonly layers: readonly ResolvedLayer[];
  /** Strained band steps at every heterointerface, with the conduction share of the gap step. */
  readonly interfaces: readonly InterfaceOffset[];
  /** Values of the spec's free variables that produced this structure (nm, ML or fraction). */
  readonly variables: Readonly<Record<string, number>>;
  readonly total_nm: number;
}

/**
 * Layer indices whose Ec is a local minimum along the stack (strictly below each neighbour): the
 * wells of a stack, as objectives, optical spectra and the island analysis count them. Ec is read
 * at the layer's centre sample.
 */
export function wellLayerIndices(layers: readonly { readonly bands: readonly { readonly Ec: number }[] }[]): number[] {
  const ec = layers.map((l) => l.bands[Math.floor(l.bands.length / 2)]!.Ec);
  return ec.flatMap((e, i) => {
    const nb = [ec[i - 1], ec[i + 1]].filter((x): x is number => x !== undefined);
    return nb.length > 0 && nb.every((x) => e < x) ? [i] : [];
  });
}

/**
 * Samples of band edges across a graded layer. Linear interpolation between samples errs by about
 * E''·Δx²/8: with AlGaAs's composition-dependent Γ bowing (E'' ≈ 3 eV near x = 0) and a 0 → 0.45
 * grade, 65 samples keep it near 0.02 meV (17 samples gave 0.3 meV; test/unit/structure.test.ts).
 */
export const GRADE_SAMPLES = 65;

export const PARAMETER_SET = 'Vurgaftman, Meyer & Ram-Mohan, J. Appl. Phys. 89, 5815 (2001)';

/** Highest temperature accepted: the Varshni fits of the parameter set are made up to about this (K). */
export const MAX_TEMPERATURE_K = 1000;
/** Largest field accepted (kV/cm): several times the breakdown field of the III–V materials here. */
export const MAX_FIELD_KV_PER_CM = 2000;
/** Thinnest layer accepted (nm): a tenth of a monolayer, below which a "layer" is a typing error. */
export const MIN_LAYER_NM = 0.03;

/**
 * Most layers a stack may have once its repeats are written out. A solve's time grows a little
 * faster than the layer count: a GaAs/Al0.3Ga0.7As superlattice of 200, 1000 and 2000 layers took
 * 8, 36 and 119 s on a 2-core machine (measured), so this many take several minutes.
 */
export const MAX_LAYERS = 4000;

/** Largest total stack thickness (nm): beyond it the wavefunction grid and the state count grow without physical purpose. */
export const MAX_TOTAL_NM = 10_000;

/** Kind and unit of a free variable, from the units of its bounds. */
export interface VariableInfo {
  /** The name values are keyed by: the vary key, or "w[3]" for period 3 of a per_period variable. */
  readonly name: string;
  /** 'strain': an in-plane mismatch strain in % (a layer's `strain:`). */
  readonly kind: 'length' | 'fraction' | 'strain';
  /** 'nm' or 'ML' for lengths; '%' for strains; '' for fractions. */
  readonly unit: 'nm' | 'ML' | '%' | '';
  readonly from: number;
  readonly to: number;
  readonly value: number | undefined;
  /** For a per_period variable: the vary key and the 1-based period. */
  readonly perPeriod?: { readonly base: string; readonly period: number; readonly periods: number; readonly entry: number };
}

type Unit = VariableInfo['unit'];

function quantityValue(raw: string | number, field: string): { x: number; unit: Unit } {
  const q = splitQuantity(raw);
  if (!q) throw new InputError('bad-value', `${field}: expected a number, a length or a strain in %, got ${JSON.stringify(raw)}`, field);
  if (q.unit === '') return { x: q.value, unit: '' };
  if (q.unit === '%') return { x: q.value, unit: '%' };
  const len = parseLength(raw);
  if (typeof len === 'string') throw new InputError('bad-value', `${field}: ${len}`, field);
  return 'ml' in len ? { x: len.ml, unit: 'ML' } : { x: len.nm, unit: 'nm' };
}

/** Top-level repeats that list variables under per_period: variable -> (stack index, periods). */
function perPeriodBlocks(spec: Spec): Map<string, { entry: number; periods: number }> {
  const out = new Map<string, { entry: number; periods: number }>();
  spec.stack.forEach((entry, i) => {
    const e = repeatOf(entry);
    for (const [k, name] of (e?.per_period ?? []).entries()) {
      const field = `stack[${i}].per_period[${k}]`;
      if (spec.vary?.[name] === undefined) throw new InputError('unknown-variable', `${field}: "${name}" is not a vary variable; declare it under "vary:" with bounds`, field);
      const other = out.get(name);
      if (other) throw new InputError('bad-value', `${field}: "${name}" is already per period in stack[${other.entry}]; give each repeat its own variable`, field);
      out.set(name, { entry: i, periods: e!.periods });
    }
  });
  return out;
}

/**
 * The spec's free variables with their kinds and bounds, in declaration order; a per_period
 * variable of a repeat of N periods becomes N variables w[1] … w[N] with the same bounds.
 */
export function variablesOf(spec: Spec): readonly VariableInfo[] {
  const blocks = perPeriodBlocks(spec);
  return Object.entries(spec.vary ?? {}).flatMap(([name, v]): VariableInfo[] => {
    const from = quantityValue(v.from, `vary.${name}.from`);
    const to = quantityValue(v.to, `vary.${name}.to`);
    const block = blocks.get(name);
    const rawValues = v.value === undefined ? undefined : Array.isArray(v.value) ? v.value : [v.value];
    if (rawValues && rawValues.length > 1 && rawValues.length !== (block?.periods ?? 1)) {
      throw new InputError('bad-value', `vary.${name}.value: a list gives one value per period, got ${rawValues.length} value${rawValues.length > 1 ? 's' : ''}${block ? ` for ${block.periods} periods` : ` for a variable that is not per_period`}; ${block ? `give ${block.periods} values or one shared value` : 'give one value, or list the variable under per_period of its repeat'}`, `vary.${name}.value`);
    }
    const values = rawValues?.map((x, k) => quantityValue(x, Array.isArray(v.value) ? `vary.${name}.value[${k}]` : `vary.${name}.value`));
    const unit = from.unit;
    if (to.unit !== unit || values?.some((x) => x.unit !== unit)) {
      throw new InputError('bad-value', `vary.${name}: bounds and value must share one unit, got "${v.from}", "${v.to}"${v.value !== undefined ? `, ${JSON.stringify(v.value)}` : ''}; write all in nm, all in ML, all in % or all as fractions`, `vary.${name}`);
    }
    if (!(from.x < to.x)) throw new InputError('bad-value', `vary.${name}: "from" must be below "to", got ${v.from} and ${v.to}; swap them`, `vary.${name}`);
    for (const x of values ?? []) {
      if (x.x < from.x || x.x > to.x) throw new InputError('bad-value', `vary.${name}.value: ${JSON.stringify(v.value)} lies outside [${v.from}, ${v.to}]; move it inside or widen the bounds`, `vary.${name}.value`);
    }
    const kind = unit === '' ? 'fraction' : unit === '%' ? 'strain' : 'length';
    if (kind === 'fraction' && (from.x < 0 || to.x > 1)) throw new InputError('bad-value', `vary.${name}: a fraction must lie in [0, 1], got [${from.x}, ${to.x}]; give lengths a unit (nm, Å or ML)`, `vary.${name}`);
    if (kind === 'length' && from.x <= 0) throw new InputError('bad-value', `vary.${name}.from: a thickness must be positive, got ${v.from}`, `vary.${name}.from`);
    if (!block) return [{ name, kind, unit, from: from.x, to: to.x, value: values?.[0]?.x }];
    return Array.from({ length: block.periods }, (_, k) => ({
      name: `${name}[${k + 1}]`, kind, unit, from: from.x, to: to.x, value: (values?.[k] ?? values?.[0])?.x,
      perPeriod: { base: name, period: k + 1, periods: block.periods, entry: block.entry },
    }));
  });
}

/** The nominal variable values of a spec (each `value`), or an error naming the first one missing. */
export function nominalVariables(spec: Spec): Record<string, number> {
  const out: Record<string, number> = {};
  for (const v of variablesOf(spec)) {
    const key = v.perPeriod?.base ?? v.name;
    if (v.value === undefined) throw new InputError('unknown-variable', `vary.${key}: has no value to solve at; add "value:" inside its bounds, or run "wellsmith design" to choose it`, `vary.${key}`);
    out[v.name] = v.value;
  }
  return out;
}

const RESERVED = new Set(['material', 'thickness', 'label', 'strain', 'doping']);

function lookupVariable(written: string, vars: readonly VariableInfo[], values: Readonly<Record<string, number>>, field: string, want: VariableInfo['kind'], rename: Readonly<Record<string, string>>): { value: number; info: VariableInfo } {
  const name = rename[written] ?? written;
  const info = vars.find((v) => v.name === name);
  if (!info) {
    const perPeriod = vars.find((v) => v.perPeriod?.base === written);
    if (perPeriod) throw new InputError('bad-value', `${field}: variable "${written}" takes one value per period of the repeat at stack[${perPeriod.perPeriod!.entry}] (per_period); use it inside that repeat only, or declare another variable here`, field);
    const known = [...new Set(vars.map((v) => v.perPeriod?.base ?? v.name))].join(', ');
    throw new InputError('unknown-variable', `${field}: unknown variable "${written}"; ${known ? `declared variables are ${known}` : 'declare it under "vary:" with bounds'}`, field);
  }
  if (info.kind !== want) {
    const how: Readonly<Record<VariableInfo['kind'], string>> = { length: 'bounds with a unit (nm or ML)', fraction: 'bounds without a unit', strain: 'bounds in % (e.g. from: -1.5 %)' };
    throw new InputError('bad-value', `${field}: variable "${written}" is a ${info.kind} but a ${want} is needed here; give it ${how[want]}`, field);
  }
  const value = values[name];
  if (value === undefined || !Number.isFinite(value)) throw new InputError('unknown-variable', `${field}: variable "${name}" has no value; give vary.${written}.value or solve a design`, field);
  return { value, info };
}


/** One layer as grown: repeat blocks written out period by period. */
export interface StackLayer {
  readonly layer: LayerSpec;
  /** Where it is written, e.g. "stack[2].repeat[1]"; errors name its fields from here. */
  readonly field: string;
  /** Its label with the period(s) ("well[3]", nested "well[2.1]"), or undefined when unlabelled. */
  readonly label: string | undefined;
  readonly period: ResolvedLayer['period'];
  /** Per-period variable names of this period: "w" -> "w[3]". */
  readonly rename: Readonly<Record<string, string>>;
}

/**
 * The stack with its repeat blocks written out: each period's layers in order, labels carrying
 * the period ("well" in period 3 -> "well[3]"; in period 1 of an inner repeat of period 2 ->
 * "well[2.1]"), per_period variables renamed to their period's ("w" -> "w[3]").
 */
export function expandStack(spec: Spec): readonly StackLayer[] {
  const count = (entries: readonly StackEntry[]): number => entries.reduce((n, e) => { const r = repeatOf(e); return n + (r ? r.periods * count(r.repeat) : 1); }, 0);
  const layers = count(spec.stack);
  if (layers > MAX_LAYERS) {
    throw new InputError('bad-value', `stack: ${layers} layers once the repeats are written out, more than the ${MAX_LAYERS} a solve takes (2000 layers took about 2 minutes on a 2-core machine); model fewer periods (the outer layers continue outwards) or split the stack`, 'stack');
  }
  const out: StackLayer[] = [];
  const walk = (entries: readonly StackEntry[], base: string, periods: readonly number[], top: { entry: number; period: number; periods: number } | null, rename: Readonly<Record<string, string>>): void => {
    entries.forEach((entry, i) => {
      const field = `${base}[${i}]`;
      const e = repeatOf(entry);
      if (e === null) {
        const layer = entry as LayerSpec;
        const label = layer.label === undefined ? undefined : periods.length ? `${layer.label}[${periods.join('.')}]` : layer.label;
        out.push({ layer, field, label, period: top, rename });
        return;
      }
      for (let k = 1; k <= e.periods; k++) {
        const isTop = top === null;
        const names = isTop ? Object.fromEntries((e.per_period ?? []).map((n) => [n, `${n}[${k}]`])) : rename;
        walk(e.repeat, `${field}.repeat`, [...periods, k], isTop ? { entry: i, period: k, periods: e.periods } : top, names);
      }
    });
  };
  walk(spec.stack, 'stack', [], null, {});
  return out;
}

interface Context {
  readonly spec: Spec;
  readonly vars: readonly VariableInfo[];
  readonly values: Readonly<Record<string, number>>;
  readonly temperature_K: number;
  readonly substrate: Alloy | null;
  readonly models: StructureModels;
}

function compositionOf(at: StackLayer, ctx: Context): LayerComposition {
  const { layer, field, rename } = at;
  const custom = ctx.spec.materials?.[layer.material];
  const fractionKeys = Object.keys(layer).filter((k) => !RESERVED.has(k));
  if (custom) {
    const extra = fractionKeys[0] ?? (layer.strain !== undefined ? 'strain' : undefined);
    if (extra) throw new InputError('bad-value', `${field}.${extra}: custom material "${layer.material}" takes no ${extra === 'strain' ? 'strain' : 'fractions'}; remove it`, `${field}.${extra}`);
    return { kind: 'custom', name: layer.material };
  }
  if (layer.strain !== undefined) {
    if (fractionKeys.length > 0) throw new InputError('bad-value', `${field}.${fractionKeys[0]}: a layer given by its strain takes no fractions (the strain sets the free one); remove it or the strain`, `${field}.${fractionKeys[0]}`);
    return { kind: 'alloy', alloy: alloyForStrain(layer.material, strainOf(layer.strain, at, ctx), ctx, `${field}.strain`) };
  }
  if (fractionKeys.length === 0) return { kind: 'alloy', alloy: parseFormulaAt(layer.material, `${field}.material`) };
  const start: Record<string, number> = {};
  const end: Record<string, number> = {};
  let graded = false;
  for (const key of fractionKeys) {
    const raw = (layer as Record<string, unknown>)[key];
    const f = `${field}.${key}`;
    let a: number;
    let b: number;
    if (typeof raw === 'number') a = b = raw;
    else if (typeof raw === 'string') a = b = lookupVariable(raw, ctx.vars, ctx.values, f, 'fraction', rename).value;
    else {
      const g = raw as { from: number; to: number };
      a = g.from; b = g.to; graded = true;
    }
    for (const x of [a, b]) if (!(x >= 0 && x <= 1)) throw new InputError('bad-value', `${f}: a fraction must lie in [0, 1], got ${x}`, f);
    start[key] = a;
    end[key] = b;
  }
  const from = alloyAt(layer.material, start, `${field}.material`);
  if (!graded) return { kind: 'alloy', alloy: from };
  return { kind: 'graded', from, to: alloyAt(layer.material, end, `${field}.material`) };
}

/** A layer's `strain:` as a fraction (not %): a quantity in % or a strain variable. */
function strainOf(raw: string | number, at: StackLayer, ctx: Context): number {
  const field = `${at.field}.strain`;
  const q = splitQuantity(raw);
  if (q && q.unit === '%') return q.value / 100;
  if (typeof raw === 'string' && !q && /^[A-Za-z_][A-Za-z0-9_]*$/.test(raw.trim())) return lookupVariable(raw.trim(), ctx.vars, ctx.values, field, 'strain', at.rename).value / 100;
  throw new InputError('bad-value', `${field}: expected a strain in % such as "-1 %" (negative is compressive) or a vary variable in %, got ${JSON.stringify(raw)}`, field);
}

/**
 * The ternary of `name` (InGaAs, GaAsP…: one side mixed from two elements) whose in-plane strain
 * on the substrate is `strain`, at the structure's temperature. The lattice constant is linear in
 * the fraction (Vegard; materials/alloys.ts), so ε∥ = (a_sub − a)/a gives a = a_sub/(1 + ε) and
 * the fraction in closed form.
 */
function alloyForStrain(name: string, strain: number, ctx: Context, field: string): Alloy {
  if (!ctx.substrate) throw new InputError('bad-value', `${field}: a strain needs a substrate to be strained on; give "substrate:"`, field);
  const { side, first, second } = mixedSide(name, field);
  const end = (el: string): Alloy => {
    const other = side === 'III' ? ternaryOther(name, 'V') : ternaryOther(name, 'III');
    return side === 'III' ? { III: { [el]: 1 }, V: { [other]: 1 } } : { III: { [other]: 1 }, V: { [el]: 1 } };
  };
  const lattice = (a: Alloy): number => alloyParamsAt(a, ctx.temperature_K, ctx.models.lattice).a_nm;
  const aSub = lattice(ctx.substrate);
  const aA = lattice(end(first));
  const aB = lattice(end(second));
  const x = (aSub / (1 + strain) - aB) / (aA - aB);
  if (!(x >= 0 && x <= 1)) {
    const eps = (a: number): string => ((aSub - a) / a * 100).toFixed(2);
    throw new InputError('bad-value', `${field}: ${(strain * 100).toPrecision(3)} % is out of reach of ${name} on ${formatFormula(ctx.substrate)} (from ${eps(aB)} % to ${eps(aA)} %); choose a strain in that range or another alloy`, field);
  }
  return withField(field, () => alloyFromName(name, { [first]: x }));
}

/** The mixed side of a ternary name and its two elements, in the name's order; InputError otherwise. */
function mixedSide(name: string, field: string): { side: 'III' | 'V'; first: string; second: string } {
  const els = name.match(/[A-Z][a-z]?/g) ?? [];
  const III = els.filter((e) => (GROUP_III as readonly string[]).includes(e));
  const V = els.filter((e) => (GROUP_V as readonly string[]).includes(e));
  if (els.length === 3 && III.length + V.length === 3 && /^([A-Z][a-z]?)+$/.test(name.trim())) {
    if (III.length === 2) return { side: 'III', first: III[0]!, second: III[1]! };
    if (V.length === 2) return { side: 'V', first: V[0]!, second: V[1]! };
  }
  throw new InputError('bad-value', `${field}: a strain sets the free fraction of a ternary named without numbers (InGaAs, GaAsP, InAsP…), got material "${name}"; write such a name or give the fractions instead`, field);
}

/** The single element of a ternary name's unmixed side. */
const ternaryOther = (name: string, side: 'III' | 'V'): string =>
  (name.match(/[A-Z][a-z]?/g) ?? []).find((e) => ((side === 'III' ? GROUP_III : GROUP_V) as readonly string[]).includes(e))!;

function withField<T>(field: string, f: () => T): T {
  try {
    return f();
  } catch (e) {
    if (e instanceof InputError && e.field === undefined) throw new InputError(e.code, `${field}: ${e.message}`, field);
    throw e;
  }
}

/**
 * Memo of pure look-ups that a design search repeats thousands of times with the same arguments:
 * formula parsing, and (per spec) the layers that name no variable. Values are frozen, so sharing
 * them is safe; a table is cleared when it grows past MEMO_LIMIT entries.
 */
const MEMO_LIMIT = 4096;
function memo<V>(table: Map<string, V>, key: string, make: () => V): V {
  const hit = table.get(key);
  if (hit !== undefined) return hit;
  const value = make();
  if (table.size >= MEMO_LIMIT) table.clear();
  table.set(key, value);
  return value;
}
const formulas = new Map<string, Alloy>();

const parseFormulaAt = (text: string, field: string): Alloy => memo(formulas, text, () => withField(field, () => parseMaterialName(text)));
const alloyAt = (name: string, fractions: Record<string, number>, field: string): Alloy => withField(field, () => alloyFromName(name, fractions));

/** Mixes two alloys linearly: the composition at fraction t of a graded layer. */
export function mixAlloys(a: Alloy, b: Alloy, t: number): Alloy {
  const mix = (p: Readonly<Record<string, number>>, q: Readonly<Record<string, number>>): Record<string, number> => {
    const out: Record<string, number> = {};
    for (const k of new Set([...Object.keys(p), ...Object.keys(q)])) out[k] = (1 - t) * (p[k] ?? 0) + t * (q[k] ?? 0);
    return out;
  };
  return { III: mix(a.III, b.III), V: mix(a.V, b.V) };
}

function num(raw: string | number | undefined, parse: (x: string | number) => number | string, field: string, fallback: number): number {
  if (raw === undefined) return fallback;
  const v = parse(raw);
  if (typeof v === 'string') throw new InputError('bad-value', `${field}: ${v}`, field);
  return v;
}

/** Resolves a material (alloy or custom) at the spec's temperature, strained on the substrate. */
export function resolveComposition(spec: Spec, alloyOrCustom: Alloy | string, temperature_K: number, substrate: Alloy | null, field: string): ResolvedMaterial {
  const models = modelsOf(spec);
  if (typeof alloyOrCustom === 'string') {
    const def = spec.materials![alloyOrCustom]!;
    const f = `materials.${alloyOrCustom}`;
    const lattice = def.lattice === undefined ? undefined : parseLength(def.lattice);
    if (typeof lattice === 'string' || (lattice && 'ml' in lattice)) throw new InputError('bad-value', `${f}.lattice: expected a length in nm or Å, got ${JSON.stringify(def.lattice)}`, `${f}.lattice`);
    return withField(f, () => customMaterial({
      name: alloyOrCustom,
      temperature_K,
      Ec: num(def.Ec, parseEnergy, `${f}.Ec`, NaN),
      Ev: num(def.Ev, parseEnergy, `${f}.Ev`, NaN),
      me: def.me, mhh: def.mhh, mlh: def.mlh,
      ...(def.mhh_inplane !== undefined ? { mhh_par: def.mhh_inplane } : {}),
      ...(def.mlh_inplane !== undefined ? { mlh_par: def.mlh_inplane } : {}),
      ...(lattice ? { a_nm: lattice.nm } : {}),
    }));
  }
  return withField(field, () => resolveMaterialCached(alloyOrCustom, { temperature_K, substrate, models }));
}

/** The model choices a structure is built with; recorded in every output. */
export interface StructureModels extends MaterialModels {
  /** Form of the electron non-parabolicity α (materials/nonparabolicity.ts); whether it is applied is solver.nonparabolic. */
  readonly nonparabolicity: NonparabolicityModel;
}

/**
 * Defaults: the two-band α = 1/Eg, the form most published intersubband designs use (the
 * three-band form with the split-off band and the free-electron term lowers α by 15–20 % in GaAs);
 * the low-temperature electron mass and the linear lattice law, as the parameter set tabulates them.
 */
export const DEFAULT_STRUCTURE_MODELS: StructureModels = Object.freeze({ ...DEFAULT_MODELS, nonparabolicity: 'two-band' });

/** One line naming the model choices, for tables and reports. */
export const describeModels = (m: StructureModels): string =>
  `electron non-parabolicity ${m.nonparabolicity} (when solver.nonparabolic is on), electron mass ${m.electronMass}, lattice ${m.lattice}`;

/** A spec's model choices (solver section) over the defaults. */
export function modelsOf(spec: Spec): StructureModels {
  const s = spec.solver;
  if (s?.nonparabolicity === undefined && s?.electron_mass === undefined && s?.lattice === undefined) return DEFAULT_STRUCTURE_MODELS;
  return {
    nonparabolicity: s.nonparabolicity ?? DEFAULT_STRUCTURE_MODELS.nonparabolicity,
    electronMass: s.electron_mass ?? DEFAULT_STRUCTURE_MODELS.electronMass,
    lattice: s.lattice ?? DEFAULT_STRUCTURE_MODELS.lattice,
  };
}

/**
 * Growth errors applied while building a structure (tolerance analysis): per-layer thickness
 * errors in monolayers, per-layer composition errors, one growth-rate scale for every layer, and
 * a temperature offset. A composition error moves the layer's mixed fraction: the first mixed
 * group-III element (in print order In, Al, Ga) gains Δx and its partner loses it, or the first
 * mixed group-V element when group III is pure; binaries and custom materials have none.
 */
export interface Perturbation {
  readonly thickness_ML?: readonly number[];
  readonly composition?: readonly number[];
  /** Multiplies every thickness: 1.01 is a growth rate 1 % high. */
  readonly thicknessScale?: number;
  readonly temperature_K?: number;
}

/** The two mixed elements of one side of a formula, in print order (In, Al, Ga | As, P, Sb), or null. */
function mixedPair(side: Readonly<Record<string, number>>): [string, string] | null {
  const mixed = Object.keys(side).filter((k) => side[k]! > 0 && side[k]! < 1);
  if (mixed.length < 2) return null;
  return ORDER.filter((e) => mixed.includes(e)).concat(mixed.filter((e) => !ORDER.includes(e))).slice(0, 2) as [string, string];
}

/** Moves dx of fraction from b to a on one side, clamped to [0, 1]. */
function shiftPair(side: Readonly<Record<string, number>>, [a, b]: readonly [string, string], dx: number): Record<string, number> {
  const d = Math.min(Math.max(dx, -(side[a] ?? 0)), side[b] ?? 0);
  return { ...side, [a]: (side[a] ?? 0) + d, [b]: (side[b] ?? 0) - d };
}

/** Which side and pair a composition error moves: group III when it is mixed, else group V. */
function errorPair(alloy: Alloy): { side: 'III' | 'V'; pair: [string, string] } | null {
  const III = mixedPair(alloy.III);
  if (III) return { side: 'III', pair: III };
  const V = mixedPair(alloy.V);
  return V ? { side: 'V', pair: V } : null;
}

const shiftWith = (alloy: Alloy, e: { side: 'III' | 'V'; pair: [string, string] }, dx: number): Alloy =>
  e.side === 'III' ? { III: shiftPair(alloy.III, e.pair, dx), V: alloy.V } : { III: alloy.III, V: shiftPair(alloy.V, e.pair, dx) };

/** The alloy with its mixed fraction moved by dx (see Perturbation), clamped to [0, 1]. */
export function shiftComposition(alloy: Alloy, dx: number): Alloy {
  const e = errorPair(alloy);
  return e ? shiftWith(alloy, e, dx) : alloy;
}

/** Print order of elements, for choosing which fraction a composition error moves. */
const ORDER: readonly string[] = [...GROUP_III, ...GROUP_V];

/**
 * A composition error of a layer. A graded layer moves, at both ends, the pair of elements that is
 * mixed at either end (a GaAs → Al0.3Ga0.7As grade moves Al/Ga at both ends, not only at the mixed one).
 */
export function perturbComposition(c: LayerComposition, dx: number): LayerComposition {
  if (dx === 0 || c.kind === 'custom') return c;
  if (c.kind === 'alloy') {
    const alloy = shiftComposition(c.alloy, dx);
    return alloy === c.alloy ? c : { kind: 'alloy', alloy };
  }
  const e = errorPair(c.from) ?? errorPair(c.to);
  return e ? { kind: 'graded', from: shiftWith(c.from, e, dx), to: shiftWith(c.to, e, dx) } : c;
}

/** Whether a composition error (Perturbation.composition) changes this composition: an alloy with a mixed fraction, not a binary or custom material. */
export const hasCompositionError = (c: LayerComposition): boolean => perturbComposition(c, 0.01) !== c;

/** A layer's composition, material and band samples: everything of it but its thickness. */
interface LayerPart {
  readonly composition: LayerComposition;
  readonly formula: string;
  readonly material: ResolvedMaterial;
  readonly permittivity: number;
  readonly bands: readonly LayerBands[];
}

/**
 * What a search rebuilds thousands of times unchanged, computed once per spec: its free variables
 * and the parts of layers whose composition names no variable (keyed by layer and temperature,
 * which a tolerance run perturbs). Specs are immutable values, so the cache is keyed on the object
 * and goes with it.
 */
interface SpecCache {
  readonly vars: readonly VariableInfo[];
  /** The stack with repeats written out. */
  readonly layers: readonly StackLayer[];
  readonly parts: Map<string, LayerPart>;
  /** Substrate and offset rule at each temperature. */
  readonly settings: Map<string, Setting>;
}

/** What every layer of a structure is placed by: the substrate and the band-offset rule. */
interface Setting {
  readonly substrate: Alloy | null;
  readonly reference: ResolvedMaterial | null;
  readonly offsetRule: OffsetRule;
}
const specCaches = new WeakMap<Spec, SpecCache>();
function cacheOf(spec: Spec): SpecCache {
  let c = specCaches.get(spec);
  if (!c) {
    c = { vars: variablesOf(spec), layers: expandStack(spec), parts: new Map(), settings: new Map() };
    specCaches.set(spec, c);
  }
  return c;
}

/** The substrate (checked by resolving it) and the offset rule of a spec at a temperature. */
function settingOf(spec: Spec, temperature_K: number): Setting {
  const substrate = spec.substrate === undefined ? null : parseFormulaAt(spec.substrate, 'substrate');
  if (substrate) resolveComposition(spec, substrate, temperature_K, null, 'substrate');
  const share = spec.offsets?.conduction_share;
  if (share === undefined) return { substrate, reference: null, offsetRule: { kind: 'absolute', source: `valence-band offsets of ${PARAMETER_SET}` } };
  const refText = spec.offsets?.reference ?? spec.substrate;
  if (refText === undefined) throw new InputError('bad-value', 'offsets.reference: the conduction-share rule needs a reference material; give offsets.reference or a substrate', 'offsets.reference');
  const refAlloy = spec.materials?.[refText] ? refText : parseFormulaAt(refText, 'offsets.reference');
  const gap: ShareGap = spec.offsets?.gap ?? 'unstrained';
  // The strained rule compares strained gaps, so its reference is grown on the substrate too.
  const onSubstrate = gap === 'strained' && typeof refAlloy !== 'string' ? substrate : null;
  const reference = resolveComposition(spec, refAlloy, temperature_K, onSubstrate, 'offsets.reference');
  return { substrate, reference, offsetRule: { kind: 'conduction-share', share, reference: reference.formula, gap } };
}

/** Whether a layer's composition depends on a free variable (a fraction or a strain that names one). */
const namesVariable = (layer: LayerSpec): boolean =>
  Object.keys(layer).some((k) => (k === 'strain' || !RESERVED.has(k)) && typeof (layer as Record<string, unknown>)[k] === 'string' && !(k === 'strain' && splitQuantity(layer.strain!)));

/** The layers of a spec as grown (repeats written out), from the spec's cache. */
export const stackLayers = (spec: Spec): readonly StackLayer[] => cacheOf(spec).layers;

/**
 * Builds the Structure of a spec at the given variable values, optionally with growth errors.
 * A spec is a value: what does not depend on the values is kept per spec object, so a changed
 * spec must be a new object (as the parser, design writer and campaign sweeps make them).
 */
export function buildStructure(spec: Spec, values: Readonly<Record<string, number>>, perturbation: Perturbation = {}): Structure {
  const cache = cacheOf(spec);
  const vars = cache.vars;
  const nominalT = num(spec.temperature, parseTemperature, 'temperature', 300);
  const temperature_K = nominalT + (perturbation.temperature_K ?? 0);
  if (!(temperature_K >= 0) || !Number.isFinite(temperature_K)) throw new InputError('bad-value', `temperature: must be 0 K or above, got ${spec.temperature}; give it in K, e.g. "300 K"`, 'temperature');
  if (nominalT > MAX_TEMPERATURE_K) throw new InputError('bad-value', `temperature: ${spec.temperature} is above ${MAX_TEMPERATURE_K} K, beyond the Varshni fits of the parameter set; give a growth or operating temperature`, 'temperature');
  const field_kV_per_cm = num(spec.field, parseField, 'field', 0);
  if (!(Math.abs(field_kV_per_cm) <= MAX_FIELD_KV_PER_CM)) throw new InputError('bad-value', `field: ${spec.field} is beyond ±${MAX_FIELD_KV_PER_CM} kV/cm, above the breakdown field of these materials; give a field below it`, 'field');
  const { substrate, reference, offsetRule } = memo(cache.settings, String(temperature_K), () => settingOf(spec, temperature_K));
  const models = modelsOf(spec);
  const ctx: Context = { spec, vars, values, temperature_K, substrate, models };

  const bandsOf = (source: Alloy | string, field: string): { bands: LayerBands; material: ResolvedMaterial } => {
    const m = resolveComposition(spec, source, temperature_K, typeof source === 'string' ? null : substrate, field);
    let { Ec, Ehh, Elh } = m;
    if (reference && offsetRule.kind === 'conduction-share' && typeof source !== 'string') {
      const free = offsetRule.gap === 'unstrained' ? edgesOf(resolveComposition(spec, source, temperature_K, null, field)) : edgesOf(m);
      ({ Ec, Ehh, Elh } = shareEdges(offsetRule, m, free, edgesOf(reference)));
    }
    const gap = Ec - Math.max(Ehh, Elh);
    const custom = typeof source === 'string' ? spec.materials![source]!.nonparabolicity : undefined;
    // A closed or inverted gap has no Kane non-parabolicity of this form: the band is taken parabolic there.
    const alpha = custom !== undefined ? num(custom, (x) => { const q = splitQuantity(x); return q && q.value >= 0 ? q.value : `expected a non-negative number in 1/eV (a negative α would make the mass fall with energy), got ${JSON.stringify(x)}`; }, `materials.${source as string}.nonparabolicity`, 0)
      : gap > 0 ? (typeof source === 'string' ? 1 / gap : nonparabolicity(models.nonparabolicity, { Eg: gap, Dso: m.Dso, me: m.me })) : 0;
    return { material: m, bands: { Ec, Ehh, Elh, me: m.me, mhh_z: m.mhh_z, mlh_z: m.mlh_z, mhh_par: m.mhh_par, mlh_par: m.mlh_par, alpha } };
  };

  const partOf = (composition: LayerComposition, field: string): LayerPart => {
    const mid = composition.kind === 'custom' ? composition.name : composition.kind === 'alloy' ? composition.alloy : mixAlloys(composition.from, composition.to, 0.5);
    const centre = bandsOf(mid, `${field}.material`);
    const bands = composition.kind === 'graded'
      ? Array.from({ length: GRADE_SAMPLES }, (_, k) => bandsOf(mixAlloys(composition.from, composition.to, k / (GRADE_SAMPLES - 1)), `${field}.material`).bands)
      : [centre.bands];
    const formula = composition.kind === 'graded' ? `${formatFormula(composition.from)}→${formatFormula(composition.to)}` : centre.material.formula;
    // ε_s is linear in composition, so a grade's mid value is its mean.
    const permittivity = typeof mid === 'string' ? spec.materials![mid]!.permittivity ?? NaN : staticPermittivity(mid) ?? NaN;
    return { composition, formula, material: centre.material, permittivity, bands };
  };

  let total = 0;
  // Every period of a repeat shares its written layer's part (memo keyed by the written field), so a
  // repeated stack resolves to the same numbers as its layers written out.
  const layers = cache.layers.map((at, i): ResolvedLayer => {
    const { layer, field } = at;
    const dx = perturbation.composition?.[i] ?? 0;
    let part: LayerPart;
    if (namesVariable(layer)) part = partOf(perturbComposition(compositionOf(at, ctx), dx), field);
    else {
      const base = memo(cache.parts, `${field}@${temperature_K}`, () => partOf(compositionOf(at, ctx), field));
      // A composition error leaves binaries and custom materials as they are.
      const composition = perturbComposition(base.composition, dx);
      part = composition === base.composition ? base : partOf(composition, field);
    }
    const { composition, formula, material, permittivity, bands } = part;

    let length: Length;
    const t = layer.thickness;
    const tq = splitQuantity(t);
    const isName = typeof t === 'string' && !tq && /^[A-Za-z_][A-Za-z0-9_]*$/.test(t.trim());
    let thicknessVariable: string | null = null;
    if (isName) {
      const { value, info } = lookupVariable((t as string).trim(), vars, ctx.values, `${field}.thickness`, 'length', at.rename);
      length = info.unit === 'ML' ? { ml: value } : { nm: value };
      thicknessVariable = info.name;
    } else {
      const parsed = parseLength(t);
      if (typeof parsed === 'string') throw new InputError('bad-value', `${field}.thickness: ${parsed}, or the name of a vary variable`, `${field}.thickness`);
      length = parsed;
    }
    const ml = material.monolayer_nm;
    const dML = perturbation.thickness_ML?.[i] ?? 0;
    if (('ml' in length || dML !== 0) && !(ml > 0)) {
      throw new InputError('bad-value', `${field}.thickness: a thickness in monolayers needs the material's lattice constant; give materials.${layer.material}.lattice or the thickness in nm`, `${field}.thickness`);
    }
    const thickness_nm = (('ml' in length ? length.ml * ml : length.nm) + (dML === 0 ? 0 : dML * ml)) * (perturbation.thicknessScale ?? 1);
    if (!(thickness_nm > 0) || !Number.isFinite(thickness_nm)) throw new InputError('bad-value', `${field}.thickness: must be positive, got ${JSON.stringify(t)}${isName ? ` = ${thickness_nm} nm` : ''}`, `${field}.thickness`);
    if (thickness_nm < MIN_LAYER_NM) throw new InputError('bad-value', `${field}.thickness: ${JSON.stringify(t)} is thinner than ${MIN_LAYER_NM} nm (a tenth of a monolayer); check the unit`, `${field}.thickness`);
    total += thickness_nm;
    if (total > MAX_TOTAL_NM) throw new InputError('bad-value', `${field}.thickness: the stack reaches ${total.toPrecision(4)} nm, above the ${MAX_TOTAL_NM / 1000} µm an envelope-function solve handles here; model only the active region (the outer layers continue outwards)`, `${field}.thickness`);
    return {
      index: i,
      label: at.label ?? `layer ${i + 1}`,
      field,
      period: at.period,
      thicknessVariable,
      formula,
      composition,
      thickness_nm,
      monolayers: ml > 0 ? thickness_nm / ml : NaN,
      monolayer_nm: ml,
      material,
      permittivity,
      bands,
    };
  });
  return {
    title: spec.title ?? '',
    substrate: substrate ? formatFormula(substrate) : null,
    temperature_K,
    field_kV_per_cm,
    offsetRule,
    models,
    layers,
    interfaces: interfaceOffsets(layers.map((l) => ({ index: l.index, label: l.label, formula: l.formula, first: l.bands[0]!, last: l.bands[l.bands.length - 1]! }))),
    variables: { ...values },
    total_nm: total,
  };
}
