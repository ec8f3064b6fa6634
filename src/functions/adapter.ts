/**
 * The one place where a registry result becomes what Excel's custom-functions runtime expects:
 * each ErrorCell becomes a CustomFunctions.Error with Excel's code and our message.
 * Only this file touches the CustomFunctions global.
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

export type Wrapper = (a0?: Arg, a1?: Arg, a2?: Arg, a3?: Arg, rest?: readonly Arg[]) => ExcelCell[][];

/**
 * Binds a registered function once, when the functions file loads: its compiled evaluator, with
 * error cells made CustomFunctions.Error as they arise, so a call goes straight to the engine.
 */
export function bind(name: string): Wrapper {
  const evaluator = compiledFunction(name, toExcel);
  if (!evaluator) throw new Error(`Leeway: no worksheet function ${name} in the registry`);
  return evaluator.at as unknown as Wrapper;
}
