/**
 * High-precision references for tests (decimal.js, 80 significant digits): the exact value of a
 * double, the standard normal distribution and its quantile, and a check of a double against an
 * exact value that states how results at the edges of the double range are judged.
 *
 * The normal distribution: erf by its everywhere-positive series erf(z) = 2z·e^(−z²)/√π ·
 * Σ (2z²)ⁿ/(1·3·…·(2n+1)) (Abramowitz & Stegun 7.1.6, from memory); erfc(z) for z ≥ 3 by the
 * continued fraction erfc(z) = e^(−z²)/√π · 1/(z + ½/(z + 1/(z + 3/2/(z + …)))) (A&S 7.1.14, from
 * memory; checked in test/robustness/extremes.test.ts against 2Φ(−3), erfc(6) and Φ⁻¹(0.975)), evaluated
 * by the modified Lentz method to 1e-70; quantiles by Newton's method on these.
 */
import Decimal from 'decimal.js';

/** The decimal context of every reference: 80 significant digits, exponents without limit. */
export const D = Decimal.clone({ precision: 80, rounding: Decimal.ROUND_HALF_EVEN, toExpNeg: -7, toExpPos: 21, minE: -9e15, maxE: 9e15 });
export type Dec = Decimal;

/**
 * A context wide enough for sums of doubles to be exact: the largest double has 309 integer
 * digits and the smallest subnormal 1074 decimal places, so 1500 digits hold any sum of them (and
 * the references of means whose terms cancel, such as 1e300 + 1 − 1e300).
 */
export const DW = Decimal.clone({ precision: 1500, rounding: Decimal.ROUND_HALF_EVEN, toExpNeg: -7, toExpPos: 21, minE: -9e15, maxE: 9e15 });

const TWO = new D(2);

/** The exact value of a finite double (its binary value, not the decimal it was typed as), in DW: exact. */
export function exactWide(x: number): Dec {
  return new DW(exact(x, DW));
}

/** The value of a finite double (its binary value, not the decimal it was typed as), to 80 digits (or in `ctor`). */
export function exact(x: number, ctor: typeof D = D): Dec {
  if (x === 0) return new ctor(0);
  let e = 0;
  let m = Math.abs(x);
  // m·2^e = |x| with m a whole number below 2^53: scale by powers of two, each exact.
  while (!Number.isInteger(m)) {
    m *= 2;
    e -= 1;
  }
  while (m >= 2 ** 53) {
    m /= 2;
    e += 1;
  }
  const v = new ctor(m).times(new ctor(2).pow(e));
  return x < 0 ? v.neg() : v;
}

export const SMALLEST_NORMAL = 2.2250738585072014e-308;
export const SUBNORMAL_STEP = 5e-324; // 2^-1074
const MAX = exact(Number.MAX_VALUE);

const SQRT_PI = D.acos(-1).sqrt();
const SQRT2 = new D(2).sqrt();

/** erf(z), z ≥ 0, by the positive series (no cancellation). */
export function erf(z: Dec): Dec {
  if (z.isZero()) return new D(0);
  const z2 = z.times(z);
  const x = z2.times(2);
  let term = new D(1);
  let sum = new D(1);
  for (let n = 1; n < 100000; n++) {
    term = term.times(x).div(2 * n + 1);
    sum = sum.plus(term);
    if (term.lt(sum.times('1e-82'))) break;
  }
  return z.times(2).times(z2.neg().exp()).div(SQRT_PI).times(sum);
}

/** erfc(z), z ≥ 0: 1 − erf(z) below 3, the continued fraction from 3 on (relative accuracy about 1e-70). */
export function erfc(z: Dec): Dec {
  if (z.lt(3)) return new D(1).minus(erf(z));
  const tiny = new D('1e-300');
  let f = z;
  let C = z;
  let Dd = new D(0);
  for (let n = 1; n < 100000; n++) {
    const a = new D(n).div(2);
    Dd = z.plus(a.times(Dd));
    if (Dd.isZero()) Dd = tiny;
    Dd = new D(1).div(Dd);
    C = z.plus(a.div(C));
    if (C.isZero()) C = tiny;
    const delta = C.times(Dd);
    f = f.times(delta);
    if (delta.minus(1).abs().lt('1e-72')) break;
  }
  return z.times(z).neg().exp().div(SQRT_PI).div(f);
}

/** Φ(x) = P(Z ≤ x). */
export function phi(x: Dec): Dec {
  const z = x.abs().div(SQRT2);
  const tail = erfc(z).div(2); // P(Z > |x|)
  return x.isNegative() ? tail : new D(1).minus(tail);
}

/** P(Z > x), upper tail without cancellation. */
export function upperTail(x: Dec): Dec {
  return phi(x.neg());
}

/** The density φ(x). */
function density(x: Dec): Dec {
  return x.times(x).div(-2).exp().div(SQRT2.times(SQRT_PI));
}

/**
 * Solves f(x) = target for x by Newton's method from `start`, f increasing with derivative
 * fprime; stops when the step is below 1e-70·|x|.
 */
function newton(f: (x: Dec) => Dec, fprime: (x: Dec) => Dec, target: Dec, start: Dec): Dec {
  let x = start;
  for (let i = 0; i < 200; i++) {
    const step = f(x).minus(target).div(fprime(x));
    x = x.minus(step);
    if (step.abs().lte(x.abs().times('1e-70')) || step.isZero()) return x;
  }
  throw new Error(`Newton did not converge for target ${target.toString()}`);
}

/** erf⁻¹(y), 0 ≤ y < 1, from a double starting value. */
function inverseErf(y: Dec, start: number): Dec {
  if (y.isZero()) return new D(0);
  const two = new D(2).div(SQRT_PI);
  return newton(erf, (z) => two.times(z.times(z).neg().exp()), y, new D(start));
}

/** erfc⁻¹(y), 0 < y ≤ 1: Newton on −ln erfc(z) = −ln y (increasing and nearly linear in z² in the tail). */
function inverseErfc(y: Dec, start: number): Dec {
  const two = new D(2).div(SQRT_PI);
  const f = (z: Dec): Dec => erfc(z).ln().neg();
  const fprime = (z: Dec): Dec => two.times(z.times(z).neg().exp()).div(erfc(z));
  return newton(f, fprime, y.ln().neg(), new D(Math.max(start, 0)));
}

/**
 * Φ⁻¹(p) for an exact p in (0, 1); `start` is any double near the answer (Newton converges from
 * the engine's value or any guess of the right sign and size).
 */
export function quantile(p: Dec, start: number): Dec {
  const half = new D(0.5);
  if (p.eq(half)) return new D(0);
  if (p.lt(half)) {
    // Φ⁻¹(p) = −√2·erfc⁻¹(2p)
    const y = p.times(2);
    return y.gt(0.5) ? inverseErf(new D(1).minus(y), -start / Math.SQRT2).times(SQRT2).neg() : inverseErfc(y, -start / Math.SQRT2).times(SQRT2).neg();
  }
  return twoSidedQuantile(p.times(2).minus(1), start);
}

/** Φ⁻¹((1 + p)/2) = √2·erf⁻¹(p) for an exact p in [0, 1), computed without forming (1 + p)/2. */
export function twoSidedQuantile(p: Dec, start: number): Dec {
  if (p.lte(0.5)) return inverseErf(p, start / Math.SQRT2 || 1e-300).times(SQRT2);
  return inverseErfc(new D(1).minus(p), start / Math.SQRT2).times(SQRT2);
}

export { density as normalDensity };

/** How a computed double compares with its exact value. */
export interface Agreement {
  /** True when the double meets the rule below. */
  readonly ok: boolean;
  /** |computed − exact|/|exact| (0 for exact 0 and computed 0). */
  readonly relative: number;
  /** True when computed is the correctly rounded exact value. */
  readonly correctlyRounded: boolean;
  readonly why: string;
}

/**
 * The rule for a result whose exact value is finite and at most the largest double:
 * - exact value of normal size (≥ 2.2e-308): relative error ≤ relTol;
 * - exact value in the subnormal range: |computed − exact| ≤ relTol·|exact| + one subnormal step
 *   (4.9e-324), i.e. the correctly rounded value or its neighbour, and never 0 when the exact
 *   value is at least the smallest subnormal;
 * - `floor`: an absolute error allowed on top, for figures where the formula itself loses digits
 *   (a difference of larger terms): the caller gives relTol × the size of those terms.
 */
export function agree(computed: number, exactValue: Dec, relTol: number, floor: Dec | number = 0): Agreement {
  const c = exact(computed);
  const err = c.minus(exactValue).abs();
  const size = exactValue.abs();
  const relative = size.isZero() ? (computed === 0 ? 0 : Infinity) : err.div(size).toNumber();
  const correctlyRounded = nearest(exactValue) === computed;
  let allowed = size.times(relTol).plus(floor);
  if (size.lt(exact(SMALLEST_NORMAL))) allowed = allowed.plus(exact(SUBNORMAL_STEP));
  let ok = err.lte(allowed);
  let why = `computed ${computed}, exact ${exactValue.toSignificantDigits(20).toString()}, relative error ${relative}`;
  if (ok && computed === 0 && size.gte(exact(SUBNORMAL_STEP))) {
    ok = false;
    why += ': 0 although the exact value is at least the smallest subnormal';
  }
  return { ok, relative, correctlyRounded, why };
}

const STEP = TWO.pow(-1074);

/**
 * The double nearest the exact value, ties to even. Below the smallest normal double it is
 * counted in subnormal steps (2^-1074, the same decimal as exact() uses), so exact ties round as
 * IEEE 754 rounds them.
 */
export function nearest(exactValue: Dec): number {
  if (exactValue.abs().gte(exact(SMALLEST_NORMAL))) return exactValue.toNumber();
  // 60 digits first: an exact tie carries the last-digit rounding of 2^-1074 at 80 digits.
  const steps = exactValue.div(STEP).toSignificantDigits(60).toDecimalPlaces(0, D.ROUND_HALF_EVEN);
  return steps.toNumber() * SUBNORMAL_STEP;
}

/** True when no finite double holds the exact value (it rounds to ±Infinity). */
export function beyondRange(exactValue: Dec): boolean {
  return exactValue.abs().gt(MAX) && !Number.isFinite(exactValue.toNumber());
}

/** True when the exact value lies within relTol of the largest double (either answer is fair). */
export function nearLargest(exactValue: Dec, relTol: number): boolean {
  return exactValue.abs().minus(MAX).abs().lte(MAX.times(relTol * 4));
}
