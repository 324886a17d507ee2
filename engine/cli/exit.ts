/**
 * Exit codes, mapped in one place: 0 success, 1 the physics cannot be satisfied (no bound state,
 * unreachable target), 2 bad input, 3 a bug in wellsmith. Commands return an Outcome; only
 * main.ts writes to stdout/stderr and sets the process exit code.
 */
import { isInputError } from '../errors.js';

export const EXIT = { ok: 0, physics: 1, input: 2, bug: 3 } as const;

/** What a command produced: the CLI prints it; tests read it without spawning a process. */
export interface Outcome {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

/** A command's result: stdout, and on stderr its warnings (engine/input/check.ts specWarnings), one "wellsmith: warning:" line each. */
export const success = (stdout: string, code: number = EXIT.ok, warnings: readonly string[] = []): Outcome => ({ code, stdout, stderr: warnings.map((w) => `wellsmith: warning: ${w}\n`).join('') });

/** An error as one line for stderr with its exit code; a bug (not bad input) keeps its stack and exits 3. */
export function failure(e: unknown, locate?: (field: string) => number | undefined): Outcome {
  if (isInputError(e)) {
    const line = e.field && locate && !/\(line \d+\)/.test(e.message) ? locate(e.field) : undefined;
    return { code: EXIT.input, stdout: '', stderr: `wellsmith: ${e.message}${line ? ` (line ${line})` : ''}\n` };
  }
  return { code: EXIT.bug, stdout: '', stderr: `wellsmith: internal error (please report it with the spec): ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n` };
}
