/**
 * Benchmarks of issue 15's doped structures, in the entry shape of entries.ts: the self-consistent
 * Schrödinger–Poisson solve of a 5-layer modulation-doped well (the acceptance: under 20 ms), and
 * the absorption spectrum of a doped detector well that a design on absorption targets adds per
 * candidate. Each returns the numbers it computed, so a NaN fails the run.
 */
import { DEFAULT_SELF_CONSISTENT, selfConsistent } from '../../engine/poisson/selfconsistent.js';
import { DEFAULT_ABSORPTION, intersubbandAbsorption } from '../../engine/poisson/absorption.js';
import { potentialProfile } from '../../engine/poisson/subbands.js';
import { detectorCase, modulationCase } from '../reference/poisson/structures.js';
import type { BenchEntry } from './harness.js';

export const POISSON_ENTRIES: readonly BenchEntry[] = [
  {
    name: 'self-consistent solve: 5-layer modulation-doped GaAs/Al0.3Ga0.7As well, 1e12 cm⁻², 77 K (e1, e2, E_F)',
    target: { text: '< 20 ms', met: (r) => r.median_ms < 20 },
    prepare: () => {
      const c = modulationCase(77, 1e12);
      return {
        run: (): number[] => {
          const r = selfConsistent(c.structure, c.doping, DEFAULT_SELF_CONSISTENT);
          if (r.status !== 'converged') throw new Error(`bench: the self-consistent solve ended ${r.status}`);
          return [...r.subbands.map((s) => s.energy_eV), r.cells[0]!.fermi_eV, r.iterations];
        },
      };
    },
  },
  {
    name: 'intersubband absorption: 4.5 nm detector well, 1e18 cm⁻³, 77 K, 200 nm continuum (peak, FWHM)',
    prepare: () => {
      const c = detectorCase();
      const sc = selfConsistent(c.structure, c.doping, DEFAULT_SELF_CONSISTENT);
      const input = { profile: potentialProfile(c.structure, sc.mesh, sc.potential, 'electron', 1, true), mesh: sc.mesh, temperature_K: 77, cellOfNode: sc.cellOfNode, fermi: sc.cells.map((x) => x.fermi_eV) };
      return {
        run: (): number[] => {
          const a = intersubbandAbsorption(input, DEFAULT_ABSORPTION);
          return [a.peak_eV, a.fwhm_meV, a.peak_absorption];
        },
      };
    },
  },
];
