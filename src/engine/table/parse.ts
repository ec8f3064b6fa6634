/**
 * Import of a variation table (SPEC.md section 5) from CSV/TSV text or a worksheet range.
 * Nothing is imported here: the result lists every problem with its spreadsheet row (header =
 * row 1) and column, and holds a candidate table that acceptImport() hands over once the user
 * has accepted. Parsing is papaparse's (quotes, separators inside quotes, line breaks inside
 * quotes, CRLF); the separator is found among comma, semicolon and tab.
 */
import Papa from 'papaparse';
import { mapColumns } from './fields';
import { readDecimal } from './numbers';
import type {
  ColumnMapping,
  Field,
  ImportOptions,
  ImportResult,
  Problem,
  VariationRow,
  VariationTable,
} from './types';
import { NUMERIC_FIELDS, REQUIRED_FIELDS } from './types';
import { columnLetters } from '../fill/a1';

/** A cell of a worksheet range as the task pane reads it. */
export type GridCell = string | number | boolean | null | undefined;

/** Above this a CV is almost surely not a percent number (or a typing error): a warning. */
const IMPLAUSIBLE_CV = 100;

/** Reads CSV or TSV text (with or without a UTF-8 BOM). */
export function parseTableText(text: string, options: ImportOptions = {}): ImportResult {
  const body = text.replace(/^\uFEFF/, '');
  if (body.trim() === '') {
    return finish([], [problem('error', 'empty-file', 1, 'A', undefined, 'the file is empty: it needs a header row (analyte, cvi, source, …) and one row per analyte')], '', 0, options);
  }
  const parsed = Papa.parse<string[]>(body, {
    delimiter: guessDelimiter(body),
    skipEmptyLines: false,
    header: false,
    dynamicTyping: false,
  });
  const delimiter = parsed.meta.delimiter;
  const rows = parsed.data;
  // A file that ends in a line break gives one last empty record: not a row a spreadsheet shows.
  if (rows.length > 1 && rows[rows.length - 1].length === 1 && rows[rows.length - 1][0] === '') rows.pop();
  const extra: Problem[] = [];
  for (const e of parsed.errors) {
    if (e.code === 'UndetectableDelimiter' || e.code === 'TooFewFields' || e.code === 'TooManyFields') continue;
    const row = (e.row ?? 0) + 1;
    extra.push(problem('error', 'parse', row, null, undefined, `cannot read the file here: ${e.message.replace(/\.$/, '')} (check the quotes on this row)`));
  }
  return readGrid(rows, options, delimiter, extra);
}

/**
 * The separator is read off the header line (outside quotes): the one of tab, semicolon and comma
 * that occurs most often there; on a tie tab, then semicolon. Data rows are no guide: their
 * text may hold any separator, and decimal commas look like separators.
 */
export function guessDelimiter(text: string): ',' | ';' | '\t' {
  const counts: Record<string, number> = { ',': 0, ';': 0, '\t': 0 };
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === '\n' || ch === '\r')) break;
    else if (!quoted && ch in counts) counts[ch]++;
  }
  if (counts['\t'] > 0 && counts['\t'] >= counts[';'] && counts['\t'] >= counts[',']) return '\t';
  if (counts[';'] > 0 && counts[';'] >= counts[',']) return ';';
  return ',';
}

/** Reads a worksheet range (first row = headers); numbers may already be numbers. */
export function parseTableGrid(grid: readonly (readonly GridCell[])[], options: ImportOptions = {}): ImportResult {
  const rows = grid.map((r) => r.map(cellText));
  if (rows.length === 0 || rows.every((r) => r.every((c) => c.trim() === ''))) {
    return finish([], [problem('error', 'empty-file', options.firstRow ?? 1, columnLetters(options.firstColumn ?? 1), undefined, 'the range is empty: it needs a header row (analyte, cvi, source, …) and one row per analyte')], '', 0, options);
  }
  return readGrid(rows, options, '', []);
}

function cellText(v: GridCell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  return v;
}

function problem(severity: Problem['severity'], code: Problem['code'], row: number, column: string | null, field: Field | undefined, message: string): Problem {
  return field === undefined ? { severity, code, row, column, message } : { severity, code, row, column, field, message };
}

/** Text that a spreadsheet would read as a formula, exported with a leading apostrophe (see csv.ts): the apostrophe comes off again. */
function unquoteFormulaText(t: string): string {
  return /^'[=+\-@']/.test(t) ? t.slice(1) : t;
}

function readGrid(rows: string[][], options: ImportOptions, delimiter: string, problems: Problem[]): ImportResult {
  const firstRow = options.firstRow ?? 1;
  const firstColumn = options.firstColumn ?? 1;
  const headers = rows[0] ?? [];
  const columns = mapColumns(headers, options.mapping ?? {}, firstColumn);
  const fieldColumn = new Map<Field, ColumnMapping>();
  // Data present per column, to warn only about headerless columns that hold something.
  const hasData = columns.map((_, c) => rows.some((r, i) => i > 0 && (r[c] ?? '').trim() !== ''));

  for (let c = 0; c < columns.length; c++) {
    const col = columns[c];
    if (col.field === null) {
      if (col.header === '') {
        if (hasData[c]) problems.push(problem('warning', 'blank-header', firstRow, col.letter, undefined, `column ${col.letter} has values but no header: it is ignored unless you map it to a field`));
      } else if (col.by !== 'user') {
        problems.push(problem('warning', 'unknown-header', firstRow, col.letter, undefined, `unknown header "${col.header}": this column is ignored unless you map it to one of analyte, specimen, unit, cvi, cvg, source, limit_abs, limit_pct, level, note`));
      }
      continue;
    }
    const earlier = fieldColumn.get(col.field);
    if (earlier) {
      problems.push(problem('error', 'duplicate-column', firstRow, col.letter, col.field, `"${col.header}" and "${earlier.header}" (column ${earlier.letter}) both map to ${col.field}: map one of them to another field or ignore it`));
      continue;
    }
    fieldColumn.set(col.field, col);
  }
  for (const f of REQUIRED_FIELDS) {
    if (!fieldColumn.has(f)) {
      problems.push(problem('error', 'missing-column', firstRow, null, f, `the required column ${f} is missing: add it or map one of the headers to it`));
    }
  }

  const out: VariationRow[] = [];
  const seen = new Map<string, number>();
  let rowCount = 0;
  const canRead = REQUIRED_FIELDS.every((f) => fieldColumn.has(f));
  for (let i = 1; i < rows.length; i++) {
    const cells = rows[i];
    if (cells.every((c) => c.trim() === '')) continue;
    rowCount++;
    const line = firstRow + i;
    if (cells.length > headers.length) {
      const extraCells = cells.slice(headers.length).filter((c) => c.trim() !== '');
      if (extraCells.length) {
        const hint = delimiter === ',' ? ' (a decimal comma in a comma-separated file? quote the number or save with ; as separator)' : '';
        problems.push(problem('error', 'extra-fields', line, columnLetters(firstColumn + headers.length), undefined, `this row has ${cells.length} fields but the header has ${headers.length}${hint}`));
      }
    }
    if (!canRead) continue;
    const text = (f: Field): string => {
      const col = fieldColumn.get(f);
      return col ? unquoteFormulaText((cells[col.index - firstColumn] ?? '').trim()) : '';
    };
    const at = (f: Field): string => fieldColumn.get(f)!.letter;
    let bad = false;
    for (const f of REQUIRED_FIELDS) {
      if (text(f) === '') {
        problems.push(problem('error', 'missing-value', line, at(f), f, `${f} is blank: it is required`));
        bad = true;
      }
    }
    const nums: Partial<Record<Field, number | null>> = {};
    for (const f of NUMERIC_FIELDS) {
      if (!fieldColumn.has(f)) {
        nums[f] = null;
        continue;
      }
      const t = text(f);
      if (t === '') {
        nums[f] = null;
        continue;
      }
      const x = readDecimal(t);
      if (x === undefined) {
        problems.push(problem('error', 'not-a-number', line, at(f), f, `${f} must be a number (got "${t.length > 40 ? t.slice(0, 40) + '…' : t}"); use . or , as the decimal mark and no thousands separator`));
        bad = true;
        nums[f] = null;
        continue;
      }
      if (x < 0) {
        problems.push(problem('error', 'negative', line, at(f), f, `${f} must not be negative (got ${t})`));
        bad = true;
      } else if (f === 'level' && x === 0) {
        problems.push(problem('error', 'zero', line, at(f), f, 'level must be greater than 0: a fixed limit is expressed as a percent of it'));
        bad = true;
      } else if (f === 'cvi' && x === 0) {
        problems.push(problem('warning', 'zero', line, at(f), f, 'cvi is 0: every specification from it will be 0'));
      } else if ((f === 'cvi' || f === 'cvg') && x > IMPLAUSIBLE_CV) {
        problems.push(problem('warning', 'implausible', line, at(f), f, `${f} is ${t}: CVs are percent numbers (5.7 means 5.7 %); check this value`));
      }
      nums[f] = x;
    }
    if (nums.limit_abs != null && nums.level == null && fieldColumn.has('limit_abs')) {
      problems.push(problem('error', 'needs-level', line, fieldColumn.get('level')?.letter ?? at('limit_abs'), 'level', 'an absolute limit needs a level (the concentration it is judged at) to become a percent'));
      bad = true;
    }
    const analyte = text('analyte');
    const specimen = text('specimen');
    if (analyte !== '') {
      const key = rowKey(analyte, specimen);
      const first = seen.get(key);
      if (first !== undefined) {
        problems.push(problem('error', 'duplicate-row', line, at('analyte'), 'analyte', `${analyte}${specimen ? ` (${specimen})` : ''} is listed twice: also on row ${first}; keep one row per analyte and specimen`));
        bad = true;
      } else {
        seen.set(key, line);
      }
    }
    if (bad) continue;
    out.push({
      analyte,
      specimen,
      unit: text('unit'),
      cvi: nums.cvi as number,
      cvg: nums.cvg ?? null,
      source: text('source'),
      limitAbs: nums.limit_abs ?? null,
      limitPct: nums.limit_pct ?? null,
      level: nums.level ?? null,
      note: text('note'),
      line,
    });
  }
  if (rows.length >= 1 && rowCount === 0 && problems.every((p) => p.code !== 'empty-file')) {
    problems.push(problem('error', 'no-data', firstRow + 1, columnLetters(firstColumn), undefined, 'there are no data rows below the header'));
  }
  return finish(columns, problems, delimiter, rowCount, options, out);
}

/** The identity of a row: analyte and specimen, case and surrounding spaces ignored. */
export function rowKey(analyte: string, specimen: string): string {
  return `${analyte.trim().toLowerCase()}\u0000${specimen.trim().toLowerCase()}`;
}

function finish(columns: ColumnMapping[], problems: Problem[], delimiter: string, rowCount: number, options: ImportOptions, rows: VariationRow[] = []): ImportResult {
  const sorted = [...problems].sort((a, b) => a.row - b.row || colOrder(a.column) - colOrder(b.column));
  const errorCount = sorted.filter((p) => p.severity === 'error').length;
  const warningCount = sorted.length - errorCount;
  const ok = errorCount === 0;
  const base = { ok, problems: sorted, errorCount, warningCount, columns, delimiter, rowCount };
  if (!ok) return base;
  const candidate: VariationTable = {
    name: options.name ?? 'table',
    origin: options.origin ?? '',
    importedAt: options.importedAt ?? new Date().toISOString(),
    demo: options.demo ?? false,
    rows,
  };
  return { ...base, candidate };
}

function colOrder(letters: string | null): number {
  if (letters === null) return 0;
  let n = 0;
  for (const ch of letters) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n;
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

/** One problem as one line: "row 4, column C (cvi): error: cvi must not be negative (got -2)". */
export function formatProblem(p: Problem): string {
  const where = p.column === null ? `row ${p.row}, column ${p.field ?? '?'} (missing)` : `row ${p.row}, column ${p.column}${p.field ? ` (${p.field})` : ''}`;
  return `${where}: ${p.severity}: ${p.message}`;
}

/** The whole report: one line per problem, then a count. */
export function formatReport(result: ImportResult): string[] {
  const lines = result.problems.map(formatProblem);
  const n = (k: number, w: string): string => `${k} ${w}${k === 1 ? '' : 's'}`;
  lines.push(`${n(result.rowCount, 'data row')}, ${n(result.errorCount, 'error')}, ${n(result.warningCount, 'warning')}`);
  return lines;
}
