/**
 * Every photon target reads its `within` the same way (objectives/common.ts windowIn): in the
 * unit of its goal, a number without a unit in that unit with a note saying so. Conversions are
 * definitions (1 µm = 1000 nm, 1 eV = 1000 meV). Before, gain and absorption targets read a bare
 * 0.2 under a 9 µm goal as 0.2 nm (a window 1000× too narrow) without a word.
 */
import { describe, expect, it } from 'vitest';
import { windowIn } from '../../objectives/common.js';
import { photonWindow } from '../../objectives/gain-common.js';
import { absorptionPeakObjective } from '../../objectives/absorption-peak.js';
import { gainPeakObjective } from '../../objectives/gain-peak.js';

const context = { geometry: 'stack' as const };

describe('photon windows', () => {
  it('are read in the goal\'s unit, with or without a unit written', () => {
    expect(windowIn('0.2 µm', 'µm', 'w')).toBeCloseTo(0.2, 12);
    expect(windowIn('200 nm', 'µm', 'w')).toBeCloseTo(0.2, 12);
    expect(windowIn('0.2', 'µm', 'w')).toBe(0.2);
    expect(windowIn(2, 'nm', 'w')).toBe(2);
    expect(windowIn('5 meV', 'eV', 'w')).toBeCloseTo(0.005, 12);
    expect(windowIn('0.005 eV', 'meV', 'w')).toBeCloseTo(5, 12);
    expect(windowIn('20 cm-1', 'cm⁻¹', 'w')).toBe(20);
    expect(() => windowIn('3 ML', 'nm', 'targets[0].within')).toThrow(/^targets\[0\]\.within: a wavelength window takes nm or µm/);
    expect(() => windowIn('-1 nm', 'nm', 'w')).toThrow(/must be positive/);
  });

  it('a bare number under a gain or absorption goal is the goal\'s unit, and a note says so', () => {
    expect(photonWindow({ wavelength: '976 nm', within: 2 }, 'targets[0]').within).toBe(2);
    const gain = gainPeakObjective.warnings!({ gain_peak: 'TE', wavelength: '976 nm', within: 2, density: '3e12 cm-2' } as never, 'targets[0]', context);
    expect(gain).toEqual([expect.stringMatching(/^targets\[0\]\.within: .*read as 2 nm/)]);
    const absorption = absorptionPeakObjective.warnings!({ absorption_peak: '9 µm', within: 0.2 } as never, 'targets[1]', context);
    expect(absorption).toEqual([expect.stringMatching(/^targets\[1\]\.within: .*read as 0\.2 µm/)]);
    expect(absorptionPeakObjective.warnings!({ absorption_peak: '9 µm', within: '0.2 µm' } as never, 'targets[1]', context)).toEqual([]);
  });
});
