/**
 * A recorded solve (the `structure` and `settings` of `wellsmith solve --json` or of a design in
 * `design --json`) turned back into a spec, so that a report re-solves it through the same schema,
 * limits and structure builder as any spec: nothing in the file is trusted as a number unless the
 * schema says it is one, a text field that reads "NaN" stays text, and a recorded thickness of
 * 1e5 nm meets the same stack limit as a typed one. The spec reproduces the recorded energies
 * exactly: thicknesses and fractions are carried as the same doubles.
 */
import { InputError } from '../errors.js';
import { validateSpec } from '../input/load.js';
import type { Spec } from '../input/schema.js';

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Reads one field of the recorded JSON, refusing what a solve never writes there. */
class Reader {
  constructor(private readonly where: string) {}

  fail(path: string, what: string): never {
    throw new InputError('schema', `${this.where}: recorded ${path} ${what}; regenerate the file with "wellsmith solve --json" or "wellsmith design --json"`, path);
  }

  record(v: unknown, path: string): Record<string, unknown> {
    return isRecord(v) ? v : this.fail(path, 'must be an object');
  }

  number(v: unknown, path: string): number {
    return typeof v === 'number' && Number.isFinite(v) ? v : this.fail(path, `must be a finite number, got ${JSON.stringify(v)}`);
  }

  text(v: unknown, path: string): string {
    return typeof v === 'string' ? v : this.fail(path, `must be text, got ${JSON.stringify(v)}`);
  }

  fractions(v: unknown, path: string): Record<string, number> {
    const r = this.record(v, path);
    return Object.fromEntries(Object.entries(r).map(([k, x]) => [k, this.number(x, `${path}.${k}`)]));
  }
}

/** "In0.2Ga0.8As"-style formula of recorded fractions, with the full precision of each double. */
function formulaOf(alloy: { III: Record<string, number>; V: Record<string, number> }): string {
  const side = (s: Record<string, number>): string => Object.entries(s).map(([el, x]) => (Object.keys(s).length === 1 ? el : `${el}${x}`)).join('');
  return side(alloy.III) + side(alloy.V);
}

/**
 * The spec of a recorded structure and solver settings (the shapes Structure and SolverSettings
 * take in --json). Throws InputError naming the recorded field when something is missing or of
 * the wrong kind, and the spec's own errors (schema, limits) prefixed with where the record sits.
 */
export function specFromRecorded(structure: unknown, settings: unknown, where: string): Spec {
  const r = new Reader(where);
  const s = r.record(structure, 'structure');
  const set = r.record(settings, 'settings');
  const layers = Array.isArray(s.layers) && s.layers.length > 0 ? s.layers : r.fail('structure.layers', 'must be a non-empty list');
  const materials: Record<string, unknown> = {};
  const stack = layers.map((raw, i) => {
    const path = `structure.layers[${i}]`;
    const l = r.record(raw, path);
    const c = r.record(l.composition, `${path}.composition`);
    const layer: Record<string, unknown> = { thickness: `${r.number(l.thickness_nm, `${path}.thickness_nm`)} nm`, label: r.text(l.label, `${path}.label`) };
    if (c.kind === 'alloy') {
      const a = r.record(c.alloy, `${path}.composition.alloy`);
      layer.material = formulaOf({ III: r.fractions(a.III, `${path}.composition.alloy.III`), V: r.fractions(a.V, `${path}.composition.alloy.V`) });
    } else if (c.kind === 'graded') {
      // A grade is written as its start formula with the mixed fractions graded to the end's.
      const from = r.record(c.from, `${path}.composition.from`);
      const to = r.record(c.to, `${path}.composition.to`);
      const f = { III: r.fractions(from.III, `${path}.composition.from.III`), V: r.fractions(from.V, `${path}.composition.from.V`) };
      const t = { III: r.fractions(to.III, `${path}.composition.to.III`), V: r.fractions(to.V, `${path}.composition.to.V`) };
      const name = (side: Record<string, number>, other: Record<string, number>): string => [...new Set([...Object.keys(side), ...Object.keys(other)])].join('');
      layer.material = name(f.III, t.III) + name(f.V, t.V);
      // Every fraction but the last of each side: the name's last element takes the remainder.
      for (const sideKey of ['III', 'V'] as const) {
        const els = [...new Set([...Object.keys(f[sideKey]), ...Object.keys(t[sideKey])])];
        for (const el of els.slice(0, -1)) layer[el] = { from: f[sideKey][el] ?? 0, to: t[sideKey][el] ?? 0 };
      }
    } else if (c.kind === 'custom') {
      const name = r.text(c.name, `${path}.composition.name`);
      const m = r.record(l.material, `${path}.material`);
      const bands = Array.isArray(l.bands) && l.bands.length > 0 ? r.record(l.bands[0], `${path}.bands[0]`) : r.fail(`${path}.bands`, 'must be a non-empty list');
      materials[name] = {
        Ec: `${r.number(m.Ec, `${path}.material.Ec`)} eV`,
        Ev: `${r.number(m.Ehh, `${path}.material.Ehh`)} eV`,
        me: r.number(m.me, `${path}.material.me`), mhh: r.number(m.mhh_z, `${path}.material.mhh_z`), mlh: r.number(m.mlh_z, `${path}.material.mlh_z`),
        mhh_inplane: r.number(m.mhh_par, `${path}.material.mhh_par`), mlh_inplane: r.number(m.mlh_par, `${path}.material.mlh_par`),
        nonparabolicity: r.number(bands.alpha, `${path}.bands[0].alpha`),
        ...(typeof m.a_nm === 'number' && Number.isFinite(m.a_nm) ? { lattice: `${m.a_nm} nm` } : {}),
        ...(typeof l.permittivity === 'number' && Number.isFinite(l.permittivity) ? { permittivity: l.permittivity } : {}),
      };
      layer.material = name;
    } else {
      r.fail(`${path}.composition.kind`, `must be alloy, graded or custom, got ${JSON.stringify(c.kind)}`);
    }
    return layer;
  });
  const rule = r.record(s.offsetRule, 'structure.offsetRule');
  const models = s.models === undefined ? {} : r.record(s.models, 'structure.models');
  const maxStates = set.maxStates;
  const spec: Record<string, unknown> = {
    title: s.title === undefined ? undefined : r.text(s.title, 'structure.title'),
    ...(s.substrate === null || s.substrate === undefined ? {} : { substrate: r.text(s.substrate, 'structure.substrate') }),
    temperature: `${r.number(s.temperature_K, 'structure.temperature_K')} K`,
    field: `${r.number(s.field_kV_per_cm, 'structure.field_kV_per_cm')} kV/cm`,
    ...(rule.kind === 'conduction-share' ? { offsets: { conduction_share: rule.share, reference: rule.reference, gap: rule.gap } } : {}),
    ...(Object.keys(materials).length > 0 ? { materials } : {}),
    stack,
    solver: {
      nonparabolic: set.nonparabolic,
      slice: `${r.number(set.slice_nm, 'settings.slice_nm')} nm`,
      ...(typeof maxStates === 'number' && Number.isFinite(maxStates) ? { max_states: maxStates } : {}),
      ...(models.nonparabolicity === undefined ? {} : { nonparabolicity: models.nonparabolicity }),
      ...(models.electronMass === undefined ? {} : { electron_mass: models.electronMass }),
      ...(models.lattice === undefined ? {} : { lattice: models.lattice }),
      ...(set.valence === undefined ? {} : { valence: set.valence }),
      ...(set.valenceAxial === undefined ? {} : { valence_axial: set.valenceAxial }),
    },
  };
  try {
    return validateSpec(spec);
  } catch (e) {
    if (e instanceof InputError) throw new InputError(e.code, `${where}: the recorded structure is not a valid stack: ${e.message}; regenerate the file`, e.field);
    throw e;
  }
}
