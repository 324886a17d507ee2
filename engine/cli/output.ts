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

/** One CSV line, quoting fields that need it (RFC 4180). */
export const csvLine = (cells: readonly (string | number)[]): string =>
  cells.map((c) => {
    const s = typeof c === 'number' ? (Number.isFinite(c) ? String(c) : '') : c;
    return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  }).join(',');
