/**
 * Verification with confidence: DATA.CVLIMITS, DATA.AGREEMENT, PERF.SIGMALIMITS, VERIFY.PRECISION
 * and VERIFY.TRUENESS. Pairing and group labels as the DATA family reads them (catalogue/data.ts).
 */
import { agreement, cvLimits, readAgreementScale, sigmaLimits, verifyPrecision, verifyTrueness } from '../../engine/verify';
import { DEFAULT_AGREEMENT_SCALE } from '../../engine/verify';
import { labelled, num, optNum, optWord, range } from '../define';
import type { Grid } from '../types';
import { groupedNumbers, pairedNumbers } from './data';

const EP15 = 'CLSI EP15-A3 (2014)';
const CONFIDENCE = optNum('confidence', 0.95, 'Two-sided confidence level, strictly between 0 and 1; default 0.95.');
const SAMPLES = optNum('samples', 1, 'Number of materials verified in the same study (shares α = 0.05 among them), a whole number ≥ 1; default 1.');
const VALUES = range('values', 'The results of the replication study (one material).');
const GROUPS = range('groups', 'The run or day label of each result (numbers or text), same size as values.');
const CHI_ACCURACY = 'Chi-square quantiles by Newton steps on the regularised incomplete gamma function, relative error below 2e-14 (checked against a 60-digit reference).';

export const DATA_CVLIMITS = labelled({
  name: 'DATA.CVLIMITS',
  doc: {
    summary: 'two-sided confidence limits of a CV (or an SD) from its degrees of freedom',
    description:
      'Confidence limits of a CV or SD estimated with df degrees of freedom (df > 0, may be fractional, e.g. DATA.PRECISION\'s within-lab df): Low = cv·√(df/χ²_{(1+c)/2}(df)), High = cv·√(df/χ²_{(1−c)/2}(df)), c = confidence (default 0.95). Exact for the SD of normal data; for a CV it is the usual approximation, good when the CV is small. ' +
      CHI_ACCURACY,
    sources: ['common practice (the chi-square interval for a normal variance)', EP15],
    returns: 'Labelled lower and upper limit, in the unit of cv.',
    example: { args: [2.5, 24], show: ['Low', 'High'] },
  },
  params: [num('cv', 'The estimated CV, % (or an SD, in its unit); ≥ 0.'), num('df', 'Its degrees of freedom, > 0 (e.g. N − k for repeatability).'), CONFIDENCE],
  labels: ['Low', 'High'],
  fn: (cv: number, df: number, confidence: number) => {
    const l = cvLimits(cv, df, confidence);
    return { Low: l.low, High: l.high };
  },
});

export const DATA_AGREEMENT = labelled({
  name: 'DATA.AGREEMENT',
  doc: {
    summary: 'Bland–Altman limits of agreement of two methods, with their confidence intervals',
    description:
      'Limits of agreement of y (candidate) with x (comparative method), paired cell by cell as DATA.COMPARE (a pair with a non-number is skipped), at least 3 pairs. Differences d = y − x (scale "absolute", default) or 100·(y − x)/((x + y)/2) ("percent"; a pair with x + y = 0 gives #DIV/0!). Mean difference d̄ and SD s_d (n − 1); limits d̄ ∓ 1.96·s_d; with t = t_{(1+c)/2}(n − 1): the mean difference\'s interval d̄ ∓ t·s_d/√n and each limit\'s interval ∓ t·s_d·√(1/n + 1.96²/(2(n − 1))).',
    sources: ['Bland JM, Altman DG. Lancet 1986;i:307–10', 'Bland JM, Altman DG. Stat Methods Med Res 1999;8:135–60'],
    returns: 'Labelled mean difference, SD of differences, the two limits, each with its interval, and the number of pairs.',
    example: { args: [[[102], [98], [110], [95], [104], [99]], [[104], [97], [113], [96], [107], [98]]], show: ['Mean difference', 'Lower limit', 'Upper limit'] },
  },
  params: [
    range('x', 'Results of the comparative method.'),
    range('y', 'Results of the candidate method, paired cell by cell with x.'),
    optWord('scale', readAgreementScale, DEFAULT_AGREEMENT_SCALE, '"absolute" (default: y − x in the unit of the results) or "percent" (difference in % of the pair\'s mean).'),
    CONFIDENCE,
  ],
  labels: [
    'Mean difference',
    'Mean difference low',
    'Mean difference high',
    'SD of differences',
    'Lower limit',
    'Lower limit low',
    'Lower limit high',
    'Upper limit',
    'Upper limit low',
    'Upper limit high',
    'Pairs',
  ],
  fn: (gx: Grid, gy: Grid, scale, confidence: number) => {
    const a = agreement(...pairedNumbers(gx, gy, 'x', 'y'), scale, confidence);
    return {
      'Mean difference': a.meanDifference,
      'Mean difference low': a.meanDifferenceLow,
      'Mean difference high': a.meanDifferenceHigh,
      'SD of differences': a.sdDifferences,
      'Lower limit': a.lowerLimit,
      'Lower limit low': a.lowerLimitLow,
      'Lower limit high': a.lowerLimitHigh,
      'Upper limit': a.upperLimit,
      'Upper limit low': a.upperLimitLow,
      'Upper limit high': a.upperLimitHigh,
      Pairs: a.pairs,
    };
  },
});

export const PERF_SIGMALIMITS = labelled({
  name: 'PERF.SIGMALIMITS',
  doc: {
    summary: 'the sigma metric with its confidence limits (uncertainty of the CV and of the bias)',
    description:
      'σ = (allowable − |bias|)/cv with limits σ ∓ z·u(σ), z = Φ⁻¹((1 + c)/2), u(σ) = √(u_bias² + σ²·cv²/(2·df))/cv: first-order propagation with u(cv) ≈ cv/√(2·df). Percent inputs; cv > 0, df > 0; u_bias default 0, confidence default 0.95.',
    sources: ['JCGM 100:2008 (GUM), law of propagation of uncertainty', 'Westgard JO, Groth T. Clin Chem 1979;25:863–9 (sigma metric)'],
    returns: 'Labelled sigma and its lower and upper limit.',
    example: { args: [10, 1.2, 2, 24], show: ['Sigma', 'Low', 'High'] },
  },
  params: [
    num('allowable', 'Allowable total error, %; ≥ 0.'),
    num('bias', 'Observed bias, % (signed; its absolute value is used).'),
    num('cv', 'Observed analytical CV, %; > 0.'),
    num('df', 'Degrees of freedom of the CV, > 0 (e.g. DATA.PRECISION\'s within-lab df).'),
    optNum('u_bias', 0, 'Standard uncertainty of the bias, %; ≥ 0; default 0.'),
    CONFIDENCE,
  ],
  labels: ['Sigma', 'Low', 'High'],
  fn: (allowable: number, bias: number, cv: number, df: number, uBias: number, confidence: number) => {
    const s = sigmaLimits(allowable, bias, cv, df, uBias, confidence);
    return { Sigma: s.sigma, Low: s.low, High: s.high };
  },
});

export const VERIFY_PRECISION = labelled({
  name: 'VERIFY.PRECISION',
  doc: {
    summary: 'a precision claim verified from a replication study (repeatability and within-lab)',
    description:
      'The repeatability and within-lab CVs of a replication study (DATA.PRECISION\'s one-way ANOVA) against the manufacturer\'s claims: verification limit = claim·√(χ²_{1−α/L}(ν)/ν), α = 0.05, L = samples, ν = N − k (repeatability) or Satterthwaite\'s within-lab df. "yes" when the observed CV ≤ the limit, else "no". Claims are percent CVs > 0. ' +
      CHI_ACCURACY,
    sources: [EP15, 'Satterthwaite FE. Biometrics Bulletin 1946;2:110–4'],
    returns: 'Labelled CVs, claims, limits, verdicts and degrees of freedom.',
    notes: ['A "no" says the study does not support the claim at this confidence; it calls for investigation under the laboratory\'s own quality system, not for a conclusion on its own.'],
    example: {
      args: [
        [[10.1], [10.3], [9.9], [10.6], [10.4], [10.8], [9.7], [9.9], [10.0], [10.2], [10.1], [10.4], [9.8], [10.0], [10.1]],
        [[1], [1], [1], [2], [2], [2], [3], [3], [3], [4], [4], [4], [5], [5], [5]],
        1.5,
        3,
      ],
      show: ['Repeatability CV %', 'Repeatability verified', 'Within-lab verified'],
    },
  },
  params: [
    VALUES,
    GROUPS,
    num('claim_repeatability', 'The claimed repeatability CV, %; > 0.'),
    num('claim_withinlab', 'The claimed within-laboratory CV, %; > 0.'),
    SAMPLES,
  ],
  labels: [
    'Repeatability CV %',
    'Repeatability claim %',
    'Repeatability limit %',
    'Repeatability verified',
    'Within-lab CV %',
    'Within-lab claim %',
    'Within-lab limit %',
    'Within-lab verified',
    'Repeatability df',
    'Within-lab df',
  ],
  fn: (gv: Grid, gg: Grid, claimR: number, claimWl: number, samples: number) => {
    const { values, labels } = groupedNumbers(gv, gg);
    const v = verifyPrecision(values, labels, claimR, claimWl, samples);
    return {
      'Repeatability CV %': v.repeatabilityCv,
      'Repeatability claim %': v.repeatabilityClaim,
      'Repeatability limit %': v.repeatabilityLimit,
      'Repeatability verified': v.repeatabilityVerified,
      'Within-lab CV %': v.withinLabCv,
      'Within-lab claim %': v.withinLabClaim,
      'Within-lab limit %': v.withinLabLimit,
      'Within-lab verified': v.withinLabVerified,
      'Repeatability df': v.repeatabilityDf,
      'Within-lab df': v.withinLabDf,
    };
  },
});

export const VERIFY_TRUENESS = labelled({
  name: 'VERIFY.TRUENESS',
  doc: {
    summary: 'trueness verified against a material with an assigned value',
    description:
      'Mean of all results against the assigned value: bias = mean − assigned, bias % = 100·bias/assigned; standard error SE² = s_b²·Σnᵢ²/N² + s_r²/N from the one-way ANOVA, its df by Satterthwaite; u_c² = SE² + u_assigned², ν_c = u_c⁴/(SE⁴/ν_SE); verification interval = assigned ± t_{1−α/(2L)}(ν_c)·u_c, α = 0.05, L = samples. "yes" when the mean lies in it (inclusive). An assigned value of 0 gives #DIV/0! in Bias % only; when every result is equal (SE = 0) df is #NUM! and the normal quantile is used.',
    sources: [EP15, 'JCGM 100:2008 (GUM)', 'Satterthwaite FE. Biometrics Bulletin 1946;2:110–4'],
    returns: 'Labelled mean, assigned value, bias, standard error, verification interval, verdict and df.',
    notes: ['The assigned value\'s uncertainty is taken with infinite degrees of freedom (a reference or certified material).'],
    example: {
      args: [
        [[5.12], [5.08], [5.15], [5.02], [5.06], [5.10], [5.18], [5.11], [5.14], [5.05], [5.09], [5.07]],
        [[1], [1], [1], [2], [2], [2], [3], [3], [3], [4], [4], [4]],
        5.0,
        0.04,
      ],
      show: ['Bias %', 'Verification high', 'Verified'],
    },
  },
  params: [VALUES, GROUPS, num('assigned', 'The material\'s assigned (target) value, in the unit of the results.'), num('u_assigned', 'Standard uncertainty of the assigned value, same unit; ≥ 0.'), SAMPLES],
  labels: ['Mean', 'Assigned', 'Bias', 'Bias %', 'Standard error', 'Verification low', 'Verification high', 'Verified', 'df'],
  fn: (gv: Grid, gg: Grid, assigned: number, uAssigned: number, samples: number) => {
    const { values, labels } = groupedNumbers(gv, gg);
    const t = verifyTrueness(values, labels, assigned, uAssigned, samples);
    return {
      Mean: t.mean,
      Assigned: t.assigned,
      Bias: t.bias,
      'Bias %': t.biasPercent,
      'Standard error': t.standardError,
      'Verification low': t.verificationLow,
      'Verification high': t.verificationHigh,
      Verified: t.verified,
      df: t.df,
    };
  },
});

export const VERIFY_FUNCTIONS = [DATA_CVLIMITS, DATA_AGREEMENT, PERF_SIGMALIMITS, VERIFY_PRECISION, VERIFY_TRUENESS];
