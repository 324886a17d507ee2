/**
 * Conformance of the optical target kinds (objectives/gain-peak.ts, peak-gain.ts,
 * gain-transparency.ts, polarisation-ratio.ts, absorption-edge.ts): schema round trip, residual
 * zero at a target built from what each achieved, finite residuals for every candidate (no gain at
 * the density, no bound state, a result that is not a stack's solve), and input errors that name the
 * field. The kinds are exercised through their Objective objects, as the registry dispatches them.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InputError } from '../../engine/errors.js';
import type { Objective, TargetSource } from '../../objectives/types.js';
import { gainPeakObjective } from '../../objectives/gain-peak.js';
import { peakGainObjective } from '../../objectives/peak-gain.js';
import { gainTransparencyObjective } from '../../objectives/gain-transparency.js';
import { polarisationRatioObjective } from '../../objectives/polarisation-ratio.js';
import { absorptionEdgeObjective } from '../../objectives/absorption-edge.js';
import { solvedStack } from './helpers.js';

const KINDS = { gain_peak: gainPeakObjective, peak_gain: peakGainObjective, gain_transparency: gainTransparencyObjective, polarisation_ratio: polarisationRatioObjective, absorption_edge: absorptionEdgeObjective } as unknown as Record<string, Objective<unknown>>;

const kindOf = (t: Record<string, unknown>): Objective<unknown> => KINDS[Object.keys(t)[0]!]!;
const evaluate = (t: Record<string, unknown>, r: TargetSource) => {
  const o = kindOf(t);
  const parsed = o.schema.parse(t);
  o.check(parsed, 'targets[0]', 'stack');
  return o.evaluate(parsed, r);
};

/** The pump stack of runs/pump-976.yaml at a width (nm) and In fraction. */
const pump = (w: number, x: number) => solvedStack([['Al0.30Ga0.70As', 20], ['GaAs', 10], [`In${x.toFixed(3)}Ga${(1 - x).toFixed(3)}As`, w], ['GaAs', 10], ['Al0.30Ga0.70As', 20]]);

describe('optical target kinds', () => {
  const r = pump(7, 0.2);
  const first: Record<string, unknown>[] = [
    { gain_peak: 'TE', wavelength: '976 nm', within: '2 nm', density: '3e12 cm-2' },
    { peak_gain: 'TE', at_least: '1000 cm-1', density: '3e12 cm-2' },
    { gain_transparency: 'TE', at_most: '1e12 cm-2' },
    { polarisation_ratio: 'TE/TM', value: 1, within: 0.5, density: '3e12 cm-2' },
    { absorption_edge: 'TE', wavelength: '990 nm', within: '5 nm' },
  ];

  it('round-trip their schemas, describe themselves, and score residual 0 at a target set to what they achieved', () => {
    const again = first.map((t) => {
      const e = evaluate(t, r);
      expect(e.achieved, `${e.label} achieved`).not.toBeNull();
      const a = e.achieved!;
      const key = Object.keys(t)[0]!;
      return key === 'gain_peak' ? { ...t, wavelength: `${a} nm` }
        : key === 'peak_gain' ? { ...t, at_least: `${a} cm-1` }
          : key === 'gain_transparency' ? { ...t, at_most: `${a} cm-2` }
            : key === 'polarisation_ratio' ? { ...t, value: a }
              : { ...t, wavelength: `${a} nm` };
    });
    const lines: string[] = [];
    for (const t of again) {
      const o = kindOf(t);
      expect(o.description.length).toBeGreaterThan(30);
      expect(o.schema.parse(JSON.parse(JSON.stringify(o.schema.parse(t))))).toEqual(t);
      const e = evaluate(t, r);
      lines.push(`${e.label} ${e.achieved} ${e.unit} → r ${e.residual.toExponential(1)}`);
      expect(Math.abs(e.residual), e.label).toBeLessThan(1e-9);
      expect(e.satisfied, e.label).toBe(true);
    }
    console.log(`at target (7 nm In0.2Ga0.8As pump well): ${lines.join('; ')}`);
  });

  it('score finite residuals for every candidate, with a penalty where there is no gain or no result to read', () => {
    const cases = fc.sample(fc.record({ w: fc.integer({ min: 40, max: 100 }).map((v) => v / 10), x: fc.integer({ min: 5, max: 30 }).map((v) => v / 100), n: fc.constantFrom('1e10 cm-2', '3e12 cm-2') }), { numRuns: 5, seed: 14 });
    for (const { w, x, n } of cases) {
      const rr = pump(w, x);
      for (const t of first) {
        const e = evaluate(t.density ? { ...t, density: n } : t, rr);
        expect(Number.isFinite(e.residual), `${e.label} at w ${w}, x ${x}, ${n}: ${e.residual}`).toBe(true);
        if (t.gain_peak && n === '1e10 cm-2') {
          // No gain at 1e10 cm⁻²: the peak does not exist and costs more than a missed window.
          expect(e.achieved).toBeNull();
          expect(Math.abs(e.residual)).toBeGreaterThan(1);
        }
      }
    }
    // A result that is not a stack's solve (a wire's, or one without wavefunctions) has nothing to read.
    const bare = { ...r, settings: undefined, wavefunctions: undefined } as unknown as TargetSource;
    for (const t of first) {
      const e = evaluate(t, bare);
      expect(e.achieved, e.label).toBeNull();
      expect(Number.isFinite(e.residual) && Math.abs(e.residual) >= 1, `${e.label}: ${e.residual}`).toBe(true);
    }
  });

  it('carry examples that parse and pass their checks', () => {
    for (const o of Object.values(KINDS)) {
      expect(o.examples?.length, o.kind).toBeGreaterThan(0);
      for (const t of o.examples!) o.check(o.schema.parse(t), 'targets[0]', 'stack');
    }
  });

  it('refuse wires and malformed keys with errors naming the field', () => {
    const refuse = (t: Record<string, unknown>, field: RegExp, geometry: 'stack' | 'wire' = 'stack'): void => {
      const o = kindOf(t);
      let err: unknown;
      try {
        o.check(o.schema.parse(t), 'targets[2]', geometry);
      } catch (e) {
        err = e;
      }
      expect(err, JSON.stringify(t)).toBeInstanceOf(InputError);
      expect((err as InputError).message).toMatch(field);
    };
    refuse(first[0]!, /^targets\[2\]\.gain_peak: optical spectra are computed for layer stacks/, 'wire');
    refuse({ ...first[0], density: '3e12 m-3' }, /^targets\[2\]\.density: unknown sheet-density unit/);
    refuse({ ...first[0], wavelength: undefined, energy: undefined }, /^targets\[2\]: give exactly one of energy or wavelength/);
    refuse({ ...first[1], intraband_time: '0.1 s' }, /^targets\[2\]\.intraband_time: expected a positive time/);
    refuse({ ...first[1], at_least: '-5 cm-1' }, /^targets\[2\]\.at_least: must be a positive gain/);
    refuse({ ...first[3], at_least: 2 }, /^targets\[2\]: give exactly one of at_least, at_most or value/);
    refuse({ polarisation_ratio: 'TM/TE', value: 1, density: '2e12' }, /^targets\[2\]\.within: a ratio "value" needs a window/);
    refuse({ ...first[4], level: '0 cm-1' }, /^targets\[2\]\.level: must be a positive absorption/);
    refuse({ ...first[4], within: '2 ML' }, /^targets\[2\]\.within: a wavelength window takes nm or µm/);
  });
});
