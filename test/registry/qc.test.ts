/**
 * QC.DETECT, QC.FALSEREJECT and QC.PLAN through the registry (as Excel and the CLI evaluate them)
 * and through the built command (`leeway call --lines`).
 */
import { execFileSync, spawnSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';
import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { evaluate } from '../../src/registry';
import type { ErrorCell, OutCell } from '../../src/registry/types';

const Phi = (x: number): number => cdf(x, 0, 1);
const one = (name: string, args: unknown[]): OutCell => evaluate(name, args as never)[0][0];
const err = (v: OutCell): ErrorCell => {
  if (typeof v !== 'object') throw new Error(`expected an error, got ${String(v)}`);
  return v;
};

describe('QC.DETECT and QC.FALSEREJECT in the registry', () => {
  // Closed form of the Westgard & Groth 1979 model with the stdlib Φ: 1-3s, n 2, shift 2: 1 − [Φ(1) − Φ(−5)]².
  test('a single rule gives the closed form; runs default to 1', () => {
    const expected = 1 - (Phi(1) - Phi(-5)) ** 2;
    expect(Math.abs((one('QC.DETECT', ['1-3s', 2, 2]) as number) - expected)).toBeLessThan(1e-12);
    expect(one('QC.DETECT', ['1-3s', 2, 2, null])).toBe(one('QC.DETECT', ['1-3s', 2, 2, 1]));
    // Common practice, no source: 1-2s with one control falsely rejects about 4.5 % of runs.
    expect(Math.abs((one('QC.FALSEREJECT', ['1-2s', 1]) as number) - 0.0455)).toBeLessThan(0.0005);
  });

  test('QC.FALSEREJECT is QC.DETECT at shift 0', () => {
    expect(one('QC.FALSEREJECT', ['1-3s/2-2s/R-4s/4-1s', 2, 2])).toBe(one('QC.DETECT', ['1-3s/2-2s/R-4s/4-1s', 2, 0, 2]));
  });

  test('a column of shifts spills a power curve, rising with the shift', () => {
    const out = evaluate('QC.DETECT', ['1-3s/2-2s/R-4s', 2, [[0], [1], [2], [3], [4]]]);
    expect(out.length).toBe(5);
    const ps = out.map((r) => r[0] as number);
    for (let i = 1; i < ps.length; i++) expect(ps[i]).toBeGreaterThan(ps[i - 1]);
  });

  test('a range of rules spills; a bad cell is an error in that cell only', () => {
    const out = evaluate('QC.FALSEREJECT', [[['1-3s', '2-2x', '1-2s']], 1]);
    expect(typeof out[0][0]).toBe('number');
    expect(err(out[0][1]).error).toBe('#VALUE!');
    expect(err(out[0][1]).message).toMatch(/rule term "2-2x"/);
    expect(typeof out[0][2]).toBe('number');
  });

  test.each([
    ['an unknown term', ['1-3s/3-3z', 2, 1], '#VALUE!', /rule term "3-3z" is not a control rule/],
    ['a number as the rule', [13, 2, 1], '#VALUE!', /rule must be a word/],
    ['n 0', ['1-3s', 0, 1], '#NUM!', /n must be at least 1/],
    ['n 2.5', ['1-3s/2-2s/R-4s', 2.5, 1], '#NUM!', /n must be a whole number/],
    ['runs 0', ['1-3s', 2, 1, 0], '#NUM!', /runs must be at least 1/],
    ['runs 1.5', ['1-3s', 2, 1, 1.5], '#NUM!', /runs must be a whole number/],
    ['a negative shift', ['1-3s', 2, -1], '#NUM!', /shift must be a finite number ≥ 0/],
    ['a non-finite shift', ['1-3s', 2, Infinity], '#NUM!', /shift must be a finite number/],
    ['a blank shift', ['1-3s', 2, null], '#N/A', /shift is required/],
    ['a blank rule', ['', 2, 1], '#N/A', /rule is blank/],
  ])('QC.DETECT with %s: %s', (_w, args, code, message) => {
    const e = err(one('QC.DETECT', args));
    expect(e.error).toBe(code);
    expect(e.message).toMatch(message);
  });
});

describe('QC.PLAN in the registry', () => {
  test('spills two rows: the labels exactly, then the values; Target met is a logical', () => {
    const out = evaluate('QC.PLAN', [12, 1.5, 1.75]);
    expect(out[0]).toEqual(['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met', 'Run size']);
    expect(out[1].slice(0, 3)).toEqual(['1-3s', 1, 1]);
    // Sigma 6, critical shift 4.35: detection Φ(1.35) + Φ(−7.35), false rejection 2Φ(−3) (stdlib).
    expect(Math.abs((out[1][3] as number) - (Phi(1.35) + Phi(-7.35)))).toBeLessThan(1e-12);
    expect(Math.abs((out[1][4] as number) - 2 * Phi(-3))).toBeLessThan(1e-12);
    expect(out[1][5]).toBe(true);
    expect(evaluate('QC.PLAN', [2.5, 0, 1])[1][5]).toBe(false);
  });

  test('blank optional cells take the defaults 0.90 and 0.05', () => {
    expect(evaluate('QC.PLAN', [9, 1, 2, null, null])).toEqual(evaluate('QC.PLAN', [9, 1, 2, 0.9, 0.05]));
    expect(evaluate('QC.PLAN', [9, 1, 2, [['']], [[null]]])).toEqual(evaluate('QC.PLAN', [9, 1, 2]));
  });

  test.each([
    ['target 1', [10, 0, 2, 1], '#NUM!', /target must be a probability strictly between 0 and 1/],
    ['limit 0', [10, 0, 2, 0.9, 0], '#NUM!', /limit must be a probability/],
    ['cv 0', [10, 0, 0], '#DIV/0!', /cv must not be zero/],
    ['a text allowable', ['ten', 0, 2], '#VALUE!', /allowable must be a number/],
    ['a range for allowable', [[[10], [12]], 0, 2], '#VALUE!', /allowable must be a single cell/],
    ['a blank cv', [10, 0, null], '#N/A', /cv is required/],
  ])('with %s: %s', (_w, args, code, message) => {
    const out = evaluate('QC.PLAN', args as never);
    expect(out.length).toBe(1);
    const e = err(out[0][0]);
    expect(e.error).toBe(code);
    expect(e.message).toMatch(message);
  });
});

describe('through the built command: leeway call --lines', () => {
  const root = path.join(__dirname, '..', '..');
  const bundle = path.join(root, 'dist', 'cli', 'leeway.js');
  const bin = path.join(root, 'bin', 'leeway.js');

  /** Newest modification time under a folder. */
  function newest(dir: string): number {
    let t = 0;
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, entry.name);
      t = Math.max(t, entry.isDirectory() ? newest(p) : fs.statSync(p).mtimeMs);
    }
    return t;
  }

  beforeAll(() => {
    // `npm test` builds first (pretest); a direct jest run rebuilds here when the sources are newer.
    if (!fs.existsSync(bundle) || fs.statSync(bundle).mtimeMs < newest(path.join(root, 'src'))) {
      execFileSync(process.execPath, [path.join(root, 'scripts', 'build-cli.js')], { stdio: 'inherit' });
    }
  });

  test('answers QC requests line by line, equal to the registry, errors as {error, message}', () => {
    const requests: unknown[][] = [
      ['QC.DETECT', '1-3s/2-2s/R-4s', 2, 2.5],
      ['LEEWAY.QC.DETECT', '1-3s/2-2s/R-4s/4-1s/10-x', 2, 1.2, 5],
      ['QC.FALSEREJECT', '1_3s/2_2s/R_4s/4_1s', 4],
      ['QC.PLAN', 8, 1, 1.5],
      ['QC.PLAN', 3, 0.5, 1.2, 0.95, 0.02],
      ['QC.DETECT', '1-3s/2-2q', 2, 1],
      ['QC.DETECT', '1-3s', 0, 1],
      ['QC.PLAN', 10, 0, 2, 1.2],
    ];
    const r = spawnSync(process.execPath, [bin, 'call', '--lines'], {
      input: requests.map((q) => JSON.stringify(q)).join('\n') + '\n',
      encoding: 'utf8',
      timeout: 30000,
    });
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.length).toBe(requests.length);
    const value = (i: number) => lines[i].value;
    expect(value(0)).toBe(one('QC.DETECT', ['1-3s/2-2s/R-4s', 2, 2.5]));
    expect(value(1)).toBe(one('QC.DETECT', ['1-3s/2-2s/R-4s/4-1s/10-x', 2, 1.2, 5]));
    expect(value(2)).toBe(one('QC.FALSEREJECT', ['1-3s/2-2s/R-4s/4-1s', 4]));
    expect(value(3)).toEqual(evaluate('QC.PLAN', [8, 1, 1.5]));
    expect(value(3)[1][5]).toBe(true);
    expect(value(4)).toEqual(evaluate('QC.PLAN', [3, 0.5, 1.2, 0.95, 0.02]));
    expect(value(4)[1][5]).toBe(false);
    expect(lines[5]).toEqual({ error: '#VALUE!', message: expect.stringMatching(/rule term "2-2q"/) });
    expect(lines[6]).toEqual({ error: '#NUM!', message: expect.stringMatching(/n must be at least 1/) });
    expect(lines[7]).toEqual({ error: '#NUM!', message: expect.stringMatching(/target must be a probability/) });
  });

  test('leeway call QC.PLAN prints the spill as rows and exits 0; a bad rule exits 1', () => {
    const ok = spawnSync(process.execPath, [bin, 'call', 'QC.PLAN', '12', '1.5', '1.75'], { encoding: 'utf8', timeout: 30000 });
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout)[1].slice(0, 3)).toEqual(['1-3s', 1, 1]);
    expect(JSON.parse(ok.stdout)[1][5]).toBe(true);
    const bad = spawnSync(process.execPath, [bin, 'call', 'QC.DETECT', '1-3s/5-x5', '2', '1'], { encoding: 'utf8', timeout: 30000 });
    expect(bad.status).toBe(1);
    expect(bad.stderr).toMatch(/^#VALUE! rule term "5-x5"/);
  });
});

describe('QC.RISK and QC.RUNSIZE in the registry', () => {
  test('QC.PLAN\'s Run size is QC.RUNSIZE of the chosen rule and controls', () => {
    const out = evaluate('QC.PLAN', [10, 1, 2]);
    const [rule, n] = out[1];
    expect(out[1][6]).toBe(evaluate('QC.RUNSIZE', [10, 1, 2, rule as string, n as number])[0][0]);
  });

  test('QC.RUNSIZE is the largest run size whose QC.RISK stays within maxrisk', () => {
    const m = evaluate('QC.RUNSIZE', [10, 1, 2, '1-3s/2-2s/R-4s', 2])[0][0] as number;
    expect(m).toBeGreaterThan(0);
    expect(evaluate('QC.RISK', [10, 1, 2, '1-3s/2-2s/R-4s', 2, m])[0][0] as number).toBeLessThanOrEqual(1);
    expect(evaluate('QC.RISK', [10, 1, 2, '1-3s/2-2s/R-4s', 2, m + 1])[0][0] as number).toBeGreaterThan(1);
  });

  test.each([
    ['QC.RISK', [10, 1, 2, '1-3s', 2, 0], '#NUM!'],
    ['QC.RISK', [10, 1, 2, '1-3s', 2, 2.5], '#NUM!'],
    ['QC.RISK', [10, 1, 0, '1-3s', 2, 100], '#DIV/0!'],
    ['QC.RISK', [10, 1, -2, '1-3s', 2, 100], '#NUM!'],
    ['QC.RISK', [10, 1, 2, '1-3s', 0, 100], '#NUM!'],
    ['QC.RISK', [10, 1, 2, '3-3q', 2, 100], '#VALUE!'],
    ['QC.RUNSIZE', [10, 1, 2, '1-3s', 2, 0], '#NUM!'],
    ['QC.RUNSIZE', [10, 1, 2, '1-3s', 2, -1], '#NUM!'],
    ['QC.RUNSIZE', [10, 1, 0, '1-3s', 2], '#DIV/0!'],
  ])('%s%j gives %s', (name, args, code) => {
    expect(err(evaluate(name as string, args as never)[0][0]).error).toBe(code);
  });

  test('a method that fails without a shift: QC.RISK #NUM! naming sigma, QC.RUNSIZE 0', () => {
    const e = err(evaluate('QC.RISK', [3, 1, 2, '1-3s', 2, 100])[0][0]);
    expect(e.error).toBe('#NUM!');
    expect(e.message).toMatch(/sigma/i);
    expect(evaluate('QC.RUNSIZE', [3, 1, 2, '1-3s', 2])[0][0]).toBe(0);
  });
});
