/** End to end: `wellsmith design` on the wire scenario runs/wire-spacing.yaml, in-process, with a small budget. */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { mismatch } from './check.js';

interface JsonState { label: string; energy_eV: number }
interface JsonDesign {
  satisfied: boolean;
  variables: { name: string; nm: number; ml: number }[];
  targets: { label: string; achieved: number | null; satisfied: boolean }[];
  bands: { electron: { states: JsonState[] } };
}

const energy = (states: JsonState[], label: string): number => {
  const s = states.find((x) => x.label === label);
  if (!s) throw new Error(`state ${label} missing from ${JSON.stringify(states.map((x) => x.label))}`);
  return s.energy_eV;
};

// Boltzmann constant 8.617333262e-5 eV/K (CODATA 2018, exact in the 2019 SI); 3 kT at 300 K in meV.
const THREE_KT_300_MEV = 3 * 8.617333262e-5 * 300 * 1000;
// GaAs lattice constant at 300 K 0.565325 nm (Vurgaftman, Meyer & Ram-Mohan, J. Appl. Phys. 89, 5815 (2001), Table III); one (001) monolayer is a/2.
const GAAS_ML_NM = 0.565325 / 2;

describe('wellsmith design on a wire spec', () => {
  it('ranks designs meeting e1-e2 ≥ 3 kT on whole monolayers, and solve on the written design reproduces the spacing exactly', async () => {
    const out = mkdtempSync(join(tmpdir(), 'wire-design-'));
    const o = await cli(['design', 'runs/wire-spacing.yaml', '--starts', '2', '--evaluations', '40', '--workers', '1', '--json', '--out', out]);
    expect(o.code, o.stderr).toBe(0);
    const r = JSON.parse(o.stdout) as { status: string; designs: JsonDesign[] };
    expect(r.status).toBe('ok');
    const best = r.designs[0]!;
    expect(best.satisfied).toBe(true);

    const spacing = best.targets.find((t) => t.label === 'e1-e2 spacing')!;
    const states = best.bands.electron.states;
    const fromStates = (energy(states, 'e2') - energy(states, 'e1')) * 1000;
    expect(spacing.satisfied).toBe(true);
    // The target reads the same solve the design reports: equal to rounding.
    expect(Math.abs(spacing.achieved! - fromStates), mismatch('best design e1-e2 (meV)', spacing.achieved!, fromStates, 1e-9)).toBeLessThanOrEqual(1e-9);
    expect(fromStates, mismatch('e1-e2 vs 3 kT at 300 K (meV), lower limit', fromStates, THREE_KT_300_MEV, 0)).toBeGreaterThanOrEqual(THREE_KT_300_MEV);

    for (const v of best.variables) {
      expect(Math.abs(v.ml - Math.round(v.ml)), mismatch(`${v.name} in ML`, v.ml, Math.round(v.ml), 1e-9)).toBeLessThanOrEqual(1e-9);
      // Relative tolerance: the resolved monolayer carries the thermal expansion the material tables give at 300 K.
      const perMl = v.nm / v.ml;
      expect(Math.abs(perMl - GAAS_ML_NM), mismatch(`${v.name} nm per ML`, perMl, GAAS_ML_NM, 1e-5)).toBeLessThanOrEqual(1e-5);
    }

    const solved = await cli(['solve', join(out, 'design-1.yaml'), '--json']);
    expect(solved.code, solved.stderr).toBe(0);
    const again = JSON.parse(solved.stdout) as { bands: { electron: { states: JsonState[] } } };
    const reproduced = (energy(again.bands.electron.states, 'e2') - energy(again.bands.electron.states, 'e1')) * 1000;
    expect(reproduced, mismatch('solve on design-1.yaml, e1-e2 (meV), exact', reproduced, fromStates, 0)).toBe(fromStates);
  }, 60_000);

  it('refuses --robust on a wire spec as bad input (exit 2)', async () => {
    const o = await cli(['design', 'runs/wire-spacing.yaml', '--robust', '--workers', '1']);
    expect(o.code, o.stderr).toBe(2);
    expect(o.stderr).toMatch(/--robust/);
  });
});
