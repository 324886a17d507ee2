/**
 * Figures derived from gain spectra: the peak (gain and photon energy), the transparency density,
 * the differential gain, and the logarithmic gain–density fit g = g0 ln(N/N_tr).
 * Units: cm⁻¹, eV, nm; sheet densities cm⁻² (3-D densities cm⁻³ = sheet density / well thickness).
 */
import { HC_EV_NM } from '../constants.js';
import { rootOfIncreasing } from '../observables/fermi.js';
import type { Population } from './schema.js';
import type { BinSums, SpectrumEngine } from './spectra.js';

export type Polarisation = 'te' | 'tm';

/** A gain peak: its value (cm⁻¹) and where (eV, nm). */
export interface GainPeak {
  readonly gain_per_cm: number;
  readonly energy_eV: number;
  readonly wavelength_nm: number;
}

/** Golden-section steps of the peak refinement: the bracket shrinks to 0.618^24 ≈ 1e-5 of two grid steps. */
const REFINE_STEPS = 24;

/**
 * The largest gain over the engine's photon grid, refined between the neighbouring grid points by
 * golden-section search on the exact spectrum (SpectrumEngine.gainAt). A maximum at an end of the
 * grid stays there (the spectrum rises beyond the range asked).
 */
export function gainPeak(engine: SpectrumEngine, sums: BinSums, which: Polarisation, shift = 0, onGrid?: Float64Array): GainPeak {
  const w = engine.photon_eV;
  const g = onGrid ?? engine.gainOn(sums, which, shift);
  let i = 0;
  for (let j = 1; j < g.length; j++) if (g[j]! > g[i]!) i = j;
  if (i === 0 || i === g.length - 1) return { gain_per_cm: g[i]!, energy_eV: w[i]!, wavelength_nm: HC_EV_NM / w[i]! };
  const at = (x: number): number => engine.gainAt(sums, which, x, shift);
  let a = w[i - 1]!;
  let b = w[i + 1]!;
  const r = (Math.sqrt(5) - 1) / 2;
  let c = b - r * (b - a);
  let d = a + r * (b - a);
  let fc = at(c);
  let fd = at(d);
  for (let s = 0; s < REFINE_STEPS; s++) {
    if (fc > fd) {
      b = d; d = c; fd = fc; c = b - r * (b - a); fc = at(c);
    } else {
      a = c; c = d; fc = fd; d = a + r * (b - a); fd = at(d);
    }
  }
  const best = fc > fd ? { x: c, y: fc } : { x: d, y: fd };
  return best.y >= g[i]! ? { gain_per_cm: best.y, energy_eV: best.x, wavelength_nm: HC_EV_NM / best.x } : { gain_per_cm: g[i]!, energy_eV: w[i]!, wavelength_nm: HC_EV_NM / w[i]! };
}

/** Peak gain (cm⁻¹) of a population, with an optional gap shift (eV) as a function of the population. */
export function peakAt(engine: SpectrumEngine, p: Population, which: Polarisation, shiftOf: (p: Population) => number = () => 0): GainPeak {
  const shift = shiftOf(p);
  return gainPeak(engine, engine.binSums(engine.levels(p)), which, shift);
}

/** Range and tolerance (in ln n) of the transparency search. */
const N_LO = 1e9;
const N_HI = 1e14;
const LN_TOLERANCE = 1e-4;

/**
 * Transparency sheet density (cm⁻²): the injected density n (holes p = ratio·n) at which the peak
 * gain over the photon grid reaches zero, by safeguarded regula falsi on ln n (the peak rises
 * monotonically with n). NaN when the peak stays negative up to 1e14 cm⁻² (bound subbands cannot
 * invert), or is positive already at 1e9 cm⁻².
 */
export function transparencyDensity(engine: SpectrumEngine, which: Polarisation, options: { readonly holesPerElectron?: number; readonly shiftOf?: (p: Population) => number } = {}): number {
  const ratio = options.holesPerElectron ?? 1;
  const peak = (lnN: number): number => {
    const n = Math.exp(lnN);
    return peakAt(engine, { electrons_cm2: n, holes_cm2: ratio * n }, which, options.shiftOf).gain_per_cm;
  };
  const lo = Math.log(N_LO);
  const hi = Math.log(N_HI);
  if (!(peak(hi) > 0) || peak(lo) > 0) return NaN;
  // The bracket must not widen beyond [N_LO, N_HI]: clamp the argument.
  const clamped = (x: number): number => peak(Math.min(Math.max(x, lo), hi));
  return Math.exp(rootOfIncreasing(clamped, Math.log(5e11), Math.log(3e12), LN_TOLERANCE));
}

/**
 * Differential gain at a density: ∂g/∂N at the peak photon energy of that density, N the 3-D
 * density n/L_w, by a central difference in n of ±1 % (holes scaled with it). Returns cm²
 * (cm⁻¹ per cm⁻³).
 */
export function differentialGain(engine: SpectrumEngine, p: Population, which: Polarisation, shiftOf: (p: Population) => number = () => 0): number {
  const at = peakAt(engine, p, which, shiftOf);
  const h = 0.01;
  const gainAt = (s: number): number => {
    const q = { electrons_cm2: p.electrons_cm2 * s, holes_cm2: p.holes_cm2 * s };
    return engine.gainAt(engine.binSums(engine.levels(q)), which, at.energy_eV, shiftOf(q));
  };
  const dn = 2 * h * p.electrons_cm2;
  return ((gainAt(1 + h) - gainAt(1 - h)) / dn) * (engine.bands.well_nm * 1e-7);
}

/** The logarithmic fit of peak gain against density. */
export interface LogFit {
  /** g0 (cm⁻¹) and N_tr (cm⁻²; the 3-D value is N_tr / well thickness). */
  readonly g0_per_cm: number;
  readonly transparency_cm2: number;
  /** Root-mean-square deviation of the fit over its points (cm⁻¹). */
  readonly rms_per_cm: number;
  /** Densities (cm⁻²) of the points fitted. */
  readonly from_cm2: number;
  readonly to_cm2: number;
}

/**
 * Least-squares fit of g = g0 ln(N/N_tr) = g0 ln N − g0 ln N_tr, linear in ln N (common practice;
 * L. A. Coldren and S. W. Corzine, Diode Lasers and Photonic Integrated Circuits, Ch. 4), over the
 * points with positive gain. Null with fewer than two such points.
 */
export function logFit(densities_cm2: readonly number[], gains_per_cm: readonly number[]): LogFit | null {
  const pts = densities_cm2.map((n, i) => ({ x: Math.log(n), y: gains_per_cm[i]!, n })).filter((p) => p.y > 0 && Number.isFinite(p.x));
  if (pts.length < 2) return null;
  const mx = pts.reduce((s, p) => s + p.x, 0) / pts.length;
  const my = pts.reduce((s, p) => s + p.y, 0) / pts.length;
  const sxx = pts.reduce((s, p) => s + (p.x - mx) ** 2, 0);
  if (!(sxx > 0)) return null;
  const g0 = pts.reduce((s, p) => s + (p.x - mx) * (p.y - my), 0) / sxx;
  const intercept = my - g0 * mx;
  const rms = Math.sqrt(pts.reduce((s, p) => s + (p.y - (g0 * p.x + intercept)) ** 2, 0) / pts.length);
  return { g0_per_cm: g0, transparency_cm2: Math.exp(-intercept / g0), rms_per_cm: rms, from_cm2: Math.min(...pts.map((p) => p.n)), to_cm2: Math.max(...pts.map((p) => p.n)) };
}
