/**
 * Small shared guards. Each checks one domain rule and builds the one message format:
 * `<name> must <rule> (got <value>)`. Engine functions call these first, so a bad input
 * becomes a LeewayError and never a wrong number.
 */
import { divError, numError } from './errors';

/**
 * Formats a number for a message as the user typed it: the shortest decimal that reads back as
 * the same double (JavaScript's own number-to-text rule), so 2.0000000001 stays 2.0000000001 and
 * 1.7976931348623157e308 is not shown as Infinity; exponent form below 1e-6 and from 1e21.
 */
export function show(x: number): string {
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? 'Infinity' : '-Infinity';
  // 1.797e308 as typed, not JavaScript's 1.797e+308.
  return String(x).replace('e+', 'e');
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

/** "cvi is 1e308, cvg is 2": the inputs of a formula, each as the user gave it. */
export function describeInputs(inputs: Readonly<Record<string, number>>): string {
  return Object.entries(inputs)
    .map(([name, x]) => `${name} is ${show(x)}`)
    .join(', ');
}

/**
 * The inputs that carry a result of a few products and quotients past 1.8e308: those far from 1
 * in size (at least 1e100, or nonzero and at most 1e-100), else those beyond 1e10 or 1e-10, else
 * all. Defaults (a z of 1.65, a k of 2) are never far from 1, so a message built from these names
 * what the user typed, not a parameter the user left out.
 */
export function inputsBeyond(inputs: Readonly<Record<string, number>>): Record<string, number> {
  for (const edge of [100, 10]) {
    const out: Record<string, number> = {};
    for (const [name, x] of Object.entries(inputs)) {
      const a = Math.abs(x);
      if (a >= 10 ** edge || (a > 0 && a <= 10 ** -edge)) out[name] = x;
    }
    if (Object.keys(out).length) return out;
  }
  return { ...inputs };
}

/**
 * A result that must be a finite double: x itself, or #NUM! when the exact result is beyond
 * ±1.8e308 (x is ±Infinity), with a message that names the inputs far from 1 in size that carry
 * it there (`what` names the result).
 */
export function fits(x: number, inputs: Readonly<Record<string, number>>, what = 'the result'): number {
  if (x - x === 0) return x;
  throw numError(`${what} exceeds the largest number Excel can hold (about 1.8e308 in size): ${describeInputs(inputsBeyond(inputs))}`);
}
