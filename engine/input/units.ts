/**
 * Quantities with units as they appear in spec files ("10 nm", "35 ML", "300 K", "976 nm",
 * "9 µm", "1100 cm-1", "120 meV", "20 kV/cm"). Each kind converts to the engine's unit:
 * length nm (or whole monolayers, resolved later against the layer's own lattice), temperature K,
 * photon targets eV, field kV/cm.
 */
import { HC_EV_NM } from '../constants.js';

export type Length = { readonly nm: number } | { readonly ml: number };

const NUMBER = String.raw`([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)`;
const QUANTITY = new RegExp(String.raw`^\s*${NUMBER}\s*([^\s\d].*?)?\s*$`);

/** Parsed quantity strings: a search re-reads the same few spec strings at every evaluation. */
const parsed = new Map<string, { readonly value: number; readonly unit: string } | null>();

/** Splits "10 nm" into 10 and "nm"; a bare number gives unit ''. Returns null when not a quantity. */
export function splitQuantity(input: string | number): { readonly value: number; readonly unit: string } | null {
  if (typeof input === 'number') return Number.isFinite(input) ? { value: input, unit: '' } : null;
  const hit = parsed.get(input);
  if (hit !== undefined) return hit;
  const m = QUANTITY.exec(input);
  const value = m ? Number(m[1]) : NaN;
  const q = m && Number.isFinite(value) ? { value, unit: (m[2] ?? '').trim() } : null;
  if (parsed.size >= 4096) parsed.clear();
  parsed.set(input, q);
  return q;
}

/** Whether a quantity is written without a unit: a number, or text holding only a number. */
export const isUnitless = (input: string | number | undefined): boolean => input !== undefined && splitQuantity(input)?.unit === '';

/**
 * The note for a quantity written without a unit, which is read in the key's default unit
 * (`unit`); null when it has a unit. wellsmith's rule: a bare number is read in the key's one
 * default unit (lengths nm, energies eV, temperatures K, fields kV/cm, wavelengths nm, wavenumbers
 * cm⁻¹, sheet densities cm⁻²) and a warning says so; keys whose unit is ambiguous (a strain in % or
 * as a fraction, a spread in nm or meV) refuse it.
 */
export function unitlessNote(input: string | number | undefined, unit: string): string | null {
  if (!isUnitless(input)) return null;
  const v = splitQuantity(input!)!.value;
  return `${JSON.stringify(input)} has no unit and is read as ${v} ${unit}; write "${v} ${unit}" (or another unit) to say so`;
}

const LENGTH_UNITS: Readonly<Record<string, number>> = { nm: 1, 'Å': 0.1, A: 0.1, angstrom: 0.1, um: 1000, 'µm': 1000, 'μm': 1000 };

/** A thickness or width: nm (also a bare number), Å or ML. Returns a message on failure. */
export function parseLength(input: string | number): Length | string {
  const q = splitQuantity(input);
  if (!q) return `expected a length such as "10 nm", "50 Å" or "35 ML", got ${JSON.stringify(input)}`;
  if (q.unit === 'ML' || q.unit === 'ml') return { ml: q.value };
  const scale = q.unit === '' ? 1 : LENGTH_UNITS[q.unit];
  if (scale === undefined) return `unknown length unit "${q.unit}" in ${JSON.stringify(input)}; use nm, Å or ML`;
  return { nm: q.value * scale };
}

/** A temperature in K (bare number = K; "°C"/"C" converted). */
export function parseTemperature(input: string | number): number | string {
  const q = splitQuantity(input);
  if (!q) return `expected a temperature such as "300 K", got ${JSON.stringify(input)}`;
  if (q.unit === '' || q.unit === 'K') return q.value;
  if (q.unit === '°C' || q.unit === 'C') return q.value + 273.15;
  return `unknown temperature unit "${q.unit}" in ${JSON.stringify(input)}; use K`;
}

/** An electric field in kV/cm (bare number = kV/cm; V/cm and MV/m accepted). */
export function parseField(input: string | number): number | string {
  const q = splitQuantity(input);
  if (!q) return `expected a field such as "20 kV/cm", got ${JSON.stringify(input)}`;
  const scale: Readonly<Record<string, number>> = { '': 1, 'kV/cm': 1, 'V/cm': 1e-3, 'MV/m': 10, 'kV/m': 1e-5 };
  const s = scale[q.unit];
  if (s === undefined) return `unknown field unit "${q.unit}" in ${JSON.stringify(input)}; use kV/cm`;
  return q.value * s;
}

/**
 * A photon or transition energy target in eV, from an energy (eV, meV), a wavelength (nm, µm)
 * or a wavenumber (cm-1). λ[nm] = 1239.84198 / E[eV] (CODATA 2018).
 */
export function parsePhotonEnergy(input: string | number): { eV: number; kind: 'energy' | 'wavelength' | 'wavenumber' } | string {
  const q = splitQuantity(input);
  if (!q || q.value <= 0) return `expected a positive energy, wavelength or wavenumber such as "976 nm", "9 µm", "120 meV" or "1100 cm-1", got ${JSON.stringify(input)}`;
  switch (q.unit) {
    case 'eV': return { eV: q.value, kind: 'energy' };
    case 'meV': return { eV: q.value / 1000, kind: 'energy' };
    case 'nm': return { eV: HC_EV_NM / q.value, kind: 'wavelength' };
    case 'um': case 'µm': case 'μm': return { eV: HC_EV_NM / (q.value * 1000), kind: 'wavelength' };
    case 'cm-1': case 'cm^-1': case 'cm⁻¹': case '/cm': return { eV: (q.value * HC_EV_NM) / 1e7, kind: 'wavenumber' };
    default: return `unknown unit "${q.unit}" in ${JSON.stringify(input)}; use eV, meV, nm, µm or cm-1`;
  }
}

/** An energy difference in eV (eV or meV; bare number = eV). */
export function parseEnergy(input: string | number): number | string {
  const q = splitQuantity(input);
  if (!q) return `expected an energy such as "25 meV", got ${JSON.stringify(input)}`;
  if (q.unit === '' || q.unit === 'eV') return q.value;
  if (q.unit === 'meV') return q.value / 1000;
  return `unknown energy unit "${q.unit}" in ${JSON.stringify(input)}; use eV or meV`;
}

/** A sheet density in cm⁻² ("2e12 cm-2", "2e12 /cm2"; a bare number is cm⁻²). */
export function parseSheetDensity(input: string | number): number | string {
  const q = splitQuantity(input);
  if (!q || !(q.value > 0)) return `expected a positive sheet density such as "2e12 cm-2", got ${JSON.stringify(input)}`;
  if (/^(|cm-2|cm\^-2|cm⁻²|\/cm2|\/cm\^2)$/.test(q.unit)) return q.value;
  return `unknown sheet-density unit "${q.unit}" in ${JSON.stringify(input)}; use cm-2`;
}
