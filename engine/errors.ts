/**
 * Bad input: one error class with a stable code and a message of the shape
 * "what, where, got, what to do". The CLI maps it to exit code 2 and prints only the message.
 */
export type InputErrorCode =
  | 'parse'
  | 'schema'
  | 'unknown-material'
  | 'bad-formula'
  | 'bad-value'
  | 'unknown-variable'
  | 'io';

export class InputError extends Error {
  override readonly name = 'InputError';
  constructor(
    readonly code: InputErrorCode,
    message: string,
    /** Dotted path of the offending field in the spec, when there is one (e.g. "stack[2].thickness"). */
    readonly field?: string,
  ) {
    super(message);
  }
}

export const isInputError = (e: unknown): e is InputError => e instanceof InputError;

/**
 * A bad-value InputError in the project's one-line shape "where: what, got X; what to do", for
 * library functions whose arguments are checked directly rather than through a spec.
 */
export const badValue = (where: string, what: string, got: unknown, fix: string, field?: string): InputError =>
  new InputError('bad-value', `${where}: ${what}, got ${String(got)}; ${fix}`, field);

/** Throws badValue(…): for use in expressions. */
export const failBadValue = (where: string, what: string, got: unknown, fix: string): never => {
  throw badValue(where, what, got, fix);
};
