/**
 * Lattice-matched quaternaries on InP named by their band-gap wavelength, in the trade's shorthand:
 * "Q1.25" is In(1−x)Ga(x)As(y)P(1−y) lattice-matched to InP whose gap wavelength is 1.25 µm;
 * "InGaAsP(1.25 µm)" says the same in full, and "AlGaInAs(1.3 µm)" is Al(z)Ga(w)In(1−z−w)As
 * lattice-matched to InP with a 1.3 µm gap. The wavelength is that of the unstrained Γ gap at
 * 300 K, as the trade quotes it (a room-temperature photoluminescence or absorption edge, common
 * practice): the composition is a property of the grown layer, so it does not move with the spec's
 * temperature, while the layer's gap then does.
 *
 * Resolution: on the materials model itself (alloys.ts, quadratic form of Moon, Antypas & James,
 * Vegard lattice constant), the lattice match fixes one fraction in closed form for any value of
 * the other (the lattice constant is bilinear in the fractions), and the gap equation is solved
 * for that other fraction by bisection, which converges because the gap is monotonic along the
 * lattice-matched line (InP 1.35 eV → In0.53Ga0.47As 0.74 eV; In0.53Ga0.47As → Al0.48In0.52As
 * 1.45 eV). Fractions are rounded to 1e-4, the precision a grower quotes: that moves the gap by
 * under 0.1 meV (0.1 nm at 1.3 µm) and the mismatch by under 1e-5.
 */
import { InputError } from '../engine/errors.js';
import { HC_EV_NM } from '../engine/constants.js';
import { alloyAt } from './alloys.js';
import { BINARIES } from './binaries.js';
import { formatFormula, parseFormula } from './formula.js';
import type { Alloy } from './types.js';

/** Temperature (K) at which a quaternary's name gives its gap wavelength. */
export const NAMED_GAP_TEMPERATURE_K = 300;

/** Fractions of a named quaternary are rounded to this step. */
const FRACTION_STEP = 1e-4;

type Family = 'InGaAsP' | 'AlGaInAs';

const FAMILIES: Readonly<Record<string, Family>> = { InGaAsP: 'InGaAsP', GaInAsP: 'InGaAsP', AlGaInAs: 'AlGaInAs', AlInGaAs: 'AlGaInAs', GaAlInAs: 'AlGaInAs' };

const round = (x: number): number => Math.round(x / FRACTION_STEP) * FRACTION_STEP;

const lattice = (a: Alloy): number => alloyAt(a, NAMED_GAP_TEMPERATURE_K).a_nm;
const gap = (a: Alloy): number => alloyAt(a, NAMED_GAP_TEMPERATURE_K).EgG;

/** InGaAsP at arsenic fraction y, with the gallium fraction that matches InP (Vegard: linear in Ga at fixed y). */
function ingaasp(y: number): Alloy {
  const at = (ga: number): number => lattice({ III: { In: 1 - ga, Ga: ga }, V: { As: y, P: 1 - y } });
  const a0 = at(0);
  const ga = (lattice(INP) - a0) / (at(1) - a0);
  return { III: { In: 1 - ga, Ga: ga }, V: { As: y, P: 1 - y } };
}

/** AlGaInAs at aluminium fraction p, with the indium fraction that matches InP. */
function algainas(p: number): Alloy {
  const at = (inx: number): number => lattice({ III: { Al: p, Ga: 1 - p - inx, In: inx }, V: { As: 1 } });
  const a0 = at(0);
  const inx = ((1 - p) * (lattice(INP) - a0)) / (at(1 - p) - a0);
  return { III: { In: inx, Al: p, Ga: 1 - p - inx }, V: { As: 1 } };
}

const INP: Alloy = { III: { In: 1 }, V: { P: 1 } };

/** The lattice-matched line of a family: the alloy at parameter t ∈ [0, 1] (InP → InGaAs; InGaAs → AlInAs). */
function along(family: Family): (t: number) => Alloy {
  if (family === 'InGaAsP') return ingaasp;
  // Al fraction at which Ga runs out on the matched line: Al(p)In(1−p)As matches InP.
  const pMax = (lattice(INP) - BINARIES.InAs.a_nm) / (BINARIES.AlAs.a_nm - BINARIES.InAs.a_nm);
  return (t) => algainas(t * pMax);
}

/** Clean fractions: rounded to FRACTION_STEP, each side summing to 1 exactly as printed. */
function tidy(a: Alloy): Alloy {
  const side = (s: Readonly<Record<string, number>>, last: string): Record<string, number> => {
    const out: Record<string, number> = {};
    let sum = 0;
    for (const [el, x] of Object.entries(s)) if (el !== last) { out[el] = Number(round(x).toFixed(4)); sum += out[el]!; }
    if (last in s) out[last] = Number((1 - sum).toFixed(4));
    return out;
  };
  return parseFormula(formatFormula({ III: side(a.III, 'Ga'), V: side(a.V, 'P') }));
}

/**
 * The lattice-matched quaternary on InP of a family whose unstrained Γ gap at 300 K has the
 * wavelength λ (nm), by bisection along the matched line (see the file comment), then rounded to
 * 1e-4. Example: latticeMatchedByWavelength('InGaAsP', 1250) ≈ In0.74Ga0.26As0.56P0.44.
 * Throws InputError when λ lies outside the family's range on InP (named in the message).
 */
export function latticeMatchedByWavelength(family: Family, wavelength_nm: number, written: string): Alloy {
  const line = along(family);
  const target = HC_EV_NM / wavelength_nm;
  const g0 = gap(line(0));
  const g1 = gap(line(1));
  const [lo, hi] = g0 < g1 ? [g0, g1] : [g1, g0];
  if (!(target >= lo && target <= hi)) {
    throw new InputError('bad-value', `material "${written}": ${family} lattice-matched to InP spans gap wavelengths ${(HC_EV_NM / hi / 1000).toFixed(3)}–${(HC_EV_NM / lo / 1000).toFixed(3)} µm at ${NAMED_GAP_TEMPERATURE_K} K, got ${(wavelength_nm / 1000).toPrecision(4)} µm; choose a wavelength in that range`);
  }
  let a = 0;
  let b = 1;
  const rising = g1 > g0;
  for (let k = 0; k < 60; k++) {
    const m = (a + b) / 2;
    if ((gap(line(m)) < target) === rising) a = m;
    else b = m;
  }
  return tidy(line((a + b) / 2));
}

const SHORT = /^Q(\d+(?:\.\d+)?)$/;
const LONG = /^([A-Za-z]+)\(\s*(\d+(?:\.\d+)?)\s*(µm|μm|um|nm)\s*\)$/;

/** Resolved names, since a search parses the same few names at every candidate. */
const resolved = new Map<string, Alloy>();

/**
 * A material name as a layer, substrate or reference may give it: a formula (parseFormula) or a
 * lattice-matched quaternary on InP by its gap wavelength at 300 K ("Q1.25", "InGaAsP(1.25 µm)",
 * "AlGaInAs(1300 nm)"), resolved to its composition (latticeMatchedByWavelength).
 * Throws InputError as parseFormula does, or for an unknown family or a wavelength out of range.
 */
export function parseMaterialName(text: string): Alloy {
  const name = text.trim();
  const hit = resolved.get(name);
  if (hit) return hit;
  const short = SHORT.exec(name);
  const long = short ? null : LONG.exec(name);
  if (!short && !long) return parseFormula(text);
  let family: Family;
  let nm: number;
  if (short) {
    family = 'InGaAsP';
    nm = Number(short[1]) * 1000;
  } else {
    const f = FAMILIES[long![1]!];
    if (!f) throw new InputError('bad-formula', `material "${name}": a gap wavelength names InGaAsP or AlGaInAs lattice-matched to InP, got "${long![1]}"; write e.g. InGaAsP(1.25 µm), AlGaInAs(1.3 µm) or Q1.25`);
    family = f;
    nm = Number(long![2]) * (long![3] === 'nm' ? 1 : 1000);
  }
  const alloy = latticeMatchedByWavelength(family, nm, name);
  if (resolved.size >= 256) resolved.clear();
  resolved.set(name, alloy);
  return alloy;
}
