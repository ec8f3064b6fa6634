import { biasUncertainty, combinedUncertainty } from '../../src/engine/mu';
import { mulberry32, uniform } from '../support/prng';

// Nordtest TR 537, ed. 4 (2017), worked examples — second-hand: the handbook itself was not at
// hand; the values are quoted from a public study note that cites the handbook's
// sections 3.2 and 6.1. Tolerances follow the decimals given there.
describe('MU.BIAS and MU.COMBINE against the Nordtest TR 537 examples (second-hand)', () => {
  const ammoniumBiases = [2.5, 2.7, 1.9, 1.4, 1.8, 2.9];

  test('ammonium §3.2: u(bias) = √(2.26² + 1.52²) = 2.73 %', () => {
    const u = biasUncertainty(ammoniumBiases, 1.52);
    expect(Math.abs(u - 2.73)).toBeLessThan(0.005);
    // Exact, common practice: √(30.76/6 + 1.52²).
    expect(Math.abs(u - Math.sqrt(30.76 / 6 + 1.52 ** 2))).toBeLessThanOrEqual(1e-14);
  });

  test('ammonium §3.2: u_c = √(1.67² + 2.73²) = 3.20 %, U (k = 2) = 6.40 %', () => {
    expect(Math.abs(combinedUncertainty(1.67, 2.73, 1) - 3.2)).toBeLessThan(0.005);
    expect(Math.abs(combinedUncertainty(1.67, 2.73, 2) - 6.4)).toBeLessThan(0.005);
    // Chained from the data: u(Rw) = 3.34/2.
    const U = combinedUncertainty(3.34 / 2, biasUncertainty(ammoniumBiases, 1.52), 2);
    expect(Math.abs(U - 6.4)).toBeLessThan(0.005);
  });

  // §6.1 single CRM: certified 11.5 ± 0.5 (k = 2), lab mean 11.9, s = 2.2 % (n = 12):
  // u(Cref) = 0.25/11.5 = 2.17 %, bias 3.48 %, u(bias) = √(3.48² + (2.2/√12)² + 2.17²) ≈ 4.1 %.
  // MU.BIAS takes one u_ref, so the standard error of the lab mean goes in with u(Cref).
  test('single CRM §6.1: u(bias) ≈ 4.1 % with the mean’s SE folded into u_ref', () => {
    const uCref = (100 * 0.25) / 11.5;
    expect(Math.abs(uCref - 2.17)).toBeLessThan(0.005);
    const bias = (100 * (11.9 - 11.5)) / 11.5;
    const u = biasUncertainty([bias], Math.hypot(2.2 / Math.sqrt(12), uCref));
    // The README's "≈ 4.1" is √17.2226 = 4.150 (from its rounded inputs) cut to one decimal.
    expect(Math.abs(u - 4.1)).toBeLessThan(0.06);
    const fromRounded = biasUncertainty([3.48], Math.hypot(2.2 / Math.sqrt(12), 2.17));
    expect(Math.abs(fromRounded - Math.sqrt(3.48 ** 2 + 2.2 ** 2 / 12 + 2.17 ** 2))).toBeLessThanOrEqual(1e-14);
    expect(Math.abs(fromRounded - 4.15)).toBeLessThan(0.005);
  });
});

describe('MU rules', () => {
  test('if given no biases, throws #NUM!', () => {
    expect(() => biasUncertainty([], 1)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });
  test('if an uncertainty is negative or k is not positive, throws #NUM!', () => {
    expect(() => biasUncertainty([1], -0.1)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => combinedUncertainty(-1, 1, 2)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => combinedUncertainty(1, -1, 2)).toThrow(expect.objectContaining({ code: '#NUM!' }));
    expect(() => combinedUncertainty(1, 1, 0)).toThrow(expect.objectContaining({ code: '#NUM!' }));
  });

  // Seed 3501: the combination is at least each part, linear in k and in a common scale, and
  // the sign of a bias does not matter (common practice, no source).
  test('properties: u_c ≥ each part, linear scaling, sign of bias irrelevant', () => {
    const rand = mulberry32(3501);
    for (let i = 0; i < 1000; i++) {
      const a = uniform(rand, 0, 10);
      const b = uniform(rand, 0, 10);
      const k = uniform(rand, 0.5, 3);
      const s = uniform(rand, 0.01, 100);
      const u = combinedUncertainty(a, b, 1);
      expect(u).toBeGreaterThanOrEqual(Math.max(a, b));
      expect(Math.abs(combinedUncertainty(a, b, k) - k * u)).toBeLessThanOrEqual(1e-14 * k * u);
      expect(Math.abs(combinedUncertainty(s * a, s * b, 1) - s * u)).toBeLessThanOrEqual(1e-13 * s * u);
      const biases = Array.from({ length: 1 + Math.floor(rand() * 8) }, () => uniform(rand, -5, 5));
      expect(biasUncertainty(biases.map((x) => -x), a)).toBe(biasUncertainty(biases, a));
    }
  });
});
