import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { perRunRejection, planQc, QC_CANDIDATES, QcPlan } from '../../../src/engine/qc/plan';
import { detectionProbability, falseRejectionProbability } from '../../../src/engine/qc/power';
import { LeewayError } from '../../../src/engine/errors';
import { mulberry32, uniform } from '../../support/prng';

const Phi = (x: number): number => cdf(x, 0, 1);

/**
 * The plan's selection rule, written out again: detection at the critical shift
 * (allowable − |bias|)/CV − 1.65, false rejection per run 1 − (1 − P_fr)^(1/runs); among those
 * meeting both, lowest n, then fewest runs, then lowest false rejection, then list order; else
 * the highest detection. Single rules use the stdlib closed form, multirules the engine.
 */
function expectedPlan(allowable: number, bias: number, cv: number, target: number, limit: number) {
  const shift = (allowable - Math.abs(bias)) / cv - 1.65;
  const at = Math.max(shift, 0);
  const rows = QC_CANDIDATES.map((c, index) => {
    const single = /^1-([\d.]+)s$/.exec(c.rule);
    const k = single ? Number(single[1]) : NaN;
    const det = single
      ? 1 - Math.pow(Phi(k - at) - Phi(-k - at), c.n * c.runs)
      : detectionProbability(c.rule, c.n, at, c.runs);
    const frAll = single ? 1 - Math.pow(Phi(k) - Phi(-k), c.n * c.runs) : falseRejectionProbability(c.rule, c.n, c.runs);
    const fr = 1 - Math.pow(1 - frAll, 1 / c.runs);
    return { ...c, index, det, fr };
  });
  const meeting = rows
    .filter((r) => shift > 0 && r.det >= target && r.fr <= limit)
    .sort((a, b) => a.n - b.n || a.runs - b.runs || a.fr - b.fr || a.index - b.index);
  if (meeting.length) return { ...meeting[0], met: true };
  const best = rows.reduce((a, b) => (b.det > a.det ? b : a));
  return { ...best, met: false };
}

function sameAs(plan: QcPlan, e: ReturnType<typeof expectedPlan>): void {
  expect(plan.rule).toBe(e.rule);
  expect(plan.n).toBe(e.n);
  expect(plan.runs).toBe(e.runs);
  expect(plan.targetMet).toBe(e.met);
  expect(Math.abs(plan.detection - e.det)).toBeLessThan(1e-9);
  expect(Math.abs(plan.falseRejectionPerRun - e.fr)).toBeLessThan(1e-9);
}

describe('QC.PLAN picks by its documented order of candidates', () => {
  test('on a grid of sigma 1.0 … 8.0 (step 0.05), bias 0, CV 1', () => {
    for (let i = 0; i <= 140; i++) {
      const sigma = 1 + i * 0.05;
      sameAs(planQc(sigma, 0, 1), expectedPlan(sigma, 0, 1, 0.9, 0.05));
    }
  });

  // Seed 5251: other targets, limits, biases and CVs.
  test('on 150 seeded cases with other targets and limits', () => {
    const rand = mulberry32(5251);
    for (let i = 0; i < 150; i++) {
      const cv = uniform(rand, 0.5, 5);
      const bias = uniform(rand, -3, 3);
      const allowable = Math.abs(bias) + cv * uniform(rand, 1, 8);
      const target = [0.5, 0.8, 0.9, 0.95, 0.99][i % 5];
      const limit = [0.005, 0.01, 0.02, 0.05, 0.1][Math.floor(i / 5) % 5];
      sameAs(planQc(allowable, bias, cv, target, limit), expectedPlan(allowable, bias, cv, target, limit));
    }
  });

  // Common practice, no source: at six sigma one control and a simple rule suffice.
  test('at sigma ≥ 6 the plan is a single rule with one control', () => {
    for (let sigma = 6; sigma <= 12; sigma += 0.25) {
      const p = planQc(sigma * 2, 0, 2);
      expect(p.rule).not.toContain('/');
      expect(p.n).toBe(1);
      expect(p.runs).toBe(1);
      expect(p.targetMet).toBe(true);
    }
  });

  // Common practice, no source: below about sigma 3 no candidate reaches 90 % detection.
  test('below sigma 3 the target is reported as not met, with the most sensitive candidate', () => {
    for (let sigma = 0.5; sigma < 3; sigma += 0.1) {
      const p = planQc(sigma, 0, 1);
      expect(p.targetMet).toBe(false);
      expect(p.detection).toBeLessThan(0.9);
      expect(p.rule).toBe('1-3s/2-2s/R-4s/4-1s/10-x');
    }
  });

  // Worked by hand with the stdlib Φ: sigma 6 → critical shift 4.35; 1-3.5s with one control
  // detects Φ(0.85) + Φ(−7.85) ≈ 0.80 (not enough), 1-3s detects Φ(1.35) + Φ(−7.35) ≈ 0.911.
  test('sigma 6: 1-3s with one control, detection Φ(1.35) + Φ(−7.35), false rejection 2Φ(−3)', () => {
    const p = planQc(12, 1.5, 1.75); // (12 − 1.5)/1.75 = 6
    expect(p.rule).toBe('1-3s');
    expect(Math.abs(p.criticalShift - 4.35)).toBeLessThan(1e-12);
    expect(Math.abs(p.detection - (Phi(1.35) + Phi(-7.35)))).toBeLessThan(1e-12);
    expect(Math.abs(p.falseRejectionPerRun - 2 * Phi(-3))).toBeLessThan(1e-12);
  });

  test('the sign of the bias does not matter; a method failing with no shift meets nothing', () => {
    expect(planQc(10, -2, 1.5)).toEqual(planQc(10, 2, 1.5));
    const failing = planQc(3, 2.5, 1); // sigma 0.5
    expect(failing.criticalShift).toBeLessThan(0);
    expect(failing.targetMet).toBe(false);
    expect(planQc(1.65, 0, 1, 0.001, 0.5).targetMet).toBe(false); // critical shift exactly 0
  });

  test('false rejection per run undoes the runs: 1 − (1 − p)^(1/runs)', () => {
    expect(perRunRejection(1 - 0.9 ** 3, 3)).toBeCloseTo(0.1, 14);
    expect(perRunRejection(0.2, 1)).toBeCloseTo(0.2, 15);
    expect(perRunRejection(1, 4)).toBe(1);
  });

  test.each([
    ['target 0', () => planQc(10, 0, 2, 0), /^#NUM! target must be a probability strictly between 0 and 1/],
    ['target 1', () => planQc(10, 0, 2, 1), /^#NUM! target/],
    ['limit 0', () => planQc(10, 0, 2, 0.9, 0), /^#NUM! limit must be a probability/],
    ['limit 1.5', () => planQc(10, 0, 2, 0.9, 1.5), /^#NUM! limit/],
    ['cv 0', () => planQc(10, 0, 0), /^#DIV\/0! cv/],
    ['cv −1', () => planQc(10, 0, -1), /^#NUM! cv/],
    ['allowable −1', () => planQc(-1, 0, 1), /^#NUM! allowable/],
  ])('%s: the Excel error with a message', (_w, call, message) => {
    let got = '';
    try {
      call();
    } catch (e) {
      if (e instanceof LeewayError) got = `${e.code} ${e.message}`;
    }
    expect(got).toMatch(message);
  });
});
