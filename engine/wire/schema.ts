/**
 * The `wire:` section of a spec (ours): a cross-section of one or more materials inside a barrier
 * material, solved in (x, y) with free motion along the wire. Lengths stay strings with units
 * (nm, Å, ML) or vary-variable names until engine/wire/structure.ts resolves them, so errors can
 * name the field the user wrote.
 */
import { z } from 'zod';

const length = z.union([z.number(), z.string()]).describe('Length with unit (nm, Å, ML of the part\'s own material) or the name of a vary variable');
const material = z.string().min(1).describe('Formula (GaAs, Al0.3Ga0.7As) or a custom material name');

const rectangle = z
  .object({ kind: z.literal('rectangle'), material, width: length, height: length })
  .strict()
  .describe('A rectangular core centred at the origin');

const circle = z
  .object({
    kind: z.literal('circle'),
    material,
    radius: length,
    shell: z.object({ material, thickness: length }).strict().optional().describe('A ring around the core; outside it is the barrier'),
  })
  .strict()
  .describe('A circular core centred at the origin, optionally in a shell');

const well = z
  .object({
    material,
    width: length.describe('Thickness of this parent well'),
    length: length.optional().describe('How far the well extends in the cross-section; default 40 nm for the arm (centred on the stem), 20 nm for the stem (below the arm)'),
  })
  .strict();

const tShape = z
  .object({ kind: z.literal('t-shape'), stem: well.describe('Vertical well ending on the arm'), arm: well.describe('Horizontal well across the end of the stem') })
  .strict()
  .describe('Two perpendicular quantum wells meeting in a T; the wire state sits at the junction');

const part = z
  .object({
    material,
    x: length.describe('Left edge'),
    y: length.describe('Bottom edge'),
    width: length,
    height: length,
    continues: z.boolean().optional().describe('True when this rectangle is a quantum well that continues beyond the drawing along its longer side (an arm cut off by the cross-section, as in T-wires): its 2-D continuum then bounds the wire subbands. Default false: the rectangle ends where it is drawn'),
  })
  .strict();

const union = z
  .object({ kind: z.literal('union'), parts: z.array(part).min(1).describe('Rectangles; where they overlap the later one wins') })
  .strict()
  .describe('A union of rectangles, each with its own material');

export const wireShapeSchema = z.discriminatedUnion('kind', [rectangle, circle, tShape, union]);

export const wireSchema = z
  .object({
    barrier: material.describe('Material around the cross-section'),
    shape: wireShapeSchema,
    grid: length.optional().describe('Coarsest grid spacing (nm or Å); the solver refines it and extrapolates; default 0.5 nm'),
    margin: length.optional().describe('Barrier kept around the shape before the hard outer wall; default 10 nm'),
    states: z.number().int().positive().max(40).optional().describe('Subbands sought per band; default 6 (only bound ones are reported)'),
    tolerance: z.union([z.number(), z.string()]).optional().describe('Wanted accuracy of each subband edge, e.g. "0.5 meV" (default)'),
    broadening: z.union([z.number(), z.string()]).optional().describe('Lorentzian half width of the sampled 1-D density of states, e.g. "2 meV" (default 1 meV)'),
  })
  .strict()
  .describe('A quantum-wire cross-section in place of a layer stack');

export type WireSpec = z.infer<typeof wireSchema>;
export type WireShapeSpec = z.infer<typeof wireShapeSchema>;
