/**
 * Leeway's worksheet functions inside HyperFormula, a real spreadsheet engine (GPL: tests and
 * benchmarks only, never shipped). Every registry function becomes `LEEWAY.<NAME>` taking any
 * arguments (cells, ranges, literals), evaluated through the same registry the add-in uses;
 * ranges spill, errors become the spreadsheet's own error values with our message.
 */
import {
  ArraySize,
  CellError,
  EmptyValue,
  ErrorType,
  FunctionArgumentType,
  FunctionPlugin,
  HyperFormula,
  SimpleRangeValue,
} from 'hyperformula';
import type { ProcedureAst } from 'hyperformula/typings/parser';
import type { InterpreterState } from 'hyperformula/typings/interpreter/InterpreterState';
import { evaluate, FUNCTIONS, NAMESPACE } from '../../src/registry';
import type { Grid, OutCell, Output, Scalar } from '../../src/registry/types';

const ERROR_TYPES: Record<string, ErrorType> = {
  '#VALUE!': ErrorType.VALUE,
  '#NUM!': ErrorType.NUM,
  '#DIV/0!': ErrorType.DIV_BY_ZERO,
  '#N/A': ErrorType.NA,
};

type HfValue = unknown;

function toScalar(v: HfValue): Scalar {
  if (v === EmptyValue || v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (v instanceof CellError) return v.message ? `#ERROR ${v.message}` : '#ERROR';
  const n = Number(v);
  return Number.isFinite(n) ? n : String(v);
}

function toGrid(v: HfValue): Grid | Scalar {
  if (v instanceof SimpleRangeValue) return v.rawData().map((row) => row.map(toScalar));
  return toScalar(v);
}

function toHf(v: OutCell): number | string | boolean | CellError {
  if (typeof v === 'object') return new CellError(ERROR_TYPES[v.error], v.message);
  return v;
}

function fromOutput(out: Output): unknown {
  if (out.length === 1 && out[0].length === 1) return toHf(out[0][0]);
  return SimpleRangeValue.onlyValues(out.map((row) => row.map(toHf)) as never);
}


const METHODS: Record<string, { method: string; sizeOfResultArrayMethod: string; parameters: { argumentType: FunctionArgumentType; optionalArg?: boolean }[]; vectorizationForbidden: boolean }> = {};
for (const f of FUNCTIONS) {
  const id = `${NAMESPACE}.${f.name}`;
  METHODS[id] = {
    method: 'leeway',
    sizeOfResultArrayMethod: 'leewaySize',
    vectorizationForbidden: true,
    parameters: f.params.map((p) => ({ argumentType: FunctionArgumentType.ANY, optionalArg: !!p.optional })),
  };
}

/** The size of a literal cell range argument (A1:B3), which the engine otherwise sizes as a scalar. */
function rangeSize(a: ProcedureAst['args'][number]): ArraySize | undefined {
  const r = a as unknown as { type: string; start?: { col: number; row: number }; end?: { col: number; row: number } };
  if (r.type !== 'CELL_RANGE' || !r.start || !r.end) return undefined;
  return new ArraySize(Math.abs(r.end.col - r.start.col) + 1, Math.abs(r.end.row - r.start.row) + 1);
}

class LeewayPlugin extends FunctionPlugin {
  static override implementedFunctions = METHODS;

  leeway(ast: ProcedureAst, state: InterpreterState): unknown {
    const name = ast.procedureName.slice(NAMESPACE.length + 1);
    const args = ast.args.map((a) => {
      const v = this.evaluateAst(a, state);
      return toGrid(v);
    });
    return fromOutput(evaluate(name, args));
  }

  /** Spill size: for elementwise functions the shape of the first multi-cell argument; for tables, a trial evaluation. */
  leewaySize(ast: ProcedureAst, state: InterpreterState): ArraySize {
    const name = ast.procedureName.slice(NAMESPACE.length + 1);
    const def = FUNCTIONS.find((f) => f.name === name);
    if (def && def.kind === 'elementwise') {
      let size = ArraySize.scalar();
      for (const a of ast.args) {
        const s = rangeSize(a) ?? this.arraySizeForAst(a, state);
        if (s.width * s.height > 1) {
          size = s;
          break;
        }
      }
      return size;
    }
    const args = ast.args.map((a) => toGrid(this.evaluateAst(a, state)));
    const out = evaluate(name, args);
    return new ArraySize(out[0]?.length ?? 1, out.length);
  }
}

let registered = false;

/** A HyperFormula instance with the LEEWAY functions registered (GPL licence key: tests only). */
export function leewaySheet(sheets: Record<string, (string | number | boolean | null)[][]>): HyperFormula {
  if (!registered) {
    const translations: Record<string, string> = {};
    for (const id of Object.keys(METHODS)) translations[id] = id;
    HyperFormula.registerFunctionPlugin(LeewayPlugin, { enGB: translations, enUS: translations });
    registered = true;
  }
  return HyperFormula.buildFromSheets(sheets, { licenseKey: 'gpl-v3', smartRounding: false });
}
