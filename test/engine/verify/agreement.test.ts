import * as fs from 'fs';
import * as path from 'path';
import tQuantileRef from '@stdlib/stats-base-dists-t-quantile';
import { agreement, readAgreementScale } from '../../../src/engine/verify/agreement';
import { normalDeviates } from '../../../src/engine/demo/random';
import { mulberry32, uniform } from '../../support/prng';

/** Bland & Altman 1986, Table 1 (test/fixtures/method-comparison/bland_altman_1986_pefr.csv). */
function peakFlow(): { large: number[]; mini: number[] } {
  const text = fs.readFileSync(path.join(__dirname, '..', '..', 'fixtures', 'method-comparison', 'bland_altman_1986_pefr.csv'), 'utf8');
  const rows = text.trim().split(/\r?\n/).slice(1).map((l) => l.split(',').map(Number));
  return { large: rows.map((r) => r[1]), mini: rows.map((r) => r[2]) };
}

const round1 = (v: number): number => Math.round(v * 10) / 10;

describe('DATA.AGREEMENT on the Bland & Altman (Lancet 1986) peak-flow data', () => {
  const { large, mini } = peakFlow();
  // x = mini meter, y = large meter, so d = large − mini as published.
  const a = agreement(mini, large);

  test('17 pairs; mean difference −2.1 and SD 38.8 l/min as published (to the published 1 decimal)', () => {
    expect(a.pairs).toBe(17);
    // Published: mean difference −2.1, SD 38.8 (Bland & Altman 1986, as given in the fixtures README).
    expect(round1(a.meanDifference)).toBe(-2.1);
    expect(round1(a.sdDifferences)).toBe(38.8);
    // The same, to the 2 decimals the fixtures README gives (−2.12, 38.77): absolute 0.005.
    expect(Math.abs(a.meanDifference - -2.12)).toBeLessThanOrEqual(0.005);
    expect(Math.abs(a.sdDifferences - 38.77)).toBeLessThanOrEqual(0.005);
    // Exactly: Σd = −36 over 17 pairs (hand sum of the table), so d̄ = −36/17; relative 2e-15
    // (the two-pass mean is exact to about one rounding of the first difference, 18).
    expect(a.meanDifference).toBeRelClose(-36 / 17, 2e-15);
  });

  test('limits: the published ±2 SD limits −79.7 and 75.5 from the rounded mean and SD; ours are ±1.96 SD', () => {
    // The paper forms its limits from the rounded figures: −2.1 ∓ 2·38.8.
    const d = round1(a.meanDifference);
    const s = round1(a.sdDifferences);
    expect(round1(d - 2 * s)).toBe(-79.7);
    expect(round1(d + 2 * s)).toBe(75.5);
    // Leeway's limits use 1.96 SD (the catalogue's definition).
    expect(a.lowerLimit).toBeRelClose(a.meanDifference - 1.96 * a.sdDifferences, 1e-14);
    expect(a.upperLimit).toBeRelClose(a.meanDifference + 1.96 * a.sdDifferences, 1e-14);
  });

  // Bland & Altman 1986 (from memory): 95 % CI of the mean difference −2.1 ± 2.12·9.4, that is
  // −22.0 to 17.8 (t = 2.12 with 16 df, SE = s/√17 = 9.4).
  test('interval of the mean difference −22.0 to 17.8 (from memory of the paper; absolute 0.05)', () => {
    expect(Math.abs(a.meanDifferenceLow - -22.0)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(a.meanDifferenceHigh - 17.8)).toBeLessThanOrEqual(0.05);
  });

  // The intervals against the formulas written out here, with t from
  // @stdlib/stats-base-dists-t-quantile (an independent implementation): relative 1e-13.
  test('intervals of the mean and of each limit: t·s/√n and t·s·√(1/n + 1.96²/(2(n − 1)))', () => {
    const n = 17;
    const t = tQuantileRef(0.975, n - 1);
    const s = a.sdDifferences;
    const hm = (t * s) / Math.sqrt(n);
    const hl = t * s * Math.sqrt(1 / n + (1.96 * 1.96) / (2 * (n - 1)));
    expect(a.meanDifferenceLow).toBeRelClose(a.meanDifference - hm, 1e-13);
    expect(a.meanDifferenceHigh).toBeRelClose(a.meanDifference + hm, 1e-13);
    expect(a.lowerLimitLow).toBeRelClose(a.lowerLimit - hl, 1e-13);
    expect(a.lowerLimitHigh).toBeRelClose(a.lowerLimit + hl, 1e-13);
    expect(a.upperLimitLow).toBeRelClose(a.upperLimit - hl, 1e-13);
    expect(a.upperLimitHigh).toBeRelClose(a.upperLimit + hl, 1e-13);
    // A 90 % interval is narrower, the limits themselves do not move.
    const b = agreement(mini, large, 'absolute', 0.9);
    expect(b.lowerLimit).toBe(a.lowerLimit);
    expect(b.meanDifferenceHigh - b.meanDifference).toBeRelClose((tQuantileRef(0.95, n - 1) * s) / Math.sqrt(n), 1e-13);
  });
});

describe('DATA.AGREEMENT, percent differences', () => {
  // Hand-checkable (common practice, no source): d = 100·(y − x)/((x + y)/2).
  test('three pairs, written out', () => {
    const x = [100, 200, 50];
    const y = [110, 190, 55];
    const d = x.map((xi, i) => (100 * (y[i] - xi)) / ((xi + y[i]) / 2));
    const m = (d[0] + d[1] + d[2]) / 3;
    const s = Math.sqrt(d.reduce((acc, v) => acc + (v - m) ** 2, 0) / 2);
    const r = agreement(x, y, 'percent');
    expect(r.meanDifference).toBeRelClose(m, 1e-14);
    expect(r.sdDifferences).toBeRelClose(s, 1e-14);
    expect(r.upperLimit).toBeRelClose(m + 1.96 * s, 1e-14);
  });

  test('a pair with x + y = 0 is #DIV/0! naming its position', () => {
    expect(() => agreement([1, -2, 3], [1.1, 2, 3.2], 'percent')).toThrow(
      expect.objectContaining({ code: '#DIV/0!', message: expect.stringContaining('pair 2') }),
    );
    // The same pair is fine in absolute units.
    expect(agreement([1, -2, 3], [1.1, 2, 3.2], 'absolute').pairs).toBe(3);
  });
});

describe('DATA.AGREEMENT, numerical care', () => {
  // Seed 5201: a common level of 1e9 added to both methods (exact in doubles for these integer
  // differences) changes no figure; swapping the methods negates the mean difference and swaps
  // the limits (common practice, no source).
  test('a large common level costs no digits; swapping x and y mirrors every figure', () => {
    const rand = mulberry32(5201);
    for (let t = 0; t < 100; t++) {
      const n = 3 + Math.floor(rand() * 40);
      const x: number[] = [];
      const y: number[] = [];
      for (let i = 0; i < n; i++) {
        const xi = Math.round(uniform(rand, 50, 150));
        x.push(xi);
        y.push(xi + Math.round(uniform(rand, -10, 12)));
      }
      const base = agreement(x, y);
      const shifted = agreement(
        x.map((v) => v + 1e9),
        y.map((v) => v + 1e9),
      );
      expect(shifted.meanDifference).toBeRelClose(base.meanDifference, 1e-15);
      expect(shifted.sdDifferences).toBeRelClose(base.sdDifferences, 1e-14);
      const swapped = agreement(y, x);
      expect(swapped.meanDifference === -base.meanDifference).toBe(true); // exact (0 and −0 alike)
      expect(swapped.lowerLimit).toBeRelClose(-base.upperLimit, 1e-14);
      expect(swapped.upperLimitHigh).toBeRelClose(-base.lowerLimitLow, 1e-14);
    }
  });

  // Results in a huge or tiny unit: every absolute figure scales, percent figures do not change
  // (relative 1e-14); a naive sum of squares would overflow (1e300²) or underflow (1e-300²).
  test.each([1e300, 1e-300])('results scaled by %p: absolute figures scale, percent figures stay', (k) => {
    const x = [101, 99, 104, 98, 100.5];
    const y = [102, 98.5, 106, 99, 100];
    const base = agreement(x, y);
    const big = agreement(
      x.map((v) => v * k),
      y.map((v) => v * k),
    );
    for (const key of ['meanDifference', 'sdDifferences', 'lowerLimitLow', 'upperLimitHigh'] as const) {
      expect(big[key]).toBeRelClose(base[key] * k, 1e-13);
    }
    const pBase = agreement(x, y, 'percent');
    const pBig = agreement(
      x.map((v) => v * k),
      y.map((v) => v * k),
      'percent',
    );
    expect(pBig.upperLimit).toBeRelClose(pBase.upperLimit, 1e-14);
    expect(pBig.sdDifferences).toBeRelClose(pBase.sdDifferences, 1e-14);
  });

  test('if a figure would leave double range, throws #NUM!', () => {
    expect(() => agreement([-1.5e308, 1.5e308, 0], [1.5e308, -1.5e308, 0])).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
});

describe('DATA.AGREEMENT, coverage of the interval of the mean difference', () => {
  // Seed 5202: 10,000 simulated studies of 10 pairs with normal differences (true mean 1, SD 3).
  // The t interval of the mean is exact for normal data, so it covers the true mean in 95 % of
  // studies; simulation SE √(0.95·0.05/10000) = 0.22 %, tolerance ±1 % (4.6 SE).
  test('95 % ± 1 % of 10,000 studies', () => {
    const z = normalDeviates(mulberry32(5202));
    const studies = 10000;
    const n = 10;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    let covered = 0;
    for (let s = 0; s < studies; s++) {
      for (let i = 0; i < n; i++) {
        x[i] = 100 + 10 * z();
        y[i] = x[i] + 1 + 3 * z();
      }
      const r = agreement(x, y);
      if (r.meanDifferenceLow <= 1 && 1 <= r.meanDifferenceHigh) covered++;
    }
    const rate = covered / studies;
    console.log(`agreement: mean-difference interval covered the true mean in ${(100 * rate).toFixed(2)} % of ${studies} studies`);
    expect(Math.abs(rate - 0.95)).toBeLessThanOrEqual(0.01);
  });
});

describe('DATA.AGREEMENT bad input', () => {
  test('if x and y differ in length, throws #VALUE!', () => {
    expect(() => agreement([1, 2, 3], [1, 2])).toThrow(expect.objectContaining({ code: '#VALUE!' }));
  });
  test('if given fewer than 3 pairs, throws #NUM!', () => {
    expect(() => agreement([1, 2], [1, 2])).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => agreement([], [])).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test.each([0, 1, -0.5, 1.5, NaN])('if given confidence %p, throws #NUM!', (c) => {
    expect(() => agreement([1, 2, 3], [1, 2, 4], 'absolute', c)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test('if a value is not finite, throws #NUM! naming it', () => {
    expect(() => agreement([1, NaN, 3], [1, 2, 4])).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('x value 2') }));
    expect(() => agreement([1, 2, 3], [1, 2, Infinity])).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('y value 3') }));
  });
  test('the scale word: any case and spacing, aliases; anything else is #VALUE! naming the words', () => {
    expect(readAgreementScale(' Percent ')).toBe('percent');
    expect(readAgreementScale('%')).toBe('percent');
    expect(readAgreementScale('ABS')).toBe('absolute');
    expect(readAgreementScale('absolute')).toBe('absolute');
    expect(() => readAgreementScale('ratio')).toThrow(
      expect.objectContaining({ code: '#VALUE!', message: expect.stringContaining('"absolute"') }),
    );
  });
});
