/**
 * A fill plan: everything one fill writes, cell by cell, as data. The planner (plan.ts) decides;
 * the two writers (the task pane's Excel writer, the CLI's .xlsx writer) only execute a plan.
 */
import type { ErrorCode } from '../errors';
import type { Tier } from '../tiers';
import type { CellRef } from './a1';
import type { Field, VariationRow, VariationTable, WrittenDecimals } from '../table/types';

/** "live": derived columns as LEEWAY formulas (with their results); "values": as numbers, the formula in each header's note. */
export type FillMode = 'live' | 'values';

/** The columns a fill can write: the table's fields, a per-row tier, and the derived specifications. */
export type FillField = Field | 'tier' | DerivedField;

export type DerivedField = 'spec_cv' | 'spec_bias' | 'spec_total' | 'spec_mu' | 'fixed_pct';

export const DERIVED_FIELDS: readonly DerivedField[] = ['spec_cv', 'spec_bias', 'spec_total', 'spec_mu', 'fixed_pct'];

/** A computed result that is an Excel error. */
export interface CellError {
  readonly error: ErrorCode;
  readonly message: string;
}

export type CellResult = number | string | CellError;

export type CellContent =
  | { readonly kind: 'number'; readonly value: number }
  /** Always stored as text, whatever it starts with (= + - @ included). */
  | { readonly kind: 'text'; readonly text: string }
  /** A computed result stored as an Excel error value (values mode). */
  | { readonly kind: 'error'; readonly error: CellError }
  /** `formula` starts with "=" and uses the typed names (=LEEWAY.SPEC.TOTAL(…)); `result` is what it computes now. */
  | { readonly kind: 'formula'; readonly formula: string; readonly result: CellResult };

/** What a cell is for; writers map roles to formatting (bold headers, the tier cell's fill, …). */
export type CellRole =
  | 'title'
  | 'demo'
  | 'caution'
  | 'label'
  | 'tier'
  | 'z'
  | 'provenance'
  | 'header'
  | 'input'
  | 'row-tier'
  | 'derived';

export interface PlannedCell {
  readonly row: number;
  readonly col: number;
  /** "C7". */
  readonly address: string;
  readonly content: CellContent;
  readonly role: CellRole;
  /** Excel number format ("0.00"); absent: leave the cell's format as it is. */
  readonly format?: string;
  /** A note (comment) on the cell. */
  readonly note?: string;
}

/**
 * A target cell that already holds something different from what the fill would write. By
 * default the fill leaves it as it is and lists it; confirmed overwriting replaces it.
 */
export interface Conflict {
  readonly address: string;
  readonly row: number;
  readonly col: number;
  /** What the cell holds now (a formula as "=…"). */
  readonly existing: string | number | boolean;
  /** What the fill would write, as the user would type it. */
  readonly planned: string;
}

/**
 * A target cell the fill never writes, even when overwriting is confirmed: it lies in a merged
 * range (writing into it would write through the merge), or in a formula that spans other cells.
 */
export interface BlockedCell {
  readonly address: string;
  readonly row: number;
  readonly col: number;
  /** What the fill would have written, as the user would type it. */
  readonly planned: string;
  /** "merged B3:C3", "part of the array formula E2:E9", … */
  readonly reason: string;
}

/** A rectangle of cells, 1-based and inclusive. */
export interface CellRange {
  readonly top: number;
  readonly left: number;
  readonly bottom: number;
  readonly right: number;
}

/** A range of cells that must not be written (see BlockedCell), with the reason shown to the user. */
export interface LockedRange {
  readonly range: CellRange;
  readonly reason: string;
}

/** One non-empty cell of a sheet. */
export interface SheetCell {
  readonly row: number;
  readonly col: number;
  readonly value: string | number | boolean;
}

/** A cell of a sheet as read before filling: a value, a formula as "=…", or null when empty. */
export type ExistingCell = string | number | boolean | null;

/**
 * What the planner knows of an existing sheet. The cells come as a dense rectangle (cells[i][j]
 * is the cell at origin.row + i, origin.col + j; what Excel's used range gives the task pane),
 * or as a sparse list of the non-empty cells (what a file reader gives: a far stray cell costs one
 * entry), or both. Every other field is optional: absent means "none" or "not known".
 */
export interface SheetSnapshot {
  readonly name: string;
  readonly origin: CellRef;
  readonly cells: readonly (readonly ExistingCell[])[];
  readonly sparse?: readonly SheetCell[];
  /** Merged ranges of more than one cell. */
  readonly merges?: readonly CellRange[];
  /** Cells that must not be written (parts of array formulas, first cells of shared formulas, …). */
  readonly locked?: readonly LockedRange[];
  /** Column widths in characters, by column number, where the sheet sets them (0 for a hidden column). */
  readonly columnWidths?: Readonly<Record<number, number>>;
  /** The width of every other column, in characters; default 8.43 (the spreadsheet default). */
  readonly defaultColumnWidth?: number;
  /** The last row read: rows below it exist but were not read, so the planner treats them as not empty. */
  readonly readThrough?: number;
  /** The sheet's print area, when it has one. */
  readonly printArea?: readonly CellRange[];
  /** The names of every sheet of the workbook (to name a provenance sheet that is not taken). */
  readonly sheetNames?: readonly string[];
}

export interface NewSheetTarget {
  readonly kind: 'new-sheet';
  readonly sheetName: string;
}

/** A user's correction of the template's header match: header text (trimmed) → field, or null to leave the column alone. */
export type TemplateMapping = Readonly<Record<string, FillField | null>>;

export interface TemplateTarget {
  readonly kind: 'template';
  readonly sheet: SheetSnapshot;
  /** The first cell of the template's header row; default: the best header row of the first 30 rows (findHeaderRow). */
  readonly headerAt?: CellRef;
  readonly mapping?: TemplateMapping;
  /**
   * Where the block with the tier cell, z cell, provenance and caution goes. Default: directly
   * below the filled table when the rows there are empty, else a sheet of its own.
   */
  readonly blockAt?: CellRef;
  /** Table rows the template does not list go into empty rows directly below the template's table (default: they are only reported). */
  readonly append?: boolean;
}

export interface FillRequest {
  readonly table: VariationTable;
  /** The rows to fill, in order (see selectRows); default every row of the table. */
  readonly rows?: readonly VariationRow[];
  /** The sheet's tier (the tier cell). */
  readonly tier: Tier;
  /** The coverage factor of the z cell (≥ 0), e.g. 1.65. */
  readonly z: number;
  /** A tier for single rows, keyed by rowKey(analyte, specimen); formulas prefer it to the sheet's. */
  readonly rowTiers?: Readonly<Record<string, Tier>>;
  readonly mode: FillMode;
  readonly target: NewSheetTarget | TemplateTarget;
  /** The user confirmed overwriting the conflicting cells. */
  readonly overwrite?: boolean;
  /** The fill date, YYYY-MM-DD (provenance). */
  readonly date: string;
  /** Decimals shown in derived columns (display only; stored numbers keep full precision); default 2. */
  readonly decimals?: number;
  /** Program version for the provenance; default src/engine/version.ts. */
  readonly version?: string;
  /**
   * SHA-256 of the table file, bytes as read (64 lower-case hex digits), so the sheet names one
   * exact version of the table. Absent: the block says it was not recorded (a table kept in the
   * task pane's library no longer has its file's bytes) or, for the built-in demo table, that
   * there is no file.
   */
  readonly tableSha256?: string;
  /**
   * Decimals each input number was written with in the table file, by rowKey(analyte, specimen)
   * (the importer's ImportResult.decimals): input cells show them ("14.0" stays 14.0). On a
   * template only where the cell's own format is General and General would show fewer decimals
   * (see writtenFormat in plan.ts). Absent: input numbers keep the cell's own format.
   */
  readonly writtenDecimals?: Readonly<Record<string, WrittenDecimals>>;
}

/** One column the plan fills. */
export interface PlannedColumn {
  readonly field: FillField;
  readonly col: number;
  readonly letter: string;
  /** The header text (the template's own, or the planner's on a new sheet). */
  readonly header: string;
}

/** Where one table row went. */
export interface PlannedRow {
  readonly key: string;
  readonly analyte: string;
  readonly specimen: string;
  readonly row: number;
}

export interface Provenance {
  readonly tableName: string;
  readonly tableOrigin: string;
  readonly tableImported: string;
  /** SHA-256 of the table file's bytes (hex), or null when not recorded (the block then says why: NO_FINGERPRINT, or no file for the demo table). */
  readonly tableSha256: string | null;
  /** Rows of the table (all of them, not only those filled). */
  readonly tableRows: number;
  /** Table rows this fill wrote (on a template: the rows matched or appended, each counted once). */
  readonly rowsFilled: number;
  readonly sources: readonly string[];
  readonly tier: Tier;
  readonly z: number;
  readonly date: string;
  readonly version: string;
  readonly mode: FillMode;
  readonly demo: boolean;
}

/** A table row, named as the user knows it. */
export interface AnalyteName {
  readonly analyte: string;
  /** '' when the row has no specimen. */
  readonly specimen: string;
}

/** A row of the template's table whose analyte no table row matches. */
export interface TemplateOnlyRow extends AnalyteName {
  readonly row: number;
}

/** A template row without a specimen column whose analyte the table lists for several specimens. */
export interface AmbiguousRow {
  readonly row: number;
  readonly analyte: string;
  readonly specimens: readonly string[];
}

/** What a template fill found when it matched the table against the template (all empty on a new sheet). */
export interface TemplateReport {
  /** How the header row was found. */
  readonly header: 'given' | 'scanned';
  /** The template's table: header row to its last data row (after appending), e.g. "A6:F12". */
  readonly tableRange: string;
  /** Table rows the template does not list (written only when appending was asked for: see appended and noRoom). */
  readonly notInTemplate: readonly AnalyteName[];
  /** Table rows that appending found no room for. */
  readonly noRoom: readonly AnalyteName[];
  /** Why there was no room, when noRoom is not empty. */
  readonly noRoomReason: string;
  /** Table rows written into empty rows below the template's table. */
  readonly appended: readonly PlannedRow[];
  /** Template rows whose analyte (and specimen) the table does not have. */
  readonly missingFromTable: readonly TemplateOnlyRow[];
  /** Template rows left blank because the match is ambiguous. */
  readonly ambiguous: readonly AmbiguousRow[];
  /** Rows further down the sheet that name a table analyte but lie below the table's end (not filled). */
  readonly belowTable: readonly TemplateOnlyRow[];
  /** Where the provenance went, in words ("below the table, A14:A33" or "the sheet \"Leeway provenance\""). */
  readonly provenanceAt: string;
  /** Things the user should know that change nothing (a print area that leaves out the provenance, say). */
  readonly notes: readonly string[];
}

/** A sheet the fill adds for its provenance block (when there is no room below a template's table). */
export interface BlockSheet {
  readonly name: string;
  readonly cells: readonly PlannedCell[];
  readonly columnWidths: Readonly<Record<number, number>>;
}

export interface FillPlan {
  readonly sheetName: string;
  readonly target: 'new-sheet' | 'template';
  readonly mode: FillMode;
  /** Every cell to write, row by row. Cells that already hold exactly the planned content are left out. */
  readonly cells: readonly PlannedCell[];
  /** "$B$3": the tier cell every derived formula points at (on blockSheet when there is one). */
  readonly tierCell: string;
  /** "$B$4": the z cell (on blockSheet when there is one). */
  readonly zCell: string;
  /** The provenance block's own sheet, when it does not fit on the filled sheet. */
  readonly blockSheet?: BlockSheet;
  readonly headerRow: number;
  readonly columns: readonly PlannedColumn[];
  readonly rows: readonly PlannedRow[];
  /**
   * Non-empty target cells that hold something else. Without overwrite they are left as they
   * are (and are not in `cells`); with overwrite they are in `cells` and get replaced.
   */
  readonly conflicts: readonly Conflict[];
  /** Target cells the fill never writes (merged, parts of formulas spanning cells). */
  readonly blocked: readonly BlockedCell[];
  /** Target cells left out because they already hold what the fill would write. */
  readonly unchanged: number;
  readonly overwrite: boolean;
  /** True for every plan planFill makes (conflicts are left out of `cells` unless overwriting is confirmed); writers refuse a plan where it is false. */
  readonly writable: boolean;
  /** What matching the table against a template found (empty lists on a new sheet). */
  readonly template: TemplateReport;
  /** Suggested widths in characters, by column number. */
  readonly columnWidths: Readonly<Record<number, number>>;
  readonly provenance: Provenance;
}

/** Why a plan could not be made (a template without an analyte column, say). */
export interface PlanProblem {
  /** The cell or column concerned ("D5", "column H"), or "" for the request as a whole. */
  readonly where: string;
  readonly message: string;
  /** "no-header": no header row was found; each front end says how to point at it (--at, or the selection). */
  readonly code?: 'no-header';
}

export type PlanResult = { readonly ok: true; readonly plan: FillPlan } | { readonly ok: false; readonly problems: readonly PlanProblem[] };
