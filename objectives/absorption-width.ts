/** Absorption-width targets: the full width at half maximum of a doped stack's absorption peak at least and/or at most a value, in meV or in µm of wavelength. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, weight } from './common.js';
import { absorptionOf, widthOf } from './absorption-common.js';

const schema = z.object({
  absorption_width: z.object({
    at_least: quantity.optional().describe('Lower limit of the FWHM: an energy ("10 meV") or a wavelength span ("1 µm")'),
    at_most: quantity.optional().describe('Upper limit of the FWHM'),
  }).strict().describe('Limits of the absorption peak\'s full width at half maximum'),
  weight,
}).strict();
export type AbsorptionWidthTarget = z.infer<typeof schema>;

export const absorptionWidthObjective: Objective<AbsorptionWidthTarget> = {
  kind: 'absorption_width',
  description: 'the FWHM of a doped stack\'s absorption peak at least and/or at most a value (meV, or µm of wavelength)',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: () => ['electron'],
  examples: [{ absorption_width: { at_least: '1 µm' } }, { absorption_width: { at_least: '10 meV', at_most: '25 meV' } }],
  check: (t, field, geometry) => {
    if (geometry === 'wire') throw new InputError('bad-value', `${field}.absorption_width: the absorption of a doped layer stack; a wire has none here`, `${field}.absorption_width`);
    const { at_least, at_most } = t.absorption_width;
    if (at_least === undefined && at_most === undefined) throw new InputError('bad-value', `${field}.absorption_width: give at_least and/or at_most`, `${field}.absorption_width`);
    const lo = at_least === undefined ? undefined : widthOf(at_least, `${field}.absorption_width.at_least`);
    const hi = at_most === undefined ? undefined : widthOf(at_most, `${field}.absorption_width.at_most`);
    if (lo && hi && lo.unit !== hi.unit) throw new InputError('bad-value', `${field}.absorption_width: give both limits in one kind of unit (both meV or both µm), got ${JSON.stringify(at_least)} and ${JSON.stringify(at_most)}`, `${field}.absorption_width`);
  },
  evaluate: (t, r) => {
    const { at_least, at_most } = t.absorption_width;
    const lo = at_least === undefined ? undefined : widthOf(at_least, 'at_least');
    const hi = at_most === undefined ? undefined : widthOf(at_most, 'at_most');
    const unit = (lo ?? hi)!.unit;
    const a = absorptionOf(r);
    const value = a ? (unit === 'meV' ? a.fwhm_meV : a.fwhm_um) : null;
    const low = lo?.value ?? -Infinity;
    const high = hi?.value ?? Infinity;
    // 10 % of the limit per unit of residual beyond it, as spacing targets score a shortfall.
    const scale = 0.1 * (Number.isFinite(low) ? low : high);
    const short = value === null ? 0 : value < low ? (low - value) / scale : value > high ? (value - high) / scale : 0;
    return {
      label: 'absorption FWHM', role: 'target', achieved: value, goal: Number.isFinite(low) ? low : high, unit,
      residual: value === null ? 1 + MISSING_STATE_PENALTY : short === 0 ? 0 : 1 + short,
      weight: t.weight ?? 1, satisfied: value !== null && short === 0,
    };
  },
};
