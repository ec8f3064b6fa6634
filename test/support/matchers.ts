/**
 * Jest matchers of the project, loaded for every suite (jest.config.js, setupFilesAfterEach).
 *
 * toBeRelClose(expected, rel): |actual − expected| ≤ rel·|expected| (with the smallest positive
 * double as the floor of |expected|, so an expected 0 asks for an exact 0). On failure it prints
 * both numbers in full, their difference and the relative difference, which `expect(relClose(…))
 * .toBe(true)` could not.
 */
import { relClose } from './prng';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace jest {
    interface Matchers<R> {
      toBeRelClose(expected: number, rel: number): R;
    }
  }
}

expect.extend({
  toBeRelClose(actual: unknown, expected: number, rel: number) {
    const ok = typeof actual === 'number' && relClose(actual, expected, rel);
    const detail = (): string => {
      if (typeof actual !== 'number') return `expected a number, got ${String(actual)}`;
      const diff = actual - expected;
      const relDiff = expected === 0 ? Infinity : Math.abs(diff / expected);
      return [
        `expected ${this.utils.printExpected(expected)} within a relative ${rel}`,
        `received ${this.utils.printReceived(actual)}`,
        `difference ${diff} (relative ${relDiff})`,
      ].join('\n');
    };
    return {
      pass: ok,
      message: () => (ok ? `expected ${String(actual)} not to be within a relative ${rel} of ${expected}` : detail()),
    };
  },
});
