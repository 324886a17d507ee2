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
 * Band-edge polyline of one band between z = from and z = to (nm): the solver's own profile
 * (engine/profile.ts), so graded layers appear as slopes and a field as a tilt, drawn with a
 * vertical jump at each slice boundary.
 */
function edgePoints(r: SolveResult, band: BandName, from = 0, to = Infinity): Point[] {
  const p = buildBandProfile(r.structure, band, { maxSlice_nm: r.settings.slice_nm, nonparabolic: false });
  const out: Point[] = [];
  let z = 0;
  for (const s of p.slices) {
    const a = Math.max(z, from);
    const b = Math.min(z + s.width_nm, to);
    z += s.width_nm;
    if (b <= a) continue;
    const E = p.sign * s.V;
    out.push({ z: a, E, series: BAND_NAMES[band], curve: band, i: out.length });
    out.push({ z: b, E, series: BAND_NAMES[band], curve: band, i: out.length });
  }
  return out;
}

/** States drawn per band in the band diagram (the tables list them all): more only clutters the well. */
export const DIAGRAM_STATES = 3;

/** One panel of the band diagram: the conduction band, or the two valence bands. */
interface Panel {
  readonly bands: readonly BandName[];
  readonly title: string;
  /** Energy range shown (eV). */
  readonly lo: number;
  readonly hi: number;
}

/** Pixel sizes of the band diagram (each panel) and the font of its state labels. */
const DIAGRAM = { width: 720, height: 230, label: 11, minGap: 13 } as const;

/**
 * The z range worth showing (nm): the layers where some band lies inside its barrier (below the
 * continuum edge for electrons, above it for holes), with a margin of 30 % of that span (at least
 * 4 nm) each side, within the stack. Thick claddings then no longer squeeze the wells.
 */
export function confiningRange(r: SolveResult): { readonly from: number; readonly to: number } {
  const total = r.structure.total_nm;
  let first = Infinity;
  let last = -Infinity;
  let z = 0;
  for (const l of r.structure.layers) {
    const inside = BANDS.some((b) => {
      const sign = b === 'electron' ? 1 : -1;
      const key = b === 'electron' ? 'Ec' : b === 'heavy_hole' ? 'Ehh' : 'Elh';
      return l.bands.some((x) => sign * (x[key] - r.bands[b].barrier_eV) < -1e-9);
    });
    if (inside) { first = Math.min(first, z); last = Math.max(last, z + l.thickness_nm); }
    z += l.thickness_nm;
  }
  if (!Number.isFinite(first)) return { from: 0, to: total };
  const margin = Math.max(4, 0.3 * (last - first));
  return { from: Math.max(0, first - margin), to: Math.min(total, last + margin) };
}

/**
 * |ψ|² of the lowest DIAGRAM_STATES states of a band drawn at their energies: E_n ± A·|ψ|²/max|ψ|²,
 * upward for electrons and downward for holes (into the band, where the state lives). A is 25 % of
 * the band's confinement depth (or of the lowest state's confinement energy when there is no
 * barrier), so curves stay inside the well. Only the part above 0.2 % of the peak is drawn, so each
 * baseline spans where the state lives. The energy scale of the curves is arbitrary; only their
 * position and shape carry meaning. Points outside [from, to] (nm) are left out.
 */
function stateCurves(r: SolveResult, band: BandName, from: number, to: number): { curves: Point[]; states: { label: string; E: number; series: string }[] } {
  const res = r.bands[band];
  const z = r.wavefunctions.z_nm;
  const sign = band === 'electron' ? 1 : -1;
  const depth = Math.abs(res.barrier_eV - res.edge_eV);
  const first = res.states[0];
  const amplitude = 0.25 * (Number.isFinite(depth) && depth > 0 ? depth : first ? Math.max(first.confinement_meV / 1000, 0.01) : 0.01);
  const curves: Point[] = [];
  const states: { label: string; E: number; series: string }[] = [];
  res.states.slice(0, DIAGRAM_STATES).forEach((s, k) => {
    const psi = r.wavefunctions.psi[band][k];
    if (!psi || psi.length !== z.length) return;
    let peak = 0;
    for (const v of psi) peak = Math.max(peak, v * v);
    if (!(peak > 0)) return;
    const stride = Math.max(1, Math.ceil(z.length / MAX_CURVE_POINTS));
    for (let i = 0; i < z.length; i += stride) {
      const w = (psi[i]! * psi[i]!) / peak;
      if (w < 2e-3 || z[i]! < from || z[i]! > to) continue;
      curves.push({ z: z[i]!, E: s.energy_eV + sign * amplitude * w, series: BAND_NAMES[band], curve: `${band}-${s.label}`, i: curves.length });
    }
    states.push({ label: s.label, E: s.energy_eV, series: BAND_NAMES[band] });
  });
  return { curves, states };
}

/**
 * Label positions (pixels from the top) for labels wanted at `want` (sorted or not), each at least
 * `gap` from the next and all within [gap/2, height − gap/2]: pushed down past their upper
 * neighbours, then up from the bottom edge. Returns them in the input order.
 */
export function spreadLabels(want: readonly number[], gap: number, height: number): number[] {
  const order = want.map((y, i) => ({ y, i })).sort((a, b) => a.y - b.y);
  const y = order.map((o) => Math.min(Math.max(o.y, gap / 2), height - gap / 2));
  for (let k = 1; k < y.length; k++) y[k] = Math.max(y[k]!, y[k - 1]! + gap);
  if (y.length > 0) y[y.length - 1] = Math.min(y[y.length - 1]!, height - gap / 2);
  for (let k = y.length - 2; k >= 0; k--) y[k] = Math.min(y[k]!, y[k + 1]! - gap);
  const out = new Array<number>(want.length);
  order.forEach((o, k) => { out[o.i] = y[k]!; });
  return out;
}

/** The conduction and valence panels: each band group's extremum to its continuum edge, padded, and every drawn point (levels, |ψ|² curves) inside. */
function panelsOf(r: SolveResult, drawn: Readonly<Record<BandName, { E: number }[]>>): Panel[] {
  const groups: { bands: BandName[]; title: string }[] = [{ bands: ['electron'], title: 'electron energy (eV)' }, { bands: ['heavy_hole', 'light_hole'], title: 'hole energy (eV)' }];
  return groups.map(({ bands, title }) => {
    const sign = bands[0] === 'electron' ? 1 : -1;
    // Particle sense: the extremum is the lowest point, the continuum edge the highest that confines.
    const edge = Math.min(...bands.map((b) => sign * r.bands[b].edge_eV));
    const barrier = Math.max(...bands.map((b) => sign * r.bands[b].barrier_eV));
    const top = Math.max(barrier, ...bands.flatMap((b) => drawn[b].map((s) => sign * s.E)));
    const depth = Math.max(top - edge, 0.02);
    const lo = edge - 0.12 * depth;
    const hi = top + 0.15 * depth;
    return sign > 0 ? { bands, title, lo, hi } : { bands, title, lo: -hi, hi: -lo };
  });
}

/**
 * Band diagram in two panels — the conduction band above, heavy and light holes below — each
 * zoomed to its bands' confining range (extremum to continuum edge, padded) and to the z range of
 * the confining layers (confiningRange), so a state next to the barrier edge stays visible: band
 * edges (solid), the continuum edge (dashed), each state's |ψ|² at its energy, state labels in a
 * column at the right joined to their level by a leader and spread so they never overlap, and
 * layer labels above where they fit. z in nm from the first layer's start; energies in eV.
 */
export function bandDiagramSpec(r: SolveResult, options: { readonly width?: number; readonly height?: number } = {}): TopLevelSpec {
  const width = options.width ?? DIAGRAM.width;
  const height = options.height ?? DIAGRAM.height;
  const range = confiningRange(r);
  const span = range.to - range.from;
  // The label column: 12 % of the plotted span beyond the last layer shown.
  const labelZ = range.to + 0.04 * span;
  const domain = [range.from, range.to + 0.12 * span];
  const pxPerNm = width / (domain[1]! - domain[0]!);
  const drawnCurves = Object.fromEntries(BANDS.map((b) => [b, stateCurves(r, b, range.from, range.to)])) as Record<BandName, ReturnType<typeof stateCurves>>;
  // Levels and their |ψ|² curves both inside: a state at the barrier edge draws its curve above it.
  const extent = (b: BandName): { E: number }[] => [...drawnCurves[b].states, ...drawnCurves[b].curves];
  const panels = panelsOf(r, { electron: extent('electron'), heavy_hole: extent('heavy_hole'), light_hole: extent('light_hole') });
  const interfaces: { z: number }[] = [];
  const layerLabels: { z: number; label: string }[] = [];
  let z = 0;
  for (const l of r.structure.layers) {
    const a = Math.max(z, range.from);
    const b = Math.min(z + l.thickness_nm, range.to);
    const text = l.label || l.formula;
    // A label is drawn only where it fits inside its layer's visible width (about 6 px per character at 10 px).
    if (b > a && (b - a) * pxPerNm >= text.length * 6.2 + 6) layerLabels.push({ z: (a + b) / 2, label: text });
    z += l.thickness_nm;
    if (l.index < r.structure.layers.length - 1 && z > range.from && z < range.to) interfaces.push({ z });
  }
  const x = { field: 'z', type: 'quantitative' as const, title: 'z (nm)', scale: { domain, nice: false } };
  const vconcat = panels.map((panel, p) => {
    const y = { field: 'E', type: 'quantitative' as const, title: panel.title, scale: { domain: [panel.lo, panel.hi], nice: false, zero: false } };
    const toPx = (E: number): number => (height * (panel.hi - E)) / (panel.hi - panel.lo);
    const toE = (px: number): number => panel.hi - (px * (panel.hi - panel.lo)) / height;
    const states = panel.bands.flatMap((b) => drawnCurves[b].states);
    const spread = spreadLabels(states.map((s) => toPx(s.E)), DIAGRAM.minGap, height);
    const labels = states.map((s, k) => ({ z: labelZ, E: toE(spread[k]!), label: s.label, series: s.series }));
    const leaders = states.flatMap((s, k) => [
      { z: range.to, E: s.E, curve: s.label, i: 0, series: s.series },
      { z: labelZ - 0.008 * span, E: toE(spread[k]!), curve: s.label, i: 1, series: s.series },
    ]);
    const continuum = panel.bands.flatMap((b) => [range.from, range.to].map((zz, i) => ({ z: zz, E: r.bands[b].barrier_eV, series: BAND_NAMES[b], curve: b, i })));
    const colour = { field: 'series', type: 'nominal' as const, title: 'band', scale: colourScale };
    return {
      width, height,
      layer: [
        { data: { values: interfaces }, mark: { type: 'rule', color: '#d8d8d8', strokeWidth: 1 }, encoding: { x } },
        ...(p === 0 ? [{
          data: { values: layerLabels },
          mark: { type: 'text', color: PALETTE.ink, fontSize: 10, baseline: 'top', dy: 4, y: 0 },
          encoding: { x, text: { field: 'label' } },
        }] : []),
        {
          data: { values: continuum },
          mark: { type: 'line', strokeDash: [6, 4], strokeWidth: 1, opacity: 0.7 },
          encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: colour },
        },
        {
          data: { values: panel.bands.flatMap((b) => edgePoints(r, b, range.from, range.to)) },
          mark: { type: 'line', strokeWidth: 2, clip: true },
          encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: colour },
        },
        {
          data: { values: panel.bands.flatMap((b) => drawnCurves[b].curves) },
          mark: { type: 'line', strokeWidth: 1.2, opacity: 0.85, clip: true },
          encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: colour },
        },
        {
          data: { values: leaders },
          mark: { type: 'line', strokeWidth: 0.8, strokeDash: [2, 2], opacity: 0.7 },
          encoding: { x, y, order: { field: 'i' }, detail: { field: 'curve' }, color: colour },
        },
        {
          data: { values: labels },
          mark: { type: 'text', align: 'left', baseline: 'middle', fontSize: DIAGRAM.label, fontWeight: 'bold' },
          encoding: { x, y, text: { field: 'label' }, color: colour },
        },
      ],
    };
  });
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    vconcat,
    spacing: 14,
    resolve: { scale: { y: 'independent' } },
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
 * each panel titled with its band and its L (confiningWidth),
 * versus the energy into the band from its edge (meV); DOS in 10¹³ cm⁻² eV⁻¹.
 */
export function dosSpec(r: SolveResult, options: { readonly width?: number; readonly height?: number } = {}): TopLevelSpec {
  // Each panel names the L of its envelope: the confining width differs between bands.
  const panel = (b: BandName): string => `${BAND_NAMES[b]}: L = ${confiningWidth(r, b).toFixed(1)} nm`;
  const rows = BANDS.flatMap((b) => {
    const s = dosSeries(r, b);
    return [
      ...s.staircase.map((p) => ({ ...p, band: BAND_NAMES[b], panel: panel(b), curve: '2-D staircase' })),
      ...s.envelope.map((p) => ({ ...p, band: BAND_NAMES[b], panel: panel(b), curve: 'bulk envelope g3·L' })),
    ];
  });
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    data: { values: rows },
    facet: { column: { field: 'panel', type: 'nominal', title: null, sort: BANDS.map(panel) } },
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
