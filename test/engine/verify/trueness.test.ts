import tQuantileRef from '@stdlib/stats-base-dists-t-quantile';
import normalQuantileRef from '@stdlib/stats-base-dists-normal-quantile';
import { verifyTrueness } from '../../../src/engine/verify/trueness';
import { oneWayPrecision } from '../../../src/engine/data/precision';
import { LeewayError } from '../../../src/engine/errors';
import { normalDeviates } from '../../../src/engine/demo/random';
import { mulberry32, uniform } from '../../support/prng';
import { anova } from '../data/nist';

function design(k: number, n: number, seed: number, between = 1, within = 2): { values: number[]; groups: number[] } {
  const z = normalDeviates(mulberry32(seed));
  const values: number[] = [];
  const groups: number[] = [];
  for (let g = 0; g < k; g++) {
    const shift = between * z();
    for (let j = 0; j < n; j++) {
      values.push(100 + shift + within * z());
      groups.push(g);
    }
  }
  return { values, groups };
}

const num = (x: number | LeewayError): number => {
  if (typeof x !== 'number') throw new Error(`expected a number, got ${x.code} ${x.message}`);
  return x;
};

describe('VERIFY.TRUENESS', () => {
  // Closed form (the catalogue's identity; common practice for a balanced nested design): with
  // MS_B ≥ MS_W in a balanced design, SE = √(MS_B/N), and SE² = MS_B/N is a single mean square
  // with k − 1 df, so with u_assigned = 0, ν_c = k − 1 and the interval uses t_{0.975}(k − 1)
  // (t from @stdlib/stats-base-dists-t-quantile). Relative 1e-13.
  test('balanced, MS_B ≥ MS_W: SE = √(MS_B/N), df = k − 1, interval assigned ± t(k − 1)·SE', () => {
    const { values, groups } = design(5, 5, 7101, 3, 2);
    const p = oneWayPrecision(values, groups);
    expect(p.msBetween).toBeGreaterThan(p.msWithin);
    const r = verifyTrueness(values, groups, 100, 0);
    const se = Math.sqrt(p.msBetween / 25);
    expect(r.standardError).toBeRelClose(se, 1e-13);
    expect(num(r.df)).toBeRelClose(4, 1e-12);
    const t = tQuantileRef(0.975, 4);
    expect(r.verificationHigh - 100).toBeRelClose(t * se, 1e-12);
    expect(100 - r.verificationLow).toBeRelClose(t * se, 1e-12);
  });

  // The same design on NIST StRD SiRstv (5 × 5, certified MS_B 1.27865654e-2 > MS_W
  // 1.08318280e-2): SE = √(certified MS_B/25), ν_SE = 4; with u_assigned: ν_c = 4·(u_c²/SE²)².
  test('NIST StRD SiRstv: SE from the certified MS_B; ν_c with u_assigned (relative 1e-9)', () => {
    const d = anova('SiRstv');
    const se = Math.sqrt(d.msBetween / 25);
    const ua = 0.02;
    const r = verifyTrueness(d.values, d.groups, 1.34, ua);
    expect(r.standardError).toBeRelClose(se, 1e-9);
    const uc2 = se * se + ua * ua;
    expect(num(r.df)).toBeRelClose((4 * uc2 * uc2) / (se * se * se * se), 1e-9);
    const half = tQuantileRef(0.975, num(r.df)) * Math.sqrt(uc2);
    expect(r.verificationHigh).toBeRelClose(1.34 + half, 1e-9);
  });

  // Hand-checked unbalanced design (common practice, no source): groups {1, 2, 3}, {5, 7}, {10}:
  // N = 6, k = 3, Σnᵢ² = 14, MS_B = 80/3, MS_W = 4/3, n₀ = 11/6, s_b² = 152/11.
  // SE² = s_b²·14/36 + MS_W/6; written as a·MS_B + c·MS_W, a = 14/(36·11/6) = 7/33,
  // c = 1/6 − 7/33 = −1/22; ν_SE = SE⁴/[(a·MS_B)²/2 + (c·MS_W)²/3].
  test('unbalanced design, hand-checked: SE² = (7/33)·MS_B − (1/22)·MS_W and its Satterthwaite df', () => {
    const r = verifyTrueness([1, 2, 3, 5, 7, 10], ['a', 'a', 'a', 'b', 'b', 'c'], 5, 0);
    const A = (7 / 33) * (80 / 3);
    const C = (-1 / 22) * (4 / 3);
    const se2 = A + C;
    expect(se2).toBeRelClose(((152 / 11) * 14) / 36 + 4 / 3 / 6, 1e-14); // both forms agree
    expect(r.standardError).toBeRelClose(Math.sqrt(se2), 1e-14);
    const df = (se2 * se2) / ((A * A) / 2 + (C * C) / 3);
    expect(num(r.df)).toBeRelClose(df, 1e-13);
    expect(r.mean).toBeRelClose(14 / 3, 1e-15);
    expect(r.bias).toBeRelClose(14 / 3 - 5, 1e-14);
    expect(num(r.biasPercent)).toBeRelClose((100 * (14 / 3 - 5)) / 5, 1e-14);
    const half = tQuantileRef(0.975, df) * Math.sqrt(se2);
    expect(r.verificationLow).toBeRelClose(5 - half, 1e-12);
    expect(r.verified).toBe('yes');
  });

  test('between-group variance floored at 0: SE² = s_r²/N with N − k df', () => {
    // Runs identical in mean: MS_B = 0 < MS_W.
    const values = [9, 10, 11, 11, 10, 9, 10, 9, 11];
    const groups = [1, 1, 1, 2, 2, 2, 3, 3, 3];
    const p = oneWayPrecision(values, groups);
    expect(p.betweenVariance).toBe(0);
    const r = verifyTrueness(values, groups, 10.5, 0);
    expect(r.standardError).toBeRelClose(Math.sqrt(p.msWithin / 9), 1e-15);
    expect(num(r.df)).toBe(6);
  });

  test('samples = L uses t at 1 − α/(2L)', () => {
    const { values, groups } = design(5, 5, 7102, 3, 2);
    const r1 = verifyTrueness(values, groups, 100, 0.5, 1);
    const r3 = verifyTrueness(values, groups, 100, 0.5, 3);
    const uc = Math.hypot(r1.standardError, 0.5);
    expect(r3.verificationHigh - 100).toBeRelClose(tQuantileRef(1 - 0.05 / 6, num(r3.df)) * uc, 1e-12);
    expect(r3.verificationHigh).toBeGreaterThan(r1.verificationHigh);
  });

  // Groups {10, 10}, {12, 12}: MS_W = 0, MS_B = 4, n₀ = 2, s_b² = 2, SE² = 2·8/16 = 1, ν = k − 1 = 1,
  // so the half-width is t_{0.975}(1) = tan(0.475π) (Cauchy; from memory, 12.706).
  test('a mean just inside the interval is verified, just outside is not', () => {
    const values = [10, 10, 12, 12];
    const groups = [1, 1, 2, 2];
    const half = Math.tan(0.475 * Math.PI);
    const r = verifyTrueness(values, groups, 11, 0);
    expect(r.standardError).toBe(1);
    expect(r.verificationHigh - 11).toBeRelClose(half, 1e-13);
    expect(verifyTrueness(values, groups, 11 - half * (1 - 1e-9), 0).verified).toBe('yes');
    expect(verifyTrueness(values, groups, 11 - half * (1 + 1e-9), 0).verified).toBe('no');
    expect(verifyTrueness(values, groups, 11 + half * (1 + 1e-9), 0).verified).toBe('no');
  });

  test('assigned = 0: Bias % alone is a #DIV/0! error, every other figure stands', () => {
    const r = verifyTrueness([0.1, -0.1, 0.2, 0], [1, 1, 2, 2], 0, 0.05);
    expect(r.biasPercent).toBeInstanceOf(LeewayError);
    expect((r.biasPercent as LeewayError).code).toBe('#DIV/0!');
    expect(r.bias).toBeCloseTo(0.05, 15);
    expect(Number.isFinite(r.verificationHigh)).toBe(true);
    expect(typeof r.df).toBe('number');
  });

  // All results equal: SE = 0, ν_c infinite. The interval is assigned ± z·u_assigned with the
  // normal quantile (stdlib), the df figure is a #NUM! error; with u_assigned = 0 the interval is
  // the point `assigned`, and a mean on it is verified (the ends are inclusive).
  test('all results equal: normal quantile, the df is a #NUM! error; u_assigned = 0 gives a point interval', () => {
    const values = [5, 5, 5, 5, 5, 5];
    const groups = [1, 1, 2, 2, 3, 3];
    const r = verifyTrueness(values, groups, 5.1, 0.1);
    expect(r.standardError).toBe(0);
    expect(r.verificationHigh - 5.1).toBeRelClose(normalQuantileRef(0.975, 0, 1) * 0.1, 1e-13);
    expect(r.verified).toBe('yes');
    expect((r.df as LeewayError).code).toBe('#NUM!');
    const point = verifyTrueness(values, groups, 5, 0);
    expect(point.verificationLow).toBe(5);
    expect(point.verificationHigh).toBe(5);
    expect(point.verified).toBe('yes');
    expect(verifyTrueness(values, groups, 5.0001, 0).verified).toBe('no');
  });

  test('a standard error negligible beside u_assigned: df beyond double range is a #NUM! error, t is the normal quantile', () => {
    const values = [1, 1 + 1e-14, 1, 1 + 1e-14];
    const groups = [1, 1, 2, 2];
    const r = verifyTrueness(values, groups, 1, 1e70);
    expect((r.df as LeewayError).code).toBe('#NUM!');
    expect(r.verificationHigh - 1).toBeRelClose(normalQuantileRef(0.975, 0, 1) * 1e70, 1e-13);
  });

  // Results, assigned value and u_assigned in a huge or tiny unit (×2^1000, ×2^-1000): every
  // figure in result units scales, df and Bias % do not (relative 1e-14).
  test.each([2 ** 1000, 2 ** -1000])('everything scaled by %p: figures scale, df and Bias % stay', (k) => {
    const { values, groups } = design(4, 3, 7103, 2, 2);
    const base = verifyTrueness(values, groups, 99, 0.7);
    const s = verifyTrueness(
      values.map((v) => v * k),
      groups,
      99 * k,
      0.7 * k,
    );
    expect(s.mean).toBeRelClose(base.mean * k, 1e-14);
    expect(s.standardError).toBeRelClose(base.standardError * k, 1e-14);
    expect(s.verificationLow).toBeRelClose(base.verificationLow * k, 1e-14);
    expect(num(s.df)).toBeRelClose(num(base.df), 1e-14);
    expect(num(s.biasPercent)).toBeRelClose(num(base.biasPercent), 1e-13);
    expect(s.verified).toBe(base.verified);
  });
});

describe('VERIFY.TRUENESS false "no" rate (seeded simulation)', () => {
  // Seed 7201: 10,000 studies of 5 runs × 5 replicates, true mean = assigned = 100, u_assigned = 0,
  // between-run SD 4 and repeatability SD 3. When MS_B ≥ MS_W (nearly always here) the
  // studentised mean (x̄ − μ)/√(MS_B/N) is exactly t(k − 1) and ν_SE = k − 1, so the verdict is
  // "no" in α = 5 % of studies. Simulation SE 0.22 %; tolerance ±1 % (4.6 SE).
  // Measured while writing the test: 5.0 % (40,000 studies).
  test('with the true value assigned, "no" in 5 % ± 1 % of 10,000 studies', () => {
    const z = normalDeviates(mulberry32(7201));
    const studies = 10000;
    const values = new Float64Array(25);
    const groups = new Int32Array(25);
    for (let i = 0; i < 25; i++) groups[i] = Math.floor(i / 5);
    let no = 0;
    for (let s = 0; s < studies; s++) {
      for (let run = 0; run < 5; run++) {
        const shift = 4 * z();
        for (let j = 0; j < 5; j++) values[run * 5 + j] = 100 + shift + 3 * z();
      }
      if (verifyTrueness(values, groups, 100, 0).verified === 'no') no++;
    }
    const rate = no / studies;
    console.log(`verify trueness: "no" with the true value assigned in ${(100 * rate).toFixed(2)} % of ${studies} studies`);
    expect(Math.abs(rate - 0.05)).toBeLessThanOrEqual(0.01);
  });
});

describe('VERIFY.TRUENESS bad input', () => {
  const { values, groups } = design(3, 3, 7300);
  test('if u_assigned is negative, throws #NUM!', () => {
    expect(() => verifyTrueness(values, groups, 100, -1)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('u_assigned') }));
  });
  test.each([NaN, Infinity])('if assigned is %p, throws #NUM!', (a) => {
    expect(() => verifyTrueness(values, groups, a, 1)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('assigned') }));
  });
  test.each([0, 2.5, -3])('if samples is %p, throws #NUM!', (L) => {
    expect(() => verifyTrueness(values, groups, 100, 1, L)).toThrow(expect.objectContaining({ code: '#NUM!', message: expect.stringContaining('samples') }));
  });
  test('if all results come from one group, throws #NUM!', () => {
    expect(() => verifyTrueness([1, 2, 3], [1, 1, 1], 2, 0)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test('if values and groups differ in length, throws #VALUE!', () => {
    expect(() => verifyTrueness([1, 2, 3], [1, 2], 2, 0)).toThrow(expect.objectContaining({ code: '#VALUE!' }));
  });
  // Seed 7301: random designs and inputs: every number finite, a verdict, errors only where named.
  test('random designs give finite figures and a verdict', () => {
    const rand = mulberry32(7301);
    for (let t = 0; t < 200; t++) {
      const k = 2 + Math.floor(rand() * 6);
      const vs: number[] = [];
      const gs: number[] = [];
      for (let g = 0; g < k; g++) {
        const n = 1 + Math.floor(rand() * 5);
        for (let j = 0; j < n; j++) {
          vs.push(uniform(rand, -5, 5));
          gs.push(g);
        }
      }
      if (vs.length === k) continue;
      const r = verifyTrueness(vs, gs, uniform(rand, -3, 3), rand() < 0.3 ? 0 : uniform(rand, 0, 2), 1 + Math.floor(rand() * 4));
      for (const x of Object.values(r)) if (typeof x === 'number') expect(Number.isFinite(x)).toBe(true);
      expect(['yes', 'no']).toContain(r.verified);
      expect(r.verificationLow).toBeLessThanOrEqual(r.verificationHigh);
    }
  });
});
