import { individualityIndex, logNormalRcv, referenceChangeValue, setPointSpecimens } from '../../src/engine/bv';
import { mulberry32, uniform } from '../support/prng';

describe('BV.RCV (Harris & Yasaka 1983)', () => {
  // √2·z·√(CV² + CVI²) by hand: CV 3, CVI 4 → √2·1.96·5 = 13.8593…
  test('CV 3 %, CVI 4 %, z 1.96 gives 13.859 %', () => {
    expect(referenceChangeValue(3, 4, 1.96)).toBeCloseTo(Math.SQRT2 * 9.8, 12);
  });
  test('property: linear in the CVs (seed 3)', () => {
    const rand = mulberry32(3);
    for (let i = 0; i < 1000; i++) {
      const cv = uniform(rand, 0, 30);
      const cvi = uniform(rand, 0, 30);
      const s = uniform(rand, 0.01, 100);
      const a = referenceChangeValue(cv, cvi, 1.96);
      expect(Math.abs(referenceChangeValue(s * cv, s * cvi, 1.96) - s * a)).toBeLessThanOrEqual(1e-12 * s * a + 1e-300);
    }
  });
});

describe('BV.RCVLOG (Fokkema et al. 2006)', () => {
  // The function's formula (docs/reference/functions), evaluated by hand in double precision: CV 3, CVI 4 (total 5 %):
  // σ = √ln(1.0025) = 0.0499688…, up = e^{1.96·√2·σ} − 1 = 14.8…%, down = e^{−…} − 1 = −12.9…%.
  test('up and down are asymmetric and multiply to a unit ratio', () => {
    const up = logNormalRcv(3, 4, 1.96, 'up');
    const down = logNormalRcv(3, 4, 1.96, 'down');
    const sigma = Math.sqrt(Math.log(1 + 0.05 * 0.05));
    expect(up).toBeCloseTo((Math.exp(1.96 * Math.SQRT2 * sigma) - 1) * 100, 12);
    expect((1 + up / 100) * (1 + down / 100)).toBeCloseTo(1, 14);
    expect(up).toBeGreaterThan(referenceChangeValue(3, 4, 1.96));
    expect(-down).toBeLessThan(referenceChangeValue(3, 4, 1.96));
  });
  test('for small CVs it approaches the symmetric RCV', () => {
    expect(Math.abs(logNormalRcv(0.03, 0.04, 1.96, 'up') / referenceChangeValue(0.03, 0.04, 1.96) - 1)).toBeLessThan(1e-3);
  });
});

describe('BV.INDIVIDUALITY (Harris 1974) and BV.SETPOINT', () => {
  test('index of individuality √(CVI² + CV²)/CVG', () => {
    expect(individualityIndex(3, 10, 4)).toBe(0.5);
    expect(individualityIndex(6, 10, 0)).toBeCloseTo(0.6, 15);
  });
  test('if CVG is zero, returns #DIV/0!', () => {
    expect(() => individualityIndex(3, 0, 0)).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
  });
  // ⌈(z·√(CV² + CVI²)/closeness)²⌉ by hand: z 2, CV 3, CVI 4, closeness 5 → exactly 4 (not 5 by rounding).
  test('a whole-number result is not pushed up by binary rounding', () => {
    expect(setPointSpecimens(3, 4, 5, 2)).toBe(4);
    expect(setPointSpecimens(3, 4, 5, 1.96)).toBe(4); // 3.8416 → 4
    expect(setPointSpecimens(3, 4, 2, 1.96)).toBe(25); // 24.01 → 25
    expect(setPointSpecimens(0, 0, 2, 1.96)).toBe(1);
  });
});
