/**
 * Absorption-edge targets: the photon energy (or wavelength) at which the absorption of the
 * unpumped well, in one polarisation, first reaches a level — by default half its value 5Γ above the
 * first line of that polarisation (the middle of the broadened first step) — within a window. What a
 * modulator or detector designer places: where the well starts to absorb TE or TM light.
 */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import type { OpticsContext } from '../engine/optics/optics.js';
import { parseGain } from '../engine/optics/schema.js';
import type { BinSums } from '../engine/optics/spectra.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { quantity, transitionEnergy, unitNotes, weight } from './common.js';
import { candidateOptics, checkSpectrumTarget, photonWindow, polarisation, spectrumKeys } from './gain-common.js';

const schema = z.object({
  absorption_edge: polarisation.describe('Polarisation of the absorbed light: TE or TM'),
  energy: quantity.optional().describe('Goal as a photon energy ("1.42 eV")'),
  wavelength: quantity.optional().describe('Goal as a wavelength ("850 nm")'),
  within: quantity.describe('Half-width of the window, in the goal\'s kind of unit'),
  level: quantity.optional().describe('Absorption that defines the edge, e.g. "5000 cm-1"; default half the value 5Γ above the first line of the polarisation'),
  ...spectrumKeys,
  weight,
}).strict();
export type AbsorptionEdgeTarget = z.infer<typeof schema>;

/** Offset (in Γ, or meV without broadening) above the first line where the default level is read. */
const PLATEAU_GAMMAS = 5;
/** Bisection steps of the crossing between two grid points: 2⁻³⁰ of 2 meV. */
const BISECTIONS = 30;

/** Lowest k∥ = 0 line of a polarisation: pairs whose factor reaches a tenth of the largest. */
function firstLine(ctx: OpticsContext, which: 'te' | 'tm'): number {
  let largest = 0;
  for (const d of ctx.bands.directions) for (const p of d.pairs) largest = Math.max(largest, p[which][0]!);
  let e = Infinity;
  for (const d of ctx.bands.directions) for (const p of d.pairs) if (p[which][0]! >= 0.1 * largest) e = Math.min(e, p.Ec[0]! - p.Ev[0]!);
  return e;
}

/** The photon energy (eV) where the absorption −g of the empty well first reaches `level` (cm⁻¹), or null within the grid. */
export function absorptionEdge(ctx: OpticsContext, empty: BinSums, which: 'te' | 'tm', level: number): number | null {
  const { engine } = ctx;
  const w = engine.photon_eV;
  const alpha = engine.gainOn(empty, which).map((g) => -g);
  const j = alpha.findIndex((a) => a >= level);
  if (j < 0) return null;
  if (j === 0) return w[0]!;
  let lo = w[j - 1]!;
  let hi = w[j]!;
  for (let s = 0; s < BISECTIONS; s++) {
    const mid = 0.5 * (lo + hi);
    if (-engine.gainAt(empty, which, mid) >= level) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

export const absorptionEdgeObjective: Objective<AbsorptionEdgeTarget> = {
  kind: 'absorption_edge',
  description: 'the photon energy or wavelength where the unpumped well\'s TE or TM absorption sets in (reaches "level", default half the first step), within a window',
  schema,
  needsWavefunctions: () => true,
  statesNeeded: () => ['electron', 'heavy_hole', 'light_hole'],
  examples: [
    { absorption_edge: 'TE', wavelength: '850 nm', within: '5 nm' },
    { absorption_edge: 'TM', energy: '1.45 eV', within: '5 meV', level: '3000 cm-1' },
  ],
  check: (t, field, geometry) => {
    checkSpectrumTarget(t, field, geometry, 'absorption_edge');
    photonWindow(t, field);
    if (t.level !== undefined && !(parseGain(t.level, `${field}.level`) > 0)) throw new InputError('bad-value', `${field}.level: must be a positive absorption, got ${JSON.stringify(t.level)}`, `${field}.level`);
  },
  warnings: (t, field) => unitNotes([[t.within, `${field}.within`, photonWindow(t, field).scale.unit]]),
  evaluate: (t, r) => {
    const w = photonWindow(t, 'target');
    const which = t.absorption_edge === 'TE' ? 'te' : 'tm';
    const goal = w.scale.fromEv(w.scale.goal_eV);
    const label = `${t.absorption_edge} absorption edge ${w.key}`;
    const ctx = candidateOptics(r, t);
    const empty = ctx?.engine.binSums(ctx.engine.levels({ electrons_cm2: 0, holes_cm2: 0 }));
    let edge: number | null = null;
    if (ctx && empty) {
      const first = firstLine(ctx, which);
      const offset = ctx.engine.lineshape.gamma_eV > 0 ? PLATEAU_GAMMAS * ctx.engine.lineshape.gamma_eV : PLATEAU_GAMMAS * 1e-3;
      const level = t.level !== undefined ? parseGain(t.level, 'level') : 0.5 * -ctx.engine.gainAt(empty, which, first + offset);
      if (level > 0) edge = absorptionEdge(ctx, empty, which, level);
    }
    if (edge === null) {
      // No edge within the spectrum: the band-edge line stands in, with a penalty.
      const e = transitionEnergy(r, which === 'te' ? 'e1-hh1' : 'e1-lh1').energy;
      const residual = (w.scale.fromEv(e) - goal) / w.within;
      return { label, role: 'target', achieved: null, goal, unit: w.scale.unit, residual: Math.sign(residual || 1) * (Math.abs(residual) + MISSING_STATE_PENALTY), weight: t.weight ?? 1, satisfied: false };
    }
    const achieved = w.scale.fromEv(edge);
    const residual = (achieved - goal) / w.within;
    return { label, role: 'target', achieved, goal, unit: w.scale.unit, residual, weight: t.weight ?? 1, satisfied: Math.abs(residual) <= 1 };
  },
};
