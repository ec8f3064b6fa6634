/**
 * DATA.AGREEMENT: limits of agreement of two methods measuring the same samples (Bland JM,
 * Altman DG. Statistical methods for assessing agreement between two methods of clinical
 * measurement. Lancet 1986;i:307–10; Bland JM, Altman DG. Measuring agreement in method
 * comparison studies. Stat Methods Med Res 1999;8:135–60).
 *
 *   dᵢ = yᵢ − xᵢ                                   (scale "absolute", result units)
 *   dᵢ = 100·(yᵢ − xᵢ)/((xᵢ + yᵢ)/2)               (scale "percent", percent of the pair's mean)
 *   d̄ = mean difference, s_d = SD of the differences (n − 1)
 *   limits of agreement  d̄ − 1.96·s_d  and  d̄ + 1.96·s_d
 *   t = t_{(1+c)/2}(n − 1)
 *   interval of d̄          d̄ ∓ t·s_d/√n
 *   interval of each limit  limit ∓ t·s_d·√(1/n + 1.96²/(2(n − 1)))
 *
 * The last is the 1986 paper's approximation Var(d̄ ± 1.96·s_d) ≈ (1/n + 1.96²/(2(n − 1)))·s_d²
 * (the paper rounds it to 3s_d²/n; from memory). x is the comparative method, y the candidate, as for
 * DATA.COMPARE. c = confidence (default 0.95) sets only the intervals; the limits themselves are
 * always ±1.96 SD (95 % of differences).
 *
 * Domain: x and y paired (#VALUE! otherwise), finite, at least 3 pairs (#NUM!); in percent, a pair
 * with x + y = 0 is #DIV/0! naming its position; 0 < confidence < 1.
 *
 * Method (numerical): differences are formed after scaling all x and y by one power of two when
 * they are extremely large or small (exact), the mean by the corrected two-pass method and the SD
 * from squares about it (Chan, Golub & LeVeque, Am Stat 1983;37:242–7), so neither a large common
 * level nor a huge or tiny unit loses digits or overflows.
 */
import { divError, numError, valueError } from '../errors';
import { openProbability } from '../guards';
import { makeWordReader } from '../words';
import { centredSumOfSquares, mean } from '../data/describe';
import { tQuantile } from '../data/studentT';
import { finiteResults, inRange, maxAbs, powerOfTwoScale } from './common';

export type AgreementScale = 'absolute' | 'percent';

export const DEFAULT_AGREEMENT_SCALE: AgreementScale = 'absolute';
export const DEFAULT_AGREEMENT_CONFIDENCE = 0.95;

/** The scale word: "absolute" (default; also "abs") or "percent" (also "pct", "%"), any case. */
export const readAgreementScale = makeWordReader<AgreementScale>('scale', {
  absolute: ['abs'],
  percent: ['pct', '%'],
});

/** The limits of agreement use ±1.96 SD (Bland & Altman 1986), whatever the confidence. */
export const AGREEMENT_Z = 1.96;

export interface Agreement {
  readonly meanDifference: number;
  readonly meanDifferenceLow: number;
  readonly meanDifferenceHigh: number;
  readonly sdDifferences: number;
  readonly lowerLimit: number;
  readonly lowerLimitLow: number;
  readonly lowerLimitHigh: number;
  readonly upperLimit: number;
  readonly upperLimitLow: number;
  readonly upperLimitHigh: number;
  readonly pairs: number;
}

/** The differences y − x, or 100·(y − x)/((x + y)/2), of the pairs scaled by f. */
function differences(x: ArrayLike<number>, y: ArrayLike<number>, scale: AgreementScale, f: number): Float64Array {
  const n = x.length;
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const xs = x[i] * f;
    const ys = y[i] * f;
    if (scale === 'absolute') {
      d[i] = ys - xs;
    } else {
      const sum = xs + ys;
      if (sum === 0) throw divError(`pair ${i + 1}: x + y is zero, and a percent difference divides by the pair's mean`);
      d[i] = (200 * (ys - xs)) / sum;
    }
  }
  return d;
}

export function agreement(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  scale: AgreementScale = DEFAULT_AGREEMENT_SCALE,
  confidence = DEFAULT_AGREEMENT_CONFIDENCE,
): Agreement {
  const n = x.length;
  if (y.length !== n) throw valueError(`x and y do not pair up (${n} x values, ${y.length} y values)`);
  if (n < 3) throw numError(`limits of agreement need at least 3 pairs of numbers (got ${n})`);
  finiteResults(x, 'x value');
  finiteResults(y, 'y value');
  openProbability(confidence, 'confidence');

  // Percent differences do not depend on the unit; absolute ones are scaled back below.
  const f = powerOfTwoScale(maxAbs(x, y));
  const d = differences(x, y, scale, f);
  const unit = scale === 'absolute' ? f : 1;
  const m = mean(d);
  const sd = Math.sqrt(centredSumOfSquares(d, m) / (n - 1));
  const t = -tQuantile((1 - confidence) / 2, n - 1);
  const halfMean = (t * sd) / Math.sqrt(n);
  const halfLimit = t * sd * Math.sqrt(1 / n + (AGREEMENT_Z * AGREEMENT_Z) / (2 * (n - 1)));
  const lower = m - AGREEMENT_Z * sd;
  const upper = m + AGREEMENT_Z * sd;
  const out = (v: number, what: string): number => inRange(v / unit, what);
  return {
    meanDifference: out(m, 'the mean difference'),
    meanDifferenceLow: out(m - halfMean, 'the low end of the mean difference'),
    meanDifferenceHigh: out(m + halfMean, 'the high end of the mean difference'),
    sdDifferences: out(sd, 'the SD of the differences'),
    lowerLimit: out(lower, 'the lower limit of agreement'),
    lowerLimitLow: out(lower - halfLimit, 'the low end of the lower limit'),
    lowerLimitHigh: out(lower + halfLimit, 'the high end of the lower limit'),
    upperLimit: out(upper, 'the upper limit of agreement'),
    upperLimitLow: out(upper - halfLimit, 'the low end of the upper limit'),
    upperLimitHigh: out(upper + halfLimit, 'the high end of the upper limit'),
    pairs: n,
  };
}
