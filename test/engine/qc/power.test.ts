import cdf from '@stdlib/stats-base-dists-normal-cdf';
import {
  chainSurvival,
  clearQcCaches,
  DEFAULT_QUADRATURE,
  detectionProbability,
  falseRejectionProbability,
  gaussLegendre,
  powerCurve,
  shiftAxis,
} from '../../../src/engine/qc/power';
import { machineOf } from '../../../src/engine/qc/machine';
import { parseRule } from '../../../src/engine/qc/rules';
import { LeewayError } from '../../../src/engine/errors';
import { mulberry32, uniform } from '../../support/prng';
import { simulateRejection } from './simulate';

const Phi = (x: number, mu = 0): number => cdf(x, mu, 1);

/** The closed form of the issue, written with the stdlib Φ: 1 − [Φ(k−Δ) − Φ(−k−Δ)]^(n·runs). */
const closedForm = (k: number, n: number, shift: number, runs: number): number =>
  1 - Math.pow(Phi(k - shift) - Phi(-k - shift), n * runs);

const MULTIRULES = ['1-3s/2-2s/R-4s', '1-3s/2-2s/R-4s/4-1s', '1-3s/2-2s/R-4s/4-1s/10-x'];

function codeOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    if (e instanceof LeewayError) return `${e.code} ${e.message}`;
    throw e;
  }
  return undefined;
}

describe('single-limit rules: the closed form 1 − [Φ(k−Δ) − Φ(−k−Δ)]^(n·runs)', () => {
  // Closed form of the Westgard & Groth 1979 model, Φ from @stdlib (independent).
  test('agrees with the stdlib closed form at 3000 seeded points (absolute 1e-12)', () => {
    const rand = mulberry32(19790601);
    for (let i = 0; i < 3000; i++) {
      const k = [2, 2.5, 3, 3.5][i % 4] + (i % 5 === 0 ? uniform(rand, -1, 1) : 0);
      const n = 1 + Math.floor(rand() * 8);
      const runs = 1 + Math.floor(rand() * 12);
      const shift = uniform(rand, 0, 6);
      const rule = `1-${k}s`;
      expect(Math.abs(detectionProbability(rule, n, shift, runs) - closedForm(k, n, shift, runs))).toBeLessThanOrEqual(1e-12);
    }
  });

  test('the exact Markov chain reproduces the closed form (absolute 1e-12)', () => {
    // 2-3s can never fire before 1-2s, and a run inside ±2 SD has a range below 4: so these
    // rules reject exactly when 1-2s does, but they go through the chain (the second with the
    // range integral).
    for (const rule of ['1-2s/2-3s', '1-2s/R-5s', '1-2s/R-4.5s/3of4-2.5s']) {
      const m = machineOf(parseRule(rule));
      for (const [n, runs, shift] of [
        [1, 1, 0],
        [2, 1, 0],
        [2, 3, 1.3],
        [4, 1, 2.2],
        [3, 5, 0.4],
        [5, 2, 3.7],
      ]) {
        expect(Math.abs(1 - chainSurvival(m, n, shift, runs) - closedForm(2, n, shift, runs))).toBeLessThanOrEqual(1e-12);
      }
    }
  });

  test('over many runs (the geometric tail of the chain) it still matches: 1-2s/2-3s, n 1, 800 runs, shift 0.01', () => {
    const m = machineOf(parseRule('1-2s/2-3s'));
    expect(Math.abs(1 - chainSurvival(m, 1, 0.01, 800) - closedForm(2, 1, 0.01, 800))).toBeLessThanOrEqual(1e-10);
  });

  // Common practice, no source: one control per run, 1-2s rejects about 4.5 % of good runs,
  // 1-3s about 0.3 %.
  test('with one control, 1-2s falsely rejects about 4.5 % of runs and 1-3s about 0.3 %', () => {
    expect(Math.abs(falseRejectionProbability('1-2s', 1) - 0.045)).toBeLessThan(0.001);
    expect(Math.abs(falseRejectionProbability('1-3s', 1) - 0.003)).toBeLessThan(0.0005);
  });

  // Common practice, no source: more controls per run raise false rejection.
  test('more controls raise false rejection, for single rules and multirules', () => {
    for (const rule of ['1-2s', '1-2.5s', '1-3s', '1-3.5s', ...MULTIRULES, '2of3-2s']) {
      let last = -1;
      for (let n = 1; n <= 6; n++) {
        const p = falseRejectionProbability(rule, n);
        expect(p).toBeGreaterThan(last);
        last = p;
      }
    }
  });
});

describe('multirules: exact chain against independent computations', () => {
  // Independent exact integration, n = 2 within one run, 1-3s/2-2s/R-4s: the run is accepted
  // when both observations lie in [−3, 3], differ by at most 4 and are not both beyond +2 or
  // both beyond −2. For each x1 the accepted x2 form an interval; the outer integral over x1 is
  // composite Simpson between the kinks (−3, −2, −1, 1, 2, 3), Φ from @stdlib.
  function exactTwo(shift: number): number {
    const inner = (x1: number): number => {
      let lo = Math.max(-3, x1 - 4);
      let hi = Math.min(3, x1 + 4);
      if (x1 > 2) hi = Math.min(hi, 2);
      if (x1 < -2) lo = Math.max(lo, -2);
      return hi > lo ? Phi(hi, shift) - Phi(lo, shift) : 0;
    };
    const f = (x: number): number => Math.exp(-0.5 * (x - shift) ** 2) / Math.sqrt(2 * Math.PI) * inner(x);
    const knots = [-3, -2, -1, 1, 2, 3];
    let total = 0;
    for (let j = 0; j + 1 < knots.length; j++) {
      const a = knots[j];
      const b = knots[j + 1];
      const m = 2000;
      const h = (b - a) / m;
      // Ends taken just inside the piece: the integrand jumps at ±2 (one-sided limits).
      let s = f(a + 1e-13) + f(b - 1e-13);
      for (let i = 1; i < m; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
      total += (s * h) / 3;
    }
    return 1 - total;
  }

  test.each([0, 0.5, 1, 1.5, 2, 2.5, 3, 4])('1-3s/2-2s/R-4s, n = 2, one run, shift %p: agrees with direct integration (1e-9)', (shift) => {
    expect(Math.abs(detectionProbability('1-3s/2-2s/R-4s', 2, shift, 1) - exactTwo(shift))).toBeLessThan(1e-9);
  });

  // Brute-force simulation (test/engine/qc/simulate.ts), 10⁶ series each, seed 20260417 + case:
  // agreement within the stated precision ±0.005 and within 5 standard errors.
  const cases: Array<[string, number, number, number]> = [
    ['1-3s/2-2s/R-4s', 4, 1.5, 1],
    ['1-3s/2-2s/R-4s/4-1s', 2, 1, 2],
    ['1-3s/2-2s/R-4s/4-1s', 4, 0, 1],
    ['1-3s/2-2s/R-4s/4-1s/10-x', 2, 0.8, 5],
    ['1-3s/2-2s/R-4s/4-1s/10-x', 4, 0, 3],
    ['1-3s/2of3-2s/R-4s/3-1s/6-x', 3, 1.2, 2],
    ['R-3s/4-1s', 3, 0.7, 2],
    ['2of3-2s', 2, 1.5, 1],
  ];
  test.each(cases.map((c, i) => [...c, i] as const))('%s, n = %p, shift %p, runs %p: simulation agrees', (rule, n, shift, runs, i) => {
    const sim = simulateRejection(rule, n, shift, runs, 1_000_000, 20260417 + i);
    const exact = detectionProbability(rule, n, shift, runs);
    expect(Math.abs(exact - sim.p)).toBeLessThanOrEqual(0.005);
    expect(Math.abs(exact - sim.p)).toBeLessThanOrEqual(5 * sim.se);
  });

  // Runs of one sign among fair (or biased) coin flips: at shift Δ each observation is above the
  // mean with probability Φ(Δ). Independent recurrence on the number of flips (a_m = P(no run of
  // c in m flips)), not on runs of controls.
  function noSideRun(c: number, m: number, up: number): number {
    let ending = new Float64Array(2 * c); // [side][length-1]
    ending[0] = up;
    ending[c] = 1 - up;
    for (let k = 2; k <= m; k++) {
      const nxt = new Float64Array(2 * c);
      for (let side = 0; side < 2; side++) {
        for (let len = 1; len <= c - 1; len++) {
          const v = ending[side * c + len - 1];
          if (!v) continue;
          const same = side === 0 ? up : 1 - up;
          if (len + 1 < c) nxt[side * c + len] += v * same;
          nxt[(1 - side) * c] += v * (1 - same);
        }
      }
      ending = nxt;
    }
    return ending.reduce((a, b) => a + b, 0);
  }

  test.each([
    [1, 1000, 0],
    [2, 120, 0.2],
    [3, 40, 0.5],
    [5, 10, 0],
  ])('10-x, n = %p, %p runs, shift %p: equals the coin-flip recurrence (1e-10)', (n, runs, shift) => {
    const expected = 1 - noSideRun(10, n * runs, Phi(shift));
    expect(Math.abs(detectionProbability('10-x', n, shift, runs) - expected)).toBeLessThan(1e-10);
  });
});

describe('properties of the power functions', () => {
  // Seed 1981: detection rises with the shift and with the number of runs; all within [0, 1].
  test('detection rises with the shift and with runs; probabilities in [0, 1]', () => {
    const rand = mulberry32(1981);
    const rules = [...MULTIRULES, '1-2.5s', '2of3-2s/1-3s', '1-3s/R-4s', '4-1s/10-x'];
    for (let i = 0; i < 60; i++) {
      const rule = rules[i % rules.length];
      const n = 1 + Math.floor(rand() * 4);
      const runs = 1 + Math.floor(rand() * 5);
      const shifts = Array.from({ length: 8 }, () => uniform(rand, 0, 5)).sort((a, b) => a - b);
      let last = -1;
      for (const s of shifts) {
        const p = detectionProbability(rule, n, s, runs);
        expect(p).toBeGreaterThanOrEqual(0);
        expect(p).toBeLessThanOrEqual(1);
        expect(p).toBeGreaterThanOrEqual(last - 1e-12);
        last = p;
        expect(detectionProbability(rule, n, s, runs + 1)).toBeGreaterThanOrEqual(p - 1e-12);
      }
    }
  });

  test('detection at a large shift approaches 1; a count rule longer than the series never fires', () => {
    expect(detectionProbability('1-3s/2-2s/R-4s', 2, 8)).toBeGreaterThan(1 - 1e-12);
    expect(detectionProbability('1-3s/2-2s/R-4s', 2, 1e6)).toBe(1);
    expect(detectionProbability('10-x', 2, 50, 4)).toBe(0);
    expect(detectionProbability('10-x', 2, 50, 5)).toBe(1);
    expect(detectionProbability('R-4s', 1, 3, 20)).toBe(0);
  });

  test('the range integral: the default quadrature agrees with a much finer one (1e-11)', () => {
    const fine = { points: 24, maxWidth: 0.2, below: 9, above: 7 };
    for (const rule of ['1-3s/2-2s/R-4s/4-1s/10-x', 'R-4s', '1-2.5s/R-3s/3of4-1s']) {
      const m = machineOf(parseRule(rule));
      for (const [n, shift, runs] of [
        [2, 0, 1],
        [2, 1.7, 5],
        [4, 2.6, 3],
        [6, 0.9, 2],
      ]) {
        const a = chainSurvival(m, n, shift, runs, DEFAULT_QUADRATURE);
        const b = chainSurvival(m, n, shift, runs, fine);
        expect(Math.abs(a - b)).toBeLessThan(1e-11);
      }
    }
  });

  test('Gauss–Legendre nodes integrate polynomials of degree 2m − 1 exactly', () => {
    for (const m of [1, 2, 5, 8, 24]) {
      const { x, w } = gaussLegendre(m);
      for (let d = 0; d <= 2 * m - 1; d++) {
        let s = 0;
        for (let i = 0; i < m; i++) s += w[i] * x[i] ** d;
        expect(Math.abs(s - (d % 2 ? 0 : 2 / (d + 1)))).toBeLessThan(1e-13);
      }
    }
  });

  test('deterministic and cached: the same number cold and warm, whatever the spelling of the rule', () => {
    clearQcCaches();
    const cold = detectionProbability('1-3s/2-2s/R-4s/4-1s/10-x', 2, 1.234, 5);
    const warm = detectionProbability('1-3s/2-2s/R-4s/4-1s/10-x', 2, 1.234, 5);
    clearQcCaches();
    const again = detectionProbability(' 10_X / 4-1s/r-4S/2-2s /1-3s', 2, 1.234, 5);
    expect(warm).toBe(cold);
    expect(again).toBe(cold);
  });

  test('powerCurve returns {shift, p} in the order given, equal to QC.DETECT point by point', () => {
    const shifts = shiftAxis(4, 0.5);
    expect(shifts).toEqual([0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4]);
    const curve = powerCurve('1-3s/2-2s/R-4s', 2, 1, shifts);
    expect(curve.map((c) => c.shift)).toEqual(shifts);
    curve.forEach((c) => expect(c.p).toBe(detectionProbability('1-3s/2-2s/R-4s', 2, c.shift, 1)));
    expect(curve[0].p).toBe(falseRejectionProbability('1-3s/2-2s/R-4s', 2));
    expect(() => powerCurve('1-3s', 1, 1, [1, -1])).toThrow(LeewayError);
  });
});

describe('bad input', () => {
  test.each([
    ['n 0', () => detectionProbability('1-3s', 0, 1), /^#NUM! n must be at least 1/],
    ['n 1.5', () => detectionProbability('1-3s/2-2s', 1.5, 1), /^#NUM! n must be a whole number/],
    ['n 101', () => detectionProbability('1-3s', 101, 1), /^#NUM! n must be at most 100/],
    ['runs 0', () => detectionProbability('1-3s', 2, 1, 0), /^#NUM! runs must be at least 1/],
    ['runs 2.5', () => falseRejectionProbability('1-3s', 2, 2.5), /^#NUM! runs must be a whole number/],
    ['runs 10001', () => falseRejectionProbability('1-3s', 2, 10001), /^#NUM! runs must be at most 10000/],
    ['shift −0.1', () => detectionProbability('1-3s', 2, -0.1), /^#NUM! shift must be a finite number ≥ 0/],
    ['shift NaN', () => detectionProbability('1-3s', 2, NaN), /^#NUM! shift/],
    ['shift Infinity', () => detectionProbability('1-3s', 2, Infinity), /^#NUM! shift/],
    ['a bad term', () => detectionProbability('1-3s/2-2x', 2, 1), /^#VALUE! rule term "2-2x"/],
  ])('%s: the Excel error with a message', (_what, call, message) => {
    expect(codeOf(call)).toMatch(message);
  });
});
