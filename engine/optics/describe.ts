/** The human summary of an optics result for `wellsmith solve` (the spectra themselves are in --json and the report). */
import { fixed, inUnit, table, withUnit } from '../text.js';
import { HC_EV_NM } from '../constants.js';
import type { OpticsResult } from './optics.js';

/** Density in cm⁻² with its 3-D value over the well thickness. */
const density = (n: number, well_nm: number): string => (Number.isFinite(n) ? `${withUnit(n, 'cm⁻²')} (${withUnit(n / (well_nm * 1e-7), 'cm⁻³')})` : 'not reached by the bound subbands');

export function describeOptics(o: OpticsResult): string {
  const m = o.model;
  const rows = o.spectra.map((s) => [
    inUnit(s.electrons_cm2, 'cm⁻²'), inUnit(s.holes_cm2, 'cm⁻²'), inUnit(s.separation_eV, 'eV'), fixed(s.peak_te.gain_per_cm, 0), fixed(s.peak_te.wavelength_nm, 2),
    fixed(s.peak_tm.gain_per_cm, 0), fixed(s.peak_tm.wavelength_nm, 2), inUnit(s.differential_gain_te_cm2, 'cm²'), fixed(s.radiative_current_A_per_cm2, 1),
  ]);
  const fit = o.gain_curve.fit_te;
  const edge = o.band_edge_eV;
  const j = o.photon_eV.findIndex((e) => e >= edge + 0.02);
  return [
    `Optical spectra at ${o.temperature_K} K: ${m.gain_reference}. Valence: ${m.valence}; conduction: ${m.conduction}; lineshape ${m.lineshape.kind}, τ_in ${m.lineshape.intraband_time_ps} ps (Γ ${fixed(m.lineshape.gamma_meV, 2)} meV; ${m.lineshape.source}); n_r ${fixed(m.refractive_index.value, 3)} (${m.refractive_index.source}); Ep: ${m.kane_energy}; band-gap renormalisation ${m.band_gap_renormalisation}.`,
    table(['n cm⁻²', 'p cm⁻²', 'ΔF eV', 'TE peak cm⁻¹', 'at nm', 'TM peak cm⁻¹', 'at nm', 'dg/dN cm²', 'J_rad A/cm²'], rows),
    `Transparency (peak gain 0, n = p): TE ${density(o.transparency_te_cm2, o.well.thickness_nm)}; TM ${density(o.transparency_tm_cm2, o.well.thickness_nm)}.`,
    fit ? `Gain–density fit of the TE peak: g = ${fixed(fit.g0_per_cm, 0)} cm⁻¹ · ln(N/N_tr), N_tr = ${density(fit.transparency_cm2, o.well.thickness_nm)}, over ${inUnit(fit.from_cm2, 'cm⁻²')}–${withUnit(fit.to_cm2, 'cm⁻²')}, rms ${fixed(fit.rms_per_cm, 0)} cm⁻¹.` : 'Gain–density fit: fewer than two densities with gain.',
    j >= 0 ? `Unpumped absorption 20 meV above the band-edge line (${fixed(HC_EV_NM / o.photon_eV[j]!, 2)} nm): TE ${fixed(o.absorption_te_per_cm[j], 0)} cm⁻¹, TM ${fixed(o.absorption_tm_per_cm[j], 0)} cm⁻¹.` : '',
    `${o.note}. The spectra are in --json (optics) and in the report.`,
  ].filter((l) => l !== '').join('\n');
}
