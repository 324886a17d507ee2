/**
 * Pieces shared by the optical targets (gain peak, peak gain, gain transparency, polarisation
 * ratio, absorption edge): the optional keys of their schemas, and the optical spectra of a
 * candidate, computed once per solve and settings however many optical targets read them.
 *
 * Inside a search every candidate needs its valence subbands with their optical matrix elements;
 * the targets compute them in the axial approximation on 17 k∥ points to 1 1/nm without the grid
 * extrapolation (SEARCH_BANDS), about seven times faster than the full [100]/[110] solve on 49
 * points to 1.2 1/nm that `wellsmith solve` reports. Measured on the 976 nm pump scenario
 * (runs/pump-976.yaml at (w nm, x) = (7, 0.20), (5, 0.22), (9, 0.17), (6, 0.15), (8.4, 0.183),
 * (4.5, 0.30), 3e12 cm⁻²): the TE gain peak lies 0.22–0.25 nm to the blue of the full solve's, its
 * height 4–9 % above (the axial hole DOS is lighter), for 66 ms against 490 ms per candidate on a
 * loaded 2-core machine. Every evaluation, including the final ranking, uses these settings so that
 * ranks compare like with like; `wellsmith solve` and the report give the full spectra of the design.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import type { OpticalBandOptions } from '../engine/optics/bands.js';
import { LINESHAPES, type LineshapeKind } from '../engine/optics/lineshape.js';
import { opticsContext, type OpticsContext } from '../engine/optics/optics.js';
import { DEFAULT_LINESHAPE, DEFAULT_TAU_PS, parseTime, sheetDensityOf, type OpticsSettings, type Population } from '../engine/optics/schema.js';
import type { SolveResult } from '../engine/solve.js';
import type { Geometry, TargetSource } from './types.js';
import { photonScale, quantity, windowIn, type PhotonScale } from './common.js';

/** Valence settings of the optical targets (see the module comment). */
export const SEARCH_BANDS: OpticalBandOptions = { axial: true, kPoints: 17, kMax_per_nm: 1, extrapolate: false };
/** Photon grid of the targets: 2 meV steps over the default range; peaks are refined between points. */
export const SEARCH_PHOTON_POINTS = 151;

/** Keys every optical target may carry: the broadening and the index of its spectra. */
export const spectrumKeys = {
  lineshape: z.enum(LINESHAPES as [LineshapeKind, ...LineshapeKind[]]).optional().describe('Broadening of the spectra: sech (default), lorentzian or delta'),
  intraband_time: quantity.optional().describe('Intraband relaxation time τ_in (default "0.1 ps")'),
  refractive_index: z.number().positive().optional().describe('Background index of the well (default Adachi\'s model)'),
};

/** Keys of targets read at an injected density. */
export const densityKeys = {
  density: quantity.describe('Injected electron sheet density, e.g. "3e12 cm-2" (holes the same unless "holes" is given)'),
  holes: quantity.optional().describe('Hole sheet density when it differs from the electrons\''),
};

export const polarisation = z.enum(['TE', 'TM']);

export interface SpectrumTarget {
  readonly lineshape?: LineshapeKind | undefined;
  readonly intraband_time?: string | number | undefined;
  readonly refractive_index?: number | undefined;
}

export interface DensityTarget {
  readonly density: string | number;
  readonly holes?: string | number | undefined;
}

/** The population a target reads. */
export function populationOf(t: DensityTarget, field = 'target'): Population {
  const n = sheetDensityOf(t.density, `${field}.density`);
  return { electrons_cm2: n, holes_cm2: t.holes === undefined ? n : sheetDensityOf(t.holes, `${field}.holes`) };
}

/** Checks the shared keys and refuses wires (their carriers are per length, and no optics is computed for them). */
export function checkSpectrumTarget(t: SpectrumTarget & Partial<DensityTarget>, field: string, geometry: Geometry, key: string): void {
  if (geometry === 'wire') throw new InputError('bad-value', `${field}.${key}: optical spectra are computed for layer stacks; use a transition target on a wire`, `${field}.${key}`);
  if (t.intraband_time !== undefined) parseTime(t.intraband_time, `${field}.intraband_time`);
  if (t.density !== undefined) populationOf(t as DensityTarget, field);
}

function settingsOf(t: SpectrumTarget): OpticsSettings {
  return {
    lineshape: t.lineshape ?? DEFAULT_LINESHAPE,
    tau_ps: t.intraband_time === undefined ? DEFAULT_TAU_PS : parseTime(t.intraband_time, 'intraband_time'),
    ...(t.refractive_index !== undefined ? { refractiveIndex: t.refractive_index } : {}),
    renormalisation: false,
  };
}

/** A layer stack's solve with sampled wavefunctions (what the optical targets need), or null. */
function stackSolve(r: TargetSource): SolveResult | null {
  // Objectives see the TargetSource view; a stack's is a SolveResult, which carries its settings.
  const s = r as Partial<SolveResult>;
  return s.settings !== undefined && s.structure !== undefined && 'models' in s.structure && (r.wavefunctions?.z_nm.length ?? 0) > 2 ? (r as SolveResult) : null;
}

const cache = new WeakMap<object, Map<string, OpticsContext | null>>();

/**
 * The optical spectra context of a candidate for a target's settings (null without bound electrons
 * or holes), computed once per solve result and settings.
 */
export function candidateOptics(r: TargetSource, t: SpectrumTarget): OpticsContext | null {
  const solve = stackSolve(r);
  if (!solve) return null;
  const settings = settingsOf(t);
  const key = `${settings.lineshape}|${settings.tau_ps}|${settings.refractiveIndex ?? ''}`;
  let byKey = cache.get(r);
  if (!byKey) {
    byKey = new Map();
    cache.set(r, byKey);
  }
  if (byKey.has(key)) return byKey.get(key)!;
  const ctx = opticsContext(solve, settings, SEARCH_BANDS, SEARCH_PHOTON_POINTS);
  byKey.set(key, ctx);
  return ctx;
}

/** A photon goal (exactly one of energy or wavelength) with its window in the goal's unit. */
export function photonWindow(t: { readonly energy?: string | number | undefined; readonly wavelength?: string | number | undefined; readonly within: string | number }, field: string): { readonly key: 'energy' | 'wavelength'; readonly scale: PhotonScale; readonly within: number } {
  const keys = (['energy', 'wavelength'] as const).filter((k) => t[k] !== undefined);
  if (keys.length !== 1) throw new InputError('bad-value', `${field}: give exactly one of energy or wavelength, got ${keys.length === 0 ? 'none' : keys.join(' and ')}`, field);
  const key = keys[0]!;
  const scale = photonScale(t[key]!, `${field}.${key}`);
  const within = windowIn(t.within, scale.unit, `${field}.within`);
  return { key, scale, within };
}
