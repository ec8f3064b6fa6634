export { createSheetIO, excelSheetIO, excelInput, columnRuns, assertWritable, FillWriteError, READ_CELL_LIMIT } from './sheetio';
export type { ColumnRun, ExcelRun, RangeRead, SheetIO, SheetIOOptions, WriteReport, FillWriteErrorCode } from './sheetio';
export { ROLE_STYLES, TIER_CHOICES } from './styles';
