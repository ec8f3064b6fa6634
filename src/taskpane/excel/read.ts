/**
 * The pane's own reads from the workbook (the fill's reads and writes are the SheetIO's in
 * sheetio.ts), each one load and one sync: the active sheet's used range and active cell
 * (observed bias/CV, the tier cell of a filled sheet), and the active sheet's name with the
 * selection (the start of a fill into the selected range).
 */
import type { ActiveSheet, CellGrid, TargetSheet } from '../host';
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

