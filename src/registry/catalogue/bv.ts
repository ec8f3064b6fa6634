/** BV family: other uses of biological variation. */
import { individualityIndex, logNormalRcv, readDirection, referenceChangeValue, setPointSpecimens } from '../../engine/bv';
import { num, optNum, word, Z_95 } from '../params';
import type { FunctionDef } from '../types';

export const BV_FUNCTIONS: FunctionDef[] = [
  { kind: 'elementwise', name: 'BV.RCV', params: [num('cv'), num('cvi'), Z_95], fn: referenceChangeValue },
  {
    kind: 'elementwise',
    name: 'BV.RCVLOG',
    params: [num('cv'), num('cvi'), Z_95, word('direction', readDirection, 'up')],
    fn: logNormalRcv,
  },
  {
    kind: 'elementwise',
    name: 'BV.INDIVIDUALITY',
    params: [num('cvi'), num('cvg'), optNum('cv', 0)],
    fn: individualityIndex,
  },
  {
    kind: 'elementwise',
    name: 'BV.SETPOINT',
    params: [num('cv'), num('cvi'), num('closeness'), Z_95],
    fn: setPointSpecimens,
  },
];
