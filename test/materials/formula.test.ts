/**
 * Formula notation: the trade's spellings, canonical printing, round trip and bad input.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { alloyFromName, formatFormula, parseFormula, type Alloy } from '../../materials/index.js';
import { expectClose, expectInputError } from './check.js';

function expectAlloy(got: Alloy, want: Alloy, input: string): void {
  for (const side of ['III', 'V'] as const) {
    expect(Object.keys(got[side]).sort(), `${input} ${side} elements`).toEqual(Object.keys(want[side]).sort());
    for (const [el, f] of Object.entries(want[side])) expectClose(got[side][el]!, f, 1e-12, `${input} ${el}`);
  }
}

describe('parseFormula: the trade notation (common practice)', () => {
  const cases: readonly [string, Alloy][] = [
    ['GaAs', { III: { Ga: 1 }, V: { As: 1 } }],
    ['Al0.3Ga0.7As', { III: { Al: 0.3, Ga: 0.7 }, V: { As: 1 } }],
    ['In0.53Ga0.47As', { III: { In: 0.53, Ga: 0.47 }, V: { As: 1 } }],
    ['Ga0.47In0.53As', { III: { In: 0.53, Ga: 0.47 }, V: { As: 1 } }],
    ['In0.72Ga0.28As0.61P0.39', { III: { In: 0.72, Ga: 0.28 }, V: { As: 0.61, P: 0.39 } }],
    ['Al0.1Ga0.37In0.53As', { III: { Al: 0.1, Ga: 0.37, In: 0.53 }, V: { As: 1 } }],
    ['Al0.3GaAs', { III: { Al: 0.3, Ga: 0.7 }, V: { As: 1 } }],
    ['GaAs0.5Sb0.5', { III: { Ga: 1 }, V: { As: 0.5, Sb: 0.5 } }],
  ];
  for (const [text, want] of cases) it(text, () => expectAlloy(parseFormula(text), want, text));
});

describe('alloyFromName: fractions given separately', () => {
  it('InGaAs with { In: 0.2 } is In0.2Ga0.8As', () => {
    expect(formatFormula(alloyFromName('InGaAs', { In: 0.2 }))).toBe('In0.2Ga0.8As');
  });
  it('InGaAsP with { In: 0.72, As: 0.61 } is In0.72Ga0.28As0.61P0.39', () => {
    expect(formatFormula(alloyFromName('InGaAsP', { In: 0.72, As: 0.61 }))).toBe('In0.72Ga0.28As0.61P0.39');
  });
  it('AlGaInAs with { Al: 0.1, In: 0.53 } leaves Ga = 0.37', () => {
    expectAlloy(alloyFromName('AlGaInAs', { Al: 0.1, In: 0.53 }), { III: { Al: 0.1, Ga: 0.37, In: 0.53 }, V: { As: 1 } }, 'AlGaInAs');
  });
});

describe('formatFormula', () => {
  it('prints the canonical order without float noise', () => {
    expect(formatFormula({ III: { Ga: 1 - 0.53, In: 0.53 }, V: { As: 1 } })).toBe('In0.53Ga0.47As');
    expect(formatFormula({ III: { Ga: 0.7, Al: 0.3 }, V: { As: 1 } })).toBe('Al0.3Ga0.7As');
    expect(formatFormula({ III: { Ga: 1 }, V: { P: 0.39, As: 0.61 } })).toBe('GaAs0.61P0.39');
  });
  it('parse(format(a)) equals a (property)', () => {
    const side = (els: readonly string[]) => fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: els.length, maxLength: els.length })
      .map((ws) => {
        const total = ws.reduce((a, b) => a + b, 0);
        const fr = total > 0 ? ws.map((w) => w / total) : ws.map((_, i) => (i === 0 ? 1 : 0));
        return Object.fromEntries(els.map((e, i) => [e, fr[i]!]));
      });
    const alloy = fc.oneof(
      fc.record({ III: side(['In', 'Ga']), V: side(['As']) }),
      fc.record({ III: side(['Al', 'Ga', 'In']), V: side(['As']) }),
      fc.record({ III: side(['In', 'Ga']), V: side(['As', 'P']) }),
      fc.record({ III: side(['Ga']), V: side(['As', 'Sb']) }),
    );
    fc.assert(fc.property(alloy, (a) => {
      const text = formatFormula(a);
      expectAlloy(parseFormula(text), a, text);
      expect(formatFormula(parseFormula(text)), 'format is a fixed point').toBe(text);
    }), { numRuns: 200 });
  });
});

describe('bad input', () => {
  it('unknown element', () => expectInputError(() => parseFormula('Xy0.3Ga0.7As'), 'bad-formula', /unknown element "Xy"/));
  it('group-III fractions not summing to 1, with a corrected example', () =>
    expectInputError(() => parseFormula('In0.3Ga0.6As'), 'bad-formula', /group-III fractions sum to 0\.9, must sum to 1 \(e\.g\. In0\.3Ga0\.7As\)/));
  it('group-V fractions not summing to 1', () =>
    expectInputError(() => parseFormula('In0.72Ga0.28As0.6P0.3'), 'bad-formula', /group-V fractions sum to 0\.9/));
  it('group-III element on the group-V side', () => expectInputError(() => parseFormula('GaAsIn'), 'bad-formula', /group-III element In on the group-V side/));
  it('group-V element on the group-III side', () => expectInputError(() => parseFormula('AsGa'), 'bad-formula', /group-V element As on the group-III side/));
  it('fraction outside [0, 1]', () => expectInputError(() => parseFormula('In1.2GaAs'), 'bad-formula', /fraction of In is 1\.2, must lie in \[0, 1\]/));
  it('negative fraction', () => expectInputError(() => alloyFromName('InGaAs', { In: -0.1 }), 'bad-formula', /fraction of In is -0\.1/));
  it('elements without parameters', () => expectInputError(() => parseFormula('GaN'), 'unknown-material', /no parameters for GaN/));
  it('missing fractions', () => expectInputError(() => parseFormula('AlGaAs'), 'bad-formula', /fractions missing for Al, Ga/));
  it('quaternary name needs a group-V fraction', () => expectInputError(() => alloyFromName('InGaAsP', { In: 0.72 }), 'bad-formula', /group-V fractions missing for As, P/));
  it('fraction for an element not in the name', () => expectInputError(() => alloyFromName('InGaAs', { Al: 0.2 }), 'bad-formula', /fraction given for Al/));
});
