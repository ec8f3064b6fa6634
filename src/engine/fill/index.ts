/**
 * The fill planner and what its plans are made of. Both writers (src/taskpane/excel,
 * src/cli/xlsx.ts) execute a FillPlan; neither decides anything about layout or safety.
 */
export type {
  CellContent,
  CellError,
  CellResult,
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
  SheetSnapshot,
  TemplateMapping,
  TemplateTarget,
} from './types';
export { DERIVED_FIELDS } from './types';
export { planFill, derivedFormula, derivedValue, decimalsFormat, shown, NO_FINGERPRINT, TITLE, TIER_CELL_LABEL, Z_CELL_LABEL } from './plan';
export { selectRows } from './select';
export type { Selection } from './select';
export { COLUMN_HEADERS, matchTemplateHeader } from './headers';
export { CAUTION, DEMO_MARKER, wrapText } from './caution';
export { a1, a1Range, columnLetters, columnNumber, parseA1, sheetPrefix, MAX_COLUMNS, MAX_ROWS } from './a1';
export type { CellRef } from './a1';
export { formatConflicts, needsTextGuard, uniqueSheetName } from './util';
