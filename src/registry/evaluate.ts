/**
 * Evaluation of a registered function for either front end. Never throws: every failure comes
 * back as an error cell, and no NaN or ±Infinity ever reaches an output cell.
 *
 * Hot paths:
 * - a worksheet calls an elementwise function once per cell with 1×1 arguments: that case
 *   (compile's single-cell path) skips the grid machinery;
 * - a spilled call over a column (the usual spill) runs one loop that takes plain finite numbers
 *   as they are and coerces anything else through the parameter's rules (columnPath).
 * Defaults are coerced once, when a parameter is defined; error cells are made what the front end
 * wants (`mapError`) as they arise, never in a second pass over the result. A finite number goes
 * into a result row of its own literal, so a column of numbers stays unboxed in the JavaScript
 * engine (a shared literal for numbers and error objects boxes every number).
 */
import { LeewayError, valueError } from '../engine/errors';
import { asGrid, coerceCell, defaultValue, errorCell, isBlankFor, singleCell } from './coerce';
import type { AggregateDef, AnyParam, ElementwiseDef, FunctionDef, ScalarParam } from './define';
import type { Arg, ErrorCell, Grid, OutCell, Output, Scalar } from './types';

const NOT_FINITE: ErrorCell = { error: '#NUM!', message: 'the result is not a finite number: an input is out of range' };

/** Turns an error cell into what the front end shows (an Excel error object, or the cell as it is). */
type MapError = (e: ErrorCell) => OutCell;
const asItIs: MapError = (e) => e;

/** Any failure as an error cell (a LeewayError keeps its code and message). */
export function failure(e: unknown): ErrorCell {
  if (e instanceof LeewayError) return errorCell(e);
  const text = e instanceof Error ? e.message : String(e);
  return { error: '#VALUE!', message: `unexpected failure: ${text}` };
}

/** Marks a coerced argument that is not a value: an error (Failed), or a range where one cell was expected. */
class Marker {}

/** An error travelling through coerced arguments, told apart from values cheaply. */
class Failed extends Marker {
  constructor(readonly cell: ErrorCell) {
    super();
  }
}

const RANGE_ARG = new Marker();

function isMarker(v: unknown): v is Marker {
  return typeof v === 'object' && v !== null && v instanceof Marker;
}

function failedCell(v: unknown): ErrorCell | undefined {
  return typeof v === 'object' && v !== null && v instanceof Failed ? v.cell : undefined;
}

/** Coerces one cell; a plain finite number for an unchecked number parameter is taken as it is. */
function coerceOne(v: Scalar, p: ScalarParam): unknown {
  if (typeof v === 'number' && p.kind === 'number' && p.check === undefined && v - v === 0) return v;
  if (p.optional && isBlankFor(v, p)) return defaultValue(p);
  try {
    return coerceCell(v, p);
  } catch (e) {
    return new Failed(failure(e));
  }
}

function required(p: AnyParam): Failed {
  return new Failed({ error: '#N/A', message: `${p.name} is required` });
}

function ragged(p: AnyParam): LeewayError {
  return valueError(`${p.name} is an empty or ragged range`);
}

function raggedCell(p: AnyParam): never {
  throw ragged(p);
}

/**
 * Checks that the ranges among `grids` share one shape (rows of the first row's length); gives
 * [rows, cols] of the result. Each row's length is checked as the loop reaches it.
 */
function resultShape(def: ElementwiseDef, grids: ReadonlyArray<Grid | undefined>): [number, number] {
  let rows = 1;
  let cols = 1;
  let shapedBy = -1;
  for (let i = 0; i < grids.length; i++) {
    const g = grids[i];
    if (!g) continue;
    const r = g.length;
    const c = r && Array.isArray(g[0]) ? g[0].length : 0;
    if (r === 0 || c === 0) throw ragged(def.params[i]);
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
  return [rows, cols];
}

/** The arguments of one call: single cells and omitted ones coerced once, ranges left to the loop. */
function fixedArgs(params: readonly ScalarParam[], grids: ReadonlyArray<Grid | undefined>): { fixed: unknown[]; ranged: Array<Grid | undefined> } {
  const fixed: unknown[] = new Array(params.length);
  const ranged: Array<Grid | undefined> = new Array(params.length);
  for (let i = 0; i < params.length; i++) {
    const g = grids[i];
    if (g === undefined) fixed[i] = params[i].optional ? defaultValue(params[i]) : required(params[i]);
    else if (g.length === 1 && g[0].length === 1) fixed[i] = coerceOne(g[0][0], params[i]);
    else ranged[i] = g;
  }
  return { fixed, ranged };
}

/** The engine's answer, or the error it raised as an error cell. */
function guarded(fn: (...a: unknown[]) => unknown, a0: unknown, a1: unknown, a2: unknown, a3: unknown): OutCell {
  try {
    return fn(a0, a1, a2, a3) as OutCell;
  } catch (e) {
    return failure(e);
  }
}

/** True when every row of `g` is one plain finite number (a column of numbers). */
function numberColumn(g: Grid, rows: number): boolean {
  for (let r = 0; r < rows; r++) {
    const row = g[r];
    if (!Array.isArray(row) || row.length !== 1) return false;
    const v = row[0];
    if (typeof v !== 'number' || v - v !== 0) return false;
  }
  return true;
}

/** One result cell into the result column: numbers in a literal of their own (kept unboxed). */
function put(out: Output, r: number, res: OutCell, map: MapError): void {
  if (typeof res === 'number') out[r] = res - res === 0 ? [res] : [map(NOT_FINITE)];
  else if (typeof res === 'object') out[r] = [map(res)];
  else out[r] = [res];
}

/**
 * The commonest spill: the first k arguments are columns of plain numbers for unchecked number
 * parameters, the rest single valid cells. The cells are read straight into the engine call, so
 * no number is boxed on the way (each k has a call of its own: a value that is sometimes a cell
 * and sometimes a fixed argument would be).
 */
function numberColumnsPath(fn: (...a: unknown[]) => unknown, k: number, g: ReadonlyArray<Grid | undefined>, f: readonly unknown[], rows: number, map: MapError): Output {
  const out: Output = new Array(rows);
  const [g0, g1, g2, g3] = g as Grid[];
  const [, f1, f2, f3] = f;
  for (let r = 0; r < rows; r++) {
    let res: OutCell;
    try {
      if (k === 1) res = fn(g0[r][0], f1, f2, f3) as OutCell;
      else if (k === 2) res = fn(g0[r][0], g1[r][0], f2, f3) as OutCell;
      else if (k === 3) res = fn(g0[r][0], g1[r][0], g2[r][0], f3) as OutCell;
      else res = fn(g0[r][0], g1[r][0], g2[r][0], g3[r][0]) as OutCell;
    } catch (e) {
      res = failure(e);
    }
    put(out, r, res, map);
  }
  return out;
}

/** k when the first k arguments are number columns and the rest single cells (0 when not so). */
function leadingNumberColumns(ranged: ReadonlyArray<Grid | undefined>, plain: readonly boolean[], n: number, rows: number): number {
  let k = 0;
  while (k < n && ranged[k] !== undefined) k++;
  for (let i = k; i < n; i++) if (ranged[i] !== undefined) return 0;
  for (let i = 0; i < k; i++) if (!plain[i] || !numberColumn(ranged[i] as Grid, rows)) return 0;
  return k;
}

/**
 * The loop for a column of up to four arguments, every single-cell argument valid: numbers are
 * taken as they are, anything else is coerced, and the first failing argument in parameter order
 * gives the cell's error. A function of its own, so the JavaScript engine optimises it alone.
 */
function columnPath(
  fn: (...a: unknown[]) => unknown,
  rows: number,
  ranged: ReadonlyArray<Grid | undefined>,
  fixed: readonly unknown[],
  ps: readonly ScalarParam[],
  qs: readonly boolean[],
  map: MapError,
): Output {
  const [g0, g1, g2, g3] = ranged;
  const [f0, f1, f2, f3] = fixed;
  const [p0, p1, p2, p3] = ps;
  const [q0, q1, q2, q3] = qs;
  const out: Output = new Array(rows);
  for (let r = 0; r < rows; r++) {
    let a0 = f0;
    let a1 = f1;
    let a2 = f2;
    let a3 = f3;
    let bad: ErrorCell | undefined;
    if (g0 !== undefined) {
      const row = g0[r];
      const v = Array.isArray(row) && row.length === 1 ? row[0] : raggedCell(p0);
      if (q0 && typeof v === 'number' && v - v === 0) a0 = v;
      else if (bad === undefined) bad = failedCell((a0 = coerceOne(v, p0)));
    }
    if (g1 !== undefined) {
      const row = g1[r];
      const v = Array.isArray(row) && row.length === 1 ? row[0] : raggedCell(p1);
      if (q1 && typeof v === 'number' && v - v === 0) a1 = v;
      else if (bad === undefined) bad = failedCell((a1 = coerceOne(v, p1)));
    }
    if (g2 !== undefined) {
      const row = g2[r];
      const v = Array.isArray(row) && row.length === 1 ? row[0] : raggedCell(p2);
      if (q2 && typeof v === 'number' && v - v === 0) a2 = v;
      else if (bad === undefined) bad = failedCell((a2 = coerceOne(v, p2)));
    }
    if (g3 !== undefined) {
      const row = g3[r];
      const v = Array.isArray(row) && row.length === 1 ? row[0] : raggedCell(p3);
      if (q3 && typeof v === 'number' && v - v === 0) a3 = v;
      else if (bad === undefined) bad = failedCell((a3 = coerceOne(v, p3)));
    }
    if (bad !== undefined) {
      out[r] = [map(bad)];
      continue;
    }
    put(out, r, guarded(fn, a0, a1, a2, a3), map);
  }
  return out;
}

/** The loop for any shape and any number of arguments (arguments in an array). */
function gridPath(
  fn: (...a: unknown[]) => unknown,
  rows: number,
  cols: number,
  ranged: ReadonlyArray<Grid | undefined>,
  fixed: readonly unknown[],
  params: readonly ScalarParam[],
  plain: readonly boolean[],
  map: MapError,
): Output {
  const n = params.length;
  const errors = fixed.map(failedCell);
  const args: unknown[] = new Array(n);
  const out: Output = new Array(rows);
  for (let r = 0; r < rows; r++) {
    const line: OutCell[] = new Array(cols);
    for (let c = 0; c < cols; c++) {
      let bad: ErrorCell | undefined;
      for (let i = 0; i < n && bad === undefined; i++) {
        const g = ranged[i];
        if (g === undefined) {
          args[i] = fixed[i];
          bad = errors[i];
          continue;
        }
        const row = g[r];
        const v = Array.isArray(row) && row.length === cols ? row[c] : raggedCell(params[i]);
        args[i] = plain[i] && typeof v === 'number' && v - v === 0 ? v : coerceOne(v, params[i]);
        bad = failedCell(args[i]);
      }
      if (bad !== undefined) {
        line[c] = map(bad);
        continue;
      }
      try {
        const res = fn(...args) as number | string | boolean;
        line[c] = typeof res === 'number' && res - res !== 0 ? map(NOT_FINITE) : res;
      } catch (e) {
        line[c] = map(failure(e));
      }
    }
    out[r] = line;
  }
  return out;
}

type GridEvaluator = (grids: Array<Grid | undefined>) => Output;

/** The grid path of an elementwise function, made once per function (and front end). */
function makeElementwise(def: ElementwiseDef, map: MapError): GridEvaluator {
  const params = def.params;
  const plain = params.map((p) => p.kind === 'number' && p.check === undefined);
  const fn = def.fn as (...a: unknown[]) => unknown;
  const column = params.length <= 4;
  const none = { kind: 'number', name: '', text: '', optional: true } as ScalarParam;
  const ps = [0, 1, 2, 3].map((i) => params[i] ?? none);
  const qs = ps.map((_p, i) => plain[i] ?? true);
  return (grids) => {
    const [rows, cols] = resultShape(def, grids);
    const { fixed, ranged } = fixedArgs(params, grids);
    if (column && cols === 1 && !fixed.some((f) => f instanceof Failed)) {
      const k = leadingNumberColumns(ranged, plain, params.length, rows);
      if (k > 0) return numberColumnsPath(fn, k, ranged, fixed, rows, map);
      return columnPath(fn, rows, ranged, fixed, ps, qs, map);
    }
    return gridPath(fn, rows, cols, ranged, fixed, params, plain, map);
  };
}

function outValue(v: unknown): OutCell {
  if (typeof v === 'number') return v - v === 0 ? v : NOT_FINITE;
  if (typeof v === 'string' || typeof v === 'boolean') return v;
  if (v instanceof LeewayError) return errorCell(v);
  if (typeof v === 'object' && v !== null && 'error' in v && 'message' in v) return v as ErrorCell;
  return { error: '#VALUE!', message: 'unexpected failure: a result that is not a value' };
}

/** Coerces an aggregate function's arguments: range parameters as grids, scalar ones from their single cell. */
function aggregateArgs(def: AggregateDef, grids: ReadonlyArray<Grid | undefined>): unknown[] {
  return def.params.map((p, i) => {
    const g = grids[i];
    if (p.kind === 'range') return g;
    return coerceCell(singleCell(g, p, def.name), p);
  });
}

/** An aggregate's result: a value or a table, every cell checked and its errors mapped. */
function evaluateAggregate(def: AggregateDef, grids: Array<Grid | undefined>, map: MapError): Output {
  const result: unknown = def.fn(...aggregateArgs(def, grids));
  const cell = (v: unknown): OutCell => {
    const c = outValue(v);
    return typeof c === 'object' ? map(c) : c;
  };
  if (!Array.isArray(result)) return [[cell(result)]];
  return (result as unknown[][]).map((row) => row.map(cell));
}

/** Evaluates `def` on front-end arguments. Missing trailing arguments are omitted optionals. */
function evaluateDef(def: FunctionDef, args: readonly Arg[], map: MapError, elementwise?: GridEvaluator): Output {
  try {
    if (args.length > def.params.length) {
      throw valueError(`${def.name} takes at most ${def.params.length} arguments (got ${args.length})`);
    }
    const grids: Array<Grid | undefined> = def.params.map((p, i) => {
      const g = asGrid(args[i]);
      if (g === undefined && !p.optional) throw new LeewayError('#N/A', `${p.name} is required`);
      return g;
    });
    if (def.kind === 'aggregate') return evaluateAggregate(def, grids, map);
    return (elementwise ?? makeElementwise(def, map))(grids);
  } catch (e) {
    return [[map(failure(e))]];
  }
}

/**
 * A compiled evaluator of one function: `run(args)` takes the front end's argument list;
 * `at(a0, a1, a2, a3, rest)` takes up to four arguments positionally (the worksheet adapter's way,
 * which spares an argument array per call). Both give an Output grid and never throw.
 */
export interface Evaluator {
  run(args: readonly Arg[]): Output;
  at(a0?: Arg, a1?: Arg, a2?: Arg, a3?: Arg, rest?: readonly Arg[]): Output;
}

/** One parameter's coercer for the single-cell path, with its default and checks bound in. */
function singleCoercer(p: ScalarParam): (a: Arg) => unknown {
  const missing = p.optional ? defaultValue(p) : required(p);
  const plainNumber = p.kind === 'number' && p.check === undefined;
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
 * parameters get a single-cell path of their own closures; anything else goes through
 * evaluateDef.
 */
export function compile(def: FunctionDef, mapError?: (e: ErrorCell) => unknown): Evaluator {
  const n = def.params.length;
  const map = (mapError as MapError | undefined) ?? asItIs;
  const grid = def.kind === 'elementwise' ? makeElementwise(def, map) : undefined;
  const full = (args: readonly Arg[]): Output => evaluateDef(def, args, map, grid);
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
      for (const v of [v0, v1, v2, v3]) if (v instanceof Failed) return [[map(v.cell)]];
    }
    let r: number | string | boolean;
    try {
      r = fn(v0, v1, v2, v3);
    } catch (e) {
      return [[map(failure(e))]];
    }
    if (typeof r === 'number') return r - r === 0 ? [[r]] : [[map(NOT_FINITE)]];
    return [[r]];
  };
  return {
    run: (args) => (args.length > n ? full(args) : at(args[0], args[1], args[2], args[3])),
    at,
  };
}
