/**
 * Display rounding (src/engine/round.ts): half-up on the decimal the user sees. Reference:
 * decimal.js ROUND_HALF_UP on the same shortest decimal string (a well-kept arbitrary-precision
 * library), on seeded numbers over 40 orders of magnitude and on known ties.
 */
import Decimal from 'decimal.js';
import { formatFixed, roundHalfUp } from '../../src/engine/round';
import { mulberry32 } from '../support/prng';

const D = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_UP });
const refText = (x: number, d: number): string => new D(String(x)).toFixed(d, D.ROUND_HALF_UP);

describe('display rounding', () => {
  test.each([
    [2.675, 2, '2.68'], // the classic binary trap: 2.675 is 2.67499999… as a double (common practice, no source)
    [1.005, 2, '1.01'],
    [-2.675, 2, '-2.68'],
    [0.5, 0, '1'],
    [-0.5, 0, '-1'],
    [9.995, 2, '10.00'],
    [14, 1, '14.0'],
    [0.0006, 3, '0.001'],
    [0, 2, '0.00'],
    [-0.001, 2, '-0.00'],
  ])('%p to %p decimals is %p', (x, d, text) => {
    expect(formatFixed(x, d)).toBe(text);
    expect(formatFixed(x, d)).toBe(refText(x, d));
    expect(roundHalfUp(x, d)).toBe(Number(text));
  });

  test('equals decimal.js on 60,000 seeded numbers from 1e-20 to 1e20 and 0 to 6 decimals', () => {
    const rand = mulberry32(20261204);
    let checked = 0;
    for (let i = 0; i < 10000; i++) {
      const x = (rand() - 0.5) * Math.pow(10, Math.floor(rand() * 40) - 20);
      const tie = Math.round(rand() * 1e6) / 1000 + 0.0005;
      for (const d of [0, 2, 6]) {
        expect([x, d, formatFixed(x, d)]).toEqual([x, d, refText(x, d)]);
        expect([tie, d, formatFixed(tie, d)]).toEqual([tie, d, refText(tie, d)]);
        checked += 2;
      }
    }
    expect(checked).toBe(60000);
  });

  test('non-finite numbers pass through unchanged', () => {
    expect(roundHalfUp(Infinity, 2)).toBe(Infinity);
    expect(formatFixed(NaN, 2)).toBe('NaN');
  });
});
