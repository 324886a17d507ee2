/**
 * Benchmarks of the optical spectra (issue 14), in the entry shape of entries.ts: one gain spectrum
 * (200 photon energies, 3 densities) once the subbands are known — the issue's < 30 ms — and the
 * cost of one candidate of a gain-peak search (solve, valence subbands on the search grid, peak).
 */
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { opticalBands, type OpticalBands } from '../../engine/optics/bands.js';
import { gainPeak } from '../../engine/optics/figures.js';
import { lineshape } from '../../engine/optics/lineshape.js';
import { opticsContext } from '../../engine/optics/optics.js';
import { opticsSettings } from '../../engine/optics/schema.js';
import { SpectrumEngine } from '../../engine/optics/spectra.js';
import { settingsOf, solveStructure } from '../../engine/solve.js';
import { loadSpecFile, parseSpecText } from '../../engine/input/load.js';
import { buildStructure, nominalVariables } from '../../engine/structure.js';
import { SEARCH_BANDS, SEARCH_PHOTON_POINTS } from '../../objectives/gain-common.js';
import { HEAVY_POLICY, type BenchEntry } from './harness.js';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));

/** A 7 nm In0.2Ga0.8As well between 20 nm GaAs barriers on GaAs at 300 K (the valence tests' pump well). */
const PUMP_WELL = `
title: optics benchmark well
substrate: GaAs
temperature: 300 K
stack:
  - { material: GaAs, thickness: 20 nm }
  - { material: In0.2Ga0.8As, thickness: 7 nm }
  - { material: GaAs, thickness: 20 nm }
`;

/** The optical bands of a spec text at its nominal values (full valence model), built outside the timing. */
function bandsOf(text: string, name: string): OpticalBands {
  const spec = parseSpecText(text, name).spec;
  return opticalBands(solveStructure(buildStructure(spec, nominalVariables(spec)), settingsOf(spec)))!;
}

/** Spectra at 1, 2, 3 × 10¹² cm⁻² on 200 photon energies from 50 meV below the band edge: engine, Fermi levels, TE, TM, spontaneous emission. */
function spectra(b: OpticalBands): number[] {
  const photon = Float64Array.from({ length: 200 }, (_, i) => b.edge_eV - 0.05 + (0.3 * i) / 199);
  const engine = new SpectrumEngine(b, { photon_eV: photon, lineshape: lineshape('sech', 0.1), refractiveIndex: 3.6 });
  return [1e12, 2e12, 3e12].flatMap((n) => {
    const s = engine.at({ electrons_cm2: n, holes_cm2: n });
    return [s.gain_te_per_cm[100]!, s.gain_tm_per_cm[100]!, s.spontaneous_per_cm2_s_eV[100]!, s.radiativeCurrent_A_per_cm2];
  });
}

export const OPTICS_ENTRIES: readonly BenchEntry[] = [
  {
    name: 'optics: gain spectrum of a 7 nm In0.2Ga0.8As/GaAs well, 200 photon energies x 3 densities (TE, TM, spontaneous), subbands known',
    target: { text: '< 30 ms', met: (r) => r.median_ms < 30 },
    prepare: () => {
      const b = bandsOf(PUMP_WELL, 'bench:optics-well');
      return { run: () => spectra(b) };
    },
  },
  {
    name: 'optics: the same for the SCH pump stack of runs/pump-976.yaml (7 electron, 8 hole subbands)',
    prepare: () => {
      const { spec } = loadSpecFile(join(ROOT, 'runs/pump-976.yaml'));
      const b = opticalBands(solveStructure(buildStructure(spec, nominalVariables(spec)), settingsOf(spec)))!;
      return { run: () => spectra(b) };
    },
  },
  {
    name: 'optics: one gain-peak search candidate of runs/pump-976.yaml (solve, search valence grid, TE peak at 3e12 cm-2)',
    prepare: () => {
      const { spec } = loadSpecFile(join(ROOT, 'runs/pump-976.yaml'));
      const structure = buildStructure(spec, nominalVariables(spec));
      const settings = settingsOf(spec);
      return {
        policy: HEAVY_POLICY,
        run: () => {
          const r = solveStructure(structure, settings);
          const ctx = opticsContext(r, opticsSettings(undefined), SEARCH_BANDS, SEARCH_PHOTON_POINTS)!;
          const p = gainPeak(ctx.engine, ctx.engine.binSums(ctx.engine.levels({ electrons_cm2: 3e12, holes_cm2: 3e12 })), 'te');
          return [p.wavelength_nm, p.gain_per_cm];
        },
      };
    },
  },
];
