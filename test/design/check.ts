/** Failure text for numeric checks: input, got, expected, difference and tolerance. */
export const mismatch = (input: string, got: number, expected: number, tolerance: number): string =>
  `${input}: got ${got}, expected ${expected}, difference ${Math.abs(got - expected)}, tolerance ${tolerance}`;

/** True when |got − expected| ≤ tolerance. */
export const within = (got: number, expected: number, tolerance: number): boolean => Math.abs(got - expected) <= tolerance;
