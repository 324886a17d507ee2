/** Comparison helper for the materials tests: a failing check prints input, got, expected,
 * difference and tolerance. */
import { expect } from 'vitest';

export function expectClose(got: number, expected: number, tol: number, input: string): void {
  const diff = got - expected;
  expect(Math.abs(diff) <= tol || (got === expected),
    `${input}: got ${got}, expected ${expected}, difference ${diff}, tolerance ${tol}`).toBe(true);
}
