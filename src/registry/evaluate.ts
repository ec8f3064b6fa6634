/**
 * Evaluation of a registered function for either front end. Never throws: every failure comes
 * back as an ErrorCell, and no NaN or ±Infinity ever reaches an output cell.
 *
 * Hot path: a worksheet calls an elementwise function once per cell with 1×1 arguments, so that
 * case skips the grid machinery; numbers that need no check are taken as they are; defaults are
 * coerced once per parameter, not once per call.
 */
import { LeewayError, valueError } from '../engine/errors';
import { asGrid, coerceCell, errorCell, isBlankFor } from './coerce';
import type { AggregateDef, Arg, ElementwiseDef, ErrorCell, FunctionDef, Grid, OutCell, Output, ParamDef, Scalar } from './types';

const NOT_FINITE: ErrorCell = { error: '#NUM!', message: 'the result is not a finite number: an input is out of range' };

function fail(e: unknown): ErrorCell {
  if (e instanceof LeewayError) return errorCell(e);
  const text = e instanceof Error ? e.message : String(e);
  return { error: '#VALUE!', message: `unexpected failure: ${text}` };
}

function outValue(v: number | string | boolean): OutCell {
  if (typeof v === 'number' && !Number.isFinite(v)) return NOT_FINITE;
  return v;
}

/** A marker class so an error can travel through coerced-argument arrays and be told apart cheaply. */
class Failed {
  constructor(readonly cell: ErrorCell) {}
}

/** The coerced default of an optional parameter (params.ts computes it once, when the parameter is defined). */
function defaultOf(p: ParamDef): unknown {
  return p.coercedDefault !== undefined ? p.coercedDefault : coerceCell(undefined, p);
}

/** Coerces one cell; a plain finite number for an unchecked number parameter is taken as it is. */
function coerceOne(v: Scalar, p: ParamDef): unknown {
  if (typeof v === 'number' && p.type === 'number' && p.check === undefined && v - v === 0) return v;
  if (p.optional && isBlankFor(v, p)) return defaultOf(p);
  try {
    return coerceCell(v, p);
  } catch (e) {
    return new Failed(fail(e));
  }
}

function callWith(fn: (...a: unknown[]) => number | string | boolean, a: unknown[]): OutCell {
  try {
    switch (a.length) {
      case 1:
        return outValue(fn(a[0]));
      case 2:
        return outValue(fn(a[0], a[1]));
      case 3:
        return outValue(fn(a[0], a[1], a[2]));
      case 4:
        return outValue(fn(a[0], a[1], a[2], a[3]));
      default:
        return outValue(fn(...a));
    }
  } catch (e) {
    return fail(e);
  }
}

/** Marks a range where one cell was expected. */
const NOT_SINGLE = {};

/** Scratch argument arrays by arity, reused by the single-cell path (engine calls never re-enter it). */
const SCRATCH: unknown[][] = [];

/**
 * The single-cell path: every argument omitted, a scalar or a 1×1 grid (how Excel calls a
 * function typed in one cell). Returns NOT_SINGLE as soon as an argument is a larger range, so
 * the caller takes the grid path instead.
 */
function evaluateSingle(def: ElementwiseDef, args: readonly Arg[]): OutCell | typeof NOT_SINGLE {
  const params = def.params;
  const n = params.length;
  const vals = SCRATCH[n] ?? (SCRATCH[n] = new Array(n));
  let bad: ErrorCell | undefined;
  for (let i = 0; i < n; i++) {
    const p = params[i];
    const a = args[i];
    let v: unknown;
    if (a === null || a === undefined) {
      if (!p.optional) {
        bad = bad ?? { error: '#N/A', message: `${p.name} is required` };
        continue;
      }
      v = defaultOf(p);
    } else if (Array.isArray(a)) {
      if (a.length !== 1) return NOT_SINGLE;
      const row = a[0];
      if (!Array.isArray(row) || row.length !== 1) return NOT_SINGLE;
      v = coerceOne(row[0], p);
    } else {
      v = coerceOne(a, p);
    }
    if (v instanceof Failed) bad = bad ?? v.cell;
    else vals[i] = v;
  }
  if (bad) return bad;
  return callWith(def.fn as (...a: unknown[]) => number | string, vals);
}

function evaluateElementwise(def: ElementwiseDef, grids: Array<Grid | undefined>): Output {
  let rows = 1;
  let cols = 1;
  let shapedBy = -1;
  for (let i = 0; i < grids.length; i++) {
    const g = grids[i];
    if (!g) continue;
    const r = g.length;
    const c = r ? g[0].length : 0;
    if (r === 0 || c === 0 || g.some((row) => !Array.isArray(row) || row.length !== c)) {
      throw valueError(`${def.params[i].name} is an empty or ragged range`);
    }
    if (r === 1 && c === 1) continue;
    if (shapedBy < 0) {
      rows = r;
      cols = c;
      shapedBy = i;
    } else if (r !== rows || c !== cols) {
      throw valueError(
        `ranges do not pair up: ${def.params[shapedBy].name} is ${rows}×${cols} but ${def.params[i].name} is ${r}×${c}` +
          ' (give ranges of one shape, or single cells)',
      );
    }
  }
  // Single cells and omitted arguments are coerced once; range cells as the loop reaches them.
  const params = def.params;
  const n = params.length;
  const fixed: unknown[] = new Array(n);
  const ranged: Array<Grid | undefined> = new Array(n);
  for (let i = 0; i < n; i++) {
    const g = grids[i];
    if (g === undefined) {
      fixed[i] = params[i].optional ? defaultOf(params[i]) : new Failed({ error: '#N/A', message: `${params[i].name} is required` });
    } else if (g.length === 1 && g[0].length === 1) {
      fixed[i] = coerceOne(g[0][0], params[i]);
    } else {
      ranged[i] = g;
    }
  }
  const fn = def.fn as (...a: unknown[]) => number | string;
  const args: unknown[] = new Array(n);
  const out: Output = new Array(rows);
  for (let r = 0; r < rows; r++) {
    const line: OutCell[] = new Array(cols);
    for (let c = 0; c < cols; c++) {
      let bad: ErrorCell | undefined;
      for (let i = 0; i < n; i++) {
        const g = ranged[i];
        const v = g === undefined ? fixed[i] : coerceOne(g[r][c], params[i]);
        if (v instanceof Failed) {
          bad = v.cell;
          break;
        }
        args[i] = v;
      }
      line[c] = bad ?? callWith(fn, args);
    }
    out[r] = line;
  }
  return out;
}

function evaluateAggregate(def: AggregateDef, grids: Array<Grid | undefined>): Output {
  const result = def.fn(grids);
  if (!Array.isArray(result)) return [[outValue(result)]];
  return result.map((row) => row.map((v) => (typeof v === 'object' ? v : outValue(v))));
}

/** Evaluates `def` on front-end arguments. Missing trailing arguments are omitted optionals. */
export function evaluateDef(def: FunctionDef, args: readonly Arg[]): Output {
  try {
    if (args.length > def.params.length) {
      throw valueError(`${def.name} takes at most ${def.params.length} arguments (got ${args.length})`);
    }
    if (def.kind === 'elementwise') {
      const v = evaluateSingle(def, args);
      if (v !== NOT_SINGLE) return [[v as OutCell]];
    }
    const grids: Array<Grid | undefined> = def.params.map((p, i) => {
      const g = asGrid(args[i]);
      if (g === undefined && !p.optional) {
        throw new LeewayError('#N/A', `${p.name} is required`);
      }
      return g;
    });
    return def.kind === 'elementwise' ? evaluateElementwise(def, grids) : evaluateAggregate(def, grids);
  } catch (e) {
    return [[fail(e)]];
  }
}
