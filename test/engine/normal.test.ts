import Decimal from 'decimal.js';
import { normalCdf, normalQuantile } from '../../src/engine/normal';
import { zFromCoverage } from '../../src/engine/coverage';
import stdlibQuantile from '@stdlib/stats-base-dists-normal-quantile';
import stdlibCdf from '@stdlib/stats-base-dists-normal-cdf';
import { mulberry32 } from '../support/prng';

// High-precision reference: Φ(x) = 1/2 + φ(x)·Σ x^(2n+1)/(1·3·…·(2n+1)) summed in 60-digit
// decimal.js arithmetic, inverted by Newton's method from the double estimate. (Series from
// Abramowitz & Stegun 26.2.11, from memory; it converges for every x and, at 60 digits, loses
// nothing to cancellation for |x| ≤ 9.)
const D = Decimal.clone({ precision: 60 });
const SQRT_2PI = D.sqrt(D.acos(-1).times(2));

function phiHigh(x: Decimal): Decimal {
  const x2 = x.times(x);
  let term = x;
  let sum = x;
  for (let k = 1; k < 2000; k++) {
    term = term.times(x2).div(2 * k + 1);
    sum = sum.plus(term);
    if (term.abs().lt('1e-58')) break;
  }
  const density = D.exp(x2.div(-2)).div(SQRT_2PI);
  return new D(0.5).plus(density.times(sum));
}

/** The reference at the double nearest p (toPrecision(40) spells out the binary value exactly enough). */
function quantileHigh(p: string): Decimal {
  const target = new D(Number(p).toPrecision(40));
  let x = new D(normalQuantile(Number(p)));
  for (let i = 0; i < 4; i++) {
    const density = D.exp(x.times(x).div(-2)).div(SQRT_2PI);
    x = x.minus(phiHigh(x).minus(target).div(density));
  }
  return x;
}

describe('normal quantile (AS 241)', () => {
  // NIST/SEMATECH e-Handbook of Statistical Methods §1.3.6.7.2, t table, ν = ∞ row (3 decimals).
  test.each([
    [0.9, 1.282],
    [0.95, 1.645],
    [0.975, 1.96],
    [0.99, 2.326],
    [0.995, 2.576],
    [0.999, 3.09],
  ])('Φ⁻¹(%p) = %p to the table’s 3 decimals', (p, z) => {
    expect(Math.abs(normalQuantile(p) - z)).toBeLessThanOrEqual(0.0005);
  });

  // Common practice, no source: z = 1.65 covers 95 % one-sided and 2.33 covers 99 %.
  test('1.65 covers 95 % and 2.33 covers 99 %, one-sided', () => {
    expect(normalCdf(1.65)).toBeCloseTo(0.95, 2);
    expect(normalCdf(2.33)).toBeCloseTo(0.99, 2);
    expect(zFromCoverage(0.95, 2)).toBeCloseTo(1.96, 2);
  });

  test.each(['1e-12', '1e-6', '0.001', '0.025', '0.05', '0.2', '0.5', '0.6', '0.8413', '0.975', '0.999', '0.999999'])(
    'Φ⁻¹(%s) agrees with a 60-digit decimal.js reference to 1e-14 relative',
    (p) => {
      const ref = quantileHigh(p).toNumber();
      const got = normalQuantile(Number(p));
      if (ref === 0) expect(got).toBe(0);
      else expect(Math.abs(got - ref) / Math.abs(ref)).toBeLessThan(1e-14);
    },
  );

  // Reference library: @stdlib/stats-base-dists-normal-quantile (central region; its tails are
  // less accurate than AS 241, so the comparison stays within 1e-6 < p < 1 − 1e-6).
  test('agrees with stdlib to 1e-12 relative on 20,000 seeded points (seed 7)', () => {
    const rand = mulberry32(7);
    for (let i = 0; i < 20000; i++) {
      const p = 1e-6 + (1 - 2e-6) * rand();
      const a = normalQuantile(p);
      const b = stdlibQuantile(p, 0, 1);
      expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(b)));
    }
  });

  test('edges: 0 and 1 give ∓Infinity, outside [0, 1] gives NaN', () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
  });
});

describe('normal CDF (West 2005)', () => {
  test('agrees with stdlib to 1e-15 absolute from −8 to 8 (step 0.001)', () => {
    for (let x = -8; x <= 8; x += 0.001) {
      expect(Math.abs(normalCdf(x) - stdlibCdf(x, 0, 1))).toBeLessThan(1e-15);
    }
  });

  test('agrees with the 60-digit reference at a few points', () => {
    for (const x of ['-5', '-2.5', '-1', '0.3', '1.96', '4']) {
      const ref = phiHigh(new D(x)).toNumber();
      expect(Math.abs(normalCdf(Number(x)) - ref)).toBeLessThan(2e-16 + 1e-15 * ref);
    }
  });

  test('inverts the quantile', () => {
    for (const p of [1e-9, 0.01, 0.3, 0.5, 0.77, 0.99]) expect(normalCdf(normalQuantile(p))).toBeCloseTo(p, 14);
  });
});
