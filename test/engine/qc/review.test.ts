/**
 * QC.REVIEW engine: the figures of a period of control results.
 */
import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { evaluateControls, ControlSeries, Entry, Label } from '../../../src/engine/qc/flags';
import { controlReview, REVIEW_FIGURES } from '../../../src/engine/qc/review';
import { falseRejectionProbability } from '../../../src/engine/qc/power';
import { parseRule } from '../../../src/engine/qc/rules';
import { LeewayError } from '../../../src/engine/errors';
import { mulberry32 } from '../../support/prng';

const Phi = (x: number): number => cdf(x, 0, 1);

function series(rule: string, z: Entry[], runs?: Label[], levels?: Label[]): ControlSeries {
  return { values: z, target: z.map(() => 0), sd: z.map(() => 1), rule: parseRule(rule), runs, levels };
}

function codeOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof LeewayError) return `${e.code} ${e.message}`;
    throw e;
  }
  throw new Error('no error');
}

describe('the review figures', () => {
  test('labels in the catalogue\'s order', () => {
    expect(REVIEW_FIGURES.map(([label]) => label)).toEqual([
      'Results',
      'Runs',
      'Runs flagged',
      'Share of runs flagged',
      'Expected false rejection per run',
      'Mean z',
      'SD of z',
      'Results beyond 2 SD',
    ]);
  });

  test('a worked period with 1-2s', () => {
    // Runs: a = (2.5, 0.5), b = (−1), c = (0.2, −2.1, 1.0), d = (blank only: not a run).
    const z: Entry[] = [2.5, 0.5, -1, 0.2, -2.1, 1.0, null];
    const r = controlReview(series('1-2s', z, ['a', 'a', 'b', 'c', 'c', 'c', 'd']));
    expect(r.results).toBe(6);
    expect(r.runs).toBe(3);
    expect(r.runsFlagged).toBe(2);
    expect(r.shareFlagged).toBeCloseTo(2 / 3, 15);
    // 1-2s with n controls: 1 − (1 − 2Φ(−2))^n (Westgard & Groth 1979 model; Φ from @stdlib).
    const fr = (n: number): number => 1 - (1 - 2 * Phi(-2)) ** n;
    const expected = (fr(2) + fr(1) + fr(3)) / 3;
    expect(Math.abs((r.expectedFalseRejection as number) - expected)).toBeLessThan(1e-12);
    const zs = [2.5, 0.5, -1, 0.2, -2.1, 1.0];
    const mean = 1.1 / 6;
    const sd = Math.sqrt(zs.reduce((a, x) => a + (x - mean) ** 2, 0) / 5);
    expect(Math.abs((r.meanZ as number) - mean)).toBeLessThan(1e-15);
    expect(Math.abs((r.sdZ as number) - sd)).toBeLessThan(1e-14);
    expect(r.beyond2Sd).toBe(2);
  });

  test('without run labels every result is a run', () => {
    const r = controlReview(series('1-3s/2-2s', [2.1, 2.2, 0, -0.5]));
    expect(r.runs).toBe(4);
    expect(r.runsFlagged).toBe(1);
    expect(r.shareFlagged).toBe(0.25);
    expect(r.expectedFalseRejection).toBe(falseRejectionProbability('1-3s/2-2s', 1, 1));
    expect(r.beyond2Sd).toBe(2);
  });

  test('the expected false rejection averages QC.FALSEREJECT over runs of different sizes', () => {
    const rule = '1-3s/2-2s/R-4s/4-1s/10-x';
    const r = controlReview(series(rule, [0, 0, 0, 0, 0, 0], [1, 1, 2, 3, 3, 3]));
    const expected = (falseRejectionProbability(rule, 2) + falseRejectionProbability(rule, 1) + falseRejectionProbability(rule, 3)) / 3;
    expect(Math.abs((r.expectedFalseRejection as number) - expected)).toBeLessThan(1e-15);
    expect(r.runsFlagged).toBe(0);
  });

  test('runs flagged counts runs with a flag anywhere, with several materials', () => {
    const rand = mulberry32(2024);
    const z: number[] = [];
    const runs: number[] = [];
    const levels: string[] = [];
    for (let r = 0; r < 300; r++) {
      for (const level of ['low', 'high']) {
        z.push(3 * (rand() - 0.5) + (r % 40 < 8 ? 1.5 : 0));
        runs.push(r);
        levels.push(level);
      }
    }
    const s = series('1-3s/2-2s/R-4s/4-1s/10-x', z, runs, levels);
    const ev = evaluateControls(s);
    const flaggedRuns = new Set(runs.filter((_r, i) => ev.flags[i] !== ''));
    const review = controlReview(s);
    expect(review.runsFlagged).toBe(flaggedRuns.size);
    expect(review.runsFlagged).toBeGreaterThan(10);
    expect(review.shareFlagged).toBe(flaggedRuns.size / 300);
    expect(review.beyond2Sd).toBe(z.filter((x) => Math.abs(x) > 2).length);
  });

  test('SD of z above 1 when the method varies more than the SD in use (seeded, 4 SE)', () => {
    // True SD 1.5 times the SD in use: SD of z estimates 1.5; SE ≈ 1.5/√(2(n − 1)) for normal
    // data (common practice, no source).
    const rand = mulberry32(1979);
    const n = 4000;
    const values: number[] = [];
    for (let i = 0; i < n; i++) {
      const u = Math.max(rand(), 1e-12);
      values.push(100 + 1.5 * 2 * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand()));
    }
    const r = controlReview({ values, target: values.map(() => 100), sd: values.map(() => 2), rule: parseRule('1-3s') });
    expect(Math.abs((r.sdZ as number) - 1.5)).toBeLessThan(4 * (1.5 / Math.sqrt(2 * (n - 1))));
    expect(Math.abs(r.meanZ as number)).toBeLessThan(4 * (1.5 / Math.sqrt(n)));
  });

  test('results beyond 2 SD read the limit as the flags do: exactly 2 SD in decimal is not beyond', () => {
    // (1.6 − 1)/0.3 computes as 2.0000000000000004.
    const r = controlReview({ values: [1.6, 0.39], target: [1, 1], sd: [0.3, 0.3], rule: parseRule('1-2s') });
    expect(r.beyond2Sd).toBe(1);
    expect(r.runsFlagged).toBe(1);
  });
});

describe('figures that cannot be computed, and bad input', () => {
  test('one result: SD of z is a #NUM! figure, the others stand', () => {
    const r = controlReview(series('1-3s', [1.2]));
    expect(r.sdZ).toBeInstanceOf(LeewayError);
    expect((r.sdZ as LeewayError).code).toBe('#NUM!');
    expect((r.sdZ as LeewayError).message).toBe('SD of z needs at least 2 control results (got 1)');
    expect(r.meanZ).toBe(1.2);
    expect(r.results).toBe(1);
  });

  test('a run of more than 100 results: the expected false rejection is a #NUM! figure naming the run', () => {
    const z = new Array(101).fill(0.1);
    const r = controlReview(series('1-3s/2-2s', [...z, 0.2], [...z.map(() => ' Big Run '), 'small']));
    expect(r.expectedFalseRejection).toBeInstanceOf(LeewayError);
    expect((r.expectedFalseRejection as LeewayError).code).toBe('#NUM!');
    expect((r.expectedFalseRejection as LeewayError).message).toMatch(/^run "Big Run" holds 101 control results: .* at most 100 results$/);
    expect(r.runs).toBe(2);
    expect(r.sdZ).toBeCloseTo(Math.sqrt((101 * 0.1 ** 2 + 0.2 ** 2 - (10.3 ** 2) / 102) / 101), 12);
  });

  test('no numbers at all: #NUM!', () => {
    expect(codeOf(() => controlReview(series('1-3s', [null, 'text'])))).toBe(
      '#NUM! values hold no numbers: a review needs at least one control result',
    );
    expect(codeOf(() => controlReview(series('1-3s', [])))).toMatch(/^#NUM!/);
  });

  test('bad entries: the errors of the flags, naming the result', () => {
    expect(codeOf(() => controlReview({ values: [1, 2], target: [0, 0], sd: [1, 0], rule: parseRule('1-3s') }))).toBe(
      '#NUM! result 2: sd must be > 0 (got 0)',
    );
  });
});
