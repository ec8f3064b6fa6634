/**
 * The fill planner and what its plans are made of. Both writers (src/taskpane/excel,
 * src/cli/xlsx.ts) execute a FillPlan; neither decides anything about layout or safety.
 */
export type {
  AmbiguousRow,
  AnalyteName,
  BlockedCell,
  BlockSheet,
  CellContent,
  CellError,
  CellResult,
  CellRange,
  CellRole,
  Conflict,
  DerivedField,
  ExistingCell,
  FillField,
  FillMode,
  FillPlan,
  FillRequest,
  NewSheetTarget,
  PlannedCell,
  PlannedColumn,
  PlannedRow,
  PlanProblem,
  PlanResult,
  Provenance,
  LockedRange,
  SheetCell,
  SheetSnapshot,
  TemplateMapping,
  TemplateOnlyRow,
  TemplateReport,
  TemplateTarget,
} from './types';
export { DERIVED_FIELDS } from './types';
export { planFill, derivedFormula, derivedValue, decimalsFormat, shown, NO_FINGERPRINT, TITLE, TIER_CELL_LABEL, Z_CELL_LABEL, PROVENANCE_SHEET } from './plan';
export { findHeaderRow, headerRowAt, HEADER_SCAN_ROWS } from './scan';
export type { HeaderCell, HeaderColumn, HeaderRow } from './scan';
export { SheetIndex, DEFAULT_COLUMN_WIDTH, rangeText } from './sheet';
export { selectRows } from './select';
export type { Selection } from './select';
export { COLUMN_HEADERS, matchTemplateHeader } from './headers';
export { CAUTION, DEMO_MARKER, wrapText } from './caution';
export { a1, a1Range, columnLetters, columnNumber, parseA1, sheetPrefix, MAX_COLUMNS, MAX_ROWS } from './a1';
export type { CellRef } from './a1';
export { formatConflicts, formatTemplateReport, needsTextGuard, uniqueSheetName } from './util';
