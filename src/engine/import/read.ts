/**
 * The generic importer: bytes, text or a worksheet range → located problems, the column mapping,
 * and one call per data row with a reader that hands out each field's text, number or date by the
 * file's own rules. The variation table, the control results file and the EQA results file are
 * kinds of it (their fields, names, required and numeric columns); their own checks run in the
 * row callback and after it.
 *
 * Order of work: the size limit; the encoding (text/decode.ts); the separator (from the header
 * line); records (records.ts, with the column and row limits); headers (headers.ts); the file's
 * decimal mark and slash-date order from all its numeric and date cells (numbers.ts, dates.ts);
 * then the rows.
 */
import { decodeText } from '../text/decode';
import type { TextEncodingName } from '../text/decode';
import { columnLetters } from '../fill/a1';
import { IMPORT_LIMITS, describeBytes } from './limits';
import { guessDelimiter, splitRecords } from './records';
import { readHeader, headerUnit, sameUnit } from './headers';
import type { HeaderSpec } from './headers';
import { decideDecimalMark, decimalsWritten, readNumberText, resolveAmbiguous } from './numbers';
import type { DecimalDecision, MarkEvidence } from './numbers';
import { decideDateOrder, readDateText } from './dates';
import type { DateOrder } from './dates';
import type { ImportColumn, ImportProblem, ImportReport, ProblemCode, ReadOptions, Severity } from './types';

/** A cell: text, or a number a worksheet already holds. */
export type Cell = string | number;

/** A kind of file the importer reads. */
export interface ImportKind<F extends string> extends HeaderSpec<F> {
  /** What the file is, in messages: "table", "control results file". */
  readonly noun: string;
  readonly required: readonly F[];
  readonly numeric: readonly F[];
  readonly dates?: readonly F[];
  /** The field holding the unit of a row's numbers, when the kind has one. */
  readonly unitField?: F;
  /** What an empty file lacks: "a header row (analyte, cvi, source, …) and one row per analyte". */
  readonly needs: string;
}

/** A file split into rows, ready for reading; or the report of why it cannot be. */
export interface Sheet<F extends string> {
  readonly rows: readonly (readonly Cell[])[];
  /** Columns the header row spans (up to the widest non-empty data), before trimming. */
  readonly width: number;
  readonly delimiter: string;
  readonly problems: ImportProblem<F>[];
  readonly encoding?: TextEncodingName;
}

export type Prepared<F extends string> = { readonly ok: true; readonly sheet: Sheet<F> } | { readonly ok: false; readonly report: ImportReport<F> };

export function problem<F extends string>(severity: Severity, code: ProblemCode, row: number, column: string | null, field: F | undefined, message: string): ImportProblem<F> {
  return field === undefined ? { severity, code, row, column, message } : { severity, code, row, column, field, message };
}

/** The report: problems sorted by row then column (stable), with their counts. */
export function makeReport<F extends string>(parts: {
  problems: readonly ImportProblem<F>[];
  columns?: readonly ImportColumn<F>[];
  delimiter?: string;
  rowCount?: number;
  encoding?: TextEncodingName;
  decimal?: ImportReport<F>['decimal'];
}): ImportReport<F> {
  const sorted = [...parts.problems].sort((a, b) => a.row - b.row || colOrder(a.column) - colOrder(b.column));
  const errorCount = sorted.filter((p) => p.severity === 'error').length;
  const base: ImportReport<F> = {
    ok: errorCount === 0,
    problems: sorted,
    errorCount,
    warningCount: sorted.length - errorCount,
    columns: parts.columns ?? [],
    delimiter: parts.delimiter ?? '',
    rowCount: parts.rowCount ?? 0,
  };
  return {
    ...base,
    ...(parts.encoding ? { encoding: parts.encoding } : {}),
    ...(parts.decimal ? { decimal: parts.decimal } : {}),
  };
}

function colOrder(letters: string | null): number {
  if (letters === null) return 0;
  let n = 0;
  for (const ch of letters) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n;
}

/** Bytes of a file: size limit, encoding, then as text. */
export function prepareBytes<F extends string>(kind: ImportKind<F>, bytes: Uint8Array): Prepared<F> {
  if (bytes.length > IMPORT_LIMITS.maxBytes) {
    return fileFailure<F>('too-large', `the file is ${describeBytes(bytes.length)}: Leeway reads files up to ${describeBytes(IMPORT_LIMITS.maxBytes)}; save only the ${kind.noun} itself`);
  }
  const decoded = decodeText(bytes);
  if (!decoded.ok) return fileFailure<F>('encoding', decoded.message);
  const extra: ImportProblem<F>[] = decoded.warning ? [problem<F>('warning', 'encoding', 0, null, undefined, decoded.warning)] : [];
  return prepareText(kind, decoded.text, extra, decoded.encoding);
}

function fileFailure<F extends string>(code: ProblemCode, message: string): Prepared<F> {
  return { ok: false, report: makeReport<F>({ problems: [problem<F>('error', code, 0, null, undefined, message)] }) };
}

/** CSV or TSV text (a leading BOM is dropped). */
export function prepareText<F extends string>(kind: ImportKind<F>, text: string, extra: ImportProblem<F>[] = [], encoding?: TextEncodingName): Prepared<F> {
  const body = text.replace(/^\uFEFF/, '');
  if (body.trim() === '') {
    const problems = [...extra, problem<F>('error', 'empty-file', 1, 'A', undefined, `the file is empty: it needs ${kind.needs}`)];
    return { ok: false, report: makeReport({ problems, encoding }) };
  }
  const delimiter = guessDelimiter(body);
  const records = splitRecords(body, delimiter);
  const problems = [...extra];
  for (const issue of records.issues) {
    const why = issue.kind === 'unclosed-quote' ? 'a quote opened on this row is never closed' : 'text follows a closing quote';
    problems.push(problem<F>('error', 'parse', issue.record + 1, null, undefined, `cannot read the file here: ${why} (check the quotes on this row)`));
  }
  if (records.stopped) {
    problems.push(limitProblem<F>(records.stopped.limit, records.stopped.record + 1));
    return { ok: false, report: makeReport({ problems, delimiter, encoding }) };
  }
  // A file that ends in a blank line: the records end there, as a spreadsheet shows them.
  return { ok: true, sheet: { rows: records.rows, width: headerWidth(records.rows, records.headerFields), delimiter, problems, encoding } };
}

function limitProblem<F extends string>(limit: 'columns' | 'rows', row: number): ImportProblem<F> {
  return limit === 'columns'
    ? problem<F>('error', 'too-many-columns', row, null, undefined, `row ${row} has values in more than ${IMPORT_LIMITS.maxColumns} columns: Leeway reads at most ${IMPORT_LIMITS.maxColumns} (empty columns after the last value do not count); delete the columns that are not needed, or save only the range that holds the data`)
    : problem<F>('error', 'too-many-rows', row, null, undefined, `the file has more than ${IMPORT_LIMITS.maxRows.toLocaleString('en-US')} rows, more than one worksheet holds: split it`);
}

/** The header's columns: its fields, but not beyond the widest record's last value. */
function headerWidth(rows: readonly (readonly Cell[])[], headerFields: number): number {
  let widest = 0;
  for (const r of rows) if (r.length > widest) widest = r.length;
  return Math.min(Math.max(headerFields, rows[0]?.length ?? 0), widest);
}

/** A worksheet range as the task pane reads it (first row = headers); numbers may be numbers. */
export function prepareGrid<F extends string>(kind: ImportKind<F>, grid: readonly (readonly (string | number | boolean | null | undefined)[])[], options: ReadOptions<F>): Prepared<F> {
  const firstRow = options.firstRow ?? 1;
  const firstColumn = options.firstColumn ?? 1;
  if (grid.length > IMPORT_LIMITS.maxRows) return { ok: false, report: makeReport({ problems: [limitProblem<F>('rows', firstRow + IMPORT_LIMITS.maxRows)] }) };
  const rows: Cell[][] = [];
  let headerFields = 0;
  for (let i = 0; i < grid.length; i++) {
    const src = grid[i];
    let last = src.length - 1;
    while (last >= 0 && gridText(src[last]).trim() === '' && typeof src[last] !== 'number') last--;
    if (last + 1 > IMPORT_LIMITS.maxColumns) return { ok: false, report: makeReport({ problems: [limitProblem<F>('columns', firstRow + i)] }) };
    const row: Cell[] = [];
    for (let c = 0; c <= last; c++) {
      const v = src[c];
      row.push(typeof v === 'number' ? (Number.isFinite(v) ? v : '') : gridText(v));
    }
    if (i === 0) headerFields = src.length;
    rows.push(row);
  }
  if (rows.every((r) => r.every((c) => typeof c === 'string' && c.trim() === ''))) {
    return {
      ok: false,
      report: makeReport({ problems: [problem<F>('error', 'empty-file', firstRow, columnLetters(firstColumn), undefined, `the range is empty: it needs ${kind.needs}`)] }),
    };
  }
  return { ok: true, sheet: { rows, width: headerWidth(rows, headerFields), delimiter: '', problems: [] } };
}

function gridText(v: string | number | boolean | null | undefined): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  return v;
}

function cellString(c: Cell | undefined): string {
  return c === undefined ? '' : typeof c === 'number' ? String(c) : c;
}

/** Text that a spreadsheet would read as a formula, exported with a leading apostrophe: the apostrophe comes off again. */
function unquoteFormulaText(t: string): string {
  return /^'[=+\-@']/.test(t) ? t.slice(1) : t;
}

/** What a row callback reads a data row with. */
export interface RowReader<F extends string> {
  /** The row as a spreadsheet shows it. */
  readonly line: number;
  has(f: F): boolean;
  /** The column letters of a field ('' when the file has no such column). */
  letter(f: F): string;
  /** The column's stated unit (from its header), if any. */
  unit(f: F): string | undefined;
  /** The field's text, trimmed ('' when blank or absent). */
  text(f: F): string;
  /** null when blank or absent; undefined when unreadable (the problem is already recorded). */
  number(f: F): number | null | undefined;
  /**
   * How many decimals the field's number is written with in the file ("14.0" → 1), for showing it
   * as written; undefined when blank, unreadable, in exponent notation, or already a number (a
   * worksheet range).
   */
  decimals(f: F): number | undefined;
  /** ISO 8601; null when blank or absent; undefined when unreadable (recorded). */
  date(f: F): string | null | undefined;
  /** Records a problem on this row, in the field's column (or the column given). */
  problem(severity: Severity, code: ProblemCode, field: F | undefined, message: string, column?: string): void;
}

export interface RowsRead<F extends string, R> {
  readonly records: R[];
  readonly problems: ImportProblem<F>[];
  readonly columns: ImportColumn<F>[];
  readonly rowCount: number;
  /** False when a required column is missing: no row was read. */
  readonly readable: boolean;
  readonly decimal?: ImportReport<F>['decimal'];
}

function mapColumns<F extends string>(kind: ImportKind<F>, headers: readonly string[], mapping: Readonly<Record<string, F | null>>, firstColumn: number, hasData: readonly boolean[], problems: ImportProblem<F>[], firstRow: number): ImportColumn<F>[] {
  return headers.map((h, i) => {
    const header = h.replace(/^\uFEFF/, '').trim();
    const index = firstColumn + i;
    const letter = columnLetters(index);
    if (Object.prototype.hasOwnProperty.call(mapping, header)) {
      const field = mapping[header];
      const unit = field !== null && (kind.units[field] === 'amount' || kind.units[field] === 'spread' || field === kind.limits?.abs) ? headerUnit(header) : undefined;
      return unit === undefined ? { index, letter, header, field, by: 'user' as const } : { index, letter, header, field, by: 'user' as const, unit };
    }
    if (header === '') return { index, letter, header, field: null, by: 'none' as const };
    const r = readHeader(kind, header);
    if (r.kind === 'field') return r.unit === undefined ? { index, letter, header, field: r.field, by: r.by } : { index, letter, header, field: r.field, by: r.by, unit: r.unit };
    if (r.kind === 'ambiguous') {
      const map = `map it to ${r.candidates.join(' or ')}, or ignore it`;
      if (hasData[i]) problems.push(problem<F>('error', 'ambiguous-header', firstRow, letter, undefined, `${r.why}: ${map} (its values are not read until then)`));
      else problems.push(problem<F>('warning', 'ambiguous-header', firstRow, letter, undefined, `${r.why}; it holds no values and is ignored (${map})`));
    }
    return { index, letter, header, field: null, by: 'none' as const };
  });
}

/** How each header is read, without a report (ambiguous headers read as ignored). */
export function columnsOf<F extends string>(kind: ImportKind<F>, headers: readonly string[], mapping: Readonly<Record<string, F | null>> = {}, firstColumn = 1): ImportColumn<F>[] {
  return mapColumns(kind, headers, mapping, firstColumn, headers.map(() => false), [], 1);
}

/**
 * Reads a prepared sheet: headers, the file's decimal mark, then each data row through `onRow`
 * (which returns the row's record, or undefined to leave the row out).
 */
export function readRows<F extends string, R>(kind: ImportKind<F>, sheet: Sheet<F>, options: ReadOptions<F>, onRow: (row: RowReader<F>) => R | undefined): RowsRead<F, R> {
  const firstRow = options.firstRow ?? 1;
  const firstColumn = options.firstColumn ?? 1;
  const problems = sheet.problems;
  const rows = sheet.rows;
  const width = sheet.width;
  const headers: string[] = [];
  for (let c = 0; c < width; c++) headers.push(cellString(rows[0]?.[c]));
  const hasData: boolean[] = new Array(width).fill(false);
  for (let i = 1; i < rows.length; i++) {
    const r = rows[i];
    for (let c = 0; c < r.length && c < width; c++) if (!hasData[c] && cellString(r[c]).trim() !== '') hasData[c] = true;
  }
  const columns = mapColumns(kind, headers, options.mapping ?? {}, firstColumn, hasData, problems, firstRow);
  const fieldColumn = new Map<F, ImportColumn<F>>();
  for (let c = 0; c < columns.length; c++) {
    const col = columns[c];
    if (col.field === null) {
      if (col.header === '') {
        if (hasData[c]) problems.push(problem<F>('warning', 'blank-header', firstRow, col.letter, undefined, `column ${col.letter} has values but no header: it is ignored unless you map it to a field`));
      } else if (col.by !== 'user' && !problems.some((p) => p.code === 'ambiguous-header' && p.column === col.letter)) {
        problems.push(problem<F>('warning', 'unknown-header', firstRow, col.letter, undefined, `unknown header "${col.header}": this column is ignored unless you map it to one of ${kind.fields.join(', ')}`));
      }
      continue;
    }
    const earlier = fieldColumn.get(col.field);
    if (earlier) {
      problems.push(problem<F>('error', 'duplicate-column', firstRow, col.letter, col.field, `"${col.header}" and "${earlier.header}" (column ${earlier.letter}) both map to ${col.field}: map one of them to another field or ignore it`));
      continue;
    }
    fieldColumn.set(col.field, col);
  }
  for (const f of kind.required) {
    if (!fieldColumn.has(f)) problems.push(problem<F>('error', 'missing-column', firstRow, null, f, `the required column ${f} is missing: add it or map one of the headers to it`));
  }
  const readable = kind.required.every((f) => fieldColumn.has(f));
  const offset = (f: F): number => fieldColumn.get(f)!.index - firstColumn;

  // The file's decimal mark and slash-date order, from every numeric and date cell it holds.
  const numericCols = kind.numeric.filter((f) => fieldColumn.has(f)).map((f) => ({ f, at: offset(f), letter: fieldColumn.get(f)!.letter }));
  const dateCols = (kind.dates ?? []).filter((f) => fieldColumn.has(f)).map((f) => offset(f));
  let comma: MarkEvidence = { count: 0 };
  let point: MarkEvidence = { count: 0 };
  let dmy = 0;
  let mdy = 0;
  let sawNumber = false;
  if (readable) {
    for (let i = 1; i < rows.length; i++) {
      const r = rows[i];
      for (const col of numericCols) {
        const v = r[col.at];
        if (typeof v !== 'string' || v.trim() === '') continue;
        sawNumber = true;
        const n = readNumberText(v);
        if (n.kind !== 'number' || n.decimal === null) continue;
        const seen = { row: firstRow + i, column: col.letter, text: v.trim() };
        if (n.decimal === ',') comma = { count: comma.count + 1, first: comma.first ?? seen };
        else point = { count: point.count + 1, first: point.first ?? seen };
      }
      for (const at of dateCols) {
        const v = r[at];
        if (typeof v !== 'string') continue;
        const d = readDateText(v);
        if (d.kind === 'date' && d.order === 'dmy') dmy++;
        else if (d.kind === 'date' && d.order === 'mdy') mdy++;
      }
    }
  }
  const decision: DecimalDecision = decideDecimalMark(comma, point, sheet.delimiter);
  const dateOrder: DateOrder | null = decideDateOrder(dmy, mdy);

  const records: R[] = [];
  let rowCount = 0;
  const headerCount = width;
  for (let i = 1; i < rows.length; i++) {
    const cells = rows[i];
    if (cells.every((c) => cellString(c).trim() === '')) continue;
    rowCount++;
    const line = firstRow + i;
    if (cells.length > headerCount) {
      const extraCells = cells.slice(headerCount).filter((c) => cellString(c).trim() !== '');
      if (extraCells.length) {
        const hint = sheet.delimiter === ',' ? ' (a decimal comma in a comma-separated file? quote the number or save with ; as separator)' : '';
        problems.push(problem<F>('error', 'extra-fields', line, columnLetters(firstColumn + headerCount), undefined, `this row has ${cells.length} fields but the header has ${headerCount}${hint}`));
      }
    }
    if (!readable) continue;
    const reader = rowReader(fieldColumn, cells, line, firstColumn, decision, dateOrder, problems);
    const record = onRow(reader);
    if (record !== undefined) records.push(record);
  }
  if (rows.length >= 1 && rowCount === 0) {
    problems.push(problem<F>('error', 'no-data', firstRow + 1, columnLetters(firstColumn), undefined, 'there are no data rows below the header'));
  }
  return {
    records,
    problems,
    columns,
    rowCount,
    readable,
    ...(sawNumber ? { decimal: { mark: decision.mark, by: decision.by } } : {}),
  };
}

function rowReader<F extends string>(
  fieldColumn: Map<F, ImportColumn<F>>,
  cells: readonly Cell[],
  line: number,
  firstColumn: number,
  decision: DecimalDecision,
  dateOrder: DateOrder | null,
  problems: ImportProblem<F>[],
): RowReader<F> {
  const raw = (f: F): Cell | undefined => {
    const col = fieldColumn.get(f);
    return col ? cells[col.index - firstColumn] : undefined;
  };
  const letter = (f: F): string => fieldColumn.get(f)?.letter ?? '';
  const text = (f: F): string => unquoteFormulaText(cellString(raw(f)).trim());
  const add = (severity: Severity, code: ProblemCode, field: F | undefined, message: string, column?: string): void => {
    problems.push(problem<F>(severity, code, line, column ?? (field === undefined ? null : letter(field) || null), field, message));
  };
  const reader: RowReader<F> = {
    line,
    has: (f) => fieldColumn.has(f),
    letter,
    unit: (f) => fieldColumn.get(f)?.unit,
    text,
    number(f) {
      const v = raw(f);
      if (typeof v === 'number') return v;
      const t = text(f);
      if (t === '') return null;
      const r = readNumberText(t);
      if (r.kind === 'number') return r.value;
      if (r.kind === 'ambiguous') {
        const d = resolveAmbiguous(t, r, decision);
        if ('value' in d) return d.value;
        add('error', 'ambiguous-number', f, `${f}: ${d.why}`);
        return undefined;
      }
      add('error', 'not-a-number', f, `${f} must be a number (got "${t.length > 40 ? t.slice(0, 40) + '…' : t}"); use . or , as the decimal mark and no thousands separator`);
      return undefined;
    },
    decimals(f) {
      if (typeof raw(f) === 'number') return undefined;
      const t = text(f);
      if (t === '') return undefined;
      const r = readNumberText(t);
      if (r.kind === 'number') return decimalsWritten(t, r.decimal);
      if (r.kind === 'ambiguous') {
        const d = resolveAmbiguous(t, r, decision);
        if (!('value' in d)) return undefined;
        return decimalsWritten(t, d.value === r.asDecimal && d.value !== r.asThousands ? r.mark : null);
      }
      return undefined;
    },
    date(f) {
      const t = text(f);
      if (t === '') return null;
      const d = readDateText(t);
      if (d.kind === 'date') return d.iso;
      if (d.kind === 'ambiguous') {
        if (dateOrder === 'dmy') return d.dmy;
        if (dateOrder === 'mdy') return d.mdy;
        add('error', 'ambiguous-date', f, `${f} "${t}" could be ${d.dmy.slice(0, 10)} (day/month/year) or ${d.mdy.slice(0, 10)} (month/day/year), and no other date in the file decides: write dates as YYYY-MM-DD`);
        return undefined;
      }
      add('error', 'not-a-date', f, `${f} must be a date (got "${t.length > 40 ? t.slice(0, 40) + '…' : t}"): write YYYY-MM-DD, or YYYY-MM-DD HH:MM with a time`);
      return undefined;
    },
    problem: add,
  };
  return reader;
}

/**
 * A warning when a column's stated unit (from its header) differs from the row's unit column.
 * Only for rows that hold a value in that column and a unit.
 */
export function checkUnits<F extends string>(kind: ImportKind<F>, row: RowReader<F>, fields: readonly F[]): void {
  const uf = kind.unitField;
  if (uf === undefined || !row.has(uf)) return;
  const rowUnit = row.text(uf);
  if (rowUnit === '') return;
  for (const f of fields) {
    const stated = row.unit(f);
    if (stated === undefined || row.text(f) === '') continue;
    if (!sameUnit(stated, rowUnit)) {
      row.problem('warning', 'unit-mismatch', f, `${f} is in ${stated} by its header but this row's ${uf} is ${rowUnit}: the value is read as written; convert it or correct the ${uf}`);
    }
  }
}
