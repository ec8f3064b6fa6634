/**
 * The worksheet wrappers with a stubbed CustomFunctions global, as Excel calls them: every
 * parameter arrives as a matrix, omitted optional arguments arrive as null, blank cells as null.
 */
class StubError {
  constructor(
    public code: string,
    public message?: string,
  ) {}
}
(globalThis as unknown as { CustomFunctions: unknown }).CustomFunctions = {
  Error: StubError,
  ErrorCode: {
    invalidValue: '#VALUE!',
    notAvailable: '#N/A',
    divisionByZero: '#DIV/0!',
    invalidNumber: '#NUM!',
    nullReference: '#NULL!',
    invalidName: '#NAME?',
    invalidReference: '#REF!',
  },
};

import { wrapperOf } from '../support/wrappers';

const specCv = wrapperOf('SPEC.CV');
const specTotal = wrapperOf('SPEC.TOTAL');
const specTiers = wrapperOf('SPEC.TIERS');
const zScore = wrapperOf('ZSCORE');
const perfSigma = wrapperOf('PERF.SIGMA');
const perfTier = wrapperOf('PERF.TIER');
const qcShift = wrapperOf('QC.SHIFT');
const bvRcv = wrapperOf('BV.RCV');
const bvSetpoint = wrapperOf('BV.SETPOINT');

describe('worksheet wrappers', () => {
  test('a single cell in, a single value out; omitted optionals (null) take defaults', () => {
    expect(specCv([[5.7]], null as unknown as undefined)).toEqual([[2.85]]);
    expect(specTotal([[5.7]], [[6.9]], null as never, null as never)[0][0]).toBeCloseTo(6.93997, 5);
    expect(zScore([[0.975]])[0][0]).toBeCloseTo(1.959964, 6);
    expect(bvRcv([[3]], [[4]])[0][0]).toBeCloseTo(13.8593, 4);
  });

  test.each([
    ['#VALUE!', () => specCv([['high']])],
    ['#NUM!', () => specCv([[-2]])],
    ['#DIV/0!', () => perfSigma([[10]], [[1]], [[0]])],
    ['#N/A', () => specCv([[null]])],
    ['#NUM!', () => zScore([[1.5]])],
    ['#VALUE!', () => perfTier([[5]], [[6]], [[1]], [[1]], [[1.65]], [['sometimes']])],
  ])('each error code reaches Excel as a CustomFunctions.Error: %s', (code, call) => {
    const v = call()[0][0] as unknown as StubError;
    expect(v).toBeInstanceOf(StubError);
    expect(v.code).toBe(code);
    // Excel takes a custom message with #VALUE! and #N/A only (Office Add-ins documentation).
    if (code === '#VALUE!' || code === '#N/A') expect((v.message ?? '').length).toBeGreaterThan(5);
    else expect(v.message).toBeUndefined();
  });

  test('a blank cell inside a range gives #N/A in that cell only', () => {
    const out = specCv([[4], [null], [8]]);
    expect(out[0][0]).toBe(2);
    expect((out[1][0] as unknown as StubError).code).toBe('#N/A');
    expect(out[2][0]).toBe(4);
  });

  test('spills: SPEC.TIERS returns 4×4 values, not errors', () => {
    const out = specTiers([[5.7]], [[6.9]]);
    expect(out.length).toBe(4);
    expect(out.every((r) => r.length === 4)).toBe(true);
    expect(qcShift([[10]], [[2]], [[2]])[0][0]).toBeCloseTo(2.35, 12);
    expect(bvSetpoint([[3]], [[4]], [[5]], [[2]])).toEqual([[4]]);
  });

  test('nothing throws past the wrapper, whatever arrives', () => {
    const odd: unknown[] = [undefined, null, [[{}]], [[[1]]], [[Symbol('x')]], [[]], [], [[1n]]];
    for (const v of odd) expect(() => specCv(v as never, v as never)).not.toThrow();
  });
});
