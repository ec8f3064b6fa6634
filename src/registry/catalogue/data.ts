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
import { cvPercent, meanPercentBias, mean, rmsPercentBias, sampleCv } from '../../engine/data/describe';
import { oneWayPrecision } from '../../engine/data/precision';
import {
  CompareMethod,
  DEFAULT_COMPARE_METHOD,
  LineFit,
  biasAtLevel,
  compareMethods,
  readCompareMethod,
} from '../../engine/data/compare';
import { biasUncertainty, combinedUncertainty } from '../../engine/mu';
import { LeewayError, divError, naError, valueError } from '../../engine/errors';
import { nonNegative, positive } from '../../engine/guards';
import { cellsOf, coerceCell, errorCell, isBlank, numbersOf, singleCell, toNumber } from '../coerce';
import { num, optNum, range, word } from '../params';
import type { FunctionDef, Grid, OutCell, Output, ParamDef, Scalar } from '../types';

/** Labels of the DATA.PRECISION spill, as in SPEC.md section 3. */
export const PRECISION_LABELS = [
  'Mean',
  'Repeatability SD',
  'Between-group SD',
  'Within-lab SD',
  'Repeatability CV %',
  'Within-lab CV %',
  'Groups',
  'Results',
] as const;

/** Labels of the DATA.COMPARE spill, as in SPEC.md section 3. */
export const COMPARE_LABELS = [
  'Slope',
  'Slope low 95%',
  'Slope high 95%',
  'Intercept',
  'Intercept low 95%',
  'Intercept high 95%',
  'Bias at level',
  'Bias at level %',
] as const;

/** The worksheet's confidence level for DATA.COMPARE intervals. */
const COMPARE_CONFIDENCE = 0.95;

function cellCount(g: Grid | undefined): number {
  let n = 0;
  if (g) for (const row of g) n += row.length;
  return n;
}

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

/** Pairs two ranges cell by cell, keeping the pairs where both cells are numbers. */
function pairedNumbers(a: Grid | undefined, b: Grid | undefined, nameA: string, nameB: string): [number[], number[]] {
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

/** A run or day label as a group key, or undefined for a blank cell. */
function groupKey(v: Scalar): string | undefined {
  if (isBlank(v)) return undefined;
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : undefined;
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  const t = v.trim();
  return t === '' ? undefined : t.toLowerCase();
}

/** A scalar parameter of an aggregate function, coerced as the registry coerces any cell. */
function scalarArg<T>(g: Grid | undefined, p: ParamDef, fn: string): T {
  return coerceCell(singleCell(g, p, fn), p) as T;
}

/** Runs one figure of a spill; a LeewayError becomes that cell's error, the rest still show. */
function cell(compute: () => number | string): OutCell {
  try {
    const v = compute();
    if (typeof v === 'number' && !Number.isFinite(v)) {
      return { error: '#NUM!', message: 'the result is not a finite number' };
    }
    return v;
  } catch (e) {
    if (e instanceof LeewayError) return errorCell(e);
    throw e;
  }
}

function bound(v: number | null, fit: LineFit): OutCell {
  if (v !== null && Number.isFinite(v)) return v;
  return { error: '#NUM!', message: fit.intervalNote ?? 'the interval is not defined for these data' };
}

const METHOD = word<CompareMethod>('method', readCompareMethod, DEFAULT_COMPARE_METHOD);
const LEVEL: ParamDef = { ...optNum('level', undefined), check: nonNegative };
const RATIO: ParamDef = { ...optNum('ratio', 1), check: positive };
const U_REF = range('u_ref');

export const DATA_FUNCTIONS: FunctionDef[] = [
  {
    kind: 'aggregate',
    name: 'DATA.CV',
    params: [range('values')],
    fn: ([g]) => sampleCv(numbersOf(g)),
  },
  {
    kind: 'aggregate',
    name: 'DATA.BIAS',
    params: [range('results'), range('targets')],
    fn: ([r, t]) => meanPercentBias(...pairedNumbers(r, t, 'results', 'targets')),
  },
  {
    kind: 'aggregate',
    name: 'DATA.RMSBIAS',
    params: [range('results'), range('targets')],
    fn: ([r, t]) => rmsPercentBias(...pairedNumbers(r, t, 'results', 'targets')),
  },
  {
    kind: 'aggregate',
    name: 'DATA.PRECISION',
    params: [range('values'), range('groups')],
    fn: ([gv, gg]): Output => {
      checkSameSize(gv, gg, 'values', 'groups');
      const cv = cellsOf(gv);
      const cg = cellsOf(gg);
      const values: number[] = [];
      const labels: string[] = [];
      for (let i = 0; i < cv.length; i++) {
        const v = cv[i];
        const key = groupKey(cg[i]);
        if (isNumber(v) && key !== undefined) {
          values.push(v);
          labels.push(key);
        }
      }
      const p = oneWayPrecision(values, labels);
      return [
        [...PRECISION_LABELS],
        [
          p.mean,
          p.repeatabilitySd,
          p.betweenSd,
          p.withinLabSd,
          cell(() => cvPercent(p.repeatabilitySd, p.mean)),
          cell(() => cvPercent(p.withinLabSd, p.mean)),
          p.groups,
          p.results,
        ],
      ];
    },
  },
  {
    kind: 'aggregate',
    name: 'DATA.COMPARE',
    params: [range('x'), range('y'), METHOD, LEVEL, RATIO],
    fn: ([gx, gy, gm, gl, gr]): Output => {
      const method = scalarArg<CompareMethod>(gm, METHOD, 'DATA.COMPARE');
      const level = scalarArg<number | undefined>(gl, LEVEL, 'DATA.COMPARE');
      const ratio = scalarArg<number>(gr, RATIO, 'DATA.COMPARE');
      const [x, y] = pairedNumbers(gx, gy, 'x', 'y');
      const fit = compareMethods(x, y, method, ratio, COMPARE_CONFIDENCE);
      let biasUnits: OutCell = '';
      let biasPercent: OutCell = '';
      if (level !== undefined) {
        const bias = biasAtLevel(fit, level);
        biasUnits = cell(() => bias.units);
        biasPercent = cell(() => {
          if (bias.percent === null) throw divError('level is zero: the bias in percent divides by the level');
          return bias.percent;
        });
      }
      return [
        [...COMPARE_LABELS],
        [
          fit.slope,
          bound(fit.slopeLow, fit),
          bound(fit.slopeHigh, fit),
          fit.intercept,
          bound(fit.interceptLow, fit),
          bound(fit.interceptHigh, fit),
          biasUnits,
          biasPercent,
        ],
      ];
    },
  },
  {
    kind: 'aggregate',
    name: 'MU.BIAS',
    params: [range('bias_values'), U_REF],
    fn: ([gb, gu]) => {
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
  },
  {
    kind: 'elementwise',
    name: 'MU.COMBINE',
    params: [num('u_rw'), num('u_bias'), optNum('k', 2)],
    fn: combinedUncertainty,
  },
];
