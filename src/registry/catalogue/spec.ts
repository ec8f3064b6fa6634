/** SPEC family and ZSCORE: specifications from biological variation or a fixed limit. */
import {
  allowableBias,
  allowableImprecision,
  allowableTotalError,
  allowableUncertainty,
  fixedLimitPercent,
} from '../../engine/spec';
import { TIERS } from '../../engine/tiers';
import { LeewayError } from '../../engine/errors';
import { errorCell } from '../coerce';
import { zFromCoverage } from '../../engine/coverage';
import { nonNegative } from '../../engine/guards';
import { aggregate, elementwise, figure, num, optNum } from '../define';
import { CVG, CVI, TIER } from '../params';
import type { Output } from '../types';

const TIER_SOURCES = ['Fraser CG, Hyltoft Petersen P, Libeer JC, Ricós C. Ann Clin Biochem 1997;34:8–12'];

/** SPEC.TIERS's header row. */
export const TIERS_HEADER = ['Tier', 'CV', 'Bias', 'Total'] as const;

export const SPEC_CV = elementwise({
  name: 'SPEC.CV',
  doc: {
    summary: 'allowable imprecision f·CVI (f = 0.25 / 0.50 / 0.75)',
    description:
      'Allowable imprecision from biological variation: CV = f × CVI, f = 0.25 (optimum), 0.50 (desirable), 0.75 (minimum). Percent in, percent out; cvi ≥ 0.',
    sources: ['Cotlove E, Harris EK, Williams GZ. Clin Chem 1970;16:1028–32', ...TIER_SOURCES],
    returns: 'Allowable analytical CV, %.',
    example: { args: [5.7] },
  },
  params: [num('cvi', 'Within-subject biological variation CVI, % (a number or a range).'), TIER],
  fn: allowableImprecision,
});

export const SPEC_BIAS = elementwise({
  name: 'SPEC.BIAS',
  doc: {
    summary: 'allowable bias g·√(CVI² + CVG²) (g = 0.125 / 0.25 / 0.375)',
    description:
      'Allowable bias from biological variation: g × √(CVI² + CVG²), g = 0.125 / 0.25 / 0.375 (optimum / desirable / minimum). Percent; cvi, cvg ≥ 0.',
    sources: ['Gowans EM, Hyltoft Petersen P, Blaabjerg O, Hørder M. Scand J Clin Lab Invest 1988;48:757–64', ...TIER_SOURCES],
    returns: 'Allowable bias, %.',
    example: { args: [5.7, 6.9] },
  },
  params: [CVI, CVG, TIER],
  fn: allowableBias,
});

export const SPEC_TOTAL = elementwise({
  name: 'SPEC.TOTAL',
  doc: {
    summary: 'allowable total error z·SPEC.CV + SPEC.BIAS',
    description:
      'Allowable total error from biological variation: z × f × CVI + g × √(CVI² + CVG²), z = 1.65 by default (one-sided 95 %). Percent; cvi, cvg, z ≥ 0.',
    sources: [...TIER_SOURCES, 'Sandberg S, Fraser CG, Horvath AR, et al. Clin Chem Lab Med 2015;53:833–5'],
    returns: 'Allowable total error, %.',
    example: { args: [5.7, 6.9, 'desirable', 1.65] },
  },
  params: [CVI, CVG, TIER, optNum('z', 1.65, 'Coverage factor for imprecision, default 1.65; ≥ 0.')],
  fn: allowableTotalError,
});

export const SPEC_MU = elementwise({
  name: 'SPEC.MU',
  doc: {
    summary: 'maximum allowable measurement uncertainty k·u, u = f·CVI (k = 1 by default)',
    description:
      'Maximum allowable measurement uncertainty from biological variation: k × u, u = 0.25 / 0.50 / 0.75 × CVI (optimum / desirable / minimum); k = 1 gives the standard uncertainty (default), k = 2 the expanded. Percent; k > 0.',
    sources: TIER_SOURCES,
    returns: 'Maximum allowable uncertainty, %.',
    example: { args: [5.7, 'desirable', 2] },
  },
  params: [CVI, TIER, optNum('k', 1, 'Coverage factor, default 1 (standard uncertainty); > 0.')],
  fn: allowableUncertainty,
});

export const SPEC_FIXED = elementwise({
  name: 'SPEC.FIXED',
  doc: {
    summary: '"± absolute units or ± percent, whichever is greater" as a percent at a level',
    description:
      'A regulatory or EQA limit "± absolute units or ± percent, whichever is greater" as a percent at a level: max(100 × absolute / level, percent). Enter 0 for a part the limit does not have. level > 0 (0 gives #DIV/0!).',
    sources: ['common practice, no source'],
    returns: 'Allowable total error at that level, %.',
    example: { args: [2, 0.3, 10] },
  },
  params: [
    num('level', 'Concentration at which the limit is judged, in the analyte\'s unit; > 0.'),
    num('absolute', 'Absolute part of the limit, same unit as level; ≥ 0.'),
    num('percent', 'Percent part of the limit, %; ≥ 0.'),
  ],
  fn: fixedLimitPercent,
});

const Z_TIERS = optNum('z', 1.65, 'Coverage factor for the total, default 1.65; ≥ 0.', nonNegative);

export const SPEC_TIERS = aggregate({
  name: 'SPEC.TIERS',
  doc: {
    summary: 'the three tiers side by side: a 4 × 4 spill, header Tier, CV, Bias, Total',
    description:
      'The three tiers side by side: a 4 × 4 spill with the header Tier, CV, Bias, Total and one row each for optimum, desirable and minimum. Percent; z = 1.65 by default.',
    sources: TIER_SOURCES,
    returns: 'Table of allowable CV, bias and total error by tier.',
    example: { args: [5.7, 6.9] },
  },
  params: [
    num('cvi', 'Within-subject biological variation CVI, % (one cell).'),
    num('cvg', 'Between-subject biological variation CVG, % (one cell).'),
    Z_TIERS,
  ],
  fn: (cvi: number, cvg: number, z: number): Output => {
    const rows: Output = [[...TIERS_HEADER]];
    for (const tier of TIERS) {
      // CV and bias check the inputs (a bad one fails the whole table) and are always finite; a
      // total beyond the largest number Excel can hold is an error in its own cell.
      const cv = allowableImprecision(cvi, tier);
      const bias = allowableBias(cvi, cvg, tier);
      const total = figure(() => allowableTotalError(cvi, cvg, tier, z));
      rows.push([tier, cv, bias, total instanceof LeewayError ? errorCell(total) : total]);
    }
    return rows;
  },
});

export const ZSCORE = elementwise({
  name: 'ZSCORE',
  doc: {
    summary: 'standard-normal quantile Φ⁻¹(p), one- or two-sided',
    description:
      'Standard-normal quantile for a coverage probability: sides 1 (default) gives Φ⁻¹(p), sides 2 gives Φ⁻¹((1 + p)/2). 0.95 gives 1.645 one-sided, 1.960 two-sided. Method: Wichura\'s AS 241, about 16 digits.',
    sources: ['Wichura MJ. Applied Statistics 1988;37:477–84 (AS 241)'],
    returns: 'z.',
    example: { args: [0.95] },
  },
  params: [
    num('probability', 'Coverage probability, strictly between 0 and 1.'),
    optNum('sides', 1, '1 (one-sided, default) or 2 (two-sided).'),
  ],
  fn: zFromCoverage,
});

export const SPEC_FUNCTIONS = [SPEC_CV, SPEC_BIAS, SPEC_TOTAL, SPEC_MU, SPEC_FIXED, SPEC_TIERS, ZSCORE];
