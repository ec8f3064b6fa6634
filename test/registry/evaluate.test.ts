import { evaluate, evaluateLabelled, findFunction, FUNCTIONS } from '../../src/registry';
import type { Output } from '../../src/registry';

const codeOf = (out: Output, r = 0, c = 0): string | undefined => {
  const v = out[r][c];
  return typeof v === 'object' ? v.error : undefined;
};
const messageOf = (out: Output): string => {
  const v = out[0][0];
  return typeof v === 'object' ? v.message : '';
};

describe('the registry', () => {
  test('names are found with or without the LEEWAY. prefix, in any case', () => {
    expect(findFunction('leeway.spec.cv')?.name).toBe('SPEC.CV');
    expect(findFunction(' SPEC.CV ')?.name).toBe('SPEC.CV');
    expect(findFunction('SPEC.NOPE')).toBeUndefined();
  });

  test('every function name is unique and every parameter name within a function is unique', () => {
    const names = FUNCTIONS.map((f) => f.name);
    expect(new Set(names).size).toBe(names.length);
    for (const f of FUNCTIONS) expect(new Set(f.params.map((p) => p.name)).size).toBe(f.params.length);
  });

  test('optional parameters come after required ones', () => {
    for (const f of FUNCTIONS) {
      const firstOptional = f.params.findIndex((p) => p.optional);
      if (firstOptional >= 0) expect(f.params.slice(firstOptional).every((p) => p.optional)).toBe(true);
    }
  });
});

describe('the documented conventions through evaluate()', () => {
  test('a single value gives a 1×1 result; omitted optionals take their defaults', () => {
    expect(evaluate('SPEC.TOTAL', [5.7, 6.9])).toEqual(evaluate('SPEC.TOTAL', [5.7, 6.9, 'desirable', 1.65]));
    expect(evaluate('SPEC.CV', [[[5.7]], null])).toEqual([[2.85]]);
  });

  test('tier words: case-insensitive, spaces ignored, short forms', () => {
    for (const t of ['Optimum', ' OPT ', 'opt']) expect(evaluate('SPEC.CV', [10, t])).toEqual([[2.5]]);
    expect(evaluate('SPEC.CV', [10, 'MIN'])).toEqual([[7.5]]);
  });

  test('if given an unknown tier, returns #VALUE! naming the accepted words', () => {
    const out = evaluate('SPEC.CV', [10, 'best']);
    expect(codeOf(out)).toBe('#VALUE!');
    expect(messageOf(out)).toMatch(/optimum.*desirable.*minimum/);
  });

  test('a range spills a same-shaped result; a blank cell gives #N/A in that cell only', () => {
    const out = evaluate('SPEC.CV', [[[4], [null], [8]]]);
    expect(out[0][0]).toBe(2);
    expect(codeOf(out, 1, 0)).toBe('#N/A');
    expect(out[2][0]).toBe(4);
  });

  test('two ranges of one shape pair up cell by cell; a single cell broadcasts', () => {
    const out = evaluate('SPEC.BIAS', [[[3, 6]], [[4, 8]], 'desirable']);
    expect(out).toEqual([[1.25, 2.5]]);
    const col = evaluate('SPEC.BIAS', [[[3], [6]], 4]);
    expect(col[0][0]).toBe(1.25);
    expect(col[1][0]).toBeCloseTo(0.25 * Math.hypot(6, 4), 14);
  });

  test('if given ranges that do not pair up, returns #VALUE!', () => {
    const out = evaluate('SPEC.BIAS', [[[1], [2]], [[1], [2], [3]]]);
    expect(codeOf(out)).toBe('#VALUE!');
    expect(messageOf(out)).toMatch(/do not pair up/);
  });

  test('if given text where a number belongs, returns #VALUE!; a logical too', () => {
    expect(codeOf(evaluate('SPEC.CV', ['abc']))).toBe('#VALUE!');
    expect(codeOf(evaluate('SPEC.CV', [true]))).toBe('#VALUE!');
  });

  test('if given a negative CV, returns #NUM!; NaN or Infinity, #NUM!', () => {
    expect(codeOf(evaluate('SPEC.CV', [-1]))).toBe('#NUM!');
    expect(codeOf(evaluate('SPEC.CV', [NaN]))).toBe('#NUM!');
    expect(codeOf(evaluate('SPEC.TOTAL', [1, 1, 'des', Infinity]))).toBe('#NUM!');
  });

  test('if a divisor is zero, returns #DIV/0!', () => {
    expect(codeOf(evaluate('PERF.SIGMA', [10, 1, 0]))).toBe('#DIV/0!');
    expect(codeOf(evaluate('SPEC.FIXED', [0, 1, 1]))).toBe('#DIV/0!');
    expect(codeOf(evaluate('BV.INDIVIDUALITY', [3, 0]))).toBe('#DIV/0!');
  });

  test('if a probability is outside (0, 1), returns #NUM!', () => {
    expect(codeOf(evaluate('ZSCORE', [0]))).toBe('#NUM!');
    expect(codeOf(evaluate('ZSCORE', [1]))).toBe('#NUM!');
    expect(codeOf(evaluate('ZSCORE', [0.95, 3]))).toBe('#NUM!');
  });

  test('if a required argument is missing, returns #N/A', () => {
    expect(codeOf(evaluate('SPEC.BIAS', [5]))).toBe('#N/A');
    expect(codeOf(evaluate('SPEC.BIAS', [5, null]))).toBe('#N/A');
    expect(codeOf(evaluate('SPEC.BIAS', [5, [['']]]))).toBe('#N/A');
  });

  test('a blank cell in an optional argument takes the default', () => {
    expect(evaluate('SPEC.CV', [10, [[null]]])).toEqual([[5]]);
    expect(evaluate('SPEC.TOTAL', [[[3]], [[4]], [['']], [[null]]])).toEqual(evaluate('SPEC.TOTAL', [3, 4]));
  });

  test('SPEC.TIERS spills a 4×4 table with its header', () => {
    const out = evaluate('SPEC.TIERS', [5.7, 6.9]);
    expect(out.length).toBe(4);
    expect(out[0]).toEqual(['Tier', 'CV', 'Bias', 'Total']);
    expect(out.map((r) => r[0])).toEqual(['Tier', 'optimum', 'desirable', 'minimum']);
    expect(out[2][1]).toBeCloseTo(2.85, 14);
  });

  test('SPEC.TIERS given a range for cvi returns #VALUE!', () => {
    expect(codeOf(evaluate('SPEC.TIERS', [[[1], [2]], 3]))).toBe('#VALUE!');
  });

  test('PERF.TIER returns a word; words in ranges spill', () => {
    expect(evaluate('PERF.TIER', [5.7, 6.9, 2, 2])).toEqual([['desirable']]);
    expect(evaluate('PERF.TIER', [5.7, 6.9, [[1], [5]], [[1], [3.5]]])).toEqual([['optimum'], ['none']]);
    expect(codeOf(evaluate('PERF.TIER', [5.7, 6.9, 2, 2, 1.65, 'whole']))).toBe('#VALUE!');
  });

  test('no output cell is ever NaN or Infinity', () => {
    const out = evaluate('BV.SETPOINT', [1e200, 1e200, 1e-200]);
    expect(codeOf(out)).toBe('#NUM!');
  });

  test('an unknown function or too many arguments is #VALUE!', () => {
    expect(codeOf(evaluate('SPEC.NOPE', []))).toBe('#VALUE!');
    expect(codeOf(evaluate('SPEC.CV', [1, 'des', 3]))).toBe('#VALUE!');
  });
});

describe('blank word cells', () => {
  test('a blank text cell ("") in a required word parameter is #N/A, in an optional one the default', () => {
    const rule = evaluate('QC.FALSEREJECT', [[['']], 1]);
    expect(typeof rule[0][0] === 'object' && rule[0][0].error).toBe('#N/A');
    expect(evaluate('SPEC.CV', [10, [['  ']]])).toEqual([[5]]);
  });
});

describe('spilled calls give what a cell-by-cell call gives', () => {
  // Property (seeded): the column and grid paths of every elementwise function agree with the
  // single-cell path on each cell, whatever mixture of numbers, blanks, text and bad values.
  const { mulberry32 } = require('../support/prng') as typeof import('../support/prng');
  const rand = mulberry32(20261204);
  const pool = [1, 2.5, 7, 30, 0, -1, null, '', 'text', true, 1e308, 'desirable', 'min', '1-3s', 0.5, 3];
  const pick = () => pool[Math.floor(rand() * pool.length)];
  const elementwise = FUNCTIONS.filter((f) => f.kind === 'elementwise');
  test.each(elementwise.map((f) => [f.name]))('%s', (name) => {
    const def = findFunction(name)!;
    for (let trial = 0; trial < 60; trial++) {
      const rows = 1 + Math.floor(rand() * 6);
      const cols = trial % 3 === 0 ? 2 : 1;
      // Each argument: a range, a single cell or omitted (optional ones); plain numbers most of the time.
      const args = def.params.map((p, i) => {
        const r = rand();
        if (p.optional && r < 0.15) return null;
        const cell = () => (rand() < 0.7 && p.kind === 'number' ? Math.round(1 + 30 * rand()) / 2 : pick());
        if (r < 0.55 || i === 0) return Array.from({ length: rows }, () => Array.from({ length: cols }, cell));
        return [[cell()]];
      });
      const out = evaluate(name, args as never);
      const isRange = (a: unknown): boolean => Array.isArray(a) && !(a.length === 1 && (a[0] as unknown[]).length === 1);
      if (!args.some(isRange)) continue;
      expect([JSON.stringify(args), out.length === rows ? rows : JSON.stringify(out)]).toEqual([JSON.stringify(args), rows]);
      for (let r = 0; r < rows; r++) {
        for (let c = 0; c < cols; c++) {
          const one = args.map((a) => (isRange(a) ? [[(a as unknown[][])[r][c]]] : a));
          expect([name, r, c, out[r][c]]).toEqual([name, r, c, evaluate(name, one as never)[0][0]]);
        }
      }
    }
  });
});

describe('evaluateLabelled: a labelled spill as label → cell', () => {
  test('the catalogue\'s labels in order, each with its figure', () => {
    const out = evaluate('EQA.CONSENSUS', [[[5.02], [4.97], [5.1], [5.05], [4.99]]]);
    const m = evaluateLabelled('EQA.CONSENSUS', [[[5.02], [4.97], [5.1], [5.05], [4.99]]]);
    expect([...m.keys()]).toEqual(out[0]);
    expect([...m.values()]).toEqual(out[1]);
  });

  test('a call that fails as a whole puts its error under every label', () => {
    const m = evaluateLabelled('EQA.CONSENSUS', [[[5.02], [4.97]]]);
    expect(m.size).toBe(4);
    for (const cell of m.values()) expect(cell).toMatchObject({ error: '#NUM!' });
  });

  test('a function without labels is a programming error', () => {
    expect(() => evaluateLabelled('SPEC.CV', [5])).toThrow(/not a labelled worksheet function/);
  });
});
