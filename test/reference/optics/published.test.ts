/**
 * Published comparisons (issue 14 acceptance, second line).
 *
 * Gain of an 8 nm In0.2Ga0.8As/GaAs well at 300 K: L. A. Coldren and S. W. Corzine, Diode Lasers
 * and Photonic Integrated Circuits (Wiley 1995), Ch. 4, tabulate the calculated peak gain of this
 * well as the three-parameter fit g = g0 ln((N + Ns)/(Ntr + Ns)) with g0 = 2100 cm⁻¹,
 * Ntr = 1.8 × 10¹⁸ cm⁻³, Ns = −0.4 × 10¹⁸ cm⁻³ (from memory, not seen: hence the generous window),
 * from a calculation with a Lorentzian of τ_in = 0.1 ps. Here: the 4×4 k·p subbands with the same
 * lineshape; the peak gain at 2.5–6 × 10¹⁸ cm⁻³ must lie within 20 % (or 150 cm⁻¹) of that fit, and
 * the transparency density within the 1–2.5 × 10¹⁸ cm⁻³ the literature gives for compressively
 * strained InGaAs/GaAs wells (Coldren and Corzine's 1.8 × 10¹⁸; common practice for such wells:
 * 1–2 × 10¹⁸ cm⁻³, from memory). The radiative current at transparency is compared with their
 * transparency current of about 50 A/cm² per well (from memory) within a factor 1.6.
 *
 * Refractive index: Adachi's 1982 model (engine/optics/refractive.ts) for GaAs at 1.40 eV against
 * the independent modified single-oscillator model of M. A. Afromowitz, Solid State Commun. 15, 59
 * (1974) (E0 = 3.65 eV, Ed = 36.1 eV for GaAs, with its gap term; from memory), and both against
 * the measured n ≈ 3.6 of GaAs just below its gap (D. T. F. Marple, J. Appl. Phys. 35, 1241 (1964),
 * from memory).
 */
import { describe, expect, it } from 'vitest';
import { opticsOfSolve } from '../../../engine/optics/optics.js';
import { opticsSettings } from '../../../engine/optics/schema.js';
import { adachiIndex, ADACHI_AB } from '../../../engine/optics/refractive.js';
import { expectClose } from '../../observables/close.js';
import { solvedStack } from '../../optics/helpers.js';

const L_CM = 8e-7;
const coldrenCorzine = (N: number): number => 2100 * Math.log((N - 0.4e18) / (1.8e18 - 0.4e18));

describe('8 nm In0.2Ga0.8As/GaAs well against Coldren and Corzine', () => {
  const r = solvedStack([['GaAs', 30], ['In0.2Ga0.8As', 8], ['GaAs', 30]]);
  const densities = [2.5e18, 3e18, 4e18, 5e18, 6e18];
  const o = opticsOfSolve(r, opticsSettings({ lineshape: 'lorentzian' }), densities.map((N) => ({ electrons_cm2: N * L_CM, holes_cm2: N * L_CM })))!;

  it('peak TE gain within 20 % (or 150 cm⁻¹) of their fit at 2.5–6 × 10¹⁸ cm⁻³', () => {
    const rows = densities.map((N, i) => {
      const got = o.spectra[i]!.peak_te.gain_per_cm;
      const want = coldrenCorzine(N);
      expectClose(got, want, { abs: Math.max(0.2 * want, 150) }, `peak gain at ${N.toExponential(1)} cm⁻³`);
      return `${(N / 1e18).toFixed(1)}e18: ${got.toFixed(0)} (fit ${want.toFixed(0)}) at ${o.spectra[i]!.peak_te.wavelength_nm.toFixed(1)} nm`;
    });
    const fit = o.gain_curve.fit_te!;
    console.log(`peak TE gain: ${rows.join('; ')}; our g0 ln(N/Ntr): g0 ${fit.g0_per_cm.toFixed(0)} cm⁻¹, Ntr ${(fit.transparency_cm2 / L_CM).toExponential(3)} cm⁻³`);
  });

  it('transparency density within 1–2.5 × 10¹⁸ cm⁻³, radiative current there near their 50 A/cm²', () => {
    const N = o.transparency_te_cm2 / L_CM;
    const at = opticsOfSolve(r, opticsSettings({ lineshape: 'lorentzian' }), [{ electrons_cm2: o.transparency_te_cm2, holes_cm2: o.transparency_te_cm2 }])!;
    const J = at.spectra[0]!.radiative_current_A_per_cm2;
    console.log(`transparency ${o.transparency_te_cm2.toExponential(3)} cm⁻² = ${N.toExponential(3)} cm⁻³; radiative current there ${J.toFixed(1)} A/cm²; peak gain there ${at.spectra[0]!.peak_te.gain_per_cm.toFixed(2)} cm⁻¹`);
    expect(N).toBeGreaterThan(1e18);
    expect(N).toBeLessThan(2.5e18);
    expectClose(at.spectra[0]!.peak_te.gain_per_cm, 0, { abs: 0.5 }, 'peak gain at the transparency density');
    expect(J).toBeGreaterThan(50 / 1.6);
    expect(J).toBeLessThan(50 * 1.6);
  });
});

/** Afromowitz's modified single oscillator for Al_xGa_{1−x}As below the gap (x = 0 here). */
function afromowitz(E: number, Eg: number): number {
  const E0 = 3.65;
  const Ed = 36.1;
  const eta = (Math.PI * Ed) / (2 * E0 ** 3 * (E0 ** 2 - Eg ** 2));
  const eps = 1 + Ed / E0 + (Ed * E ** 2) / E0 ** 3 + (eta / Math.PI) * E ** 4 * Math.log((2 * E0 ** 2 - Eg ** 2 - E ** 2) / (Eg ** 2 - E ** 2));
  return Math.sqrt(eps);
}

describe('refractive index of GaAs near its gap', () => {
  it('Adachi (1982) and Afromowitz (1974) agree within 1 % at 1.40 eV, both within 2 % of the measured 3.6', () => {
    const adachi = adachiIndex({ ...ADACHI_AB.GaAs!, E0: 1.424, Dso: 0.341, photon_eV: 1.4 });
    const afro = afromowitz(1.4, 1.424);
    console.log(`n(GaAs, 1.40 eV): Adachi ${adachi.toFixed(4)}, Afromowitz ${afro.toFixed(4)}`);
    expectClose(adachi, afro, { rel: 0.01 }, 'Adachi vs Afromowitz');
    expectClose(adachi, 3.6, { rel: 0.02 }, 'Adachi vs measured');
  });
});
