/**
 * DATA and MU families: statistics from the lab's own data (replicates, EQA/CRM results, method
 * comparisons) and measurement uncertainty from them.
 *
 * Pairing rule for two-range functions: the ranges are read cell by cell in row order and must
 * hold the same number of cells (else #VALUE!); a pair is skipped when either cell is not a
 * number (text, blank, TRUE/FALSE). For DATA.PRECISION the group label may be a number or text
 * (trimmed, any case, so "Run A" and "run a" are one group, and 1 and "1" are one group); a pair
 * with a blank label is skipped.
 */
import { cvPercentScaled, meanPercentBias, mean, rmsPercentBias, sampleCv } from '../../engine/data/describe';
import { oneWayPrecision } from '../../engine/data/precision';
import { DEFAULT_COMPARE_METHOD, LineFit, biasAtLevel, compareMethods, readCompareMethod } from '../../engine/data/compare';
import { biasUncertainty, combinedUncertainty } from '../../engine/mu';
import { divError, naError, numError, valueError } from '../../engine/errors';
import { fits, nonNegative, positive, show } from '../../engine/guards';
import { cellCount, cellsOf, numbersOf, singleCell, toNumber } from '../coerce';
import { aggregate, elementwise, figure, labelled, num, optNum, optNumNone, optWord, range } from '../define';
import type { Figure } from '../define';
import type { Grid, Scalar } from '../types';
import { labelKey } from '../../engine/labels';

/** The worksheet's confidence level for DATA.COMPARE intervals. */
const COMPARE_CONFIDENCE = 0.95;

function checkSameSize(a: Grid | undefined, b: Grid | undefined, nameA: string, nameB: string): void {
  const na = cellCount(a);
  const nb = cellCount(b);
  if (na !== nb) {
    throw valueError(
      `${nameA} and ${nameB} do not pair up: ${nameA} has ${na} cells but ${nameB} has ${nb} (give two ranges of the same size)`,
    );
  }
}

const isNumber = (v: Scalar): v is number => typeof v === 'number' && Number.isFinite(v);

/** The largest magnitude among numbers (for messages). */
function largest(xs: readonly number[]): number {
  let top = 0;
  for (const x of xs) top = Math.max(top, Math.abs(x));
  return top;
}

/** Pairs two ranges cell by cell, keeping the pairs where both cells are numbers. */
export function pairedNumbers(a: Grid | undefined, b: Grid | undefined, nameA: string, nameB: string): [number[], number[]] {
  checkSameSize(a, b, nameA, nameB);
  const ca = cellsOf(a);
  const cb = cellsOf(b);
  const xa: number[] = [];
  const xb: number[] = [];
  for (let i = 0; i < ca.length; i++) {
    const u = ca[i];
    const v = cb[i];
    if (isNumber(u) && isNumber(v)) {
      xa.push(u);
      xb.push(v);
    }
  }
  return [xa, xb];
}

/** Results and their group labels, cell by cell; a pair with a non-number result or a blank label is skipped. */
export function groupedNumbers(gv: Grid, gg: Grid): { values: number[]; labels: string[] } {
  checkSameSize(gv, gg, 'values', 'groups');
  const cv = cellsOf(gv);
  const cg = cellsOf(gg);
  const values: number[] = [];
  const labels: string[] = [];
  for (let i = 0; i < cv.length; i++) {
    const v = cv[i];
    const key = labelKey(cg[i]);
    if (isNumber(v) && key !== undefined) {
      values.push(v);
      labels.push(key);
    }
  }
  return { values, labels };
}

function bound(v: number | null, fit: LineFit): Figure {
  if (v !== null && Number.isFinite(v)) return v;
  return numError(fit.intervalNote ?? 'the interval is not defined for these data');
}

const RESULTS = range('results', 'The laboratory\'s results.');
const TARGETS = range('targets', 'The assigned or certified values, one per result.');

export const DATA_CV = aggregate({
  name: 'DATA.CV',
  doc: {
    summary: 'sample CV % of the numbers in a range (text and blanks ignored)',
    description:
      'Sample CV of the numbers in a range: 100 × SD / mean, SD with n − 1. Text and blanks are ignored; fewer than 2 numbers give #NUM!, a zero mean #DIV/0!. Percent. Two-pass arithmetic, checked on the NIST StRD univariate data sets.',
    sources: ['common practice (CLSI EP15-A3, 2014)'],
    returns: 'CV, %.',
    example: { args: [[[10.1], [9.8], [10.3], [10.0], [9.9]]] },
  },
  params: [range('values', 'Results of one material, e.g. a column of replicates.')],
  fn: (g: Grid) => sampleCv(numbersOf(g)),
});

export const DATA_BIAS = aggregate({
  name: 'DATA.BIAS',
  doc: {
    summary: 'mean percent bias over pairs',
    description:
      'Mean percent bias over pairs: mean of 100 × (result − target) / target. Ranges are paired cell by cell (same size, else #VALUE!); a pair with text or a blank on either side is skipped; a zero target gives #DIV/0!. Signed, percent. Bias from EQA or reference-material results.',
    sources: ['Magnusson B, et al. Nordtest Report TR 537, ed. 4 (2017)'],
    returns: 'Mean bias, %.',
    example: { args: [[[102], [98.5], [101]], [[100], [100], [100]]] },
  },
  params: [RESULTS, TARGETS],
  fn: (r: Grid, t: Grid) => meanPercentBias(...pairedNumbers(r, t, 'results', 'targets')),
});

export const DATA_RMSBIAS = aggregate({
  name: 'DATA.RMSBIAS',
  doc: {
    summary: 'root-mean-square percent bias over pairs',
    description:
      'Root-mean-square percent bias over pairs: √(mean of (100 × (result − target) / target)²), the RMS(bias) of the Nordtest approach. Paired cell by cell as DATA.BIAS; a zero target gives #DIV/0!. Percent.',
    sources: ['Magnusson B, et al. Nordtest Report TR 537, ed. 4 (2017)'],
    returns: 'RMS bias, %.',
    example: { args: [[[102], [98.5], [101]], [[100], [100], [100]]] },
  },
  params: [RESULTS, TARGETS],
  fn: (r: Grid, t: Grid) => rmsPercentBias(...pairedNumbers(r, t, 'results', 'targets')),
});

export const DATA_PRECISION = labelled({
  name: 'DATA.PRECISION',
  doc: {
    summary: 'one-way ANOVA by run or day: repeatability, between-group and within-lab SD and CV',
    description:
      'One-way ANOVA of replicates grouped by run or day, balanced or not. Repeatability SD = √MS_within; between-group variance = (MS_between − MS_within)/n₀, floored at 0, n₀ = (N − Σnᵢ²/N)/(k − 1); within-lab SD = √(repeatability² + between²). SDs in the unit of the results, CVs in % of the mean. Within-lab df is Satterthwaite\'s: (MS_B/n₀ + (1 − 1/n₀)·MS_W)² / [(MS_B/n₀)²/(k − 1) + ((1 − 1/n₀)·MS_W)²/(N − k)] when the between-group variance is positive, else N − k. At least 2 groups and 2 results (#NUM!).',
    sources: ['ISO 5725-2', 'CLSI EP15-A3 (2014)', 'Satterthwaite FE. Biometrics Bulletin 1946;2:110–4'],
    returns: 'Labelled precision estimates.',
    example: { args: [[[10.1], [10.3], [9.9], [10.6], [10.4], [10.8], [9.7], [9.9], [10.0]], [[1], [1], [1], [2], [2], [2], [3], [3], [3]]], show: ['Repeatability SD', 'Within-lab SD', 'Groups'] },
  },
  params: [range('values', 'The results.'), range('groups', 'The run or day label of each result (numbers or text), same size as values.')],
  labels: ['Mean', 'Repeatability SD', 'Between-group SD', 'Within-lab SD', 'Repeatability CV %', 'Within-lab CV %', 'Groups', 'Results', 'Within-lab df'],
  fn: (gv: Grid, gg: Grid) => {
    const { values, labels } = groupedNumbers(gv, gg);
    const p = oneWayPrecision(values, labels);
    // SDs beyond the largest double are errors in their own cells; the CVs, ratios, are taken on
    // the scaled figures, so they are right whatever the size of the results.
    const sd = (v: number, what: string): Figure =>
      figure(() => {
        if (v === Infinity) throw numError(`the ${what} exceeds the largest number Excel can hold (about 1.8e308): the values reach ${show(largest(values))}`);
        return v;
      });
    return {
      Mean: p.mean,
      'Repeatability SD': sd(p.repeatabilitySd, 'repeatability SD'),
      'Between-group SD': sd(p.betweenSd, 'between-group SD'),
      'Within-lab SD': sd(p.withinLabSd, 'within-lab SD'),
      'Repeatability CV %': figure(() => cvPercentScaled(p.scaled.repeatabilitySd, p.scaled.mean)),
      'Within-lab CV %': figure(() => cvPercentScaled(p.scaled.withinLabSd, p.scaled.mean)),
      Groups: p.groups,
      Results: p.results,
      'Within-lab df': p.withinLabDf,
    };
  },
});

const LEVEL = optNumNone('level', 'Medical decision level for the bias, in the unit of the results; ≥ 0.', nonNegative);

export const DATA_COMPARE = labelled({
  name: 'DATA.COMPARE',
  doc: {
    summary: 'method comparison: Passing–Bablok (default), Deming or OLS, with 95 % intervals and the bias at a level',
    description:
      'Method comparison of y (candidate) against x (comparative method): Passing–Bablok (default), Deming with a known error-variance ratio (ratio = error variance of y over that of x) and jackknife intervals with t on n − 2 degrees of freedom, or ordinary least squares (t intervals, n − 2 degrees of freedom). Bias at level = intercept + (slope − 1) × level, in units and % of level (empty without a level). At least 3 pairs; all-equal x gives #DIV/0!.',
    sources: ['Passing H, Bablok W. J Clin Chem Clin Biochem 1983;21:709–20', 'Linnet K. Clin Chem 1993;39:424–32'],
    returns: 'Labelled slope, intercept, 95 % intervals and bias.',
    example: { args: [[[1], [2], [3], [4], [10], [12], [18]], [[9], [15], [19], [20], [45], [55], [78]]], show: ['Slope', 'Intercept'] },
  },
  params: [
    range('x', 'Results of the comparative method.'),
    range('y', 'Results of the candidate method, paired cell by cell with x.'),
    optWord('method', readCompareMethod, DEFAULT_COMPARE_METHOD, '"passing-bablok" (default, also "pb"), "deming" or "ols".'),
    LEVEL,
    optNum('ratio', 1, 'Deming only: error variance of y over that of x, default 1; > 0.', positive),
  ],
  labels: ['Slope', 'Slope low 95%', 'Slope high 95%', 'Intercept', 'Intercept low 95%', 'Intercept high 95%', 'Bias at level', 'Bias at level %'],
  fn: (gx: Grid, gy: Grid, method, level: number | undefined, ratio: number) => {
    const [x, y] = pairedNumbers(gx, gy, 'x', 'y');
    const fit = compareMethods(x, y, method, ratio, COMPARE_CONFIDENCE);
    let biasUnits: Figure = '';
    let biasPercent: Figure = '';
    if (level !== undefined) {
      const bias = biasAtLevel(fit, level);
      biasUnits = figure(() => fits(bias.units, { level }, 'the bias at level'));
      biasPercent = figure(() => {
        if (bias.percent === null) throw divError('level is zero: the bias in percent divides by the level');
        return fits(bias.percent, { level }, 'the bias at level in percent');
      });
    }
    return {
      Slope: fit.slope,
      'Slope low 95%': bound(fit.slopeLow, fit),
      'Slope high 95%': bound(fit.slopeHigh, fit),
      Intercept: fit.intercept,
      'Intercept low 95%': bound(fit.interceptLow, fit),
      'Intercept high 95%': bound(fit.interceptHigh, fit),
      'Bias at level': biasUnits,
      'Bias at level %': biasPercent,
    };
  },
});

const U_REF = range('u_ref', 'Standard uncertainty of the assigned or certified values, %; a range gives its mean; ≥ 0.');

export const MU_BIAS = aggregate({
  name: 'MU.BIAS',
  doc: {
    summary: 'u(bias) = √(RMS(bias)² + u_ref²)',
    description:
      'Standard uncertainty of the bias, √(RMS(bias)² + u_ref²), from EQA rounds or reference materials. RMS(bias) = √(mean of bias²); text and blanks ignored. Percent when the biases are percent.',
    sources: ['Magnusson B, et al. Nordtest Report TR 537, ed. 4 (2017)'],
    returns: 'u(bias), %.',
    example: { args: [[[2.5], [2.7], [1.9], [1.4], [1.8], [2.9]], 1.52] },
  },
  params: [range('bias_values', 'The biases found (signed), e.g. DATA.BIAS of each EQA round, %.'), U_REF],
  fn: (gb: Grid, gu: Grid) => {
    let uRef: number;
    if (cellCount(gu) === 1) {
      uRef = toNumber(singleCell(gu, U_REF, 'MU.BIAS'), 'u_ref');
    } else {
      const us = numbersOf(gu);
      if (us.length === 0) throw naError('u_ref holds no numbers: enter the standard uncertainty of the reference values');
      for (const u of us) nonNegative(u, 'u_ref');
      uRef = mean(us);
    }
    return biasUncertainty(numbersOf(gb), uRef);
  },
});

export const MU_COMBINE = elementwise({
  name: 'MU.COMBINE',
  doc: {
    summary: 'expanded uncertainty k·√(u_Rw² + u_bias²), k = 2',
    description:
      'Combined uncertainty k × √(u_rw² + u_bias²): k = 2 (default) gives the expanded uncertainty, about 95 % coverage; k = 1 the combined standard uncertainty. Percent in, percent out.',
    sources: ['Magnusson B, et al. Nordtest Report TR 537, ed. 4 (2017)'],
    returns: 'Expanded (or combined) uncertainty, %.',
    example: { args: [1.67, 2.73] },
  },
  params: [
    num('u_rw', 'Within-laboratory reproducibility u(Rw), % (e.g. the long-term IQC CV); ≥ 0.'),
    num('u_bias', 'Uncertainty of the bias u(bias), % (MU.BIAS); ≥ 0.'),
    optNum('k', 2, 'Coverage factor, default 2; > 0.'),
  ],
  fn: combinedUncertainty,
});

export const DATA_FUNCTIONS = [DATA_CV, DATA_BIAS, DATA_RMSBIAS, DATA_PRECISION, DATA_COMPARE, MU_BIAS, MU_COMBINE];
