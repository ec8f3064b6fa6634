/**
 * DATA.CVLIMITS: two-sided confidence limits of an SD (or a CV) estimated with df degrees of
 * freedom, from the chi-square distribution of ν·s²/σ²:
 *
 *   low  = cv·√(df / χ²_{(1+c)/2}(df))
 *   high = cv·√(df / χ²_{(1−c)/2}(df))
 *
 * c = confidence (default 0.95), χ²_p(ν) the p-quantile. The classical interval for a normal
 * variance (common practice, no source: any statistics text), exact for the SD of normal data;
 * for a CV it is the usual approximation, good when the CV is small (the mean's own error is then
 * negligible). df may be fractional (a Satterthwaite df, as for the within-lab CV).
 *
 * Units: those of cv (percent for a CV, result units for an SD). Domain: cv ≥ 0 (cv = 0 gives
 * 0 and 0), df > 0 (#NUM! otherwise: a count of degrees of freedom, not a divisor),
 * 0 < confidence < 1. #NUM! when df is so small for the confidence (below about 0.013 at 95 %)
 * that the upper limit exceeds any usable size.
 */
import { numError } from '../errors';
import { nonNegative, openProbability, positive, show } from '../guards';
import { chiSquareQuantile, chiSquareUpperQuantile } from '../data/chiSquare';
import { inRange } from './common';

export interface CvLimits {
  readonly low: number;
  readonly high: number;
}

export const DEFAULT_CV_CONFIDENCE = 0.95;

/** Smallest lower chi-square quantile used: below it the upper limit is more than 1e145 × cv·√df. */
const SMALLEST_QUANTILE = 1e-290;

export function cvLimits(cv: number, df: number, confidence = DEFAULT_CV_CONFIDENCE): CvLimits {
  nonNegative(cv, 'cv');
  positive(df, 'df');
  openProbability(confidence, 'confidence');
  if (cv === 0) return { low: 0, high: 0 };
  const tail = (1 - confidence) / 2;
  const upperQuantile = chiSquareUpperQuantile(tail, df);
  const lowerQuantile = chiSquareQuantile(tail, df);
  if (!(lowerQuantile >= SMALLEST_QUANTILE)) {
    throw numError(`df (got ${show(df)}) is too small for a confidence of ${show(confidence)}: the upper limit is too large to compute`);
  }
  return {
    low: inRange(cv * Math.sqrt(df / upperQuantile), 'the lower limit'),
    high: inRange(cv * Math.sqrt(df / lowerQuantile), 'the upper limit'),
  };
}
