import { expect } from 'vitest';

/**
 * Asserts |got − expected| ≤ abs + rel·|expected| and, on failure, prints the input, both values,
 * the difference and the tolerance.
 */
export function expectClose(
  got: number,
  expected: number,
  tolerance: { readonly rel?: number; readonly abs?: number },
  input: string,
): void {
  const allowed = (tolerance.abs ?? 0) + (tolerance.rel ?? 0) * Math.abs(expected);
  const difference = Math.abs(got - expected);
  const message = `${input}: got ${got}, expected ${expected}, difference ${difference.toExponential(3)}, tolerance ${allowed.toExponential(3)}`;
  expect(difference <= allowed, message).toBe(true);
}
