import Decimal from 'decimal.js';
import { oneWayPrecision } from '../../../src/engine/data/precision';
import { lre, mulberry32, uniform } from '../../support/prng';
import { anova, lreRow } from './nist';

// NIST StRD one-way ANOVA (test/fixtures/nist-strd). Repeatability SD = certified residual SD;
// the between-group SD is derived from the certified mean squares, √((MS_between − MS_within)/n),
// n = replicates per group (balanced designs), so it is not itself certified.
const FILES: Array<[string, string, number]> = [
  ['SiRstv', 'lower', 9],
  ['SmLs01', 'lower', 9],
  ['SmLs02', 'lower', 9],
  ['SmLs03', 'lower', 9],
  ['AtmWtAg', 'average', 9],
  ['SmLs04', 'average', 9],
  ['SmLs05', 'average', 9],
  ['SmLs06', 'average', 9],
  // SmLs07–09 (higher difficulty): 13 constant leading digits (1000000000000.4, …) leave only
  // 4–5 significant digits of each deviation once the value is a double, which is what Excel
  // hands a function; no algorithm can recover more, so 3.5 digits is required here.
  ['SmLs07', 'higher', 3.5],
  ['SmLs08', 'higher', 3.5],
  ['SmLs09', 'higher', 3.5],
];

describe('DATA.PRECISION against the NIST StRD ANOVA data sets', () => {
  const table: string[] = [];
  afterAll(() => {
    console.log(['LRE, NIST StRD one-way ANOVA (repeatability SD; between-group SD derived from certified MS):', ...table].join('\n'));
  });

  test.each(FILES)('NIST StRD %s (%s difficulty): repeatability and between-group SD to the required digits', (file, _l, required) => {
    const d = anova(file);
    const p = oneWayPrecision(d.values, d.groups);
    const k = d.dfBetween + 1;
    const N = d.dfWithin + k;
    expect(p.groups).toBe(k);
    expect(p.results).toBe(N);
    expect(p.n0).toBe(N / k);
    const sbCert = Math.sqrt((d.msBetween - d.msWithin) / (N / k));
    const rows: Array<[string, number, number]> = [
      ['repeatability SD', p.repeatabilitySd, d.residualSd],
      ['between-group SD', p.betweenSd, sbCert],
      ['MS within', p.msWithin, d.msWithin],
      ['MS between', p.msBetween, d.msBetween],
    ];
    for (const [q, got, cert] of rows) {
      const digits = lre(got, cert);
      table.push(lreRow(file, q, got, cert, digits, required));
      expect(digits).toBeGreaterThanOrEqual(required);
    }
    {
      // What the doubles themselves carry: the exact ANOVA of the same doubles (120-digit
      // decimal.js) is matched to at least 12 digits, so any shortfall above is the data's
      // (decimal values such as 1000000.4 are not exact in binary).
      const exact = decimalReference(d.values, d.groups);
      const dr = lre(p.repeatabilitySd, exact.sr);
      const db = lre(p.betweenSd, exact.sb);
      table.push(lreRow(file, 'sr vs exact(dbl)', p.repeatabilitySd, exact.sr, dr, 12));
      table.push(lreRow(file, 'sb vs exact(dbl)', p.betweenSd, exact.sb, db, 12));
      expect(dr).toBeGreaterThanOrEqual(12);
      expect(db).toBeGreaterThanOrEqual(12);
    }
  });
});

/**
 * The textbook ANOVA in 120-digit decimal arithmetic (decimal.js), as an independent reference,
 * on the exact binary values of the doubles (toPrecision(100) spells a double out exactly).
 */
function decimalReference(values: number[], groups: number[]): { sr: number; sb: number; n0: number } {
  const D = Decimal.clone({ precision: 120 });
  const by = new Map<number, Decimal[]>();
  values.forEach((v, i) => {
    const list = by.get(groups[i]) ?? [];
    list.push(new D(v.toPrecision(100)));
    by.set(groups[i], list);
  });
  const N = values.length;
  const k = by.size;
  const all = values.map((v) => new D(v.toPrecision(100)));
  const grand = all.reduce((a, b) => a.plus(b), new D(0)).div(N);
  let ssw = new D(0);
  let ssb = new D(0);
  let sumSq = new D(0);
  for (const list of by.values()) {
    const m = list.reduce((a, b) => a.plus(b), new D(0)).div(list.length);
    for (const v of list) ssw = ssw.plus(v.minus(m).pow(2));
    ssb = ssb.plus(m.minus(grand).pow(2).times(list.length));
    sumSq = sumSq.plus(list.length * list.length);
  }
  const msw = ssw.div(N - k);
  const msb = ssb.div(k - 1);
  const n0 = new D(N).minus(sumSq.div(N)).div(k - 1);
  const vb = Decimal.max(0, msb.minus(msw).div(n0));
  return { sr: msw.sqrt().toNumber(), sb: vb.sqrt().toNumber(), n0: n0.toNumber() };
}

describe('DATA.PRECISION, unbalanced designs', () => {
  // Common practice, no source (hand-checkable): groups {1, 2, 3}, {5, 7}, {10}:
  // N = 6, k = 3, SS_within = 2 + 2 = 4, MS_within = 4/3; grand mean 14/3;
  // SS_between = 3·(2 − 14/3)² + 2·(6 − 14/3)² + (10 − 14/3)² = 480/9; MS_between = 80/3;
  // n₀ = (6 − 14/6)/2 = 11/6; between variance (80/3 − 4/3)/(11/6) = 152/11.
  test('a group with one result counts in k, N and n₀ (hand-checked)', () => {
    const p = oneWayPrecision([1, 2, 3, 5, 7, 10], ['a', 'a', 'a', 'b', 'b', 'c']);
    expect(p.groups).toBe(3);
    expect(p.results).toBe(6);
    expect(Math.abs(p.n0 - 11 / 6)).toBeLessThanOrEqual(1e-15);
    expect(Math.abs(p.msWithin - 4 / 3)).toBeLessThanOrEqual(1e-15);
    expect(Math.abs(p.msBetween - 80 / 3)).toBeLessThanOrEqual(1e-13);
    expect(Math.abs(p.betweenSd - Math.sqrt(152 / 11))).toBeLessThanOrEqual(1e-14);
    expect(Math.abs(p.mean - 14 / 3)).toBeLessThanOrEqual(1e-15);
  });

  // Seed 3101: random unbalanced designs (1–8 results in 2–12 groups) around offsets up to 1e6,
  // against the decimal.js reference: 9 digits at least.
  test('random unbalanced designs agree with a 120-digit decimal reference', () => {
    const rand = mulberry32(3101);
    for (let t = 0; t < 300; t++) {
      const k = 2 + Math.floor(rand() * 11);
      const offset = uniform(rand, -1e6, 1e6);
      const values: number[] = [];
      const groups: number[] = [];
      for (let g = 0; g < k; g++) {
        const n = 1 + Math.floor(rand() * 8);
        const shift = uniform(rand, -1, 1);
        for (let j = 0; j < n; j++) {
          values.push(offset + shift + uniform(rand, -1, 1));
          groups.push(g);
        }
      }
      if (values.length === k) continue;
      const p = oneWayPrecision(values, groups);
      const r = decimalReference(values, groups);
      expect(lre(p.repeatabilitySd, r.sr)).toBeGreaterThanOrEqual(9);
      expect(lre(p.n0, r.n0)).toBeGreaterThanOrEqual(14);
      if (r.sb > 1e-3 * r.sr) expect(lre(p.betweenSd, r.sb)).toBeGreaterThanOrEqual(7);
      else expect(p.betweenSd).toBeLessThanOrEqual(1e-3 * r.sr + 1e-9);
    }
  });

  // Seed 3102: components are never negative, within-lab SD ≥ repeatability SD, and
  // within-lab² = repeatability² + between² (ISO 5725-2 model).
  test('properties: non-negative components, within-lab ≥ repeatability', () => {
    const rand = mulberry32(3102);
    let floored = 0;
    for (let t = 0; t < 1000; t++) {
      const k = 2 + Math.floor(rand() * 6);
      const values: number[] = [];
      const groups: string[] = [];
      const spread = rand() < 0.5 ? 0 : uniform(rand, 0, 3);
      for (let g = 0; g < k; g++) {
        const n = 1 + Math.floor(rand() * 5);
        const run = uniform(rand, -spread, spread);
        for (let j = 0; j < n; j++) {
          values.push(100 + run + uniform(rand, -1, 1));
          groups.push(`run ${g}`);
        }
      }
      if (values.length === k) continue;
      const p = oneWayPrecision(values, groups);
      expect(p.repeatabilitySd).toBeGreaterThanOrEqual(0);
      expect(p.betweenSd).toBeGreaterThanOrEqual(0);
      expect(p.withinLabSd).toBeGreaterThanOrEqual(p.repeatabilitySd);
      const sum = p.repeatabilitySd ** 2 + p.betweenSd ** 2;
      expect(Math.abs(p.withinLabSd ** 2 - sum)).toBeLessThanOrEqual(1e-12 * sum);
      if (p.msBetween < p.msWithin) {
        floored++;
        expect(p.betweenSd).toBe(0);
        expect(p.withinLabSd).toBe(p.repeatabilitySd);
      }
    }
    expect(floored).toBeGreaterThan(50); // the floor at 0 was exercised
  });
});

describe('DATA.PRECISION bad input', () => {
  test('if given fewer than 2 results, throws #NUM!', () => {
    expect(() => oneWayPrecision([1], ['a'])).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test('if given fewer than 2 groups, throws #NUM!', () => {
    expect(() => oneWayPrecision([1, 2, 3], ['a', 'a', 'a'])).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test('if every group has one result, throws #NUM!', () => {
    expect(() => oneWayPrecision([1, 2, 3], ['a', 'b', 'c'])).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test('if values and groups differ in length, throws #VALUE!', () => {
    expect(() => oneWayPrecision([1, 2, 3], ['a', 'b'])).toThrow(expect.objectContaining({ code: '#VALUE!' }));
  });
});

describe('DATA.PRECISION degrees of freedom (repeatability N − k, within-lab by Satterthwaite)', () => {
  // NIST StRD one-way ANOVA files: the certified between and within mean squares and their df
  // (file headers). The expected within-lab df is computed here from those certified values by
  // Satterthwaite's formula (Satterthwaite FE, Biometrics Bulletin 1946;2:110–4) for
  // s_WL² = MS_B/n₀ + (1 − 1/n₀)·MS_W, n₀ = N/k in these balanced designs, written out
  // independently of the engine (plain squares, no shares). The engine computes it from the raw
  // data. Tolerance: relative 1e-8 where the engine's mean squares carry ≥ 9 digits (lower and
  // average difficulty), 1e-3 for SmLs07–09, whose doubles carry only 3.5–4.5 digits of each
  // deviation (see the LRE table above).
  test.each(FILES)('NIST StRD %s (%s difficulty): ν_WL from the certified mean squares', (file, _l, required) => {
    const d = anova(file);
    const p = oneWayPrecision(d.values, d.groups);
    const k = d.dfBetween + 1;
    const N = d.dfWithin + k;
    const n0 = N / k;
    const between = d.msBetween / n0;
    const within = (1 - 1 / n0) * d.msWithin;
    const expected = (between + within) ** 2 / (between ** 2 / d.dfBetween + within ** 2 / d.dfWithin);
    expect(d.msBetween).toBeGreaterThan(d.msWithin); // every file has a positive between-group component
    const tol = required >= 9 ? 1e-8 : 1e-3;
    expect(p.withinLabDf).toBeRelClose(expected, tol);
    expect(p.repeatabilityDf).toBe(d.dfWithin);
    expect(p.sumSquaredCounts).toBe(k * n0 * n0);
    // ν_WL lies between the smaller df and their sum (Satterthwaite, positive terms).
    expect(p.withinLabDf).toBeGreaterThanOrEqual(Math.min(d.dfBetween, d.dfWithin) * (1 - 1e-12));
    expect(p.withinLabDf).toBeLessThanOrEqual((d.dfBetween + d.dfWithin) * (1 + 1e-12));
  });

  // Hand-checked (common practice, no source): the unbalanced example above, groups {1, 2, 3},
  // {5, 7}, {10}: MS_B = 80/3, MS_W = 4/3, n₀ = 11/6, k − 1 = 2, N − k = 3.
  // s_WL² = (80/3)/(11/6) + (5/11)·(4/3) = 160/11 + 20/33 = 500/33;
  // ν_WL = (500/33)² / [ (160/11)²/2 + (20/33)²/3 ] = 250000/1089 / (12800/121 + 400/3267)
  //      = 250000 / (115200 + 400/3) = 750000/346000 = 375/173.
  test('hand-checked unbalanced design: ν_WL = 375/173, ν_r = 3', () => {
    const p = oneWayPrecision([1, 2, 3, 5, 7, 10], ['a', 'a', 'a', 'b', 'b', 'c']);
    expect(p.withinLabDf).toBeRelClose(375 / 173, 1e-14);
    expect(p.repeatabilityDf).toBe(3);
    expect(p.sumSquaredCounts).toBe(14);
    expect(p.betweenVariance).toBeRelClose(152 / 11, 1e-14);
  });

  // Seed 3103: s_WL² = MS_B/n₀ + (1 − 1/n₀)·MS_W equals s_r² + s_b² (the within-lab SD) whenever
  // s_b² > 0, and ν_WL = N − k when the between-group variance is floored at 0.
  test('identity s_WL² = MS_B/n₀ + (1 − 1/n₀)·MS_W; the floored case gives N − k', () => {
    const rand = mulberry32(3103);
    let floored = 0;
    let positive = 0;
    for (let t = 0; t < 1000; t++) {
      const k = 2 + Math.floor(rand() * 6);
      const values: number[] = [];
      const groups: number[] = [];
      const spread = rand() < 0.4 ? 0 : uniform(rand, 0, 3);
      for (let g = 0; g < k; g++) {
        const n = 1 + Math.floor(rand() * 5);
        const run = uniform(rand, -spread, spread);
        for (let j = 0; j < n; j++) {
          values.push(50 + run + uniform(rand, -1, 1));
          groups.push(g);
        }
      }
      if (values.length === k) continue;
      const p = oneWayPrecision(values, groups);
      const N = values.length;
      expect(p.repeatabilityDf).toBe(N - k);
      if (p.betweenVariance > 0) {
        positive++;
        const sum = p.msBetween / p.n0 + (1 - 1 / p.n0) * p.msWithin;
        expect(p.withinLabSd ** 2).toBeRelClose(sum, 1e-12);
        expect(p.withinLabDf).toBeGreaterThanOrEqual(Math.min(k - 1, N - k) * (1 - 1e-12));
        expect(p.withinLabDf).toBeLessThanOrEqual((N - 1) * (1 + 1e-12));
      } else {
        floored++;
        expect(p.withinLabDf).toBe(N - k);
      }
    }
    expect(floored).toBeGreaterThan(50);
    expect(positive).toBeGreaterThan(50);
  });
});
