/**
 * The spec file's shape (ours). One zod schema is the single source for validation, for the
 * TypeScript types and for the shipped JSON Schema (schema/spec.schema.json). Quantities stay
 * strings with units here; engine/input/units.ts converts them when the structure is resolved,
 * so an error can still point at the field the user wrote.
 */
import { z } from 'zod';
import { opticsSchema } from '../optics/schema.js';
import { wireSchema } from '../wire/schema.js';
import { absorptionSchema, biasSchema, dopingSectionSchema, layerDopingSchema } from '../poisson/schema.js';

const quantity = z.union([z.number(), z.string()]);
const name = z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/, 'must be a name of letters, digits and _ that starts with a letter');

/** A fraction: a number in [0, 1], a variable name, or a linear grade {from, to}. */
export const fractionValue = z.union([
  z.number(),
  name,
  z.object({ from: z.number(), to: z.number() }).strict(),
]);

const layerKeys = {
  material: z.string().min(1).describe('Formula (Al0.3Ga0.7As), named alloy (InGaAs with a fraction key such as In: 0.2), a quaternary lattice-matched to InP by its 300 K gap wavelength (Q1.25 or InGaAsP(1.25 µm); AlGaInAs(1.3 µm)) or a custom material name'),
  thickness: quantity.describe('Length with unit (nm, Å, ML) or the name of a vary variable'),
  label: z.string().optional().describe('A name for the layer used in tables (well, barrier…); inside a repeat the period is added, e.g. well[3]'),
  doping: layerDopingSchema.optional(),
  strain: quantity.optional().describe('In-plane mismatch strain on the substrate ("-1 %", negative compressive) or a vary variable in %: the free fraction of a ternary name (InGaAs, GaAsP…) is solved to give it'),
};

export const layerSchema = z
  .object(layerKeys)
  .catchall(fractionValue)
  .describe('One layer, from the substrate side upwards');

const repeatKeys = {
  periods: z.number().int().min(1).max(1000).describe('How many times the layers of "repeat" are grown'),
  label: z.string().optional().describe('A name for the repeat block, used in messages'),
};

/**
 * One stack entry: a layer, or a repeat block { repeat: [layers], periods: N }. Written as one
 * object (not a union) so that an error inside either kind still names its own field, e.g.
 * stack[2].repeat[1].thickness; checkEntry tells the two kinds apart.
 */
function entrySchema<T extends z.ZodType>(inner: T | null, topLevel: boolean) {
  const shape = {
    ...layerKeys,
    material: layerKeys.material.optional(),
    thickness: layerKeys.thickness.optional(),
    ...(inner === null ? {} : {
      repeat: z.array(inner).min(1).optional().describe('Layers of one period, grown "periods" times (a repeat may hold one level of repeats)'),
      periods: repeatKeys.periods.optional(),
      per_period: z.array(name).optional().describe('Variables that take one value per period (w[1], w[2]…), instead of one value shared by every period; top-level repeats only'),
    }),
  };
  return z.object(shape).catchall(fractionValue).superRefine((e, ctx) => checkEntry(e as Record<string, unknown>, topLevel, ctx));
}

/** A layer needs material and thickness; a repeat block needs periods and takes no layer keys. */
function checkEntry(e: Record<string, unknown>, topLevel: boolean, ctx: z.core.$RefinementCtx): void {
  if (e.repeat === undefined) {
    for (const key of ['material', 'thickness'] as const) {
      if (e[key] === undefined) ctx.addIssue({ code: 'custom', path: [key], input: undefined, message: 'is required for a layer (or write a repeat block { repeat: [layers], periods: N })' });
    }
    for (const key of ['periods', 'per_period']) {
      if (e[key] !== undefined) ctx.addIssue({ code: 'custom', path: [key], input: e[key], message: 'belongs to a repeat block { repeat: [layers], periods: N }, not to a layer' });
    }
    return;
  }
  if (!topLevel && e.per_period !== undefined) ctx.addIssue({ code: 'custom', path: ['per_period'], input: e.per_period, message: 'is allowed on a top-level repeat only (its periods number the variables); move it to the outer repeat' });
  if (e.periods === undefined) ctx.addIssue({ code: 'custom', path: ['periods'], input: undefined, message: 'is required for a repeat block: how many times its layers are grown, e.g. periods: 5' });
  for (const key of Object.keys(e)) {
    if (!['repeat', 'periods', 'per_period', 'label'].includes(key)) ctx.addIssue({ code: 'custom', path: [key], input: e[key], message: 'a repeat block takes only repeat, periods, per_period and label; put layer keys inside its layers' });
  }
}

/** Entries of a repeat block: layers, or repeat blocks of layers (nesting goes one level deep). */
export const innerEntrySchema = entrySchema(layerSchema, false);
export const stackEntrySchema = entrySchema(innerEntrySchema, true).describe('A layer, or a repeat block { repeat: [layers], periods: N, per_period?: [variables] }');

export const customMaterialSchema = z
  .object({
    Ec: quantity.describe('Conduction-band edge on the absolute scale (eV)'),
    Ev: quantity.describe('Valence-band edge on the absolute scale (eV)'),
    me: z.number().positive().describe('Electron mass (m0)'),
    mhh: z.number().positive().describe('Heavy-hole mass along z (m0)'),
    mlh: z.number().positive().describe('Light-hole mass along z (m0)'),
    mhh_inplane: z.number().positive().optional(),
    mlh_inplane: z.number().positive().optional(),
    lattice: quantity.optional().describe('Lattice constant (nm or Å); sets the monolayer'),
    nonparabolicity: quantity.optional().describe('Electron non-parabolicity α (1/eV); default 1/Eg'),
    permittivity: z.number().positive().optional().describe('Static relative permittivity ε_s, for the exciton estimate'),
  })
  .strict();

export const variableSchema = z
  .object({
    from: quantity,
    to: quantity,
    value: z.union([quantity, z.array(quantity).min(1)]).optional().describe('Nominal value used by solve and tolerance; a list gives one value per period for a per_period variable'),
  })
  .strict();

export const offsetsSchema = z
  .object({
    conduction_share: z.number().gt(0).lt(1).describe('ΔEc/ΔEg at each heterointerface, relative to the reference material'),
    reference: z.string().optional().describe('Reference material for the share rule; default the substrate'),
    gap: z.enum(['unstrained', 'strained']).optional().describe('Which gap difference the share divides: the relaxed materials\' (default) or the strained edges as grown on the substrate, as measured offsets of strained wells are quoted'),
  })
  .strict();

export const solverSchema = z
  .object({
    nonparabolic: z.boolean().optional().describe('Energy-dependent electron mass (two-band); default true'),
    slice: quantity.optional().describe('Slice width for graded layers and fields; default 0.2 nm, Richardson-extrapolated'),
    max_states: z.number().int().positive().optional().describe('At most this many states per band; default all bound states'),
    nonparabolicity: z.enum(['two-band', 'three-band']).optional().describe('Form of the electron non-parabolicity α: two-band 1/Eg (default) or three-band Kane with the split-off band and the free-electron term'),
    electron_mass: z.enum(['low-temperature', 'kane-temperature']).optional().describe('Electron mass: the tabulated low-temperature value at every T (default), or scaled to T by the Kane inverse mass at Eg(T)'),
    lattice: z.enum(['linear', 'held-below-100K']).optional().describe('Lattice constant versus T: the tabulated linear law at every T (default), or held at its 100 K value below 100 K'),
    valence: z.enum(['kp4', 'kp6', 'parabolic']).optional().describe('Valence model for the hole dispersions, hole density of states and quasi-Fermi levels: kp4 (heavy and light holes mixed by the 4×4 Luttinger–Kohn Hamiltonian; default), kp6 (with the split-off band) or parabolic (the single-band in-plane masses). Subband edges at k∥ = 0 are the same in all three'),
    valence_axial: z.boolean().optional().describe('Axial approximation for the valence dispersions (in-plane isotropic); default false: [100] and [110] computed and the DOS averaged over both'),
  })
  .strict();

export const growthSchema = z
  .object({
    rates: z.record(z.string().min(1), quantity).describe('Growth rates keyed by binary (GaAs, AlAs, InAs), alloy formula or layer label: "1.0 µm/h", "0.2 ML/s", "2.5 Å/s"'),
  })
  .strict()
  .describe('Growth rates for the shutter times of the growth sheet (wellsmith report)');

export const carriersSchema = z
  .object({
    sheet_density: z.union([z.number(), z.string()]).describe('Injected electron and hole sheet density (n = p), e.g. "2e12 cm-2"; solve reports the quasi-Fermi levels'),
  })
  .strict();

/** Figures a preference can rank by (engine/design/preferences.ts computes them). */
export const PREFERENCE_FIGURES = ['critical_margin', 'spacing', 'splitting', 'overlap', 'total_thickness', 'indium', 'aluminium', 'gallium', 'phosphorus', 'antimony', 'strain_residual'] as const;

export const preferenceSchema = z
  .object({
    maximize: z.enum(PREFERENCE_FIGURES).optional().describe('Figure to make as large as possible'),
    minimize: z.enum(PREFERENCE_FIGURES).optional().describe('Figure to make as small as possible'),
    of: z.string().optional().describe('The states a spacing, splitting or overlap reads, e.g. e1-e2, hh1-lh1, e1-hh1'),
    within: quantity.optional().describe('Values closer than this tie (in the figure\'s unit: meV, nm, %, or a number)'),
  })
  .strict()
  .describe('critical_margin: smallest 1 − t/h_c over layers and merged strained runs; spacing/splitting: meV between the "of" states; overlap: overlap² of "of"; total_thickness: nm; indium…antimony: thickness × fraction summed over layers (nm); strain_residual: |net average strain| (%)');

export const specSchema = z
  .object({
    title: z.string().optional(),
    substrate: z.string().optional().describe('Substrate formula; layers are strained to it. Omit for unstrained layers'),
    temperature: quantity.optional().describe('Temperature, e.g. "300 K" (default 300 K)'),
    field: quantity.optional().describe('Electric field along z, e.g. "20 kV/cm" (default 0)'),
    offsets: offsetsSchema.optional(),
    materials: z.record(name, customMaterialSchema).optional(),
    vary: z.record(name, variableSchema).optional(),
    stack: z.array(stackEntrySchema).min(1).default([]).describe('Layers (and repeat blocks) from the substrate upwards; omit it when the spec describes a wire'),
    wire: wireSchema.optional(),
    solver: solverSchema.optional(),
    carriers: carriersSchema.optional(),
    optics: opticsSchema.optional(),
    doping: dopingSectionSchema.optional(),
    bias: biasSchema.optional(),
    absorption: absorptionSchema.optional(),
    growth: growthSchema.optional(),
    targets: z.array(z.record(z.string(), z.unknown())).optional(),
    prefer: z.array(preferenceSchema).optional().describe('Secondary objectives, in order of importance, applied once every target is met (lexicographic; values within "within" tie and pass to the next)'),
  })
  .strict()
  // A spec is either a layer stack or a wire cross-section; the empty default keeps Spec.stack a list for well code.
  .superRefine((spec, ctx) => {
    if (spec.wire === undefined && spec.stack.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['stack'], input: undefined, message: 'is required: give the layers, or a "wire:" section for a quantum wire' });
    } else if (spec.wire !== undefined && spec.stack.length > 0) {
      ctx.addIssue({ code: 'custom', path: ['wire'], input: undefined, message: 'a spec describes either a layer stack or a wire, not both; remove "stack:" or "wire:"' });
    }
    // Settings the wire solver does not apply are refused rather than silently ignored.
    if (spec.wire !== undefined) {
      const stackOnly: readonly [readonly (string | number)[], string][] = [
        [['field'], 'a wire is solved without an applied field; remove "field:" (fields are modelled for layer stacks)'],
        [['carriers'], 'injected carriers are computed for layer stacks only; remove "carriers:"'],
        [['optics'], 'optical spectra are computed for layer stacks only; remove "optics:"'],
        [['doping'], 'doped structures are solved self-consistently as layer stacks only; remove "doping:"'],
        [['bias'], 'a bias is applied across a layer stack; remove "bias:"'],
        [['absorption'], 'intersubband absorption is computed for doped layer stacks; remove "absorption:"'],
        [['solver', 'slice'], 'slices apply to graded layers and fields of layer stacks; a wire\'s grid is "wire.grid"'],
        [['solver', 'max_states'], 'a wire\'s number of subbands is "wire.states"; remove solver.max_states'],
      ];
      for (const [path, message] of stackOnly) {
        const value = path.length === 1 ? (spec as Record<string, unknown>)[path[0] as string] : (spec.solver as Record<string, unknown> | undefined)?.[path[1] as string];
        if (value !== undefined) ctx.addIssue({ code: 'custom', path: [...path], input: value, message });
      }
    }
  });

export type Spec = z.infer<typeof specSchema>;
export type LayerSpec = z.infer<typeof layerSchema>;
export type StackEntry = z.infer<typeof stackEntrySchema>;
/** A repeat block as code reads it (checkEntry guarantees its keys). */
export interface RepeatBlock {
  readonly repeat: readonly StackEntry[];
  readonly periods: number;
  readonly per_period?: readonly string[];
  readonly label?: string;
}
/** The repeat block of a stack entry, or null for a layer. */
export const repeatOf = (e: StackEntry): RepeatBlock | null => ((e as { repeat?: unknown }).repeat === undefined ? null : (e as unknown as RepeatBlock));
export type PreferenceSpec = z.infer<typeof preferenceSchema>;
export type CustomMaterialSpec = z.infer<typeof customMaterialSchema>;
export type VariableSpec = z.infer<typeof variableSchema>;
