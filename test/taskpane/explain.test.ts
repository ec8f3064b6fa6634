import { explain, parseLeewayCall, referencesOf, refKey, splitTopLevel } from '../../src/taskpane/explain';
import type { Grid } from '../../src/registry/types';

describe('explaining a LEEWAY cell', () => {
  test('splits arguments at top-level commas only', () => {
    expect(splitTopLevel('B2,IF(F22="",$B$2,F22),"a,b",{1,2;3,4}')).toEqual(['B2', 'IF(F22="",$B$2,F22)', '"a,b"', '{1,2;3,4}']);
  });

  test('reads the call a fill writes, as typed and as a file stores it', () => {
    for (const f of ['=LEEWAY.SPEC.TOTAL(D22,E22,IF(F22="",$B$2,F22),$B$3)', '_xldudf_LEEWAY_SPEC_TOTAL(D22,E22,IF(F22="",$B$2,F22),$B$3)']) {
      const call = parseLeewayCall(f)!;
      expect(call.name).toBe('SPEC.TOTAL');
      expect(referencesOf(call).map((r) => r.address)).toEqual(['D22', 'E22', 'F22', 'B2', 'B3']);
    }
  });

  test('literals, sheet-qualified ranges and array constants', () => {
    const call = parseLeewayCall("=LEEWAY.DATA.COMPARE('Raw data'!A2:A8,Sheet2!$B$2:$B$8,\"deming\",10)")!;
    expect(call.args[0]).toEqual({ kind: 'ref', sheet: 'Raw data', address: 'A2:A8' });
    expect(call.args[1]).toEqual({ kind: 'ref', sheet: 'Sheet2', address: 'B2:B8' });
    expect(call.args[2]).toEqual({ kind: 'value', value: 'deming' });
    expect(parseLeewayCall('=LEEWAY.DATA.CV({1;2;3})')!.args[0]).toEqual({ kind: 'value', value: [[1], [2], [3]] });
  });

  test('a formula that is not one LEEWAY call is not read', () => {
    expect(parseLeewayCall('=SUM(A1:A3)')).toBeNull();
    expect(parseLeewayCall('=LEEWAY.SPEC.CV(A1)+LEEWAY.SPEC.CV(A2)')).toBeNull();
    expect(parseLeewayCall('=LEEWAY.NOT.A.FUNCTION(1)')).toBeNull();
  });

  test('a zero CV in PERF.SIGMA gives the #DIV/0! message Excel cannot show', () => {
    const call = parseLeewayCall('=LEEWAY.PERF.SIGMA(H2,E2,D2)')!;
    const values = new Map<string, Grid>([
      [refKey(null, 'H2'), [[6.94]]],
      [refKey(null, 'E2'), [[1]]],
      [refKey(null, 'D2'), [[0]]],
    ]);
    const e = explain(call, values);
    expect(e.isError).toBe(true);
    expect(e.message).toMatch(/^#DIV\/0! cv must not be zero/);
  });

  test('the per-row tier falls back to the sheet tier cell when the row cell is blank', () => {
    const call = parseLeewayCall('=LEEWAY.SPEC.CV(D22,IF(F22="",$B$2,F22))')!;
    const values = new Map<string, Grid>([
      [refKey(null, 'D22'), [[5.7]]],
      [refKey(null, 'F22'), [[null]]],
      [refKey(null, 'B2'), [['best']]],
    ]);
    expect(explain(call, values).message).toMatch(/^#VALUE! tier must be one of/);
    values.set(refKey(null, 'B2'), [['desirable']]);
    expect(explain(call, values)).toMatchObject({ isError: false });
    expect(explain(call, values).output).toEqual([[2.85]]);
  });

  test('an expression it does not follow is said so, not guessed', () => {
    const call = parseLeewayCall('=LEEWAY.SPEC.CV(D2*2)')!;
    expect(explain(call, new Map()).message).toMatch(/does not follow/);
  });
});
