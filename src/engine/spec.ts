/**
 * Analytical performance specifications (SPEC family). All CVs, biases and allowances are percent
 * numbers (5.7 means 5.7 %); every function is linear in its CV inputs, so any single consistent
 * unit also works. Tier factors: see tiers.ts. Model: Sandberg S, Fraser CG, Horvath AR, et al.
 * Clin Chem Lab Med 2015;53:833–5 (model 2, biological variation).
 */
import { BIAS_FACTOR, IMPRECISION_FACTOR, TIERS, Tier } from './tiers';
import { divisor, nonNegative, positive } from './guards';

/** SPEC.CV: allowable imprecision = f·CVI. cvi ≥ 0. */
export function allowableImprecision(cvi: number, tier: Tier): number {
  nonNegative(cvi, 'cvi');
  return IMPRECISION_FACTOR[tier] * cvi;
}

/** SPEC.BIAS: allowable bias = g·√(CVI² + CVG²). cvi, cvg ≥ 0. */
export function allowableBias(cvi: number, cvg: number, tier: Tier): number {
  nonNegative(cvi, 'cvi');
  nonNegative(cvg, 'cvg');
  return BIAS_FACTOR[tier] * Math.sqrt(cvi * cvi + cvg * cvg);
}

/** SPEC.TOTAL: allowable total error = z·f·CVI + g·√(CVI² + CVG²). z ≥ 0 (default 1.65 at the wrapper). */
export function allowableTotalError(cvi: number, cvg: number, tier: Tier, z: number): number {
  nonNegative(cvi, 'cvi');
  nonNegative(cvg, 'cvg');
  nonNegative(z, 'z');
  return z * IMPRECISION_FACTOR[tier] * cvi + BIAS_FACTOR[tier] * Math.sqrt(cvi * cvi + cvg * cvg);
}

/**
 * SPEC.MU: maximum allowable measurement uncertainty from biological variation,
 * u = f·CVI (f as for imprecision), times the coverage factor k (k = 1: standard uncertainty;
 * k = 2: expanded). cvi ≥ 0, k > 0.
 */
export function allowableUncertainty(cvi: number, tier: Tier, k: number): number {
  nonNegative(cvi, 'cvi');
  positive(k, 'k');
  return k * IMPRECISION_FACTOR[tier] * cvi;
}

/**
 * SPEC.FIXED: a regulatory or EQA limit "± absolute units or ± percent, whichever is greater",
 * as a percent at the concentration `level`: max(100·absolute/level, percent).
 * level > 0 (0 is #DIV/0!), absolute ≥ 0 and percent ≥ 0 (0 when the limit has no such part).
 */
export function fixedLimitPercent(level: number, absolute: number, percent: number): number {
  divisor(level, 'level');
  nonNegative(absolute, 'absolute');
  nonNegative(percent, 'percent');
  return Math.max((100 * absolute) / level, percent);
}

export interface TierRow {
  tier: Tier;
  cv: number;
  bias: number;
  total: number;
}

/** SPEC.TIERS: the three tiers side by side, most stringent first. */
export function tierTable(cvi: number, cvg: number, z: number): TierRow[] {
  return TIERS.map((tier) => ({
    tier,
    cv: allowableImprecision(cvi, tier),
    bias: allowableBias(cvi, cvg, tier),
    total: allowableTotalError(cvi, cvg, tier, z),
  }));
}
