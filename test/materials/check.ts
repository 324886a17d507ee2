/** Comparison helper for the materials tests: a failing check prints input, got, expected,
 * difference and tolerance. */
import { expect } from 'vitest';
import { InputError } from '../../engine/errors.js';

export function expectClose(got: number, expected: number, tol: number, input: string): void {
  const diff = got - expected;
  expect(Math.abs(diff) <= tol || (got === expected),
    `${input}: got ${got}, expected ${expected}, difference ${diff}, tolerance ${tol}`).toBe(true);
}

/** `run` throws an InputError with this code, a message matching `pattern`, on one line. */
export function expectInputError(run: () => unknown, code: string, pattern: RegExp): void {
  let caught: unknown;
  try { run(); } catch (e) { caught = e; }
  expect(caught, 'expected an InputError').toBeInstanceOf(InputError);
  const err = caught as InputError;
  expect(err.code).toBe(code);
  expect(err.message).toMatch(pattern);
  expect(err.message.includes('\n'), `one line: ${err.message}`).toBe(false);
}
