/**
 * A material after alloying, temperature and strain: the values the profile builder needs.
 */
import { InputError } from '../engine/errors.js';
import { alloyAt } from './alloys.js';
import { formatFormula, validateAlloy } from './formula.js';
import { electronMassAtGap, holeMasses } from './masses.js';
import { biaxialStrain, criticalThickness, edgeShifts } from './strain.js';
import type { Alloy, ElectronMassModel, LatticeModel, MaterialModels, ResolvedMaterial } from './types.js';

/** Below this |mismatch| a layer counts as lattice-matched: no critical thickness. */
const MATCHED = 1e-6;

function checkTemperature(T: number): number {
  if (typeof T !== 'number' || !Number.isFinite(T) || T < 0) {
    throw new InputError('bad-value', `temperature: must be a finite number of kelvin ≥ 0, got ${String(T)}; give e.g. 300`);
  }
  return T;
}

/** The model choices used when resolveMaterial is given none: today's behaviour. */
export const DEFAULT_MODELS: MaterialModels = Object.freeze({ electronMass: 'low-temperature', lattice: 'linear' });

const ELECTRON_MASS_MODELS: readonly ElectronMassModel[] = ['low-temperature', 'kane-temperature'];
const LATTICE_MODELS: readonly LatticeModel[] = ['linear', 'held-below-100K'];

function checkChoice<T extends string>(value: T | undefined, choices: readonly T[], fallback: T, field: string): T {
  if (value === undefined) return fallback;
  if (!choices.includes(value)) {
    throw new InputError('bad-value', `${field}: must be one of ${choices.map((c) => `'${c}'`).join(', ')}, got ${JSON.stringify(value)}; pick one of them`);
  }
  return value;
}

/**
 * Resolves an alloy at a temperature, pseudomorphically strained on a (001) substrate (or
 * free-standing when substrate is null).
 *
 * Parameters: interpolation of the VMR2001 binaries and bowings (alloys.ts) with each binary's
 * gaps at T by its tabulated law; lattice constants of layer and substrate both at T under
 * models.lattice (temperature.ts). Edges on the VMR2001 absolute scale: Ev = VBO (taken as
 * temperature-independent, so the gap's change with T goes to Ec), Ec = VBO + EgΓ(T), then the
 * strain shifts of strain.ts (hydrostatic ac, av; shear b with the lh–so coupling).
 * Electron mass under models.electronMass: 'low-temperature' (default) is VMR2001's tabulated
 * value at every T; 'kane-temperature' scales it by the Kane inverse mass at EgΓ(0)/EgΓ(T) of the
 * unstrained alloy (masses.ts; GaAs 0.067 → 0.0622 at 300 K). Hole masses from the Luttinger
 * parameters (masses.ts). Indirect valleys are reported unstrained. temperature_K in K; result in
 * eV, nm, m0, with the model choices recorded in `models`.
 * Example: GaAs on GaAs at 300 K → EgStrained ≈ 1.4225 eV, monolayer_nm ≈ 0.28266 nm.
 * Throws InputError 'bad-value' for a negative or non-finite temperature or an unknown model
 * choice, and 'bad-formula' / 'unknown-material' for an invalid layer or substrate alloy.
 */
export function resolveMaterial(
  alloy: Alloy,
  opts: {
    readonly temperature_K: number;
    readonly substrate: Alloy | null;
    readonly models?: { readonly electronMass?: ElectronMassModel; readonly lattice?: LatticeModel };
  },
): ResolvedMaterial {
  const T = checkTemperature(opts.temperature_K);
  const models: MaterialModels = Object.freeze({
    electronMass: checkChoice(opts.models?.electronMass, ELECTRON_MASS_MODELS, DEFAULT_MODELS.electronMass, 'models.electronMass'),
    lattice: checkChoice(opts.models?.lattice, LATTICE_MODELS, DEFAULT_MODELS.lattice, 'models.lattice'),
  });
  validateAlloy(alloy, 'material');
  if (opts.substrate !== null) validateAlloy(opts.substrate, 'substrate');
  const p = alloyAt(alloy, T, models.lattice);
  const aSub = opts.substrate === null ? p.a_nm : alloyAt(opts.substrate, T, models.lattice).a_nm;
  const strain = biaxialStrain(p.a_nm, aSub, p.C11, p.C12);
  const shifts = edgeShifts(p, strain);
  const mismatch = (p.a_nm - aSub) / aSub;
  const Ev = p.VBO;
  const Ec = Ev + p.EgG + shifts.dEc;
  const Ehh = Ev + shifts.dEhh;
  const Elh = Ev + shifts.dElh;
  const masses = holeMasses(p);
  const lowest = Math.min(p.EgG, p.EgX, p.EgL);
  const lowestValley = lowest === p.EgG ? 'Γ' : lowest === p.EgX ? 'X' : 'L';
  return Object.freeze({
    formula: formatFormula(alloy),
    temperature_K: T,
    substrate: opts.substrate === null ? null : formatFormula(opts.substrate),
    a_nm: p.a_nm,
    EgG: p.EgG, EgX: p.EgX, EgL: p.EgL,
    Dso: p.Dso,
    Ec, Ehh, Elh,
    EgStrained: Ec - Math.max(Ehh, Elh),
    me: models.electronMass === 'kane-temperature' ? electronMassAtGap(p.me, p, alloyAt(alloy, 0).EgG, p.EgG) : p.me,
    ...masses,
    strain_par: strain.par,
    strain_perp: strain.perp,
    mismatch,
    C11: p.C11, C12: p.C12,
    criticalThickness_nm: Math.abs(mismatch) < MATCHED ? Infinity : criticalThickness(p.a_nm, mismatch, p.C11, p.C12),
    monolayer_nm: (p.a_nm * (1 + strain.perp)) / 2,
    indirect: lowestValley !== 'Γ',
    lowestValley,
    models,
  });
}

/** A material given by its own band edges and masses instead of a composition. */
export interface CustomMaterialDef {
  readonly name: string;
  /** Conduction and valence edges on the absolute scale (eV), Ec > Ev. */
  readonly Ec: number;
  readonly Ev: number;
  /** Electron, heavy-hole and light-hole masses along the growth axis (m0). */
  readonly me: number;
  readonly mhh: number;
  readonly mlh: number;
  /** In-plane hole masses (m0); default the growth-axis masses (isotropic bands). */
  readonly mhh_par?: number;
  readonly mlh_par?: number;
  /** Lattice constant (nm), needed only for thicknesses in monolayers. */
  readonly a_nm?: number;
  /** Temperature the edges refer to (K), recorded only. */
  readonly temperature_K?: number;
}

/**
 * Builds a ResolvedMaterial from user band edges: Ehh = Elh = Ev, EgΓ = EgStrained = Ec − Ev,
 * no strain, never indirect. Values the user did not give and the model cannot know are
 * non-numbers on purpose: EgX, EgL and Dso are Infinity (no other valley or split-off band
 * nearby), a_nm and monolayer_nm are NaN without a_nm (monolayer units are then undefined),
 * temperature_K is NaN without temperature_K. Energies eV, masses m0, lengths nm.
 * Throws InputError 'bad-value' for a non-finite edge, Ec ≤ Ev, a mass ≤ 0 or an invalid a_nm.
 */
export function customMaterial(def: CustomMaterialDef): ResolvedMaterial {
  const where = `material "${def.name}"`;
  const need = (label: string, v: number | undefined, ok: (x: number) => boolean, rule: string, unit: string): void => {
    if (v !== undefined && (typeof v !== 'number' || !Number.isFinite(v) || !ok(v))) {
      throw new InputError('bad-value', `${where}: ${label} must be ${rule}, got ${String(v)}; give it in ${unit}`);
    }
  };
  if (typeof def.name !== 'string' || def.name.trim() === '') {
    throw new InputError('bad-value', `custom material: name must be a non-empty string, got ${JSON.stringify(def.name)}; give it a name`);
  }
  const positive = (x: number): boolean => x > 0;
  for (const [label, v] of [['Ec', def.Ec], ['Ev', def.Ev]] as const) {
    if (v === undefined) throw new InputError('bad-value', `${where}: ${label} is required, got nothing; give it in eV on the absolute scale`);
    need(label, v, () => true, 'a finite energy', 'eV');
  }
  if (!(def.Ec > def.Ev)) {
    throw new InputError('bad-value', `${where}: Ec must lie above Ev, got Ec=${def.Ec} eV, Ev=${def.Ev} eV; swap or correct them`);
  }
  for (const [label, v] of [['me', def.me], ['mhh', def.mhh], ['mlh', def.mlh]] as const) {
    if (v === undefined) throw new InputError('bad-value', `${where}: ${label} is required, got nothing; give it in m0, e.g. 0.067`);
    need(label, v, positive, 'a positive mass', 'm0');
  }
  need('mhh_par', def.mhh_par, positive, 'a positive mass', 'm0');
  need('mlh_par', def.mlh_par, positive, 'a positive mass', 'm0');
  need('a_nm', def.a_nm, positive, 'a positive length', 'nm');
  need('temperature_K', def.temperature_K, (x) => x >= 0, 'a finite temperature ≥ 0', 'K');
  const a = def.a_nm ?? NaN;
  return Object.freeze({
    formula: def.name,
    temperature_K: def.temperature_K ?? NaN,
    substrate: null,
    a_nm: a,
    EgG: def.Ec - def.Ev, EgX: Infinity, EgL: Infinity,
    Dso: Infinity,
    Ec: def.Ec, Ehh: def.Ev, Elh: def.Ev,
    EgStrained: def.Ec - def.Ev,
    me: def.me,
    mhh_z: def.mhh, mlh_z: def.mlh,
    mhh_par: def.mhh_par ?? def.mhh, mlh_par: def.mlh_par ?? def.mlh,
    strain_par: 0, strain_perp: 0, mismatch: 0,
    C11: NaN, C12: NaN,
    criticalThickness_nm: Infinity,
    monolayer_nm: a / 2,
    indirect: false,
    lowestValley: 'Γ',
    models: null,
  });
}
