/**
 * The wire sections of a report: the cross-section's materials map, |ψ|² maps of the lowest
 * states of each band (Vega-Lite rect heatmaps on the solver's map grid), the broadened 1-D
 * density of states with its E^(−1/2) singularities at the subband edges, and the states and
 * transitions tables. Lengths in nm, energies in eV on the absolute scale of the parameter set.
 */
import type { TopLevelSpec } from 'vega-lite';
import { InputError } from '../errors.js';
import { fixed, inUnit, sig } from '../text.js';
import type { BandName } from '../profile.js';
import { BANDS } from '../solve.js';
import type { WireSolveResult, WireTransition } from '../wire/solve.js';
import { magnitude } from '../wire/describe.js';
import { figureHtml, htmlTable, type Section } from './html.js';
import { BAND_COLOURS, BAND_NAMES, PALETTE } from './palette.js';
import { renderSvg } from './render.js';
import { MIN_OSCILLATOR_STRENGTH, MIN_OVERLAP2 } from './defaults.js';

/** States mapped per band (the tables list them all). */
export const MAPPED_STATES = 2;
/** Cells per axis kept in a map: finer than the eye resolves at the plotted size, and a small page. */
const MAX_CELLS = 60;

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** True for `wellsmith solve --json` output of a wire (with or without --maps). */
export const isWireJson = (v: unknown): v is Record<string, unknown> =>
  isRecord(v) && isRecord(v.structure) && Array.isArray(v.structure.primitives) && isRecord(v.bands);

/** A wire result from `solve --json --maps` output; without the maps there is nothing to draw. */
export function wireFromJson(v: Record<string, unknown>, origin: string): WireSolveResult {
  if (!isRecord(v.maps) || !isRecord(v.dos) || !isRecord(v.dos.curves)) {
    throw new InputError('schema', `${origin}: a wire result needs its |ψ|² maps and DOS curves; write it with "wellsmith solve SPEC --json --maps"`, 'maps');
  }
  const bands = v.bands as Record<string, unknown>;
  if (!BANDS.every((b) => isRecord(bands[b]) && isRecord(bands[b].threshold))) {
    throw new InputError('schema', `${origin}: a wire result without continuum thresholds (written by an older version); write it again with "wellsmith solve SPEC --json --maps"`, 'bands');
  }
  return v as unknown as WireSolveResult;
}

interface Cell { readonly x: number; readonly x2: number; readonly y: number; readonly y2: number }

/** The map grid's cells, strided to at most MAX_CELLS per axis, with the node index each stands for. */
function cells(r: WireSolveResult): { readonly cell: Cell; readonly node: number }[] {
  const g = r.maps.grid;
  const stride = Math.max(1, Math.ceil(Math.max(g.nx, g.ny) / MAX_CELLS));
  const out: { cell: Cell; node: number }[] = [];
  for (let j = 0; j < g.ny; j += stride) {
    for (let i = 0; i < g.nx; i += stride) {
      const x = g.x0_nm + i * g.dx_nm;
      const y = g.y0_nm + j * g.dy_nm;
      out.push({ cell: { x: x - g.dx_nm / 2, x2: x + (stride - 0.5) * g.dx_nm, y: y - g.dy_nm / 2, y2: y + (stride - 0.5) * g.dy_nm }, node: j * g.nx + i });
    }
  }
  return out;
}

const axes = (r: WireSolveResult) => {
  const g = r.maps.grid;
  const xd = [g.x0_nm - g.dx_nm / 2, g.x0_nm + (g.nx - 0.5) * g.dx_nm];
  const yd = [g.y0_nm - g.dy_nm / 2, g.y0_nm + (g.ny - 0.5) * g.dy_nm];
  return {
    x: { field: 'x', type: 'quantitative' as const, title: 'x (nm)', scale: { domain: xd, nice: false, zero: false } },
    x2: { field: 'x2' },
    y: { field: 'y', type: 'quantitative' as const, title: 'z (nm, growth)', scale: { domain: yd, nice: false, zero: false } },
    y2: { field: 'y2' },
    size: (side: number) => ({ width: side, height: Math.round((side * (yd[1]! - yd[0]!)) / (xd[1]! - xd[0]!)) }),
  };
};

/** Materials map of the cross-section: each cell coloured by the material at its node. */
export function materialsMapSpec(r: WireSolveResult): TopLevelSpec {
  const a = axes(r);
  const names = r.structure.materials.map((m) => m.formula);
  const rows = cells(r).map(({ cell, node }) => ({ ...cell, material: names[r.maps.grid.material[node]!] ?? '?' }));
  const domain = [...new Set(names)];
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    ...a.size(300),
    data: { values: rows },
    mark: { type: 'rect' },
    encoding: { x: a.x, x2: a.x2, y: a.y, y2: a.y2, color: { field: 'material', type: 'nominal', title: 'material', scale: { domain, range: [PALETTE.straw, PALETTE.indigo, PALETTE.amber, PALETTE.rose, PALETTE.sky].slice(0, domain.length) } } },
  } as TopLevelSpec;
}

/**
 * The boundaries between materials on the map grid, as segments (nm): a vertical segment midway
 * between horizontally adjacent nodes of different materials, a horizontal one between vertically
 * adjacent ones. Drawn over each |ψ|² map, they outline the cross-section's shape.
 */
export function materialOutline(r: WireSolveResult): { x: number; y: number; x2: number; y2: number }[] {
  const g = r.maps.grid;
  const out: { x: number; y: number; x2: number; y2: number }[] = [];
  for (let j = 0; j < g.ny; j++) {
    for (let i = 0; i < g.nx; i++) {
      const m = g.material[j * g.nx + i];
      const x = g.x0_nm + i * g.dx_nm;
      const y = g.y0_nm + j * g.dy_nm;
      if (i + 1 < g.nx && g.material[j * g.nx + i + 1] !== m) out.push({ x: x + g.dx_nm / 2, y: y - g.dy_nm / 2, x2: x + g.dx_nm / 2, y2: y + g.dy_nm / 2 });
      if (j + 1 < g.ny && g.material[(j + 1) * g.nx + i] !== m) out.push({ x: x - g.dx_nm / 2, y: y + g.dy_nm / 2, x2: x + g.dx_nm / 2, y2: y + g.dy_nm / 2 });
    }
  }
  return out;
}

/**
 * |ψ|² maps (normalised to each state's peak) of the lowest MAPPED_STATES states of each band, one
 * panel per state, each with the cross-section's material boundaries drawn over it.
 */
export function stateMapsSpec(r: WireSolveResult): TopLevelSpec {
  const a = axes(r);
  const grid = cells(r);
  const outline = materialOutline(r);
  const rows = BANDS.flatMap((b) => r.bands[b].states.slice(0, MAPPED_STATES).flatMap((s, k) => {
    const psi2 = r.maps.psi2[b][k];
    if (!psi2) return [];
    let peak = 0;
    for (let n = 0; n < psi2.length; n++) peak = Math.max(peak, psi2[n]!);
    const state = `${s.label} (${fixed(s.energy_eV, 4)} eV)`;
    // A facet's layers share its data: the outline rides along with every state's map.
    return peak > 0 ? [...grid.map(({ cell, node }) => ({ ...cell, p: psi2[node]! / peak, state, kind: 'map' })), ...outline.map((o) => ({ ...o, state, kind: 'outline' }))] : [];
  }));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    data: { values: rows },
    facet: { field: 'state', type: 'nominal', title: null, sort: null },
    columns: 3,
    spec: {
      ...a.size(230),
      layer: [
        {
          transform: [{ filter: "datum.kind === 'map'" }],
          mark: { type: 'rect' },
          encoding: { x: a.x, x2: a.x2, y: a.y, y2: a.y2, color: { field: 'p', type: 'quantitative', title: '|ψ|² / max', scale: { domain: [0, 1], range: ['#ffffff', PALETTE.indigo], interpolate: 'rgb' } } },
        },
        {
          transform: [{ filter: "datum.kind === 'outline'" }],
          mark: { type: 'rule', color: PALETTE.amber, strokeWidth: 1.2 },
          encoding: { x: a.x, x2: a.x2, y: a.y, y2: a.y2 },
        },
      ],
    },
  } as TopLevelSpec;
}

/**
 * Broadened 1-D DOS per band, g1 = Σ √(2m)/(πħ) (E − Eₙ)^(−1/2) with the result's Lorentzian
 * broadening, versus the energy into the band from its extremum (meV), with the subband edges
 * (the singularities) as dashed rules.
 */
export function wireDosSpec(r: WireSolveResult): TopLevelSpec {
  const sign = (b: BandName): number => (b === 'electron' ? 1 : -1);
  const curve = BANDS.flatMap((b) => {
    const c = r.dos.curves[b];
    return c.energies_eV.map((e, k) => ({ e_meV: sign(b) * (e - r.bands[b].edge_eV) * 1000, g: c.states_per_cm_per_eV[k]! / 1e6, band: BAND_NAMES[b] }));
  });
  const edges = BANDS.flatMap((b) => r.dos.bands[b].map((d) => ({ e_meV: sign(b) * (d.edge_eV - r.bands[b].edge_eV) * 1000, band: BAND_NAMES[b], label: d.label })));
  const colour = { field: 'band', type: 'nominal' as const, legend: null, scale: { domain: BANDS.map((b) => BAND_NAMES[b]), range: BANDS.map((b) => BAND_COLOURS[b]) } };
  const x = { field: 'e_meV', type: 'quantitative' as const, title: 'energy from band extremum (meV)' };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    facet: { column: { field: 'band', type: 'nominal', title: null, sort: BANDS.map((b) => BAND_NAMES[b]) } },
    data: { values: [...curve.map((p) => ({ ...p, kind: 'curve' })), ...edges.map((p) => ({ ...p, kind: 'edge' }))] },
    spec: {
      width: 210, height: 200,
      layer: [
        { transform: [{ filter: "datum.kind === 'curve'" }], mark: { type: 'line', strokeWidth: 1.6 }, encoding: { x, y: { field: 'g', type: 'quantitative', title: 'DOS (10⁶ cm⁻¹ eV⁻¹)' }, color: colour } },
        { transform: [{ filter: "datum.kind === 'edge'" }], mark: { type: 'rule', strokeDash: [4, 3], opacity: 0.6 }, encoding: { x, color: colour } },
      ],
    },
    resolve: { scale: { x: 'independent', y: 'independent' } },
  } as TopLevelSpec;
}

/**
 * The lines the report shows: interband with overlap² ≥ MIN_OVERLAP2, intersubband with the
 * oscillator strength of either polarisation ≥ MIN_OSCILLATOR_STRENGTH, as for wells; every
 * intersubband line of a result written before wire solves recorded dipoles (`dipoles` false).
 */
function shownLines(r: WireSolveResult): { readonly inter: WireTransition[]; readonly isb: WireTransition[]; readonly dipoles: boolean; readonly omitted: number } {
  const inter = r.transitions.filter((t) => t.kind === 'interband' && t.overlap2 >= MIN_OVERLAP2);
  const all = r.transitions.filter((t) => t.kind === 'intersubband');
  const dipoles = all.some((t) => t.oscillator_strength_x !== undefined);
  const isb = dipoles ? all.filter((t) => Math.max(Math.abs(t.oscillator_strength_x ?? 0), Math.abs(t.oscillator_strength_y ?? 0)) >= MIN_OSCILLATOR_STRENGTH) : all;
  return { inter, isb, dipoles, omitted: r.transitions.length - inter.length - isb.length };
}

/**
 * Interband and intersubband lines as two tables. An intersubband line shows its dipoles across
 * the wire, |x_ij| and |z_ij| (the solve's y, the growth axis; signed in --json), and the
 * oscillator strength of each polarisation (engine/wire/dipoles.ts).
 */
function transitionTables({ inter, isb, dipoles }: ReturnType<typeof shownLines>): string {
  const parts = [];
  if (inter.length) parts.push('<h3>Interband</h3>', htmlTable(['transition', 'energy (eV)', 'wavelength (nm)', 'overlap²'], inter.map((t) => [t.label, inUnit(t.energy_eV, 'eV'), inUnit(t.wavelength_nm, 'nm'), inUnit(t.overlap2, '')]), [1, 2, 3]));
  if (isb.length) {
    parts.push('<h3>Intersubband</h3>', htmlTable(['transition', 'energy (meV)', 'wavelength (µm)', ...(dipoles ? ['|x_ij| (nm)', '|z_ij| (nm)', 'f, x-polarised', 'f, z-polarised'] : [])],
      isb.map((t) => [t.label, inUnit(t.energy_eV * 1000, 'meV'), inUnit(t.wavelength_nm / 1000, 'µm'),
        ...(dipoles ? [magnitude(t.dipole_x_nm), magnitude(t.dipole_y_nm), inUnit(t.oscillator_strength_x, ''), inUnit(t.oscillator_strength_y, '')] : [])]), dipoles ? [1, 2, 3, 4, 5, 6] : [1, 2]));
    if (!dipoles) parts.push('<p class="lead">This result was written before wire solves recorded intersubband dipoles; solve the spec again for their dipoles and oscillator strengths.</p>');
  }
  return parts.length ? parts.join('\n') : '<p>No transition: a band has no bound state.</p>';
}

/** The sections of a wire report. */
export async function wireSections(r: WireSolveResult): Promise<Section[]> {
  const s = r.structure;
  const dims = Object.entries(s.dimensions).map(([k, v]) => `${k.replace(/^wire\.shape\./, '')} ${fixed(v, 2)} nm`).join(', ');
  const states = BANDS.flatMap((b) => r.bands[b].states.map((x) => [BAND_NAMES[b], x.label, fixed(x.energy_eV, 5), fixed(x.confinement_meV, 2), fixed(x.binding_meV, 2), fixed(x.mass_axis, 4)]));
  const thresholds = BANDS.map((b) => {
    const t = r.bands[b].threshold;
    return `${BAND_NAMES[b]} ${fixed(t.energy_eV, 5)} eV (${t.source === 'barrier' ? 'barrier edge' : `parent well ${t.field.replace(/^wire\.shape\./, '')}`})`;
  }).join(', ');
  const parent = BANDS.flatMap((b) => r.bands[b].parentWellStates.map((x) => [BAND_NAMES[b], x.label, fixed(x.energy_eV, 5), fixed(x.binding_meV, 2), x.where.replace(/^wire\.shape\./, ''), fixed(x.share, 2)]));
  const lines = shownLines(r);
  return [
    {
      id: 'cross-section', title: 'Cross-section',
      lead: `${s.shape} wire${dims ? ` (${dims})` : ''} · T = ${s.temperature_K} K · substrate ${s.substrate ?? 'none'} · parameters ${r.parameterSet}; x across the wire, z along growth, the wire axis out of the page.`,
      html: figureHtml(await renderSvg(materialsMapSpec(r)), 'Material at each node of the map grid (x and z in nm).'),
    },
    {
      id: 'maps', title: '|ψ|² of the lowest states',
      lead: r.status === 'ok' ? `The lowest ${MAPPED_STATES} subbands of each band, each normalised to its peak.` : `status ${r.status}: ${r.message}`,
      html: figureHtml(await renderSvg(stateMapsSpec(r)), '|ψ|² / max|ψ|² over the cross-section (x and z in nm); subband edge energies in the panel titles.'),
    },
    {
      id: 'states', title: 'Subbands',
      lead: `Wire subbands are the states bound below the continuum threshold of their band: ${thresholds}. A parent well is a drawn arm, stem or rectangle extended without end; its 1-D level, solved exactly, is where its 2-D continuum starts.`,
      html: htmlTable(['band', 'state', 'edge (eV)', 'confinement (meV)', 'binding (meV)', 'm along axis (m0)'], states, [2, 3, 4, 5])
        + (parent.length > 0 ? htmlTable(['band', 'parent-well state', 'energy (eV)', 'below threshold (meV)', 'mostly in', 'share'], parent, [2, 3, 5]) : ''),
    },
    {
      id: 'transitions', title: 'Transitions',
      lead: `Interband transitions with envelope overlap² ≥ ${MIN_OVERLAP2}; ${lines.dipoles ? `intersubband transitions with an oscillator strength ≥ ${MIN_OSCILLATOR_STRENGTH} for light polarised across the wire along x or along z (growth), with their dipoles; f is normalised as for wells (Σ_j f = 1 per polarisation for a parabolic band)` : 'intersubband transitions with their energies'}${lines.omitted > 0 ? ` (${lines.omitted} weaker pairs left out; "wellsmith solve --json" lists all)` : ''}.`,
      html: transitionTables(lines),
    },
    {
      id: 'dos', title: 'Density of states',
      lead: `One-dimensional g1 = Σ √(2mₙ)/(πħ) (E − Eₙ)^(−1/2) per band (spin included), Lorentzian-broadened by ${sig(r.dos.broadening_eV * 1000, 3)} meV; dashed: the subband edges, where g1 diverges.`,
      html: figureHtml(await renderSvg(wireDosSpec(r)), 'DOS (10⁶ cm⁻¹ eV⁻¹) versus energy into each band from its extremum in the cross-section (meV).'),
    },
  ];
}
