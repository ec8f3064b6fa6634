/**
 * `leeway call FUNCTION [ARG ...]` and `leeway call --lines` (SPEC.md section 7).
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

/** One command-line word: JSON if it parses (number, array, null, "quoted"), a bare word otherwise. */
export function parseCliArg(text: string): Arg {
  const t = text.trim();
  if (/^[[{"]/.test(t) || /^-?(\d|\.\d)/.test(t) || t === 'null' || t === 'true' || t === 'false') {
    try {
      return toArg(JSON.parse(t));
    } catch (e) {
      if (e instanceof UsageError) throw e;
      if (/^[[{"]/.test(t)) throw new UsageError(`cannot read ${text} as JSON`);
    }
  }
  return text;
}

export type CallResult =
  | { ok: true; value: unknown }
  | { ok: false; error: string; message: string };

/** A 1×1 result prints as its value, a spill as rows; error cells print as their code. */
export function toJsonValue(out: Output, scalarShape: boolean): CallResult {
  if (out.length === 1 && out[0].length === 1) {
    const v = out[0][0];
    if (typeof v === 'object') return { ok: false, error: v.error, message: v.message };
    if (scalarShape) return { ok: true, value: v };
  }
  return { ok: true, value: out.map((row) => row.map((v) => (typeof v === 'object' ? v.error : v))) };
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
