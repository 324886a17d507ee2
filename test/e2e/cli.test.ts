import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';

describe('wellsmith command line (in-process)', () => {
  it('solve prints the JSON shape other tools rely on', async () => {
    const o = await cli(['solve', 'runs/pump-976.yaml', '--json']);
    expect(o.code, o.stderr).toBe(0);
    const r = JSON.parse(o.stdout);
    for (const band of ['electron', 'heavy_hole', 'light_hole']) {
      for (const s of r.bands[band].states) {
        expect(Object.keys(s)).toEqual(expect.arrayContaining(['label', 'energy_eV', 'confinement_meV', 'bound']));
      }
    }
    const t = r.transitions.find((x: { label: string }) => x.label === 'e1-hh1');
    expect(Object.keys(t)).toEqual(expect.arrayContaining(['label', 'energy_eV', 'wavelength_nm', 'overlap2']));
    // Common practice: compressively strained ~7 nm In0.2Ga0.8As wells in GaAs emit near 980 nm.
    expect(Math.abs(t.wavelength_nm - 980)).toBeLessThan(20);
    expect(r.transitions.find((x: { label: string }) => x.label === 'e1-e2').oscillator_strength).toBeGreaterThan(0);
    expect(r.dos.bands.electron.length).toBe(r.bands.electron.states.length);
    expect(r.structure.layers).toHaveLength(5);
  });

  it('bad input is one line on stderr with exit code 2', async () => {
    for (const argv of [['solve', 'no-such-file.yaml'], ['materials', 'In0.3Ga0.6As'], ['materials', 'GaAs', '--temperature', '-4 K'], ['frobnicate']]) {
      const o = await cli(argv);
      expect(o.code, argv.join(' ')).toBe(2);
      expect(o.stderr.trim().split('\n'), argv.join(' ')).toHaveLength(1);
      expect(o.stderr).not.toMatch(/\n\s+at /);
    }
  });
});
