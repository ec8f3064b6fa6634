import { readDecimal } from '../../../src/engine/table';

// Common practice, no source: how people and spreadsheets in several locales write numbers.
describe('readDecimal', () => {
  test.each([
    ['5.7', 5.7],
    ['5,7', 5.7],
    [' -0,25 ', -0.25],
    ['12', 12],
    ['.5', 0.5],
    [',5', 0.5],
    ['1e-3', 0.001],
    ['5.7 %', 5.7],
    ['5,7%', 5.7],
    ['+3', 3],
  ])('reads %j as %d', (text, x) => {
    expect(readDecimal(text)).toBe(x);
  });

  test.each(['', 'twelve', '1.234,5', '1,234.5', '1 234', '5..7', '5.7.1', '%', 'NaN', 'Infinity', '0x10', '5 7'])('refuses %j', (text) => {
    expect(readDecimal(text)).toBeUndefined();
  });
});
