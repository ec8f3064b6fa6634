/**
 * Timings of the two heavy computations, printed (not asserted: a slow machine must not fail the
 * suite), with checks that the timed runs compute the right thing.
 * Passing–Bablok on 1,000 pairs (499,500 slopes) should take well under 500 ms; the one-way
 * ANOVA of NIST StRD SmLs03 (18,009 results) milliseconds.
 */
import { performance } from 'perf_hooks';
import { passingBablok } from '../../../src/engine/data/compare';
import { oneWayPrecision } from '../../../src/engine/data/precision';
import { evaluate } from '../../../src/registry';
import { mulberry32, uniform } from '../../support/prng';
import { anova } from './nist';

function time(fn: () => void, runs = 5): { median: number; min: number; max: number } {
  fn(); // warm-up
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const a = performance.now();
    fn();
    t.push(performance.now() - a);
  }
  t.sort((p, q) => p - q);
  return { median: t[runs >> 1], min: t[0], max: t[runs - 1] };
}

const fmt = (r: { median: number; min: number; max: number }): string =>
  `median ${r.median.toFixed(1)} ms (min ${r.min.toFixed(1)}, max ${r.max.toFixed(1)})`;

/** The same estimator written plainly (an Array of slopes, comparator sort), for checking. */
function plainSlope(x: number[], y: number[]): number {
  const s: number[] = [];
  for (let i = 0; i < x.length; i++) {
    for (let j = i + 1; j < x.length; j++) {
      const a = x[i] <= x[j] ? i : j;
      const b = a === i ? j : i;
      const dx = x[b] - x[a];
      const dy = y[b] - y[a];
      if (dx === 0 && dy === 0) continue;
      if (dx === 0) {
        s.push(Infinity);
        continue;
      }
      if (dy === -dx) continue;
      s.push(dy / dx);
    }
  }
  s.sort((p, q) => p - q);
  const K = s.filter((v) => v < -1).length;
  const N = s.length;
  return N % 2 ? s[(N + 1) / 2 + K - 1] : 0.5 * (s[N / 2 + K - 1] + s[N / 2 + K]);
}

describe('performance (printed, not asserted)', () => {
  test('Passing–Bablok on 1,000 pairs: time it, and it equals the plainly written estimator', () => {
    // Seed 3601: y = 1.5 + 1.02·t, both with errors, t over 5–300.
    const rand = mulberry32(3601);
    const g = (): number => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    const x: number[] = [];
    const y: number[] = [];
    for (let i = 0; i < 1000; i++) {
      const t = uniform(rand, 5, 300);
      x.push(t + 2 * g());
      y.push(1.5 + 1.02 * t + 2 * g());
    }
    const fit = passingBablok(x, y);
    expect(fit.slope).toBe(plainSlope(x, y));
    expect(fit.slopeLow as number).toBeLessThan(1.02);
    expect(fit.slopeHigh as number).toBeGreaterThan(1.02);
    const engine = time(() => passingBablok(x, y));
    const gx = x.map((v) => [v]);
    const gy = y.map((v) => [v]);
    const sheet = time(() => evaluate('DATA.COMPARE', [gx, gy]));
    console.log(
      `Passing–Bablok, 1,000 pairs (499,500 slopes): engine ${fmt(engine)}; DATA.COMPARE through the registry ${fmt(sheet)}`,
    );
  });

  test('one-way ANOVA of NIST StRD SmLs03 (18,009 results): time it', () => {
    const d = anova('SmLs03');
    const p = oneWayPrecision(d.values, d.groups);
    expect(Math.abs(p.repeatabilitySd - d.residualSd)).toBeLessThan(1e-9 * d.residualSd);
    const engine = time(() => oneWayPrecision(d.values, d.groups), 9);
    const v = d.values.map((z) => [z]);
    const gr = d.groups.map((z) => [z]);
    const sheet = time(() => evaluate('DATA.PRECISION', [v, gr]), 9);
    console.log(`ANOVA, SmLs03 (18,009 results, 9 groups): engine ${fmt(engine)}; DATA.PRECISION through the registry ${fmt(sheet)}`);
  });
});
