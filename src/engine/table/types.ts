/**
 * The variation table: the laboratory's own biological-variation data, one row per analyte and
 * specimen. CVs are percent numbers (5.7 means 5.7 %).
 */
import type { ImportColumn, ImportProblem, ImportReport } from '../import/types';

/** The columns of a variation table, in their documented order. */
export type Field = 'analyte' | 'specimen' | 'unit' | 'cvi' | 'cvg' | 'source' | 'limit_abs' | 'limit_pct' | 'level' | 'note';

export const FIELDS: readonly Field[] = ['analyte', 'specimen', 'unit', 'cvi', 'cvg', 'source', 'limit_abs', 'limit_pct', 'level', 'note'];

export const REQUIRED_FIELDS: readonly Field[] = ['analyte', 'cvi', 'source'];

export type NumericField = 'cvi' | 'cvg' | 'limit_abs' | 'limit_pct' | 'level';

export const NUMERIC_FIELDS: readonly NumericField[] = ['cvi', 'cvg', 'limit_abs', 'limit_pct', 'level'];

/**
 * How many decimals each number of a row is written with in the file ("14.0" → 1), so that a
 * sheet can show it as the user wrote it. A display fact beside the row, never part of its value.
 */
export type WrittenDecimals = Readonly<Partial<Record<NumericField, number>>>;

/** One analyte and specimen. Optional numbers are null when the cell is blank. */
export interface VariationRow {
  readonly analyte: string;
  /** '' when the table has no specimen for this row. */
  readonly specimen: string;
  readonly unit: string;
  /** Within-subject biological variation, %. */
  readonly cvi: number;
  /** Between-subject biological variation, %; null when not given. */
  readonly cvg: number | null;
  /** Where the values come from, with date. */
  readonly source: string;
  /** Fixed limit, absolute part (in the row's unit). */
  readonly limitAbs: number | null;
  /** Fixed limit, percent part. */
  readonly limitPct: number | null;
  /** Concentration at which a fixed limit is judged (in the row's unit). */
  readonly level: number | null;
  readonly note: string;
  /** The row as a spreadsheet shows the file (header = row 1), for messages. */
  readonly line: number;
}

/** An accepted table: what the task pane stores and the fill planner reads. */
export interface VariationTable {
  /** The name the user knows it by (the file name by default). */
  readonly name: string;
  /** Where the table came from: a file name, a worksheet range, or "built-in demo table". */
  readonly origin: string;
  /** When it was imported, ISO 8601 (date and time, UTC). */
  readonly importedAt: string;
  /** True for the invented demo table: every output says so. */
  readonly demo: boolean;
  readonly rows: readonly VariationRow[];
}

export type { Severity, ProblemCode } from '../import/types';

/** One finding of the import check, located as a spreadsheet shows the file (row 0: the whole file). */
export type Problem = ImportProblem<Field>;

/** How one column of the file is read (and the unit its header states, for a limit or level). */
export type ColumnMapping = ImportColumn<Field>;

/**
 * A user's correction of the header match, keyed by the header text as shown in the file
 * (trimmed): a field, or null to ignore the column.
 */
export type HeaderMapping = Readonly<Record<string, Field | null>>;

export interface ImportOptions {
  /** The table's name; default "table". */
  readonly name?: string;
  /** Where it came from (file name, range address). */
  readonly origin?: string;
  /** Header corrections. */
  readonly mapping?: HeaderMapping;
  /** Import time, ISO 8601; default now. */
  readonly importedAt?: string;
  /** For a worksheet range: the sheet row of the header (default 1) and the sheet column of the first cell (default 1), so messages name the cells the user sees. */
  readonly firstRow?: number;
  readonly firstColumn?: number;
  /** Marks the table as the invented demo table. */
  readonly demo?: boolean;
}

/**
 * The outcome of reading a table: nothing is imported yet. `candidate` holds the table that
 * acceptImport() turns into a VariationTable; it is present only when there are no errors.
 * Besides the problems and columns it records the encoding found (when read from bytes) and the
 * file's decimal mark.
 */
export interface ImportResult extends ImportReport<Field> {
  readonly candidate?: VariationTable;
  /**
   * Decimals each number is written with, by rowKey(analyte, specimen); present with the
   * candidate when the table was read from a file or text (a worksheet range gives numbers).
   */
  readonly decimals?: Readonly<Record<string, WrittenDecimals>>;
}
