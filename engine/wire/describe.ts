/** Human table and machine-readable form of a wire solve, for `wellsmith solve` on a wire spec. */
import type { BandName } from '../profile.js';
import { fixed, inUnit, sig, table } from '../text.js';
import { describeModels } from '../structure.js';
import { describeOffsetRule } from '../lineup.js';
import type { WireSolveResult } from './solve.js';

const BANDS: readonly BandName[] = ['electron', 'heavy_hole', 'light_hole'];

/** |d| of a dipole (nm) to 0.1 pm: its sign follows the arbitrary signs of the two envelopes. */
export const magnitude = (d: number | undefined): string => fixed(d === undefined ? d : Math.abs(d), 4);

/** Everything but the |ψ|² maps and the sampled DOS curves unless `maps` is set. */
export function wireJson(r: WireSolveResult, maps: boolean): unknown {
  if (maps) return r;
  const { maps: _maps, dos, ...rest } = r;
  const { curves: _curves, ...steps } = dos;
  return { ...rest, dos: steps };
}

export function describeWire(r: WireSolveResult): string {
  const s = r.structure;
  const out: string[] = [];
  if (s.title) out.push(s.title, '');
  out.push(
    `T = ${s.temperature_K} K · substrate ${s.substrate ?? 'none (unstrained)'} · ${s.shape} wire · grid ${s.settings.grid_nm} nm (refined, extrapolated) · margin ${s.settings.margin_nm} nm`,
    `offsets: ${describeOffsetRule(s.offsetRule)}; strain: each material pseudomorphic on the substrate as a (001) layer (wire strain not modelled)`,
    `models: ${describeModels(s.models)}`,
    table(['#', 'where', 'material', 'Ec eV', 'Ehh eV', 'Elh eV', 'ε∥ %'],
      s.materials.map((m, i) => [String(i), m.field, m.formula, fixed(m.bands.Ec, 4), fixed(m.bands.Ehh, 4), fixed(m.bands.Elh, 4), fixed(m.material.strain_par * 100, 3)])),
    table(['dimension', 'nm'], Object.entries(s.dimensions).map(([k, v]) => [k, fixed(v, 3)])),
    '',
  );
  out.push(
    `axes: y = growth axis [001] (z in the report), x across the wire in the (001) plane; masses: diagonal tensor, holes 1/(γ1 ∓ 2γ2) along y and 1/(γ1 ± γ2) along x and the wire axis (no heavy/light-hole mixing); electrons ${r.settings.nonparabolic ? 'non-parabolic, m(E) = m(1 + α(E − V)) self-consistent per state' : 'parabolic (solver.nonparabolic: false)'}`,
    '',
    'Continuum threshold per band: a wire subband is bound below it (parent well: a drawn arm, stem or rectangle extended without end, solved exactly in 1-D)',
    table(['band', 'threshold eV', 'set by', 'barrier edge eV'], BANDS.map((b) => {
      const t = r.bands[b].threshold;
      return [b.replace('_', ' '), fixed(t.energy_eV, 5), t.source === 'barrier' ? 'barrier edge' : `${t.field} (parent well)`, fixed(t.barrierEdge_eV, 5)];
    })),
  );
  const wells = BANDS.flatMap((b) => r.bands[b].threshold.parentWells.map((w) => [b.replace('_', ' '), w.field, w.formula, `${fixed(w.thickness_nm, 2)} along ${w.across}`, fixed(w.mass, 4), w.ground_eV === null ? 'none bound' : fixed(w.ground_eV, 5)]));
  if (wells.length > 0) out.push(table(['band', 'parent well', 'material', 'thickness nm', 'mass across m0', 'lowest level eV'], wells));
  out.push('');
  const rows = BANDS.flatMap((b) => r.bands[b].states.map((x) => [b.replace('_', ' '), x.label, fixed(x.energy_eV, 5), fixed(x.confinement_meV, 2), fixed(x.binding_meV, 2), fixed(x.mass_axis, 4)]));
  out.push('Wire subbands (absolute scale; confinement from the band extremum in the cross-section; binding below the threshold)', table(['band', 'state', 'energy eV', 'confinement meV', 'binding meV', 'm_axis m0'], rows));
  out.push(`error estimate meV: ${BANDS.map((b) => `${b.replace('_', ' ')} ${sig(r.bands[b].errorEstimate_meV, 2)}`).join(', ')}`, '');
  const parent = BANDS.flatMap((b) => r.bands[b].parentWellStates.map((x) => [b.replace('_', ' '), x.label, fixed(x.energy_eV, 5), fixed(x.binding_meV, 2), x.where, fixed(x.share, 2)]));
  if (parent.length > 0) {
    out.push(
      'States of the parent wells: at or above the threshold (within the error estimate), set by the drawn lengths; not wire subbands, never read by targets',
      table(['band', 'state', 'energy eV', 'below threshold meV', 'mostly in', 'share'], parent),
      '',
    );
  }
  const spacing = BANDS.flatMap((b) => r.bands[b].states.slice(1).map((x, k) => [`${r.bands[b].states[k]!.label}-${x.label}`, fixed(Math.abs(x.energy_eV - r.bands[b].states[k]!.energy_eV) * 1000, 2)]));
  if (spacing.length > 0) out.push('Subband spacings', table(['pair', 'meV'], spacing), '');
  const inter = r.transitions.filter((t) => t.kind === 'interband');
  if (inter.length > 0) out.push('Interband transitions', table(['transition', 'energy eV', 'wavelength nm', 'overlap²'], inter.map((t) => [t.label, fixed(t.energy_eV, 5), fixed(t.wavelength_nm, 2), fixed(t.overlap2, 4)])), '');
  const isb = r.transitions.filter((t) => t.kind === 'intersubband' && t.label.startsWith('e1-'));
  if (isb.length > 0) {
    out.push(
      'Intersubband transitions from e1 (all pairs in --json): dipoles across the wire, x in the growth plane and y along growth; oscillator strength f per polarisation, normalised as for wells (Σ_j f = 1 for a parabolic band)',
      table(['transition', 'energy meV', 'wavelength µm', 'wavenumber cm⁻¹', '|x_ij| nm', '|y_ij| nm', 'f (x-pol.)', 'f (y-pol.)'],
        isb.map((t) => [t.label, inUnit(t.energy_eV * 1000, 'meV'), inUnit(t.wavelength_nm / 1000, 'µm'), inUnit(t.wavenumber_per_cm, 'cm⁻¹'), magnitude(t.dipole_x_nm), magnitude(t.dipole_y_nm), inUnit(t.oscillator_strength_x, ''), inUnit(t.oscillator_strength_y, '')])),
      '',
    );
  }
  const dosRows = BANDS.flatMap((b) => r.dos.bands[b].map((d) => [d.label, fixed(d.edge_eV, 5), fixed(d.mass_axis, 4), sig(d.prefactor_per_cm_per_sqrt_eV, 4)]));
  out.push('1-D density of states: g1 = Σ √(2m)/(πħ) (E − Eₙ)^(−1/2) (states cm⁻¹ eV⁻¹, spin included)', table(['subband', 'edge eV', 'm_axis m0', '√(2m)/(πħ) cm⁻¹ eV^-½'], dosRows));
  if (r.status !== 'ok') out.push('', `status: ${r.status}: ${r.message}`);
  return out.join('\n');
}
