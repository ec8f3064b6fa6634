/**
 * The chi-square distribution with ν > 0 degrees of freedom (ν may be fractional, as a
 * Satterthwaite df is): lower and upper tail probabilities and the quantile χ²_p(ν), for the
 * confidence limits of an SD or CV and the verification limit of a precision claim.
 *
 * χ²(ν) is twice a gamma variable of shape a = ν/2: P(χ² ≤ x) = P(a, x/2), the regularised lower
 * incomplete gamma function P(a, y) = γ(a, y)/Γ(a), and Q(a, y) = 1 − P(a, y).
 *
 * Method (tails): with D = y^a·e^(−y)/Γ(a),
 *   P(a, y) = (D/a)·Σₙ yⁿ/((a + 1)(a + 2)…(a + n))                  for y < a + 1 (A&S 6.5.29)
 *   Q(a, y) = D / (y + 1 − a − 1·(1 − a)/(y + 3 − a − 2·(2 − a)/(y + 5 − a − …)))   for y ≥ a + 1
 * the continued fraction (A&S 6.5.31, even form) evaluated by the modified Lentz method; the other
 * tail is 1 minus the one computed, which costs digits only where that tail is small: for
 * y < a + 1 only when a is small (Q(a, a + 1) → a·E₁(1) as a → 0), hence the larger errors below
 * ν = 0.5. Everything is carried as logarithms, so no tail underflows. ln D for a < 10 is
 * a·ln y − y − ln Γ(a) (Lanczos); for a ≥ 10 it is ½ln(a/2π) + a·[ln(1 + u) − u] − S(a), u = (y − a)/a,
 * S the Stirling series of ln Γ, and ln(1 + u) − u summed from its own series for |u| ≤ ½ (taken
 * as a·ln(y/a) − (y − a) further out, where nothing cancels), so the large terms a·ln y, y and
 * ln Γ(a) never cancel (as in DiDonato & Morris, ACM TOMS 1986;12:377–93, and Boost's regularised
 * gamma prefix; cited from memory).
 *
 * Method (quantile): the root y of ln P(a, y) = ln p (lower half, p ≤ ½) or ln Q(a, y) = ln q
 * (upper half, q = 1 − p < ½, or q given directly, so a small upper tail keeps all its digits),
 * by Newton's method in ln y: d ln P/d ln y = D/P, d ln Q/d ln y = −D/Q. Both equations are concave
 * in ln y (the log of a gamma variable has a log-concave density, so its CDF and survival function
 * are log-concave), so Newton's iterates approach the root from one side after at most one step;
 * a bracket kept from the signs seen, with geometric bisection when a step leaves it, makes that a
 * guarantee. Start: Wilson–Hilferty, y = a·(1 − 1/(9a) + z/(3√a))³, z = Φ⁻¹(p) (Wilson EB,
 * Hilferty MM. PNAS 1931;17:684–8), raised in the lower tail to the bound y ≥ (p·Γ(a + 1))^(1/a)
 * (which holds because P(a, y) ≤ yᵃ/Γ(a + 1)). Stop when a Newton step is below 1e-12 in ln y
 * (applied; quadratic convergence leaves ~1e-24) or the bracket is one rounding wide.
 * For ν ≥ 2e5 and |z|⁷ ≤ 5e-12·ν³ (where the series and fraction would need O(√ν) terms) the
 * Cornish–Fisher expansion of the chi-square quantile to the ν^(−3/2) term is used instead
 * (A&S 26.4.18; from memory, and checked against the 60-digit reference below).
 *
 * Accuracy (measured against a 60-digit decimal.js reference, test/fixtures/chi-square, generated
 * by scripts/make-chisquare-reference.js): relative error of the quantile at most 1.0e-14 at
 * ν = 0.5, 1, 2.7, 4, 24, 1000 for p from 1e-10 to 1 − 1e-10 and upper tails 0.05/L, 0.025/L
 * (L = 1…10), worst at ν = 0.5 (the test allows 2e-14); the same in the far tails (1e-300);
 * below 1e-15 at ν = 1e5, 2e5, 1e6. Measured once while writing this (not in the tests): 3.8e-14
 * at ν = 0.02, 1.6e-14 at ν = 0.1. The closed forms for ν = 1 and 2 agree to 1e-14. For very
 * small ν the lower quantiles underflow to 0 (at ν = 0.02 already for p ≤ 1e-6).
 */
import { normalQuantile } from '../normal';
import { lnGamma, stirlingTail } from './studentT';

const LN_SQRT_2PI = 0.91893853320467274178;
const TINY = 1e-300;
const SMALLEST_NORMAL = 2.2250738585072014e-308;

/** ln(1 + u) − u, u > −1, without cancellation for small |u|. */
export function log1pMinus(u: number): number {
  if (!(Math.abs(u) <= 0.5)) return Math.log1p(u) - u;
  // With s = u/(2 + u): ln(1 + u) = 2·(s + s³/3 + s⁵/5 + …) and u − 2s = u·s, so
  // ln(1 + u) − u = −u·s + 2·(s³/3 + s⁵/5 + …); |s| ≤ ⅓, so 30 terms are more than enough.
  const s = u / (2 + u);
  const s2 = s * s;
  let power = s * s2;
  let sum = 0;
  for (let k = 3; k < 80; k += 2) {
    const term = power / k;
    sum += term;
    if (Math.abs(term) <= 1e-17 * Math.abs(sum)) break;
    power *= s2;
  }
  return -u * s + 2 * sum;
}

/** ln(y^a·e^(−y)/Γ(a)) = ln(y·f(y)), f the gamma(a) density; a > 0, y > 0. */
function lnPrefix(a: number, y: number): number {
  if (a < 10) return a * Math.log(y) - y - lnGamma(a);
  // a·[ln(y/a) − (y/a − 1)], from the series near y = a, else directly (no cancellation there).
  const r = y / a;
  let core: number;
  if (Math.abs(y - a) <= 0.5 * a) core = a * log1pMinus((y - a) / a);
  else if (r > 0 && r < Infinity) core = a * Math.log(r) - (y - a);
  else core = a * (Math.log(y) - Math.log(a)) - (y - a);
  return 0.5 * Math.log(a) - LN_SQRT_2PI + core - stirlingTail(a);
}

/** Σₙ yⁿ/((a + 1)…(a + n)), y < a + 1. */
function gammaSeries(a: number, y: number): number {
  let term = 1;
  let sum = 1;
  for (let n = 1; n < 10_000_000; n++) {
    term *= y / (a + n);
    sum += term;
    if (term <= 1e-17 * sum) break;
  }
  return sum;
}

/** The continued fraction 1/(y + 1 − a − 1·(1 − a)/(y + 3 − a − …)), y ≥ a + 1 (modified Lentz). */
function gammaFraction(a: number, y: number): number {
  let b = y + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10_000_000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) <= 1e-16) break;
  }
  return h;
}

interface LogTails {
  /** ln P(a, y). */
  readonly lower: number;
  /** ln Q(a, y). */
  readonly upper: number;
  /** ln(y^a·e^(−y)/Γ(a)). */
  readonly prefix: number;
}

/** ln P(a, y), ln Q(a, y) and the log prefix, a > 0, 0 < y < ∞. */
function logTails(a: number, y: number): LogTails {
  const prefix = lnPrefix(a, y);
  if (y < a + 1) {
    const lower = prefix - Math.log(a) + Math.log(gammaSeries(a, y));
    return { lower, upper: Math.log1p(-Math.exp(lower)), prefix };
  }
  const upper = prefix + Math.log(gammaFraction(a, y));
  return { lower: Math.log1p(-Math.exp(upper)), upper, prefix };
}

/** P(χ² ≤ x) for ν > 0 degrees of freedom (x ≤ 0 gives 0). */
export function chiSquareCdf(x: number, nu: number): number {
  if (Number.isNaN(x) || !(nu > 0)) return NaN;
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return Math.exp(logTails(nu / 2, x / 2).lower);
}

/** P(χ² > x) for ν > 0 degrees of freedom, computed without subtracting from 1 in the upper tail. */
export function chiSquareUpperTail(x: number, nu: number): number {
  if (Number.isNaN(x) || !(nu > 0)) return NaN;
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return Math.exp(logTails(nu / 2, x / 2).upper);
}

/**
 * The Cornish–Fisher expansion replaces the Newton solution when ν ≥ 2e5 and |z|⁷ ≤ 5e-12·ν³:
 * its truncation error, measured against the 50-digit reference, is about 4e-5·|z|⁷/ν³ relative
 * (≤ 2e-16 there), while the series and fraction would need O(√ν) terms.
 */
function useExpansion(z: number, nu: number): boolean {
  return nu >= 2e5 && Math.abs(z) ** 7 <= 5e-12 * nu * nu * nu;
}

/**
 * Cornish–Fisher expansion of χ²_p(ν) in z = Φ⁻¹(p), to the ν^(−3/2) term (A&S 26.4.18):
 *   ν + √(2ν)·z + ⅔(z² − 1) + (z³ − 7z)/(9√(2ν)) − (6z⁴ + 14z² − 32)/(405ν)
 *     + (9z⁵ + 256z³ − 433z)/(4860ν√(2ν)).
 */
function cornishFisher(z: number, nu: number): number {
  const r = Math.sqrt(2 * nu);
  const z2 = z * z;
  const t2 = (2 / 3) * (z2 - 1);
  const t3 = ((z2 - 7) * z) / (9 * r);
  const t4 = -((6 * z2 + 14) * z2 - 32) / (405 * nu);
  const t5 = (((9 * z2 + 256) * z2 - 433) * z) / (4860 * nu * r);
  return nu + (r * z + (t2 + (t3 + (t4 + t5))));
}

/** The y > 0 with P(a, y) = exp(lnTarget) (upper = false) or Q(a, y) = exp(lnTarget) (upper = true). */
function gammaRoot(a: number, lnTarget: number, upper: boolean, start: number): number {
  let lo = 0;
  let hi = Infinity;
  let y = start;
  for (let i = 0; i < 200; i++) {
    const t = logTails(a, y);
    const g = (upper ? t.upper : t.lower) - lnTarget;
    if (g === 0) return y;
    // Lower: g rises with y; upper: g falls with y.
    if (upper ? g > 0 : g < 0) lo = y;
    else hi = y;
    const slope = upper ? -Math.exp(t.prefix - t.upper) : Math.exp(t.prefix - t.lower);
    const step = -g / slope;
    if (Number.isFinite(step) && Math.abs(step) <= 1e-12) return y * Math.exp(step);
    let next = Number.isFinite(step) ? y * Math.exp(Math.max(-50, Math.min(50, step))) : NaN;
    if (!(next > lo && next < hi)) next = hi === Infinity ? y * 16 : lo === 0 ? y / 16 : Math.sqrt(lo * hi);
    if (hi < Infinity && hi - lo <= 4e-16 * hi) return next;
    // The root lies below the normal range of doubles: report the underflow as 0.
    if (hi <= SMALLEST_NORMAL) return 0;
    y = next;
  }
  return y;
}

/** The y with Q(a, y) = q (upper) or P(a, y) = p, from its Wilson–Hilferty start. */
function gammaQuantile(a: number, prob: number, upper: boolean): number {
  const z = upper ? -normalQuantile(prob) : normalQuantile(prob);
  const w = 1 - 1 / (9 * a) + z / (3 * Math.sqrt(a));
  const wh = w > 0 ? a * w * w * w : 0;
  let start: number;
  if (upper) {
    start = wh > 0 ? wh : Math.max(1, -Math.log(prob));
  } else {
    const bound = Math.exp((Math.log(prob) + lnGamma(a + 1)) / a);
    start = Math.max(wh, bound);
    if (!(start > 0)) start = Number.MIN_VALUE;
  }
  return gammaRoot(a, Math.log(prob), upper, start);
}

/**
 * χ²_p(ν): the x with P(χ² ≤ x) = p. Domain 0 < p < 1, ν > 0 (p = 0 gives 0, p = 1 Infinity,
 * anything else NaN: the callers guard). For p > ½ the upper tail 1 − p is solved for, which is
 * exact in double arithmetic; for an upper tail smaller than about 1e-16 use chiSquareUpperQuantile.
 * May underflow to 0 for very small ν and p (e.g. ν = 0.02, p = 1e-10).
 */
export function chiSquareQuantile(p: number, nu: number): number {
  if (Number.isNaN(p) || !(nu > 0 && nu < Infinity) || p < 0 || p > 1) return NaN;
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  if (p > 0.5) return chiSquareUpperQuantile(1 - p, nu);
  const z = normalQuantile(p);
  if (useExpansion(z, nu)) return cornishFisher(z, nu);
  return 2 * gammaQuantile(nu / 2, p, false);
}

/**
 * The x with P(χ² > x) = q: χ²_{1−q}(ν) with all the digits of a small q. Domain 0 < q < 1, ν > 0
 * (q = 0 gives Infinity, q = 1 gives 0, anything else NaN).
 */
export function chiSquareUpperQuantile(q: number, nu: number): number {
  if (Number.isNaN(q) || !(nu > 0 && nu < Infinity) || q < 0 || q > 1) return NaN;
  if (q === 0) return Infinity;
  if (q === 1) return 0;
  if (q > 0.5) return chiSquareQuantile(1 - q, nu);
  const z = -normalQuantile(q);
  if (useExpansion(z, nu)) return cornishFisher(z, nu);
  return 2 * gammaQuantile(nu / 2, q, true);
}
