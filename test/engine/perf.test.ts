import { allowanceShare, criticalShift, observedTotalError, sigmaMetric, tierMet } from '../../src/engine/perf';
import { allowableTotalError } from '../../src/engine/spec';
import { mulberry32, uniform } from '../support/prng';

describe('PERF.TOTAL, PERF.SIGMA, PERF.SHARE, QC.SHIFT', () => {
  // Total-error model |bias| + z·CV (Westgard, Carey & Wold 1974, from memory), arithmetic by hand.
  test('observed total error uses |bias|', () => {
    expect(observedTotalError(-2, 3, 1.65)).toBeCloseTo(2 + 4.95, 14);
    expect(observedTotalError(2, 3, 1.65)).toBeCloseTo(6.95, 14);
  });

  // Common practice, no source: an observed total error of 10.1 % against 6.94 % fails.
  test('10.1 % observed against a 6.94 % allowance uses more than all of it', () => {
    expect(allowanceShare(10.1, 6.94)).toBeGreaterThan(1);
    expect(allowanceShare(10.1, 6.94)).toBeCloseTo(1.4553, 4);
  });

  // Sigma metric (allowable − |bias|)/CV: Westgard & Groth 1979 framework, arithmetic by hand.
  test('sigma of a 10 % allowance, 2 % bias, 2 % CV is 4; critical shift is 4 − 1.65', () => {
    expect(sigmaMetric(10, -2, 2)).toBe(4);
    expect(criticalShift(10, 2, 2, 1.65)).toBeCloseTo(2.35, 14);
    expect(sigmaMetric(1, 3, 1)).toBe(-2);
  });

  test('if given a zero CV, sigma gives #DIV/0!; a zero allowance share gives #DIV/0!', () => {
    expect(() => sigmaMetric(10, 1, 0)).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
    expect(() => allowanceShare(1, 0)).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
  });

  // Seed 99: sigma is unchanged when allowance, bias and CV are scaled by one factor.
  test('property: sigma is scale-free', () => {
    const rand = mulberry32(99);
    for (let i = 0; i < 5000; i++) {
      const a = uniform(rand, 0, 50);
      const b = uniform(rand, -20, 20);
      const cv = uniform(rand, 0.01, 20);
      const s = Math.exp(uniform(rand, -7, 7));
      const base = sigmaMetric(a, b, cv);
      expect(Math.abs(sigmaMetric(s * a, s * b, s * cv) - base)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(base)));
    }
  });
});

describe('PERF.TIER', () => {
  // CVI 5.7, CVG 6.9 (the common-practice example above): desirable TEa 6.94 %, optimum 3.47 %, minimum 10.41 %.
  test('picks the most stringent tier met, total mode', () => {
    expect(tierMet(5.7, 6.9, 1, 1, 1.65, 'total')).toBe('optimum'); // 1 + 1.65 = 2.65 ≤ 3.47
    expect(tierMet(5.7, 6.9, 2, 2, 1.65, 'total')).toBe('desirable'); // 5.3 ≤ 6.94
    expect(tierMet(5.7, 6.9, 4, 3, 1.65, 'total')).toBe('minimum'); // 8.95 ≤ 10.41
    expect(tierMet(5.7, 6.9, 5, 3.5, 1.65, 'total')).toBe('none'); // 10.775 > 10.41
  });

  test('parts mode needs both CV and bias within their allowances', () => {
    // desirable: CV ≤ 2.85, bias ≤ 2.237; optimum: CV ≤ 1.425, bias ≤ 1.119
    expect(tierMet(5.7, 6.9, 1, 1.4, 1.65, 'parts')).toBe('optimum');
    expect(tierMet(5.7, 6.9, 0.1, 2.9, 1.65, 'parts')).toBe('minimum');
    expect(tierMet(5.7, 6.9, 2.3, 0.1, 1.65, 'parts')).toBe('minimum');
  });

  test('a result exactly on the allowance meets it', () => {
    const tea = allowableTotalError(5.7, 6.9, 'desirable', 1.65);
    expect(tierMet(5.7, 6.9, tea, 0, 1.65, 'total')).toBe('desirable');
  });
});
