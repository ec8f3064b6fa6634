/**
 * Arithmetic that neither overflows nor underflows in its intermediate steps: a number is held as
 * a double m times a power of two, 2^e, with 0.5 ≤ |m| < 1 (or m = 0), and e any whole number.
 * A formula evaluated on such numbers gives, in the normal range of doubles, exactly the bits
 * the same formula gives on doubles in the same order (scaling by a power of two commutes with
 * rounding there), and outside it the answer the doubles would give without the range limits;
 * only `toDouble` rounds back into the double range, once.
 *
 * Method: the exponent is read from the bits of the double (IEEE 754 binary64), so splitting a
 * double into m and e is exact; `ldexp` follows musl libc's scalbn (two-step scaling so that a
 * result in the subnormal range is rounded once; from memory, checked in test/engine/scaled.test.ts
 * against exact integer arithmetic). Rounding: each operation rounds its mantissa once, to
 * nearest, as the same double operation would; a result below the smallest normal double
 * (2.2e-308) is rounded once more to the subnormal grid (steps of 2^-1074 ≈ 4.9e-324), so it is
 * the correctly rounded value of the mantissa computed, within one step of the exact result.
 */

const F64 = new Float64Array(1);
const U32 = new Uint32Array(F64.buffer);
/** Index of the high (sign and exponent) word: 1 on little-endian hosts. */
const HI = (() => {
  F64[0] = 1;
  return U32[1] === 0x3ff00000 ? 1 : 0;
})();
const LO = 1 - HI;

const TWO_64 = 18446744073709551616; // 2^64

/** 2^n for whole n, −1022 ≤ n ≤ 1023, built from its bits (exact). */
function pow2(n: number): number {
  U32[HI] = (n + 1023) << 20;
  U32[LO] = 0;
  return F64[0];
}

const P1023 = pow2(1023);
const PM969 = pow2(-969); // 2^-1022 · 2^53

/**
 * x·2^n for whole n, rounded once (musl's scalbn). Gives ±Infinity when the result is beyond the
 * largest double and ±0 below half the smallest subnormal.
 */
export function ldexp(x: number, n: number): number {
  if (n > 1023) {
    x *= P1023;
    n -= 1023;
    if (n > 1023) {
      x *= P1023;
      n -= 1023;
      if (n > 1023) n = 1023;
    }
  } else if (n < -1022) {
    x *= PM969;
    n += 969;
    if (n < -1022) {
      x *= PM969;
      n += 969;
      if (n < -1022) n = -1022;
    }
  }
  return x * pow2(n);
}

/** The exponent e with 2^(e−1) ≤ |x| < 2^e (frexp's exponent); 0 for 0 and for NaN or ±Infinity. */
export function exponentOf(x: number): number {
  F64[0] = x;
  let bits = (U32[HI] >>> 20) & 0x7ff;
  if (bits === 0x7ff) return 0;
  if (bits !== 0) return bits - 1022;
  if (x === 0) return 0;
  F64[0] = x * TWO_64;
  bits = (U32[HI] >>> 20) & 0x7ff;
  return bits - 1022 - 64;
}

/** A number m·2^e, 0.5 ≤ |m| < 1 or m = 0 (then e = 0). */
export interface Scaled {
  readonly m: number;
  readonly e: number;
}

export const ZERO: Scaled = { m: 0, e: 0 };

/** m·2^e brought to the form 0.5 ≤ |m| < 1 (m finite). Exact. */
function norm(m: number, e: number): Scaled {
  if (m === 0) return ZERO;
  const k = exponentOf(m);
  return { m: ldexp(m, -k), e: e + k };
}

/** A finite double as a scaled number (exact). */
export function scaled(x: number): Scaled {
  return norm(x, 0);
}

/** a·b, its mantissa rounded once. */
export function times(a: Scaled, b: Scaled): Scaled {
  return norm(a.m * b.m, a.e + b.e);
}

/** a/b, b ≠ 0, its mantissa rounded once. */
export function over(a: Scaled, b: Scaled): Scaled {
  return norm(a.m / b.m, a.e - b.e);
}

/** a + b, rounded once (the smaller is aligned to the larger exactly unless it is negligible). */
export function plus(a: Scaled, b: Scaled): Scaled {
  if (a.m === 0) return b;
  if (b.m === 0) return a;
  return a.e >= b.e ? norm(a.m + ldexp(b.m, b.e - a.e), a.e) : norm(ldexp(a.m, a.e - b.e) + b.m, b.e);
}

export function negate(a: Scaled): Scaled {
  return a.m === 0 ? a : { m: -a.m, e: a.e };
}

export function abs(a: Scaled): Scaled {
  return a.m < 0 ? { m: -a.m, e: a.e } : a;
}

/** a − b, rounded once. */
export function minus(a: Scaled, b: Scaled): Scaled {
  return plus(a, negate(b));
}

/** √a for a ≥ 0, rounded once. */
export function root(a: Scaled): Scaled {
  if (a.m === 0) return a;
  return a.e % 2 === 0 ? norm(Math.sqrt(a.m), a.e / 2) : norm(Math.sqrt(2 * a.m), (a.e - 1) / 2);
}

/** √(a² + b²) by Math.hypot on the mantissas aligned to the larger exponent (no square leaves the range). */
export function hypotenuse(a: Scaled, b: Scaled): Scaled {
  if (a.m === 0) return abs(b);
  if (b.m === 0) return abs(a);
  const e = Math.max(a.e, b.e);
  return norm(Math.hypot(ldexp(a.m, a.e - e), ldexp(b.m, b.e - e)), e);
}

/** a·2^n, exact. */
export function timesPow2(a: Scaled, n: number): Scaled {
  return a.m === 0 ? a : { m: a.m, e: a.e + n };
}

/** −1, 0 or 1 as a is below, equal to or above b (exact). */
export function compare(a: Scaled, b: Scaled): -1 | 0 | 1 {
  const d = minus(a, b).m;
  return d < 0 ? -1 : d > 0 ? 1 : 0;
}

const BAND_LOW = 2 ** -400;
const BAND_HIGH = 2 ** 400;

/**
 * True for 0 and for |x| within 2^-400 … 2^400. A formula whose terms are products or quotients
 * of two such numbers (and constants), their sums and roots, stays within the normal range, so
 * plain doubles give exactly the bits scaled numbers give: the fast path of the worksheet functions.
 */
export function inBand(x: number): boolean {
  const a = Math.abs(x);
  return a === 0 || (a >= BAND_LOW && a <= BAND_HIGH);
}

/** The nearest double (±Infinity beyond the largest double, rounded once into the subnormal range). */
export function toDouble(a: Scaled): number {
  return ldexp(a.m, a.e);
}
