/**
 * The spec keys of doped structures (ours), as zod pieces for engine/input/schema.ts: a layer's
 * `doping:` (volume densities over the layer or a part of it, or a delta sheet inside it; donors or
 * acceptors), the top-level `doping:` section (a background and the self-consistent solve's
 * settings), `bias:` (voltages or fields at which a doped stack is solved) and `absorption:` (how
 * the intersubband absorption is computed and coupled). Quantities stay strings with units here;
 * engine/poisson/doping.ts, bias.ts and absorption.ts convert them and name the field on errors.
 */
import { z } from 'zod';

const quantity = z.union([z.number(), z.string()]);

/** One doped part of a layer: a volume density over [from, to] or a sheet at `at` (the unit tells which). */
export const dopingEntrySchema = z
  .object({
    donors: quantity.optional().describe('Ionised donors: a volume density ("1e18 cm-3") over the layer or its part from..to, or a sheet density ("5e11 cm-2") at "at"'),
    acceptors: quantity.optional().describe('Ionised acceptors, written as donors'),
    from: quantity.optional().describe('Start of the doped part, from the layer\'s start (nm, Å or ML); volume densities only; default 0'),
    to: quantity.optional().describe('End of the doped part, from the layer\'s start; volume densities only; default the layer\'s thickness'),
    at: quantity.optional().describe('Position of a sheet, from the layer\'s start; default the layer\'s centre'),
  })
  .strict()
  .superRefine((e, ctx) => {
    const kinds = (['donors', 'acceptors'] as const).filter((k) => e[k] !== undefined);
    if (kinds.length !== 1) ctx.addIssue({ code: 'custom', path: [], input: e, message: `give exactly one of donors or acceptors per entry (a list of entries dopes a layer with both), got ${kinds.length === 0 ? 'neither' : 'both'}` });
  });

/** A layer's `doping:` key: one entry or a list of them. */
export const layerDopingSchema = z
  .union([dopingEntrySchema, z.array(dopingEntrySchema).min(1)])
  .describe('Ionised dopants of this layer: { donors: 1e18 cm-3 }, { acceptors: 5e17 cm-3, from: 1 nm, to: 4 nm }, { donors: 5e11 cm-2, at: 2 nm } (a delta sheet), or a list of these');

/** The background doping: a volume density over the whole stack. */
export const backgroundSchema = z
  .object({
    donors: quantity.optional().describe('Unintentional donors over the whole stack, e.g. "1e14 cm-3"'),
    acceptors: quantity.optional().describe('Unintentional acceptors over the whole stack'),
  })
  .strict();

/** The top-level `doping:` section: background and the self-consistent Schrödinger–Poisson solve's settings. */
export const dopingSectionSchema = z
  .object({
    background: backgroundSchema.optional(),
    mesh: quantity.optional().describe('Largest Poisson element (nm); each layer is cut evenly, nodes on every interface; default 0.5 nm'),
    tolerance: quantity.optional().describe('Self-consistency: largest change of the electrostatic potential between input and output of an iteration; default 1e-6 eV'),
    max_iterations: z.number().int().min(1).max(10000).optional().describe('Iterations before the solve stops as not converged (exit 1 with the last residual); default 200'),
    mixing: z.number().gt(0).max(1).optional().describe('Anderson mixing parameter β (share of the new residual taken per step) over the predictor–corrector map; default 1'),
    continuum: z.boolean().optional().describe('Carriers above the barrier edge as a semiclassical 3-D gas in the stack; default true'),
  })
  .strict()
  .describe('Settings of the self-consistent solve of a doped stack and its background doping');

/** `bias:` one voltage or field, or a list: the doped stack is solved at each. */
export const biasSchema = z
  .union([quantity, z.array(quantity).min(1).max(64)])
  .describe('Applied bias across the stack: a voltage ("0.2 V", the electron energy at the last layer\'s end minus that at the first\'s start) or a field ("10 kV/cm"), or a list; replaces "field:"');

/** `absorption:` how the intersubband absorption of a doped stack is computed. */
export const absorptionSchema = z
  .object({
    linewidth: quantity.optional().describe('Lorentzian full width at half maximum of every line, e.g. "8 meV"; default 10 meV'),
    coupling: z.enum(['45deg', 'brewster', 'normal-z']).optional().describe('Light path through the stack: 45deg (p-polarised at 45° inside, the polished-facet geometry; default), brewster (p-polarised from air at Brewster\'s angle), or normal-z (the field along z, per unit path across the layers)'),
    refractive_index: z.number().gt(1).optional().describe('Background refractive index of the stack at the line; default 3.3'),
    continuum: quantity.optional().describe('Flat barrier added on each side to discretise the continuum (nm); default 200 nm × (10 meV / linewidth), so the discretised continuum stays finer than the lines'),
    range: quantity.optional().describe('How far above the barrier edge continuum states are kept; default 0.3 eV'),
    depolarisation: z.boolean().optional().describe('Shift every line by its depolarisation field (Ando, Fowler & Stern); default true'),
  })
  .strict()
  .describe('Intersubband absorption of a doped stack: lineshape, coupling geometry and continuum discretisation');

export type DopingEntrySpec = z.infer<typeof dopingEntrySchema>;
export type LayerDopingSpec = z.infer<typeof layerDopingSchema>;
export type BackgroundSpec = z.infer<typeof backgroundSchema>;
export type DopingSectionSpec = z.infer<typeof dopingSectionSchema>;
export type BiasSpec = z.infer<typeof biasSchema>;
export type AbsorptionSpec = z.infer<typeof absorptionSchema>;
