import { allowableBias, allowableImprecision, allowableTotalError, allowableUncertainty, fixedLimitPercent, tierTable } from '../../src/engine/spec';
import { TIERS } from '../../src/engine/tiers';
import { LeewayError } from '../../src/engine/errors';
import { mulberry32, uniform } from '../support/prng';

describe('SPEC.CV, SPEC.BIAS, SPEC.TOTAL against the published tier factors', () => {
  // Common practice, no source: CVI 5.7 %, CVG 6.9 %, desirable tier → CV 2.85 %, bias 2.24 %,
  // total 6.94 % at z = 1.65 (values as usually quoted, to 2 decimals).
  test('CVI 5.7, CVG 6.9, desirable: 2.85 / 2.24 / 6.94', () => {
    expect(allowableImprecision(5.7, 'desirable')).toBeCloseTo(2.85, 12);
    expect(Math.abs(allowableBias(5.7, 6.9, 'desirable') - 2.24)).toBeLessThan(0.005);
    expect(Math.abs(allowableTotalError(5.7, 6.9, 'desirable', 1.65) - 6.94)).toBeLessThan(0.005);
  });

  // Fraser et al. Ann Clin Biochem 1997;34:8–12: f = 0.25 / 0.50 / 0.75, g = 0.125 / 0.25 / 0.375.
  test('the factors of each tier, exactly', () => {
    expect(allowableImprecision(10, 'optimum')).toBe(2.5);
    expect(allowableImprecision(10, 'minimum')).toBe(7.5);
    expect(allowableBias(3, 4, 'optimum')).toBe(0.625);
    expect(allowableBias(3, 4, 'desirable')).toBe(1.25);
    expect(allowableBias(3, 4, 'minimum')).toBe(1.875);
    expect(allowableTotalError(3, 4, 'desirable', 2)).toBe(2 * 1.5 + 1.25);
  });

  test('if given a negative CV, throws #NUM!', () => {
    expect(() => allowableImprecision(-1, 'desirable')).toThrow(LeewayError);
    let caught: unknown;
    try {
      allowableBias(1, -2, 'desirable');
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(LeewayError);
    expect((caught as LeewayError).code).toBe('#NUM!');
    expect((caught as LeewayError).message).toMatch(/cvg/);
  });

  // Seed 20261202: tiers ordered and the formulas linear in the CVs.
  test('properties: optimum < desirable < minimum, and linear scaling', () => {
    const rand = mulberry32(20261202);
    for (let i = 0; i < 2000; i++) {
      const cvi = uniform(rand, 0.01, 60);
      const cvg = uniform(rand, 0, 80);
      const z = uniform(rand, 0, 3);
      const t = tierTable(cvi, cvg, z);
      expect(t[0].cv).toBeLessThan(t[1].cv);
      expect(t[1].cv).toBeLessThan(t[2].cv);
      expect(t[0].bias).toBeLessThan(t[1].bias);
      expect(t[1].total).toBeLessThan(t[2].total);
      const s = uniform(rand, 0.001, 1000);
      for (const tier of TIERS) {
        const a = allowableTotalError(cvi, cvg, tier, z);
        const b = allowableTotalError(s * cvi, s * cvg, tier, z);
        expect(Math.abs(b - s * a)).toBeLessThanOrEqual(1e-12 * Math.abs(s * a));
      }
    }
  });
});

describe('SPEC.MU and SPEC.FIXED', () => {
  test('standard and expanded uncertainty from CVI', () => {
    expect(allowableUncertainty(6, 'desirable', 1)).toBe(3);
    expect(allowableUncertainty(6, 'desirable', 2)).toBe(6);
  });

  // Common practice, no source: "± 0.3 mmol/L or ± 10 %, whichever is greater".
  test('whichever is greater: absolute wins at low levels, percent at high levels', () => {
    expect(fixedLimitPercent(2, 0.3, 10)).toBeCloseTo(15, 12);
    expect(fixedLimitPercent(6, 0.3, 10)).toBe(10);
  });

  test('a zero level gives #DIV/0!, a negative one #NUM!', () => {
    expect(() => fixedLimitPercent(0, 1, 1)).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
    expect(() => fixedLimitPercent(-1, 1, 1)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
});
