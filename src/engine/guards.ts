/**
 * Small shared guards. Each checks one domain rule and builds the one message format:
 * `<name> must <rule> (got <value>)`. Engine functions call these first, so a bad input
 * becomes a LeewayError and never a wrong number.
 */
import { divError, numError } from './errors';

/** Formats a number for a message: up to 10 significant digits, no exponent for ordinary sizes. */
export function show(x: number): string {
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? 'Infinity' : '-Infinity';
  return String(Number(x.toPrecision(10)));
}

/** Any finite number (NaN and ±Infinity are out of range). */
export function finite(x: number, name: string): number {
  if (!Number.isFinite(x)) throw numError(`${name} must be a finite number (got ${show(x)})`);
  return x;
}

/** A finite number ≥ 0 (CVs, levels, allowances). */
export function nonNegative(x: number, name: string): number {
  if (!(x >= 0) || x === Infinity) throw numError(`${name} must be a finite number ≥ 0 (got ${show(x)})`);
  return x;
}

/** A finite number > 0 that is used as a divisor: 0 gives #DIV/0!, negative gives #NUM!. */
export function divisor(x: number, name: string): number {
  if (x === 0) throw divError(`${name} must not be zero: it is a divisor`);
  if (!(x > 0) || x === Infinity) throw numError(`${name} must be a finite number > 0 (got ${show(x)})`);
  return x;
}

/** A finite number > 0 that is not a divisor (a coverage factor k, say). */
export function positive(x: number, name: string): number {
  if (!(x > 0) || x === Infinity) throw numError(`${name} must be a finite number > 0 (got ${show(x)})`);
  return x;
}

/** A probability strictly inside (0, 1). */
export function openProbability(x: number, name: string): number {
  if (!(x > 0 && x < 1)) throw numError(`${name} must be a probability strictly between 0 and 1 (got ${show(x)})`);
  return x;
}

/** A whole number ≥ min. */
export function wholeNumber(x: number, name: string, min = 1): number {
  if (!Number.isInteger(x)) throw numError(`${name} must be a whole number (got ${show(x)})`);
  if (x < min) throw numError(`${name} must be at least ${min} (got ${show(x)})`);
  return x;
}
