/**
 * III–V alloy compositions (Alloy, materials/types.ts): the trade's formula notation for them
 * ("Al0.3Ga0.7As", "In0.72Ga0.28As0.61P0.39", "Al0.1Ga0.37In0.53As").
 */
import { InputError } from '../engine/errors.js';
import { supportIssue } from './ternaries.js';
import type { Alloy } from './types.js';

/** Elements with VMR2001 parameters, in the canonical print order: In before Al before Ga so that
 * the usual names come out (In0.2Ga0.8As, Al0.3Ga0.7As, In0.52Al0.48As); As before P before Sb
 * (GaAsP, InGaAsP, GaAsSb). */
export const GROUP_III = ['In', 'Al', 'Ga'] as const;
export const GROUP_V = ['As', 'P', 'Sb'] as const;

// Elements of the two groups that are real but not tabulated: named as "no parameters",
// not as unknown symbols, so the message tells the user what is actually missing.
const OTHER_III = ['B', 'Tl'];
const OTHER_V = ['N', 'Bi'];

const SUM_TOLERANCE = 1e-6;

type Side = 'III' | 'V';
const groupOf = (el: string): Side | null =>
  (GROUP_III as readonly string[]).includes(el) || OTHER_III.includes(el) ? 'III'
    : (GROUP_V as readonly string[]).includes(el) || OTHER_V.includes(el) ? 'V' : null;

interface Token { readonly el: string; readonly frac: number | null }

const bad = (text: string, what: string): InputError => new InputError('bad-formula', `material "${text}": ${what}`);

/** Splits "In0.53Ga0.47As" into element/fraction tokens; checks symbols and groups. */
function tokenize(text: string): { III: Token[]; V: Token[] } {
  const re = /([A-Z][a-z]?)((?:\d+(?:\.\d*)?|\.\d+))?/y;
  const sides: { III: Token[]; V: Token[] } = { III: [], V: [] };
  let pos = 0;
  while (pos < text.length) {
    re.lastIndex = pos;
    const m = re.exec(text);
    if (!m) {
      throw bad(text, `unexpected character "${text[pos]}" at position ${pos + 1}; write elements with plain decimal fractions, e.g. In0.2Ga0.8As`);
    }
    pos = re.lastIndex;
    const el = m[1]!;
    const group = groupOf(el);
    if (group === null) {
      throw bad(text, `unknown element "${el}"; use ${GROUP_III.join(', ')} (group III) and ${GROUP_V.join(', ')} (group V)`);
    }
    if (group === 'III' && sides.V.length > 0) {
      throw bad(text, `group-III element ${el} on the group-V side; write the group-III elements first, e.g. In0.2Ga0.8As`);
    }
    if (group === 'V' && sides.V.length === 0 && sides.III.length === 0) {
      throw bad(text, `group-V element ${el} on the group-III side; write the group-III elements first, e.g. In0.2Ga0.8As`);
    }
    const side = sides[group];
    if (side.some((t) => t.el === el) || (group === 'III' ? sides.V : sides.III).some((t) => t.el === el)) {
      throw bad(text, `element ${el} appears twice; give each element once`);
    }
    const frac = m[2] === undefined ? null : Number(m[2]);
    if (frac !== null && frac > 1) throw bad(text, `fraction of ${el} is ${frac}, must lie in [0, 1]`);
    side.push({ el, frac });
  }
  if (sides.III.length === 0) throw bad(text, 'no group-III element; write e.g. GaAs or In0.2Ga0.8As');
  if (sides.V.length === 0) throw bad(text, 'no group-V element; write e.g. GaAs or In0.2Ga0.8As');
  return sides;
}

/** Prints a fraction without float noise: at most 12 decimals, trailing zeros dropped. */
export const formatFraction = (x: number): string => {
  const s = x.toFixed(12).replace(/0+$/, '').replace(/\.$/, '');
  return s === '-0' ? '0' : s;
};

const roundFraction = (x: number): number => Number(x.toFixed(12));

/** Suggests a corrected formula by giving the last element of the faulty side the remainder. */
function suggestion(sides: Readonly<Record<Side, readonly Token[]>>, side: Side): string {
  const fix = (ts: readonly Token[], s: Side): string => ts.map((t, i) => {
    if (ts.length === 1) return t.el;
    if (s === side && i === ts.length - 1) {
      const rest = ts.slice(0, -1).reduce((acc, u) => acc + (u.frac ?? 0), 0);
      return t.el + formatFraction(Math.max(0, 1 - rest));
    }
    return t.el + formatFraction(t.frac ?? 0);
  }).join('');
  return fix(sides.III, 'III') + fix(sides.V, 'V');
}

/** Completes one side: a lone element has fraction 1, one missing fraction is the remainder. `textOf` names the alloy in a message. */
function completeSide(textOf: () => string, sides: Readonly<Record<Side, readonly Token[]>>, side: Side): Record<string, number> {
  const tokens = sides[side];
  const label = side === 'III' ? 'group-III' : 'group-V';
  if (tokens.length === 1) {
    const t = tokens[0]!;
    if (t.frac !== null && Math.abs(t.frac - 1) > SUM_TOLERANCE) {
      throw bad(textOf(), `${label} fractions sum to ${formatFraction(t.frac)}, must sum to 1 (e.g. ${suggestion(sides, side)})`);
    }
    return { [t.el]: 1 };
  }
  const missing = tokens.filter((t) => t.frac === null);
  if (missing.length > 1) {
    throw bad(textOf(), `${label} fractions missing for ${missing.map((t) => t.el).join(', ')}; give all but at most one, e.g. ${tokens.map((t, i) => t.el + (i === 0 ? '0.3' : i === tokens.length - 1 ? '' : '0.2')).join('')}…`);
  }
  const given = tokens.reduce((acc, t) => acc + (t.frac ?? 0), 0);
  const out: Record<string, number> = {};
  for (const t of tokens) out[t.el] = t.frac ?? roundFraction(1 - given);
  const sum = Object.values(out).reduce((a, b) => a + b, 0);
  if (Math.abs(sum - 1) > SUM_TOLERANCE || Object.values(out).some((f) => f < 0)) {
    throw bad(textOf(), `${label} fractions sum to ${formatFraction(missing.length === 1 ? given : sum)}, must sum to 1 (e.g. ${suggestion(sides, side)})`);
  }
  return out;
}

/** Throws 'unknown-material' when the elements have no VMR2001 parameter set in this table. */
function checkSupported(textOf: () => string, alloy: Alloy): Alloy {
  const issue = supportIssue(alloy);
  if (issue !== null) throw new InputError('unknown-material', `material "${textOf()}": ${issue}`);
  return alloy;
}

/**
 * Parses the trade's formula notation into an Alloy.
 *
 * Group-III elements first, then group-V, each followed by its fraction; a side with one element
 * needs none ("GaAs"), and one fraction per side may be left out as the remainder ("Al0.3GaAs").
 * Element order within a side is free ("Ga0.47In0.53As" = "In0.53Ga0.47As").
 * Example: parseFormula("In0.72Ga0.28As0.61P0.39") → { III: { In: 0.72, Ga: 0.28 }, V: { As: 0.61, P: 0.39 } }.
 * Throws InputError 'bad-formula' (unknown element, wrong side, sums ≠ 1 within 1e-6, fraction
 * outside [0, 1]) or 'unknown-material' (elements without parameters).
 */
export function parseFormula(text: string): Alloy {
  const trimmed = text.trim();
  if (trimmed === '') throw bad(text, 'empty formula; write e.g. GaAs or In0.2Ga0.8As');
  const sides = tokenize(trimmed);
  const textOf = (): string => trimmed;
  return checkSupported(textOf, Object.freeze({
    III: Object.freeze(completeSide(textOf, sides, 'III')),
    V: Object.freeze(completeSide(textOf, sides, 'V')),
  }));
}

/**
 * Builds an alloy from a name without numbers and fractions given separately.
 *
 * On each side every fraction but one must be given; the missing one is the remainder.
 * Examples: alloyFromName('InGaAs', { In: 0.2 }) → In0.2Ga0.8As;
 * alloyFromName('InGaAsP', { In: 0.72, As: 0.61 }) → In0.72Ga0.28As0.61P0.39.
 * Throws InputError as parseFormula does, and for a fraction naming an element not in the name.
 */
export function alloyFromName(name: string, fractions: Readonly<Record<string, number>>): Alloy {
  const trimmed = name.trim();
  const sides = nameTokens(trimmed);
  if ([...sides.III, ...sides.V].some((t) => t.frac !== null)) {
    throw bad(trimmed, 'a name with fractions given separately must carry no numbers; write e.g. InGaAs with { In: 0.2 }');
  }
  const names = new Set([...sides.III, ...sides.V].map((t) => t.el));
  for (const [el, f] of Object.entries(fractions)) {
    if (!names.has(el)) {
      throw bad(trimmed, `fraction given for ${el}, which is not in the name; give fractions only for ${[...names].join(', ')}`);
    }
    if (!Number.isFinite(f) || f < 0 || f > 1) throw bad(trimmed, `fraction of ${el} is ${f}, must lie in [0, 1]`);
  }
  const withFractions = (ts: readonly Token[]): Token[] => ts.map((t) => ({ el: t.el, frac: fractions[t.el] ?? null }));
  const filled = { III: withFractions(sides.III), V: withFractions(sides.V) };
  // The formula text is only for messages: a search builds this alloy at every candidate.
  const textOf = (): string => formatTokens(filled);
  return checkSupported(textOf, Object.freeze({
    III: Object.freeze(completeSide(textOf, filled, 'III')),
    V: Object.freeze(completeSide(textOf, filled, 'V')),
  }));
}

/** Tokens of alloy names (a search builds the same few names at every candidate); tokenize throws on a bad name, which is never stored. */
const names = new Map<string, { III: Token[]; V: Token[] }>();
function nameTokens(name: string): { III: Token[]; V: Token[] } {
  let t = names.get(name);
  if (!t) {
    t = tokenize(name);
    if (names.size >= 256) names.clear();
    names.set(name, t);
  }
  return t;
}

const formatTokens = (sides: Readonly<Record<Side, readonly Token[]>>): string =>
  [...sides.III, ...sides.V].map((t) => t.el + (t.frac === null ? '' : formatFraction(t.frac))).join('');

const ordered = (side: Readonly<Record<string, number>>, order: readonly string[]): string[] =>
  Object.keys(side).sort((p, q) => {
    const i = order.indexOf(p);
    const j = order.indexOf(q);
    return (i < 0 ? order.length : i) - (j < 0 ? order.length : j) || p.localeCompare(q);
  });

/**
 * Canonical text of an alloy: elements in the fixed order In, Al, Ga | As, P, Sb, fractions with
 * at most 12 decimals and no float noise, a lone element on a side without a number.
 * parseFormula(formatFormula(a)) equals a to 1e-12. Example: { III: { Ga: 0.8, In: 0.2 }, V: { As: 1 } } → "In0.2Ga0.8As".
 */
export function formatFormula(alloy: Alloy): string {
  const side = (s: Readonly<Record<string, number>>, order: readonly string[]): string => {
    const els = ordered(s, order);
    return els.map((el) => (els.length === 1 ? el : el + formatFraction(s[el]!))).join('');
  };
  return side(alloy.III, GROUP_III) + side(alloy.V, GROUP_V);
}

/**
 * Checks an alloy value built in code (not parsed): known elements on the right sides, fractions
 * in [0, 1] summing to 1 within 1e-6, parameters available. `where` names it in the message
 * (e.g. "substrate"). Returns the alloy unchanged.
 */
export function validateAlloy(alloy: Alloy, where: string): Alloy {
  // Only a message needs the text: this check runs at every material resolution of a search.
  const text = (): string => formatFormulaLoose(alloy);
  for (const [side, label] of [['III', 'group-III'], ['V', 'group-V']] as const) {
    const entries = Object.entries(alloy[side]);
    if (entries.length === 0) throw new InputError('bad-formula', `${where} "${text()}": no ${label} element; give e.g. GaAs`);
    for (const [el, f] of entries) {
      const g = groupOf(el);
      if (g === null) throw new InputError('bad-formula', `${where} "${text()}": unknown element "${el}"; use ${GROUP_III.join(', ')} and ${GROUP_V.join(', ')}`);
      if (g !== side) throw new InputError('bad-formula', `${where} "${text()}": ${g === 'III' ? 'group-III' : 'group-V'} element ${el} on the ${label} side; put it on its own side`);
      if (!Number.isFinite(f) || f < 0 || f > 1) throw new InputError('bad-formula', `${where} "${text()}": fraction of ${el} is ${f}, must lie in [0, 1]`);
    }
    const sum = entries.reduce((a, [, f]) => a + f, 0);
    if (Math.abs(sum - 1) > SUM_TOLERANCE) {
      throw new InputError('bad-formula', `${where} "${text()}": ${label} fractions sum to ${formatFraction(sum)}, must sum to 1`);
    }
  }
  const issue = supportIssue(alloy);
  if (issue !== null) throw new InputError('unknown-material', `${where} "${text()}": ${issue}`);
  return alloy;
}

/** Like formatFormula but safe on invalid values, for messages only. */
const formatFormulaLoose = (alloy: Alloy): string => {
  const side = (s: Readonly<Record<string, number>>): string => {
    const entries = Object.entries(s);
    return entries.map(([el, f]) => el + (entries.length === 1 && f === 1 ? '' : Number.isFinite(f) ? formatFraction(f) : String(f))).join('');
  };
  return side(alloy.III) + side(alloy.V);
};
