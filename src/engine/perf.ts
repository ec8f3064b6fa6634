/**
 * Observed performance against a specification (PERF family) and the critical systematic error
 * (QC.SHIFT). Percent numbers throughout; bias is signed on input and used as |bias|.
 * Total-error model: Westgard JO, Carey RN, Wold S. Clin Chem 1974;20:825–33 (from memory);
 * sigma metric and critical systematic error: Westgard JO, Groth T. Clin Chem 1979;25:863–9
 * and Westgard et al. Clin Chem 1981;27:493–501.
 */
import { allowableBiasScaled, allowableTotalErrorScaled } from './spec';
import { BIAS_FACTOR, IMPRECISION_FACTOR, TIERS, Tier } from './tiers';
import { divisor, finite, fits, nonNegative } from './guards';
import { makeWordReader } from './words';
import { Scaled, compare, inBand, minus, over, plus, scaled, times, toDouble } from './scaled';

/*
 * Range: any finite doubles. Inputs within 2^-400 … 2^400 (or 0) take the plain formula; others
 * take it on scaled numbers (scaled.ts), rounded once into the double range; a result beyond
 * ±1.8e308 is #NUM! naming the inputs, and PERF.TIER compares the scaled totals, so neither side
 * overflows to Infinity.
 */

/** |bias| + z·CV as a scaled number. */
function observedTotalErrorScaled(bias: number, cv: number, z: number): Scaled {
  return plus(scaled(Math.abs(bias)), times(scaled(z), scaled(cv)));
}

/** (allowable − |bias|)/CV as a scaled number. */
function sigmaMetricScaled(allowable: number, bias: number, cv: number): Scaled {
  return over(minus(scaled(allowable), scaled(Math.abs(bias))), scaled(cv));
}

/** PERF.TOTAL: observed total error = |bias| + z·CV. cv ≥ 0, z ≥ 0. */
export function observedTotalError(bias: number, cv: number, z: number): number {
  finite(bias, 'bias');
  nonNegative(cv, 'cv');
  nonNegative(z, 'z');
  if (inBand(bias) && inBand(cv) && inBand(z)) return Math.abs(bias) + z * cv;
  return fits(toDouble(observedTotalErrorScaled(bias, cv, z)), { bias, cv, z });
}

/** PERF.SIGMA: sigma metric = (allowable − |bias|)/CV; negative when |bias| exceeds the allowance. cv > 0. */
export function sigmaMetric(allowable: number, bias: number, cv: number): number {
  nonNegative(allowable, 'allowable');
  finite(bias, 'bias');
  divisor(cv, 'cv');
  if (inBand(allowable) && inBand(bias) && inBand(cv)) return (allowable - Math.abs(bias)) / cv;
  return fits(toDouble(sigmaMetricScaled(allowable, bias, cv)), { allowable, bias, cv });
}

/** PERF.SHARE: observed/allowable, the share of the allowance used (1 = all of it). observed ≥ 0, allowable > 0. */
export function allowanceShare(observed: number, allowable: number): number {
  nonNegative(observed, 'observed');
  divisor(allowable, 'allowable');
  return fits(observed / allowable, { observed, allowable });
}

export type TierMode = 'total' | 'parts';

export const readTierMode = makeWordReader<TierMode>('mode', { total: [], parts: [] });

/**
 * PERF.TIER: the most stringent tier the method meets, or "none".
 * mode "total": |bias| + z·CV ≤ SPEC.TOTAL; mode "parts": CV ≤ SPEC.CV and |bias| ≤ SPEC.BIAS.
 * A result exactly on the allowance meets it. Both sides are compared as scaled numbers, so
 * totals beyond the double range compare as they are (never Infinity ≤ Infinity).
 */
export function tierMet(cvi: number, cvg: number, bias: number, cv: number, z: number, mode: TierMode): Tier | 'none' {
  nonNegative(cvi, 'cvi');
  nonNegative(cvg, 'cvg');
  finite(bias, 'bias');
  nonNegative(cv, 'cv');
  nonNegative(z, 'z');
  if (inBand(cvi) && inBand(cvg) && inBand(bias) && inBand(cv) && inBand(z)) return tierMetInBand(cvi, cvg, bias, cv, z, mode);
  const observed = observedTotalErrorScaled(bias, cv, z);
  const cvS = scaled(cv);
  const biasS = scaled(Math.abs(bias));
  for (const tier of TIERS) {
    const met =
      mode === 'total'
        ? compare(observed, allowableTotalErrorScaled(cvi, cvg, tier, z)) <= 0
        : compare(cvS, times(scaled(IMPRECISION_FACTOR[tier]), scaled(cvi))) <= 0 &&
          compare(biasS, allowableBiasScaled(cvi, cvg, tier)) <= 0;
    if (met) return tier;
  }
  return 'none';
}

/** PERF.TIER by the plain formulas, for inputs within inBand (no total can leave the range there). */
function tierMetInBand(cvi: number, cvg: number, bias: number, cv: number, z: number, mode: TierMode): Tier | 'none' {
  const observed = Math.abs(bias) + z * cv;
  for (const tier of TIERS) {
    const met =
      mode === 'total'
        ? observed <= z * IMPRECISION_FACTOR[tier] * cvi + BIAS_FACTOR[tier] * Math.sqrt(cvi * cvi + cvg * cvg)
        : cv <= IMPRECISION_FACTOR[tier] * cvi && Math.abs(bias) <= BIAS_FACTOR[tier] * Math.sqrt(cvi * cvi + cvg * cvg);
    if (met) return tier;
  }
  return 'none';
}

/**
 * QC.SHIFT: critical systematic error in SD units, ΔSE_crit = (allowable − |bias|)/CV − z,
 * the shift a QC procedure must detect (z = 1.65: 5 % of results may exceed the allowance).
 * cv > 0, z ≥ 0. May be negative (the method already fails).
 */
export function criticalShift(allowable: number, bias: number, cv: number, z: number): number {
  if (inBand(allowable) && inBand(bias) && inBand(cv) && inBand(z) && z >= 0 && allowable >= 0 && cv > 0) {
    return (allowable - Math.abs(bias)) / cv - z;
  }
  return fits(toDouble(criticalShiftScaled(allowable, bias, cv, z)), { allowable, bias, cv, z });
}

/** ΔSE_crit as a scaled number, after the domain checks of QC.SHIFT (QC.PLAN takes it beyond the double range). */
export function criticalShiftScaled(allowable: number, bias: number, cv: number, z: number): Scaled {
  nonNegative(z, 'z');
  nonNegative(allowable, 'allowable');
  finite(bias, 'bias');
  divisor(cv, 'cv');
  return minus(sigmaMetricScaled(allowable, bias, cv), scaled(z));
}
