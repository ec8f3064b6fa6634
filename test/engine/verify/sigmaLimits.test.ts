import normalQuantileRef from '@stdlib/stats-base-dists-normal-quantile';
import { sigmaLimits } from '../../../src/engine/verify/sigmaLimits';
import { sigmaMetric } from '../../../src/engine/perf';
import { mulberry32, uniform } from '../../support/prng';

// z from @stdlib/stats-base-dists-normal-quantile (an independent implementation).
const Z95 = normalQuantileRef(0.975, 0, 1);

describe('PERF.SIGMALIMITS', () => {
  // Written out (first-order propagation, JCGM 100:2008): allowable 10, bias 1, cv 2, df 20,
  // u_bias 0.5: σ = 4.5; u(σ) = √(0.5² + 4.5²·2²/(2·20))/2 = √(0.25 + 2.025)/2 = √2.275/2.
  test('a worked case: σ = 4.5, u(σ) = √2.275/2, limits σ ∓ z·u(σ) (relative 1e-14)', () => {
    const r = sigmaLimits(10, 1, 2, 20, 0.5);
    const u = Math.sqrt(2.275) / 2;
    expect(r.sigma).toBe(4.5);
    expect(r.low).toBeRelClose(4.5 - Z95 * u, 1e-14);
    expect(r.high).toBeRelClose(4.5 + Z95 * u, 1e-14);
  });

  test('σ is PERF.SIGMA; the bias counts by its size; a negative σ is allowed', () => {
    expect(sigmaLimits(10, -1, 2, 20).sigma).toBe(sigmaMetric(10, -1, 2));
    const r = sigmaLimits(2, 5, 1, 10);
    expect(r.sigma).toBe(-3);
    expect(r.low).toBeLessThan(-3);
    expect(r.high).toBeGreaterThan(-3);
  });

  // Seed 5401: random inputs against the formula written with plain squares, z from stdlib at a
  // random confidence; relative 1e-13.
  test('random inputs agree with √(u_bias² + σ²·cv²/(2·df))/cv written out', () => {
    const rand = mulberry32(5401);
    for (let i = 0; i < 500; i++) {
      const allowable = uniform(rand, 0, 30);
      const bias = uniform(rand, -10, 10);
      const cv = uniform(rand, 0.1, 8);
      const df = uniform(rand, 0.5, 200);
      const ub = rand() < 0.3 ? 0 : uniform(rand, 0, 3);
      const c = uniform(rand, 0.5, 0.999);
      const r = sigmaLimits(allowable, bias, cv, df, ub, c);
      const sigma = (allowable - Math.abs(bias)) / cv;
      const u = Math.sqrt(ub * ub + (sigma * sigma * cv * cv) / (2 * df)) / cv;
      const z = normalQuantileRef((1 + c) / 2, 0, 1);
      expect(Math.abs(r.low - (sigma - z * u))).toBeLessThanOrEqual(1e-13 * (Math.abs(sigma) + z * u));
      expect(Math.abs(r.high - (sigma + z * u))).toBeLessThanOrEqual(1e-13 * (Math.abs(sigma) + z * u));
    }
  });

  // Common practice, no source: with a CV known exactly (df → ∞) and a bias known exactly
  // (u_bias → 0), the interval collapses onto σ; at df = 1e30 its half-width is z·σ/√(2e30).
  test('the limits collapse onto σ as df → ∞ and u_bias → 0', () => {
    const r = sigmaLimits(10, 1, 2, 1e30, 0);
    expect(Math.abs(r.low - 4.5)).toBeLessThanOrEqual(1e-14);
    expect(Math.abs(r.high - 4.5)).toBeLessThanOrEqual(1e-14);
    const s = sigmaLimits(10, 1, 2, 1e6, 1e-9);
    expect(Math.abs(s.high - 4.5)).toBeLessThanOrEqual(Z95 * 4.5 * 1.01e-3 / Math.SQRT2 + 1e-9);
  });

  // The figures do not depend on the unit: every input scaled by 1e300 or 1e-300 gives the same
  // σ and limits (relative 1e-14), where squaring the inputs would overflow or underflow.
  test.each([1e300, 1e-300, 1e-320])('inputs scaled by %p give the same σ and limits', (k) => {
    const base = sigmaLimits(10, 1, 2, 20, 0.5);
    const r = sigmaLimits(10 * k, 1 * k, 2 * k, 20, 0.5 * k);
    const tol = k < 1e-310 ? 1e-3 : 1e-14; // 1e-320 is subnormal: only a few digits survive in the inputs
    expect(r.sigma).toBeRelClose(base.sigma, tol);
    expect(r.low).toBeRelClose(base.low, tol);
    expect(r.high).toBeRelClose(base.high, tol);
  });
});

describe('PERF.SIGMALIMITS bad input', () => {
  test('if cv is zero, throws #DIV/0!', () => {
    expect(() => sigmaLimits(10, 1, 0, 20)).toThrow(expect.objectContaining({ code: '#DIV/0!', message: expect.stringContaining('cv') }));
  });
  test('if cv is negative, throws #NUM!', () => {
    expect(() => sigmaLimits(10, 1, -2, 20)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test.each([0, -1, NaN])('if given df %p, throws #NUM!', (df) => {
    expect(() => sigmaLimits(10, 1, 2, df)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('df') }));
  });
  test('if u_bias is negative, throws #NUM!', () => {
    expect(() => sigmaLimits(10, 1, 2, 20, -0.1)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('u_bias') }));
  });
  test('if allowable is negative or bias is not a number, throws #NUM!', () => {
    expect(() => sigmaLimits(-1, 1, 2, 20)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('allowable') }));
    expect(() => sigmaLimits(10, NaN, 2, 20)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('bias') }));
  });
  test.each([0, 1, 1.5, -0.2])('if given confidence %p, throws #NUM!', (c) => {
    expect(() => sigmaLimits(10, 1, 2, 20, 0, c)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('confidence') }));
  });
  test('if σ or its limits leave double range, throws #NUM!', () => {
    expect(() => sigmaLimits(1e308, 0, 1e-10, 20)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => sigmaLimits(10, 1, 0.5, 20, 1e308)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
});
