/**
 * The pane's own reads from the workbook (the fill's reads and writes are the SheetIO's in
 * sheetio.ts), each one load and one sync: the active sheet's used range and active cell
 * (observed bias/CV, the tier cell of a filled sheet), and the active sheet's name with the
 * selection (the start of a fill into the selected range).
 */
import type { ActiveCell, ActiveSheet, CellGrid, RangeRef, TargetSheet } from '../host';
import type { GridCell } from '../../engine/table';

function cells(values: unknown[][]): GridCell[][] {
  return values.map((row) => row.map((v) => (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean' ? v : null)));
}

export async function readActiveSheetGrid(context: Excel.RequestContext): Promise<ActiveSheet> {
  const sheet = context.workbook.worksheets.getActiveWorksheet();
  const used = sheet.getUsedRangeOrNullObject(true);
  const active = context.workbook.getActiveCell();
  sheet.load('name');
  used.load(['address', 'values', 'rowIndex', 'columnIndex', 'isNullObject']);
  active.load('rowIndex');
  await context.sync();
  const grid: CellGrid = used.isNullObject
    ? { sheet: sheet.name, address: `${sheet.name}!A1`, firstRow: 1, firstColumn: 1, values: [] }
    : { sheet: sheet.name, address: used.address, firstRow: used.rowIndex + 1, firstColumn: used.columnIndex + 1, values: cells(used.values) };
  return { grid, activeRow: active.rowIndex + 1 };
}

/** The active sheet's name and the selection (where a fill into "the selected range" starts). */
export async function readActiveContext(context: Excel.RequestContext): Promise<{ sheet: string; selection: TargetSheet['selection'] }> {
  const sheet = context.workbook.worksheets.getActiveWorksheet();
  const sel = context.workbook.getSelectedRange();
  sheet.load('name');
  sel.load(['address', 'rowIndex', 'columnIndex', 'rowCount', 'columnCount']);
  await context.sync();
  return { sheet: sheet.name, selection: { row: sel.rowIndex + 1, col: sel.columnIndex + 1, rows: sel.rowCount, cols: sel.columnCount, address: sel.address } };
}

/** The active cell's sheet, address, formula and value (one load, one sync). */
export async function readActiveCellOf(context: Excel.RequestContext): Promise<ActiveCell> {
  const cell = context.workbook.getActiveCell();
  const sheet = cell.worksheet;
  cell.load(['address', 'formulas', 'values']);
  sheet.load('name');
  await context.sync();
  const formula = cell.formulas[0][0];
  return {
    sheet: sheet.name,
    address: cell.address.includes('!') ? cell.address.slice(cell.address.lastIndexOf('!') + 1) : cell.address,
    formula: typeof formula === 'string' ? formula : String(formula ?? ''),
    value: cells(cell.values)[0][0],
  };
}

/** The values of several ranges in one batch (sheet null: the active sheet). */
export async function readRangesOf(context: Excel.RequestContext, refs: readonly RangeRef[]): Promise<GridCell[][][]> {
  const active = context.workbook.worksheets.getActiveWorksheet();
  const ranges = refs.map((r) => {
    const range = (r.sheet ? context.workbook.worksheets.getItem(r.sheet) : active).getRange(r.address);
    range.load('values');
    return range;
  });
  await context.sync();
  return ranges.map((r) => cells(r.values));
}
