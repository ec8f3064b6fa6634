/**
 * Evaluation of a registered function for either front end. Never throws: every failure comes
 * back as an ErrorCell, and no NaN or ±Infinity ever reaches an output cell.
 */
import { LeewayError, valueError } from '../engine/errors';
import { asGrid, coerceCell, errorCell } from './coerce';
import type { AggregateDef, Arg, ElementwiseDef, ErrorCell, FunctionDef, Grid, OutCell, Output } from './types';

const NOT_FINITE: ErrorCell = { error: '#NUM!', message: 'the result is not a finite number: an input is out of range' };

function fail(e: unknown): ErrorCell {
  if (e instanceof LeewayError) return errorCell(e);
  const text = e instanceof Error ? e.message : String(e);
  return { error: '#VALUE!', message: `unexpected failure: ${text}` };
}

function outValue(v: number | string): OutCell {
  if (typeof v === 'number' && !Number.isFinite(v)) return NOT_FINITE;
  return v;
}

/** Coerces each distinct cell of one argument once; 1×1 grids broadcast. */
function coerceGrid(g: Grid | undefined, def: ElementwiseDef, i: number): Array<Array<unknown>> {
  const p = def.params[i];
  const grid: Grid = g ?? [[undefined]];
  return grid.map((row) =>
    row.map((v) => {
      try {
        return coerceCell(v, p);
      } catch (e) {
        return fail(e);
      }
    }),
  );
}

function isErrorCell(v: unknown): v is ErrorCell {
  return typeof v === 'object' && v !== null && 'error' in v;
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
    if (r === 0 || c === 0 || g.some((row) => row.length !== c)) {
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
  const coerced = grids.map((g, i) => coerceGrid(g, def, i));
  const fn = def.fn as (...a: unknown[]) => number | string;
  const n = coerced.length;
  const args: unknown[] = new Array(n);
  const out: Output = new Array(rows);
  for (let r = 0; r < rows; r++) {
    const line: OutCell[] = new Array(cols);
    for (let c = 0; c < cols; c++) {
      let bad: ErrorCell | undefined;
      for (let i = 0; i < n; i++) {
        const g = coerced[i];
        const v = g.length === 1 && g[0].length === 1 ? g[0][0] : g[r][c];
        if (isErrorCell(v)) {
          bad = v;
          break;
        }
        args[i] = v;
      }
      if (bad) {
        line[c] = bad;
        continue;
      }
      try {
        line[c] = outValue(fn(...args));
      } catch (e) {
        line[c] = fail(e);
      }
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

