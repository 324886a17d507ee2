/**
 * Spec + values of the free variables -> Structure: a frozen list of layers with materials
 * resolved at the temperature and strained on the substrate, thicknesses in nm and monolayers,
 * and the band-offset rule that was applied. Everything downstream (profiles, solvers, designs)
 * starts from this value; it is plain data so it can cross to a worker thread.
 */
import { InputError } from './errors.js';
import type { LayerSpec, Spec, VariableSpec } from './spec/schema.js';
import { parseField, parseLength, parseTemperature, splitQuantity, parseEnergy, type Length } from './spec/units.js';
import { alloyFromName, customMaterial, DEFAULT_MODELS, formatFormula, GROUP_III, GROUP_V, parseFormula, resolveMaterial, type Alloy } from '../materials/index.js';
import type { MaterialModels, ResolvedMaterial } from '../materials/types.js';
import { nonparabolicity, type NonparabolicityModel } from '../materials/nonparabolicity.js';
import { staticPermittivity } from '../materials/dielectric.js';
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
  readonly label: string;
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

/** Largest total stack thickness (nm): beyond it the wavefunction grid and the state count grow without physical purpose. */
export const MAX_TOTAL_NM = 10_000;

/** Kind and unit of a free variable, from the units of its bounds. */
export interface VariableInfo {
  readonly name: string;
  readonly kind: 'length' | 'fraction';
  /** 'nm' or 'ML' for lengths; '' for fractions. */
  readonly unit: 'nm' | 'ML' | '';
  readonly from: number;
  readonly to: number;
  readonly value: number | undefined;
}

function variableValue(v: VariableSpec, key: 'from' | 'to' | 'value', name: string): { x: number; unit: 'nm' | 'ML' | '' } {
  const raw = v[key] as string | number;
  const q = splitQuantity(raw);
  if (!q) throw new InputError('bad-value', `vary.${name}.${key}: expected a number or a length, got ${JSON.stringify(raw)}`, `vary.${name}.${key}`);
  if (q.unit === '') return { x: q.value, unit: '' };
  const len = parseLength(raw);
  if (typeof len === 'string') throw new InputError('bad-value', `vary.${name}.${key}: ${len}`, `vary.${name}.${key}`);
  return 'ml' in len ? { x: len.ml, unit: 'ML' } : { x: len.nm, unit: 'nm' };
}

/** The spec's free variables with their kinds and bounds, in declaration order. */
export function variablesOf(spec: Spec): readonly VariableInfo[] {
  return Object.entries(spec.vary ?? {}).map(([name, v]) => {
    const from = variableValue(v, 'from', name);
    const to = variableValue(v, 'to', name);
    const value = v.value === undefined ? undefined : variableValue(v, 'value', name);
    const unit = from.unit;
    if (to.unit !== unit || (value && value.unit !== unit)) {
      throw new InputError('bad-value', `vary.${name}: bounds and value must share one unit, got "${v.from}", "${v.to}"${v.value !== undefined ? `, "${v.value}"` : ''}; write all in nm, all in ML or all as fractions`, `vary.${name}`);
    }
    if (!(from.x < to.x)) throw new InputError('bad-value', `vary.${name}: "from" must be below "to", got ${v.from} and ${v.to}; swap them`, `vary.${name}`);
    if (value && (value.x < from.x || value.x > to.x)) throw new InputError('bad-value', `vary.${name}.value: ${v.value} lies outside [${v.from}, ${v.to}]; move it inside or widen the bounds`, `vary.${name}.value`);
    const kind = unit === '' ? 'fraction' : 'length';
    if (kind === 'fraction' && (from.x < 0 || to.x > 1)) throw new InputError('bad-value', `vary.${name}: a fraction must lie in [0, 1], got [${from.x}, ${to.x}]; give lengths a unit (nm, Å or ML)`, `vary.${name}`);
    if (kind === 'length' && from.x <= 0) throw new InputError('bad-value', `vary.${name}.from: a thickness must be positive, got ${v.from}`, `vary.${name}.from`);
    return { name, kind, unit, from: from.x, to: to.x, value: value?.x };
  });
}

/** The nominal variable values of a spec (each `value`), or an error naming the first one missing. */
export function nominalVariables(spec: Spec): Record<string, number> {
  const out: Record<string, number> = {};
  for (const v of variablesOf(spec)) {
    if (v.value === undefined) throw new InputError('unknown-variable', `vary.${v.name}: has no value to solve at; add "value:" inside its bounds, or run "wellsmith design" to choose it`, `vary.${v.name}`);
    out[v.name] = v.value;
  }
  return out;
}

const RESERVED = new Set(['material', 'thickness', 'label']);

function lookupVariable(name: string, vars: readonly VariableInfo[], values: Readonly<Record<string, number>>, field: string, want: VariableInfo['kind']): { value: number; info: VariableInfo } {
  const info = vars.find((v) => v.name === name);
  if (!info) {
    const known = vars.map((v) => v.name).join(', ');
    throw new InputError('unknown-variable', `${field}: unknown variable "${name}"; ${known ? `declared variables are ${known}` : 'declare it under "vary:" with bounds'}`, field);
  }
  if (info.kind !== want) throw new InputError('bad-value', `${field}: variable "${name}" is a ${info.kind} but a ${want} is needed here; give it ${want === 'length' ? 'bounds with a unit (nm or ML)' : 'bounds without a unit'}`, field);
  const value = values[name];
  if (value === undefined || !Number.isFinite(value)) throw new InputError('unknown-variable', `${field}: variable "${name}" has no value; give vary.${name}.value or solve a design`, field);
  return { value, info };
}

interface Context {
  readonly spec: Spec;
  readonly vars: readonly VariableInfo[];
  readonly values: Readonly<Record<string, number>>;
  readonly temperature_K: number;
  readonly substrate: Alloy | null;
}

function compositionOf(layer: LayerSpec, i: number, ctx: Context): LayerComposition {
  const field = `stack[${i}]`;
  const custom = ctx.spec.materials?.[layer.material];
  const fractionKeys = Object.keys(layer).filter((k) => !RESERVED.has(k));
  if (custom) {
    if (fractionKeys.length > 0) throw new InputError('bad-value', `${field}.${fractionKeys[0]}: custom material "${layer.material}" takes no fractions; remove it`, `${field}.${fractionKeys[0]}`);
    return { kind: 'custom', name: layer.material };
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
    else if (typeof raw === 'string') a = b = lookupVariable(raw, ctx.vars, ctx.values, f, 'fraction').value;
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

const parseFormulaAt = (text: string, field: string): Alloy => memo(formulas, text, () => withField(field, () => parseFormula(text)));
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
  return withField(field, () => resolveMaterial(alloyOrCustom, { temperature_K, substrate, models }));
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
    c = { vars: variablesOf(spec), parts: new Map(), settings: new Map() };
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

/** Whether a layer's composition depends on a free variable (a fraction that names one). */
const namesVariable = (layer: LayerSpec): boolean =>
  Object.keys(layer).some((k) => !RESERVED.has(k) && typeof (layer as Record<string, unknown>)[k] === 'string');

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
  const ctx: Context = { spec, vars, values, temperature_K, substrate };

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

  const partOf = (composition: LayerComposition, i: number): LayerPart => {
    const field = `stack[${i}]`;
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
  const layers = spec.stack.map((layer, i): ResolvedLayer => {
    const field = `stack[${i}]`;
    const dx = perturbation.composition?.[i] ?? 0;
    let part: LayerPart;
    if (namesVariable(layer)) part = partOf(perturbComposition(compositionOf(layer, i, ctx), dx), i);
    else {
      const base = memo(cache.parts, `${i}@${temperature_K}`, () => partOf(compositionOf(layer, i, ctx), i));
      // A composition error leaves binaries and custom materials as they are.
      const composition = perturbComposition(base.composition, dx);
      part = composition === base.composition ? base : partOf(composition, i);
    }
    const { composition, formula, material, permittivity, bands } = part;

    let length: Length;
    const t = layer.thickness;
    const tq = splitQuantity(t);
    const isName = typeof t === 'string' && !tq && /^[A-Za-z_][A-Za-z0-9_]*$/.test(t.trim());
    if (isName) {
      const { value, info } = lookupVariable((t as string).trim(), vars, ctx.values, `${field}.thickness`, 'length');
      length = info.unit === 'ML' ? { ml: value } : { nm: value };
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
      label: layer.label ?? `layer ${i + 1}`,
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
