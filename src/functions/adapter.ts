/**
 * The one place where a registry result becomes what Excel's custom-functions runtime expects:
 * each ErrorCell becomes a CustomFunctions.Error with Excel's code and our message.
 * Only this file touches the CustomFunctions global.
 */
import { evaluate } from '../registry';
import type { Arg } from '../registry';
import type { ErrorCell, OutCell } from '../registry/types';

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
function toExcel(v: OutCell): ExcelCell {
  if (typeof v !== 'object') return v;
  const code = codeOf(v);
  if (v.error === '#VALUE!' || v.error === '#N/A') return new CustomFunctions.Error(code, v.message);
  return new CustomFunctions.Error(code);
}

/** Evaluates a registered function for Excel; never throws. Error cells are replaced in place. */
export function run(name: string, args: readonly Arg[]): ExcelCell[][] {
  const out = evaluate(name, args) as unknown as ExcelCell[][];
  for (let r = 0; r < out.length; r++) {
    const row = out[r];
    for (let c = 0; c < row.length; c++) {
      const v = row[c];
      if (typeof v === 'object') row[c] = toExcel(v as unknown as OutCell);
    }
  }
  return out;
}
