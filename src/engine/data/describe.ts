/**
 * Descriptive statistics of the lab's own results: mean, sample SD and CV (DATA.CV), and the
 * percent bias of results against targets (DATA.BIAS, DATA.RMSBIAS).
 *
 * Method: the corrected two-pass algorithm (Chan TF, Golub GH, LeVeque RJ. Algorithms for
 * computing the sample variance: analysis and recommendations. Am Stat 1983;37:242–7; cited from
 * memory): the data
 * are first shifted by their first value (exact for data with common leading digits), the mean
 * is taken and then corrected by the mean of the residuals, and the sum of squares is
 * Σ(x − x̄)² − (Σ(x − x̄))²/n. No one-pass sums of squares, so data with many constant leading
 * digits (NIST StRD NumAcc4: 10000000.2, 10000000.1, …) keep their accuracy.
 */
import { divError, numError, valueError } from '../errors';
import { show } from '../guards';

/** Mean by the corrected two-pass method. Domain: at least one finite number. */
export function mean(xs: ArrayLike<number>): number {
  const n = xs.length;
  if (n === 0) throw numError('there are no numbers to average');
  const shift = xs[0];
  let s = 0;
  for (let i = 0; i < n; i++) s += xs[i] - shift;
  let m = shift + s / n;
  let c = 0;
  for (let i = 0; i < n; i++) c += xs[i] - m;
  m += c / n;
  return m;
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

/** Mean and sample SD (n − 1). Domain: at least 2 numbers (fewer: #NUM!). */
export function summarize(xs: ArrayLike<number>): Summary {
  const n = xs.length;
  if (n < 2) throw numError(`a sample SD needs at least 2 numbers (got ${n})`);
  const m = mean(xs);
  return { n, mean: m, sd: Math.sqrt(centredSumOfSquares(xs, m) / (n - 1)) };
}

/**
 * CV % = 100·SD/mean. The sign follows the mean (a CV is meant for results on a ratio scale,
 * where the mean is positive). mean = 0 → #DIV/0!.
 */
export function cvPercent(sd: number, m: number, what = 'the mean'): number {
  if (m === 0) throw divError(`${what} is zero, so a CV (SD / mean) cannot be formed`);
  return (100 * sd) / m;
}

/**
 * DATA.CV: sample coefficient of variation, 100·s/x̄ with s the n − 1 SD (common practice, e.g.
 * CLSI EP15-A3). At least 2 numbers (#NUM!); a zero mean is #DIV/0!.
 */
export function sampleCv(xs: ArrayLike<number>): number {
  const s = summarize(xs);
  return cvPercent(s.sd, s.mean);
}

/** Percent biases 100·(result − target)/target of paired results; a zero target is #DIV/0!. */
export function percentBiases(results: ArrayLike<number>, targets: ArrayLike<number>): Float64Array {
  if (results.length !== targets.length) {
    throw valueError(`results and targets do not pair up (${results.length} results, ${targets.length} targets)`);
  }
  if (results.length === 0) throw numError('there are no pairs of numbers (result and target) to compare');
  const out = new Float64Array(results.length);
  for (let i = 0; i < results.length; i++) {
    const t = targets[i];
    if (t === 0) throw divError(`target ${i + 1} is zero: a percent bias divides by the target`);
    out[i] = (100 * (results[i] - t)) / t;
  }
  return out;
}

/**
 * DATA.BIAS: mean percent bias, (1/n)·Σ 100·(resultᵢ − targetᵢ)/targetᵢ, signed (common practice;
 * the bias from EQA or CRM results in Nordtest TR 537). At least one pair; zero target #DIV/0!.
 */
export function meanPercentBias(results: ArrayLike<number>, targets: ArrayLike<number>): number {
  return mean(percentBiases(results, targets));
}

/** Root mean square √((1/n)·Σ xᵢ²) (scaled so squares of large values do not overflow). */
export function rootMeanSquare(xs: ArrayLike<number>): number {
  const n = xs.length;
  if (n === 0) throw numError('there are no numbers for a root mean square');
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(xs[i]));
  if (scale === 0) return 0;
  if (!Number.isFinite(scale)) throw numError(`a value is not finite (got ${show(scale)})`);
  let s = 0;
  for (let i = 0; i < n; i++) {
    const r = xs[i] / scale;
    s += r * r;
  }
  return scale * Math.sqrt(s / n);
}

/**
 * DATA.RMSBIAS: root-mean-square percent bias √((1/n)·Σ biasᵢ²), biasᵢ = 100·(resultᵢ − targetᵢ)/targetᵢ:
 * Nordtest TR 537 (Magnusson et al. 2017) RMS(bias), which counts both the mean bias and its
 * scatter. At least one pair; zero target #DIV/0!.
 */
export function rmsPercentBias(results: ArrayLike<number>, targets: ArrayLike<number>): number {
  return rootMeanSquare(percentBiases(results, targets));
}
