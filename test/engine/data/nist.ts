/**
 * Reader for the NIST StRD fixture files (test/fixtures/nist-strd, see its README): the data
 * lines named in each file's "File Format" header and the certified values written in it.
 * Handles CRLF (univariate files) and LF line endings.
 */
import * as fs from 'fs';
import * as path from 'path';

export const NIST_DIR = path.join(__dirname, '..', '..', 'fixtures', 'nist-strd');

export function readLines(name: string): string[] {
  return fs.readFileSync(path.join(NIST_DIR, `${name}.dat`), 'utf8').split(/\r?\n/);
}

/** The 1-based inclusive line range of the data block. */
function dataRange(lines: string[]): [number, number] {
  for (const l of lines) {
    const m = /^\s*Data\s*:?\s*\(?\s*lines\s+(\d+)\s+to\s+(\d+)/.exec(l);
    if (m) return [Number(m[1]), Number(m[2])];
  }
  throw new Error('no data line range in the header');
}

/** The whitespace-separated numbers of each data line. */
export function dataRows(name: string): number[][] {
  const lines = readLines(name);
  const [a, b] = dataRange(lines);
  return lines.slice(a - 1, b).map((l) => l.trim().split(/\s+/).map(Number));
}

export interface Univariate {
  data: number[];
  mean: number;
  sd: number;
}

export function univariate(name: string): Univariate {
  const lines = readLines(name);
  const find = (re: RegExp): number => {
    for (const l of lines) {
      const m = re.exec(l);
      if (m) return Number(m[1]);
    }
    throw new Error(`${name}: certified value ${re} not found`);
  };
  return {
    data: dataRows(name).map((r) => r[0]),
    mean: find(/ybar:\s*([-+0-9.Ee]+)/),
    sd: find(/\bs:\s*([-+0-9.Ee]+)/),
  };
}

export interface Anova {
  groups: number[];
  values: number[];
  dfBetween: number;
  dfWithin: number;
  msBetween: number;
  msWithin: number;
  residualSd: number;
}

export function anova(name: string): Anova {
  const lines = readLines(name);
  let between: number[] | undefined;
  let within: number[] | undefined;
  let residualSd: number | undefined;
  for (const l of lines) {
    const nums = (l.match(/[-+]?\d+(\.\d+)?([Ee][-+]?\d+)?/g) ?? []).map(Number);
    if (/^Between /.test(l)) between = nums;
    else if (/^Within /.test(l)) within = nums;
    else if (/Standard Deviation\s+[-+0-9]/.test(l)) residualSd = nums[nums.length - 1];
  }
  if (!between || !within || residualSd === undefined) throw new Error(`${name}: certified ANOVA table not found`);
  const rows = dataRows(name);
  return {
    groups: rows.map((r) => r[0]),
    values: rows.map((r) => r[1]),
    dfBetween: between[0],
    dfWithin: within[0],
    msBetween: between[2],
    msWithin: within[2],
    residualSd,
  };
}

export interface Regression {
  x: number[];
  y: number[];
  b0: number;
  b1: number;
}

/** Norris: data columns are y then x; certified B0 and B1. */
export function straightLine(name: string): Regression {
  const lines = readLines(name);
  const coef = (p: string): number => {
    for (const l of lines) {
      const m = new RegExp(`^\\s*${p}\\s+([-+0-9.Ee]+)`).exec(l);
      if (m) return Number(m[1]);
    }
    throw new Error(`${name}: ${p} not found`);
  };
  const rows = dataRows(name);
  return { y: rows.map((r) => r[0]), x: rows.map((r) => r[1]), b0: coef('B0'), b1: coef('B1') };
}

/** One line of the LRE table the tests print. */
export function lreRow(file: string, quantity: string, computed: number, certified: number, lre: number, required: number): string {
  return `${file.padEnd(9)} ${quantity.padEnd(18)} ${computed.toPrecision(15).padStart(22)} ${certified.toPrecision(15).padStart(22)}  LRE ${lre.toFixed(1).padStart(4)} (≥ ${required})`;
}
