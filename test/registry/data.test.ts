/**
 * DATA and MU families through the registry (evaluate), as both front ends call them, and a
 * --lines round trip through the built command line.
 */
import { execFileSync, spawnSync } from 'child_process';
import * as path from 'path';
import { evaluate } from '../../src/registry';
import { callFunction } from '../../src/cli/call';
import type { Arg, Output } from '../../src/registry';
import type { ErrorCell, Grid } from '../../src/registry/types';

const col = (...v: Array<number | string | boolean | null>): Grid => v.map((x) => [x]);
const one = (name: string, ...args: Arg[]) => evaluate(name, args)[0][0];
const codeOf = (name: string, ...args: Arg[]): string | undefined => {
  const v = one(name, ...args);
  return typeof v === 'object' ? (v as ErrorCell).error : undefined;
};

function noBadNumbers(out: Output): void {
  for (const row of out) for (const v of row) if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
}

const SEN_X = col(1, 2, 3, 4, 10, 12, 18);
const SEN_Y = col(9, 15, 19, 20, 45, 55, 78);

describe('DATA.CV', () => {
  // Common practice, no source: 2, 4, 4, 4, 5, 5, 7, 9: mean 5, SD √(32/7).
  test('text, logicals and blanks in the range are ignored', () => {
    const v = one('DATA.CV', col(2, 4, 'n/a', 4, null, 4, 5, true, 5, 7, '', 9));
    expect(Math.abs((v as number) - (100 * Math.sqrt(32 / 7)) / 5)).toBeLessThanOrEqual(1e-13);
  });
  test('if the range holds fewer than 2 numbers, returns #NUM!', () => {
    expect(codeOf('DATA.CV', col(5, 'x', null))).toBe('#NUM!');
  });
  test('if the mean is zero, returns #DIV/0!', () => {
    expect(codeOf('DATA.CV', col(-2, 2))).toBe('#DIV/0!');
  });
  test('if values is missing, returns #N/A', () => {
    expect(codeOf('DATA.CV')).toBe('#N/A');
  });
});

describe('DATA.BIAS and DATA.RMSBIAS', () => {
  test('pairs cell by cell, skipping a pair when either side is text or blank', () => {
    // Pairs kept: (102, 100), (99, 100) → biases +2, −1: mean 0.5, RMS √2.5.
    const r = col(102, 'x', 99, null, 50);
    const t = col(100, 100, 100, 100, 'pending');
    expect(one('DATA.BIAS', r, t)).toBeCloseTo(0.5, 13);
    expect(Math.abs((one('DATA.RMSBIAS', r, t) as number) - Math.sqrt(2.5))).toBeLessThanOrEqual(1e-13);
  });
  test('rows and columns of the same size pair up', () => {
    expect(one('DATA.BIAS', [[110, 90]], col(100, 100))).toBeCloseTo(0, 13);
  });
  test('if the ranges differ in size, returns #VALUE!', () => {
    expect(codeOf('DATA.BIAS', col(1, 2, 3), col(1, 2))).toBe('#VALUE!');
    expect(codeOf('DATA.RMSBIAS', col(1, 2, 3), col(1, 2))).toBe('#VALUE!');
  });
  test('if a target is zero, returns #DIV/0!', () => {
    expect(codeOf('DATA.BIAS', col(1, 2), col(1, 0))).toBe('#DIV/0!');
    expect(codeOf('DATA.RMSBIAS', col(1, 2), col(0, 2))).toBe('#DIV/0!');
  });
  test('if no pair holds two numbers, returns #NUM!', () => {
    expect(codeOf('DATA.BIAS', col('a', 2), col(1, null))).toBe('#NUM!');
  });
  // Nordtest TR 537 §6.1 single CRM (second-hand, quoted from a summary of the handbook): 11.9 against 11.5 → 3.48 %.
  test('one pair is enough (a single reference material)', () => {
    expect(Math.abs((one('DATA.BIAS', 11.9, 11.5) as number) - 3.48)).toBeLessThan(0.005);
  });
});

describe('DATA.PRECISION', () => {
  const LABELS = ['Mean', 'Repeatability SD', 'Between-group SD', 'Within-lab SD', 'Repeatability CV %', 'Within-lab CV %', 'Groups', 'Results', 'Within-lab df'];

  // Common practice, no source: runs {1, 2}, {3, 4}, {5, 6}: MS_within 0.5, MS_between 8,
  // n₀ = 2, between variance 3.75.
  test('spills the documented labels, in order, then the values', () => {
    const out = evaluate('DATA.PRECISION', [col(1, 2, 3, 4, 5, 6), col('A', 'A', 'B', 'B', 'C', 'C')]);
    expect(out.length).toBe(2);
    expect(out[0]).toEqual(LABELS);
    const [m, sr, sb, swl, cvr, cvwl, k, n, df] = out[1] as number[];
    // Satterthwaite (Biometrics Bulletin 1946;2:110–4) by hand: s_WL² = 8/2 + (1 − 1/2)·0.5 = 4.25,
    // ν = 4.25² / [(8/2)²/2 + (0.25)²/3] = 18.0625 / 8.0208333….
    expect(Math.abs(df - 18.0625 / (8 + 0.0625 / 3))).toBeLessThanOrEqual(1e-13);
    expect(m).toBe(3.5);
    expect(Math.abs(sr - Math.sqrt(0.5))).toBeLessThanOrEqual(1e-15);
    expect(Math.abs(sb - Math.sqrt(3.75))).toBeLessThanOrEqual(1e-14);
    expect(Math.abs(swl - Math.sqrt(4.25))).toBeLessThanOrEqual(1e-14);
    expect(Math.abs(cvr - (100 * Math.sqrt(0.5)) / 3.5)).toBeLessThanOrEqual(1e-13);
    expect(Math.abs(cvwl - (100 * Math.sqrt(4.25)) / 3.5)).toBeLessThanOrEqual(1e-13);
    expect([k, n]).toEqual([3, 6]);
  });

  test('run labels may be numbers or text (trimmed, any case); blank labels and text values are skipped', () => {
    const a = evaluate('DATA.PRECISION', [col(1, 2, 3, 4, 5, 6), col(1, 1, 2, 2, 3, 3)]);
    const b = evaluate('DATA.PRECISION', [
      col(1, 2, 3, 'lost', 4, 5, 99, 6),
      col('1', 1, ' Day 2', 'Day 2', 'day 2 ', 'x', null, 'X'),
    ]);
    expect(b[1]).toEqual(a[1]);
  });

  test('a group with a single result is allowed and counts', () => {
    const out = evaluate('DATA.PRECISION', [col(1, 2, 3, 5, 7, 10), col('a', 'a', 'a', 'b', 'b', 'c')]);
    expect(out[1][6]).toBe(3);
    expect(out[1][7]).toBe(6);
    // Hand-checked (see test/engine/data/precision.test.ts): between variance 152/11.
    expect(Math.abs((out[1][2] as number) - Math.sqrt(152 / 11))).toBeLessThanOrEqual(1e-14);
  });

  test('if the ranges differ in size, returns #VALUE!', () => {
    expect(codeOf('DATA.PRECISION', col(1, 2, 3, 4), col(1, 1, 2))).toBe('#VALUE!');
  });
  test('if there are fewer than 2 groups, returns #NUM!', () => {
    expect(codeOf('DATA.PRECISION', col(1, 2, 3), col('a', 'a', 'a'))).toBe('#NUM!');
  });
  test('if there are fewer than 2 results, returns #NUM!', () => {
    expect(codeOf('DATA.PRECISION', col(1, 'x'), col('a', 'b'))).toBe('#NUM!');
  });
  test('a zero mean gives #DIV/0! in the two CV cells only', () => {
    const out = evaluate('DATA.PRECISION', [col(-1, -2, 1, 2), col(1, 1, 2, 2)]);
    expect(out[1][0]).toBe(0);
    expect((out[1][4] as ErrorCell).error).toBe('#DIV/0!');
    expect((out[1][5] as ErrorCell).error).toBe('#DIV/0!');
    expect(typeof out[1][1]).toBe('number');
  });
});

describe('DATA.COMPARE', () => {
  const LABELS = ['Slope', 'Slope low 95%', 'Slope high 95%', 'Intercept', 'Intercept low 95%', 'Intercept high 95%', 'Bias at level', 'Bias at level %'];

  // Sen PK, JASA 1968 (test/fixtures/method-comparison/README.md): Passing–Bablok slope 4, intercept 6. Its 95 % ranks
  // are the same as the published 93 % ones here (M₁ = 4 either way): 26/7 and 35/8.
  test('Passing–Bablok by default: documented labels in order; the bias cells are "" without a level', () => {
    const out = evaluate('DATA.COMPARE', [SEN_X, SEN_Y]);
    expect(out[0]).toEqual(LABELS);
    const v = out[1];
    expect(v[0]).toBe(4);
    expect(v[3]).toBe(6);
    expect(Math.abs((v[1] as number) - 26 / 7)).toBeLessThanOrEqual(1e-15);
    expect(Math.abs((v[2] as number) - 35 / 8)).toBeLessThanOrEqual(1e-15);
    expect(v[6]).toBe('');
    expect(v[7]).toBe('');
  });

  test('bias at a level: intercept + (slope − 1)·level, and as percent of the level', () => {
    const v = evaluate('DATA.COMPARE', [SEN_X, SEN_Y, 'pb', 10])[1];
    expect(v[6]).toBe(6 + 3 * 10);
    expect(v[7]).toBeCloseTo(360, 12);
  });

  test('method words: case-insensitive, with aliases; deming takes a ratio; ols', () => {
    const pb = evaluate('DATA.COMPARE', [SEN_X, SEN_Y, 'passing-bablok'])[1];
    for (const w of ['Passing-Bablok', 'PB', 'passing_bablok', ' passing bablok ']) {
      expect(evaluate('DATA.COMPARE', [SEN_X, SEN_Y, w])[1]).toEqual(pb);
    }
    const d1 = evaluate('DATA.COMPARE', [SEN_X, SEN_Y, 'DEMING'])[1];
    const d4 = evaluate('DATA.COMPARE', [SEN_X, SEN_Y, 'deming', null, 4])[1];
    expect(d1[0]).not.toBe(d4[0]);
    const ols = evaluate('DATA.COMPARE', [SEN_X, SEN_Y, 'OLS'])[1];
    // OLS slope by hand (common practice): Sxy/Sxx = 1130/281 for these data.
    expect(Math.abs((ols[0] as number) - 1130 / 281)).toBeLessThanOrEqual(1e-14);
    // A blank method cell takes the default.
    expect(evaluate('DATA.COMPARE', [SEN_X, SEN_Y, [['']]])[1]).toEqual(pb);
  });

  test('if the method word is unknown, returns #VALUE! naming the accepted words', () => {
    const v = one('DATA.COMPARE', SEN_X, SEN_Y, 'theil-sen') as ErrorCell;
    expect(v.error).toBe('#VALUE!');
    expect(v.message).toMatch(/passing-bablok.*deming.*ols/);
  });
  test('if the method is a range of several cells, returns #VALUE!', () => {
    expect(codeOf('DATA.COMPARE', SEN_X, SEN_Y, [['pb', 'ols']])).toBe('#VALUE!');
  });
  test('if the ranges differ in size, returns #VALUE!', () => {
    expect(codeOf('DATA.COMPARE', col(1, 2, 3, 4), col(1, 2, 3))).toBe('#VALUE!');
  });
  test('text and blanks are skipped pairwise', () => {
    const x = col(1, 2, 'x', 3, 4, null, 10, 12, 18, 7);
    const y = col(9, 15, 100, 19, 20, 50, 45, 55, 78, '');
    expect(evaluate('DATA.COMPARE', [x, y])).toEqual(evaluate('DATA.COMPARE', [SEN_X, SEN_Y]));
  });
  test('if fewer than 3 pairs remain, returns #NUM!', () => {
    expect(codeOf('DATA.COMPARE', col(1, 2, 'x'), col(1, 2, 3))).toBe('#NUM!');
  });
  test('if all x are equal, returns #DIV/0! for every method', () => {
    for (const m of ['pb', 'deming', 'ols']) expect(codeOf('DATA.COMPARE', col(5, 5, 5, 5), col(1, 2, 3, 4), m)).toBe('#DIV/0!');
  });
  test('a negative level or a non-positive ratio returns #NUM!; a zero level #DIV/0! in the percent cell only', () => {
    expect(codeOf('DATA.COMPARE', SEN_X, SEN_Y, 'pb', -1)).toBe('#NUM!');
    expect(codeOf('DATA.COMPARE', SEN_X, SEN_Y, 'deming', null, 0)).toBe('#NUM!');
    const v = evaluate('DATA.COMPARE', [SEN_X, SEN_Y, 'pb', 0])[1];
    expect(v[6]).toBe(6);
    expect((v[7] as ErrorCell).error).toBe('#DIV/0!');
  });
  test('with too few pairs for an interval, the interval cells are #NUM! and the estimates still show', () => {
    const out = evaluate('DATA.COMPARE', [col(1, 2, 3, 4), col(1.1, 2.3, 2.9, 4.2)]);
    expect(typeof out[1][0]).toBe('number');
    expect((out[1][1] as ErrorCell).error).toBe('#NUM!');
    expect((out[1][1] as ErrorCell).message).toMatch(/too few pairs/);
    noBadNumbers(out);
  });
});

describe('MU.BIAS and MU.COMBINE', () => {
  // Nordtest TR 537 §3.2 ammonium example (second-hand, quoted from a summary of the handbook).
  const biases = col(2.5, 2.7, 1.9, 1.4, 1.8, 2.9);
  test('Nordtest ammonium: u(bias) 2.73 %, U = 6.40 % (second-hand)', () => {
    const u = one('MU.BIAS', biases, 1.52) as number;
    expect(Math.abs(u - 2.73)).toBeLessThan(0.005);
    expect(Math.abs((one('MU.COMBINE', 1.67, u) as number) - 6.4)).toBeLessThan(0.005);
    expect(Math.abs((one('MU.COMBINE', 1.67, 2.73, 1) as number) - 3.2)).toBeLessThan(0.005);
  });
  test('u_ref as a range: its mean is used', () => {
    expect(one('MU.BIAS', biases, col(1.2, 1.84, 'n/a'))).toBe(one('MU.BIAS', biases, 1.52));
  });
  test('bad u_ref: blank #N/A, text #VALUE!, negative #NUM!; no biases #NUM!', () => {
    expect(codeOf('MU.BIAS', biases, [[null]])).toBe('#N/A');
    expect(codeOf('MU.BIAS', biases, 'abc')).toBe('#VALUE!');
    expect(codeOf('MU.BIAS', biases, -1)).toBe('#NUM!');
    expect(codeOf('MU.BIAS', biases, col(1, -1))).toBe('#NUM!');
    expect(codeOf('MU.BIAS', col('x', null), 1)).toBe('#NUM!');
  });
  test('MU.COMBINE spills over ranges, k = 2 by default', () => {
    const out = evaluate('MU.COMBINE', [col(3, 6), col(4, 8)]);
    expect(out).toEqual([[10], [20]]);
    expect(codeOf('MU.COMBINE', -1, 1)).toBe('#NUM!');
    expect(codeOf('MU.COMBINE', 1, 1, 0)).toBe('#NUM!');
  });
});

describe('leeway call through the built command line', () => {
  const root = path.join(__dirname, '..', '..');
  const bin = path.join(root, 'bin', 'leeway.js');
  beforeAll(() => {
    execFileSync(process.execPath, [path.join(root, 'scripts', 'build-cli.js')], { stdio: 'inherit' });
  });

  test('DATA.COMPARE on the Sen (1968) data prints the labelled spill and exits 0', () => {
    const r = spawnSync(process.execPath, [bin, 'call', 'DATA.COMPARE', '[1,2,3,4,10,12,18]', '[9,15,19,20,45,55,78]'], {
      encoding: 'utf8',
    });
    expect(r.status).toBe(0);
    const v = JSON.parse(r.stdout);
    expect(v[0][0]).toBe('Slope');
    expect(v[1][0]).toBe(4);
    expect(v[1][3]).toBe(6);
  });

  test('a worksheet error exits 1 with the code on stderr', () => {
    const r = spawnSync(process.execPath, [bin, 'call', 'DATA.COMPARE', '[1,2,3]', '[1,2,3]', 'median'], { encoding: 'utf8' });
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^#VALUE! method must be one of/);
  });

  test('--lines: one JSON reply per request line, in order, as the in-process call answers', () => {
    const requests: unknown[][] = [
      ['DATA.CV', [2, 4, 4, 4, 5, 5, 7, 9]],
      ['DATA.BIAS', [102, 'x', 99], [100, 100, 100]],
      ['DATA.RMSBIAS', [1, 2], [1, 0]],
      ['DATA.PRECISION', [1, 2, 3, 4, 5, 6], ['A', 'A', 'B', 'B', 'C', 'C']],
      ['LEEWAY.DATA.COMPARE', [1, 2, 3, 4, 10, 12, 18], [9, 15, 19, 20, 45, 55, 78], 'deming', 10, 2],
      ['DATA.COMPARE', [1, 2, 3, 4, 10, 12, 18], [9, 15, 19, 20, 45, 55, 78], 'ols'],
      ['DATA.COMPARE', [5, 5, 5], [1, 2, 3]],
      ['DATA.COMPARE', [1, 2, 3], [1, 2]],
      ['MU.BIAS', [2.5, 2.7, 1.9, 1.4, 1.8, 2.9], 1.52],
      ['MU.COMBINE', 1.67, 2.73],
      ['MU.COMBINE', [1, 2], [2, 3], 1],
    ];
    const r = spawnSync(process.execPath, [bin, 'call', '--lines'], {
      input: requests.map((q) => JSON.stringify(q)).join('\n') + '\n',
      encoding: 'utf8',
    });
    expect(r.status).toBe(0);
    const replies = r.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(replies.length).toBe(requests.length);
    // The built binary answers each line exactly as the in-process call does.
    requests.forEach((q, i) => {
      const c = callFunction(q[0] as string, q.slice(1));
      expect(replies[i]).toEqual(c.ok ? { value: c.value } : { error: c.error, message: c.message });
    });
    expect(replies[0].value).toBeCloseTo((100 * Math.sqrt(32 / 7)) / 5, 12);
    expect(replies[3].value[0][0]).toBe('Mean');
    expect(replies[4].value[1].length).toBe(8);
    expect(replies[6].error).toBe('#DIV/0!');
    expect(replies[7].error).toBe('#VALUE!');
    expect(replies[10].value).toEqual([[Math.hypot(1, 2)], [Math.hypot(2, 3)]]);
  });
});

describe('worksheet wrappers (the adapter of src/functions) with a stubbed CustomFunctions global', () => {
  class StubError {
    constructor(
      public code: string,
      public message?: string,
    ) {}
  }
  beforeAll(() => {
    (globalThis as unknown as { CustomFunctions: unknown }).CustomFunctions = {
      Error: StubError,
      ErrorCode: { invalidValue: '#VALUE!', notAvailable: '#N/A', divisionByZero: '#DIV/0!', invalidNumber: '#NUM!' },
    };
  });

  test('each wrapper calls its own function; omitted optionals arrive as null', async () => {
    const { wrapperOf } = await import('../support/wrappers');
    const w = {
      dataCompare: wrapperOf('DATA.COMPARE'),
      dataPrecision: wrapperOf('DATA.PRECISION'),
      dataCv: wrapperOf('DATA.CV'),
      dataBias: wrapperOf('DATA.BIAS'),
      dataRmsBias: wrapperOf('DATA.RMSBIAS'),
      muBias: wrapperOf('MU.BIAS'),
      muCombine: wrapperOf('MU.COMBINE'),
    };
    const x = [[1], [2], [3], [4], [10], [12], [18]];
    const y = [[9], [15], [19], [20], [45], [55], [78]];
    const cmp = w.dataCompare(x, y, null as never, null as never, null as never);
    expect(cmp[0][0]).toBe('Slope');
    expect(cmp[1][0]).toBe(4);
    expect(w.dataPrecision([[1], [2], [3], [4]], [['a'], ['a'], ['b'], ['b']])[0][0]).toBe('Mean');
    expect(w.dataCv([[2], [4], [4], [4], [5], [5], [7], [9]])[0][0]).toBeCloseTo((100 * Math.sqrt(32 / 7)) / 5, 12);
    expect(w.dataBias([[102]], [[100]])[0][0]).toBeCloseTo(2, 12);
    expect(w.dataRmsBias([[98]], [[100]])[0][0]).toBeCloseTo(2, 12);
    expect(w.muBias([[3]], [[4]])[0][0]).toBe(5);
    expect(w.muCombine([[3]], [[4]], null as never)[0][0]).toBe(10);
    const bad = w.dataCompare(x, y, [['median']]) as unknown as StubError[][];
    expect(bad[0][0]).toBeInstanceOf(StubError);
    expect(bad[0][0].code).toBe('#VALUE!');
  });
});
