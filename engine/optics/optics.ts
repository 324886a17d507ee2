/**
 * Optical spectra of a solved well, as `solve` and the report present them: gain (TE, TM) at each
 * requested density, the absorption of the unpumped well, spontaneous emission and the radiative
 * current, the peak gain and its wavelength, differential gain, the transparency density and the
 * gain–density curve with its logarithmic fit. Every model choice is recorded in the result.
 */
import { HC_EV_NM } from '../constants.js';
import { InputError } from '../errors.js';
import type { SolveResult } from '../solve.js';
import { opticalBands, type OpticalBandOptions, type OpticalBands } from './bands.js';
import { differentialGain, gainPeak, logFit, transparencyDensity, type GainPeak, type LogFit, type Polarisation } from './figures.js';
import { lineshape, type LineshapeKind } from './lineshape.js';
import { wellIndex, type RefractiveIndex } from './refractive.js';
import { BGR_COEFFICIENT, gapShift } from './renormalisation.js';
import { DEFAULT_CURVE_POINTS, DEFAULT_PHOTON_POINTS, opticsSettings, sheetDensityOf, type OpticsSettings, type OpticsSpec, type Population } from './schema.js';
import { SpectrumEngine, type Levels } from './spectra.js';

/** Default spectral range around the band-edge line (eV): below it, and above it. */
export const PHOTON_BELOW_EV = 0.05;
export const PHOTON_ABOVE_EV = 0.25;
/** Default densities of the spectra when neither the optics section nor carriers give one (cm⁻²). */
export const DEFAULT_DENSITIES_CM2 = [1e12, 2e12, 3e12, 4e12];

/** Everything needed to evaluate spectra of one structure: its bands, the engine and the gap shift law. */
export interface OpticsContext {
  readonly bands: OpticalBands;
  readonly engine: SpectrumEngine;
  readonly refractive: RefractiveIndex;
  /** Band-gap renormalisation (eV) of a population; 0 when off. */
  readonly shiftOf: (p: Population) => number;
}

/** Uniform photon grid of the settings, or the default range around the band-edge line with `points` points. */
function photonGrid(bands: OpticalBands, settings: OpticsSettings, points: number): Float64Array {
  const p = settings.photon ?? { from_eV: bands.edge_eV - PHOTON_BELOW_EV, to_eV: bands.edge_eV + PHOTON_ABOVE_EV, points };
  return Float64Array.from({ length: p.points }, (_, i) => p.from_eV + ((p.to_eV - p.from_eV) * i) / (p.points - 1));
}

/**
 * Bands, engine and renormalisation of a solve for these settings, or null when a band has no
 * bound state or T = 0; `defaultPoints` is the size of the default photon grid. Throws InputError when the
 * refractive index cannot be found (custom well material).
 */
export function opticsContext(r: SolveResult, settings: OpticsSettings, bandOptions: OpticalBandOptions = {}, defaultPoints = DEFAULT_PHOTON_POINTS): OpticsContext | null {
  // Quasi-Fermi levels need a temperature: at 0 K there are no spectra to give (a result, not an error).
  if (!(r.structure.temperature_K > 0)) return null;
  const bands = opticalBands(r, { ...bandOptions, ...(settings.kaneEnergy_eV !== undefined ? { kaneEnergy_eV: settings.kaneEnergy_eV } : {}) });
  if (!bands) return null;
  const refractive = wellIndex(r.structure.layers[bands.wells[0]!]!, bands.edge_eV, settings.refractiveIndex);
  if (!(refractive.value > 0)) throw new InputError('bad-value', `optics.refractive_index: ${refractive.source}, e.g. refractive_index: 3.5`, 'optics.refractive_index');
  const engine = new SpectrumEngine(bands, { photon_eV: photonGrid(bands, settings, defaultPoints), lineshape: lineshape(settings.lineshape, settings.tau_ps), refractiveIndex: refractive.value });
  const shiftOf = settings.renormalisation
    ? (p: Population): number => gapShift(0.5 * (p.electrons_cm2 + p.holes_cm2), bands.reducedMass, bands.permittivity)
    : (): number => 0;
  if (settings.renormalisation && !Number.isFinite(bands.permittivity)) {
    throw new InputError('bad-value', 'optics.band_gap_renormalisation: the well material has no static permittivity (a custom material without "permittivity"); give it, or turn renormalisation off', 'optics.band_gap_renormalisation');
  }
  return { bands, engine, refractive, shiftOf };
}

/** The spectra of one density. */
export interface DensitySpectrum {
  readonly electrons_cm2: number;
  readonly holes_cm2: number;
  /** Quasi-Fermi levels (eV, absolute) and their separation. */
  readonly electron_quasi_fermi_eV: number;
  readonly hole_quasi_fermi_eV: number;
  readonly separation_eV: number;
  /** Transition shift by band-gap renormalisation (eV; 0 when off). */
  readonly gap_shift_eV: number;
  readonly gain_te_per_cm: Float64Array;
  readonly gain_tm_per_cm: Float64Array;
  /** Spontaneous emission per unit area, photon energy and time (cm⁻² s⁻¹ eV⁻¹). */
  readonly spontaneous_per_cm2_s_eV: Float64Array;
  readonly radiative_current_A_per_cm2: number;
  readonly peak_te: GainPeak;
  readonly peak_tm: GainPeak;
  /** ∂g/∂N at the TE peak (cm²), N the 3-D density (sheet density / well thickness). */
  readonly differential_gain_te_cm2: number;
}

export interface OpticsResult {
  /** How the spectra were computed, one phrase each (recorded in every output). */
  readonly model: {
    readonly valence: string;
    readonly conduction: string;
    readonly lineshape: { readonly kind: LineshapeKind; readonly intraband_time_ps: number; readonly gamma_meV: number; readonly source: string };
    readonly refractive_index: RefractiveIndex;
    readonly kane_energy: string;
    readonly band_gap_renormalisation: string;
    readonly gain_reference: string;
  };
  readonly temperature_K: number;
  readonly well: { readonly thickness_nm: number; readonly layers: readonly string[] };
  readonly band_edge_eV: number;
  readonly photon_eV: Float64Array;
  /** Absorption (cm⁻¹) of the unpumped well (no carriers), TE and TM. */
  readonly absorption_te_per_cm: Float64Array;
  readonly absorption_tm_per_cm: Float64Array;
  readonly spectra: readonly DensitySpectrum[];
  /** n = p at which the TE (TM) peak gain reaches zero (cm⁻²); NaN when the bound subbands never invert. */
  readonly transparency_te_cm2: number;
  readonly transparency_tm_cm2: number;
  /** Peak gain against density (n = p) and the fit g = g0 ln(N/N_tr) of the TE peak (null with < 2 positive points). */
  readonly gain_curve: { readonly densities_cm2: readonly number[]; readonly peak_te_per_cm: readonly number[]; readonly peak_tm_per_cm: readonly number[]; readonly fit_te: LogFit | null };
  readonly note: string;
}

const LINESHAPE_SOURCE: Readonly<Record<LineshapeKind, string>> = {
  lorentzian: 'Lorentzian (Markovian relaxation time)',
  sech: 'hyperbolic secant of S. R. Chinn, P. S. Zory and A. R. Reisinger, IEEE J. Quantum Electron. 24, 2191 (1988)',
  delta: 'none (delta function)',
};

function densitySpectrum(ctx: OpticsContext, p: Population): DensitySpectrum {
  const { engine, shiftOf } = ctx;
  const shift = shiftOf(p);
  const sums = engine.binSums(engine.levels(p));
  const s = engine.fromSums(p, sums, shift);
  const levels: Levels = s.levels;
  const both = p.electrons_cm2 > 0 && p.holes_cm2 > 0;
  return {
    electrons_cm2: p.electrons_cm2, holes_cm2: p.holes_cm2,
    electron_quasi_fermi_eV: levels.electron_eV, hole_quasi_fermi_eV: levels.hole_eV, separation_eV: levels.electron_eV - levels.hole_eV,
    gap_shift_eV: shift,
    gain_te_per_cm: s.gain_te_per_cm, gain_tm_per_cm: s.gain_tm_per_cm,
    spontaneous_per_cm2_s_eV: s.spontaneous_per_cm2_s_eV,
    radiative_current_A_per_cm2: s.radiativeCurrent_A_per_cm2,
    peak_te: gainPeak(engine, sums, 'te', shift, s.gain_te_per_cm),
    peak_tm: gainPeak(engine, sums, 'tm', shift, s.gain_tm_per_cm),
    differential_gain_te_cm2: both ? differentialGain(engine, p, 'te', shiftOf) : NaN,
  };
}

/** Log-spaced densities from a to b (cm⁻²). */
const logSpaced = (a: number, b: number, n: number): number[] => Array.from({ length: n }, (_, i) => a * (b / a) ** (i / (n - 1)));

/**
 * The optical spectra of a solved stack at the given densities (see the module comment), or null
 * when electrons or holes have no bound subband, or at T = 0. `bandOptions` overrides the valence
 * model and grid (default: the solve's). Throws InputError as opticsContext.
 */
export function opticsOfSolve(r: SolveResult, settings: OpticsSettings, populations: readonly Population[], bandOptions: OpticalBandOptions = {}): OpticsResult | null {
  const ctx = opticsContext(r, settings, bandOptions);
  if (!ctx) return null;
  const { bands, engine, shiftOf } = ctx;
  const empty = engine.binSums(engine.levels({ electrons_cm2: 0, holes_cm2: 0 }));
  const tr = (which: Polarisation): number => transparencyDensity(engine, which, { shiftOf });
  const transparency_te = tr('te');
  const transparency_tm = tr('tm');
  const curve = settings.curve ?? (Number.isFinite(transparency_te)
    ? { from_cm2: transparency_te, to_cm2: 5 * transparency_te, points: DEFAULT_CURVE_POINTS }
    : { from_cm2: 5e11, to_cm2: 5e12, points: DEFAULT_CURVE_POINTS });
  const densities = logSpaced(curve.from_cm2, curve.to_cm2, curve.points);
  const peaks = densities.map((n) => {
    const p = { electrons_cm2: n, holes_cm2: n };
    const shift = shiftOf(p);
    const sums = engine.binSums(engine.levels(p));
    return { te: gainPeak(engine, sums, 'te', shift).gain_per_cm, tm: gainPeak(engine, sums, 'tm', shift).gain_per_cm };
  });
  const labels = bands.wells.map((i) => r.structure.layers[i]!.label);
  const kp = bands.model === 'parabolic'
    ? 'parabolic single-band heavy and light holes (in-plane masses of the solve), k∥ = 0 polarisation factors'
    : `${bands.model === 'kp4' ? '4×4' : '6×6'} Luttinger–Kohn subbands on ${bands.k_per_nm.length} k∥ points to ${bands.k_per_nm[bands.k_per_nm.length - 1]} 1/nm, ${bands.axial ? 'axial approximation' : '[100] and [110] averaged'}, polarisation factors from the k-dependent spinor components`;
  return {
    model: {
      valence: kp,
      conduction: bands.nonparabolic ? 'bound subbands, in-plane dispersion of the two-band energy-dependent mass' : 'bound subbands, parabolic in-plane dispersion',
      lineshape: { kind: settings.lineshape, intraband_time_ps: settings.tau_ps, gamma_meV: engine.lineshape.gamma_eV * 1000, source: LINESHAPE_SOURCE[settings.lineshape] },
      refractive_index: ctx.refractive,
      kane_energy: settings.kaneEnergy_eV !== undefined ? `${settings.kaneEnergy_eV} eV for every layer (given)` : 'each layer\'s Ep (VMR2001 with bowing; custom materials from their electron mass by the Kane relation)',
      band_gap_renormalisation: settings.renormalisation ? `on: ΔEg = −${BGR_COEFFICIENT} (n a_B²)^(1/3) Ry* (Schmitt-Rink, Ell & Haug 1986), μ = ${bands.reducedMass.toFixed(4)} m0, ε = ${bands.permittivity.toFixed(2)}` : 'off',
      gain_reference: `material gain of the well layers (${bands.well_nm} nm: ${labels.join(', ')}); modal gain is this times the optical confinement factor`,
    },
    temperature_K: bands.temperature_K,
    well: { thickness_nm: bands.well_nm, layers: labels },
    band_edge_eV: bands.edge_eV,
    photon_eV: engine.photon_eV,
    absorption_te_per_cm: engine.gainOn(empty, 'te').map((g) => -g),
    absorption_tm_per_cm: engine.gainOn(empty, 'tm').map((g) => -g),
    spectra: populations.map((p) => densitySpectrum(ctx, p)),
    transparency_te_cm2: transparency_te,
    transparency_tm_cm2: transparency_tm,
    gain_curve: { densities_cm2: densities, peak_te_per_cm: peaks.map((p) => p.te), peak_tm_per_cm: peaks.map((p) => p.tm), fit_te: logFit(densities, peaks.map((p) => p.te)) },
    note: 'bound subbands only (carriers in the continuum above the barriers are not counted); no excitonic (Coulomb) enhancement; wavelengths λ = hc/E',
  };
}

/**
 * The spectra a spec's `optics:` section asks for, of its solve (what `solve` reports): at the
 * section's densities, else at carriers.sheet_density (n = p), else at DEFAULT_DENSITIES_CM2; null
 * when a band has no bound state, at T = 0, or when the solve is unphysical.
 */
export function opticsOfSpec(r: SolveResult, section: OpticsSpec, carriersDensity?: string | number): OpticsResult | null {
  if (r.status === 'unphysical') return null;
  const settings = opticsSettings(section);
  const populations = settings.populations
    ?? (carriersDensity !== undefined ? [sheetDensityOf(carriersDensity, 'carriers.sheet_density')] : DEFAULT_DENSITIES_CM2).map((n) => ({ electrons_cm2: n, holes_cm2: n }));
  return opticsOfSolve(r, settings, populations);
}

/** λ (nm) of each photon energy of a result, for tables and plots. */
export const wavelengthsOf = (o: OpticsResult): Float64Array => o.photon_eV.map((e) => HC_EV_NM / e);
