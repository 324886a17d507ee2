/**
 * Carriers in a wire's subbands: line density at a Fermi level and its inverse, at the
 * structure's temperature, by lineDensity / fermiLevelForLineDensity (engine/observables/carriers.ts):
 * n1D = Σₙ √(2mₙkTπ)/(πħ) F₋½((E_F − Eₙ)/kT) with mₙ the axis mass. Holes are handled in the
 * particle sense there; here every energy is on the absolute scale (eV). Densities per cm.
 */
import { InputError } from '../errors.js';
import { fermiLevelForLineDensity, lineDensity } from '../observables/carriers.js';
import type { BandName } from '../profile.js';
import type { WireSolveResult } from './solve.js';

function subbandsOf(r: WireSolveResult, band: BandName): { sign: number; subbands: { energy: number; mass: number }[] } {
  const sign = band === 'electron' ? 1 : -1;
  const states = r.bands[band].states;
  if (states.length === 0) throw new InputError('bad-value', `${band}: has no bound subband, got status "${r.status}"; choose a band with bound states`);
  return { sign, subbands: states.map((s) => ({ energy: sign * s.energy_eV, mass: s.mass_axis })) };
}

/** Carriers per cm of a band's bound subbands at an absolute Fermi (quasi-Fermi) level (eV). */
export function wireLineDensity(r: WireSolveResult, band: BandName, fermiLevel_eV: number): number {
  const { sign, subbands } = subbandsOf(r, band);
  return lineDensity({ subbands, fermiLevel_eV: sign * fermiLevel_eV, temperature_K: r.structure.temperature_K });
}

/** Absolute Fermi (quasi-Fermi) level (eV) at which a band holds `density_cm1` carriers per cm. */
export function wireFermiLevel(r: WireSolveResult, band: BandName, density_cm1: number): number {
  const { sign, subbands } = subbandsOf(r, band);
  return sign * fermiLevelForLineDensity({ subbands, density_cm1, temperature_K: r.structure.temperature_K });
}
