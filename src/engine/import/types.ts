/**
 * What every import reports, whatever the kind of file (a variation table, a control results
 * file, an EQA results file): every problem located as a spreadsheet shows the file (header =
 * row 1), how each column was read, and how the file itself was read (encoding, separator,
 * decimal mark). Nothing is imported until the report has no errors and the user accepts it.
 */
import type { TextEncodingName } from '../text/decode';
import type { Mark, DecimalDecision } from './numbers';

export type Severity = 'error' | 'warning';

export type ProblemCode =
  // the file as a whole
  | 'encoding'
  | 'too-large'
  | 'too-many-columns'
  | 'too-many-rows'
  | 'empty-file'
  | 'no-data'
  | 'parse'
  // headers
  | 'missing-column'
  | 'duplicate-column'
  | 'unknown-header'
  | 'blank-header'
  | 'ambiguous-header'
  // cells
  | 'extra-fields'
  | 'missing-value'
  | 'not-a-number'
  | 'ambiguous-number'
  | 'not-a-date'
  | 'ambiguous-date'
  | 'negative'
  | 'zero'
  | 'not-positive'
  | 'implausible'
  | 'needs-level'
  | 'unit-mismatch'
  // rows against rows
  | 'duplicate-row'
  | 'shared-run'
  | 'unsorted-dates';

/** One finding, located as a spreadsheet shows the file. */
export interface ImportProblem<F extends string = string> {
  readonly severity: Severity;
  readonly code: ProblemCode;
  /** 1-based row; the header is row 1; 0 for the file as a whole (its encoding, size, kind). */
  readonly row: number;
  /** Column letters (A, B, …), or null when the problem is a missing column or the whole file. */
  readonly column: string | null;
  /** The field concerned, when there is one. */
  readonly field?: F;
  /** Says what is wrong and what to do. */
  readonly message: string;
}

/** How one column of the file is read. */
export interface ImportColumn<F extends string = string> {
  /** 1-based column number. */
  readonly index: number;
  readonly letter: string;
  /** The header text as written in the file (trimmed). */
  readonly header: string;
  /** The field it feeds, or null: ignored. */
  readonly field: F | null;
  /** How the field was chosen. */
  readonly by: 'name' | 'alias' | 'user' | 'none';
  /** The unit the header states for an amount or a limit ("Limit (mmol/L)" → "mmol/L"). */
  readonly unit?: string;
}

/** A user's correction of the header match: header text as shown (trimmed) → field, or null to ignore. */
export type ColumnMappingOf<F extends string> = Readonly<Record<string, F | null>>;

/** How the file was read, for the report's first line. */
export interface FileReading {
  /** The encoding found; absent when the import was handed text or a worksheet range. */
  readonly encoding?: TextEncodingName;
  /** The file's decimal mark and what decided it; absent when no numbers were read. */
  readonly decimal?: { readonly mark: Mark | null; readonly by: DecimalDecision['by'] };
}

/** The report of an import, before anything is accepted. */
export interface ImportReport<F extends string = string> extends FileReading {
  /** True when there are no errors (warnings may remain). */
  readonly ok: boolean;
  readonly problems: readonly ImportProblem<F>[];
  readonly errorCount: number;
  readonly warningCount: number;
  readonly columns: readonly ImportColumn<F>[];
  /** The separator found: ',', ';' or '\t' ('' for a worksheet range or an empty file). */
  readonly delimiter: string;
  /** Data rows read (blank lines not counted). */
  readonly rowCount: number;
}

/** Options every import takes. */
export interface ReadOptions<F extends string> {
  /** Header corrections. */
  readonly mapping?: ColumnMappingOf<F>;
  /** For a worksheet range: the sheet row of the header and the sheet column of its first cell (default 1 and 1). */
  readonly firstRow?: number;
  readonly firstColumn?: number;
}
