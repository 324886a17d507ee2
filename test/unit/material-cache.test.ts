/**
 * The resolved-material cache (engine/material-cache.ts) returns what resolveMaterial returns, once
 * per distinct key: every fraction, the temperature, the substrate and each model choice count.
 */
import { describe, expect, it } from 'vitest';
import { resolveMaterialCached } from '../../engine/material-cache.js';
import { parseFormula, resolveMaterial } from '../../materials/index.js';

const GaAs = parseFormula('GaAs');

describe('resolved-material cache', () => {
  it('equals resolveMaterial for binaries, ternaries and quaternaries, strained or free', () => {
    for (const f of ['GaAs', 'Al0.3Ga0.7As', 'In0.2Ga0.8As', 'In0.53Ga0.47As', 'In0.7Ga0.3As0.6P0.4']) {
      for (const substrate of [null, GaAs]) {
        const opts = { temperature_K: 77, substrate, models: { electronMass: 'kane-temperature' as const } };
        expect(resolveMaterialCached(parseFormula(f), opts), `${f} on ${substrate ? 'GaAs' : 'nothing'}`).toEqual(resolveMaterial(parseFormula(f), opts));
      }
    }
  });

  it('returns the same object for the same key, and a new one when any input differs', () => {
    const x = (v: number) => ({ III: { In: v, Ga: 1 - v }, V: { As: 1 } });
    const a = resolveMaterialCached(x(0.2), { temperature_K: 300, substrate: GaAs });
    expect(resolveMaterialCached(x(0.2), { temperature_K: 300, substrate: GaAs })).toBe(a);
    expect(resolveMaterialCached(x(0.2 + 1e-15), { temperature_K: 300, substrate: GaAs })).not.toBe(a);
    expect(resolveMaterialCached(x(0.2), { temperature_K: 300.000001, substrate: GaAs })).not.toBe(a);
    expect(resolveMaterialCached(x(0.2), { temperature_K: 300, substrate: null })).not.toBe(a);
    const held = resolveMaterialCached(x(0.2), { temperature_K: 300, substrate: GaAs, models: { lattice: 'held-below-100K' } });
    expect(held).not.toBe(a);
    expect(resolveMaterialCached(x(0.2), { temperature_K: 300, substrate: GaAs, models: { lattice: 'held-below-100K' } })).toBe(held);
  });

  it('does not cache an error: bad input throws on every call', () => {
    expect(() => resolveMaterialCached(GaAs, { temperature_K: -1, substrate: null })).toThrow();
    expect(() => resolveMaterialCached(GaAs, { temperature_K: -1, substrate: null })).toThrow();
  });
});
