/** SPEC family and ZSCORE: specifications from biological variation or a fixed limit. */
import {
  allowableBias,
  allowableImprecision,
  allowableTotalError,
  allowableUncertainty,
  fixedLimitPercent,
  tierTable,
} from '../../engine/spec';
import { zFromCoverage } from '../../engine/coverage';
import { Z_TOTAL_ERROR } from '../../engine/coverage';
import { nonNegative } from '../../engine/guards';
import { singleCell, toNumber, isBlank } from '../coerce';
import { num, optNum, TIER, Z_TE } from '../params';
import type { FunctionDef, Output } from '../types';

const cvi = num('cvi');
const cvg = num('cvg');

export const SPEC_FUNCTIONS: FunctionDef[] = [
  { kind: 'elementwise', name: 'SPEC.CV', params: [cvi, TIER], fn: allowableImprecision },
  { kind: 'elementwise', name: 'SPEC.BIAS', params: [cvi, cvg, TIER], fn: allowableBias },
  { kind: 'elementwise', name: 'SPEC.TOTAL', params: [cvi, cvg, TIER, Z_TE], fn: allowableTotalError },
  { kind: 'elementwise', name: 'SPEC.MU', params: [cvi, TIER, optNum('k', 1)], fn: allowableUncertainty },
  {
    kind: 'elementwise',
    name: 'SPEC.FIXED',
    params: [num('level'), num('absolute'), num('percent')],
    fn: fixedLimitPercent,
  },
  {
    kind: 'aggregate',
    name: 'SPEC.TIERS',
    params: [cvi, cvg, Z_TE],
    fn: ([gi, gg, gz]): Output => {
      const i = toNumber(singleCell(gi, cvi, 'SPEC.TIERS'), 'cvi');
      const g = toNumber(singleCell(gg, cvg, 'SPEC.TIERS'), 'cvg');
      const zCell = singleCell(gz, Z_TE, 'SPEC.TIERS');
      const z = isBlank(zCell) ? Z_TOTAL_ERROR : nonNegative(toNumber(zCell, 'z'), 'z');
      const rows: Output = [['Tier', 'CV', 'Bias', 'Total']];
      for (const r of tierTable(i, g, z)) rows.push([r.tier, r.cv, r.bias, r.total]);
      return rows;
    },
  },
  { kind: 'elementwise', name: 'ZSCORE', params: [num('probability'), optNum('sides', 1)], fn: zFromCoverage },
];
