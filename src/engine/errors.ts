/**
 * The one error type of the engine. Every failure a user can cause carries one of Excel's own
 * error codes and a message that says what to fix. The worksheet boundary (src/registry) turns
 * it into the Excel error; the CLI prints it as `#CODE! message`.
 */

/** Excel error codes Leeway uses (docs/reference/conventions.md). */
export type ErrorCode = '#VALUE!' | '#NUM!' | '#DIV/0!' | '#N/A';

export const ERROR_CODES: readonly ErrorCode[] = ['#VALUE!', '#NUM!', '#DIV/0!', '#N/A'];

export class LeewayError extends Error {
  readonly code: ErrorCode;

  constructor(code: ErrorCode, message: string) {
    super(message);
    this.code = code;
    this.name = 'LeewayError';
  }
}

/** Wrong type, unknown word, ranges that do not pair up. */
export function valueError(message: string): LeewayError {
  return new LeewayError('#VALUE!', message);
}

/** Number out of range, not a whole number, too few data. */
export function numError(message: string): LeewayError {
  return new LeewayError('#NUM!', message);
}

/** A divisor that is zero. */
export function divError(message: string): LeewayError {
  return new LeewayError('#DIV/0!', message);
}

/** A required value is missing (blank cell). */
export function naError(message: string): LeewayError {
  return new LeewayError('#N/A', message);
}

export function isLeewayError(e: unknown): e is LeewayError {
  return e instanceof LeewayError;
}
