/**
 * Analytical performance specifications (SPEC family). All CVs, biases and allowances are percent
 * numbers (5.7 means 5.7 %); every function is linear in its CV inputs, so any single consistent
 * unit also works. Tier factors: see tiers.ts. Model: Sandberg S, Fraser CG, Horvath AR, et al.
 * Clin Chem Lab Med 2015;53:833–5 (model 2, biological variation).
 */
import { BIAS_FACTOR, IMPRECISION_FACTOR, TIERS, Tier } from './tiers';
import { divisor, fits, nonNegative, positive } from './guards';
import { Scaled, compare, hypotenuse, inBand, over, plus, scaled, times, toDouble } from './scaled';

/*
 * Range: every input may be any finite double. Inputs within 2^-400 … 2^400 (or 0) take the plain
 * formula, which cannot leave the normal range there; others take it on scaled numbers
 * (scaled.ts: products, and the root of the sum of squares as a hypot), so no intermediate
 * overflows or underflows; the result is rounded once into the double range, and a result beyond
 * ±1.8e308 is #NUM! naming the inputs.
 */

/** g·√(CVI² + CVG²) as a scaled number (the square root by hypot on scaled numbers). */
export function allowableBiasScaled(cvi: number, cvg: number, tier: Tier): Scaled {
  return times(scaled(BIAS_FACTOR[tier]), hypotenuse(scaled(cvi), scaled(cvg)));
}

/** z·f·CVI + g·√(CVI² + CVG²) as a scaled number, evaluated as (z·f)·CVI + g·√(…). */
export function allowableTotalErrorScaled(cvi: number, cvg: number, tier: Tier, z: number): Scaled {
  return plus(times(times(scaled(z), scaled(IMPRECISION_FACTOR[tier])), scaled(cvi)), allowableBiasScaled(cvi, cvg, tier));
}

/** SPEC.CV: allowable imprecision = f·CVI. cvi ≥ 0. One product, rounded once at any size (f < 1: never overflows). */
export function allowableImprecision(cvi: number, tier: Tier): number {
  nonNegative(cvi, 'cvi');
  return IMPRECISION_FACTOR[tier] * cvi;
}

/** SPEC.BIAS: allowable bias = g·√(CVI² + CVG²). cvi, cvg ≥ 0. */
export function allowableBias(cvi: number, cvg: number, tier: Tier): number {
  nonNegative(cvi, 'cvi');
  nonNegative(cvg, 'cvg');
  if (inBand(cvi) && inBand(cvg)) return BIAS_FACTOR[tier] * Math.sqrt(cvi * cvi + cvg * cvg);
  return toDouble(allowableBiasScaled(cvi, cvg, tier)); // g·√2·1.8e308 < 1.8e308: always finite
}

/** SPEC.TOTAL: allowable total error = z·f·CVI + g·√(CVI² + CVG²). z ≥ 0 (default 1.65 at the wrapper). */
export function allowableTotalError(cvi: number, cvg: number, tier: Tier, z: number): number {
  nonNegative(cvi, 'cvi');
  nonNegative(cvg, 'cvg');
  nonNegative(z, 'z');
  if (inBand(cvi) && inBand(cvg) && inBand(z)) return z * IMPRECISION_FACTOR[tier] * cvi + BIAS_FACTOR[tier] * Math.sqrt(cvi * cvi + cvg * cvg);
  return fits(toDouble(allowableTotalErrorScaled(cvi, cvg, tier, z)), { cvi, cvg, z });
}

/**
 * SPEC.MU: maximum allowable measurement uncertainty from biological variation,
 * u = f·CVI (f as for imprecision), times the coverage factor k (k = 1: standard uncertainty;
 * k = 2: expanded). cvi ≥ 0, k > 0.
 */
export function allowableUncertainty(cvi: number, tier: Tier, k: number): number {
  nonNegative(cvi, 'cvi');
  positive(k, 'k');
  if (inBand(cvi) && inBand(k)) return k * IMPRECISION_FACTOR[tier] * cvi;
  return fits(toDouble(times(times(scaled(k), scaled(IMPRECISION_FACTOR[tier])), scaled(cvi))), { cvi, k });
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
  if (inBand(absolute) && inBand(level)) return Math.max((100 * absolute) / level, percent);
  const fromAbsolute = over(times(scaled(100), scaled(absolute)), scaled(level));
  if (compare(fromAbsolute, scaled(percent)) <= 0) return percent;
  return fits(toDouble(fromAbsolute), { level, absolute });
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
