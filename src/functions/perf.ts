/*
 * Worksheet wrappers, PERF family and QC.SHIFT (see spec.ts for the conventions).
 */
import { bind } from './adapter';

const PERF_TOTAL = bind('PERF.TOTAL');
const PERF_SIGMA = bind('PERF.SIGMA');
const PERF_SHARE = bind('PERF.SHARE');
const PERF_TIER = bind('PERF.TIER');
const QC_SHIFT = bind('QC.SHIFT');


/**
 * Observed total error: |bias| + z × CV, z = 1.65 by default. Percent. Source: Westgard, Carey and Wold 1974 total-error model.
 * @customfunction PERF.TOTAL
 * @param {any[][]} bias Observed bias, % (signed; its absolute value is used).
 * @param {any[][]} cv Observed analytical CV, %; ≥ 0.
 * @param {any[][]} [z] Coverage factor, default 1.65.
 * @returns {any[][]} Observed total error, %.
 */
export function perfTotal(bias: any[][], cv: any[][], z?: any[][]): any[][] {
  return PERF_TOTAL(bias, cv, z);
}

/**
 * Sigma metric: (allowable − |bias|) / CV; negative when the bias alone exceeds the allowance. Percent inputs. Source: Westgard and Groth 1979.
 * @customfunction PERF.SIGMA
 * @param {any[][]} allowable Allowable total error, %; ≥ 0.
 * @param {any[][]} bias Observed bias, % (signed).
 * @param {any[][]} cv Observed analytical CV, %; > 0.
 * @returns {any[][]} Sigma metric.
 */
export function perfSigma(allowable: any[][], bias: any[][], cv: any[][]): any[][] {
  return PERF_SIGMA(allowable, bias, cv);
}

/**
 * Share of the allowance used: observed / allowable (1 means all of it, above 1 the method fails). Common practice.
 * @customfunction PERF.SHARE
 * @param {any[][]} observed Observed total error (or CV, or bias), %; ≥ 0.
 * @param {any[][]} allowable The matching allowance, %; > 0.
 * @returns {any[][]} Ratio observed / allowable.
 */
export function perfShare(observed: any[][], allowable: any[][]): any[][] {
  return PERF_SHARE(observed, allowable);
}

/**
 * The most stringent tier the method meets: "optimum", "desirable", "minimum" or "none". mode "total" (default): |bias| + z × CV ≤ allowable total error; "parts": CV ≤ allowable CV and |bias| ≤ allowable bias. Source: Fraser et al. 1997 tiers.
 * @customfunction PERF.TIER
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} cvg Between-subject biological variation CVG, %.
 * @param {any[][]} bias Observed bias, % (signed).
 * @param {any[][]} cv Observed analytical CV, %.
 * @param {any[][]} [z] Coverage factor, default 1.65.
 * @param {any[][]} [mode] "total" (default) or "parts".
 * @returns {any[][]} Tier met.
 */
export function perfTier(cvi: any[][], cvg: any[][], bias: any[][], cv: any[][], z?: any[][], mode?: any[][]): any[][] {
  return PERF_TIER(cvi, cvg, bias, cv, [z, mode]);
}

/**
 * Critical systematic error in SD units: (allowable − |bias|) / CV − z, z = 1.65 by default; the shift that QC must detect. Source: Westgard and Groth 1979.
 * @customfunction QC.SHIFT
 * @param {any[][]} allowable Allowable total error, %; ≥ 0.
 * @param {any[][]} bias Observed bias, % (signed).
 * @param {any[][]} cv Observed analytical CV, %; > 0.
 * @param {any[][]} [z] Default 1.65.
 * @returns {any[][]} Critical shift, SD.
 */
export function qcShift(allowable: any[][], bias: any[][], cv: any[][], z?: any[][]): any[][] {
  return QC_SHIFT(allowable, bias, cv, z);
}
