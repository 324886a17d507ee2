/**
 * Resolved materials kept per (composition, temperature, substrate, model choices), shared across
 * structures: a design search, a tolerance run, the jobs of a campaign and the thousand layers of a
 * superlattice ask for the same few materials over and over (a 1001-layer GaAs/AlGaAs stack: two
 * materials resolved 1001 times, 126–185 ms of its 1.7 s solve), and resolution (alloying with
 * bowing, Varshni, strain, critical thickness) is pure in those four inputs. A composition a
 * search varies continuously is new on every candidate and only passes through.
 */
import { resolveMaterial, type Alloy } from '../materials/index.js';
import type { MaterialModels, ResolvedMaterial } from '../materials/types.js';

/** Entries kept; the table is emptied when it reaches this (a campaign of many materials stays bounded). */
export const MATERIAL_CACHE_LIMIT = 4096;

const table = new Map<string, ResolvedMaterial>();

/** The fractions of one side in element order, exactly (every digit of each double). */
const side = (s: Readonly<Record<string, number>>): string => Object.keys(s).sort().map((k) => `${k}${s[k]}`).join(',');

/**
 * resolveMaterial(alloy, opts), computed once per distinct (alloy, temperature, substrate, models)
 * and shared: the result must not be modified (structures treat materials as frozen values).
 * The key holds every fraction, the temperature and each model choice exactly, so a cached result is
 * the one resolveMaterial would return. Errors are not cached: bad input throws on every call.
 * Units as resolveMaterial (K; fractions).
 */
export function resolveMaterialCached(alloy: Alloy, opts: { readonly temperature_K: number; readonly substrate: Alloy | null; readonly models?: Partial<MaterialModels> }): ResolvedMaterial {
  // Every model choice in the key, whatever choices MaterialModels grows.
  const models = opts.models ? Object.entries(opts.models).sort(([a], [b]) => (a < b ? -1 : 1)).map(([k, v]) => `${k}=${String(v)}`).join(',') : '';
  const key = `${side(alloy.III)}|${side(alloy.V)}|${opts.temperature_K}|${opts.substrate ? `${side(opts.substrate.III)}|${side(opts.substrate.V)}` : '-'}|${models}`;
  const hit = table.get(key);
  if (hit) return hit;
  const resolved = resolveMaterial(alloy, opts);
  if (table.size >= MATERIAL_CACHE_LIMIT) table.clear();
  table.set(key, resolved);
  return resolved;
}
