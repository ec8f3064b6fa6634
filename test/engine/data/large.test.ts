/**
 * The two heavy computations on large inputs compute the right thing: Passing–Bablok on 1,000
 * pairs (499,500 slopes) equals the plainly written estimator, and the one-way ANOVA of NIST
 * StRD SmLs03 (18,009 results) its certified SD, through the engine and through the registry.
 * Their timings are in the benchmark (npm run bench: pb_1000_ms, anova_smls03_ms).
 */
import { passingBablok } from '../../../src/engine/data/compare';
import { oneWayPrecision } from '../../../src/engine/data/precision';
import { evaluate } from '../../../src/registry';
import { mulberry32, uniform } from '../../support/prng';
import { anova } from './nist';

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

describe('large inputs', () => {
  test('Passing–Bablok on 1,000 pairs equals the plainly written estimator, through the registry too', () => {
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
    const out = evaluate('DATA.COMPARE', [x.map((v) => [v]), y.map((v) => [v])]);
    expect(out[1][0]).toBe(fit.slope);
  });

  test('one-way ANOVA of NIST StRD SmLs03 (18,009 results): the certified residual SD, through the registry too', () => {
    const d = anova('SmLs03');
    const p = oneWayPrecision(d.values, d.groups);
    expect(Math.abs(p.repeatabilitySd - d.residualSd)).toBeLessThan(1e-9 * d.residualSd);
    const out = evaluate('DATA.PRECISION', [d.values.map((z) => [z]), d.groups.map((z) => [z])]);
    expect(out[1][1]).toBe(p.repeatabilitySd);
  });
});
