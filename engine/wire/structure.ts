/**
 * Spec + values of the free variables -> WireStructure: the materials of a wire cross-section
 * resolved at the temperature (and strained on the substrate) exactly as layers of a well are,
 * the shape as a list of painted primitives in nm, and the solver settings. Plain frozen data.
 *
 * Strain model: each material is taken as pseudomorphic on the substrate like a (001) layer
 * (biaxial in-plane strain, hydrostatic shifts and heavy/light-hole splitting as in materials/),
 * or unstrained when the spec has no substrate. This is a crude first approximation for buried
 * wires: the real strain of a wire is two- or three-dimensional, relaxes near free edges and is
 * not modelled; trust it for lattice-matched systems (GaAs/AlGaAs) and treat strained wires as
 * indicative only.
 */
import { InputError } from '../errors.js';
import type { Spec } from '../input/schema.js';
import { parseEnergy, parseLength, splitQuantity } from '../input/units.js';
import { buildStructure, variablesOf, type LayerBands, type OffsetRule, type StructureModels } from '../structure.js';
import { DEFAULT_SETTINGS } from '../solve.js';
import type { ResolvedMaterial } from '../../materials/types.js';
import type { WireSpec } from './schema.js';

/** One material of the cross-section (index 0 is the barrier). */
export interface WireMaterial {
  /** Spec field the material came from, e.g. "wire.shape.material". */
  readonly field: string;
  readonly formula: string;
  readonly material: ResolvedMaterial;
  /** Band edges after the offset rule and masses (as for a well layer). */
  readonly bands: LayerBands;
}

/**
 * A parent well of the cross-section: one drawn arm, stem or continuing union rectangle extended without end
 * along its long direction, i.e. a 1-D well of its thickness across it, in the barrier. Its 2-D
 * continuum starts at its lowest 1-D level, so a wire state is bound only below that.
 */
export interface ParentWell {
  /** Spec field of the part, e.g. "wire.shape.arm" or "wire.shape.parts[1]". */
  readonly field: string;
  /** Index into materials. */
  readonly material: number;
  readonly thickness_nm: number;
  /** Axis the thickness lies along: 'y' is the growth axis [001], 'x' the in-plane direction across the wire. */
  readonly across: 'x' | 'y';
}

/** A painted piece of the cross-section: later primitives cover earlier ones. Lengths nm. */
export type Primitive =
  | { readonly kind: 'rect'; readonly x0: number; readonly x1: number; readonly y0: number; readonly y1: number; readonly material: number }
  | { readonly kind: 'disc'; readonly radius: number; readonly material: number };

export interface WireSettings {
  /** Coarsest grid spacing (nm); the solver also uses h/2 and h/4. */
  readonly grid_nm: number;
  /** Barrier kept between the shape's bounding box and the outer hard wall (nm). */
  readonly margin_nm: number;
  /** Subbands sought per band. */
  readonly states: number;
  /** Wanted accuracy of each subband edge (eV). */
  readonly tolerance_eV: number;
  /** Lorentzian half width of the sampled 1-D DOS (eV). */
  readonly broadening_eV: number;
  /** Energy-dependent (two-band) electron mass, from the spec's solver.nonparabolic as for a well. */
  readonly nonparabolic: boolean;
}

export interface WireStructure {
  readonly title: string;
  readonly substrate: string | null;
  readonly temperature_K: number;
  readonly offsetRule: OffsetRule;
  /** The model choices the materials were resolved with (the spec's solver section), as for a well. */
  readonly models: StructureModels;
  readonly shape: WireSpec['shape']['kind'];
  readonly materials: readonly WireMaterial[];
  readonly primitives: readonly Primitive[];
  /** The parent wells whose 2-D continuum bounds the wire subbands (none for a rectangle or circle: the barrier edge does). */
  readonly parentWells: readonly ParentWell[];
  /** Each resolved dimension by its spec field (nm), e.g. {"wire.shape.width": 12}. */
  readonly dimensions: Readonly<Record<string, number>>;
  /** Bounding box of the shape (nm). */
  readonly bounds: { readonly x0: number; readonly x1: number; readonly y0: number; readonly y1: number };
  readonly settings: WireSettings;
  readonly variables: Readonly<Record<string, number>>;
  /** Each length variable the shape uses: the first field it sizes, its length (nm) and that part's monolayer (nm), for snapping to whole monolayers. */
  readonly lengthVariables: Readonly<Record<string, { readonly field: string; readonly nm: number; readonly monolayer_nm: number }>>;
}

export const DEFAULT_WIRE_SETTINGS: WireSettings = { grid_nm: 0.5, margin_nm: 10, states: 6, tolerance_eV: 5e-4, broadening_eV: 1e-3, nonparabolic: DEFAULT_SETTINGS.nonparabolic };

/** Default extent of a T-wire's parent wells in the cross-section (nm). */
const ARM_LENGTH_NM = 40;
const STEM_LENGTH_NM = 20;

/** Material fields of a shape, in painting order after the barrier. */
function materialFields(wire: WireSpec): { field: string; name: string }[] {
  const s = wire.shape;
  const base = [{ field: 'wire.barrier', name: wire.barrier }];
  switch (s.kind) {
    case 'rectangle':
      return [...base, { field: 'wire.shape.material', name: s.material }];
    case 'circle':
      return [...base, ...(s.shell ? [{ field: 'wire.shape.shell.material', name: s.shell.material }] : []), { field: 'wire.shape.material', name: s.material }];
    case 't-shape':
      return [...base, { field: 'wire.shape.stem.material', name: s.stem.material }, { field: 'wire.shape.arm.material', name: s.arm.material }];
    case 'union':
      return [...base, ...s.parts.map((p, i) => ({ field: `wire.shape.parts[${i}].material`, name: p.material }))];
  }
}

/** Resolves the materials through the well's structure builder, renaming its stack fields to the wire's. */
function resolveMaterials(spec: Spec, wire: WireSpec, values: Readonly<Record<string, number>>): { materials: WireMaterial[]; substrate: string | null; temperature_K: number; offsetRule: OffsetRule; models: StructureModels } {
  const fields = materialFields(wire);
  const stack = fields.map((f) => ({ material: f.name, thickness: '1 nm' }));
  const { wire: _omit, ...rest } = spec;
  let built;
  try {
    built = buildStructure({ ...rest, stack, targets: undefined }, values);
  } catch (e) {
    const m = e instanceof InputError && e.field ? /^stack\[(\d+)\](?:\.material)?/.exec(e.field) : null;
    if (!m || !(e instanceof InputError)) throw e;
    const to = fields[Number(m[1])]!.field;
    throw new InputError(e.code, e.message.split(m[0]).join(to), e.field!.replace(m[0], to));
  }
  const materials = built.layers.map((l, i): WireMaterial => ({ field: fields[i]!.field, formula: l.formula, material: l.material, bands: l.bands[0]! }));
  return { materials, substrate: built.substrate, temperature_K: built.temperature_K, offsetRule: built.offsetRule, models: built.models };
}

/** A length field: a quantity (nm, Å, ML of `monolayer_nm`) or a length variable. */
function lengthOf(raw: string | number, field: string, spec: Spec, values: Readonly<Record<string, number>>, monolayer_nm: number, positive: boolean): number {
  let nm: number;
  if (typeof raw === 'string' && !splitQuantity(raw)) {
    const name = raw.trim();
    const info = variablesOf(spec).find((v) => v.name === name);
    if (!info) {
      const known = variablesOf(spec).map((v) => v.name).join(', ');
      throw new InputError('unknown-variable', `${field}: unknown variable "${name}"; ${known ? `declared variables are ${known}` : 'declare it under "vary:" with bounds'}`, field);
    }
    if (info.kind !== 'length') throw new InputError('bad-value', `${field}: variable "${name}" is a fraction but a length is needed here; give it bounds with a unit (nm or ML)`, field);
    const value = values[name];
    if (value === undefined || !Number.isFinite(value)) throw new InputError('unknown-variable', `${field}: variable "${name}" has no value; give vary.${name}.value or solve a design`, field);
    nm = info.unit === 'ML' ? value * monolayer_nm : value;
  } else {
    const parsed = parseLength(raw);
    if (typeof parsed === 'string') throw new InputError('bad-value', `${field}: ${parsed}`, field);
    nm = 'ml' in parsed ? parsed.ml * monolayer_nm : parsed.nm;
  }
  if (!Number.isFinite(nm) || (positive && !(nm > 0))) throw new InputError('bad-value', `${field}: must be a positive length, got ${JSON.stringify(raw)} (${nm} nm); give a size above 0`, field);
  return nm;
}

function settingOf<T>(raw: string | number | undefined, parse: (x: string | number) => T | string, field: string, fallback: T, valid: (x: T) => boolean, hint: string): T {
  if (raw === undefined) return fallback;
  const v = parse(raw);
  if (typeof v === 'string') throw new InputError('bad-value', `${field}: ${v}`, field);
  if (!valid(v)) throw new InputError('bad-value', `${field}: ${hint}, got ${JSON.stringify(raw)}`, field);
  return v;
}

const nmOnly = (x: string | number): number | string => {
  const l = parseLength(x);
  return typeof l === 'string' ? l : 'ml' in l ? `expected a length in nm or Å, got ${JSON.stringify(x)}` : l.nm;
};

/** Builds the wire structure of a spec with a `wire:` section at the given variable values. */
export function buildWireStructure(spec: Spec, values: Readonly<Record<string, number>>): WireStructure {
  const wire = spec.wire;
  if (!wire) throw new InputError('schema', 'wire: this spec has no "wire:" section; solve it as a layer stack', 'wire');
  const { materials, substrate, temperature_K, offsetRule, models } = resolveMaterials(spec, wire, values);
  const dimensions: Record<string, number> = {};
  const lengthVariables: Record<string, WireStructure['lengthVariables'][string]> = {};
  const ml = (index: number): number => materials[index]!.material.monolayer_nm;
  const len = (raw: string | number, field: string, material: number, positive = true): number => {
    const v = lengthOf(raw, field, spec, values, ml(material), positive);
    dimensions[field] = v;
    if (typeof raw === 'string' && !splitQuantity(raw)) lengthVariables[raw.trim()] ??= { field, nm: v, monolayer_nm: ml(material) };
    return v;
  };
  const primitives: Primitive[] = [];
  const parentWells: ParentWell[] = [];
  const s = wire.shape;
  switch (s.kind) {
    case 'rectangle': {
      const w = len(s.width, 'wire.shape.width', 1);
      const h = len(s.height, 'wire.shape.height', 1);
      primitives.push({ kind: 'rect', x0: -w / 2, x1: w / 2, y0: -h / 2, y1: h / 2, material: 1 });
      break;
    }
    case 'circle': {
      const core = s.shell ? 2 : 1;
      const r = len(s.radius, 'wire.shape.radius', core);
      if (s.shell) primitives.push({ kind: 'disc', radius: r + len(s.shell.thickness, 'wire.shape.shell.thickness', 1), material: 1 });
      primitives.push({ kind: 'disc', radius: r, material: core });
      break;
    }
    case 't-shape': {
      const ws = len(s.stem.width, 'wire.shape.stem.width', 1);
      const ls = s.stem.length === undefined ? STEM_LENGTH_NM : len(s.stem.length, 'wire.shape.stem.length', 1);
      const wa = len(s.arm.width, 'wire.shape.arm.width', 2);
      const la = s.arm.length === undefined ? ARM_LENGTH_NM : len(s.arm.length, 'wire.shape.arm.length', 2);
      if (!(la > ws)) throw new InputError('bad-value', `wire.shape.arm.length: must exceed the stem width ${ws} nm, got ${la} nm; lengthen the arm`, 'wire.shape.arm.length');
      primitives.push({ kind: 'rect', x0: -ws / 2, x1: ws / 2, y0: -ls, y1: 0, material: 1 });
      primitives.push({ kind: 'rect', x0: -la / 2, x1: la / 2, y0: 0, y1: wa, material: 2 });
      // The stem stands along y and the arm lies along x whatever lengths are drawn.
      parentWells.push({ field: 'wire.shape.stem', material: 1, thickness_nm: ws, across: 'x' }, { field: 'wire.shape.arm', material: 2, thickness_nm: wa, across: 'y' });
      break;
    }
    case 'union':
      s.parts.forEach((p, i) => {
        const f = `wire.shape.parts[${i}]`;
        const x = len(p.x, `${f}.x`, i + 1, false);
        const y = len(p.y, `${f}.y`, i + 1, false);
        const w = len(p.width, `${f}.width`, i + 1);
        const h = len(p.height, `${f}.height`, i + 1);
        primitives.push({ kind: 'rect', x0: x, x1: x + w, y0: y, y1: y + h, material: i + 1 });
        // Only a part declared to continue is a parent well; a square one has no long direction, so both
        // extensions count and the lower continuum bounds the subbands.
        if (p.continues && w >= h) parentWells.push({ field: f, material: i + 1, thickness_nm: h, across: 'y' });
        if (p.continues && h >= w) parentWells.push({ field: f, material: i + 1, thickness_nm: w, across: 'x' });
      });
      break;
  }
  const bounds = primitives.reduce(
    (b, p) => (p.kind === 'disc'
      ? { x0: Math.min(b.x0, -p.radius), x1: Math.max(b.x1, p.radius), y0: Math.min(b.y0, -p.radius), y1: Math.max(b.y1, p.radius) }
      : { x0: Math.min(b.x0, p.x0), x1: Math.max(b.x1, p.x1), y0: Math.min(b.y0, p.y0), y1: Math.max(b.y1, p.y1) }),
    { x0: Infinity, x1: -Infinity, y0: Infinity, y1: -Infinity },
  );
  const d = DEFAULT_WIRE_SETTINGS;
  const settings: WireSettings = {
    grid_nm: settingOf(wire.grid, nmOnly, 'wire.grid', d.grid_nm, (h) => h > 0 && h <= 2, 'must be a spacing above 0 and at most 2 nm'),
    margin_nm: settingOf(wire.margin, nmOnly, 'wire.margin', d.margin_nm, (m) => m > 0, 'must be a positive length'),
    states: wire.states ?? d.states,
    tolerance_eV: settingOf(wire.tolerance, parseEnergy, 'wire.tolerance', d.tolerance_eV, (t) => t > 0, 'must be a positive energy such as "0.5 meV"'),
    broadening_eV: settingOf(wire.broadening, parseEnergy, 'wire.broadening', d.broadening_eV, (g) => g > 0, 'must be a positive energy such as "1 meV"'),
    nonparabolic: spec.solver?.nonparabolic ?? d.nonparabolic,
  };
  const box = Math.max(bounds.x1 - bounds.x0, bounds.y1 - bounds.y0) + 2 * settings.margin_nm;
  if (box / settings.grid_nm > 400) {
    throw new InputError('bad-value', `wire.grid: ${settings.grid_nm} nm over a ${box.toFixed(1)} nm cross-section needs more than 400 nodes a side; give a coarser grid or a smaller margin`, 'wire.grid');
  }
  return {
    title: spec.title ?? '',
    substrate,
    temperature_K,
    offsetRule,
    models,
    shape: s.kind,
    materials,
    primitives,
    parentWells,
    dimensions,
    bounds,
    settings,
    variables: { ...values },
    lengthVariables,
  };
}

/** Index of the material at a point (nm): the last primitive covering it, else the barrier (0). */
export function materialAt(structure: WireStructure, x: number, y: number): number {
  const p = structure.primitives;
  for (let k = p.length - 1; k >= 0; k--) {
    const q = p[k]!;
    if (q.kind === 'disc' ? x * x + y * y < q.radius * q.radius : x >= q.x0 && x < q.x1 && y >= q.y0 && y < q.y1) return q.material;
  }
  return 0;
}
