/** Settings a wire spec cannot apply are input errors naming the key (issue: silently ignored settings). */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';

const wire = (extra: string): string => `
${extra}
wire:
  barrier: Al0.3Ga0.7As
  shape: { kind: rectangle, material: GaAs, width: 10 nm, height: 6 nm }
`;

describe('stack-only settings on a wire spec', () => {
  it.each([
    ['field: 10 kV/cm', /^field: a wire is solved without an applied field/],
    ['carriers: { sheet_density: 1e12 cm-2 }', /^carriers: injected carriers are computed for layer stacks only/],
    ['solver: { slice: 0.1 nm }', /^solver\.slice: .*wire\.grid/],
    ['solver: { max_states: 3 }', /^solver\.max_states: .*wire\.states/],
  ])('%s is refused', (extra, message) => {
    expect(() => parseSpecText(wire(extra))).toThrow(message);
  });

  it('settings a wire applies are accepted', () => {
    expect(parseSpecText(wire('solver: { nonparabolic: false, nonparabolicity: three-band }')).spec.wire).toBeDefined();
  });
});
