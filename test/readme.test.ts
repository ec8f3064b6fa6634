/** Every example in the README's function table, evaluated through the registry: the README stays true. */
import * as fs from 'fs';
import * as path from 'path';
import { evaluate, FUNCTIONS } from '../src/registry';
import type { Arg } from '../src/registry';

const readme = fs.readFileSync(path.join(__dirname, '..', 'README.md'), 'utf8');
const table = readme.split('<!-- functions:start -->')[1]?.split('<!-- functions:end -->')[0] ?? '';
const rows = table
  .split('\n')
  .map((l) => /^\| `=LEEWAY\.([A-Z.]+)\((.*)\)` \| (.*?) \| .*\|$/.exec(l))
  .filter((m): m is RegExpExecArray => m !== null);

/** Splits Excel arguments at top-level commas (not inside quotes or {array constants}). */
function splitArgs(s: string): string[] {
  const out: string[] = [];
  let depth = 0;
  let quoted = false;
  let cur = '';
  for (const ch of s) {
    if (ch === '"') quoted = !quoted;
    if (!quoted && ch === '{') depth++;
    if (!quoted && ch === '}') depth--;
    if (!quoted && depth === 0 && ch === ',') {
      out.push(cur.trim());
      cur = '';
    } else cur += ch;
  }
  if (cur.trim()) out.push(cur.trim());
  return out;
}

function scalar(s: string): number | string {
  if (s.startsWith('"')) return s.slice(1, -1);
  const n = Number(s);
  if (!Number.isFinite(n)) throw new Error(`not a number: ${s}`);
  return n;
}

/** An Excel argument: a number, "text", or an array constant {1;2;3} (a column) / {1,2} (a row). */
function excelArg(s: string): Arg {
  if (s.startsWith('{')) return s.slice(1, -1).split(';').map((r) => r.split(',').map((c) => scalar(c.trim())));
  return scalar(s);
}

function closeToShown(value: unknown, shown: string): void {
  const decimals = (shown.split('.')[1] ?? '').length;
  expect(typeof value).toBe('number');
  expect(Math.abs((value as number) - Number(shown))).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12);
}

describe('README function table', () => {
  test('is the one the function catalogue gives, as are docs/reference/functions (npm run docs)', () => {
    const { generated } = require('../scripts/docs.js') as { generated: () => { files: Map<string, string> } };
    for (const [file, text] of generated().files) {
      const now = fs.existsSync(file) ? fs.readFileSync(file, 'utf8') : '(missing)';
      expect([path.relative(path.join(__dirname, '..'), file), now === text]).toEqual([path.relative(path.join(__dirname, '..'), file), true]);
    }
  });

  test('lists every worksheet function', () => {
    const listed = new Set(rows.map((m) => m[1]));
    for (const f of FUNCTIONS) expect(listed.has(f.name) ? f.name : `missing ${f.name}`).toBe(f.name);
  });

  test.each(rows.map((m) => [m[1], m[2], m[3]]))('=LEEWAY.%s(%s) gives %s', (name, argText, result) => {
    const out = evaluate(name, splitArgs(argText).map(excelArg));
    expect(typeof out[0][0] === 'object' ? out[0][0] : 'ok').toBe('ok');
    if (result.startsWith('4×4')) {
      expect(out.length).toBe(4);
      return expect(out.every((r) => r.length === 4)).toBe(true);
    }
    if (result.startsWith('column: ')) {
      // "column: a, b, …": each cell of a spilled column, in order.
      const shown = result.slice('column: '.length).split(', ');
      expect(out.length).toBe(shown.length);
      return shown.forEach((s, i) => (s.startsWith('"') ? expect(out[i][0]).toBe(s.slice(1, -1)) : closeToShown(out[i][0], s)));
    }
    if (/^-?\d/.test(result)) return closeToShown(out[0][0], result);
    if (result.startsWith('"')) return expect(out[0][0]).toBe(result.slice(1, -1));
    // "spill: `Label` value, `Label` value": each named figure of the labelled spill.
    expect(result.startsWith('spill:')).toBe(true);
    for (const [, label, shown] of result.matchAll(/`([^`]+)` ("[^"]*"|-?[\d.]+)/g)) {
      const col = out[0].indexOf(label);
      expect(col).toBeGreaterThanOrEqual(0);
      if (shown.startsWith('"')) expect(out[1][col]).toBe(shown.slice(1, -1));
      else closeToShown(out[1][col], shown);
    }
  });
});
