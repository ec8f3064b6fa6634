import * as fs from 'fs';
import * as path from 'path';
import tQuantileRef from '@stdlib/stats-base-dists-t-quantile';
import {
  LineFit,
  biasAtLevel,
  compareMethods,
  deming,
  ordinaryLeastSquares,
  passingBablok,
  readCompareMethod,
} from '../../../src/engine/data/compare';
import { lre, mulberry32, uniform } from '../../support/prng';
import { lreRow, straightLine } from './nist';

const FIX = path.join(__dirname, '..', '..', 'fixtures', 'method-comparison');

function csv(name: string): Record<string, number[]> {
  const [head, ...rows] = fs.readFileSync(path.join(FIX, name), 'utf8').trim().split(/\r?\n/);
  const cols = head.split(',');
  const out: Record<string, number[]> = {};
  cols.forEach((c) => (out[c] = []));
  for (const r of rows) r.split(',').forEach((v, i) => out[cols[i]].push(Number(v)));
  return out;
}

const close = (a: number, b: number, rel: number): void => {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b));
};

describe('Passing–Bablok against published examples', () => {
  // Sen PK, JASA 1968;63:1379–89, as checked in the R package `deming` (tests/pbtest.R), per
  // test/fixtures/method-comparison/README.md: monotone data, so Passing–Bablok = Theil–Sen: slope 4, intercept 6,
  // 93 % slope interval (26/7, 35/8).
  test('Sen (1968): slope 4, intercept 6, 93 % interval 26/7 to 35/8', () => {
    const d = csv('sen1968_theil_sen.csv');
    const f = passingBablok(d.t, d.y, 0.93);
    close(f.slope, 4, 1e-15);
    close(f.intercept, 6, 1e-15);
    close(f.slopeLow as number, 26 / 7, 1e-15);
    close(f.slopeHigh as number, 35 / 8, 1e-15);
  });

  // R package `deming`, tests/pbtest.R, per test/fixtures/method-comparison/README.md: x = 1..6,
  // y = 2, 1.2, 4.1, 3.5, 6.3, 3 → slope 1.05, intercept 0.125 (15 slopes, one below −1, so
  // the median is shifted by K = 1).
  test('six-point example: slope 1.05, intercept 0.125 (shifted median, K = 1)', () => {
    const d = csv('deming_pkg_pdata.csv');
    const f = passingBablok(d.x, d.y);
    close(f.slope, 1.05, 1e-14);
    close(f.intercept, 0.125, 1e-12);
  });
});

describe('OLS against NIST StRD Norris and Ripley & Thompson (1987)', () => {
  // NIST StRD Norris (lower difficulty): certified B0, B1; ≥ 9 digits required.
  test('NIST StRD Norris: slope and intercept to 9 digits or more', () => {
    const d = straightLine('Norris');
    const f = ordinaryLeastSquares(d.x, d.y);
    const rows = [
      lreRow('Norris', 'slope B1', f.slope, d.b1, lre(f.slope, d.b1), 9),
      lreRow('Norris', 'intercept B0', f.intercept, d.b0, lre(f.intercept, d.b0), 9),
    ];
    console.log(['LRE, NIST StRD Norris (OLS):', ...rows].join('\n'));
    expect(lre(f.slope, d.b1)).toBeGreaterThanOrEqual(9);
    expect(lre(f.intercept, d.b0)).toBeGreaterThanOrEqual(9);
  });

  // NIST StRD Norris: certified SDs of the estimates (0.232818234301152 and
  // 0.429796848199937E-03); our t interval is estimate ± t(0.975, 34)·SD, t from stdlib.
  test('NIST StRD Norris: the t intervals are built on the certified standard errors', () => {
    const d = straightLine('Norris');
    const f = ordinaryLeastSquares(d.x, d.y);
    const t = tQuantileRef(0.975, 34);
    expect(lre(((f.slopeHigh as number) - (f.slopeLow as number)) / (2 * t), 0.429796848199937e-3)).toBeGreaterThanOrEqual(9);
    expect(lre(((f.interceptHigh as number) - (f.interceptLow as number)) / (2 * t), 0.232818234301152)).toBeGreaterThanOrEqual(9);
  });

  // Ripley BD, Thompson M. Analyst 1987;112:377–83, as checked in R `deming` tests/atest.R,
  // per test/fixtures/method-comparison/README.md (3 decimals): aes on aas 0.544 + 0.845·x; aas on aes −0.299 + 1.089·x.
  test('Ripley & Thompson arsenate data: OLS both ways to 3 decimals', () => {
    const d = csv('arsenate_ripley_thompson_1987.csv');
    const a = ordinaryLeastSquares(d.aas, d.aes);
    expect(Math.abs(a.intercept - 0.544)).toBeLessThan(0.0005);
    expect(Math.abs(a.slope - 0.845)).toBeLessThan(0.0005);
    const b = ordinaryLeastSquares(d.aes, d.aas);
    expect(Math.abs(b.intercept - -0.299)).toBeLessThan(0.0005);
    expect(Math.abs(b.slope - 1.089)).toBeLessThan(0.0005);
  });
});

/** Deming by the textbook formula and a plain leave-one-out loop, as an independent check. */
function naiveDeming(x: number[], y: number[], ratio: number, conf: number): number[] {
  const fit = (xs: number[], ys: number[]): [number, number] => {
    const n = xs.length;
    const mx = xs.reduce((a, b) => a + b, 0) / n;
    const my = ys.reduce((a, b) => a + b, 0) / n;
    let u = 0;
    let q = 0;
    let p = 0;
    for (let i = 0; i < n; i++) {
      u += (xs[i] - mx) ** 2;
      q += (ys[i] - my) ** 2;
      p += (xs[i] - mx) * (ys[i] - my);
    }
    // Linnet's form with λ = var(x error)/var(y error) = 1/ratio.
    const lam = 1 / ratio;
    const b = (lam * q - u + Math.sqrt((u - lam * q) ** 2 + 4 * lam * p * p)) / (2 * lam * p);
    return [b, my - b * mx];
  };
  const [b, a] = fit(x, y);
  const n = x.length;
  const pb: number[] = [];
  const pa: number[] = [];
  for (let i = 0; i < n; i++) {
    const [bi, ai] = fit(x.filter((_, j) => j !== i), y.filter((_, j) => j !== i));
    pb.push(n * b - (n - 1) * bi); // pseudo-values
    pa.push(n * a - (n - 1) * ai);
  }
  const se = (v: number[]): number => {
    const m = v.reduce((s, z) => s + z, 0) / n;
    return Math.sqrt(v.reduce((s, z) => s + (z - m) ** 2, 0) / (n - 1) / n);
  };
  const t = tQuantileRef((1 + conf) / 2, n - 2);
  return [b, b - t * se(pb), b + t * se(pb), a, a - t * se(pa), a + t * se(pa)];
}

const asRow = (f: LineFit): number[] => [
  f.slope,
  f.slopeLow as number,
  f.slopeHigh as number,
  f.intercept,
  f.interceptLow as number,
  f.interceptHigh as number,
];

/** Seeded method-comparison data: y = a + b·x with errors in both, x over 1–100. */
function sample(rand: () => number, n: number, a = 0.5, b = 1.03, sx = 1, sy = 1): { x: number[]; y: number[] } {
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    const t = uniform(rand, 1, 100);
    const g = (): number => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    x.push(t + sx * g());
    y.push(a + b * t + sy * g());
  }
  return { x, y };
}

describe('Deming regression with jackknife intervals (Linnet 1990, 1993)', () => {
  // Seed 3301: our downdated jackknife against a plain leave-one-out loop on pseudo-values
  // (the form Linnet describes), t quantile from stdlib: 1e-9 relative.
  test('jackknife intervals equal a plain pseudo-value computation', () => {
    const rand = mulberry32(3301);
    for (let k = 0; k < 40; k++) {
      const n = 5 + Math.floor(rand() * 60);
      const ratio = [1, 0.25, 4, 2.5][k % 4];
      const { x, y } = sample(rand, n, uniform(rand, -2, 2), uniform(rand, 0.8, 1.2), 1, Math.sqrt(ratio));
      const ours = asRow(deming(x, y, ratio));
      const ref = naiveDeming(x, y, ratio, 0.95);
      ours.forEach((v, i) => expect(Math.abs(v - ref[i])).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(ref[i]))));
    }
  });

  // Seed 3302: swapping x and y turns a ratio-1 Deming slope into exactly its reciprocal
  // (common practice, no source: the orthogonal line is symmetric in x and y), and ratio r into 1/r.
  test('property: swapping x and y gives the reciprocal slope', () => {
    const rand = mulberry32(3302);
    for (let k = 0; k < 300; k++) {
      const { x, y } = sample(rand, 3 + Math.floor(rand() * 50), uniform(rand, -5, 5), uniform(rand, 0.2, 5));
      const f = deming(x, y, 1);
      const g = deming(y, x, 1);
      expect(Math.abs(f.slope * g.slope - 1)).toBeLessThanOrEqual(1e-12);
      const r = uniform(rand, 0.1, 10);
      expect(Math.abs(deming(x, y, r).slope * deming(y, x, 1 / r).slope - 1)).toBeLessThanOrEqual(1e-12);
    }
  });

  // Common practice, no source: as the ratio grows (x error-free), Deming tends to OLS of y on x.
  test('a very large ratio gives the OLS slope', () => {
    const { x, y } = sample(mulberry32(3303), 40);
    close(deming(x, y, 1e12).slope, ordinaryLeastSquares(x, y).slope, 1e-9);
  });

  test('if the ratio is not positive, throws #NUM!', () => {
    expect(() => deming([1, 2, 3], [1, 2, 4], 0)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => deming([1, 2, 3], [1, 2, 4], -1)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });

  test('if a leave-one-out subset has all-equal x, the interval is not given (null, with a note)', () => {
    const f = deming([1, 1, 2], [1, 2, 3]);
    expect(Number.isFinite(f.slope)).toBe(true);
    expect(f.slopeLow).toBeNull();
    expect(f.intervalNote).toMatch(/leave|leaving/i);
  });
});

describe('properties of all three estimators (seeded)', () => {
  const methods = ['passing-bablok', 'deming', 'ols'] as const;

  // Seed 3401: intervals contain the estimate; adding a constant to y moves only the intercept
  // (common practice, no source: all three are shift-equivariant).
  test('intervals contain the estimate; a constant added to y shifts only the intercept', () => {
    const rand = mulberry32(3401);
    for (let k = 0; k < 150; k++) {
      const n = 10 + Math.floor(rand() * 60); // Passing–Bablok's rank interval needs more than a handful
      const { x, y } = sample(rand, n, uniform(rand, -3, 3), uniform(rand, 0.7, 1.4), uniform(rand, 0.1, 3), uniform(rand, 0.1, 3));
      const c = uniform(rand, -50, 50);
      const y2 = y.map((v) => v + c);
      for (const m of methods) {
        const f = compareMethods(x, y, m);
        expect(f.slopeLow as number).toBeLessThanOrEqual(f.slope);
        expect(f.slopeHigh as number).toBeGreaterThanOrEqual(f.slope);
        expect(f.interceptLow as number).toBeLessThanOrEqual(f.intercept);
        expect(f.interceptHigh as number).toBeGreaterThanOrEqual(f.intercept);
        const g = compareMethods(x, y2, m);
        expect(Math.abs(g.slope - f.slope)).toBeLessThanOrEqual(1e-9 * Math.abs(f.slope));
        expect(Math.abs(g.intercept - f.intercept - c)).toBeLessThanOrEqual(1e-9 * (Math.abs(c) + Math.abs(f.intercept) + 1));
      }
    }
  });

  // Seed 3402: Passing–Bablok is not exactly symmetric (the −1 exclusion and the shift K are
  // not), but swapping x and y gives nearly the reciprocal slope: within the swapped fit's
  // interval (Passing & Bablok 1983 designed the estimator to be nearly so).
  test('Passing–Bablok: swapping x and y gives nearly the reciprocal slope, within its interval', () => {
    const rand = mulberry32(3402);
    for (let k = 0; k < 200; k++) {
      const { x, y } = sample(rand, 10 + Math.floor(rand() * 80), uniform(rand, -3, 3), uniform(rand, 0.7, 1.4));
      const f = passingBablok(x, y);
      const g = passingBablok(y, x);
      expect(1 / f.slope).toBeGreaterThanOrEqual(g.slopeLow as number);
      expect(1 / f.slope).toBeLessThanOrEqual(g.slopeHigh as number);
      expect(Math.abs(f.slope * g.slope - 1)).toBeLessThan(0.05);
    }
  });

  // Seed 3403: the rows' order does not matter (ties included).
  test('Passing–Bablok: the result does not depend on the order of the rows, ties included', () => {
    const rand = mulberry32(3403);
    for (let k = 0; k < 50; k++) {
      const n = 6 + Math.floor(rand() * 30);
      const x = Array.from({ length: n }, () => Math.round(uniform(rand, 1, 10)));
      const y = x.map((v) => Math.round(v * 1.1 + uniform(rand, -2, 2)));
      const order = x.map((_, i) => i).sort(() => rand() - 0.5);
      const f = passingBablok(x, y);
      const g = passingBablok(order.map((i) => x[i]), order.map((i) => y[i]));
      expect(asRow(g)).toEqual(asRow(f));
    }
  });
});

describe('Passing–Bablok ties and special slopes (Passing & Bablok 1983)', () => {
  // Common practice, no source: hand-countable cases.
  test('identical points give no slope; equal x gives +∞; a slope of exactly −1 is left out', () => {
    // Points (1,1), (1,1), (2,2), (3,3): slopes 1 (four times) and +∞ for none — the two
    // identical points add nothing, so the line is y = x.
    const f = passingBablok([1, 1, 2, 3], [1, 1, 2, 3]);
    expect(f.slope).toBe(1);
    expect(f.intercept).toBe(0);
    // (0,0), (1,1), (2,2), (3,1): slopes 1, 1, 1/3, 1, 0.5, −1 (left out) → N = 5, K = 0,
    // median of {1/3, 0.5, 1, 1, 1} = 1.
    expect(passingBablok([0, 1, 2, 3], [0, 1, 2, 1]).slope).toBe(1);
    // (1,1), (1,3), (2,2), (3,3): slopes +∞, 1, 1, −1 (left out), 0, 1 → {0, 1, 1, 1, +∞}, median 1.
    expect(passingBablok([1, 1, 2, 3], [1, 3, 2, 3]).slope).toBe(1);
  });

  test('with too few pairs for the rank interval, the interval is null with a note', () => {
    const f = passingBablok([1, 2, 3, 4], [1.1, 2.3, 2.9, 4.2]);
    expect(f.slopeLow).toBeNull();
    expect(f.intervalNote).toMatch(/too few pairs/);
  });

  test('if most slopes are below −1, throws #NUM! (the methods must relate positively)', () => {
    expect(() => passingBablok([1, 2, 3, 4, 5], [10, 8, 6, 4, 2])).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
});

describe('shared rules of DATA.COMPARE', () => {
  test('if given fewer than 3 pairs, throws #NUM!', () => {
    for (const m of ['passing-bablok', 'deming', 'ols'] as const) {
      expect(() => compareMethods([1, 2], [1, 2], m)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    }
  });
  test('if all x are equal, throws #DIV/0!', () => {
    for (const m of ['passing-bablok', 'deming', 'ols'] as const) {
      expect(() => compareMethods([2, 2, 2, 2], [1, 2, 3, 4], m)).toThrow(expect.objectContaining({ code: '#DIV/0!' }));
    }
  });
  test('if x and y differ in length, throws #VALUE!', () => {
    expect(() => compareMethods([1, 2, 3], [1, 2], 'ols')).toThrow(expect.objectContaining({ code: '#VALUE!' }));
  });
  test('method words: any case, aliases, unknown → #VALUE!', () => {
    expect(readCompareMethod(' Passing-Bablok ')).toBe('passing-bablok');
    expect(readCompareMethod('PB')).toBe('passing-bablok');
    expect(readCompareMethod('passing_bablok')).toBe('passing-bablok');
    expect(readCompareMethod('DEMING')).toBe('deming');
    expect(readCompareMethod('Ols')).toBe('ols');
    expect(() => readCompareMethod('theil')).toThrow(expect.objectContaining({ code: '#VALUE!' }));
  });
  // Common practice, no source: bias of y against x at X is a + (b − 1)·X.
  test('bias at a level: intercept + (slope − 1)·level, and in percent of the level', () => {
    const b = biasAtLevel({ slope: 1.05, intercept: 0.125 }, 10);
    close(b.units, 0.625, 1e-14);
    close(b.percent as number, 6.25, 1e-14);
    expect(biasAtLevel({ slope: 1.05, intercept: 0.125 }, 0)).toEqual({ units: 0.125, percent: null });
    expect(() => biasAtLevel({ slope: 1, intercept: 0 }, -1)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
});
