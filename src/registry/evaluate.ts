/**
 * Evaluation of a registered function for either front end. Never throws: every failure comes
 * back as an ErrorCell, and no NaN or ±Infinity ever reaches an output cell.
 *
 * Hot path: a worksheet calls an elementwise function once per cell with 1×1 arguments, so that
 * case (compile's single-cell path) skips the grid machinery; numbers that need no check are taken
 * as they are; defaults are coerced once per parameter, not once per call. Everything else takes
 * the grid path, which gives the same [[value]] for single cells.
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

/** Marks a coerced argument that is not a value: an error (Failed), or a range where one cell was expected. */
class Marker {}

/** An error travelling through coerced arguments, told apart from values cheaply. */
class Failed extends Marker {
  constructor(readonly cell: ErrorCell) {
    super();
  }
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

/**
 * The grid path of an elementwise function, made once per function (a closure of its own, so the
 * per-cell coercion and engine call keep their own type feedback in the JavaScript engine).
 */
function makeElementwise(def: ElementwiseDef): (grids: Array<Grid | undefined>) => Output {
  const coercers = def.params.map((p) => (v: Scalar) => coerceOne(v, p));
  const fn = def.fn as (...a: unknown[]) => number | string;
  return (grids) => {
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
    const args: unknown[] = new Array(n);
    const out: Output = new Array(rows);
    for (let r = 0; r < rows; r++) {
      const line: OutCell[] = new Array(cols);
      for (let c = 0; c < cols; c++) {
        let bad: ErrorCell | undefined;
        for (let i = 0; i < n; i++) {
          const g = ranged[i];
          const v = g === undefined ? fixed[i] : coercers[i](g[r][c]);
          if (v instanceof Failed) {
            bad = v.cell;
            break;
          }
          args[i] = v;
        }
        if (bad) {
          line[c] = bad;
          continue;
        }
        try {
          const res = n <= 4 ? fn(args[0], args[1], args[2], args[3]) : fn(...args);
          line[c] = typeof res === 'number' && res - res !== 0 ? NOT_FINITE : res;
        } catch (e) {
          line[c] = fail(e);
        }
      }
      out[r] = line;
    }
    return out;
  };
}

function evaluateAggregate(def: AggregateDef, grids: Array<Grid | undefined>): Output {
  const result = def.fn(grids);
  if (!Array.isArray(result)) return [[outValue(result)]];
  return result.map((row) => row.map((v) => (typeof v === 'object' ? v : outValue(v))));
}

/** Evaluates `def` on front-end arguments. Missing trailing arguments are omitted optionals. */
function evaluateDef(def: FunctionDef, args: readonly Arg[], elementwise?: (grids: Array<Grid | undefined>) => Output): Output {
  try {
    if (args.length > def.params.length) {
      throw valueError(`${def.name} takes at most ${def.params.length} arguments (got ${args.length})`);
    }
    const grids: Array<Grid | undefined> = def.params.map((p, i) => {
      const g = asGrid(args[i]);
      if (g === undefined && !p.optional) {
        throw new LeewayError('#N/A', `${p.name} is required`);
      }
      return g;
    });
    return def.kind === 'elementwise' ? (elementwise ?? makeElementwise(def))(grids) : evaluateAggregate(def, grids);
  } catch (e) {
    return [[fail(e)]];
  }
}

/**
 * A compiled evaluator of one function: `run(args)` takes the front end's argument list;
 * `at(a0, a1, a2, a3, rest)` takes up to four arguments positionally (the worksheet wrappers' way,
 * which spares an argument array per call). Both give an Output grid and never throw.
 */
export interface Evaluator {
  run(args: readonly Arg[]): Output;
  at(a0?: Arg, a1?: Arg, a2?: Arg, a3?: Arg, rest?: readonly Arg[]): Output;
}

const RANGE_ARG = new Marker();

function isMarker(v: unknown): v is Marker {
  return typeof v === 'object' && v !== null && v instanceof Marker;
}

/** One parameter's coercer for the single-cell path, with its default and checks bound in. */
function singleCoercer(p: ParamDef): (a: Arg) => unknown {
  const missing = p.optional ? defaultOf(p) : new Failed({ error: '#N/A', message: `${p.name} is required` });
  const plainNumber = p.type === 'number' && p.check === undefined;
  return (a) => {
    if (a === null || a === undefined) return missing;
    let v: Scalar = a as Scalar;
    if (Array.isArray(a)) {
      if (a.length !== 1) return RANGE_ARG;
      const row = a[0];
      if (!Array.isArray(row) || row.length !== 1) return RANGE_ARG;
      v = row[0];
    }
    if (plainNumber && typeof v === 'number' && v - v === 0) return v;
    return coerceOne(v, p);
  };
}

function argList(a0: Arg, a1: Arg, a2: Arg, a3: Arg, rest: readonly Arg[] | undefined): Arg[] {
  const all: Arg[] = [a0, a1, a2, a3, ...(rest ?? [])];
  let end = all.length;
  while (end > 0 && all[end - 1] === undefined) end--;
  return all.slice(0, end);
}

/**
 * Compiles a function definition once, at registry load (or once per front end that maps error
 * cells to its own error values with `mapError`). Elementwise functions of up to four
 * parameters get a single-cell path made of closures of their own (each keeps its own type
 * feedback in the JavaScript engine, which is what makes a per-cell call cheap); anything else
 * goes through evaluateDef.
 */
export function compile(def: FunctionDef, mapError?: (e: ErrorCell) => unknown): Evaluator {
  const n = def.params.length;
  const elementwise = def.kind === 'elementwise' ? makeElementwise(def) : undefined;
  const mapped = mapError ?? ((e: ErrorCell) => e);
  const full = (args: readonly Arg[]): Output => {
    const out = evaluateDef(def, args, elementwise);
    if (mapError) for (const row of out) for (let c = 0; c < row.length; c++) if (typeof row[c] === 'object') row[c] = mapError(row[c] as ErrorCell) as OutCell;
    return out;
  };
  if (def.kind !== 'elementwise' || n > 4) {
    return { run: full, at: (a0, a1, a2, a3, rest) => full(argList(a0, a1, a2, a3, rest)) };
  }
  const c = def.params.map(singleCoercer);
  const none = (): undefined => undefined;
  const c0 = c[0] ?? none;
  const c1 = c[1] ?? none;
  const c2 = c[2] ?? none;
  const c3 = c[3] ?? none;
  const fn = def.fn as (a?: unknown, b?: unknown, c?: unknown, d?: unknown) => number | string | boolean;
  const at = (a0?: Arg, a1?: Arg, a2?: Arg, a3?: Arg, rest?: readonly Arg[]): Output => {
    if (rest !== undefined && rest.length > 0) return full(argList(a0, a1, a2, a3, rest));
    const v0 = c0(a0);
    const v1 = c1(a1);
    const v2 = c2(a2);
    const v3 = c3(a3);
    if (isMarker(v0) || isMarker(v1) || isMarker(v2) || isMarker(v3)) {
      if (v0 === RANGE_ARG || v1 === RANGE_ARG || v2 === RANGE_ARG || v3 === RANGE_ARG) return full(argList(a0, a1, a2, a3, rest));
      for (const v of [v0, v1, v2, v3]) if (v instanceof Failed) return [[mapped(v.cell) as OutCell]];
    }
    let out: unknown;
    try {
      const r = fn(v0, v1, v2, v3);
      out = typeof r === 'number' && r - r !== 0 ? mapped(NOT_FINITE) : r;
    } catch (e) {
      out = mapped(fail(e));
    }
    return [[out as OutCell]];
  };
  return {
    run: (args) => (args.length > n ? full(args) : at(args[0], args[1], args[2], args[3])),
    at,
  };
}
