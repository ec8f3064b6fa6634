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

/** A target cell that already holds something different from what the fill would write. */
export interface Conflict {
  readonly address: string;
  readonly row: number;
  readonly col: number;
  /** What the cell holds now (a formula as "=…"). */
  readonly existing: string | number | boolean;
  /** What the fill would write, as the user would type it. */
  readonly planned: string;
}

/** A cell of a sheet as read before filling: a value, a formula as "=…", or null when empty. */
export type ExistingCell = string | number | boolean | null;

/** The used part of an existing sheet: cells[i][j] is the cell at (origin.row + i, origin.col + j). */
export interface SheetSnapshot {
  readonly name: string;
  readonly origin: CellRef;
  readonly cells: readonly (readonly ExistingCell[])[];
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
  /** The first cell of the template's header row; default: the first non-empty row of the used range, from its first column. */
  readonly headerAt?: CellRef;
  readonly mapping?: TemplateMapping;
  /** Where the block with the tier cell, z cell, provenance and caution goes; default: two columns right of the used range, level with the header. */
  readonly blockAt?: CellRef;
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
   * SHA-256 of the table file, bytes as read (64 hex digits), so the sheet names one exact version
   * of the table. Absent: the block says it was not recorded (a table kept in the task pane's
   * library no longer has its file's bytes) or, for the built-in demo table, that there is no file.
   */
  readonly tableSha256?: string;
  /**
   * Decimals each input number was written with in the table file, by rowKey(analyte, specimen)
   * (the importer's ImportResult.decimals): input cells show them ("14.0" stays 14.0). Absent:
   * input numbers keep the cell's own format.
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
  readonly sources: readonly string[];
  /** SHA-256 of the table file's bytes (hex), or null when not recorded. */
  readonly tableSha256: string | null;
  /** Rows in the table, and rows this fill wrote. */
  readonly tableRows: number;
  readonly rowsFilled: number;
  readonly tier: Tier;
  readonly z: number;
  readonly date: string;
  readonly version: string;
  readonly mode: FillMode;
  readonly demo: boolean;
}

export interface FillPlan {
  readonly sheetName: string;
  readonly target: 'new-sheet' | 'template';
  readonly mode: FillMode;
  /** Every cell to write, row by row. Cells that already hold exactly the planned content are left out. */
  readonly cells: readonly PlannedCell[];
  /** "$B$3": the sheet's tier cell every derived formula points at. */
  readonly tierCell: string;
  /** "$B$4": the z cell. */
  readonly zCell: string;
  readonly headerRow: number;
  readonly columns: readonly PlannedColumn[];
  readonly rows: readonly PlannedRow[];
  /** Non-empty target cells that the fill would change. */
  readonly conflicts: readonly Conflict[];
  /** Target cells left out because they already hold what the fill would write. */
  readonly unchanged: number;
  readonly overwrite: boolean;
  /** False while there are conflicts whose overwriting the user has not confirmed: writers refuse such a plan. */
  readonly writable: boolean;
  /** Suggested widths in characters, by column number. */
  readonly columnWidths: Readonly<Record<number, number>>;
  readonly provenance: Provenance;
}

/** Why a plan could not be made (a template without an analyte column, say). */
export interface PlanProblem {
  /** The cell or column concerned ("D5", "column H"), or "" for the request as a whole. */
  readonly where: string;
  readonly message: string;
}

export type PlanResult = { readonly ok: true; readonly plan: FillPlan } | { readonly ok: false; readonly problems: readonly PlanProblem[] };
