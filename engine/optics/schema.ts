/**
 * The `optics:` section of a spec (zod) and its conversion into the settings the optical spectra
 * take, with every field named in its errors. Also the quantity parsers the section and the gain
 * targets share: times (ps), gains (cm⁻¹).
 */
import { z } from 'zod';
import { InputError } from '../errors.js';
import { parsePhotonEnergy, parseSheetDensity, splitQuantity } from '../input/units.js';
import { LINESHAPES, type LineshapeKind } from './lineshape.js';

/** An injected population: electron and hole sheet densities (cm⁻², ≥ 0; 0 and 0 is the unpumped well). */
export interface Population {
  readonly electrons_cm2: number;
  readonly holes_cm2: number;
}

const quantity = z.union([z.number(), z.string()]);

const population = z.union([
  quantity,
  z.object({ electrons: quantity.describe('Electron sheet density, e.g. "2e12 cm-2"'), holes: quantity.describe('Hole sheet density') }).strict(),
]);

export const opticsSchema = z
  .object({
    densities: z.array(population).min(1).max(64).optional().describe('Injected sheet densities of the spectra: "2e12 cm-2" (n = p) or { electrons, holes }; default carriers.sheet_density, else 1, 2, 3 and 4 × 10¹² cm⁻²'),
    lineshape: z.enum(LINESHAPES as [LineshapeKind, ...LineshapeKind[]]).optional().describe('Intraband broadening: sech (Chinn, Zory & Reisinger 1988; default), lorentzian, or delta (none)'),
    intraband_time: quantity.optional().describe('Intraband relaxation time τ_in, Γ = ħ/τ_in; default "0.1 ps"'),
    refractive_index: z.number().positive().optional().describe('Background refractive index of the well; default Adachi\'s 1982 model for the well material at the band-edge line'),
    kane_energy: quantity.optional().describe('Kane energy Ep for every layer, e.g. "25 eV"; default each material\'s (VMR2001; custom materials from their electron mass)'),
    band_gap_renormalisation: z.boolean().optional().describe('Shift every transition by the universal 2-D law ΔEg = −3.1 (n a_B²)^(1/3) Ry* (Schmitt-Rink, Ell & Haug 1986); default false'),
    photon_energies: z.object({ from: quantity, to: quantity, points: z.number().int().min(2).max(4001).optional() }).strict().optional()
      .describe('Spectral range: energies or wavelengths ("1.20 eV", "1000 nm"), with the number of points (default 301); default from 50 meV below to 250 meV above the band-edge line'),
    gain_curve: z.object({ from: quantity, to: quantity, points: z.number().int().min(3).max(200).optional() }).strict().optional()
      .describe('Densities of the gain–density curve and its logarithmic fit (log-spaced, default 12 points); default from the transparency density to five times it'),
  })
  .strict()
  .describe('Optical spectra of the well (gain TE/TM, absorption, spontaneous emission) reported by solve and the report');

export type OpticsSpec = z.infer<typeof opticsSchema>;

/** Settings of the optical spectra, in engine units. */
export interface OpticsSettings {
  /** Densities of the spectra; undefined: the caller's default. */
  readonly populations?: readonly Population[];
  readonly lineshape: LineshapeKind;
  readonly tau_ps: number;
  readonly refractiveIndex?: number;
  readonly kaneEnergy_eV?: number;
  readonly renormalisation: boolean;
  readonly photon?: { readonly from_eV: number; readonly to_eV: number; readonly points: number };
  readonly curve?: { readonly from_cm2: number; readonly to_cm2: number; readonly points: number };
}

export const DEFAULT_LINESHAPE: LineshapeKind = 'sech';
export const DEFAULT_TAU_PS = 0.1;
export const DEFAULT_PHOTON_POINTS = 301;
export const DEFAULT_CURVE_POINTS = 12;

const bad = (field: string, message: string): never => {
  throw new InputError('bad-value', `${field}: ${message}`, field);
};

/** A time in ps ("0.1 ps", "100 fs"; a bare number is ps). */
export function parseTime(raw: string | number, field: string): number {
  const q = splitQuantity(raw);
  const scale: Readonly<Record<string, number>> = { '': 1, ps: 1, fs: 1e-3, ns: 1e3 };
  const s = q ? scale[q.unit] : undefined;
  if (!q || s === undefined || !(q.value > 0)) return bad(field, `expected a positive time such as "0.1 ps", got ${JSON.stringify(raw)}`);
  return q.value * s;
}

/** A gain or absorption coefficient in cm⁻¹ ("1500 cm-1", "15 /mm"; a bare number is cm⁻¹). */
export function parseGain(raw: string | number, field: string): number {
  const q = splitQuantity(raw);
  const scale: Readonly<Record<string, number>> = { '': 1, 'cm-1': 1, 'cm^-1': 1, 'cm⁻¹': 1, '/cm': 1, '/mm': 10, 'mm-1': 10, '/m': 0.01, 'm-1': 0.01 };
  const s = q ? scale[q.unit] : undefined;
  if (!q || s === undefined || !Number.isFinite(q.value)) return bad(field, `expected a gain such as "1500 cm-1", got ${JSON.stringify(raw)}`);
  return q.value * s;
}

/** A sheet density in cm⁻², or an InputError naming the field. */
export function sheetDensityOf(raw: string | number, field: string): number {
  const n = parseSheetDensity(raw);
  return typeof n === 'string' ? bad(field, n) : n;
}

/** A photon energy in eV from an energy or a wavelength. */
function photonOf(raw: string | number, field: string): number {
  const p = parsePhotonEnergy(raw);
  return typeof p === 'string' ? bad(field, p) : p.eV;
}

/** The settings of an `optics:` section (absent: the defaults); field names start with `optics.`. */
export function opticsSettings(section: OpticsSpec | undefined): OpticsSettings {
  const s = section ?? {};
  const populations = s.densities?.map((d, i): Population => {
    const field = `optics.densities[${i}]`;
    if (typeof d === 'object') return { electrons_cm2: sheetDensityOf(d.electrons, `${field}.electrons`), holes_cm2: sheetDensityOf(d.holes, `${field}.holes`) };
    const n = sheetDensityOf(d, field);
    return { electrons_cm2: n, holes_cm2: n };
  });
  let photon: OpticsSettings['photon'];
  if (s.photon_energies) {
    const a = photonOf(s.photon_energies.from, 'optics.photon_energies.from');
    const b = photonOf(s.photon_energies.to, 'optics.photon_energies.to');
    if (a === b) bad('optics.photon_energies', `from and to must differ, got ${JSON.stringify(s.photon_energies.from)} twice`);
    photon = { from_eV: Math.min(a, b), to_eV: Math.max(a, b), points: s.photon_energies.points ?? DEFAULT_PHOTON_POINTS };
  }
  let curve: OpticsSettings['curve'];
  if (s.gain_curve) {
    const a = sheetDensityOf(s.gain_curve.from, 'optics.gain_curve.from');
    const b = sheetDensityOf(s.gain_curve.to, 'optics.gain_curve.to');
    if (!(b > a)) bad('optics.gain_curve.to', `must exceed from, got ${JSON.stringify(s.gain_curve.to)}`);
    curve = { from_cm2: a, to_cm2: b, points: s.gain_curve.points ?? DEFAULT_CURVE_POINTS };
  }
  let kaneEnergy_eV: number | undefined;
  if (s.kane_energy !== undefined) {
    const q = splitQuantity(s.kane_energy);
    if (!q || !(q.unit === '' || q.unit === 'eV') || !(q.value > 0)) bad('optics.kane_energy', `expected a positive energy such as "25 eV", got ${JSON.stringify(s.kane_energy)}`);
    kaneEnergy_eV = q!.value;
  }
  return {
    ...(populations ? { populations } : {}),
    lineshape: s.lineshape ?? DEFAULT_LINESHAPE,
    tau_ps: s.intraband_time === undefined ? DEFAULT_TAU_PS : parseTime(s.intraband_time, 'optics.intraband_time'),
    ...(s.refractive_index !== undefined ? { refractiveIndex: s.refractive_index } : {}),
    ...(kaneEnergy_eV !== undefined ? { kaneEnergy_eV } : {}),
    renormalisation: s.band_gap_renormalisation ?? false,
    ...(photon ? { photon } : {}),
    ...(curve ? { curve } : {}),
  };
}
