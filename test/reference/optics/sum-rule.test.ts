/**
 * Sum rule (issue 14 acceptance): the integrated absorption of the unpumped well matches the
 * oscillator-strength sum of its interband transitions within 5 %.
 *
 * For light of unit-area lineshape, ∫ α(ħω) ħω d(ħω) over a window equals (π e² ħ/(n_r c ε0 m0 L_w))
 * times the oscillator strengths f = 2|ê·p|²/(m0 E) of the transitions inside it, each weighted by
 * E/2 (common practice: ∫σ dω = π e² f/(2 ε0 m0 c n_r) per oscillator; F. Wooten, Optical
 * Properties of Solids, Academic Press 1972, Ch. 3, from memory). Per unit area, states of a pair
 * count ∫ d²k/(2π)² per valence branch, and |ê·p|² = (m0/6)·factor, so the sum is
 * Σ_pairs,branches ∫ du/(4π) factor(u) over the states whose transition energy lies in the window
 * (times GAIN_UNIT/(n_r L_w) in cm⁻¹ eV). Two checks:
 * - multiband (kp4) wells: the broadened (sech) absorption spectrum against that sum taken state by
 *   state over the k·p tables by the trapezoid rule, without the spectra's bins or lineshape;
 * - parabolic bands: against the solve's own transitions, Σ 2 (3/2 or 1/2)·Ep·overlap² ·
 *   m_r (E_top − E_nj)/(4π ħ²/2m0), the closed-form count of states of each 2-D pair.
 */
import { describe, it } from 'vitest';
import { HBAR2_OVER_2M0 } from '../../../engine/constants.js';
import { findTransition } from '../../../engine/solve.js';
import { opticalBands, type OpticalBands } from '../../../engine/optics/bands.js';
import { lineshape } from '../../../engine/optics/lineshape.js';
import { GAIN_UNIT, SpectrumEngine } from '../../../engine/optics/spectra.js';
import { expectClose } from '../../observables/close.js';
import { grid, solvedStack } from '../../optics/helpers.js';

const EP = 25;
const N_R = 3.6;

/** ∫ α ħω d(ħω) (cm⁻¹ eV) of the empty well over [lo, hi], from a sech-broadened spectrum (trapezoid on 1 meV). */
function integratedAbsorption(b: OpticalBands, lo: number, hi: number, which: 'te' | 'tm'): number {
  const ph = grid(lo - 0.06, hi + 0.06, Math.round((hi - lo + 0.12) / 0.0005) + 1);
  const e = new SpectrumEngine(b, { photon_eV: ph, lineshape: lineshape('sech', 0.1), refractiveIndex: N_R });
  const a = e.gainOn(e.binSums({ electron_eV: -Infinity, hole_eV: Infinity }), which).map((g) => -g);
  let s = 0;
  for (let j = 0; j + 1 < ph.length; j++) {
    const x0 = Math.max(ph[j]!, lo);
    const x1 = Math.min(ph[j + 1]!, hi);
    if (x1 > x0) s += 0.5 * (a[j]! * ph[j]! + a[j + 1]! * ph[j + 1]!) * (x1 - x0);
  }
  return s;
}

/** The oscillator-strength sum over the k·p tables: Σ ∫ du/(4π) factor over states with E_cv in [lo, hi] (trapezoid, cut at crossings). */
function stateSum(b: OpticalBands, lo: number, hi: number, which: 'te' | 'tm'): number {
  const k = b.k_per_nm;
  let s = 0;
  for (const d of b.directions) {
    for (const p of d.pairs) {
      for (let i = 0; i + 1 < k.length; i++) {
        // 20 sub-steps per interval, linear in u (as the tables are).
        for (let q = 0; q < 20; q++) {
          const t = (q + 0.5) / 20;
          const e = (1 - t) * (p.Ec[i]! - p.Ev[i]!) + t * (p.Ec[i + 1]! - p.Ev[i + 1]!);
          if (e < lo || e > hi) continue;
          const f = (1 - t) * p[which][i]! + t * p[which][i + 1]!;
          s += d.weight * f * ((k[i + 1]! ** 2 - k[i]! ** 2) / 20) / (4 * Math.PI);
        }
      }
    }
  }
  return (s * GAIN_UNIT) / (N_R * b.well_nm);
}

describe('integrated absorption = oscillator-strength sum', () => {
  it.each([
    ['GaAs/Al0.3Ga0.7As 8 nm', [['Al0.3Ga0.7As', 30], ['GaAs', 8], ['Al0.3Ga0.7As', 30]]],
    ['In0.2Ga0.8As/GaAs 8 nm', [['GaAs', 30], ['In0.2Ga0.8As', 8], ['GaAs', 30]]],
  ] as const)('kp4, %s: the sech-broadened spectrum integrates to the state-by-state sum within 5 % (TE and TM)', (name, layers) => {
    const r = solvedStack(layers);
    const b = opticalBands(r, { kaneEnergy_eV: EP })!;
    const lo = b.edge_eV - 0.03;
    const hi = b.edge_eV + 0.25;
    for (const which of ['te', 'tm'] as const) {
      const got = integratedAbsorption(b, lo, hi, which);
      const want = stateSum(b, lo, hi, which);
      console.log(`${name} ${which.toUpperCase()}: ∫α ħω dE ${got.toFixed(1)} cm⁻¹ eV, oscillator sum ${want.toFixed(1)}, ratio ${(got / want).toFixed(4)}`);
      expectClose(got, want, { rel: 0.05 }, `${name} ${which}`);
    }
  });

  it('parabolic bands: the spectrum integrates to the oscillator strengths of the solve\'s transitions within 5 %', () => {
    const r = solvedStack([['Al0.3Ga0.7As', 30], ['GaAs', 8], ['Al0.3Ga0.7As', 30]], { solver: '{ valence: parabolic, nonparabolic: false }' });
    const b = opticalBands(r, { model: 'parabolic', kaneEnergy_eV: EP })!;
    const lo = b.edge_eV - 0.03;
    const hi = b.edge_eV + 0.25;
    for (const which of ['te', 'tm'] as const) {
      let want = 0;
      for (const e of r.bands.electron.states) {
        for (const [band, f] of [['heavy_hole', which === 'te' ? 1.5 : 0], ['light_hole', which === 'te' ? 0.5 : 2]] as const) {
          for (const h of r.bands[band].states) {
            const E = e.energy_eV - h.energy_eV;
            if (E >= hi) continue;
            const mr = 1 / (1 / e.mass_inplane + 1 / h.mass_inplane);
            want += 2 * f * EP * findTransition(r, `${e.label}-${h.label}`)!.overlap2 * mr * (hi - Math.max(E, lo)) / (4 * Math.PI * HBAR2_OVER_2M0);
          }
        }
      }
      want *= GAIN_UNIT / (N_R * b.well_nm);
      const got = integratedAbsorption(b, lo, hi, which);
      console.log(`parabolic ${which.toUpperCase()}: ∫α ħω dE ${got.toFixed(1)} cm⁻¹ eV, Σ f of the solve's transitions ${want.toFixed(1)}, ratio ${(got / want).toFixed(4)}`);
      expectClose(got, want, { rel: 0.05 }, `parabolic ${which}`);
    }
  });
});
