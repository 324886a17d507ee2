/** Human table and machine-readable form of a wire solve, for `wellsmith solve` on a wire spec. */
import type { BandName } from '../profile.js';
import { fixed, sig, table } from '../cli/format.js';
import type { WireSolveResult } from './solve.js';

const BANDS: readonly BandName[] = ['electron', 'heavy_hole', 'light_hole'];

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
  const offsets = s.offsetRule.kind === 'absolute' ? s.offsetRule.source : `conduction-band share ${s.offsetRule.share} of ΔEg relative to ${s.offsetRule.reference}`;
  out.push(
    `T = ${s.temperature_K} K · substrate ${s.substrate ?? 'none (unstrained)'} · ${s.shape} wire · grid ${s.settings.grid_nm} nm (refined, extrapolated) · margin ${s.settings.margin_nm} nm`,
    `offsets: ${offsets}; strain: each material pseudomorphic on the substrate as a (001) layer (wire strain not modelled)`,
    table(['#', 'where', 'material', 'Ec eV', 'Ehh eV', 'Elh eV', 'ε∥ %'],
      s.materials.map((m, i) => [String(i), m.field, m.formula, fixed(m.bands.Ec, 4), fixed(m.bands.Ehh, 4), fixed(m.bands.Elh, 4), fixed(m.material.strain_par * 100, 3)])),
    table(['dimension', 'nm'], Object.entries(s.dimensions).map(([k, v]) => [k, fixed(v, 3)])),
    '',
  );
  const rows = BANDS.flatMap((b) => r.bands[b].states.map((x) => [b.replace('_', ' '), x.label, fixed(x.energy_eV, 5), fixed(x.confinement_meV, 2), fixed(x.mass_axis, 4)]));
  out.push('Subband edges (absolute scale; confinement from the band extremum in the cross-section)', table(['band', 'state', 'energy eV', 'confinement meV', 'm_axis m0'], rows));
  out.push(`error estimate meV: ${BANDS.map((b) => `${b.replace('_', ' ')} ${sig(r.bands[b].errorEstimate_meV, 2)}`).join(', ')}`, '');
  const spacing = BANDS.flatMap((b) => r.bands[b].states.slice(1).map((x, k) => [`${r.bands[b].states[k]!.label}-${x.label}`, fixed(Math.abs(x.energy_eV - r.bands[b].states[k]!.energy_eV) * 1000, 2)]));
  if (spacing.length > 0) out.push('Subband spacings', table(['pair', 'meV'], spacing), '');
  const inter = r.transitions.filter((t) => t.kind === 'interband');
  if (inter.length > 0) out.push('Interband transitions', table(['transition', 'energy eV', 'wavelength nm', 'overlap²'], inter.map((t) => [t.label, fixed(t.energy_eV, 5), fixed(t.wavelength_nm, 2), fixed(t.overlap2, 4)])), '');
  const dosRows = BANDS.flatMap((b) => r.dos.bands[b].map((d) => [d.label, fixed(d.edge_eV, 5), fixed(d.mass_axis, 4), sig(d.prefactor_per_cm_per_sqrt_eV, 4)]));
  out.push('1-D density of states: g1 = Σ √(2m)/(πħ) (E − Eₙ)^(−1/2) (states cm⁻¹ eV⁻¹, spin included)', table(['subband', 'edge eV', 'm_axis m0', '√(2m)/(πħ) cm⁻¹ eV^-½'], dosRows));
  if (r.status !== 'ok') out.push('', `status: ${r.status}: ${r.message}`);
  return out.join('\n');
}
