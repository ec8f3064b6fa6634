/**
 * Robustness: every worksheet function on seeded generated inputs — numbers of every magnitude
 * and sign, NaN, ±Infinity, blanks, logicals, text, dates as serial numbers, ranges of mismatched
 * shapes, omitted optionals. Each result must be a rectangular grid of finite numbers, text,
 * logicals or one of the documented Excel errors with a message. Nothing throws, nothing hangs, no
 * NaN or Infinity reaches a cell. Seed 20261202; at least 10,000 cases per function.
 */
import { ERROR_CODES } from '../../src/engine/errors';
import { evaluate, FUNCTIONS } from '../../src/registry';
import type { Arg, FunctionDef } from '../../src/registry';
import type { Scalar } from '../../src/registry/types';
import { mulberry32 } from '../support/prng';

const CASES = 10000;
const WORDS = ['desirable', 'OPT', ' min ', 'none', 'total', 'parts', 'up', 'down', 'deming', 'ols', 'passing-bablok', 'pb',
  '1-3s', '1_2.5s', '1-3s/2-2s/R-4s', '1-3s/2-2s/R-4s/4-1s/10-x', '2of3-2s', '13s', 'R-0s', '0-3s', '', ' ', 'abc', '5.7', '=1+1', '<b>x</b>'];

function numberFor(rand: () => number): number {
  const r = rand();
  if (r < 0.05) return [NaN, Infinity, -Infinity, 0, -0, Number.MIN_VALUE, Number.MAX_VALUE, -Number.MAX_VALUE][Math.floor(rand() * 8)];
  if (r < 0.1) return 45000 + Math.floor(rand() * 2000); // a date as a serial number
  if (r < 0.2) return Math.floor(rand() * 12) - 2; // small whole numbers, incl. 0 and negatives
  if (r < 0.3) return rand(); // probabilities
  const magnitude = Math.pow(10, Math.floor(rand() * 40) - 20);
  return (rand() < 0.2 ? -1 : 1) * magnitude * rand() * 10;
}

function scalarFor(rand: () => number, preferNumber: boolean): Scalar {
  const r = rand();
  if (preferNumber && r < 0.7) return numberFor(rand);
  if (r < 0.8) return WORDS[Math.floor(rand() * WORDS.length)];
  if (r < 0.87) return null;
  if (r < 0.9) return '';
  if (r < 0.95) return rand() < 0.5;
  return numberFor(rand);
}

const SHAPES: Array<[number, number]> = [[1, 1], [1, 1], [1, 1], [3, 1], [1, 3], [2, 2], [5, 1], [7, 1], [4, 1]];

/** The words of WORDS a word parameter accepts (found by asking its reader). */
function acceptedWords(p: FunctionDef['params'][number]): string[] {
  if (p.kind !== 'word') return WORDS;
  const ok = WORDS.filter((w) => {
    try {
      p.read(w);
      return true;
    } catch {
      return false;
    }
  });
  return ok.length ? ok : WORDS;
}

/** Half the cases are plausible (moderate positive numbers, accepted words, ranges that pair), so the valid paths are exercised too. */
function plausibleArg(rand: () => number, p: FunctionDef['params'][number], length: number): Arg {
  if (p.kind === 'word') {
    const ok = acceptedWords(p);
    return ok[Math.floor(rand() * ok.length)];
  }
  const value = () => (rand() < 0.05 ? null : Number((0.01 + 30 * rand()).toPrecision(6)));
  if (p.kind === 'range') return Array.from({ length }, (_v, k) => [p.name === 'groups' ? `run ${k % 4}` : value()]);
  return p.name === 'runsize' ? 1 + Math.floor(rand() * 300) : p.name === 'n' || p.name === 'runs' || p.name === 'sides' || p.name === 'samples' ? 1 + Math.floor(rand() * 3) : p.name === 'probability' || p.name === 'target' || p.name === 'limit' || p.name === 'confidence' ? rand() : value();
}

function argFor(rand: () => number, def: FunctionDef, i: number, plausible: boolean, length: number): Arg {
  const p = def.params[i];
  if (plausible) return plausibleArg(rand, p, length);
  const r = rand();
  if (p.optional && r < 0.15) return null; // omitted optional
  const wantNumber = p.kind !== 'word';
  if (p.kind === 'range' || r < 0.25) {
    const [rows, cols] = p.kind === 'range' ? [1 + Math.floor(rand() * 12), rand() < 0.8 ? 1 : 2] : SHAPES[Math.floor(rand() * SHAPES.length)];
    return Array.from({ length: rows }, () => Array.from({ length: cols }, () => scalarFor(rand, wantNumber)));
  }
  return r < 0.6 ? scalarFor(rand, wantNumber) : [[scalarFor(rand, wantNumber)]];
}

function checkOutput(out: unknown, where: string): void {
  if (!Array.isArray(out) || out.length === 0) throw new Error(`${where}: not a grid`);
  const width = (out[0] as unknown[]).length;
  for (const row of out as unknown[][]) {
    if (!Array.isArray(row) || row.length !== width || width === 0) throw new Error(`${where}: ragged or empty row`);
    for (const v of row) {
      if (typeof v === 'number') {
        if (!Number.isFinite(v)) throw new Error(`${where}: ${v} reached a cell`);
      } else if (typeof v === 'object' && v !== null) {
        const e = v as { error?: string; message?: string };
        if (!ERROR_CODES.includes(e.error as never)) throw new Error(`${where}: unknown error ${String(e.error)}`);
        if (!e.message || e.message.length < 5) throw new Error(`${where}: error without a message`);
      } else if (typeof v !== 'string' && typeof v !== 'boolean') {
        throw new Error(`${where}: ${typeof v} reached a cell`);
      }
    }
  }
}

const counts: string[] = [];

afterAll(() => {
  console.log(`robustness cases (seed 20261202):\n${counts.join('\n')}`);
});

describe.each(FUNCTIONS.map((f) => [f.name, f] as const))('%s on generated inputs', (name, def) => {
  test(`${CASES} seeded cases: a valid value or an Excel error, never a throw, NaN or Infinity`, () => {
    const rand = mulberry32(20261202 ^ name.length * 7919);
    let errors = 0;
    for (let k = 0; k < CASES; k++) {
      const nArgs = def.params.length - Math.floor(rand() * (def.params.filter((p) => p.optional).length + 1));
      const plausible = rand() < 0.5;
      const length = 3 + Math.floor(rand() * 30);
      const args = Array.from({ length: nArgs }, (_v, i) => argFor(rand, def, i, plausible, length));
      let out: unknown;
      expect(() => {
        out = evaluate(name, args);
      }).not.toThrow();
      checkOutput(out, `${name}(${JSON.stringify(args).slice(0, 200)})`);
      if (typeof (out as unknown[][])[0][0] === 'object') errors++;
    }
    counts.push(`  ${name.padEnd(18)} ${CASES} cases, ${errors} whole or first-cell errors`);
  });
});
