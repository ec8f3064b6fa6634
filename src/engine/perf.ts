/**
 * Observed performance against a specification (PERF family) and the critical systematic error
 * (QC.SHIFT). Percent numbers throughout; bias is signed on input and used as |bias|.
 * Total-error model: Westgard JO, Carey RN, Wold S. Clin Chem 1974;20:825–33 (from memory);
 * sigma metric and critical systematic error: Westgard JO, Groth T. Clin Chem 1979;25:863–9
 * and Westgard et al. Clin Chem 1981;27:493–501.
 */
import { allowableBias, allowableImprecision, allowableTotalError } from './spec';
import { TIERS, Tier } from './tiers';
import { divisor, finite, nonNegative } from './guards';
import { makeWordReader } from './words';

/** PERF.TOTAL: observed total error = |bias| + z·CV. cv ≥ 0, z ≥ 0. */
export function observedTotalError(bias: number, cv: number, z: number): number {
  finite(bias, 'bias');
  nonNegative(cv, 'cv');
  nonNegative(z, 'z');
  return Math.abs(bias) + z * cv;
}

/** PERF.SIGMA: sigma metric = (allowable − |bias|)/CV; negative when |bias| exceeds the allowance. cv > 0. */
export function sigmaMetric(allowable: number, bias: number, cv: number): number {
  nonNegative(allowable, 'allowable');
  finite(bias, 'bias');
  divisor(cv, 'cv');
  return (allowable - Math.abs(bias)) / cv;
}

/** PERF.SHARE: observed/allowable, the share of the allowance used (1 = all of it). observed ≥ 0, allowable > 0. */
export function allowanceShare(observed: number, allowable: number): number {
  nonNegative(observed, 'observed');
  divisor(allowable, 'allowable');
  return observed / allowable;
}

export type TierMode = 'total' | 'parts';

export const readTierMode = makeWordReader<TierMode>('mode', { total: [], parts: [] });

/**
 * PERF.TIER: the most stringent tier the method meets, or "none".
 * mode "total": |bias| + z·CV ≤ SPEC.TOTAL; mode "parts": CV ≤ SPEC.CV and |bias| ≤ SPEC.BIAS.
 * A result exactly on the allowance meets it.
 */
export function tierMet(cvi: number, cvg: number, bias: number, cv: number, z: number, mode: TierMode): Tier | 'none' {
  nonNegative(cvi, 'cvi');
  nonNegative(cvg, 'cvg');
  const observed = observedTotalError(bias, cv, z);
  for (const tier of TIERS) {
    const met =
      mode === 'total'
        ? observed <= allowableTotalError(cvi, cvg, tier, z)
        : cv <= allowableImprecision(cvi, tier) && Math.abs(bias) <= allowableBias(cvi, cvg, tier);
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
  nonNegative(z, 'z');
  return sigmaMetric(allowable, bias, cv) - z;
}
