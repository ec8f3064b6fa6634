/*
 * Worksheet wrappers, DATA and MU families: statistics from the lab's own data. Each is a thin
 * call into the registry; the JSDoc is what the function wizard shows (functions.json is
 * generated from it at build time). The generator needs the literal type any[][] in each
 * signature; the registry validates every cell.
 */
import { bind } from './adapter';

const DATA_CV = bind('DATA.CV');
const DATA_BIAS = bind('DATA.BIAS');
const DATA_RMSBIAS = bind('DATA.RMSBIAS');
const DATA_PRECISION = bind('DATA.PRECISION');
const DATA_COMPARE = bind('DATA.COMPARE');
const MU_BIAS = bind('MU.BIAS');
const MU_COMBINE = bind('MU.COMBINE');

/**
 * Sample CV of the numbers in a range: 100 × SD / mean, SD with n − 1. Text and blanks are ignored; fewer than 2 numbers give #NUM!, a zero mean #DIV/0!. Percent. Common practice (CLSI EP15-A3); two-pass arithmetic, checked on the NIST StRD univariate data sets.
 * @customfunction DATA.CV
 * @param {any[][]} values Results of one material, e.g. a column of replicates.
 * @returns {any[][]} CV, %.
 */
export function dataCv(values: any[][]): any[][] {
  return DATA_CV(values);
}

/**
 * Mean percent bias over pairs: mean of 100 × (result − target) / target. Ranges are paired cell by cell (same size, else #VALUE!); a pair with text or a blank on either side is skipped; a zero target gives #DIV/0!. Signed, percent. Source: bias from EQA or reference-material results, Nordtest TR 537 (2017).
 * @customfunction DATA.BIAS
 * @param {any[][]} results The laboratory's results.
 * @param {any[][]} targets The assigned or certified values, one per result.
 * @returns {any[][]} Mean bias, %.
 */
export function dataBias(results: any[][], targets: any[][]): any[][] {
  return DATA_BIAS(results, targets);
}

/**
 * Root-mean-square percent bias over pairs: √(mean of (100 × (result − target) / target)²), the RMS(bias) of Nordtest TR 537 (2017). Paired cell by cell as DATA.BIAS; a zero target gives #DIV/0!. Percent.
 * @customfunction DATA.RMSBIAS
 * @param {any[][]} results The laboratory's results.
 * @param {any[][]} targets The assigned or certified values, one per result.
 * @returns {any[][]} RMS bias, %.
 */
export function dataRmsBias(results: any[][], targets: any[][]): any[][] {
  return DATA_RMSBIAS(results, targets);
}

/**
 * One-way ANOVA of replicates grouped by run or day (ISO 5725-2, CLSI EP15-A3), balanced or not. Spills two rows: Mean, Repeatability SD, Between-group SD, Within-lab SD, Repeatability CV %, Within-lab CV %, Groups, Results. Repeatability SD = √MS_within; between-group variance = (MS_between − MS_within)/n₀, floored at 0, n₀ = (N − Σnᵢ²/N)/(k − 1); within-lab SD = √(repeatability² + between²). SDs in the unit of the results, CVs in % of the mean. At least 2 groups and 2 results (#NUM!).
 * @customfunction DATA.PRECISION
 * @param {any[][]} values The results.
 * @param {any[][]} groups The run or day label of each result (numbers or text), same size as values.
 * @returns {any[][]} Labelled precision estimates.
 */
export function dataPrecision(values: any[][], groups: any[][]): any[][] {
  return DATA_PRECISION(values, groups);
}

/**
 * Method comparison of y (candidate) against x (comparative method): Passing–Bablok (Passing & Bablok 1983; default), Deming with a known error-variance ratio and jackknife intervals (Linnet 1990, 1993) or ordinary least squares (t intervals). Spills two rows: Slope, Slope low 95%, Slope high 95%, Intercept, Intercept low 95%, Intercept high 95%, Bias at level, Bias at level % (empty without a level). Bias at level = intercept + (slope − 1) × level, in units and % of level. At least 3 pairs; all-equal x gives #DIV/0!.
 * @customfunction DATA.COMPARE
 * @param {any[][]} x Results of the comparative method.
 * @param {any[][]} y Results of the candidate method, paired cell by cell with x.
 * @param {any[][]} [method] "passing-bablok" (default, also "pb"), "deming" or "ols".
 * @param {any[][]} [level] Medical decision level for the bias, in the unit of the results; ≥ 0.
 * @param {any[][]} [ratio] Deming only: error variance of y over that of x, default 1; > 0.
 * @returns {any[][]} Labelled slope, intercept, 95 % intervals and bias.
 */
export function dataCompare(x: any[][], y: any[][], method?: any[][], level?: any[][], ratio?: any[][]): any[][] {
  return DATA_COMPARE(x, y, method, level, [ratio]);
}

/**
 * Standard uncertainty of the bias, √(RMS(bias)² + u_ref²), from EQA rounds or reference materials (Nordtest TR 537, 2017). RMS(bias) = √(mean of bias²); text and blanks ignored. Percent when the biases are percent.
 * @customfunction MU.BIAS
 * @param {any[][]} bias_values The biases found (signed), e.g. DATA.BIAS of each EQA round, %.
 * @param {any[][]} u_ref Standard uncertainty of the assigned or certified values, %; a range gives its mean; ≥ 0.
 * @returns {any[][]} u(bias), %.
 */
export function muBias(bias_values: any[][], u_ref: any[][]): any[][] {
  return MU_BIAS(bias_values, u_ref);
}

/**
 * Combined uncertainty k × √(u_rw² + u_bias²) (Nordtest TR 537, 2017): k = 2 (default) gives the expanded uncertainty, about 95 % coverage; k = 1 the combined standard uncertainty. Percent in, percent out.
 * @customfunction MU.COMBINE
 * @param {any[][]} u_rw Within-laboratory reproducibility u(Rw), % (e.g. the long-term IQC CV); ≥ 0.
 * @param {any[][]} u_bias Uncertainty of the bias u(bias), % (MU.BIAS); ≥ 0.
 * @param {any[][]} [k] Coverage factor, default 2; > 0.
 * @returns {any[][]} Expanded (or combined) uncertainty, %.
 */
export function muCombine(u_rw: any[][], u_bias: any[][], k?: any[][]): any[][] {
  return MU_COMBINE(u_rw, u_bias, k);
}
