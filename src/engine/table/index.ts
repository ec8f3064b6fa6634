/**
 * The variation-table library: import (a file's bytes, CSV/TSV text or a worksheet range) with a report of every
 * problem, acceptance, and export back to CSV. The task pane and `leeway check` use these same
 * functions, so both give the same report.
 */
export type {
  ColumnMapping,
  Field,
  HeaderMapping,
  ImportOptions,
  ImportResult,
  Problem,
  ProblemCode,
  Severity,
  VariationRow,
  VariationTable,
  NumericField,
  WrittenDecimals,
} from './types';
export { FIELDS, NUMERIC_FIELDS, REQUIRED_FIELDS } from './types';
export { HEADER_ALIASES, TABLE_KIND, mapColumns, matchHeader, normaliseHeader } from './fields';
export { readDecimal } from './numbers';
export { acceptImport, formatProblem, formatReading, formatReport, parseTableBytes, parseTableGrid, parseTableText, rowKey } from './parse';
export type { GridCell } from './parse';
export { tableToCsv } from './csv';
export type { CsvOptions } from './csv';
