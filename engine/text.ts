/**
 * Text of every output, shared by the commands, the HTML report and the files they write: plain-text
 * tables, number formatting in each unit's one format, JSON with non-finite numbers and its reviver,
 * spreadsheet-safe CSV lines.
 */

/** Left-aligns text columns and right-aligns numeric ones; the first row is the header. */
export function table(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => (r[c] ?? '').length)));
  const numeric = header.map((_, c) => rows.length > 0 && rows.every((r) => /^[-+]?[\d.]+(e[-+]?\d+)?$|^[-–]$|^∞$/.test((r[c] ?? '').trim())));
  const line = (cells: readonly string[]): string =>
    cells.map((cell, c) => (numeric[c] ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!))).join('  ').trimEnd();
  return [line(header), widths.map((w) => '─'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}

/** Fixed decimals, with "–" for a missing or non-finite value. */
export const fixed = (x: number | undefined, digits: number): string =>
  x === undefined || !Number.isFinite(x) ? (x === Infinity ? '∞' : '–') : x.toFixed(digits);

/** A number with about `digits` significant figures, exponent form when very small or large. */
export const sig = (x: number, digits = 4): string =>
  !Number.isFinite(x) ? (x > 0 ? '∞' : '–') : x !== 0 && (Math.abs(x) < 1e-3 || Math.abs(x) >= 1e6) ? x.toExponential(digits - 1) : String(Number(x.toPrecision(digits)));

/**
 * JSON with typed arrays as plain arrays; an infinite number as the string "Infinity" (a critical
 * thickness of an unstrained layer is infinite, not missing) and NaN as null (a quantity that does
 * not apply or is unknown, e.g. the lattice constant of a custom material declared without one).
 */
export function toJson(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) => {
    if (v instanceof Float64Array) return Array.from(v);
    if (typeof v === 'number' && !Number.isFinite(v)) return Number.isNaN(v) ? null : String(v);
    return v;
  }, 2);
}

/**
 * JSON.parse reviver for the non-finite numbers that JSON cannot hold: both toJson and
 * the run store write them as the strings "Infinity", "-Infinity" and "NaN".
 */
export const reviveNumbers = (_k: string, v: unknown): unknown => (v === 'Infinity' ? Infinity : v === '-Infinity' ? -Infinity : v === 'NaN' ? NaN : v);

/**
 * Decimals of each unit wherever a value is printed (tables, reports, messages), so one quantity
 * always reads the same: eV to 0.01 meV, meV to 0.01, nm to 0.01, µm to 0.001, cm⁻¹ to 0.1.
 */
const DECIMALS: Readonly<Record<string, number>> = { eV: 5, meV: 2, nm: 2, 'µm': 3, 'cm⁻¹': 1, '%': 3, states: 0, 't/h_c − 1': 3, m0: 4, '': 4 };

/**
 * Densities span orders of magnitude (a subband's 21 cm⁻² beside e1's 2.3e11): always in exponent
 * form with 4 significant figures, so a column of them compares at a glance.
 */
const EXPONENT_UNITS: ReadonlySet<string> = new Set(['cm⁻²', 'cm⁻³', 'cm⁻² eV⁻¹', 'cm²']);

/** A value in its unit's one format (DECIMALS; densities in exponent form with 4 significant figures; other units 4 significant figures); "–" when missing. */
export const inUnit = (x: number | null | undefined, unit: string): string =>
  x === null || x === undefined ? '–'
    : EXPONENT_UNITS.has(unit) ? (x === 0 ? '0' : Number.isFinite(x) ? x.toExponential(3) : fixed(x, 0))
      : DECIMALS[unit] !== undefined ? fixed(x, DECIMALS[unit]) : sig(x, 4);

/** inUnit followed by the unit ("991.41 nm"). */
export const withUnit = (x: number | null | undefined, unit: string): string => (x === null || x === undefined ? '–' : `${inUnit(x, unit)}${unit ? ` ${unit}` : ''}`);

/** A shift in its unit's one format with its sign ("+0.12"); "–" when not finite. */
export const signedIn = (x: number, unit: string): string => (Number.isFinite(x) ? `${x >= 0 ? '+' : ''}${inUnit(x, unit)}` : '–');

/** A number with its sign and fixed decimals ("+0.0120"); "–" when not finite. */
export const signed = (x: number, digits: number): string => (Number.isFinite(x) ? `${x >= 0 ? '+' : ''}${x.toFixed(digits)}` : '–');

/**
 * A text cell a spreadsheet opens as text, never as a formula. OWASP ASVS 5.0 requirement 1.2.10
 * (seen): a value whose first character is '=', '+', '-', '@', a tab or NUL is escaped with a single
 * quote; a leading carriage return is treated the same (common practice). Numbers stay numbers: a
 * negative value the program wrote is data; only text (labels, names, notes) can carry a formula.
 */
export const spreadsheetSafe = (cell: string | number): string | number =>
  typeof cell === 'string' && /^[=+\-@\t\r\0]/.test(cell) ? `'${cell}` : cell;

/** One CSV line, quoting fields that need it (RFC 4180), every text cell made spreadsheet-safe. */
export const csvLine = (cells: readonly (string | number)[]): string =>
  cells.map((c) => {
    const v = spreadsheetSafe(c);
    const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : v;
    return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  }).join(',');
