/**
 * Import of a variation table from the bytes of a file, from CSV/TSV text, or from a worksheet
 * range. Nothing is imported here: the result lists every problem with its spreadsheet row
 * (header = row 1) and column, and holds a candidate table that acceptImport() hands over once
 * the user has accepted. Reading (encodings, separators, quotes, decimal marks, headers, size
 * limits) is the generic importer's (src/engine/import); the checks of a table's own values are
 * here.
 */
import { TABLE_KIND } from './fields';
import type { Field, ImportOptions, ImportResult, NumericField, VariationRow, VariationTable, WrittenDecimals } from './types';
import { NUMERIC_FIELDS, REQUIRED_FIELDS } from './types';
import { checkUnits, makeReport, prepareBytes, prepareGrid, prepareText, readRows } from '../import/read';
import type { Prepared, RowReader } from '../import/read';
import type { ImportReport } from '../import/types';

export { guessDelimiter } from '../import/records';
export { formatProblem, formatReport, formatReading } from '../import/report';

/** A cell of a worksheet range as the task pane reads it. */
export type GridCell = string | number | boolean | null | undefined;

/** Above this a CV is almost surely not a percent number (or a typing error): a warning. */
const IMPLAUSIBLE_CV = 100;

/** Reads the bytes of a CSV/TSV file: any accepted encoding (the result records which). */
export function parseTableBytes(bytes: Uint8Array, options: ImportOptions = {}): ImportResult {
  return readTable(prepareBytes(TABLE_KIND, bytes), options);
}

/** Reads CSV or TSV text (with or without a UTF-8 BOM). */
export function parseTableText(text: string, options: ImportOptions = {}): ImportResult {
  return readTable(prepareText(TABLE_KIND, text), options);
}

/** Reads a worksheet range (first row = headers); numbers may already be numbers. */
export function parseTableGrid(grid: readonly (readonly GridCell[])[], options: ImportOptions = {}): ImportResult {
  return readTable(prepareGrid(TABLE_KIND, grid, options), options);
}

function readTable(prepared: Prepared<Field>, options: ImportOptions): ImportResult {
  if (!prepared.ok) return prepared.report;
  const seen = new Map<string, number>();
  const decimals: Record<string, WrittenDecimals> = {};
  const { sheet } = prepared;
  const read = readRows(TABLE_KIND, sheet, options, (row) => {
    const r = tableRow(row, seen);
    if (r) {
      const d = writtenDecimals(row);
      if (d) decimals[rowKey(r.analyte, r.specimen)] = d;
    }
    return r;
  });
  const report: ImportReport<Field> = makeReport<Field>({ problems: read.problems, columns: read.columns, delimiter: sheet.delimiter, rowCount: read.rowCount, encoding: sheet.encoding, decimal: read.decimal });
  if (!report.ok) return report;
  const candidate: VariationTable = {
    name: options.name ?? 'table',
    origin: options.origin ?? '',
    importedAt: options.importedAt ?? new Date().toISOString(),
    demo: options.demo ?? false,
    rows: read.records,
  };
  return Object.keys(decimals).length ? { ...report, candidate, decimals } : { ...report, candidate };
}

/** The decimals of a row's numbers as written, or undefined when none shows a count (a worksheet range). */
function writtenDecimals(row: RowReader<Field>): WrittenDecimals | undefined {
  const out: Partial<Record<NumericField, number>> = {};
  let any = false;
  for (const f of NUMERIC_FIELDS) {
    const d = row.has(f) ? row.decimals(f) : undefined;
    if (d !== undefined) {
      out[f] = d;
      any = true;
    }
  }
  return any ? out : undefined;
}

/** One data row: required cells, numbers and their ranges, the level an absolute limit needs, duplicates. */
function tableRow(row: RowReader<Field>, seen: Map<string, number>): VariationRow | undefined {
  let bad = false;
  for (const f of REQUIRED_FIELDS) {
    if (row.text(f) === '') {
      row.problem('error', 'missing-value', f, `${f} is blank: it is required`);
      bad = true;
    }
  }
  const nums: Partial<Record<Field, number | null>> = {};
  for (const f of NUMERIC_FIELDS) {
    const x = row.has(f) ? row.number(f) : null;
    if (x === undefined) {
      bad = true;
      nums[f] = null;
      continue;
    }
    nums[f] = x;
    if (x === null) continue;
    const t = row.text(f);
    if (x < 0) {
      row.problem('error', 'negative', f, `${f} must not be negative (got ${t})`);
      bad = true;
    } else if (f === 'level' && x === 0) {
      row.problem('error', 'zero', f, 'level must be greater than 0: a fixed limit is expressed as a percent of it');
      bad = true;
    } else if (f === 'cvi' && x === 0) {
      row.problem('warning', 'zero', f, 'cvi is 0: every specification from it will be 0');
    } else if ((f === 'cvi' || f === 'cvg') && x > IMPLAUSIBLE_CV) {
      row.problem('warning', 'implausible', f, `${f} is ${t}: CVs are percent numbers (5.7 means 5.7 %); check this value`);
    }
  }
  if (nums.limit_abs != null && nums.level == null && row.has('limit_abs')) {
    row.problem('error', 'needs-level', 'level', 'an absolute limit needs a level (the concentration it is judged at) to become a percent', row.letter('level') || row.letter('limit_abs'));
    bad = true;
  }
  checkUnits(TABLE_KIND, row, ['limit_abs', 'level']);
  const analyte = row.text('analyte');
  const specimen = row.text('specimen');
  if (analyte !== '') {
    const key = rowKey(analyte, specimen);
    const first = seen.get(key);
    if (first !== undefined) {
      row.problem('error', 'duplicate-row', 'analyte', `${analyte}${specimen ? ` (${specimen})` : ''} is listed twice: also on row ${first}; keep one row per analyte and specimen`);
      bad = true;
    } else {
      seen.set(key, row.line);
    }
  }
  if (bad) return undefined;
  return {
    analyte,
    specimen,
    unit: row.text('unit'),
    cvi: nums.cvi as number,
    cvg: nums.cvg ?? null,
    source: row.text('source'),
    limitAbs: nums.limit_abs ?? null,
    limitPct: nums.limit_pct ?? null,
    level: nums.level ?? null,
    note: row.text('note'),
    line: row.line,
  };
}

/** The identity of a row: analyte and specimen, case and surrounding spaces ignored. */
export function rowKey(analyte: string, specimen: string): string {
  return `${analyte.trim().toLowerCase()}\u0000${specimen.trim().toLowerCase()}`;
}

/**
 * The user accepted the report: the table is imported (optionally under another name).
 * Refuses a result with errors: fix the file or the header mapping and read it again.
 */
export function acceptImport(result: ImportResult, rename?: string): VariationTable {
  if (!result.ok || !result.candidate) {
    throw new Error(`the table has ${result.errorCount} error${result.errorCount === 1 ? '' : 's'}: fix them before importing`);
  }
  return rename ? { ...result.candidate, name: rename } : result.candidate;
}
