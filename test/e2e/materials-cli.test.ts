import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';

describe('wellsmith materials', () => {
  it('prints the strained In0.2Ga0.8As-on-GaAs edges, masses, strain and critical thickness with units', async () => {
    const o = await cli(['materials', 'In0.2Ga0.8As', '--on', 'GaAs', '--temperature', '300 K']);
    expect(o.code, o.stderr).toBe(0);
    for (const row of ['Γ gap to top valence edge (strained)', 'heavy/light-hole splitting', 'critical thickness', 'in-plane strain', 'monolayer']) {
      expect(o.stdout).toContain(row);
    }
    const json = JSON.parse((await cli(['materials', 'In0.2Ga0.8As', '--on', 'GaAs', '--json'])).stdout);
    // Compressive strain puts heavy holes on top (common practice).
    expect(json.Ehh).toBeGreaterThan(json.Elh);
    expect(json.strain_par).toBeLessThan(0);
  });

  it('lists the binaries when no formula is given', async () => {
    const o = await cli(['materials', '--temperature', '77 K']);
    expect(o.code).toBe(0);
    for (const b of ['GaAs', 'AlAs', 'InAs', 'InP', 'GaP', 'AlP', 'GaSb', 'AlSb', 'InSb']) expect(o.stdout).toContain(b);
  });

  // The bad-input cases of the materials acceptance list: each is one line naming the problem, exit 2.
  const bad: [string[], RegExp][] = [
    [['materials', 'Zq0.3Ga0.7As'], /unknown element "Zq"/],
    [['materials', 'In0.3Ga0.6As'], /sum/],
    [['materials', 'GaAs0.5In0.5'], /group/i],
    [['materials', 'GaAs', '--temperature=-5 K'], /temperature/],
    [['materials', 'GaAs', '--on', 'Unobtainium'], /--on|substrate|element/i],
  ];
  for (const [argv, pattern] of bad) {
    it(`rejects: ${argv.slice(1).join(' ')}`, async () => {
      const o = await cli(argv);
      expect(o.code).toBe(2);
      expect(o.stdout).toBe('');
      expect(o.stderr.trim().split('\n')).toHaveLength(1);
      expect(o.stderr).toMatch(pattern);
    });
  }
});
