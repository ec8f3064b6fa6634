import Decimal from 'decimal.js';
import {
  consensus,
  CONSENSUS_MAX_ROUNDS,
  CONSENSUS_TOLERANCE,
  eqaZeta,
  eqaZScore,
  scoreBand,
} from '../../src/engine/eqa';
import { mulberry32, uniform } from '../support/prng';

// High-precision references in one numeric context: 60 significant digits.
const D = Decimal.clone({ precision: 60 });
const MAX = new D('1.7976931348623157e308');
const MIN_NORMAL = 2.2250738585072014e-308;

/** The exact value of a double as a decimal (sign · mantissa · 2^exponent, from its bits). */
function exact(x: number): Decimal {
  if (x === 0) return new D(0);
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const exponentBits = Number((bits >> BigInt(52)) & BigInt(0x7ff));
  let mantissa = bits & ((BigInt(1) << BigInt(52)) - BigInt(1));
  let exponent = -1074;
  if (exponentBits !== 0) {
    mantissa |= BigInt(1) << BigInt(52);
    exponent = exponentBits - 1075;
  }
  const v = new D(mantissa.toString()).times(new D(2).pow(exponent));
  return x < 0 ? v.neg() : v;
}

/** (result − assigned)/√(a² + b²) in 60-digit arithmetic on the doubles as stored. */
function scoreHigh(result: number, assigned: number, a: number, b: number): Decimal {
  const ea = exact(a);
  const eb = exact(b);
  return exact(result).minus(exact(assigned)).div(ea.times(ea).plus(eb.times(eb)).sqrt());
}

/** |computed − reference| relative to the reference, in 60 digits. */
function relErr(computed: number, reference: Decimal): number {
  return exact(computed).minus(reference).abs().div(reference.abs()).toNumber();
}

const num = (code: string) => expect.objectContaining({ code });

/** Standard normal deviate by Box–Muller from the seeded generator. */
function gauss(rand: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}

describe('EQA.ZSCORE and EQA.ZETA: closed forms (ISO 13528:2015 9.4–9.6, from memory)', () => {
  test('z = (x − x_pt)/σ_pt: (105 − 100)/2.5 = 2 exactly', () => {
    expect(eqaZScore(105, 100, 2.5)).toBe(2);
    expect(eqaZScore(95, 100, 2.5)).toBe(-2);
    expect(eqaZScore(105, 100, 2.5, 0)).toBe(2);
  });

  test('z′ = (x − x_pt)/√(σ_pt² + u(x_pt)²): (105 − 100)/√(3² + 4²) = 1 exactly', () => {
    expect(eqaZScore(105, 100, 3, 4)).toBe(1);
    expect(eqaZScore(105, 100, 4, 3)).toBe(1);
  });

  test('ζ = (x − x_pt)/√(u(x)² + u(x_pt)²): (112 − 100)/√(5² + 12²) = 12/13, to 1 ulp', () => {
    expect(Math.abs(eqaZeta(112, 100, 5, 12) - 12 / 13)).toBeLessThanOrEqual(2.3e-16 * (12 / 13));
    expect(Math.abs(eqaZeta(112, 100, 12, 5) - 12 / 13)).toBeLessThanOrEqual(2.3e-16 * (12 / 13));
    // One of the two uncertainties may be zero.
    expect(eqaZeta(106, 100, 0, 2)).toBe(3);
    expect(eqaZeta(94, 100, 2, 0)).toBe(-3);
  });

  test('equal result and assigned value give a score of +0', () => {
    expect(Object.is(eqaZScore(7.25, 7.25, 0.3), 0)).toBe(true);
    expect(Object.is(eqaZeta(-7.25, -7.25, 0.3, 0.1), 0)).toBe(true);
  });

  // Seed 1320: plausible values against a 60-digit evaluation of the same formula (the bound
  // 4.5e-16 is the engine's stated accuracy, four roundings). ζ is symmetric in the two
  // uncertainties, z′ never exceeds z in size, z′ = z when u(x_pt) = 0 (common practice, no
  // source for the properties).
  test('plausible inputs agree with a 60-digit reference to 4.5e-16 relative; z′ ≤ z in size', () => {
    const rand = mulberry32(1320);
    let worst = 0;
    for (let i = 0; i < 2000; i++) {
      const assigned = uniform(rand, 0.1, 500);
      const result = assigned * (1 + 0.2 * gauss(rand));
      const sd = assigned * uniform(rand, 0.005, 0.2);
      const u = rand() < 0.2 ? 0 : sd * uniform(rand, 0, 1.5);
      const uLab = sd * uniform(rand, 0.01, 2);
      const z = eqaZScore(result, assigned, sd);
      const zp = eqaZScore(result, assigned, sd, u);
      const zeta = eqaZeta(result, assigned, uLab, u);
      if (result !== assigned) {
        worst = Math.max(worst, relErr(z, scoreHigh(result, assigned, sd, 0)));
        worst = Math.max(worst, relErr(zp, scoreHigh(result, assigned, sd, u)));
        worst = Math.max(worst, relErr(zeta, scoreHigh(result, assigned, uLab, u)));
      }
      expect(Math.abs(zp)).toBeLessThanOrEqual(Math.abs(z));
      expect(Math.sign(zp)).toBe(Math.sign(result - assigned));
      if (u === 0) expect(zp).toBe(z);
      expect(eqaZeta(result, assigned, u, uLab)).toBe(zeta);
    }
    expect(worst).toBeLessThan(4.5e-16);
  });
});

describe('EQA scores at extreme magnitudes against a 60-digit decimal.js reference', () => {
  // Hand-picked cases where a naive formula overflows or underflows but the score is finite.
  test.each([
    // result, assigned, a, b: what goes wrong naively
    [1e300, -1e300, 1e10, 0], // difference 2e300, fine; score 2e290
    [1.5e308, -1.5e308, 10, 0], // the difference overflows
    [1.5e308, -1.5e308, 3, 4], // the difference overflows, z′
    [1.7e308, 0, 0.9, 0.9], // difference / max(a, b) overflows, the score does not
    [1e300, 0, 1e300, 1e300], // a² + b² overflows
    [3e-300, 1e-300, 1e-300, 0], // spreads of 1e-300
    [3e-300, 1e-300, 1e-300, 1e-300], // a² + b² underflows to 0
    [1e-310, 0, 5e-324, 1e-323], // subnormal spreads
    [1e-320, -1e-320, 2e-322, 0], // subnormal everything
    [1e-300, 5e-301, 1e-160, 1e-170], // a² underflows next to nothing
    [-1e308, 1e308, 1e300, 1e299], // negative overflowing difference
    [1e16 + 2, 1e16, 1, 0], // cancellation: the stored difference is exact
  ])('(%p − %p)/√(%p² + %p²)', (result, assigned, a, b) => {
    const ref = scoreHigh(result, assigned, a, b);
    expect(ref.abs().lt(MAX)).toBe(true);
    expect(relErr(eqaZScore(result, assigned, a, b), ref)).toBeLessThan(4.5e-16);
    expect(relErr(eqaZeta(result, assigned, a, b), ref)).toBeLessThan(4.5e-16);
  });

  test('a score beyond the largest double is #NUM! and the message names the inputs', () => {
    expect(() => eqaZScore(1.5e308, -1.5e308, 1)).toThrow(num('#NUM!'));
    expect(() => eqaZScore(1e300, 0, 1e-10)).toThrow(/result 1e300 and assigned 0 .*sd_pt 1e-10/);
    expect(() => eqaZScore(1e300, 0, 1e-10, 1e-11)).toThrow(/u_assigned 1e-11/);
    expect(() => eqaZeta(1e200, -1e200, 1e-200, 1e-201)).toThrow(num('#NUM!'));
    expect(() => eqaZeta(1e200, -1e200, 1e-200, 1e-201)).toThrow(/u_result 1e-200, u_assigned 1e-201/);
  });

  // Seed 1321: magnitudes 1e-300…1e300 drawn at random (and near-equal pairs for
  // cancellation). Where the exact score is finite and normal the engine agrees to 4.5e-16
  // relative; where it is beyond the largest double the engine says #NUM!; a subnormal score
  // (below 2.2e-308) agrees to within 1e-323 absolute.
  test('random extreme inputs: right to 4.5e-16 relative, or #NUM! exactly when the score overflows', () => {
    const rand = mulberry32(1321);
    const mag = () => (rand() < 0.5 ? -1 : 1) * 10 ** uniform(rand, -300, 300);
    let finiteCases = 0;
    let overflowCases = 0;
    let worst = 0;
    for (let i = 0; i < 3000; i++) {
      const result = mag();
      const assigned = rand() < 0.3 ? result * (1 + 10 ** uniform(rand, -15, -1)) : mag();
      const a = Math.abs(mag());
      const b = rand() < 0.3 ? 0 : Math.abs(mag());
      const ref = scoreHigh(result, assigned, a, b);
      for (const score of [() => eqaZScore(result, assigned, a, b), () => eqaZeta(result, assigned, a, b)]) {
        if (ref.abs().gt(MAX)) {
          overflowCases++;
          expect(score).toThrow(num('#NUM!'));
        } else if (ref.abs().lt(MIN_NORMAL)) {
          expect(Math.abs(score() - ref.toNumber())).toBeLessThanOrEqual(1e-323);
        } else {
          finiteCases++;
          worst = Math.max(worst, relErr(score(), ref));
        }
      }
    }
    expect(worst).toBeLessThan(4.5e-16);
    // The draw exercises both outcomes.
    expect(finiteCases).toBeGreaterThan(1000);
    expect(overflowCases).toBeGreaterThan(300);
  });
});

describe('score bands (ISO 13528:2015 9.4.1, from memory: ≤ 2.0 satisfactory, ≥ 3.0 action)', () => {
  test('exactly ±2 is satisfactory; exactly ±3 is unsatisfactory', () => {
    expect(scoreBand(2)).toBe('satisfactory');
    expect(scoreBand(-2)).toBe('satisfactory');
    expect(scoreBand(3)).toBe('unsatisfactory');
    expect(scoreBand(-3)).toBe('unsatisfactory');
    expect(scoreBand(0)).toBe('satisfactory');
  });

  test('neighbours of 2 and 3 (±1e-12 and ± one ulp) fall on their own side', () => {
    const ulp2 = 2 ** -51; // spacing of doubles in [2, 4)
    expect(scoreBand(2 - 1e-12)).toBe('satisfactory');
    expect(scoreBand(2 + 1e-12)).toBe('questionable');
    expect(scoreBand(2 + ulp2)).toBe('questionable');
    expect(scoreBand(-(2 + ulp2))).toBe('questionable');
    expect(scoreBand(2 - ulp2 / 2)).toBe('satisfactory');
    expect(scoreBand(3 - 1e-12)).toBe('questionable');
    expect(scoreBand(3 - ulp2)).toBe('questionable');
    expect(scoreBand(-(3 - ulp2))).toBe('questionable');
    expect(scoreBand(3 + 1e-12)).toBe('unsatisfactory');
    expect(scoreBand(2.5)).toBe('questionable');
    expect(scoreBand(1e300)).toBe('unsatisfactory');
  });

  // Decimal inputs whose score is exactly 2 or 3 on paper but not as computed: banded as given,
  // and as reported with 2 decimals (common practice, no source).
  test('a score of 2 or 3 on paper lands a hair off; decimals band it as reported', () => {
    const two = eqaZScore(5.4, 5, 0.2);
    const three = eqaZScore(5.6, 5, 0.2);
    expect(two).toBe(2.0000000000000018);
    expect(three).toBe(2.9999999999999982);
    expect(scoreBand(two)).toBe('questionable');
    expect(scoreBand(two, 2)).toBe('satisfactory');
    expect(scoreBand(three)).toBe('questionable');
    expect(scoreBand(three, 2)).toBe('unsatisfactory');
    expect(scoreBand(-three, 2)).toBe('unsatisfactory');
  });

  test('rounding half away from zero on the decimal value before banding', () => {
    expect(scoreBand(2.004, 2)).toBe('satisfactory');
    expect(scoreBand(2.005, 2)).toBe('questionable');
    expect(scoreBand(2.995, 2)).toBe('unsatisfactory');
    expect(scoreBand(-2.995, 2)).toBe('unsatisfactory');
    expect(scoreBand(2.994, 2)).toBe('questionable');
    expect(scoreBand(2.4, 0)).toBe('satisfactory');
    expect(scoreBand(2.5, 0)).toBe('unsatisfactory');
  });

  test('if the score is not finite or decimals is not a whole number 0…15, throws #NUM!', () => {
    expect(() => scoreBand(NaN)).toThrow(num('#NUM!'));
    expect(() => scoreBand(Infinity)).toThrow(num('#NUM!'));
    expect(() => scoreBand(2, -1)).toThrow(num('#NUM!'));
    expect(() => scoreBand(2, 1.5)).toThrow(num('#NUM!'));
    expect(() => scoreBand(2, 16)).toThrow(num('#NUM!'));
  });
});

describe('EQA.ZSCORE and EQA.ZETA: bad input', () => {
  test('if sd_pt is 0, throws #DIV/0!; if negative or not finite, #NUM! naming sd_pt', () => {
    expect(() => eqaZScore(1, 2, 0)).toThrow(num('#DIV/0!'));
    expect(() => eqaZScore(1, 2, 0, 0.5)).toThrow(num('#DIV/0!'));
    expect(() => eqaZScore(1, 2, -0.1)).toThrow(num('#NUM!'));
    expect(() => eqaZScore(1, 2, -0.1)).toThrow(/sd_pt/);
    expect(() => eqaZScore(1, 2, Infinity)).toThrow(num('#NUM!'));
    expect(() => eqaZScore(1, 2, NaN)).toThrow(num('#NUM!'));
  });

  test('if u_assigned is negative or not finite, throws #NUM! naming it', () => {
    expect(() => eqaZScore(1, 2, 1, -1e-9)).toThrow(num('#NUM!'));
    expect(() => eqaZScore(1, 2, 1, -1e-9)).toThrow(/u_assigned/);
    expect(() => eqaZScore(1, 2, 1, Infinity)).toThrow(num('#NUM!'));
    expect(() => eqaZeta(1, 2, 1, NaN)).toThrow(num('#NUM!'));
  });

  test('if result or assigned is not finite, throws #NUM! naming it', () => {
    expect(() => eqaZScore(NaN, 2, 1)).toThrow(/result/);
    expect(() => eqaZScore(1, Infinity, 1)).toThrow(/assigned/);
    expect(() => eqaZeta(-Infinity, 2, 1, 1)).toThrow(num('#NUM!'));
    expect(() => eqaZeta(1, NaN, 1, 1)).toThrow(num('#NUM!'));
  });

  test('if both uncertainties of ζ are zero, throws #DIV/0!; a negative one is #NUM!', () => {
    expect(() => eqaZeta(1, 2, 0, 0)).toThrow(num('#DIV/0!'));
    expect(() => eqaZeta(1, 2, 0, 0)).toThrow(/u_result and u_assigned/);
    expect(() => eqaZeta(1, 2, -1, 1)).toThrow(num('#NUM!'));
    expect(() => eqaZeta(1, 2, -1, 1)).toThrow(/u_result/);
    expect(() => eqaZeta(1, 2, 1, -1)).toThrow(/u_assigned/);
  });
});

// ---------------------------------------------------------------------------------------------
// Algorithm A: an independent implementation, written from the description in ISO 13528:2015
// annex C.3.1 (and ISO 13528:2005 annex C.1, ISO 5725-5:1998 6.2, as reproduced on public web
// pages), in 60-digit decimal arithmetic with plain loops. It shares nothing with the engine:
// no centring, no scaling, its own median, mean and SD.

interface Trajectory {
  readonly x: Decimal[];
  readonly s: Decimal[];
}

function medianHigh(values: Decimal[]): Decimal {
  const v = [...values].sort((a, b) => a.cmp(b));
  const h = Math.floor(v.length / 2);
  return v.length % 2 ? v[h] : v[h - 1].plus(v[h]).div(2);
}

/** x* and s* after 0, 1, 2, … rounds (index = round), for `rounds` rounds. */
function algorithmAHigh(data: readonly number[], rounds: number): Trajectory {
  const values = data.map(exact);
  const p = values.length;
  let x = medianHigh(values);
  let s = medianHigh(values.map((v) => v.minus(x).abs())).times('1.483');
  const xs = [x];
  const ss = [s];
  for (let k = 0; k < rounds; k++) {
    const delta = s.times('1.5');
    const lo = x.minus(delta);
    const hi = x.plus(delta);
    const clipped = values.map((v) => (v.lt(lo) ? lo : v.gt(hi) ? hi : v));
    let sum = new D(0);
    for (const v of clipped) sum = sum.plus(v);
    const mean = sum.div(p);
    let sq = new D(0);
    for (const v of clipped) sq = sq.plus(v.minus(mean).pow(2));
    x = mean;
    s = sq.div(p - 1).sqrt().times('1.134');
    xs.push(x);
    ss.push(s);
  }
  return { x: xs, s: ss };
}

/** The settled x* and s* of the reference: run until a round changes both by < 1e-40 of s*. */
function settledHigh(data: readonly number[]): { x: Decimal; s: Decimal; rounds: number } {
  const values = data.map(exact);
  const p = values.length;
  let x = medianHigh(values);
  let s = medianHigh(values.map((v) => v.minus(x).abs())).times('1.483');
  if (s.isZero()) return { x, s, rounds: 0 };
  for (let k = 1; k <= 20000; k++) {
    const delta = s.times('1.5');
    const clipped = values.map((v) => D.min(D.max(v, x.minus(delta)), x.plus(delta)));
    let sum = new D(0);
    for (const v of clipped) sum = sum.plus(v);
    const mean = sum.div(p);
    let sq = new D(0);
    for (const v of clipped) sq = sq.plus(v.minus(mean).pow(2));
    const sNew = sq.div(p - 1).sqrt().times('1.134');
    const tol = sNew.times('1e-40');
    const settled = mean.minus(x).abs().lt(tol) && sNew.minus(s).abs().lt(tol);
    x = mean;
    s = sNew;
    if (settled) return { x, s, rounds: k };
  }
  throw new Error('the reference did not settle in 20000 rounds');
}

/** Seeded results of a round: a Gaussian bulk at `level` with SD `sd` and some far outliers. */
function roundResults(rand: () => number, level: number, sd: number): number[] {
  const p = 5 + Math.floor(rand() * 46);
  const outliers = Math.floor(rand() * 0.25 * p);
  const out: number[] = [];
  for (let i = 0; i < p - outliers; i++) out.push(level + sd * gauss(rand));
  for (let i = 0; i < outliers; i++) out.push(level + (rand() < 0.5 ? -1 : 1) * sd * uniform(rand, 3, 30));
  return out;
}

describe('EQA.CONSENSUS: Algorithm A (ISO 13528:2015 annex C.3.1)', () => {
  // No published worked example of Algorithm A is recalled reliably enough to check against;
  // the checks are the independent reference above, closed forms derived by hand from the
  // algorithm's definition, and invariances.

  test('no clipping: 1, 2, 3, 4, 5 settles in 2 rounds at x* = 3, s* = 1.134·√2.5 (by hand)', () => {
    // Round 1: δ = 1.5·1.483·1 clips nothing, so x* = 3 and s* = 1.134·SD = 1.134·√2.5;
    // round 2: δ = 1.5·s* = 2.69 clips nothing either, and nothing changes.
    const c = consensus([1, 2, 3, 4, 5]);
    expect(c.robustMean).toBe(3);
    expect(Math.abs(c.robustSd - 1.134 * Math.sqrt(2.5))).toBeLessThanOrEqual(4.5e-16 * c.robustSd);
    expect(c.rounds).toBe(2);
    expect(c.participants).toBe(5);
    expect(Math.abs(c.uncertainty - (1.25 * c.robustSd) / Math.sqrt(5))).toBeLessThanOrEqual(4.5e-16 * c.uncertainty);
  });

  test('symmetric set with two outliers: x* = 0, s* = 1.134·√(60/(10 − 1.134²·2.25·2)) (by hand)', () => {
    // 0, ±1, ±2, ±3, ±4, ±20 (p = 11). By symmetry x* = 0. With ±20 clipped to ±δ, δ = 1.5·s*:
    // s*² = 1.134²·(60 + 2·δ²)/10, so s*² = 1.134²·60/(10 − 1.134²·2.25·2); δ = 6.42 lies in
    // (4, 20), so that clipping is the settled one.
    const data = [0, 1, -1, 2, -2, 3, -3, 4, -4, 20, -20];
    const s = 1.134 * Math.sqrt(60 / (10 - 1.134 ** 2 * 2.25 * 2));
    expect(1.5 * s).toBeGreaterThan(4);
    expect(1.5 * s).toBeLessThan(20);
    const c = consensus(data);
    expect(Math.abs(c.robustMean)).toBeLessThanOrEqual(1e-14 * s);
    expect(Math.abs(c.robustSd - s)).toBeLessThanOrEqual(1e-11 * s);
    expect(Math.abs(c.uncertainty - (1.25 * s) / Math.sqrt(11))).toBeLessThanOrEqual(1e-11 * s);
    // The 60-digit reference agrees.
    const ref = settledHigh(data);
    expect(Math.abs(ref.s.toNumber() - s)).toBeLessThanOrEqual(1e-15 * s);
  });

  test('first s* = 0 (more than half the results equal): the median and 0, no rounds', () => {
    const flat = (robustMean: number, participants: number) => ({ robustMean, robustSd: 0, participants, uncertainty: 0, rounds: 0 });
    expect(consensus([5, 5, 5, 7, 9])).toEqual(flat(5, 5));
    expect(consensus([4.2, 4.2, 4.2, 100])).toEqual(flat(4.2, 4));
    expect(consensus([-3, -3, -3])).toEqual(flat(-3, 3));
  });

  // Seed 1330: 60 rounds of invented participants' results (a Gaussian bulk and up to a
  // quarter far outliers, 5 to 50 results, levels from 0 to 1e4) against the settled 60-digit
  // reference: x* and s* agree to 1e-10 of s*.
  test('seeded sets with outliers agree with the independent 60-digit implementation', () => {
    const rand = mulberry32(1330);
    let worstMean = 0;
    let worstSd = 0;
    for (let k = 0; k < 60; k++) {
      const level = k % 3 === 0 ? 0 : k % 3 === 1 ? uniform(rand, 1, 100) : 1e4;
      const sd = level === 1e4 ? 0.1 : uniform(rand, 0.01, 5);
      const data = roundResults(rand, level, sd);
      const c = consensus(data);
      const ref = settledHigh(data);
      const s = ref.s.toNumber();
      worstMean = Math.max(worstMean, exact(c.robustMean).minus(ref.x).abs().toNumber() / s);
      worstSd = Math.max(worstSd, Math.abs(c.robustSd - s) / s);
      expect(c.participants).toBe(data.length);
      expect(Math.abs(c.uncertainty - (1.25 * s) / Math.sqrt(data.length))).toBeLessThanOrEqual(1e-10 * s);
    }
    expect(worstMean).toBeLessThan(1e-10);
    expect(worstSd).toBeLessThan(1e-10);
  });

  // Seed 1331: the stop rule. The engine settles in r < 1000 rounds; allowed r − 1 rounds it
  // says #NUM!; the reference's change from round r − 1 to r is below 1e-12·s* and the one
  // before is not (each within 1e-14·s* of the engine's own arithmetic).
  test('the stop rule: changes below 1e-12·s* end the rounds, fewer rounds are #NUM!', () => {
    const rand = mulberry32(1331);
    for (let k = 0; k < 20; k++) {
      const data = roundResults(rand, uniform(rand, -50, 50), uniform(rand, 0.1, 3));
      const c = consensus(data);
      expect(c.rounds).toBeGreaterThanOrEqual(1);
      expect(c.rounds).toBeLessThan(CONSENSUS_MAX_ROUNDS);
      expect(consensus(data, c.rounds)).toEqual(c);
      if (c.rounds > 1) expect(() => consensus(data, c.rounds - 1)).toThrow(num('#NUM!'));
      const t = algorithmAHigh(data, c.rounds);
      const r = c.rounds;
      const change = (i: number) =>
        D.max(t.x[i].minus(t.x[i - 1]).abs(), t.s[i].minus(t.s[i - 1]).abs()).div(t.s[i]).toNumber();
      expect(change(r)).toBeLessThan(CONSENSUS_TOLERANCE + 1e-14);
      if (r > 1) expect(change(r - 1)).toBeGreaterThanOrEqual(CONSENSUS_TOLERANCE - 1e-14);
    }
  });

  // Seed 1332: shifting every result by c shifts x* by c and leaves s*; scaling by a > 0
  // scales both; a = −1 negates x* and keeps s* (ISO 13528 Algorithm A is location and scale
  // equivariant by construction; common practice, no source). Tolerances: 1e-10 of s* plus the
  // rounding of the shifted data themselves (4·2⁻⁵³ of their size).
  test('shift, scale and sign: x* and s* follow the data', () => {
    const rand = mulberry32(1332);
    const eps = 2 ** -53;
    for (let k = 0; k < 40; k++) {
      const data = roundResults(rand, uniform(rand, -20, 20), uniform(rand, 0.05, 5));
      const base = consensus(data);
      const shift = uniform(rand, -1000, 1000);
      const shifted = consensus(data.map((v) => v + shift));
      const big = Math.max(...data.map((v) => Math.abs(v + shift)));
      const tolShift = 1e-10 * base.robustSd + 4 * eps * big * data.length;
      expect(Math.abs(shifted.robustMean - (base.robustMean + shift))).toBeLessThanOrEqual(tolShift);
      expect(Math.abs(shifted.robustSd - base.robustSd)).toBeLessThanOrEqual(tolShift);

      const a = 10 ** uniform(rand, -6, 6);
      const scaled = consensus(data.map((v) => a * v));
      expect(Math.abs(scaled.robustMean - a * base.robustMean)).toBeLessThanOrEqual(1e-10 * a * base.robustSd);
      expect(Math.abs(scaled.robustSd - a * base.robustSd)).toBeLessThanOrEqual(1e-10 * a * base.robustSd);

      const negated = consensus(data.map((v) => -v));
      expect(Math.abs(negated.robustMean + base.robustMean)).toBeLessThanOrEqual(1e-12 * base.robustSd);
      expect(Math.abs(negated.robustSd - base.robustSd)).toBeLessThanOrEqual(1e-12 * base.robustSd);
    }
  });

  // Powers of two scale every result exactly, so the rounds run on the same centred numbers:
  // the answers scale exactly, down to spreads of 1e-301 and up to results near 1e305 (which
  // also takes the pre-scaling path for results beyond 2^1000).
  test('extreme magnitudes: exact power-of-two scaling from 2^-1000 to 2^1010', () => {
    const rand = mulberry32(1333);
    const data = roundResults(rand, 12, 0.7);
    const base = consensus(data);
    for (const e of [-1000, -600, 600, 990, 1010]) {
      const f = 2 ** e;
      const c = consensus(data.map((v) => v * f));
      expect(c.robustMean).toBe(base.robustMean * f);
      expect(c.robustSd).toBe(base.robustSd * f);
      expect(c.rounds).toBe(base.rounds);
    }
  });

  test('results of ±1e308 with opposite signs: the reference value, or #NUM! when s* overflows', () => {
    const data = [-1e308, -5e307, 0, 5e307, 1e308];
    const ref = settledHigh(data);
    const c = consensus(data);
    expect(Math.abs(c.robustMean)).toBeLessThanOrEqual(1e-12 * c.robustSd);
    expect(Math.abs(c.robustSd - ref.s.toNumber())).toBeLessThanOrEqual(1e-10 * c.robustSd);
    // Here nothing is clipped and s* = 1.134·1.7e308 ≈ 1.93e308 is beyond the largest double.
    const wide = [-1.7e308, 0, 1.7e308];
    expect(settledHigh(wide).s.gt(MAX)).toBe(true);
    expect(() => consensus(wide)).toThrow(num('#NUM!'));
  });

  // A mean of 1e4 cannot be held closer than its last bit (2^-53·1e4 ≈ 1.1e-12, here 1e-4 of
  // s*): x* is right to that bit, s* (which carries no level) to 1e-10 of itself.
  test('tiny spreads around a large level keep their digits (level 1e4, spread 1e-8)', () => {
    const rand = mulberry32(1334);
    const data = roundResults(rand, 1e4, 1e-8);
    const ref = settledHigh(data);
    const c = consensus(data);
    const s = ref.s.toNumber();
    expect(exact(c.robustMean).minus(ref.x).abs().toNumber()).toBeLessThanOrEqual(2 ** -53 * 1e4 + 1e-10 * s);
    expect(Math.abs(c.robustSd - s)).toBeLessThanOrEqual(1e-10 * s);
  });

  // Algorithm A's own limit, not the implementation's: 12 results near 0 and 4 (a quarter) at
  // 1000. From the median start s* grows round by round until nothing is clipped, and x* ends
  // at the plain mean, 4000.03/16; with 3 of 15 at 1000 it stays near the bulk. The 60-digit
  // reference settles at the same places.
  test('a quarter of far outliers carries x* to the plain mean; a fifth does not', () => {
    const bulk = [0, 0.1, -0.1, 0.2, -0.2, 0.05, -0.05, 0.15, -0.15, 0.12, -0.12, 0.03];
    const quarter = [...bulk, 1000, 1000, 1000, 1000];
    const c4 = consensus(quarter);
    const plainMean = 4000.03 / 16;
    expect(Math.abs(c4.robustMean - plainMean)).toBeLessThanOrEqual(1e-12 * c4.robustSd);
    const r4 = settledHigh(quarter);
    expect(Math.abs(r4.x.toNumber() - c4.robustMean)).toBeLessThanOrEqual(1e-10 * c4.robustSd);
    expect(Math.abs(r4.s.toNumber() - c4.robustSd)).toBeLessThanOrEqual(1e-10 * c4.robustSd);
    const fifth = [...bulk, 1000, 1000, 1000];
    const c3 = consensus(fifth);
    expect(Math.abs(c3.robustMean)).toBeLessThan(0.2);
    const r3 = settledHigh(fifth);
    expect(Math.abs(r3.x.toNumber() - c3.robustMean)).toBeLessThanOrEqual(1e-10 * c3.robustSd);
  });
});

describe('EQA.CONSENSUS: bad input', () => {
  test('if given fewer than 3 results, throws #NUM! saying how many', () => {
    expect(() => consensus([])).toThrow(num('#NUM!'));
    expect(() => consensus([1, 2])).toThrow(num('#NUM!'));
    expect(() => consensus([1, 2])).toThrow(/at least 3 results \(got 2\)/);
  });

  test('if a value is not finite, throws #NUM! naming its position', () => {
    expect(() => consensus([1, NaN, 3])).toThrow(num('#NUM!'));
    expect(() => consensus([1, NaN, 3])).toThrow(/value 2/);
    expect(() => consensus([1, 2, 3, Infinity])).toThrow(/value 4/);
    expect(() => consensus([-Infinity, 2, 3])).toThrow(num('#NUM!'));
  });

  test('a set that has not settled within the allowed rounds is #NUM!, never a number', () => {
    // 3 of 8 results at 1e200, the rest within ±0.2: s* grows about a quarter a round and needs
    // about 2,000 rounds to reach them. Allowed 5,000 rounds it settles where nothing is
    // clipped, at the plain mean 3e200/8 (the limit shown above).
    const data = [0, 0.1, -0.1, 0.2, -0.2, 1e200, 1e200, 1e200];
    expect(() => consensus(data)).toThrow(num('#NUM!'));
    expect(() => consensus(data)).toThrow(/did not settle within 1000 rounds/);
    const long = consensus(data, 5000);
    expect(long.rounds).toBeGreaterThan(CONSENSUS_MAX_ROUNDS);
    expect(Math.abs(long.robustMean - 3e200 / 8)).toBeLessThanOrEqual(1e-12 * long.robustSd);
    expect(() => consensus([1, 2, 4, 8, 16, 40], 0)).toThrow(num('#NUM!'));
  });
});
