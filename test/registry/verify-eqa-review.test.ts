/**
 * The worksheet functions of verification, EQA and the review of control results, through the
 * registry as Excel and `leeway call` reach them: labels, pairing, spills and every bad-input
 * rule of the catalogue's error conventions. The numbers themselves are checked against
 * published data in the engine tests (test/engine/verify, test/engine/eqa.test.ts,
 * test/engine/qc/flags*.test.ts); here they must equal the engine's.
 */
import { evaluate } from '../../src/registry';
import type { Output } from '../../src/registry';
import { agreement, cvLimits, sigmaLimits, verifyPrecision } from '../../src/engine/verify';
import { consensus, eqaZeta, eqaZScore } from '../../src/engine/eqa';
import { controlFlags } from '../../src/engine/qc/flags';
import { parseRule } from '../../src/engine/qc/rules';

const col = (xs: readonly (number | string | null)[]) => xs.map((x) => [x]);
const code = (out: Output, r = 0, c = 0): string | undefined => {
  const v = out[r][c];
  return typeof v === 'object' ? v.error : undefined;
};
const labelled = (out: Output): Record<string, unknown> => Object.fromEntries(out[0].map((l, i) => [String(l), out[1][i]]));

describe('DATA.CVLIMITS', () => {
  test('spills Low, High equal to the engine', () => {
    const out = evaluate('DATA.CVLIMITS', [2.5, 24]);
    expect(out[0]).toEqual(['Low', 'High']);
    const l = cvLimits(2.5, 24, 0.95);
    expect(out[1]).toEqual([l.low, l.high]);
  });
  test.each([
    [[2.5, 0], '#NUM!'],
    [[2.5, -3], '#NUM!'],
    [[-1, 10], '#NUM!'],
    [[2.5, 10, 1], '#NUM!'],
    [[2.5, 10, 0], '#NUM!'],
    [['x', 10], '#VALUE!'],
    [[null, 10], '#N/A'],
  ])('bad input %j gives %s', (args, expected) => {
    expect(code(evaluate('DATA.CVLIMITS', args))).toBe(expected);
  });
});

describe('DATA.AGREEMENT', () => {
  const x = [102, 98, 110, 95, 104, 99];
  const y = [104, 97, 113, 96, 107, 98];
  test('labels in order, equal to the engine; pairs with a non-number are skipped', () => {
    const out = evaluate('DATA.AGREEMENT', [col([...x, 'n/a']), col([...y, 5])]);
    expect(out[0]).toEqual([
      'Mean difference', 'Mean difference low', 'Mean difference high', 'SD of differences', 'Lower limit', 'Lower limit low',
      'Lower limit high', 'Upper limit', 'Upper limit low', 'Upper limit high', 'Pairs',
    ]);
    const a = agreement(x, y, 'absolute', 0.95);
    expect(labelled(out)['Mean difference']).toBe(a.meanDifference);
    expect(labelled(out)['Upper limit high']).toBe(a.upperLimitHigh);
    expect(labelled(out).Pairs).toBe(6);
  });
  test('percent scale; x + y = 0 is #DIV/0!; fewer than 3 pairs #NUM!; unequal sizes #VALUE!; bad scale #VALUE!', () => {
    expect(labelled(evaluate('DATA.AGREEMENT', [col(x), col(y), 'percent']))['Mean difference']).toBe(agreement(x, y, 'percent').meanDifference);
    expect(code(evaluate('DATA.AGREEMENT', [col([1, -2, 3]), col([2, 2, 4]), 'percent']))).toBe('#DIV/0!');
    expect(code(evaluate('DATA.AGREEMENT', [col([1, 2]), col([2, 3])]))).toBe('#NUM!');
    expect(code(evaluate('DATA.AGREEMENT', [col([1, 2, 3]), col([2, 3])]))).toBe('#VALUE!');
    expect(code(evaluate('DATA.AGREEMENT', [col(x), col(y), 'ratio']))).toBe('#VALUE!');
  });
});

describe('PERF.SIGMALIMITS', () => {
  test('Sigma, Low, High equal to the engine; defaults u_bias 0 and confidence 0.95', () => {
    const out = evaluate('PERF.SIGMALIMITS', [10, 1.2, 2, 24]);
    expect(out[0]).toEqual(['Sigma', 'Low', 'High']);
    const s = sigmaLimits(10, 1.2, 2, 24, 0, 0.95);
    expect(out[1]).toEqual([s.sigma, s.low, s.high]);
  });
  test.each([
    [[10, 1, 0, 24], '#DIV/0!'],
    [[10, 1, 2, 0], '#NUM!'],
    [[10, 1, 2, 24, -1], '#NUM!'],
    [[10, 1, 2, 24, 0, 1.2], '#NUM!'],
    [[-1, 1, 2, 24], '#NUM!'],
  ])('bad input %j gives %s', (args, expected) => {
    expect(code(evaluate('PERF.SIGMALIMITS', args))).toBe(expected);
  });
});

describe('VERIFY.PRECISION and VERIFY.TRUENESS', () => {
  const values = [10.1, 10.3, 9.9, 10.6, 10.4, 10.8, 9.7, 9.9, 10.0, 10.2, 10.1, 10.4, 9.8, 10.0, 10.1];
  const days = ['d1', 'd1', 'd1', 'D2', 'd2', 'd2', 3, 3, '3', 4, 4, 4, 5, 5, 5];
  test('labels in order; text and number labels read as DATA.PRECISION reads them; equal to the engine', () => {
    const out = evaluate('VERIFY.PRECISION', [col(values), col(days), 1.5, 3]);
    expect(out[0]).toEqual([
      'Repeatability CV %', 'Repeatability claim %', 'Repeatability limit %', 'Repeatability verified', 'Within-lab CV %',
      'Within-lab claim %', 'Within-lab limit %', 'Within-lab verified', 'Repeatability df', 'Within-lab df',
    ]);
    const keys = days.map((d) => String(d).toLowerCase());
    const v = verifyPrecision(values, keys, 1.5, 3, 1);
    expect(labelled(out)['Repeatability limit %']).toBe(v.repeatabilityLimit);
    expect(labelled(out)['Within-lab verified']).toBe(v.withinLabVerified);
    expect(labelled(out)['Repeatability df']).toBe(10);
  });
  test('DATA.PRECISION spills Within-lab df last, equal to VERIFY.PRECISION\'s', () => {
    const p = evaluate('DATA.PRECISION', [col(values), col(days)]);
    expect(p[0][p[0].length - 1]).toBe('Within-lab df');
    expect(p[1][p[1].length - 1]).toBe(labelled(evaluate('VERIFY.PRECISION', [col(values), col(days), 1.5, 3]))['Within-lab df']);
  });
  test.each([
    [[0, 3], '#NUM!'],
    [[1.5, -3], '#NUM!'],
    [[1.5, 3, 0], '#NUM!'],
    [[1.5, 3, 1.5], '#NUM!'],
  ])('VERIFY.PRECISION claims/samples %j give %s', (rest, expected) => {
    expect(code(evaluate('VERIFY.PRECISION', [col(values), col(days), ...rest]))).toBe(expected);
  });
  test('one group is #NUM!; ranges that do not pair up are #VALUE!', () => {
    expect(code(evaluate('VERIFY.PRECISION', [col(values), col(values.map(() => 'a')), 1.5, 3]))).toBe('#NUM!');
    expect(code(evaluate('VERIFY.PRECISION', [col(values), col(days.slice(1)), 1.5, 3]))).toBe('#VALUE!');
    expect(code(evaluate('VERIFY.TRUENESS', [col(values), col(days.slice(1)), 10, 0.1]))).toBe('#VALUE!');
  });
  test('VERIFY.TRUENESS: an assigned value of 0 gives #DIV/0! in Bias % only', () => {
    const out = evaluate('VERIFY.TRUENESS', [col(values.map((v) => v - 10.1)), col(days), 0, 0.05]);
    const f = labelled(out);
    expect(f['Bias %']).toMatchObject({ error: '#DIV/0!' });
    expect(typeof f.Mean).toBe('number');
    expect(['yes', 'no']).toContain(f.Verified);
  });
});

describe('EQA', () => {
  test('EQA.ZSCORE and EQA.ZETA spill elementwise and equal the engine', () => {
    const z = evaluate('EQA.ZSCORE', [col([5.4, 4.6, 5.0]), 5, 0.25]);
    expect(z).toEqual([[eqaZScore(5.4, 5, 0.25)], [eqaZScore(4.6, 5, 0.25)], [0]]);
    expect(evaluate('EQA.ZSCORE', [5.4, 5, 0.25, 0.1])[0][0]).toBe(eqaZScore(5.4, 5, 0.25, 0.1));
    expect(evaluate('EQA.ZETA', [5.4, 5, 0.15, 0.05])[0][0]).toBe(eqaZeta(5.4, 5, 0.15, 0.05));
  });
  test.each([
    ['EQA.ZSCORE', [5.4, 5, 0], '#DIV/0!'],
    ['EQA.ZSCORE', [5.4, 5, -0.2], '#NUM!'],
    ['EQA.ZSCORE', [5.4, 5, 0.2, -0.1], '#NUM!'],
    ['EQA.ZETA', [5.4, 5, 0, 0], '#DIV/0!'],
    ['EQA.ZETA', [5.4, 5, -1, 0.1], '#NUM!'],
    ['EQA.ZSCORE', ['x', 5, 0.2], '#VALUE!'],
  ])('%s%j gives %s', (name, args, expected) => {
    expect(code(evaluate(name, args))).toBe(expected);
  });
  test('EQA.CONSENSUS: labels, equal to the engine, text ignored; fewer than 3 numbers #NUM!', () => {
    const xs = [5.02, 4.97, 5.1, 5.05, 4.99, 5.61, 5.03, 4.95];
    const out = evaluate('EQA.CONSENSUS', [col([...xs, 'absent', null])]);
    expect(out[0]).toEqual(['Robust mean', 'Robust SD', 'Participants', 'Uncertainty of the assigned value']);
    const c = consensus(xs);
    expect(out[1]).toEqual([c.robustMean, c.robustSd, 8, c.uncertainty]);
    expect(code(evaluate('EQA.CONSENSUS', [col([1, 2, 'x'])]))).toBe('#NUM!');
  });
});

describe('QC.FLAGS and QC.REVIEW', () => {
  const values = [101, 104.5, 104.8, 99, 93.5];
  test('QC.FLAGS spills the shape of values; a single target and SD serve every result; equal to the engine', () => {
    const out = evaluate('QC.FLAGS', [col(values), 100, 2, '1-3s/2-2s/R-4s']);
    const expected = controlFlags({ values, target: values.map(() => 100), sd: values.map(() => 2), rule: parseRule('1-3s/2-2s/R-4s') });
    expect(out).toEqual(expected.map((f) => [f]));
    expect(out.map((r) => r[0])).toEqual(['', '', '2-2s', '', '1-3s']);
    const row = evaluate('QC.FLAGS', [[values], 100, 2, '1-3s/2-2s/R-4s']);
    expect(row).toEqual([expected]);
  });
  test('a target and SD per result; blanks and text skipped with ""', () => {
    const out = evaluate('QC.FLAGS', [col([101, null, 'absent', 106.5]), col([100, 100, 100, 100]), col([2, 2, 2, 2]), '1-3s']);
    expect(out).toEqual([[''], [''], [''], ['1-3s']]);
  });
  test('run and material labels pair with values; shapes that do not pair are #VALUE!', () => {
    expect(code(evaluate('QC.FLAGS', [col(values), col([100, 100]), 2, '1-3s']))).toBe('#VALUE!');
    expect(code(evaluate('QC.FLAGS', [col(values), 100, 2, '1-3s', col([1, 2])]))).toBe('#VALUE!');
    const out = evaluate('QC.FLAGS', [col([104.5, 95.5, 100, 100]), 100, 2, 'R-4s', col([1, 1, 2, 2])]);
    expect(out.map((r) => r[0])).toEqual(['', 'R-4s', '', '']);
  });
  test.each([
    [[col(values), 100, 0, '1-3s'], '#NUM!'],
    [[col(values), 100, -2, '1-3s'], '#NUM!'],
    [[col(values), 100, 2, '1-9q'], '#VALUE!'],
    [[col(values), 100, 2, ''], '#N/A'],
    [[col(values), 'mean', 2, '1-3s'], '#VALUE!'],
  ])('QC.FLAGS bad input gives %s', (args, expected) => {
    expect(code(evaluate('QC.FLAGS', args as never))).toBe(expected);
  });
  test('QC.REVIEW: labels in order; counts of results, runs, flagged runs and results beyond 2 SD', () => {
    const out = evaluate('QC.REVIEW', [col(values), 100, 2, '1-3s/2-2s/R-4s']);
    expect(out[0]).toEqual(['Results', 'Runs', 'Runs flagged', 'Share of runs flagged', 'Expected false rejection per run', 'Mean z', 'SD of z', 'Results beyond 2 SD']);
    const f = labelled(out);
    expect(f.Results).toBe(5);
    expect(f.Runs).toBe(5);
    expect(f['Runs flagged']).toBe(2);
    expect(f['Share of runs flagged']).toBe(0.4);
    expect(f['Results beyond 2 SD']).toBe(3);
    expect(f['Mean z']).toBeCloseTo((0.5 + 2.25 + 2.4 - 0.5 - 3.25) / 5, 14);
    expect(code(evaluate('QC.REVIEW', [col(['a', null]), 100, 2, '1-3s']))).toBe('#NUM!');
  });
});
