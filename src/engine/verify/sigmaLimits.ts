/**
 * PERF.SIGMALIMITS: the sigma metric with confidence limits that carry the uncertainty of the CV
 * (estimated with df degrees of freedom) and of the bias (standard uncertainty u_bias).
 *
 *   σ = (allowable − |bias|)/cv
 *   u(σ) = √(u_bias² + σ²·cv²/(2·df)) / cv        first-order propagation (JCGM 100:2008, GUM,
 *                                                 law of propagation), with u(cv) ≈ cv/√(2·df)
 *   low = σ − z·u(σ),  high = σ + z·u(σ),  z = Φ⁻¹((1 + c)/2)
 *
 * u(cv) ≈ cv/√(2·df) is the large-sample standard error of an SD from normal data (common
 * practice, no source). Units: allowable, bias, cv and u_bias in percent (or any one unit);
 * σ is unitless and may be negative (|bias| beyond the allowance). Defaults u_bias = 0,
 * confidence 0.95. Domain: allowable ≥ 0, bias finite, cv > 0 (0 → #DIV/0!: a divisor),
 * df > 0 (#NUM!), u_bias ≥ 0, 0 < confidence < 1.
 *
 * Method (numerical): since σ·cv = allowable − |bias| = m, u(σ) = hypot(u_bias, m/√(2·df))/cv,
 * with a scaled hypot (no square over- or underflows) and m formed from two non-negative numbers
 * (it cannot overflow), so a finite answer is returned whenever one exists; #NUM! otherwise.
 */
import { divisor, finite, nonNegative, openProbability, positive } from '../guards';
import { normalQuantile } from '../normal';
import { inRange } from './common';

export interface SigmaLimits {
  readonly sigma: number;
  readonly low: number;
  readonly high: number;
}

export const DEFAULT_SIGMA_CONFIDENCE = 0.95;

export function sigmaLimits(
  allowable: number,
  bias: number,
  cv: number,
  df: number,
  uBias = 0,
  confidence = DEFAULT_SIGMA_CONFIDENCE,
): SigmaLimits {
  nonNegative(allowable, 'allowable');
  finite(bias, 'bias');
  divisor(cv, 'cv');
  positive(df, 'df');
  nonNegative(uBias, 'u_bias');
  openProbability(confidence, 'confidence');
  const margin = allowable - Math.abs(bias);
  const sigma = inRange(margin / cv, 'the sigma metric');
  const u = Math.hypot(uBias, margin / (Math.SQRT2 * Math.sqrt(df))) / cv;
  const z = -normalQuantile((1 - confidence) / 2);
  const half = inRange(z * u, 'the half-width of the sigma interval');
  return {
    sigma,
    low: inRange(sigma - half, 'the low end of the sigma interval'),
    high: inRange(sigma + half, 'the high end of the sigma interval'),
  };
}
