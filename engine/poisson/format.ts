/**
 * The terminal text of a doped stack's solve, printed after the ordinary solve's tables by
 * `wellsmith solve`: the self-consistency (status, iterations, residual, boundary conditions), the
 * Fermi level(s) and the subbands' sheet densities, the absorption peak with its lines, and one row
 * per bias of a sweep. `--json` prints the result object itself.
 */
import { fixed, inUnit, sig, table, withUnit } from '../text.js';
import type { DopedSpecResult } from './doped.js';

export function describeDoped(r: DopedSpecResult): string {
  const sc = r.selfConsistent;
  const out: string[] = [];
  out.push(`Self-consistent solve (Hartree, ${sc.carriers}): ${sc.status} in ${sc.iterations} iterations, last change of the potential ${sig(sc.residual_eV, 2)} eV (tolerance ${sig(sc.tolerance_eV, 2)} eV, Anderson β ${sc.mixing} over the predictor–corrector step, mesh ${sc.mesh_nm} nm)`);
  out.push(`boundary: ${sc.boundary}`);
  out.push(`bias ${inUnit(r.bias.voltage_V, '')} V = ${fixed(r.bias.field_kV_per_cm, 2)} kV/cm; donors ${withUnit(sc.doping.donors_cm2, 'cm⁻²')}, acceptors ${withUnit(sc.doping.acceptors_cm2, 'cm⁻²')}, neutral to ${sig(sc.neutrality, 2)}`);
  out.push(sc.cells.length > 1
    ? `quasi-Fermi levels of the wells (eV): ${sc.cells.map((c) => `${fixed(c.from_nm, 1)}–${fixed(c.to_nm, 1)} nm ${inUnit(c.fermi_eV, 'eV')}`).join(', ')}`
    : `Fermi level ${inUnit(sc.fermi_eV, 'eV')} eV`);
  out.push(table(['subband', 'energy eV', 'm∥ m0', 'sheet density cm⁻²'], [...sc.subbands.map((s) => [s.label, inUnit(s.energy_eV, 'eV'), inUnit(s.mass_inplane, 'm0'), inUnit(s.density_cm2, 'cm⁻²')]), ['3-D gas', '–', '–', inUnit(sc.gas_cm2, 'cm⁻²')]]), '');
  const a = r.absorption;
  if (a && a.status === 'ok') {
    const o = a.options;
    out.push(`Intersubband absorption (${o.coupling}, n = ${o.refractiveIndex}, Lorentzian ${inUnit(o.linewidth_eV * 1000, 'meV')} meV${o.depolarisation ? ', depolarisation-shifted' : ''}; continuum: ${o.continuum_nm} nm each side, ${a.continuumStates} states): peak ${inUnit(a.peak_eV * 1000, 'meV')} meV = ${inUnit(a.peak_um, 'µm')} µm, ${inUnit(a.peak_absorption * 100, '%')} % per pass, FWHM ${inUnit(a.fwhm_meV, 'meV')} meV (${inUnit(a.fwhm_um, 'µm')} µm)`);
    out.push(table(['line', 'E meV', 'depolarised meV', 'z nm', 'n_i − n_j cm⁻²', 'peak %'], a.lines.slice(0, 8).map((l) => [l.label, inUnit(l.energy_eV * 1000, 'meV'), inUnit(l.shifted_eV * 1000, 'meV'), fixed(l.dipole_nm, 4), inUnit(l.population_cm2, 'cm⁻²'), inUnit(l.strength * 100, '%')])), '');
  } else if (a) out.push('Intersubband absorption: no bound subband holds carriers', '');
  if (r.sweep) {
    out.push('Bias sweep', table(['bias V', 'field kV/cm', 'status', 'iterations', 'E_F eV', 'e1 eV', 'e2 eV', 'peak µm', 'FWHM meV'], r.sweep.map((b) => {
      const e = (label: string): string => { const s = b.states.find((x) => x.label === label); return s ? `${inUnit(s.energy_eV, 'eV')}${s.bound ? '' : ' (quasi)'}` : '–'; };
      const ok = b.absorption && b.absorption.status === 'ok' ? b.absorption : undefined;
      return [inUnit(b.bias.voltage_V, ''), fixed(b.bias.field_kV_per_cm, 2), b.status, String(b.selfConsistent.iterations), inUnit(b.selfConsistent.fermi_eV, 'eV'), e('e1'), e('e2'), ok ? inUnit(ok.peak_um, 'µm') : '–', ok ? inUnit(ok.fwhm_meV, 'meV') : '–'];
    })), '');
  }
  return out.join('\n');
}
