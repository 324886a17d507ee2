/** Writing result files so that a failure never leaves a partial or corrupted file behind. */
import { mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { InputError } from '../errors.js';

/** Writes `text` to `path` through a temporary file in the same folder and an atomic rename. */
export function writeFileAtomic(path: string, text: string): void {
  const tmp = join(dirname(path), `.${process.pid}.${Date.now()}.tmp`);
  try {
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(tmp, text);
    renameSync(tmp, path);
  } catch (e) {
    try {
      rmSync(tmp, { force: true });
    } catch {
      // The folder itself is unusable (a file in its place, no permission): nothing was written.
    }
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError('io', `cannot write "${path}"${code ? ` (${code})` : ''}; check that the folder is writable`);
  }
}

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
