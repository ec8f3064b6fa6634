/**
 * Coverage factors. z = 1.65 is the one-sided 95 % factor used by the total-error model
 * (common practice); 1.96 the two-sided 95 % factor used for reference change values and
 * set-point estimates.
 */
import { normalQuantile, normalQuantileTwoSided } from './normal';
import { numError } from './errors';
import { openProbability, show } from './guards';

export const Z_TOTAL_ERROR = 1.65;
export const Z_TWO_SIDED_95 = 1.96;

/**
 * ZSCORE(probability, [sides]): the standard-normal quantile for a coverage probability.
 * sides 1: Φ⁻¹(p); sides 2: Φ⁻¹((1 + p)/2), taken without rounding (1 + p)/2 (so p = 1e-300
 * gives 1.25e-300, not 0, and p just below 1 gives a finite z). Domain: 0 < p < 1, sides 1 or 2.
 */
export function zFromCoverage(probability: number, sides = 1): number {
  openProbability(probability, 'probability');
  if (sides === 1) return normalQuantile(probability);
  if (sides === 2) return normalQuantileTwoSided(probability);
  throw numError(`sides must be 1 or 2 (got ${show(sides)})`);
}
