/**
 * The report's optics section: material-gain spectra at each density (TE solid, TM dashed, with the
 * unpumped well's absorption as negative gain), the peak gain against density with its logarithmic
 * fit, the spontaneous-emission spectra, and the table of figures per density.
 */
import type { TopLevelSpec } from 'vega-lite';
import { fixed, inUnit, withUnit } from '../text.js';
import { HC_EV_NM } from '../constants.js';
import type { OpticsResult } from '../optics/optics.js';
import { figureHtml, htmlTable, type Section } from './html.js';
import { PALETTE } from './palette.js';
import { renderSvg } from './render.js';

/** One colour per density, in order (the palette without straw, which is for windows). */
const SERIES_COLOURS = [PALETTE.indigo, PALETTE.amber, PALETTE.rose, PALETTE.sky, PALETTE.ink];

const densityLabel = (n: number, p: number): string => (n === p ? withUnit(n, 'cm⁻²') : `n ${inUnit(n, 'cm⁻²')}, p ${withUnit(p, 'cm⁻²')}`);

/** Gain spectra (cm⁻¹) against wavelength (nm): one colour per density, TE solid, TM dashed; the unpumped absorption as −α in ink. */
export function gainSpectraSpec(o: OpticsResult): TopLevelSpec {
  const rows: { nm: number; g: number; series: string; pol: string }[] = [];
  const labels = o.spectra.map((s) => densityLabel(s.electrons_cm2, s.holes_cm2));
  o.spectra.forEach((s, i) => o.photon_eV.forEach((e, j) => {
    rows.push({ nm: HC_EV_NM / e, g: s.gain_te_per_cm[j]!, series: labels[i]!, pol: 'TE' });
    rows.push({ nm: HC_EV_NM / e, g: s.gain_tm_per_cm[j]!, series: labels[i]!, pol: 'TM' });
  }));
  o.photon_eV.forEach((e, j) => {
    rows.push({ nm: HC_EV_NM / e, g: -o.absorption_te_per_cm[j]!, series: 'unpumped (−α)', pol: 'TE' });
    rows.push({ nm: HC_EV_NM / e, g: -o.absorption_tm_per_cm[j]!, series: 'unpumped (−α)', pol: 'TM' });
  });
  const domain = [...labels, 'unpumped (−α)'];
  const range = [...labels.map((_, i) => SERIES_COLOURS[i % SERIES_COLOURS.length]!), PALETTE.ink];
  // The axis shows gain and the top of the absorption; deep absorption is clipped.
  const top = Math.max(100, ...o.spectra.flatMap((s) => [s.peak_te.gain_per_cm, s.peak_tm.gain_per_cm]));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 620, height: 320,
    data: { values: rows },
    mark: { type: 'line', strokeWidth: 1.6, clip: true },
    encoding: {
      x: { field: 'nm', type: 'quantitative', title: 'wavelength (nm)', scale: { zero: false, nice: false } },
      y: { field: 'g', type: 'quantitative', title: 'material gain (cm⁻¹)', scale: { domain: [-1.5 * top, 1.15 * top] } },
      color: { field: 'series', type: 'nominal', title: 'density (n = p)', scale: { domain, range } },
      strokeDash: { field: 'pol', type: 'nominal', title: 'polarisation', scale: { domain: ['TE', 'TM'], range: [[1, 0], [6, 3]] } },
      detail: { field: 'pol' },
    },
  } as TopLevelSpec;
}

/** Peak gain (cm⁻¹) against sheet density (log axis), TE and TM, with the fitted g0 ln(N/N_tr) of the TE peak. */
export function gainCurveSpec(o: OpticsResult): TopLevelSpec {
  const c = o.gain_curve;
  const rows = c.densities_cm2.flatMap((n, i) => [{ n, g: c.peak_te_per_cm[i]!, series: 'TE peak' }, { n, g: c.peak_tm_per_cm[i]!, series: 'TM peak' }]);
  const fit = c.fit_te;
  if (fit) for (const n of c.densities_cm2) rows.push({ n, g: fit.g0_per_cm * Math.log(n / fit.transparency_cm2), series: 'fit g0 ln(N/N_tr)' });
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 420, height: 280,
    data: { values: rows },
    mark: { type: 'line', point: true, strokeWidth: 1.6 },
    encoding: {
      x: { field: 'n', type: 'quantitative', title: 'sheet density n = p (cm⁻²)', scale: { type: 'log' } },
      y: { field: 'g', type: 'quantitative', title: 'peak material gain (cm⁻¹)' },
      color: { field: 'series', type: 'nominal', title: null, scale: { domain: ['TE peak', 'TM peak', 'fit g0 ln(N/N_tr)'], range: [PALETTE.indigo, PALETTE.rose, PALETTE.sky] } },
    },
  } as TopLevelSpec;
}

/** Spontaneous emission per unit area (in units of a power of ten of cm⁻² s⁻¹ eV⁻¹) against wavelength, one colour per density. */
export function spontaneousSpec(o: OpticsResult): TopLevelSpec {
  const labels = o.spectra.map((s) => densityLabel(s.electrons_cm2, s.holes_cm2));
  const top = Math.max(...o.spectra.flatMap((s) => Array.from(s.spontaneous_per_cm2_s_eV)));
  const decade = top > 0 ? Math.floor(Math.log10(top)) : 0;
  const rows = o.spectra.flatMap((s, i) => Array.from(o.photon_eV, (e, j) => ({ nm: HC_EV_NM / e, r: s.spontaneous_per_cm2_s_eV[j]! / 10 ** decade, series: labels[i]! })));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 420, height: 280,
    data: { values: rows },
    mark: { type: 'line', strokeWidth: 1.6 },
    encoding: {
      x: { field: 'nm', type: 'quantitative', title: 'wavelength (nm)', scale: { zero: false, nice: false } },
      y: { field: 'r', type: 'quantitative', title: `spontaneous emission (1e${decade} cm⁻² s⁻¹ eV⁻¹)` },
      color: { field: 'series', type: 'nominal', title: 'density', scale: { domain: labels, range: labels.map((_, i) => SERIES_COLOURS[i % SERIES_COLOURS.length]!) } },
    },
  } as TopLevelSpec;
}

/** The optics section of a solve's report. */
export async function opticsSection(o: OpticsResult, id = 'optics'): Promise<Section> {
  const m = o.model;
  const rows = o.spectra.map((s) => [densityLabel(s.electrons_cm2, s.holes_cm2), inUnit(s.separation_eV, 'eV'), fixed(s.peak_te.gain_per_cm, 0), fixed(s.peak_te.wavelength_nm, 2),
    fixed(s.peak_tm.gain_per_cm, 0), fixed(s.peak_tm.wavelength_nm, 2), inUnit(s.differential_gain_te_cm2, 'cm²'), fixed(s.radiative_current_A_per_cm2, 1)]);
  const fit = o.gain_curve.fit_te;
  const per3d = (n: number): string => (Number.isFinite(n) ? `${withUnit(n, 'cm⁻²')} (${withUnit(n / (o.well.thickness_nm * 1e-7), 'cm⁻³')})` : 'not reached');
  return {
    id, title: 'Optical gain and emission',
    lead: `${m.gain_reference[0]!.toUpperCase()}${m.gain_reference.slice(1)}, at ${o.temperature_K} K. Valence: ${m.valence}; conduction: ${m.conduction}. Lineshape ${m.lineshape.kind} (${m.lineshape.source}), τ_in = ${m.lineshape.intraband_time_ps} ps; refractive index ${fixed(m.refractive_index.value, 3)} (${m.refractive_index.source}); Kane energy: ${m.kane_energy}; band-gap renormalisation ${m.band_gap_renormalisation}. Transparency (peak gain 0): TE ${per3d(o.transparency_te_cm2)}, TM ${per3d(o.transparency_tm_cm2)}.${fit ? ` Fit of the TE peak: g = ${fixed(fit.g0_per_cm, 0)} cm⁻¹ · ln(N/N_tr), N_tr = ${per3d(fit.transparency_cm2)}, rms ${fixed(fit.rms_per_cm, 0)} cm⁻¹.` : ''} ${o.note}.`,
    html: [
      figureHtml(await renderSvg(gainSpectraSpec(o)), 'Material gain versus wavelength at each density: TE solid, TM dashed; the unpumped well\'s absorption drawn as negative gain (ink).'),
      figureHtml(await renderSvg(gainCurveSpec(o)), 'Peak material gain versus sheet density (n = p), with the logarithmic fit of the TE peak.'),
      figureHtml(await renderSvg(spontaneousSpec(o)), 'Spontaneous emission per unit area of the well, both polarisations and all directions.'),
      htmlTable(['density', 'ΔF (eV)', 'TE peak (cm⁻¹)', 'at (nm)', 'TM peak (cm⁻¹)', 'at (nm)', 'dg/dN (cm²)', 'J_rad (A/cm²)'], rows, [1, 2, 3, 4, 5, 6, 7]),
    ].join('\n'),
  };
}
