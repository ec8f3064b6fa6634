/** PERF family and QC.SHIFT: observed performance against a specification. */
import { allowanceShare, criticalShift, observedTotalError, readTierMode, sigmaMetric, tierMet } from '../../engine/perf';
import { elementwise, num, optWord } from '../define';
import { ALLOWABLE, CVG, CVI, Z_TE } from '../params';

const SIGNED_BIAS = num('bias', 'Observed bias, % (signed).');

export const PERF_TOTAL = elementwise({
  name: 'PERF.TOTAL',
  doc: {
    summary: 'observed total error |bias| + z·CV',
    description: 'Observed total error: |bias| + z × CV, z = 1.65 by default. Percent; cv, z ≥ 0.',
    sources: ['Westgard JO, Carey RN, Wold S. Clin Chem 1974;20:825–33 (total-error model)'],
    returns: 'Observed total error, %.',
    example: { args: [-1.2, 2.1] },
  },
  params: [
    num('bias', 'Observed bias, % (signed; its absolute value is used).'),
    num('cv', 'Observed analytical CV, %; ≥ 0.'),
    Z_TE,
  ],
  fn: observedTotalError,
});

export const PERF_SIGMA = elementwise({
  name: 'PERF.SIGMA',
  doc: {
    summary: 'sigma metric (allowable − |bias|)/CV',
    description: 'Sigma metric: (allowable − |bias|) / CV; negative when the bias alone exceeds the allowance. Percent inputs; allowable ≥ 0, cv > 0.',
    sources: ['Westgard JO, Groth T. Clin Chem 1979;25:863–9'],
    returns: 'Sigma metric.',
    example: { args: [6.94, 1.2, 1.5] },
  },
  params: [ALLOWABLE, SIGNED_BIAS, num('cv', 'Observed analytical CV, %; > 0.')],
  fn: sigmaMetric,
});

export const PERF_SHARE = elementwise({
  name: 'PERF.SHARE',
  doc: {
    summary: 'observed / allowable: the share of the allowance used (above 1 the method fails)',
    description: 'Share of the allowance used: observed / allowable (1 means all of it, above 1 the method fails). observed ≥ 0, allowable > 0.',
    sources: ['common practice, no source'],
    returns: 'Ratio observed / allowable.',
    example: { args: [10.1, 6.94] },
  },
  params: [num('observed', 'Observed total error (or CV, or bias), %; ≥ 0.'), num('allowable', 'The matching allowance, %; > 0.')],
  fn: allowanceShare,
});

export const PERF_TIER = elementwise({
  name: 'PERF.TIER',
  doc: {
    summary: 'the most stringent tier met ("total" mode; "parts" checks CV and bias apart)',
    description:
      'The most stringent tier the method meets: "optimum", "desirable", "minimum" or "none". mode "total" (default): |bias| + z × CV ≤ allowable total error; "parts": CV ≤ allowable CV and |bias| ≤ allowable bias.',
    sources: ['Fraser CG, Hyltoft Petersen P, Libeer JC, Ricós C. Ann Clin Biochem 1997;34:8–12'],
    returns: 'Tier met.',
    example: { args: [5.7, 6.9, 1.2, 2.1] },
  },
  params: [CVI, CVG, SIGNED_BIAS, num('cv', 'Observed analytical CV, %.'), Z_TE, optWord('mode', readTierMode, 'total', '"total" (default) or "parts".')],
  fn: tierMet,
});

export const QC_SHIFT = elementwise({
  name: 'QC.SHIFT',
  doc: {
    summary: 'critical systematic error (allowable − |bias|)/CV − z, in SD',
    description: 'Critical systematic error in SD units: (allowable − |bias|) / CV − z, z = 1.65 by default; the shift that QC must detect. allowable ≥ 0, cv > 0.',
    sources: ['Westgard JO, Groth T. Clin Chem 1979;25:863–9'],
    returns: 'Critical shift, SD.',
    example: { args: [6.94, 1.2, 1.5] },
  },
  params: [ALLOWABLE, SIGNED_BIAS, num('cv', 'Observed analytical CV, %; > 0.'), Z_TE],
  fn: criticalShift,
});

export const PERF_FUNCTIONS = [PERF_TOTAL, PERF_SIGMA, PERF_SHARE, PERF_TIER, QC_SHIFT];
