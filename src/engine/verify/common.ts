/**
 * What the verification figures share: α, the `samples` count that shares α among materials,
 * the power-of-two scaling that keeps squares of very large or very small results in range, and
 * the check that no figure leaves double range.
 */
import { numError } from '../errors';
import { show, wholeNumber } from '../guards';
import { oneWayPrecision, PrecisionResult } from '../data/precision';

/** α = 0.05: the significance level of every verification (CLSI EP15-A3). */
export const VERIFY_ALPHA = 0.05;

/** `samples` (L ≥ 1, whole): the number of materials tested in the same study; each gets α/L. */
export function readSamples(samples: number): number {
  return wholeNumber(samples, 'samples', 1);
}

/**
 * A power of two f with max·f in [½, 1) when max lies outside [2⁻⁴⁰⁰, 2⁴⁰⁰], else 1. Multiplying
 * by f is exact (no digit is lost) and keeps squares and sums of squares far from overflow and
 * underflow; inside the band f = 1, so ordinary data are computed exactly as without it.
 */
export function powerOfTwoScale(max: number): number {
  if (!(max > 0) || max === Infinity) return 1;
  if (max >= 2 ** -400 && max <= 2 ** 400) return 1;
  const e = Math.max(-1020, Math.min(1020, Math.ceil(Math.log2(max))));
  return 2 ** -e;
}

/** Largest |xᵢ| over the arrays given. */
export function maxAbs(...arrays: ReadonlyArray<ArrayLike<number>>): number {
  let m = 0;
  for (const a of arrays) for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

/** The one-way ANOVA of the results multiplied by f (see powerOfTwoScale). */
export function scaledPrecision(
  values: ArrayLike<number>,
  groups: ArrayLike<string | number>,
  f: number,
): PrecisionResult {
  if (f === 1) return oneWayPrecision(values, groups);
  const scaled = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) scaled[i] = values[i] * f;
  return oneWayPrecision(scaled, groups);
}

/** Every result must be a finite number. */
export function finiteResults(values: ArrayLike<number>, name: string): void {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) throw numError(`${name} ${i + 1} must be a finite number (got ${show(values[i])})`);
  }
}

/** A figure that left double range is an error, never Infinity or NaN. */
export function inRange(x: number, what: string): number {
  if (!Number.isFinite(x)) throw numError(`${what} is beyond the range of double precision (about 1.8e308)`);
  return x;
}
