/**
 * Report sections, one builder per result kind. A new result kind (tolerance, wire, campaign)
 * adds its variant to ReportInput (input.ts) and its builder to SECTION_BUILDERS; the page shell
 * and the shared sections below stay as they are.
 */
import { BANDS, type SolveResult } from '../solve.js';
import { fixed, inUnit, sig, withUnit } from '../text.js';
import { describeOffsetRule, INTERFACE_HEADER, interfaceRow } from '../lineup.js';
import { opticsSection } from './optics.js';
import { describeModels } from '../structure.js';
import type { Scored } from '../../objectives/index.js';
import type { Evaluation } from '../../objectives/types.js';
import { figureHtml, htmlTable, type Section } from './html.js';
import { bandDiagramSpec, confiningRange, dosSpec, DIAGRAM_STATES, valenceDispersionSpec } from './plots.js';
import { BAND_NAMES } from './palette.js';
import { stateRegions, stateWells } from '../../objectives/wells.js';
import { renderSvg } from './render.js';
import type { GrowthSheet } from './growth.js';
import type { ReportInput } from './input.js';
import { toleranceSection } from './tolerance.js';
import { wireSections } from './wire.js';
import { campaignSections } from './campaign.js';
import { dopingSections } from './doping.js';
import { MIN_OSCILLATOR_STRENGTH, MIN_OVERLAP2 } from './defaults.js';
import type { DopedSpecResult } from '../poisson/doped.js';

/** The band diagram with states as standalone SVG (also what `solve --plot` writes). */
export const bandDiagramSvg = (r: SolveResult): Promise<string> => renderSvg(bandDiagramSpec(r));

export function structureSection(r: SolveResult, id = 'structure'): Section {
  const s = r.structure;
  const rows = s.layers.map((l) => {
    const b = l.bands[Math.floor(l.bands.length / 2)]!;
    return [String(l.index + 1), l.label, l.formula, fixed(l.thickness_nm, 3), fixed(l.monolayers, 2), fixed(b.Ec, 4), fixed(b.Ehh, 4), fixed(b.Elh, 4), fixed(l.material.strain_par * 100, 3)];
  });
  const interfaces = s.interfaces.length === 0 ? '' : `\n<h3>Interfaces</h3>\n<p>Steps of the strained edges, upper layer minus lower (meV); Qc = ΔEc/ΔEg of the strained gaps, the share measured offsets quote; type I when the hole band is higher on the side the electrons prefer.</p>\n${htmlTable(INTERFACE_HEADER, s.interfaces.map(interfaceRow), [1, 2, 3, 4, 5])}`;
  return {
    id, title: 'Layer stack',
    lead: `T = ${s.temperature_K} K · substrate ${s.substrate ?? 'none (unstrained)'} · field ${s.field_kV_per_cm} kV/cm · offsets: ${describeOffsetRule(s.offsetRule)} · models: ${describeModels(s.models)} · parameters: ${r.parameterSet}. Band edges at each layer's centre.`,
    html: `${htmlTable(['#', 'layer', 'material', 'thickness (nm)', 'ML', 'Ec (eV)', 'Ehh (eV)', 'Elh (eV)', 'ε∥ (%)'], rows, [0, 3, 4, 5, 6, 7, 8])}${interfaces}`,
  };
}

export async function bandSection(r: SolveResult, id = 'bands'): Promise<Section> {
  const range = confiningRange(r);
  return {
    id, title: 'Band diagram and states',
    lead: `Conduction band (top) and valence bands (bottom) versus growth direction z, each zoomed to its confining range; |ψ|² of the lowest ${DIAGRAM_STATES} states of each band drawn at its energy (scaled to fit the well; upward for electrons, downward for holes); dashed, each band's continuum edge.`,
    html: figureHtml(await bandDiagramSvg(r), `Ec (top), Ehh and Elh (bottom) in eV on the absolute scale of the parameter set versus z from ${fixed(range.from, 1)} to ${fixed(range.to, 1)} nm of ${fixed(r.structure.total_nm, 1)} nm (the confining layers and a margin); labels at the right name each drawn level; the tables list every state.`),
  };
}

/** Valence subband dispersions beside the band diagram, with the DOS-averaged masses. */
export async function valenceSection(r: SolveResult, id = 'valence'): Promise<Section | null> {
  const v = r.valence;
  if (!v) return null;
  const model = v.model === 'kp4' ? '4×4 Luttinger–Kohn (heavy and light holes)' : '6×6 Luttinger–Kohn (with the split-off band)';
  return {
    id, title: 'Valence subbands',
    lead: `Hole subband dispersions from the ${model} Hamiltonian${v.axial ? ' in the axial approximation' : ''}, Burt–Foreman operator ordering; labels follow each subband's character at k∥ = 0. DOS masses: the parabolic mass holding as many states within 5 meV (or kT) of the subband top, DOS averaged over ${v.dos_average}.`,
    html: `${figureHtml(await renderSvg(valenceDispersionSpec(v)), 'Energy (eV, absolute scale) versus in-plane wave vector k∥ (1/nm), [100] to the left and [110] to the right; the dashed line is the outer layers\' bulk valence edge (states below it are not confined).')}\n${htmlTable(['subband', 'DOS mass, 5 meV (m0)', 'DOS mass, kT (m0)'], v.dos_mass.map((m) => [m.label, fixed(m.window_5meV_m0, 3), fixed(m.kT_m0, 3)]), [1, 2])}`,
  };
}

/** Every state's region (objectives/wells.ts stateRegions) as a lookup; empty when unknown. */
function regionsOf(r: SolveResult): Map<string, string> {
  const regions = stateRegions(r);
  return new Map(regions ? BANDS.flatMap((b) => regions[b].map((x) => [x.state, x.region] as const)) : []);
}

export function statesSection(r: SolveResult, id = 'states'): Section {
  const region = regionsOf(r);
  const wells = stateWells(r);
  const home = new Map(wells ? BANDS.flatMap((b) => wells[b].map((w) => [w.state, w.well] as const)) : []);
  const header = ['band', 'state', ...(wells ? ['well'] : []), 'energy (eV)', 'confinement (meV)', 'bound', 'Γ (meV)', 'm∥ (m0)'];
  const rowsOf = (guide: boolean): string[][] => BANDS.flatMap((b) => r.bands[b].states.filter((s) => (region.get(s.label) === 'guide') === guide).map((s) => [BAND_NAMES[b], s.label, ...(wells ? [home.get(s.label) ?? '–'] : []),
    inUnit(s.energy_eV, 'eV'), inUnit(s.confinement_meV, 'meV'), s.bound ? 'yes' : 'quasi', s.bound ? '–' : inUnit(s.width_meV, 'meV'), inUnit(s.mass_inplane, 'm0')]));
  const numeric = wells ? [3, 4, 6, 7] : [2, 3, 5, 6];
  const guide = rowsOf(true);
  const quasi = BANDS.some((b) => r.bands[b].states.some((s) => !s.bound));
  const lead = [r.status === 'ok' ? '' : `status ${r.status}: ${r.message}.`, quasi ? 'Quasi-bound states are resonances of the well under the field; Γ is their width (FWHM), ħ/Γ their lifetime.' : '',
    guide.length ? 'States of the wells first; below them the states of the guiding and cladding layers (above the wells\' barriers, spread over the layers around the wells: a waveguide\'s states).' : ''].join(' ').trim();
  return {
    id, title: 'Bound states', lead: lead || undefined,
    html: guide.length
      ? `<h3>States of the wells</h3>\n${htmlTable(header, rowsOf(false), numeric)}\n<h3>States of the guiding and cladding layers</h3>\n${htmlTable(header, guide, numeric)}`
      : htmlTable(header, rowsOf(false), numeric),
  };
}

export function transitionsSection(r: SolveResult, id = 'transitions'): Section {
  const strong = (x: number | undefined, min: number): boolean => x === undefined || !Number.isFinite(x) || Math.abs(x) >= min;
  const region = regionsOf(r);
  const ofWells = (label: string): boolean => label.split('-').every((l) => region.get(l) !== 'guide');
  const inter = r.transitions.filter((t) => t.kind === 'interband' && strong(t.overlap2, MIN_OVERLAP2));
  const isb = r.transitions.filter((t) => t.kind === 'intersubband' && strong(t.oscillator_strength, MIN_OSCILLATOR_STRENGTH));
  const omitted = r.transitions.length - inter.length - isb.length;
  const interTable = (lines: typeof inter): string => htmlTable(['transition', 'energy (eV)', 'wavelength (nm)', 'overlap²', 'exciton binding (meV)'],
    lines.map((t) => [t.label, inUnit(t.energy_eV, 'eV'), inUnit(t.wavelength_nm, 'nm'), inUnit(t.overlap2, ''), inUnit((t.exciton_binding_eV ?? NaN) * 1000, 'meV')]), [1, 2, 3, 4]);
  const parts: string[] = [];
  const wellLines = inter.filter((t) => ofWells(t.label));
  const guideLines = inter.filter((t) => !ofWells(t.label));
  if (wellLines.length > 0) parts.push(`<h3>Interband${guideLines.length ? ', between well states' : ''}</h3>`, interTable(wellLines));
  if (guideLines.length > 0) parts.push('<h3>Interband, involving guiding or cladding-layer states</h3>', interTable(guideLines));
  if (isb.length > 0) {
    parts.push('<h3>Intersubband</h3>', htmlTable(['transition', 'energy (meV)', 'wavelength (µm)', 'wavenumber (cm⁻¹)', 'dipole (nm)', 'oscillator strength'],
      isb.map((t) => [t.label, inUnit(t.energy_eV * 1000, 'meV'), inUnit(t.wavelength_nm / 1000, 'µm'), inUnit(t.wavenumber_per_cm, 'cm⁻¹'), fixed(t.dipole_nm, 4), inUnit(t.oscillator_strength, '')]), [1, 2, 3, 4, 5]));
  }
  return {
    id, title: 'Transitions',
    lead: `Allowed transitions: interband with envelope overlap² ≥ ${MIN_OVERLAP2}, intersubband with oscillator strength ≥ ${MIN_OSCILLATOR_STRENGTH}${omitted > 0 ? ` (${omitted} weaker pairs left out; "wellsmith solve --json" lists all)` : ''}.`,
    html: parts.length > 0 ? parts.join('\n') : '<p>No transition: a band has no bound state.</p>' };
}

export async function dosSection(r: SolveResult, id = 'dos'): Promise<Section> {
  const rows = BANDS.flatMap((b) => r.dos.bands[b].map((d) => [d.label, inUnit(d.edge_eV, 'eV'), inUnit(d.mass_inplane, 'm0'), inUnit(d.step_per_cm2_per_eV, 'cm⁻² eV⁻¹')]));
  return {
    id, title: 'Density of states',
    lead: 'Two-dimensional staircase Σ m∥/(πħ²) Θ(E − Eₙ) per band (spin included) and the bulk envelope g3(E)·L of the confining layers (total width L, given in each panel\'s title) with the density-of-states mass (m∥² m_z)^(1/3).',
    html: `${figureHtml(await renderSvg(dosSpec(r)), 'DOS (10¹³ cm⁻² eV⁻¹) versus energy into each band from its edge (meV).')}\n${htmlTable(['subband', 'edge (eV)', 'm∥ (m0)', 'step (cm⁻² eV⁻¹)'], rows, [1, 2, 3])}`,
  };
}

const evaluationRow = (e: Evaluation): string[] =>
  [e.label, e.achieved === null ? 'missing' : withUnit(e.achieved, e.unit), withUnit(e.goal, e.unit), e.residual.toFixed(3), e.satisfied ? 'yes' : 'no'];

export function targetsSection(scored: Scored, id = 'targets'): Section {
  return {
    id, title: 'Targets',
    lead: `Residuals in window half-widths: |r| ≤ 1 meets a target. Loss Σ w·r² = ${sig(scored.loss, 4)}; ${scored.satisfied ? 'every target met' : 'NOT every target met'}.`,
    html: htmlTable(['target', 'achieved', 'goal', 'residual', 'met'], scored.evaluations.map(evaluationRow), [3]),
  };
}

export function growthSection(g: GrowthSheet, id = 'growth'): Section {
  const rows = g.rows.map((r) => [String(r.index + 1), r.label, r.formula, fixed(r.thickness_nm, 3), fixed(r.monolayers, 2), r.source,
    r.rate_ml_per_s === null ? '–' : fixed(r.rate_ml_per_s, 4), r.rate_nm_per_s === null ? '–' : fixed(r.rate_nm_per_s, 4), r.time_s === null ? '–' : fixed(r.time_s, 1), r.note]);
  return {
    id, title: 'Growth sheet',
    lead: `Shutter time = thickness in monolayers / growth rate (ML/s); alloy rates are the sum of their group-III binaries' rates. Total ${g.total_s === null ? '– (a layer lacks a rate)' : `${fixed(g.total_s, 1)} s`}.`,
    html: htmlTable(['#', 'layer', 'material', 'thickness (nm)', 'ML', 'rate from', 'rate (ML/s)', 'rate (nm/s)', 'shutter (s)', 'note'], rows, [0, 3, 4, 6, 7, 8]),
  };
}

async function solveSections(r: SolveResult): Promise<Section[]> {
  const valence = await valenceSection(r);
  return [structureSection(r), await bandSection(r), ...(valence ? [valence] : []), statesSection(r), transitionsSection(r), await dosSection(r), ...(r.optics ? [await opticsSection(r.optics)] : [])];
}

type Builder<K extends ReportInput['kind']> = (input: Extract<ReportInput, { kind: K }>) => Promise<readonly Section[]>;

/** One section builder per result kind. */
export const SECTION_BUILDERS: { readonly [K in ReportInput['kind']]: Builder<K> } = {
  solve: async (input) => [
    ...(input.scored ? [targetsSection(input.scored)] : []),
    ...(await solveSections(input.result)),
    ...('selfConsistent' in input.result ? await dopingSections(input.result as DopedSpecResult) : []),
    ...(input.tolerance ? [await toleranceSection(input.tolerance)] : []),
    ...(input.growth ? [growthSection(input.growth)] : []),
  ],
  tolerance: async (input) => [await toleranceSection(input.report)],
  wire: (input) => wireSections(input.result),
  campaign: (input) => campaignSections(input.report),
  design: async (input) => {
    const first = input.designs[0]!;
    const header = ['rank', ...first.variables.map((v) => (v.kind === 'fraction' ? v.name : `${v.name} (nm / ML)`)), ...first.targets.map((e) => e.label), 'loss', 'all met', 'h_c margin'];
    const rows = input.designs.map((d) => [String(d.rank),
      ...d.variables.map((v) => `${v.kind === 'fraction' ? v.value.toFixed(3) : `${fixed(v.nm, 3)} / ${fixed(v.ml, 1)}`}${v.atBound ? ` (${v.atBound} bound)` : ''}`),
      ...d.targets.map((e) => (e.achieved === null ? 'missing' : `${withUnit(e.achieved, e.unit)} (r = ${e.residual >= 0 ? '+' : ''}${e.residual.toFixed(2)})`)),
      sig(d.loss, 3), d.satisfied ? 'yes' : 'no', `${fixed(d.critical_thickness_margin * 100, 0)} %`]);
    const ranking: Section = {
      id: 'ranking', title: 'Ranked designs',
      lead: `${input.starts} starts, seed ${input.seed}; residuals r in window half-widths (|r| ≤ 1 meets a target). The sections below show design 1.`,
      html: htmlTable(header, rows, [0]),
    };
    return [ranking, ...(await solveSections(input.best))];
  },
};

/** The sections of any report input, dispatched on its kind. */
export function sectionsOf(input: ReportInput): Promise<readonly Section[]> {
  switch (input.kind) {
    case 'solve': return SECTION_BUILDERS.solve(input);
    case 'design': return SECTION_BUILDERS.design(input);
    case 'tolerance': return SECTION_BUILDERS.tolerance(input);
    case 'wire': return SECTION_BUILDERS.wire(input);
    case 'campaign': return SECTION_BUILDERS.campaign(input);
  }
}
