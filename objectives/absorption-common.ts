/**
 * What the absorption targets share: the absorption of a doped stack's solve (engine/poisson/doped.ts
 * puts it beside the states), and limits written as an energy, a wavelength width or a percentage.
 */
import { InputError } from '../engine/errors.js';
import { parseEnergy, parseLength, splitQuantity } from '../engine/input/units.js';
import type { AbsorptionResult } from '../engine/poisson/absorption.js';
import type { TargetSource } from './types.js';

/** The target kinds that read the intersubband absorption: a design computes it for every candidate only when one of them is asked for. */
export const INTERSUBBAND_ABSORPTION_KINDS: ReadonlySet<string> = new Set(['absorption_peak', 'absorption_width', 'absorption_strength']);

/** The solve's absorption spectrum, when it was computed and found a populated subband. */
export function absorptionOf(r: TargetSource): AbsorptionResult | undefined {
  const a = (r as TargetSource & { readonly absorption?: AbsorptionResult }).absorption;
  return a && a.status === 'ok' ? a : undefined;
}

/** A width written as an energy ("15 meV") or a wavelength span ("1.5 µm"): its value and unit (meV or µm). */
export function widthOf(raw: string | number, field: string): { readonly value: number; readonly unit: 'meV' | 'µm' } {
  if (splitQuantity(raw)?.unit === '') throw new InputError('bad-value', `${field}: ${JSON.stringify(raw)} has no unit, and a width may be an energy or a wavelength span; write e.g. "15 meV" or "1.5 µm"`, field);
  const e = parseEnergy(raw);
  if (typeof e === 'number') {
    if (!(e > 0)) throw new InputError('bad-value', `${field}: must be positive, got ${JSON.stringify(raw)}`, field);
    return { value: e * 1000, unit: 'meV' };
  }
  const l = parseLength(raw);
  if (typeof l === 'string' || 'ml' in l || !(l.nm > 0)) throw new InputError('bad-value', `${field}: expected a positive width in meV or µm, e.g. "15 meV" or "1.5 µm", got ${JSON.stringify(raw)}`, field);
  return { value: l.nm / 1000, unit: 'µm' };
}

/** An absorption per pass written as a percentage ("0.8 %") or a fraction (0.008), as a fraction. */
export function fractionOf(raw: string | number, field: string): number {
  const q = splitQuantity(raw);
  const v = q?.unit === '%' ? q.value / 100 : q?.unit === '' ? q.value : NaN;
  if (!(v > 0 && v < 1)) throw new InputError('bad-value', `${field}: expected an absorption per pass between 0 and 1, as "0.8 %" or 0.008, got ${JSON.stringify(raw)}`, field);
  return v;
}

