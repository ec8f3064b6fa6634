import tQuantileRef from '@stdlib/stats-base-dists-t-quantile';
import { lnGamma, tCdf, tQuantile } from '../../../src/engine/data/studentT';
import { mulberry32 } from '../../support/prng';

const NUS = [0.5, 1, 1.5, 2, 2.5, 3, 4, 5, 6, 7, 8, 10, 12, 15, 19, 20, 21, 25, 30, 40, 50, 60, 100, 120, 250, 500, 1000, 1999, 2001, 2500, 4999, 5001, 1e4, 1e5, 1e6, 1e8];
const PS = [
  1e-12, 1e-9, 1e-6, 1e-4, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.2, 0.25, 0.2500001, 0.3, 0.4, 0.45, 0.49, 0.4999,
  0.5001, 0.6, 0.75, 0.8, 0.9, 0.95, 0.965, 0.975, 0.99, 0.995, 0.999, 0.9995, 1 - 1e-6, 1 - 1e-9,
];

describe('Student t quantile', () => {
  // Reference library: @stdlib/stats-base-dists-t-quantile (a port of Boost's inverse of the
  // incomplete beta function). Stated accuracy of ours: relative error below 1e-13.
  test('agrees with @stdlib/stats-base-dists-t-quantile to 1e-13 relative over ν 0.5…1e8, p 1e-12…1 − 1e-9', () => {
    let worst = 0;
    for (const nu of NUS) {
      for (const p of PS) {
        const ours = tQuantile(p, nu);
        const ref = tQuantileRef(p, nu);
        const rel = Math.abs(ours - ref) / Math.abs(ref);
        worst = Math.max(worst, rel);
        expect(rel).toBeLessThanOrEqual(1e-13);
      }
    }
    console.log(`t quantile: worst relative difference from stdlib ${worst.toExponential(2)}`);
  });

  // Seed 3201: random ν and p, same reference and tolerance.
  test('random ν and p agree with stdlib to 1e-13 relative', () => {
    const rand = mulberry32(3201);
    for (let i = 0; i < 3000; i++) {
      const nu = Math.exp(rand() * Math.log(2e5)) * 0.5;
      const p = rand() < 0.5 ? rand() : Math.exp(-rand() * 25);
      if (p === 0 || p === 0.5) continue;
      const ours = tQuantile(p, nu);
      const ref = tQuantileRef(p, nu);
      expect(Math.abs(ours - ref)).toBeLessThanOrEqual(1e-13 * Math.abs(ref));
    }
  });

  // Closed forms (from memory): ν = 1 is the Cauchy, t = tan(π(p − ½));
  // ν = 2: t = (2p − 1)/√(2p(1 − p)); ν = 4: t = sign·√(4/√α·cos(⅓·acos(√α)) − 4), α = 4p(1 − p).
  test('closed forms for ν = 1, 2 and 4', () => {
    for (const p of [0.001, 0.025, 0.3, 0.7, 0.975, 0.999]) {
      expect(tQuantile(p, 1)).toBeRelClose(Math.tan(Math.PI * (p - 0.5)), 1e-13);
      expect(tQuantile(p, 2)).toBeRelClose((2 * p - 1) / Math.sqrt(2 * p * (1 - p)), 1e-14);
      const a = 4 * p * (1 - p);
      const q = Math.sqrt(a);
      const t4 = Math.sign(p - 0.5) * Math.sqrt((4 / q) * Math.cos(Math.acos(q) / 3) - 4);
      expect(tQuantile(p, 4)).toBeRelClose(t4, 1e-12);
    }
  });

  // NIST/SEMATECH e-Handbook §1.3.6.7.2, t table (3 decimals; the ν = ∞ row is the normal
  // quantile, the finite rows from memory): 0.975 quantiles 12.706 (ν 1), 4.303 (ν 2),
  // 2.228 (ν 10), 2.042 (ν 30), 1.960 (ν ∞).
  test('published 3-decimal table values', () => {
    expect(Math.abs(tQuantile(0.975, 1) - 12.706)).toBeLessThan(0.0005);
    expect(Math.abs(tQuantile(0.975, 2) - 4.303)).toBeLessThan(0.0005);
    expect(Math.abs(tQuantile(0.975, 10) - 2.228)).toBeLessThan(0.0005);
    expect(Math.abs(tQuantile(0.975, 30) - 2.042)).toBeLessThan(0.0005);
    expect(Math.abs(tQuantile(0.975, 1e7) - 1.96)).toBeLessThan(0.0005);
    expect(Math.abs(tQuantile(0.95, 1e7) - 1.645)).toBeLessThan(0.0005);
  });

  test('special cases: p = ½ → 0, p = 0 / 1 → ∓Infinity, bad input → NaN; symmetry', () => {
    expect(tQuantile(0.5, 7)).toBe(0);
    expect(tQuantile(0, 7)).toBe(-Infinity);
    expect(tQuantile(1, 7)).toBe(Infinity);
    expect(tQuantile(1.5, 7)).toBeNaN();
    expect(tQuantile(0.5, 0)).toBeNaN();
    expect(tQuantile(0.3, NaN)).toBeNaN();
    for (const nu of [1, 3, 17, 300, 3000]) expect(tQuantile(1 - 0.975, nu)).toBe(-tQuantile(0.975, nu));
  });

  // Seed 3202: the CDF inverts the quantile (common practice, no source).
  test('tCdf(tQuantile(p)) = p to 1e-13 relative', () => {
    const rand = mulberry32(3202);
    for (let i = 0; i < 1000; i++) {
      const nu = 0.5 + rand() * 200;
      const p = 0.001 + 0.998 * rand();
      expect(Math.abs(tCdf(tQuantile(p, nu), nu) - p)).toBeLessThanOrEqual(1e-13 * Math.min(p, 1 - p) + 1e-16);
    }
  });

  // Common practice, no source: Γ(n) = (n − 1)!, Γ(½) = √π.
  test('ln Γ at integers and ½', () => {
    let f = 1;
    for (let n = 1; n <= 25; n++) {
      if (n > 1) f *= n - 1;
      expect(Math.abs(lnGamma(n) - Math.log(f))).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(Math.log(f))));
    }
    expect(Math.abs(lnGamma(0.5) - 0.5 * Math.log(Math.PI))).toBeLessThanOrEqual(1e-15);
  });
});
