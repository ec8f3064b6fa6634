/**
 * The .xlsx writer (exceljs) for new workbooks of `leeway fill` and `leeway demo`: it executes a
 * FillPlan on a worksheet. Same plan, same layout and same safety rules as the task pane's Excel
 * writer. Templates are filled by editing their package directly (src/cli/workbook), which keeps
 * every part of the lab's file that a fill does not need to change.
 *
 * How add-in function calls are stored in the file (live mode). Office's maintainers said in
 * public issue threads that Excel saves a JavaScript custom-function call with the prefix
 * "_xldudf_" and the namespace's dot turned into an underscore (NS.FUNC( saved as
 * _xldudf_NS_FUNC(), and that a call written into a file under its typed name does not
 * calculate on opening until the cell is entered again. How the dots inside our family names
 * (SPEC.TOTAL) are stored was not confirmed; this writer turns every dot of the name into an
 * underscore (_xldudf_LEEWAY_SPEC_TOTAL(), the reading that matches the one example the threads
 * give. Each formula cell carries its computed result, and the workbook does not ask for a
 * full recalculation on load, so a reader without the add-in sees the values.
 */
import type ExcelJS from 'exceljs';
import type { CellContent, CellResult, FillPlan, PlannedCell } from '../engine/fill';
import { NAMESPACE } from '../registry';

/** The name prefix Excel uses in files for JavaScript custom functions (see the file comment). */
export const ADDIN_PREFIX = '_xldudf_';

/**
 * A typed formula ("=LEEWAY.SPEC.TOTAL(D7,…)") as the file stores it, without the "=":
 * "_xldudf_LEEWAY_SPEC_TOTAL(D7,…)". Text inside string literals is left alone.
 */
export function storedFormula(typed: string): string {
  const body = typed.startsWith('=') ? typed.slice(1) : typed;
  const pattern = new RegExp(`\\b${NAMESPACE}((?:\\.[A-Z][A-Z0-9_]*)+)\\s*\\(`, 'gi');
  return body
    .split(/("(?:[^"]|"")*")/)
    .map((part, i) => (i % 2 === 1 ? part : part.replace(pattern, (_m, rest: string) => `${ADDIN_PREFIX}${NAMESPACE}${rest.toUpperCase().replace(/\./g, '_')}(`)))
    .join('');
}

/** The typed formula back from a stored one (for reading a filled workbook). */
export function typedFormula(stored: string): string {
  const pattern = new RegExp(`${ADDIN_PREFIX}${NAMESPACE}((?:_[A-Z][A-Z0-9]*)+)\\(`, 'g');
  return '=' + stored.split(/("(?:[^"]|"")*")/).map((part, i) => (i % 2 === 1 ? part : part.replace(pattern, (_m, rest: string) => `${NAMESPACE}${rest.replace(/_/g, '.')}(`))).join('');
}

const FONT: Partial<Record<PlannedCell['role'], Partial<ExcelJS.Font>>> = {
  title: { bold: true, size: 14 },
  demo: { bold: true, color: { argb: 'FFC00000' } },
  header: { bold: true },
  label: { bold: true },
  tier: { bold: true },
  z: { bold: true },
  caution: { italic: true },
};

const INPUT_FILL: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFFFF2CC' } };

function resultValue(r: CellResult): ExcelJS.CellFormulaValue['result'] {
  if (typeof r === 'object') return { error: r.error as ExcelJS.CellErrorValue['error'] };
  return r;
}

function cellValue(c: CellContent): ExcelJS.CellValue {
  switch (c.kind) {
    case 'number':
      return c.value;
    case 'text':
      // A plain string: exceljs stores it as text whatever it starts with.
      return c.text;
    case 'error':
      return { error: c.error.error as ExcelJS.CellErrorValue['error'] };
    case 'formula':
      return { formula: storedFormula(c.formula), result: resultValue(c.result) };
  }
}

export interface WriteProgress {
  (done: number, total: number): void;
}

/** Executes a plan on a worksheet. Refuses a plan with unconfirmed conflicts. */
export function writePlan(ws: ExcelJS.Worksheet, plan: FillPlan, progress?: WriteProgress): void {
  if (!plan.writable) throw new Error(`the plan has ${plan.conflicts.length} unconfirmed conflicts`);
  const total = plan.cells.length;
  let i = 0;
  for (const c of plan.cells) {
    const cell = ws.getCell(c.row, c.col);
    cell.value = cellValue(c.content);
    if (c.format) cell.numFmt = c.format;
    const font = FONT[c.role];
    if (font) cell.font = { ...(cell.font ?? {}), ...font };
    if (c.role === 'tier' || c.role === 'z') cell.fill = INPUT_FILL;
    if (c.role === 'header') {
      cell.border = { bottom: { style: 'thin' } };
      cell.alignment = { wrapText: true, vertical: 'bottom' };
    }
    if (c.role === 'tier') cell.dataValidation = { type: 'list', allowBlank: false, formulae: ['"optimum,desirable,minimum"'] };
    if (c.note) cell.note = c.note;
    if (progress && ++i % 2000 === 0) progress(i, total);
  }
  for (const [col, width] of Object.entries(plan.columnWidths)) ws.getColumn(Number(col)).width = width;
  const headers = plan.cells.filter((c) => c.role === 'header');
  if (headers.length && plan.target === 'new-sheet') ws.getRow(plan.headerRow).height = headerHeight(headers.map((c) => [c.content.kind === 'text' ? c.content.text : '', plan.columnWidths[c.col] ?? 10]));
  progress?.(total, total);
}

/**
 * Row height (points) for wrapped header texts: lines ≈ characters / (width − 1), 15 points a
 * line, at most 4 lines. Spreadsheet programs do not all size rows of a written file themselves.
 */
export function headerHeight(cells: ReadonlyArray<readonly [string, number]>): number {
  let lines = 1;
  for (const [t, width] of cells) {
    let n = 0;
    let line = 0;
    for (const word of t.split(/\s+/)) {
      if (line === 0) {
        n++;
        line = word.length;
      } else if (line + 1 + word.length <= width - 1) line += 1 + word.length;
      else {
        n++;
        line = word.length;
      }
    }
    lines = Math.max(lines, n);
  }
  return 15 * Math.min(lines, 4);
}
