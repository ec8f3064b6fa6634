/**
 * Descriptive statistics of the lab's own results: mean, sample SD and CV (DATA.CV), and the
 * percent bias of results against targets (DATA.BIAS, DATA.RMSBIAS).
 *
 * Method: the mean is the correctly rounded sum over n (Shewchuk's exact partial sums, see
 * accurateMean), so it keeps its digits when the values cancel (0.1 + 0.2 − 0.3, or 1e16, 1,
 * −1e16); the sum of squares is taken in two passes about that mean, corrected as in the
 * corrected two-pass algorithm (Chan TF, Golub GH, LeVeque RJ. Algorithms for computing the sample
 * variance: analysis and recommendations. Am Stat 1983;37:242–7; cited from memory):
 * Σ(x − x̄)² − (Σ(x − x̄))²/n. No one-pass sums of squares, so data with many constant leading
 * digits (NIST StRD NumAcc4: 10000000.2, 10000000.1, …) keep their accuracy.
 *
 * Range: for sums of squares, data whose largest magnitude lies outside 2^-400 … 2^400 (about
 * 1e-120 … 1e120) are first multiplied by the power of two 2^-k that brings the largest to
 * 0.5 … 1 (exact), so no difference or square leaves the double range; values more than 2^1074
 * times smaller than the largest then count as 0, below the rounding of any sum of squares. The
 * mean needs no squares: tiny data are scaled up (exact) and data beyond 2^1000 down by only 2^24,
 * so a mean that cancels to far below the largest value keeps the small values. SDs are scaled
 * back once (beyond 1.8e308: #NUM!) and the CV is taken on scaled numbers.
 */
import { divError, numError, valueError } from '../errors';
import { show } from '../guards';
import { Scaled, ZERO, exponentOf, ldexp, minus, over, scaled, times, timesPow2, toDouble } from '../scaled';

/** Data within this band of binary exponents are used as they are. */
const BAND = 400;

/** Values, each multiplied by 2^-k (the exact figures are values[i]·2^k). */
export interface ScaledData {
  readonly values: ArrayLike<number>;
  readonly k: number;
}

/** The largest |x| (NaN and ±Infinity are the caller's to keep out). */
function largest(xs: ArrayLike<number>): number {
  let top = 0;
  for (let i = 0; i < xs.length; i++) top = Math.max(top, Math.abs(xs[i]));
  return top;
}

/** The k of scaleData: 0 when the largest magnitude lies between 2^-400 and 2^400 (or all are 0), else its binary exponent. */
export function bandExponent(xs: ArrayLike<number>): number {
  const top = largest(xs);
  const k = exponentOf(top);
  return top === 0 || (k > -BAND && k < BAND) ? 0 : k;
}

/**
 * The data as they are (k = 0) when the largest magnitude lies between 2^-400 and 2^400 (or all
 * are 0), else multiplied by 2^-k, k the binary exponent of the largest (exact, but for values
 * 2^1074 times smaller than the largest, which underflow).
 */
export function scaleData(xs: ArrayLike<number>): ScaledData {
  const k = bandExponent(xs);
  if (k === 0) return { values: xs, k: 0 };
  const values = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) values[i] = ldexp(xs[i], -k);
  return { values, k };
}

/**
 * Mean: the correctly rounded sum over n (accurateMean). Data below 2^-400 are scaled up to
 * 0.5 … 1 (exact, so a subnormal mean is rounded once), data from 2^1000 down by 2^24 (so no sum
 * overflows). Domain: at least one finite number.
 */
export function mean(xs: ArrayLike<number>): number {
  return toDouble(meanScaled(xs));
}

/** The mean as a scaled number (not yet rounded into the double range: a subnormal mean keeps its digits). */
export function meanScaled(xs: ArrayLike<number>): Scaled {
  if (xs.length === 0) throw numError('there are no numbers to average');
  const top = largest(xs);
  const e = exponentOf(top);
  const j = top === 0 ? 0 : e <= -BAND ? e : e > 1000 ? 24 : 0;
  if (j === 0) return scaled(accurateMean(xs));
  const values = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) values[i] = ldexp(xs[i], -j);
  return timesPow2(scaled(accurateMean(values)), j);
}

/**
 * Σx/n with the sum correctly rounded (so the mean is within one unit in the last place of the
 * exact mean, however the values cancel). Method: Shewchuk JR. Adaptive precision floating-point
 * arithmetic and fast robust geometric predicates. Discrete Comput Geom 1997;18:305–63 — the
 * sum is kept as non-overlapping partials, each addition exact (two-sum), then rounded once as
 * Python's math.fsum does (from memory). No partial overflows for data below 2^1000 in size (the
 * caller scales larger data).
 */
function accurateMean(xs: ArrayLike<number>): number {
  const partials: number[] = [];
  for (let k = 0; k < xs.length; k++) {
    let x = xs[k];
    let i = 0;
    for (let j = 0; j < partials.length; j++) {
      let y = partials[j];
      if (Math.abs(x) < Math.abs(y)) {
        const t = x;
        x = y;
        y = t;
      }
      const hi = x + y;
      const lo = y - (hi - x);
      if (lo !== 0) partials[i++] = lo;
      x = hi;
    }
    partials.length = i;
    partials.push(x);
  }
  let n = partials.length;
  let hi = 0;
  if (n > 0) {
    hi = partials[--n];
    let lo = 0;
    while (n > 0) {
      const x = hi;
      const y = partials[--n];
      hi = x + y;
      lo = y - (hi - x);
      if (lo !== 0) break;
    }
    // Round half-way cases as the exact sum of the remaining partials says.
    if (n > 0 && ((lo < 0 && partials[n - 1] < 0) || (lo > 0 && partials[n - 1] > 0))) {
      const y = lo * 2;
      const x = hi + y;
      if (y === x - hi) hi = x;
    }
  }
  return hi / xs.length;
}

/** Σ(x − m)² − (Σ(x − m))²/n, the centred sum of squares about the (corrected) mean m. */
export function centredSumOfSquares(xs: ArrayLike<number>, m: number): number {
  let ss = 0;
  let s = 0;
  for (let i = 0; i < xs.length; i++) {
    const d = xs[i] - m;
    ss += d * d;
    s += d;
  }
  return Math.max(0, ss - (s * s) / xs.length);
}

export interface Summary {
  readonly n: number;
  readonly mean: number;
  /** Sample SD, denominator n − 1. */
  readonly sd: number;
}

/** Mean and sample SD as scaled numbers (neither rounded into the double range yet). */
function scaledSummary(xs: ArrayLike<number>): { readonly n: number; readonly mean: Scaled; readonly sd: Scaled } {
  const n = xs.length;
  if (n < 2) throw numError(`a sample SD needs at least 2 numbers (got ${n})`);
  const m = meanScaled(xs);
  const d = scaleData(xs);
  // About the mean in the units of the scaled data; the sum of squares corrects a centre that
  // lost digits in that scaling (a mean far below the largest value).
  const ss = centredSumOfSquares(d.values, toDouble(timesPow2(m, -d.k)));
  return { n, mean: m, sd: timesPow2(scaled(Math.sqrt(ss / (n - 1))), d.k) };
}

/** Mean and sample SD (n − 1). Domain: at least 2 numbers (fewer: #NUM!); a SD beyond 1.8e308 is #NUM!. */
export function summarize(xs: ArrayLike<number>): Summary {
  const s = scaledSummary(xs);
  const sd = toDouble(s.sd);
  if (sd === Infinity) {
    throw numError(`the SD exceeds the largest number Excel can hold (about 1.8e308): the values reach ${show(largest(xs))}`);
  }
  return { n: s.n, mean: toDouble(s.mean), sd };
}

/**
 * CV % = 100·SD/mean (the sign follows the mean: a CV is meant for results on a ratio scale,
 * where the mean is positive). mean = 0 → #DIV/0!; a CV beyond 1.8e308 is #NUM!.
 */
export function cvPercent(sd: number, m: number, what = 'the mean'): number {
  return cvPercentScaled(scaled(sd), scaled(m), what);
}

/** cvPercent of scaled numbers: neither the product nor the quotient leaves the range; rounded once. */
export function cvPercentScaled(sd: Scaled, m: Scaled, what = 'the mean'): number {
  if (m.m === 0) throw divError(`${what} is zero, so a CV (SD / mean) cannot be formed`);
  const cv = toDouble(over(times(scaled(100), sd), m));
  if (cv - cv !== 0) {
    throw numError(`the CV exceeds the largest number Excel can hold (about 1.8e308): ${what} is too close to zero beside the SD`);
  }
  return cv;
}

/**
 * DATA.CV: sample coefficient of variation, 100·s/x̄ with s the n − 1 SD (common practice, e.g.
 * CLSI EP15-A3). At least 2 numbers (#NUM!); a zero mean is #DIV/0!. Scale-free: taken on the
 * scaled data.
 */
export function sampleCv(xs: ArrayLike<number>): number {
  const s = scaledSummary(xs);
  return cvPercentScaled(s.sd, s.mean);
}

/**
 * Percent biases 100·(result − target)/target of paired results, each taken on scaled numbers (so
 * result − target and the quotient never leave the range), then brought to one scale: the biases
 * are values[i]·2^k. A zero target is #DIV/0!.
 */
export function percentBiases(results: ArrayLike<number>, targets: ArrayLike<number>): ScaledData {
  if (results.length !== targets.length) {
    throw valueError(`results and targets do not pair up (${results.length} results, ${targets.length} targets)`);
  }
  const n = results.length;
  if (n === 0) throw numError('there are no pairs of numbers (result and target) to compare');
  const hundred = scaled(100);
  const m = new Float64Array(n);
  const e = new Int32Array(n);
  let top = -Infinity;
  for (let i = 0; i < n; i++) {
    const t = targets[i];
    if (t === 0) throw divError(`target ${i + 1} is zero: a percent bias divides by the target`);
    const st = scaled(t);
    const b = over(times(hundred, minus(scaled(results[i]), st)), st);
    m[i] = b.m;
    e[i] = b.e;
    if (b.m !== 0) top = Math.max(top, b.e);
  }
  if (top === -Infinity) return { values: m, k: 0 };
  // One scale for all: the largest bias lies in 0.5 … 1 (k = 0 when the biases are within the band).
  const k = top > -BAND && top < BAND ? 0 : top;
  for (let i = 0; i < n; i++) m[i] = ldexp(m[i], e[i] - k);
  return { values: m, k };
}

/**
 * DATA.BIAS: mean percent bias, (1/n)·Σ 100·(resultᵢ − targetᵢ)/targetᵢ, signed (common practice;
 * the bias from EQA or CRM results in Nordtest TR 537). At least one pair; zero target #DIV/0!.
 */
export function meanPercentBias(results: ArrayLike<number>, targets: ArrayLike<number>): number {
  const b = percentBiases(results, targets);
  const scaledMean = accurateMean(b.values);
  cancellationCheck(b, scaledMean);
  const m = ldexp(scaledMean, b.k);
  if (m - m !== 0) throw numError('the mean percent bias exceeds the largest number Excel can hold (about 1.8e308): a target is tiny beside its result');
  return m;
}

/**
 * #NUM! when the biases cancel below their own rounding: each bias carries up to three roundings
 * and the mean about n more, so the mean is known to ±(n + 4)·2^-53·mean|bias|. When that bound
 * exceeds both the mean itself and 1e-9 percentage points, the mean has no reliable digit (biases
 * of ±1e618 % whose exact mean is −100 %, say) and is not given. Ordinary biases (below about
 * 1e6 %) never come near it.
 */
function cancellationCheck(b: ScaledData, scaledMean: number): void {
  const n = b.values.length;
  let sumAbs = 0;
  let top = 0;
  for (let i = 0; i < n; i++) {
    sumAbs += Math.abs(b.values[i]);
    top = Math.max(top, Math.abs(b.values[i]));
  }
  const bound = ((n + 4) * 2 ** -53 * sumAbs) / n;
  if (bound > Math.abs(scaledMean) && ldexp(bound, b.k) > 1e-9) {
    throw numError(
      `the percent biases cancel: their mean is smaller than the rounding of biases as large as ${magnitude(timesPow2(scaled(top), b.k))} %, so no digit of it is reliable (check results and targets)`,
    );
  }
}

/** A size for a message: the number to 3 digits, or "about 1e618" beyond the double range. */
function magnitude(a: Scaled): string {
  const x = toDouble(a);
  if (x - x === 0 && x !== 0) return show(Number(x.toPrecision(3)));
  return `about 1e${Math.round(Math.log10(Math.abs(a.m)) + a.e * Math.LOG10E * Math.LN2)}`;
}

/**
 * Root mean square √((1/n)·Σ xᵢ²) of values·2^k: the values are multiplied by the power of two
 * that brings the largest to 0.5 … 1 (exact), so no square leaves the range; the result is scaled
 * back once and never exceeds the largest |value|·2^k.
 */
export function rootMeanSquare(xs: ArrayLike<number>, k = 0): number {
  return toDouble(rootMeanSquareScaled(xs, k));
}

/** rootMeanSquare as a scaled number (not yet rounded into the double range). */
export function rootMeanSquareScaled(xs: ArrayLike<number>, k = 0): Scaled {
  const n = xs.length;
  if (n === 0) throw numError('there are no numbers for a root mean square');
  const top = largest(xs);
  if (top === 0) return ZERO;
  if (!Number.isFinite(top)) throw numError(`a value is not finite (got ${show(top)})`);
  const j = exponentOf(top);
  let s = 0;
  for (let i = 0; i < n; i++) {
    const r = ldexp(xs[i], -j);
    s += r * r;
  }
  return timesPow2(scaled(Math.sqrt(s / n)), j + k);
}

/**
 * DATA.RMSBIAS: root-mean-square percent bias √((1/n)·Σ biasᵢ²), biasᵢ = 100·(resultᵢ − targetᵢ)/targetᵢ:
 * Nordtest TR 537 (Magnusson et al. 2017) RMS(bias), which counts both the mean bias and its
 * scatter. At least one pair; zero target #DIV/0!.
 */
export function rmsPercentBias(results: ArrayLike<number>, targets: ArrayLike<number>): number {
  const b = percentBiases(results, targets);
  const r = rootMeanSquare(b.values, b.k);
  if (r === Infinity) throw numError('the RMS percent bias exceeds the largest number Excel can hold (about 1.8e308): a target is tiny beside its result');
  return r;
}

