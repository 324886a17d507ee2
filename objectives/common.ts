/** Pieces shared by the objective modules: reading quantities and scoring states that may be missing. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { bandOfLabel, findState } from '../engine/solve.js';
import { isUnitless, parseEnergy, parseLength, parsePhotonEnergy, splitQuantity, unitlessNote } from '../engine/input/units.js';
import { HC_EV_NM, KB_EV_PER_K } from '../engine/constants.js';
import type { TargetSource } from './types.js';

export const quantity = z.union([z.number(), z.string()]);
export const weight = z.number().positive().optional().describe('Relative weight in the loss (default 1)');

/** Checks a state label such as "e1" or "hh2". */
export function checkStateLabel(label: string, field: string): void {
  if (!bandOfLabel(label)) throw new InputError('bad-value', `${field}: "${label}" is not a state label; write e1, hh1, lh1, e2…`, field);
}

/** Checks a transition label "e1-hh1" / "e1-e2" and returns its two state labels. */
export function transitionStates(label: string, field: string): [string, string] {
  const parts = label.split('-');
  if (parts.length !== 2 || !bandOfLabel(parts[0]!) || !bandOfLabel(parts[1]!)) {
    throw new InputError('bad-value', `${field}: "${label}" is not a transition; write e1-hh1, e1-lh1 or e1-e2`, field);
  }
  const a = bandOfLabel(parts[0]!)!;
  const b = bandOfLabel(parts[1]!)!;
  if (a.band !== 'electron') throw new InputError('bad-value', `${field}: a transition starts from an electron state, got "${label}"; write e1-hh1 or e1-e2`, field);
  if (b.band === 'electron' && b.index <= a.index) throw new InputError('bad-value', `${field}: an intersubband transition goes upwards, got "${label}"; write e${b.index}-e${a.index}`, field);
  return [parts[0]!, parts[1]!];
}

/** Energy of a state (eV, absolute) or, when it is not bound, its band's continuum edge. */
export function stateEnergy(r: TargetSource, label: string): { energy: number; missing: boolean } {
  const s = findState(r, label);
  if (s) return { energy: s.energy_eV, missing: false };
  return { energy: r.bands[bandOfLabel(label)!.band].barrier_eV, missing: true };
}

/** Photon energy of a transition (eV), with missing states at their continuum edges. */
export function transitionEnergy(r: TargetSource, label: string): { energy: number; missing: boolean } {
  const [a, b] = label.split('-') as [string, string];
  const sa = stateEnergy(r, a);
  const sb = stateEnergy(r, b);
  return { energy: Math.abs(sb.energy - sa.energy), missing: sa.missing || sb.missing };
}

/**
 * Exciton binding estimate (eV) of an interband line, from the solve's transition list; NaN when
 * it was not estimated (no wavefunctions, a material without a permittivity, or the line is absent).
 */
export function excitonBinding(r: TargetSource, label: string): number {
  return r.transitions.find((t) => t.label === label)?.exciton_binding_eV ?? NaN;
}

/** The unit note of a quantity written without one (see engine/input/units.ts), as a list for an objective's warnings. */
export const unitNotes = (entries: readonly (readonly [raw: string | number | undefined, field: string, unit: string])[]): string[] =>
  entries.flatMap(([raw, field, unit]) => { const n = unitlessNote(raw, unit); return n ? [`${field}: ${n}`] : []; });

export function energyOf(raw: string | number, field: string): number {
  const v = parseEnergy(raw);
  if (typeof v === 'string') throw new InputError('bad-value', `${field}: ${v}`, field);
  return v;
}

/** A photon quantity as the user wrote it: goal in eV plus how to express values in the same unit. */
export interface PhotonScale {
  readonly goal_eV: number;
  readonly unit: 'nm' | 'µm' | 'meV' | 'eV' | 'cm⁻¹';
  /** Converts an energy (eV) to the user's unit. */
  readonly fromEv: (eV: number) => number;
}

/** The default unit of each photon goal key: a bare number is read in it (engine/input/units.ts unitlessNote). */
export const PHOTON_UNITS = { energy: 'eV', wavelength: 'nm', wavenumber: 'cm-1' } as const;
export type PhotonKey = keyof typeof PHOTON_UNITS;

/** A photon goal in its key's default unit when written without one (976 under wavelength: 976 nm). */
export const withPhotonUnit = (raw: string | number, key: PhotonKey): string | number => (isUnitless(raw) ? `${splitQuantity(raw)!.value} ${PHOTON_UNITS[key]}` : raw);

/** The goal's scale; with its key, a goal written without a unit is read in the key's default unit (PHOTON_UNITS), else refused. */
export function photonScale(rawGoal: string | number, field: string, key?: PhotonKey): PhotonScale {
  const raw = key === undefined ? rawGoal : withPhotonUnit(rawGoal, key);
  const p = parsePhotonEnergy(raw);
  if (typeof p === 'string') throw new InputError('bad-value', `${field}: ${p}`, field);
  const text = String(raw);
  if (p.kind === 'wavelength') {
    return /µm|μm|um/.test(text)
      ? { goal_eV: p.eV, unit: 'µm', fromEv: (e) => HC_EV_NM / e / 1000 }
      : { goal_eV: p.eV, unit: 'nm', fromEv: (e) => HC_EV_NM / e };
  }
  if (p.kind === 'wavenumber') return { goal_eV: p.eV, unit: 'cm⁻¹', fromEv: (e) => (e * 1e7) / HC_EV_NM };
  return /meV/.test(text) ? { goal_eV: p.eV, unit: 'meV', fromEv: (e) => e * 1000 } : { goal_eV: p.eV, unit: 'eV', fromEv: (e) => e };
}

/**
 * A photon window half-width in the unit of its goal (nm or µm of wavelength, meV or eV, cm⁻¹),
 * as every photon target reads its `within`; a number without a unit is in the goal's unit (said
 * by unitNotes). `field` names the window in messages.
 */
export function windowIn(raw: string | number, unit: PhotonScale['unit'], field: string): number {
  let w: number | string;
  if (isUnitless(raw)) w = splitQuantity(raw)!.value;
  else if (unit === 'nm' || unit === 'µm') {
    const l = parseLength(raw);
    w = typeof l === 'string' ? l : 'ml' in l ? 'a wavelength window takes nm or µm' : unit === 'µm' ? l.nm / 1000 : l.nm;
  } else if (unit === 'cm⁻¹') {
    const q = splitQuantity(raw);
    w = q && /^(cm-1|cm\^-1|cm⁻¹|\/cm)$/.test(q.unit) ? q.value : `expected a wavenumber window such as "20 cm-1", got ${JSON.stringify(raw)}`;
  } else {
    const e = parseEnergy(raw);
    w = typeof e === 'string' ? e : unit === 'meV' ? e * 1000 : e;
  }
  if (typeof w === 'string') throw new InputError('bad-value', `${field}: ${w}`, field);
  if (!(w > 0)) throw new InputError('bad-value', `${field}: must be positive, got ${JSON.stringify(raw)}`, field);
  return w;
}

/** An energy that may be written as a multiple of kT ("3 kT") at the structure's temperature; eV. */
export function energyOrKT(raw: string | number, temperature_K: number, field: string): number {
  const m = typeof raw === 'string' ? /^\s*([\d.eE+-]+)\s*kT\s*$/.exec(raw) : null;
  if (m) {
    const n = Number(m[1]);
    if (!Number.isFinite(n)) throw new InputError('bad-value', `${field}: expected e.g. "3 kT", got ${JSON.stringify(raw)}`, field);
    return n * KB_EV_PER_K * temperature_K;
  }
  return energyOf(raw, field);
}
