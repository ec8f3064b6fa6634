/**
 * The one place where a registry result becomes what Excel's custom-functions runtime expects:
 * each ErrorCell becomes a CustomFunctions.Error with Excel's code and our message.
 * Only this folder touches the CustomFunctions global.
 */
import { compiledFunction } from '../registry';
import type { Arg } from '../registry';
import type { ErrorCell } from '../registry/types';

type ExcelCell = number | string | boolean | CustomFunctions.Error;

function codeOf(e: ErrorCell): CustomFunctions.ErrorCode {
  switch (e.error) {
    case '#VALUE!':
      return CustomFunctions.ErrorCode.invalidValue;
    case '#NUM!':
      return CustomFunctions.ErrorCode.invalidNumber;
    case '#DIV/0!':
      return CustomFunctions.ErrorCode.divisionByZero;
    case '#N/A':
      return CustomFunctions.ErrorCode.notAvailable;
  }
}

/**
 * Excel shows a custom message only with #VALUE! and #N/A ("Handle and return errors from your
 * custom function", Office Add-ins documentation); #NUM! and #DIV/0! go without one there. The
 * CLI and the task pane show every message.
 */
function toExcel(v: ErrorCell): ExcelCell {
  const code = codeOf(v);
  if (v.error === '#VALUE!' || v.error === '#N/A') return new CustomFunctions.Error(code, v.message);
  return new CustomFunctions.Error(code);
}

/** A worksheet function as Excel calls it: one matrix (or null) per declared parameter. */
export type Wrapper = (...args: Arg[]) => ExcelCell[][];

/**
 * Binds a registered function once, when the functions file loads: its compiled evaluator, with
 * error cells made CustomFunctions.Error as they arise, taking exactly `arity` arguments (the
 * runtime may pass an invocation object after them, which is not an argument of ours).
 */
export function bind(name: string, arity: number): Wrapper {
  const evaluator = compiledFunction(name, toExcel);
  if (!evaluator) throw new Error(`Leeway: no worksheet function ${name} in the registry`);
  const at = evaluator.at as unknown as (a0?: Arg, a1?: Arg, a2?: Arg, a3?: Arg, rest?: readonly Arg[]) => ExcelCell[][];
  switch (arity) {
    case 1:
      return (a0) => at(a0);
    case 2:
      return (a0, a1) => at(a0, a1);
    case 3:
      return (a0, a1, a2) => at(a0, a1, a2);
    case 4:
      return (a0, a1, a2, a3) => at(a0, a1, a2, a3);
    case 5:
      return (a0, a1, a2, a3, a4) => at(a0, a1, a2, a3, [a4]);
    case 6:
      return (a0, a1, a2, a3, a4, a5) => at(a0, a1, a2, a3, [a4, a5]);
    case 7:
      return (a0, a1, a2, a3, a4, a5, a6) => at(a0, a1, a2, a3, [a4, a5, a6]);
    default:
      throw new Error(`Leeway: ${name} has ${arity} parameters; the adapter binds 1 to 7`);
  }
}
