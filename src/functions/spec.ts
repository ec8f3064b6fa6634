/*
 * Worksheet wrappers, SPEC family and ZSCORE. Each is a thin call into the registry; the JSDoc
 * is what the function wizard shows (functions.json is generated from it at build time).
 * Every parameter is declared as a range so that ranges in any argument spill.
 * The generator needs the literal type any[][] in each signature; the registry validates every cell.
 */
import { bind } from './adapter';

const SPEC_CV = bind('SPEC.CV');
const SPEC_BIAS = bind('SPEC.BIAS');
const SPEC_TOTAL = bind('SPEC.TOTAL');
const SPEC_MU = bind('SPEC.MU');
const SPEC_FIXED = bind('SPEC.FIXED');
const SPEC_TIERS = bind('SPEC.TIERS');
const ZSCORE = bind('ZSCORE');


/**
 * Allowable imprecision from biological variation: CV = f × CVI, f = 0.25 (optimum), 0.50 (desirable), 0.75 (minimum). Percent in, percent out. Sources: Cotlove et al. 1970; Fraser et al. 1997.
 * @customfunction SPEC.CV
 * @param {any[][]} cvi Within-subject biological variation CVI, % (a number or a range).
 * @param {any[][]} [tier] "optimum", "desirable" (default) or "minimum"; also "opt", "des", "min".
 * @returns {any[][]} Allowable analytical CV, %.
 */
export function specCv(cvi: any[][], tier?: any[][]): any[][] {
  return SPEC_CV(cvi, tier);
}

/**
 * Allowable bias from biological variation: g × √(CVI² + CVG²), g = 0.125 / 0.25 / 0.375 (optimum / desirable / minimum). Percent. Sources: Gowans et al. 1988; Fraser et al. 1997.
 * @customfunction SPEC.BIAS
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} cvg Between-subject biological variation CVG, %.
 * @param {any[][]} [tier] "optimum", "desirable" (default) or "minimum".
 * @returns {any[][]} Allowable bias, %.
 */
export function specBias(cvi: any[][], cvg: any[][], tier?: any[][]): any[][] {
  return SPEC_BIAS(cvi, cvg, tier);
}

/**
 * Allowable total error from biological variation: z × f × CVI + g × √(CVI² + CVG²), z = 1.65 by default (one-sided 95 %). Percent. Sources: Fraser et al. 1997; Sandberg et al. 2015.
 * @customfunction SPEC.TOTAL
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} cvg Between-subject biological variation CVG, %.
 * @param {any[][]} [tier] "optimum", "desirable" (default) or "minimum".
 * @param {any[][]} [z] Coverage factor for imprecision, default 1.65; must be ≥ 0.
 * @returns {any[][]} Allowable total error, %.
 */
export function specTotal(cvi: any[][], cvg: any[][], tier?: any[][], z?: any[][]): any[][] {
  return SPEC_TOTAL(cvi, cvg, tier, z);
}

/**
 * Maximum allowable measurement uncertainty from biological variation: k × u, u = 0.25 / 0.50 / 0.75 × CVI (optimum / desirable / minimum); k = 1 gives the standard uncertainty (default), k = 2 the expanded. Percent. Source: Fraser et al. 1997 tier factors.
 * @customfunction SPEC.MU
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} [tier] "optimum", "desirable" (default) or "minimum".
 * @param {any[][]} [k] Coverage factor, default 1 (standard uncertainty); must be > 0.
 * @returns {any[][]} Maximum allowable uncertainty, %.
 */
export function specMu(cvi: any[][], tier?: any[][], k?: any[][]): any[][] {
  return SPEC_MU(cvi, tier, k);
}

/**
 * A regulatory or EQA limit "± absolute units or ± percent, whichever is greater" as a percent at a level: max(100 × absolute / level, percent). Enter 0 for a part the limit does not have. Common practice.
 * @customfunction SPEC.FIXED
 * @param {any[][]} level Concentration at which the limit is judged, in the analyte's unit; > 0.
 * @param {any[][]} absolute Absolute part of the limit, same unit as level; ≥ 0.
 * @param {any[][]} percent Percent part of the limit, %; ≥ 0.
 * @returns {any[][]} Allowable total error at that level, %.
 */
export function specFixed(level: any[][], absolute: any[][], percent: any[][]): any[][] {
  return SPEC_FIXED(level, absolute, percent);
}

/**
 * The three tiers side by side: a 4 × 4 spill with the header Tier, CV, Bias, Total and one row each for optimum, desirable and minimum. Percent; z = 1.65 by default. Source: Fraser et al. 1997.
 * @customfunction SPEC.TIERS
 * @param {any[][]} cvi Within-subject biological variation CVI, % (one cell).
 * @param {any[][]} cvg Between-subject biological variation CVG, % (one cell).
 * @param {any[][]} [z] Coverage factor for the total, default 1.65.
 * @returns {any[][]} Table of allowable CV, bias and total error by tier.
 */
export function specTiers(cvi: any[][], cvg: any[][], z?: any[][]): any[][] {
  return SPEC_TIERS(cvi, cvg, z);
}

/**
 * Standard-normal quantile for a coverage probability: sides 1 (default) gives Φ⁻¹(p), sides 2 gives Φ⁻¹((1 + p)/2). 0.95 gives 1.645 one-sided, 1.960 two-sided. Method: Wichura, AS 241 (1988).
 * @customfunction ZSCORE
 * @param {any[][]} probability Coverage probability, strictly between 0 and 1.
 * @param {any[][]} [sides] 1 (one-sided, default) or 2 (two-sided).
 * @returns {any[][]} z.
 */
export function zScore(probability: any[][], sides?: any[][]): any[][] {
  return ZSCORE(probability, sides);
}
