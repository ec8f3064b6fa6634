/** PERF family and QC.SHIFT: observed performance against a specification. */
import { allowanceShare, criticalShift, observedTotalError, readTierMode, sigmaMetric, tierMet } from '../../engine/perf';
import { num, word, Z_TE } from '../params';
import type { FunctionDef } from '../types';


export const PERF_FUNCTIONS: FunctionDef[] = [
  { kind: 'elementwise', name: 'PERF.TOTAL', params: [num('bias'), num('cv'), Z_TE], fn: observedTotalError },
  { kind: 'elementwise', name: 'PERF.SIGMA', params: [num('allowable'), num('bias'), num('cv')], fn: sigmaMetric },
  { kind: 'elementwise', name: 'PERF.SHARE', params: [num('observed'), num('allowable')], fn: allowanceShare },
  {
    kind: 'elementwise',
    name: 'PERF.TIER',
    params: [num('cvi'), num('cvg'), num('bias'), num('cv'), Z_TE, word('mode', readTierMode, 'total')],
    fn: tierMet,
  },
  {
    kind: 'elementwise',
    name: 'QC.SHIFT',
    params: [num('allowable'), num('bias'), num('cv'), Z_TE],
    fn: criticalShift,
  },
];
