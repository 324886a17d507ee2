/**
 * Report sections of a doped stack's solve: the self-consistent band profile with the Fermi level
 * (and each well's quasi-Fermi level under bias) and the subbands' sheet densities; the
 * intersubband absorption spectrum with its peak, width and lines; and, for a bias sweep, one row
 * per bias. The band diagram, states and transitions sections of an ordinary solve already show the
 * folded structure (its band edges include the electrostatic potential).
 */
import type { TopLevelSpec } from 'vega-lite';
import type { DopedSpecResult } from '../poisson/doped.js';
import { fixed, inUnit, sig, withUnit } from '../text.js';
import { figureHtml, htmlTable, type Section } from './html.js';
import { PALETTE } from './palette.js';
import { HC_EV_NM } from '../constants.js';
import { renderSvg } from './render.js';

/** Points kept per curve: finer than a screen pixel at the default width. */
const MAX_POINTS = 600;

const thin = <T>(points: readonly T[]): T[] => {
  const stride = Math.max(1, Math.ceil(points.length / MAX_POINTS));
  return points.filter((_, i) => i % stride === 0 || i === points.length - 1);
};

/** The majority band's edge along z with the Fermi level(s) over their cells and the subbands as dotted levels. */
export function profileSpec(r: DopedSpecResult): TopLevelSpec {
  const p = r.selfConsistent.profile;
  const band = thin(p.z_nm.map((z, i) => ({ z, E: p.band_eV[i]! })));
  const fermi = r.selfConsistent.cells.flatMap((c, k) => [{ z: c.from_nm, E: c.fermi_eV, cell: k }, { z: c.to_nm, E: c.fermi_eV, cell: k }]);
  const levels = r.selfConsistent.subbands.flatMap((s) => [{ z: 0, E: s.energy_eV, label: s.label }, { z: r.structure.total_nm, E: s.energy_eV, label: s.label }]);
  const x = { field: 'z', type: 'quantitative' as const, title: 'z (nm)', scale: { domain: [0, r.structure.total_nm], nice: false } };
  const y = { field: 'E', type: 'quantitative' as const, title: 'energy (eV)', scale: { zero: false } };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 720,
    height: 360,
    layer: [
      { data: { values: levels }, mark: { type: 'line', strokeDash: [2, 3], color: PALETTE.ink, strokeWidth: 1 }, encoding: { x, y, detail: { field: 'label' } } },
      { data: { values: band }, mark: { type: 'line', color: PALETTE.indigo, strokeWidth: 2 }, encoding: { x, y } },
      { data: { values: fermi }, mark: { type: 'line', color: PALETTE.amber, strokeWidth: 2, strokeDash: [6, 3] }, encoding: { x, y, detail: { field: 'cell' } } },
    ],
  };
}

/** The absorption per pass (%) against wavelength (µm). */
export function absorptionSpec(r: DopedSpecResult): TopLevelSpec | null {
  const a = r.absorption;
  if (!a || a.status !== 'ok') return null;
  const { energy_eV, absorption } = a.spectrum;
  const values = thin(Array.from(energy_eV, (E, i) => ({ um: HC_EV_NM / E / 1000, A: absorption[i]! * 100 })));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 720,
    height: 300,
    layer: [
      { data: { values }, mark: { type: 'line', color: PALETTE.indigo, strokeWidth: 2 }, encoding: { x: { field: 'um', type: 'quantitative', title: 'wavelength (µm)', scale: { zero: false } }, y: { field: 'A', type: 'quantitative', title: 'absorption per pass (%)' } } },
      { data: { values: [{ um: a.peak_um }] }, mark: { type: 'rule', color: PALETTE.sky, strokeDash: [4, 3] }, encoding: { x: { field: 'um', type: 'quantitative' } } },
    ],
  };
}

const GEOMETRY: Readonly<Record<string, string>> = { '45deg': 'p-polarised light at 45° inside the stack (polished facet)', brewster: 'p-polarised light from air at Brewster\'s angle', 'normal-z': 'a field along z, once across the layers' };

/** The doped solve's sections (see the module comment). */
export async function dopingSections(r: DopedSpecResult): Promise<Section[]> {
  const sc = r.selfConsistent;
  const cells = sc.cells.length > 1 ? ` Under the bias each well is neutral with its own quasi-Fermi level (${sc.cells.map((c) => fixed(c.fermi_eV, 4)).join(', ')} eV).` : ` Fermi level ${fixed(sc.fermi_eV, 5)} eV.`;
  const sections: Section[] = [{
    id: 'self-consistent',
    title: 'Self-consistent potential',
    lead: `Schrödinger–Poisson (Hartree), ${sc.carriers}: ${sc.status} in ${sc.iterations} iterations, last change of the potential ${sig(sc.residual_eV, 2)} eV (tolerance ${sig(sc.tolerance_eV, 2)} eV; Anderson mixing β = ${sc.mixing} over the predictor–corrector step; mesh ${sc.mesh_nm} nm). Boundary conditions: ${sc.boundary}. Bias ${inUnit(r.bias.voltage_V, '')} V (${fixed(r.bias.field_kV_per_cm, 2)} kV/cm).${cells} Donors ${withUnit(sc.doping.donors_cm2, 'cm⁻²')}, acceptors ${withUnit(sc.doping.acceptors_cm2, 'cm⁻²')}, neutral to ${sig(sc.neutrality, 2)}.`,
    html: `${figureHtml(await renderSvg(profileSpec(r)), 'The majority band\'s edge with the electrostatic potential and the bias (solid), the Fermi level over each neutral cell (dashed) and the subband edges (dotted), eV on the absolute scale, versus z (nm).')}\n${htmlTable(['subband', 'energy (eV)', 'm∥ (m0)', 'sheet density (cm⁻²)'], [...sc.subbands.map((s) => [s.label, inUnit(s.energy_eV, 'eV'), inUnit(s.mass_inplane, 'm0'), inUnit(s.density_cm2, 'cm⁻²')]), ['continuum (3-D gas)', '–', '–', inUnit(sc.gas_cm2, 'cm⁻²')]], [1, 2, 3])}`,
  }];
  const a = r.absorption;
  const spec = absorptionSpec(r);
  if (a && spec) {
    const o = a.options;
    sections.push({
      id: 'absorption',
      title: 'Intersubband absorption',
      lead: `Peak ${fixed(a.peak_eV * 1000, 2)} meV (${fixed(a.peak_um, 3)} µm), ${fixed(a.peak_absorption * 100, 3)} % per pass for ${GEOMETRY[o.coupling]} (n = ${o.refractiveIndex}), FWHM ${fixed(a.fwhm_meV, 1)} meV (${fixed(a.fwhm_um, 3)} µm). Lorentzian lines of ${fixed(o.linewidth_eV * 1000, 1)} meV, ${o.depolarisation ? 'each shifted by its depolarisation field (Ando, Fowler & Stern 1982; Allen, Tsui & Vinter 1976)' : 'without depolarisation'}; continuum discretised by ${o.continuum_nm} nm of barrier on each side (${a.continuumStates} states up to ${fixed(o.range_eV * 1000, 0)} meV above the barrier edge).`,
      html: `${figureHtml(await renderSvg(spec), 'Absorption per pass (%) versus wavelength (µm); the dashed line marks the peak.')}\n${htmlTable(['line', 'E (meV)', 'depolarised (meV)', 'z (nm)', 'n_i − n_j (cm⁻²)', 'peak (%)'], a.lines.slice(0, 12).map((l) => [l.label, inUnit(l.energy_eV * 1000, 'meV'), inUnit(l.shifted_eV * 1000, 'meV'), fixed(l.dipole_nm, 4), inUnit(l.population_cm2, 'cm⁻²'), inUnit(l.strength * 100, '%')]), [1, 2, 3, 4, 5])}`,
    });
  } else if (a) {
    sections.push({ id: 'absorption', title: 'Intersubband absorption', lead: 'No bound subband holds carriers: no absorption line.', html: '' });
  }
  if (r.sweep) {
    sections.push({
      id: 'bias',
      title: 'Bias sweep',
      lead: 'One self-consistent solve per bias: the first subbands, the (first cell\'s) Fermi level and the absorption peak.',
      html: htmlTable(['bias (V)', 'field (kV/cm)', 'status', 'iterations', 'E_F (eV)', 'states (eV)', 'peak (µm)', 'FWHM (meV)'], r.sweep.map((b) => [
        fixed(b.bias.voltage_V, 3), fixed(b.bias.field_kV_per_cm, 1), b.status, String(b.selfConsistent.iterations), fixed(b.selfConsistent.fermi_eV, 4),
        b.states.filter((s) => s.label.startsWith('e')).slice(0, 3).map((s) => `${s.label} ${fixed(s.energy_eV, 4)}${s.bound ? '' : ` (Γ ${fixed(s.width_meV, 1)} meV)`}`).join(', '),
        b.absorption && b.absorption.status === 'ok' ? fixed(b.absorption.peak_um, 3) : '–', b.absorption && b.absorption.status === 'ok' ? fixed(b.absorption.fwhm_meV, 1) : '–',
      ]), [0, 1, 3, 4, 6, 7]),
    });
  }
  return sections;
}
