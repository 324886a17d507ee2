/**
 * Vega-Lite specs of the report's plots, built from a solve result: the band diagram with each
 * state's |ψ|² drawn at its energy, and the 2-D density of states with its bulk envelope.
 * Energies eV on the absolute scale of the parameter set, z in nm.
 */
import type { TopLevelSpec } from 'vega-lite';
import { buildBandProfile, type BandName } from '../profile.js';
import { BANDS, type SolveResult } from '../solve.js';
import { dos2d, dos3d } from '../observables/dos.js';
import { BAND_COLOURS, BAND_NAMES, PALETTE } from './palette.js';
import type { ValenceSummary } from '../valence/summary.js';

const SERIES = BANDS.map((b) => BAND_NAMES[b]);
const COLOURS = BANDS.map((b) => BAND_COLOURS[b]);
const colourScale = { domain: [...SERIES], range: [...COLOURS] };

/** Points kept per |ψ|² curve: finer than a screen pixel at the default width, and a small file. */
const MAX_CURVE_POINTS = 360;

interface Point { readonly z: number; readonly E: number; readonly series: string; readonly curve: string; readonly i: number }

/**
 * Band-edge polyline of one band: the solver's own profile (engine/profile.ts), so graded layers
 * appear as slopes and a field as a tilt, drawn with a vertical jump at each slice boundary.
 */
function edgePoints(r: SolveResult, band: BandName): Point[] {
  const p = buildBandProfile(r.structure, band, { maxSlice_nm: r.settings.slice_nm, nonparabolic: false });
  const out: Point[] = [];
  let z = 0;
  for (const s of p.slices) {
    const E = p.sign * s.V;
    out.push({ z, E, series: BAND_NAMES[band], curve: band, i: out.length });
    z += s.width_nm;
    out.push({ z, E, series: BAND_NAMES[band], curve: band, i: out.length });
  }
  return out;
}

/** States drawn per band in the band diagram (the tables list them all): more only clutters the well. */
export const DIAGRAM_STATES = 3;

/**
 * |ψ|² of the lowest DIAGRAM_STATES states of a band drawn at their energies: E_n ± A·|ψ|²/max|ψ|²,
 * upward for electrons and downward for holes (into the band, where the state lives). A is 25 % of
 * the band's confinement depth (or of the lowest state's confinement energy when there is no
 * barrier), so curves stay inside the well. Labels sit alternately at the right and left ends.
 * Only the part above 0.2 % of the peak is drawn, so each baseline spans where the state lives.
 * Note: the energy scale of the curves is arbitrary; only their position and shape carry meaning.
 */
function stateCurves(r: SolveResult, band: BandName): { curves: Point[]; labels: { z: number; E: number; label: string; series: string; align: string }[] } {
  const res = r.bands[band];
  const z = r.wavefunctions.z_nm;
  const sign = band === 'electron' ? 1 : -1;
  const depth = Math.abs(res.barrier_eV - res.edge_eV);
  const first = res.states[0];
  const amplitude = 0.25 * (Number.isFinite(depth) && depth > 0 ? depth : first ? Math.max(first.confinement_meV / 1000, 0.01) : 0.01);
  const curves: Point[] = [];
  const labels: { z: number; E: number; label: string; series: string; align: string }[] = [];
  res.states.slice(0, DIAGRAM_STATES).forEach((s, k) => {
    const psi = r.wavefunctions.psi[band][k];
    if (!psi || psi.length !== z.length) return;
    let peak = 0;
    for (const v of psi) peak = Math.max(peak, v * v);
    if (!(peak > 0)) return;
    let first = -1;
    let last = -1;
    const stride = Math.max(1, Math.ceil(z.length / MAX_CURVE_POINTS));
    for (let i = 0; i < z.length; i += stride) {
      const w = (psi[i]! * psi[i]!) / peak;
      if (w < 2e-3) continue;
      curves.push({ z: z[i]!, E: s.energy_eV + sign * amplitude * w, series: BAND_NAMES[band], curve: `${band}-${s.label}`, i: curves.length });
      if (first < 0) first = i;
      last = i;
    }
    if (last >= 0) labels.push({ z: z[k % 2 === 0 ? last : first]!, E: s.energy_eV, label: s.label, series: BAND_NAMES[band], align: k % 2 === 0 ? 'left' : 'right' });
  });
  return { curves, labels };
}

/**
 * Band diagram: Ec, Ehh and Elh versus z with each bound state's |ψ|² at its energy, interfaces
 * as faint rules and layer labels above. z in nm from the first layer's start; energy in eV.
 */
export function bandDiagramSpec(r: SolveResult, options: { readonly width?: number; readonly height?: number } = {}): TopLevelSpec {
  const edges = BANDS.flatMap((b) => edgePoints(r, b));
  const states = BANDS.map((b) => stateCurves(r, b));
  const interfaces: { z: number }[] = [];
  const layerLabels: { z: number; label: string }[] = [];
  let z = 0;
  for (const l of r.structure.layers) {
    if (l.thickness_nm / r.structure.total_nm > 0.06) layerLabels.push({ z: z + l.thickness_nm / 2, label: l.label || l.formula });
    z += l.thickness_nm;
    if (l.index < r.structure.layers.length - 1) interfaces.push({ z });
  }
  const x = { field: 'z', type: 'quantitative' as const, title: 'z (nm)', scale: { domain: [0, r.structure.total_nm], nice: false } };
  const y = { field: 'E', type: 'quantitative' as const, title: 'energy (eV)', scale: { zero: false } };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: options.width ?? 720,
    height: options.height ?? 420,
    layer: [
      { data: { values: interfaces }, mark: { type: 'rule', color: '#d8d8d8', strokeWidth: 1 }, encoding: { x } },
      {
        data: { values: layerLabels },
        mark: { type: 'text', color: PALETTE.ink, fontSize: 10, baseline: 'top', dy: 4, y: 0 },
        encoding: { x, text: { field: 'label' } },
      },
      {
        data: { values: edges },
        mark: { type: 'line', strokeWidth: 2 },
        encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: { field: 'series', type: 'nominal', title: 'band', scale: colourScale } },
      },
      {
        data: { values: states.flatMap((s) => s.curves) },
        mark: { type: 'line', strokeWidth: 1.2, opacity: 0.85 },
        encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: { field: 'series', type: 'nominal', scale: colourScale } },
      },
      {
        data: { values: states.flatMap((s) => s.labels.filter((l) => l.align === 'left')) },
        mark: { type: 'text', align: 'left', dx: 4, fontSize: 11, fontWeight: 'bold' },
        encoding: { x, y, text: { field: 'label' }, color: { field: 'series', type: 'nominal', scale: colourScale } },
      },
      {
        data: { values: states.flatMap((s) => s.labels.filter((l) => l.align === 'right')) },
        mark: { type: 'text', align: 'right', dx: -4, fontSize: 11, fontWeight: 'bold' },
        encoding: { x, y, text: { field: 'label' }, color: { field: 'series', type: 'nominal', scale: colourScale } },
      },
    ],
  } as TopLevelSpec;
}

/**
 * Width (nm) of the layers that confine a band: those whose edge lies inside the barrier, i.e.
 * below the continuum edge for electrons and above it for holes. The bulk envelope of the
 * staircase of a well of width L is g3·L (common practice).
 */
export function confiningWidth(r: SolveResult, band: BandName): number {
  const res = r.bands[band];
  const sign = band === 'electron' ? 1 : -1;
  const key = band === 'electron' ? 'Ec' : band === 'heavy_hole' ? 'Ehh' : 'Elh';
  let w = 0;
  for (const l of r.structure.layers) {
    const mid = l.bands[Math.floor(l.bands.length / 2)]!;
    if (sign * (mid[key] - res.barrier_eV) < 0) w += l.thickness_nm;
  }
  return w;
}

/** Mass along z (m0) of the layer holding the band's extremum. */
function deepestMassZ(r: SolveResult, band: BandName): number {
  const sign = band === 'electron' ? 1 : -1;
  const edge = band === 'electron' ? 'Ec' : band === 'heavy_hole' ? 'Ehh' : 'Elh';
  const mass = band === 'electron' ? 'me' : band === 'heavy_hole' ? 'mhh_z' : 'mlh_z';
  let best = r.structure.layers[0]!.bands[0]!;
  for (const l of r.structure.layers) for (const b of l.bands) if (sign * b[edge] < sign * best[edge]) best = b;
  return best[mass];
}

/**
 * Sampled 2-D staircase and bulk envelope of one band, energy measured into the band from its
 * edge (meV). The envelope is g3(E)·L with the density-of-states mass (m∥² m_z)^(1/3): for an
 * infinite well of width L it touches the staircase at every edge, since n steps of m∥/(πħ²) are
 * reached at E_n = ħ²π²n²/(2 m_z L²), where g3·L = n m∥/(πħ²) (common practice).
 */
export function dosSeries(r: SolveResult, band: BandName, samples = 400): { readonly staircase: readonly { e_meV: number; g: number }[]; readonly envelope: readonly { e_meV: number; g: number }[] } {
  const res = r.bands[band];
  const steps = r.dos.bands[band].filter((d) => Number.isFinite(d.mass_inplane) && d.mass_inplane > 0);
  if (steps.length === 0) return { staircase: [], envelope: [] };
  const sign = band === 'electron' ? 1 : -1;
  const top = Math.max(Math.abs(res.barrier_eV - res.edge_eV), ...steps.map((d) => sign * (d.edge_eV - res.edge_eV))) * 1000 * 1.1;
  const e_meV = Array.from({ length: samples }, (_, k) => -0.05 * top + (1.05 * top * k) / (samples - 1));
  const g2 = dos2d({ subbands: steps.map((d) => ({ energy: sign * (d.edge_eV - res.edge_eV), mass: d.mass_inplane })), energies_eV: e_meV.map((e) => e / 1000) });
  const L_cm = confiningWidth(r, band) * 1e-7;
  const g3 = dos3d({ edge_eV: 0, mass: Math.cbrt(steps[0]!.mass_inplane ** 2 * deepestMassZ(r, band)), energies_eV: e_meV.map((e) => e / 1000) });
  return {
    staircase: e_meV.map((e, k) => ({ e_meV: e, g: g2[k]! / 1e13 })),
    envelope: L_cm > 0 ? e_meV.map((e, k) => ({ e_meV: e, g: (g3[k]! * L_cm) / 1e13 })) : [],
  };
}

/**
 * Density of states, one panel per band: the 2-D staircase Σ m∥/(πħ²) Θ(E − E_n) (solid) and the
 * bulk envelope g3(E)·L of the confining layers with the ground state's in-plane mass (dashed),
 * versus the energy into the band from its edge (meV); DOS in 10¹³ cm⁻² eV⁻¹.
 */
export function dosSpec(r: SolveResult, options: { readonly width?: number; readonly height?: number } = {}): TopLevelSpec {
  const rows = BANDS.flatMap((b) => {
    const s = dosSeries(r, b);
    return [
      ...s.staircase.map((p) => ({ ...p, band: BAND_NAMES[b], curve: '2-D staircase' })),
      ...s.envelope.map((p) => ({ ...p, band: BAND_NAMES[b], curve: 'bulk envelope g3·L' })),
    ];
  });
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    data: { values: rows },
    facet: { column: { field: 'band', type: 'nominal', title: null, sort: SERIES } },
    spec: {
      width: options.width ?? 210,
      height: options.height ?? 200,
      mark: { type: 'line', strokeWidth: 1.8, interpolate: 'step-after', clip: true },
      encoding: {
        x: { field: 'e_meV', type: 'quantitative', title: 'energy from band edge (meV)' },
        y: { field: 'g', type: 'quantitative', title: 'DOS (10¹³ cm⁻² eV⁻¹)' },
        color: { field: 'band', type: 'nominal', scale: colourScale, legend: null },
        strokeDash: { field: 'curve', type: 'nominal', title: null, scale: { domain: ['2-D staircase', 'bulk envelope g3·L'], range: [[1, 0], [5, 3]] } },
      },
    },
    resolve: { scale: { y: 'independent', x: 'independent' } },
  } as TopLevelSpec;
}

/**
 * Valence subband dispersion E(k∥): [100] drawn on the negative k axis and [110] on the positive,
 * one curve per branch, coloured by the subband's k∥ = 0 character (heavy or light hole; split-off
 * in ink), with the outer layers' bulk continuum edge dashed. k in 1/nm, energy in eV (absolute).
 */
export function valenceDispersionSpec(v: ValenceSummary, options: { readonly width?: number; readonly height?: number } = {}): TopLevelSpec {
  const kindName = { hh: BAND_NAMES.heavy_hole, lh: BAND_NAMES.light_hole, so: 'split-off' } as const;
  const rows: { k: number; E: number; series: string; curve: string; i: number }[] = [];
  const continuum: { k: number; E: number; curve: string; i: number }[] = [];
  const sideOf = (name: string): number => (name === '[110]' ? 1 : -1);
  for (const d of v.directions) {
    const side = sideOf(d.name);
    for (const s of d.subbands) {
      s.energy_eV.forEach((branch, b) => {
        branch.forEach((E, i) => rows.push({ k: side * v.k_per_nm[i]!, E, series: kindName[s.kind], curve: `${d.name}-${s.label}-${b}`, i }));
      });
    }
    d.continuum_eV.forEach((E, i) => continuum.push({ k: side * v.k_per_nm[i]!, E, curve: d.name, i }));
  }
  const x = { field: 'k', type: 'quantitative' as const, title: 'k∥ (1/nm): [100] ←  → [110]', scale: { nice: false } };
  const y = { field: 'E', type: 'quantitative' as const, title: 'energy (eV)', scale: { zero: false } };
  const colour = { domain: [BAND_NAMES.heavy_hole, BAND_NAMES.light_hole, 'split-off'], range: [BAND_COLOURS.heavy_hole, BAND_COLOURS.light_hole, PALETTE.ink] };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: options.width ?? 520,
    height: options.height ?? 360,
    layer: [
      { data: { values: [{ k: 0 }] }, mark: { type: 'rule', color: '#d8d8d8' }, encoding: { x } },
      {
        data: { values: continuum },
        mark: { type: 'line', strokeDash: [5, 3], color: PALETTE.sky, strokeWidth: 1.5 },
        encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' } },
      },
      {
        data: { values: rows },
        mark: { type: 'line', strokeWidth: 1.6 },
        encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: { field: 'series', type: 'nominal', title: 'k∥ = 0 character', scale: colour } },
      },
    ],
  } as TopLevelSpec;
}
