/**
 * `leeway call FUNCTION [ARG ...]` and `leeway call --lines`.
 * An ARG is a number, a word, or a JSON array for a range ([1,2,3] is a column, [[1,2],[3,4]] rows).
 */
import { evaluate, findFunction } from '../registry';
import type { Arg, Output } from '../registry';
import type { Grid, Scalar } from '../registry/types';

export class UsageError extends Error {}

/** A JSON value from the command line or a --lines array, turned into a function argument. */
export function toArg(v: unknown): Arg {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (Array.isArray(v)) {
    if (v.length === 0) throw new UsageError('an empty array is not a range');
    const nested = v.some((x) => Array.isArray(x));
    if (!nested) return v.map((x) => [toScalar(x)]);
    if (!v.every((x) => Array.isArray(x))) throw new UsageError('a range must be all rows ([[..],[..]]) or a flat column');
    return (v as unknown[][]).map((row) => row.map(toScalar)) as Grid;
  }
  throw new UsageError(`cannot use ${JSON.stringify(v)} as an argument`);
}

function toScalar(x: unknown): Scalar {
  if (x === null || typeof x === 'number' || typeof x === 'string' || typeof x === 'boolean') return x;
  throw new UsageError(`a range cell must be a number, text, true/false or null (got ${JSON.stringify(x)})`);
}

/** How deep a line may nest arrays: the request, a range's rows, a row's cells. */
const MAX_NESTING = 3;

/**
 * The depth of [ ] and { } nesting in JSON text, strings skipped; stops counting past `limit`
 * (so 100,000 "[" never reach the JSON reader, whose recursion would overflow the stack).
 */
export function nestingDepth(text: string, limit: number): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++;
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) {
      max = Math.max(max, ++depth);
      if (max > limit) return max;
    } else if (c === 0x5d || c === 0x7d) depth--;
  }
  return max;
}

/** A number literal in JSON text too large for a double (JSON.parse would read it as ±Infinity). */
function overflowing(text: string): string | undefined {
  for (const m of text.matchAll(/"(?:[^"\\]|\\.)*"|-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?/g)) {
    if (!m[0].startsWith('"') && !Number.isFinite(Number(m[0]))) return m[0];
  }
  return undefined;
}

function shorten(text: string): string {
  return text.length > 60 ? `${text.slice(0, 60)}…` : text;
}

/**
 * JSON text read with the CLI's bounds: at most `maxDepth` levels of arrays, and no number beyond
 * the range of a double (quoted as typed: "1e309 is beyond …", never "Infinity").
 */
export function parseJsonBounded(text: string, maxDepth: number): unknown {
  if (nestingDepth(text, maxDepth) > maxDepth) {
    throw new UsageError(`${shorten(text.trim())} nests arrays more than ${maxDepth} deep: a range is [1,2,3] (a column) or [[1,2],[3,4]] (rows)`);
  }
  const value: unknown = JSON.parse(text);
  const big = overflowing(text);
  if (big !== undefined) throw new UsageError(`${shorten(big)} is beyond the largest number a cell can hold (about 1.8e308)`);
  return value;
}

/** One command-line word: JSON if it parses (number, array, null, "quoted"), a bare word otherwise. */
export function parseCliArg(text: string): Arg {
  const t = text.trim();
  if (/^[[{"]/.test(t) || /^-?(\d|\.\d)/.test(t) || t === 'null' || t === 'true' || t === 'false') {
    try {
      return toArg(parseJsonBounded(t, MAX_NESTING - 1));
    } catch (e) {
      if (e instanceof UsageError) throw e;
      if (/^[[{"]/.test(t)) throw new UsageError(`cannot read ${shorten(text)} as JSON`);
    }
  }
  return text;
}

/** One --lines request: a JSON array ["FUNCTION", arg, ...] within the nesting bound. */
export function parseRequestLine(line: string): unknown {
  return parseJsonBounded(line, MAX_NESTING);
}

/** An error cell of a spilled result: its place in the spill (from 1) and its message. */
export interface CellError {
  readonly row: number;
  readonly col: number;
  readonly error: string;
  readonly message: string;
}

export type CallResult =
  | { ok: true; value: unknown; errors?: readonly CellError[] }
  | { ok: false; error: string; message: string };

/**
 * A 1×1 result prints as its value, a spill as rows; error cells print as their code in the
 * spill, and each one's message is listed in `errors` (row and column within the spill, from 1).
 */
export function toJsonValue(out: Output, scalarShape: boolean): CallResult {
  if (out.length === 1 && out[0].length === 1) {
    const v = out[0][0];
    if (typeof v === 'object') return { ok: false, error: v.error, message: v.message };
    if (scalarShape) return { ok: true, value: v };
  }
  const errors: CellError[] = [];
  const value = out.map((row, r) =>
    row.map((v, c) => {
      if (typeof v !== 'object') return v;
      errors.push({ row: r + 1, col: c + 1, error: v.error, message: v.message });
      return v.error;
    }),
  );
  return errors.length ? { ok: true, value, errors } : { ok: true, value };
}

export function callFunction(name: string, rawArgs: readonly unknown[]): CallResult {
  const def = findFunction(name);
  if (!def) throw new UsageError(`unknown function ${name} (try: leeway list)`);
  if (rawArgs.length > def.params.length) {
    throw new UsageError(`${def.name} takes at most ${def.params.length} arguments: ${def.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ')}`);
  }
  const args = rawArgs.map((a) => toArg(a));
  const scalarShape = args.every((a) => !Array.isArray(a)) || def.kind === 'aggregate';
  return toJsonValue(evaluate(def.name, args), scalarShape);
}
