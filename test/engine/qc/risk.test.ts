import Decimal from 'decimal.js';
import cdf from '@stdlib/stats-base-dists-normal-cdf';
import quantile from '@stdlib/stats-base-dists-normal-quantile';
import {
  clearRiskCaches,
  errorIncrease,
  errorProbability,
  expectedUnreliable,
  MAX_RUN_SIZE,
  maximumRisk,
  qcRisk,
  qcRunSize,
  riskCurve,
  uncorrectedRuns,
} from '../../../src/engine/qc/risk';
import { chainSequence, clearQcCaches, detectionProbability, survivalSequence } from '../../../src/engine/qc/power';
import { machineOf } from '../../../src/engine/qc/machine';
import { parseRule } from '../../../src/engine/qc/rules';
import { candidateRunSizes, planQc, QC_CANDIDATES } from '../../../src/engine/qc/plan';
import { LeewayError } from '../../../src/engine/errors';
import { mulberry32, uniform } from '../../support/prng';

const Phi = (x: number): number => cdf(x, 0, 1);

function codeOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    if (e instanceof LeewayError) return `${e.code} ${e.message}`;
    throw e;
  }
  return undefined;
}

// ---------------------------------------------------------------------------------------------
// High-precision reference: Φ(x) = 1/2 + φ(x)·Σ x^(2k+1)/(1·3·…·(2k+1)) (Abramowitz & Stegun
// 26.2.11, from memory) in 110-digit decimal.js arithmetic: every term has the sign of x, so the
// series loses nothing; for x down to −20 the 1/2 cancels against about 90 digits, leaving 20.
const D = Decimal.clone({ precision: 110 });
const SQRT_2PI_HIGH = D.sqrt(D.acos(-1).times(2));

function phiHigh(x: Decimal): Decimal {
  const x2 = x.times(x);
  let term = x;
  let sum = x;
  for (let k = 1; k < 5000; k++) {
    term = term.times(x2).div(2 * k + 1);
    sum = sum.plus(term);
    if (term.abs().lt(sum.abs().times('1e-108'))) break;
  }
  return new D(0.5).plus(D.exp(x2.div(-2)).div(SQRT_2PI_HIGH).times(sum));
}

/** P_E(Δ) = Φ(−(A + b)/s − Δ) + Φ(−(A − b)/s + Δ), in decimal. */
function errorProbabilityHigh(A: number, b: number, s: number, shift: Decimal): Decimal {
  const a1 = new D(A).plus(Math.abs(b)).div(s);
  const a2 = new D(A).minus(Math.abs(b)).div(s);
  return phiHigh(a1.neg().minus(shift)).plus(phiHigh(shift.minus(a2)));
}

function increaseHigh(A: number, b: number, s: number, shift: number): Decimal {
  return errorProbabilityHigh(A, b, s, new D(shift)).minus(errorProbabilityHigh(A, b, s, new D(0)));
}

/**
 * The closed form for a single-limit rule 1-Ls with n controls (the sum over events is geometric):
 * E = ΔP_E·M·((1 − P)/2 + (1 − P)²/P), P = 1 − [Φ(L − Δ) − Φ(−L − Δ)]^n the per-event
 * rejection probability (Parvin's model; the sum over events is a geometric series).
 */
function closedFormHigh(A: number, b: number, s: number, L: number, n: number, M: number, shift: number): number {
  const d = new D(shift);
  const inside = phiHigh(new D(L).minus(d)).minus(phiHigh(new D(-L).minus(d)));
  const pass = inside.pow(n);
  const P = new D(1).minus(pass);
  const W = pass.div(2).plus(pass.times(pass).div(P));
  return increaseHigh(A, b, s, shift).times(M).times(W).toNumber();
}

/** The same closed form per patient result in double precision (stdlib Φ), for the searches. */
function closedPerResult(A: number, b: number, s: number, L: number, n: number, shift: number): number {
  const a1 = (A + Math.abs(b)) / s;
  const a2 = (A - Math.abs(b)) / s;
  const dpe = Phi(-a1 - shift) + Phi(shift - a2) - (Phi(-a1) + Phi(-a2));
  const pass = Math.pow(Phi(L - shift) - Phi(-L - shift), n);
  const P = 1 - pass;
  return dpe * (pass / 2 + (pass * pass) / P);
}

/**
 * An independent maximiser: a dense grid (step 0.002 SD over (0, 10]) and golden sections on the
 * best cell to 1e-10 SD.
 */
function denseMax(f: (x: number) => number, step = 0.002): { value: number; shift: number } {
  let best = 0;
  let at = 0;
  const count = Math.round(10 / step);
  for (let i = 1; i <= count; i++) {
    const v = f(i * step);
    if (v > best) {
      best = v;
      at = i * step;
    }
  }
  let a = Math.max(0, at - step);
  let b = Math.min(10, at + step);
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = f(c);
  let fd = f(d);
  while (b - a > 1e-10) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = f(d);
    }
  }
  const x = 0.5 * (a + b);
  const v = f(x);
  return v > best ? { value: v, shift: x } : { value: best, shift: at };
}

// ---------------------------------------------------------------------------------------------

describe('ΔP_E, the share of results a shift adds beyond the allowance', () => {
  // P_E(Δ) as the model defines it (Parvin 2008), Φ from @stdlib.
  test('P_E(Δ) = Φ(−(A + b)/s − Δ) + Φ(−(A − b)/s + Δ) (absolute 1e-15)', () => {
    const rand = mulberry32(20080901);
    for (let i = 0; i < 200; i++) {
      const s = uniform(rand, 0.5, 4);
      const b = uniform(rand, -3, 3);
      const A = Math.abs(b) + s * uniform(rand, 1.7, 8);
      const d = uniform(rand, 0, 10);
      const expected = Phi(-(A + Math.abs(b)) / s - d) + Phi(-(A - Math.abs(b)) / s + d);
      expect(Math.abs(errorProbability(A, b, s, d) - expected)).toBeLessThanOrEqual(1e-15);
    }
  });

  // 110-digit decimal reference (above). Shifts from 1e-9 SD (where P_E(Δ) − P_E(0) would lose
  // all its digits in double precision) to 10 SD.
  test('agrees with the 110-digit reference to 1e-13 relative, also for tiny shifts', () => {
    const rand = mulberry32(4242);
    let worst = 0;
    for (let i = 0; i < 120; i++) {
      const s = uniform(rand, 0.5, 4);
      const b = i % 3 === 0 ? 0 : uniform(rand, -3, 3) * s;
      const A = Math.abs(b) + s * uniform(rand, 1.7, 9);
      const d = [1e-9, 1e-6, 1e-3, 0.05, uniform(rand, 0, 10)][i % 5];
      const expected = increaseHigh(A, b, s, d).toNumber();
      const got = errorIncrease(A, b, s, d);
      worst = Math.max(worst, Math.abs(got - expected) / expected);
    }
    expect(worst).toBeLessThanOrEqual(1e-13);
  });

  // dP_E/dΔ = φ((A − b)/s − Δ) − φ((A + b)/s + Δ) ≥ 0 for Δ ≥ 0 (the project's reasoning, in
  // the engine's comment): never negative, rising with the shift, 0 at no shift.
  test('is 0 at no shift, never negative and rising with the shift, also when |bias| exceeds the allowance', () => {
    const rand = mulberry32(77);
    for (let i = 0; i < 60; i++) {
      const s = uniform(rand, 0.5, 3);
      const A = uniform(rand, 0, 10);
      const b = uniform(rand, -12, 12);
      expect(errorIncrease(A, b, s, 0)).toBe(0);
      let last = 0;
      for (let d = 0.1; d <= 10; d += 0.1) {
        const v = errorIncrease(A, b, s, d);
        expect(v).toBeGreaterThanOrEqual(last * (1 - 1e-12));
        last = v;
      }
      expect(last).toBeLessThanOrEqual(1 - errorProbability(A, b, s, 0) + 1e-12);
    }
    expect(errorIncrease(0, 2, 1, 3)).toBe(0); // A = 0: every result is already beyond ±A
  });
});

describe('single-limit rules: the geometric closed form', () => {
  // Seed 2049: 1-Ls, L 2 … 3.5, n 1 … 6, runs of 1 … 500 results, sigma 1.7 … 8, shifts
  // 1e-7 … 10 SD (far beyond the limit, where passing an event is a 1e-20 chance, too).
  test('expectedUnreliable equals ΔP_E·M·((1 − P)/2 + (1 − P)²/P) in 110-digit arithmetic (1e-12 relative)', () => {
    const rand = mulberry32(2049);
    let worst = 0;
    for (let i = 0; i < 150; i++) {
      const L = [2, 2.5, 3, 3.5][i % 4];
      const n = 1 + (i % 6);
      const M = [1, 7, 100, 500][i % 4];
      const s = uniform(rand, 0.5, 3);
      const b = i % 5 === 0 ? 0 : uniform(rand, -2, 2) * s;
      const A = Math.abs(b) + s * uniform(rand, 1.7, 8);
      const d = i % 10 === 0 ? 1e-7 : i % 10 === 1 ? uniform(rand, 8, 10) : uniform(rand, 0, 10);
      const expected = closedFormHigh(A, b, s, L, n, M, d);
      const got = expectedUnreliable(A, b, s, `1-${L}s`, n, M, d);
      worst = Math.max(worst, Math.abs(got - expected) / expected);
    }
    expect(worst).toBeLessThanOrEqual(1e-12);
  });

  // The maximum of the closed form found by this file's own dense search (denseMax).
  test('QC.RISK is the closed form’s maximum (1e-6 relative) and QC.RUNSIZE the floor of maxrisk over it', () => {
    const rand = mulberry32(1954);
    let exactFloors = 0;
    for (let i = 0; i < 40; i++) {
      const L = [2, 2.5, 3, 3.5][i % 4];
      const n = 1 + (i % 4);
      const s = uniform(rand, 0.5, 3);
      const b = i % 3 === 0 ? 0 : uniform(rand, -2, 2) * s;
      const A = Math.abs(b) + s * uniform(rand, 1.8, 7);
      const maxrisk = [1, 1, 0.5, 10][i % 4];
      const peak = denseMax((d) => closedPerResult(A, b, s, L, n, d));
      const rule = `1-${L}s`;
      const got = maximumRisk(A, b, s, rule, n, 1);
      expect(Math.abs(got.maxRisk - peak.value) / peak.value).toBeLessThanOrEqual(1e-6);
      expect(Math.abs(got.argmax - peak.shift)).toBeLessThan(0.01);
      // The size is the floor of maxrisk/max; where that quotient lies within 1e-6 of a whole
      // number either neighbour is right (the maximum itself is known to 1e-6).
      const lo = Math.min(MAX_RUN_SIZE, Math.floor(maxrisk / (peak.value * (1 + 1e-6))));
      const hi = Math.min(MAX_RUN_SIZE, Math.floor(maxrisk / (peak.value * (1 - 1e-6))));
      const size = qcRunSize(A, b, s, rule, n, maxrisk);
      expect(size).toBeGreaterThanOrEqual(lo);
      expect(size).toBeLessThanOrEqual(hi);
      if (lo === hi) exactFloors++;
    }
    expect(exactFloors).toBeGreaterThanOrEqual(38);
  });

  test('the survival sequence is r, r², … with r = P(|Z + Δ| ≤ L)^n (closed form, 1e-13 relative)', () => {
    for (const [L, n, d] of [
      [3, 1, 0],
      [2.5, 4, 1.3],
      [2, 2, 4.4],
    ]) {
      const seq = survivalSequence(`1-${L}s`, n, d);
      const r = Math.pow(Phi(L - d) - Phi(-L - d), n);
      expect(seq.exact).toBe(true);
      expect(seq.survival).toHaveLength(1);
      expect(Math.abs(seq.survival[0] - r) / r).toBeLessThan(1e-13);
      expect(Math.abs(seq.tail - (r * r) / (1 - r)) / ((r * r) / (1 - r))).toBeLessThan(1e-11);
    }
  });
});

// ---------------------------------------------------------------------------------------------
// An independent simulation of Parvin's model, written here (no engine code): QC events of n
// controls x = Δ + Z; the rules checked one event at a time as their definitions read (1-3s: an
// observation beyond ±3; 2-2s: two consecutive observations beyond the same 2 SD limit, across
// events; R-4s: within one event highest minus lowest above 4; 4-1s: four consecutive beyond the
// same 1 SD limit, across events), memory empty at the shift. The shift starts at a uniformly
// random one of the M + 1 gaps between the M patient results of the run before the first event:
// U ~ uniform{0 … M} results are produced under the shift before it. With N the number of events
// that accept before the first rejection, the final (uncorrected) results produced under the shift
// number U·[N ≥ 1] + M·max(0, N − 1).

function gaussian(rand: () => number): () => number {
  let spare = 0;
  let has = false;
  return () => {
    if (has) {
      has = false;
      return spare;
    }
    let u = rand();
    while (u === 0) u = rand();
    const r = Math.sqrt(-2 * Math.log(u));
    const t = 2 * Math.PI * rand();
    spare = r * Math.sin(t);
    has = true;
    return r * Math.cos(t);
  };
}

interface Trial {
  readonly uncorrected: number;
}

function simulateRuns(withFour: boolean, n: number, shift: number, M: number, trials: number, seed: number, each: (t: Trial) => void): void {
  const rand = mulberry32(seed);
  const z = gaussian(rand);
  for (let i = 0; i < trials; i++) {
    const U = Math.floor(rand() * (M + 1));
    let last2 = 0;
    let up = 0;
    let down = 0;
    let accepted = 0;
    for (let event = 1; event <= 100000; event++) {
      let fired = false;
      let lo = Infinity;
      let hi = -Infinity;
      for (let j = 0; j < n; j++) {
        const x = shift + z();
        if (Math.abs(x) > 3) fired = true;
        const s2 = x > 2 ? 1 : x < -2 ? -1 : 0;
        if (s2 !== 0 && s2 === last2) fired = true;
        last2 = s2;
        if (withFour) {
          up = x > 1 ? up + 1 : 0;
          down = x < -1 ? down + 1 : 0;
          if (up >= 4 || down >= 4) fired = true;
        }
        lo = Math.min(lo, x);
        hi = Math.max(hi, x);
      }
      if (hi - lo > 4) fired = true;
      if (fired) break;
      accepted++;
    }
    each({ uncorrected: (accepted >= 1 ? U : 0) + M * Math.max(0, accepted - 1) });
  }
}

describe('multirules: E(Nuf) against an independent simulation of the model', () => {
  // Expectation form: E(Nuf) = ΔP_E·E[uncorrected results under the shift]; the simulation
  // estimates the expectation (seed 2008 + case), the engine computes it exactly. Agreement
  // within 5 standard errors of the simulated mean.
  // At the larger shifts most series stop at the first event, so they need more trials for the
  // same relative precision (and cost less each).
  const cases: Array<[string, number, number, number]> = [
    ['1-3s/2-2s/R-4s/4-1s', 2, 1, 60000],
    ['1-3s/2-2s/R-4s/4-1s', 2, 2, 200000],
    ['1-3s/2-2s/R-4s/4-1s', 4, 0.8, 60000],
    ['1-3s/2-2s/R-4s/4-1s', 4, 1.6, 200000],
    ['1-3s/2-2s/R-4s', 2, 1.2, 60000],
    ['1-3s/2-2s/R-4s', 2, 2.5, 200000],
    ['1-3s/2-2s/R-4s', 4, 1, 60000],
    ['1-3s/2-2s/R-4s', 4, 2, 200000],
  ];
  test.each(cases.map((c, i) => [...c, i] as const))('%s, n = %p, shift %p (%p series): within 5 SE', (rule, n, shift, trials, i) => {
    const [A, b, s, M] = [9, 1, 2, 20]; // sigma 4
    let sum = 0;
    let sum2 = 0;
    simulateRuns(rule.endsWith('4-1s'), n, shift, M, trials, 2008 + i, (t) => {
      sum += t.uncorrected;
      sum2 += t.uncorrected * t.uncorrected;
    });
    const mean = sum / trials;
    const se = Math.sqrt((sum2 / trials - mean * mean) / trials);
    const dp = errorIncrease(A, b, s, shift);
    const expected = expectedUnreliable(A, b, s, rule, n, M, shift);
    expect(Math.abs(expected - dp * mean)).toBeLessThanOrEqual(5 * dp * se);
    // and the precision is worth having: 5 SE is under 3 % of the value
    expect(5 * se).toBeLessThan(0.03 * mean);
  });

  // Patient form: each uncorrected result's error z ~ N(b/s + Δ, 1) in SD of the method; it is
  // unreliable when |z| > A/s. The shift's additional unreliable results are the count beyond
  // ±A minus the P_E(0) share the stable method gives anyway. Seed 54.
  test('counting unreliable patient results one by one agrees too (1-3s/2-2s/R-4s/4-1s, n = 2, within 5 SE)', () => {
    const [A, b, s, M, n, shift] = [3.5, 0.5, 1, 10, 2, 1.5]; // sigma 3
    const rand = mulberry32(54);
    const z = gaussian(rand);
    const pe0 = Phi(-(A + b) / s) + Phi(-(A - b) / s);
    const trials = 60000;
    let sum = 0;
    let sum2 = 0;
    simulateRuns(true, n, shift, M, trials, 55, (t) => {
      let beyond = 0;
      for (let k = 0; k < t.uncorrected; k++) if (Math.abs(b / s + shift + z()) > A / s) beyond++;
      const extra = beyond - pe0 * t.uncorrected;
      sum += extra;
      sum2 += extra * extra;
    });
    const mean = sum / trials;
    const se = Math.sqrt((sum2 / trials - mean * mean) / trials);
    expect(Math.abs(expectedUnreliable(A, b, s, '1-3s/2-2s/R-4s/4-1s', n, M, shift) - mean)).toBeLessThanOrEqual(5 * se);
    expect(5 * se).toBeLessThan(0.06 * mean);
  });

  // The maximum over the shift against this file's dense search on the engine's E(Nuf)(Δ)
  // (step 0.01 SD, golden sections to 1e-10): the located maximum is at least as large and
  // within 1e-6 of it.
  test.each([
    ['1-3s/2-2s/R-4s/4-1s', 4, 9, 1, 2],
    ['1-3s/2-2s/R-4s/4-1s', 2, 6, 0.5, 1.5],
    ['1-3s/2-2s/R-4s', 2, 12, 0, 2],
    ['1-3s/2-2s/R-4s/4-1s/10-x', 4, 3.2, 0.2, 1],
    ['2of3-2s/1-3s', 3, 7, 2, 1.2],
  ])('%s, n = %p, allowable %p, bias %p, cv %p: the maximum is located to 1e-6', (rule, n, A, b, s) => {
    const peak = denseMax((d) => expectedUnreliable(A, b, s, rule, n, 1, d), 0.01);
    const got = maximumRisk(A, b, s, rule, n, 1);
    expect(got.maxRisk).toBeGreaterThanOrEqual(peak.value * (1 - 1e-6));
    expect(got.maxRisk).toBeLessThanOrEqual(peak.value * (1 + 1e-6));
    expect(Math.abs(got.argmax - peak.shift)).toBeLessThan(0.01);
  });
});

describe('the survival sequence', () => {
  test('S_k = 1 − QC.DETECT(rule, n, Δ, k) event by event, and the tail is S_K·λ/(1 − λ) (1e-12)', () => {
    for (const [rule, n, d] of [
      ['1-3s/2-2s/R-4s/4-1s', 2, 1.5],
      ['1-3s/2-2s/R-4s', 4, 0.7],
      ['1-3s/2-2s/R-4s/4-1s/10-x', 4, 2],
      ['2of3-2s/1-3s', 3, 1],
    ] as const) {
      const seq = survivalSequence(rule, n, d);
      const K = seq.survival.length;
      seq.survival.forEach((s, k) => expect(Math.abs(s - (1 - detectionProbability(rule, n, d, k + 1)))).toBeLessThan(1e-12));
      // the rest, event by event from QC.DETECT, until it is negligible
      let rest = 0;
      for (let k = K + 1; k <= K + 400; k++) rest += 1 - detectionProbability(rule, n, d, k);
      expect(Math.abs(seq.tail - rest)).toBeLessThanOrEqual(1e-12 * Math.max(1, rest));
      expect(Math.abs(seq.survival[K - 1] * seq.factor - (1 - detectionProbability(rule, n, d, K + 1)))).toBeLessThan(1e-12);
    }
  });

  test('the tabulated run step agrees with the range integral run by run (1e-12 relative)', () => {
    for (const rule of ['1-3s/2-2s/R-4s', '1-3s/2-2s/R-4s/4-1s/10-x', '1-2.5s/R-3s/3of4-1s', 'R-3s/4-1s']) {
      const m = machineOf(parseRule(rule));
      for (const [n, d] of [
        [2, 0],
        [3, 1.1],
        [4, 2.3],
      ]) {
        const a = chainSequence(m, n, d, 1, undefined, true);
        const b = chainSequence(m, n, d, 1, undefined, false);
        if (!a || !b) throw new Error(`no sequence for ${rule}`);
        const K = Math.min(a.survival.length, b.survival.length, 60);
        for (let k = 0; k < K; k++) expect(Math.abs(a.survival[k] - b.survival[k])).toBeLessThanOrEqual(1e-12 * b.survival[k]);
      }
    }
  });

  test('a rule that cannot reject gives an infinite sum: QC.RISK #NUM!, QC.RUNSIZE 0', () => {
    // R-4s reads one run at a time: with one control per run it never fires.
    expect(survivalSequence('R-4s', 1, 2).tail).toBe(Infinity);
    expect(uncorrectedRuns('R-4s', 1, 2)).toBe(Infinity);
    expect(codeOf(() => qcRisk(8, 0, 1, 'R-4s', 1, 10))).toMatch(/^#NUM! rule "R-4s" with n = 1 almost never rejects/);
    expect(qcRunSize(8, 0, 1, 'R-4s', 1)).toBe(0);
  });
});

// ---------------------------------------------------------------------------------------------
const RULES: Array<[string, number]> = [
  ['1-3s', 1],
  ['1-2.5s', 2],
  ['1-3s/2-2s/R-4s', 2],
  ['1-3s/2-2s/R-4s', 4],
  ['1-3s/2-2s/R-4s/4-1s', 2],
  ['1-3s/2-2s/R-4s/4-1s', 4],
];

describe('properties', () => {
  test('QC.RISK is linear in the run size (exactly: M times the per-result maximum)', () => {
    const rand = mulberry32(31);
    for (let i = 0; i < 30; i++) {
      const [rule, n] = RULES[i % RULES.length];
      const A = uniform(rand, 4, 12);
      const M = 1 + Math.floor(rand() * 5000);
      const one = qcRisk(A, 0.5, 1.5, rule, n, 1);
      expect(qcRisk(A, 0.5, 1.5, rule, n, M)).toBe(M * one);
      const d = uniform(rand, 0, 5);
      expect(Math.abs(expectedUnreliable(A, 0.5, 1.5, rule, n, M, d) - M * expectedUnreliable(A, 0.5, 1.5, rule, n, 1, d))).toBeLessThanOrEqual(
        1e-15 * M * expectedUnreliable(A, 0.5, 1.5, rule, n, 1, d),
      );
    }
  });

  // Parvin 2008: better methods (higher sigma) carry less risk. Sigma raised two ways: by the
  // allowance and by the CV; from just above 1.65 (below that the risk functions refuse).
  test('QC.RISK falls as sigma rises, by a larger allowance or a smaller CV', () => {
    for (const [rule, n] of RULES) {
      for (const bs of [0, 1, 3]) {
        let last = Infinity;
        for (let sigma = 1.7; sigma <= 8; sigma += 0.25) {
          const r = qcRisk(bs + sigma, bs, 1, rule, n, 1);
          expect(r).toBeLessThanOrEqual(last * (1 + 1e-12));
          last = r;
        }
      }
      let prev = Infinity;
      for (let cv = 2.9; cv >= 0.8; cv -= 0.1) {
        const r = qcRisk(6, 1, cv, rule, n, 1); // sigma 5/cv: 1.72 … 6.25
        expect(r).toBeLessThanOrEqual(prev * (1 + 1e-12));
        prev = r;
      }
    }
  });

  test('QC.RUNSIZE never falls as the allowance rises and never rises as the CV rises (from 0 upward)', () => {
    for (const [rule, n] of RULES) {
      for (const bs of [0, 1.5]) {
        let last = -1;
        for (let sigma = 0; sigma <= 9; sigma += 0.2) {
          const size = qcRunSize(bs + sigma, bs, 1, rule, n);
          expect(size).toBeGreaterThanOrEqual(last);
          last = size;
        }
        expect(last).toBeGreaterThan(0);
      }
      let prev = Infinity;
      for (let cv = 0.5; cv <= 8; cv += 0.25) {
        const size = qcRunSize(7, 1, cv, rule, n, 10);
        expect(size).toBeLessThanOrEqual(prev);
        prev = size;
      }
      expect(prev).toBe(0);
    }
  });

  // More controls per QC event: (a) the same rule with more controls (its false rejection rises
  // too); (b) single-limit rules with the limit set so that every n has the same false rejection
  // per event α: L_n = Φ⁻¹((1 + (1 − α)^(1/n))/2). In (b) the per-event survival with n + 1
  // controls is below that with n at every shift in (0, 10] (checked on a 0.005 SD grid for
  // α 1e-4 … 0.3 and n ≤ 12 while writing this test), so the run size cannot fall. Common
  // practice, no source: more controls detect more. maxrisk 100 to resolve small run sizes.
  test('more controls never give a smaller run size: the same rule, and single-limit rules at the same false rejection', () => {
    for (const rule of ['1-3s/2-2s/R-4s', '1-3s/2-2s/R-4s/4-1s', '1-2.5s', '2of3-2s/1-3s']) {
      for (const sigma of [2, 3, 4, 5, 6]) {
        let last = -1;
        for (let n = 1; n <= 6; n++) {
          const size = qcRunSize(sigma + 0.5, 0.5, 1, rule, n, 100);
          expect(size).toBeGreaterThanOrEqual(last);
          last = size;
        }
      }
    }
    for (const alpha of [0.002, 0.01, 0.05]) {
      for (const sigma of [2, 3, 4, 5, 6]) {
        let last = -1;
        for (let n = 1; n <= 8; n++) {
          const L = quantile((1 + Math.pow(1 - alpha, 1 / n)) / 2, 0, 1);
          const size = qcRunSize(sigma, 0, 1, `1-${L}s`, n, 100);
          expect(size).toBeGreaterThanOrEqual(last);
          last = size;
        }
      }
    }
  });

  // The rounding guard: QC.RUNSIZE is the largest M with QC.RISK(…, M) ≤ maxrisk, in the very
  // numbers QC.RISK returns, also where maxrisk/max is (close to) a whole number.
  test('QC.RISK at the run size is within maxrisk, one more result is not (seeded, and at exact quotients)', () => {
    const rand = mulberry32(99);
    for (let i = 0; i < 60; i++) {
      const [rule, n] = RULES[i % RULES.length];
      const A = uniform(rand, 5, 14);
      const maxrisk = [1, 0.3, 2.5][i % 3];
      const size = qcRunSize(A, 0.4, 1.2, rule, n, maxrisk);
      if (size > 0) expect(qcRisk(A, 0.4, 1.2, rule, n, size)).toBeLessThanOrEqual(maxrisk);
      if (size < MAX_RUN_SIZE) expect(qcRisk(A, 0.4, 1.2, rule, n, size + 1)).toBeGreaterThan(maxrisk);
    }
    // maxrisk exactly 37 times the per-result maximum (as QC.RISK computes it): 37, not 36.
    for (const [rule, n] of RULES) {
      const per = qcRisk(8, 0.5, 1.5, rule, n, 1);
      expect(qcRunSize(8, 0.5, 1.5, rule, n, 37 * per)).toBe(37);
    }
  });

  test('a very good method reaches the cap of 1,000,000; the sign of the bias does not matter', () => {
    expect(qcRunSize(60, 0, 1, '1-3s', 1)).toBe(MAX_RUN_SIZE);
    expect(qcRisk(60, 0, 1, '1-3s', 1, 1000)).toBeLessThan(1e-12);
    expect(qcRisk(9, -1.5, 2, '1-3s/2-2s/R-4s', 2, 40)).toBe(qcRisk(9, 1.5, 2, '1-3s/2-2s/R-4s', 2, 40));
    expect(qcRunSize(9, -1.5, 2, '1-3s/2-2s/R-4s', 2)).toBe(qcRunSize(9, 1.5, 2, '1-3s/2-2s/R-4s', 2));
  });

  test('cached and cold give the same numbers, whatever the spelling of the rule', () => {
    clearQcCaches();
    clearRiskCaches();
    const cold = maximumRisk(7, 1, 1.3, '1-3s/2-2s/R-4s/4-1s', 4, 25);
    const warm = maximumRisk(7, 1, 1.3, '1-3s/2-2s/R-4s/4-1s', 4, 25);
    clearQcCaches();
    clearRiskCaches();
    const again = maximumRisk(7, 1, 1.3, ' 4_1S/r-4s/2-2s/1-3s ', 4, 25);
    expect(warm).toEqual(cold);
    expect(again).toEqual(cold);
  });

  test('riskCurve: E(Nuf) point by point and the located maximum above every point', () => {
    const curve = riskCurve(8, 1, 1.5, '1-3s/2-2s/R-4s', 2, 30);
    expect(curve.points).toHaveLength(41);
    expect(curve.points[0]).toEqual({ shift: 0, risk: 0 });
    for (const p of curve.points) {
      expect(p.risk).toBe(expectedUnreliable(8, 1, 1.5, '1-3s/2-2s/R-4s', 2, 30, p.shift));
      expect(p.risk).toBeLessThanOrEqual(curve.maxRisk);
    }
    expect(curve.maxRisk).toBe(qcRisk(8, 1, 1.5, '1-3s/2-2s/R-4s', 2, 30));
    const own = riskCurve(8, 1, 1.5, '1-3s/2-2s/R-4s', 2, 30, [0.5, 1.5, 2.5]);
    expect(own.points.map((p) => p.shift)).toEqual([0.5, 1.5, 2.5]);
  });
});

describe('a method that fails its allowance without a shift (sigma ≤ 1.65)', () => {
  // Below sigma 1.65 the count of ADDITIONAL unreliable results falls as the method gets worse
  // (P_E(0) → 1): with A = 0.1·CV and no bias, one control and 1-2s, the model would allow a run
  // of 12 results, more than at sigma 0.5 (0). The risk functions refuse instead.
  test('QC.RISK and E(Nuf) give #NUM! saying so; QC.RUNSIZE gives 0; just above 1.65 they work', () => {
    for (const [A, b, s] of [
      [3, 2.5, 1], // sigma 0.5
      [2, 3, 1], // |bias| beyond the allowance
      [0, 0, 1], // no allowance
      [1.65, 0, 1], // sigma exactly 1.65
      [0.1, 0, 1],
    ]) {
      expect(codeOf(() => qcRisk(A, b, s, '1-2s', 1, 1))).toMatch(/^#NUM! the method fails its allowable error without any shift: sigma/);
      expect(codeOf(() => expectedUnreliable(A, b, s, '1-3s', 2, 5, 1))).toMatch(/^#NUM! the method fails its allowable error/);
      expect(codeOf(() => riskCurve(A, b, s, '1-3s', 2, 5))).toMatch(/^#NUM! the method fails/);
      expect(qcRunSize(A, b, s, '1-2s', 1)).toBe(0);
      expect(qcRunSize(A, b, s, '1-3s/2-2s/R-4s/4-1s', 4, 1000)).toBe(0);
    }
    expect(qcRisk(1.66, 0, 1, '1-3s', 1, 1)).toBeGreaterThan(0);
  });

  test('QC.PLAN then shows run size 0', () => {
    expect(planQc(3, 2.5, 1).runSize).toBe(0);
    expect(planQc(1.6, 0, 1).runSize).toBe(0);
  });
});

describe('QC.PLAN run size', () => {
  test('is QC.RUNSIZE of the chosen rule and n; candidateRunSizes gives every candidate’s', () => {
    for (const [A, b, s] of [
      [12, 1.5, 1.75],
      [7, 1, 1.5],
      [5, 0.5, 1],
      [3.4, 0.2, 1],
      [40, 0, 1],
    ]) {
      const plan = planQc(A, b, s);
      expect(plan.runSize).toBe(qcRunSize(A, b, s, plan.rule, plan.n, 1));
      const sizes = candidateRunSizes(A, b, s);
      expect(sizes).toHaveLength(QC_CANDIDATES.length);
      QC_CANDIDATES.forEach((c, i) => expect(sizes[i]).toBe(qcRunSize(A, b, s, c.rule, c.n)));
    }
    expect(candidateRunSizes(7, 1, 1.5, [{ rule: '1-3s', n: 2, runs: 1 }], 10)).toEqual([qcRunSize(7, 1, 1.5, '1-3s', 2, 10)]);
  });
});

describe('bad input', () => {
  test.each([
    ['runsize 0', () => qcRisk(8, 0, 1, '1-3s', 2, 0), /^#NUM! runsize must be at least 1/],
    ['runsize 2.5', () => qcRisk(8, 0, 1, '1-3s', 2, 2.5), /^#NUM! runsize must be a whole number \(got 2.5\)/],
    ['runsize −3', () => qcRisk(8, 0, 1, '1-3s', 2, -3), /^#NUM! runsize must be a whole number|^#NUM! runsize must be at least 1/],
    ['runsize NaN', () => expectedUnreliable(8, 0, 1, '1-3s', 2, NaN, 1), /^#NUM! runsize must be a whole number/],
    ['runsize 1e7', () => qcRisk(8, 0, 1, '1-3s', 2, 1e7), /^#NUM! runsize must be at most 1000000 \(got 10000000\)/],
    ['maxrisk 0', () => qcRunSize(8, 0, 1, '1-3s', 2, 0), /^#NUM! maxrisk must be a finite number > 0 \(got 0\)/],
    ['maxrisk −1', () => qcRunSize(8, 0, 1, '1-3s', 2, -1), /^#NUM! maxrisk must be a finite number > 0/],
    ['maxrisk Infinity', () => qcRunSize(8, 0, 1, '1-3s', 2, Infinity), /^#NUM! maxrisk/],
    ['cv 0', () => qcRisk(8, 0, 0, '1-3s', 2, 10), /^#DIV\/0! cv must not be zero/],
    ['cv −1', () => qcRunSize(8, 0, -1, '1-3s', 2), /^#NUM! cv must be a finite number > 0/],
    ['allowable −1', () => qcRunSize(-1, 0, 1, '1-3s', 2), /^#NUM! allowable must be a finite number ≥ 0/],
    ['bias NaN', () => qcRisk(8, NaN, 1, '1-3s', 2, 10), /^#NUM! bias must be a finite number/],
    ['n 0', () => qcRisk(8, 0, 1, '1-3s', 0, 10), /^#NUM! n must be at least 1/],
    ['n 101', () => qcRunSize(8, 0, 1, '1-3s', 101), /^#NUM! n must be at most 100/],
    ['n 1.5', () => qcRunSize(8, 0, 1, '1-3s', 1.5), /^#NUM! n must be a whole number/],
    ['a bad rule', () => qcRisk(8, 0, 1, '1-3s/2-2x', 2, 10), /^#VALUE! rule term "2-2x"/],
    ['shift −1', () => expectedUnreliable(8, 0, 1, '1-3s', 2, 10, -1), /^#NUM! shift must be a finite number ≥ 0/],
    ['shift Infinity', () => errorIncrease(8, 0, 1, Infinity), /^#NUM! shift/],
  ])('%s: the Excel error with a message', (_what, call, message) => {
    expect(codeOf(call)).toMatch(message);
  });
});
