/**
 * The control results file: one row per control result, read by the same rules as a variation
 * table (separators, decimal marks, encodings, header names, limits). Columns: analyte, level
 * (the control material), run (a label or date-time; the results of one run share it), value,
 * target, sd (all required); date, instrument, lot, unit, note (optional). value, target and sd
 * are in the result's unit; sd > 0 (z = (value − target)/sd).
 *
 * Checks: required columns and cells; numbers; sd > 0; readable dates; a column unit stated in
 * a header against the row's unit (warning). Across rows: the same analyte, level, run, date and
 * value twice (warning: it may be a genuine repeat, but a copy would count twice in a review); a
 * run label used by more than one analyte (warning, once per file: runs are read per analyte, so
 * the label makes no common run of them; a label copied by mistake would join results that are not
 * one run); dates going back within an analyte and level (warning; the file order is kept).
 */
import { checkUnits, makeReport, prepareBytes, prepareGrid, prepareText, problem, readRows } from './read';
import type { ImportKind, Prepared, RowReader } from './read';
import type { UnitRule } from './headers';
import type { ImportProblem, ImportReport, ReadOptions } from './types';
import { DateOrder, groupInOrder, labelKey, requireFields } from './order';

export type ResultsField = 'analyte' | 'level' | 'run' | 'value' | 'target' | 'sd' | 'date' | 'instrument' | 'lot' | 'unit' | 'note';

export const RESULTS_FIELDS: readonly ResultsField[] = ['analyte', 'level', 'run', 'value', 'target', 'sd', 'date', 'instrument', 'lot', 'unit', 'note'];
export const RESULTS_REQUIRED: readonly ResultsField[] = ['analyte', 'level', 'run', 'value', 'target', 'sd'];
export const RESULTS_NUMERIC: readonly ResultsField[] = ['value', 'target', 'sd'];

/** Other names for each field, in normalised form (lower case, no spaces _ - . : /). */
export const RESULTS_ALIASES: Readonly<Record<ResultsField, readonly string[]>> = {
  analyte: ['test', 'measurand', 'analytename', 'component', 'parameter', 'name'],
  level: ['controllevel', 'qclevel', 'material', 'controlmaterial', 'control', 'qcmaterial', 'levelname'],
  run: ['runid', 'runlabel', 'runno', 'runnumber', 'batch', 'series', 'rundatetime'],
  value: ['result', 'measuredvalue', 'observed', 'observedvalue', 'qcvalue', 'controlvalue', 'measurement'],
  target: ['targetvalue', 'mean', 'targetmean', 'expected', 'expectedvalue', 'setpoint'],
  sd: ['targetsd', 'standarddeviation', 'stdev', 'stddev', 'sdtarget'],
  date: ['datetime', 'time', 'timestamp', 'dateandtime', 'measuredat', 'resultdate'],
  instrument: ['analyser', 'analyzer', 'device', 'platform', 'instrumentid'],
  lot: ['controllot', 'lotnumber', 'lotno', 'qclot'],
  unit: ['units', 'uom'],
  note: ['notes', 'comment', 'comments', 'remark', 'remarks'],
};

const UNITS: Readonly<Record<ResultsField, UnitRule>> = {
  analyte: 'text',
  level: 'text',
  run: 'text',
  value: 'amount',
  target: 'amount',
  sd: 'spread',
  date: 'text',
  instrument: 'text',
  lot: 'text',
  unit: 'text',
  note: 'text',
};

export const RESULTS_KIND: ImportKind<ResultsField> = {
  noun: 'control results file',
  fields: RESULTS_FIELDS,
  aliases: RESULTS_ALIASES,
  units: UNITS,
  required: RESULTS_REQUIRED,
  numeric: RESULTS_NUMERIC,
  dates: ['date'],
  unitField: 'unit',
  needs: 'a header row (analyte, level, run, value, target, sd) and one row per control result',
};

/** One control result. Optional texts are '' when blank; date is ISO 8601 (no zone) or null. */
export interface ControlResult {
  readonly analyte: string;
  /** The control material ("1", "low", "Level 2"). */
  readonly level: string;
  /** The run label: results with the same label (for one analyte) form one run. */
  readonly run: string;
  readonly value: number;
  readonly target: number;
  /** > 0, in the result's unit. */
  readonly sd: number;
  readonly date: string | null;
  readonly instrument: string;
  readonly lot: string;
  readonly unit: string;
  readonly note: string;
  /** The row as a spreadsheet shows the file (header = row 1). */
  readonly line: number;
}

/** The results of one control material of one analyte, in file order. */
export interface ControlLevelResults {
  readonly level: string;
  readonly results: readonly ControlResult[];
}

/** The results of one analyte by material, materials in order of first appearance. */
export interface ControlAnalyteResults {
  readonly analyte: string;
  readonly levels: readonly ControlLevelResults[];
}

/** An accepted control results file. */
export interface ControlResultsFile {
  readonly name: string;
  readonly origin: string;
  readonly importedAt: string;
  /** Every result in file order. */
  readonly results: readonly ControlResult[];
  /** The same results grouped by analyte and level (case and spaces of the labels ignored), in order of first appearance. */
  readonly analytes: readonly ControlAnalyteResults[];
}

export type ResultsMapping = Readonly<Record<string, ResultsField | null>>;

export interface ResultsOptions extends ReadOptions<ResultsField> {
  readonly name?: string;
  readonly origin?: string;
  /** ISO 8601; default now. */
  readonly importedAt?: string;
}

export interface ResultsImport extends ImportReport<ResultsField> {
  /** Present only when there are no errors. */
  readonly candidate?: ControlResultsFile;
}

export type ResultsProblem = ImportProblem<ResultsField>;

export function parseResultsBytes(bytes: Uint8Array, options: ResultsOptions = {}): ResultsImport {
  return readResults(prepareBytes(RESULTS_KIND, bytes), options);
}

export function parseResultsText(text: string, options: ResultsOptions = {}): ResultsImport {
  return readResults(prepareText(RESULTS_KIND, text), options);
}

export function parseResultsGrid(grid: readonly (readonly (string | number | boolean | null | undefined)[])[], options: ResultsOptions = {}): ResultsImport {
  return readResults(prepareGrid(RESULTS_KIND, grid, options), options);
}

function readResults(prepared: Prepared<ResultsField>, options: ResultsOptions): ResultsImport {
  if (!prepared.ok) return prepared.report;
  const { sheet } = prepared;
  const seen = new Map<string, number>();
  const runs = new Map<string, { analyte: string; analyteKey: string; line: number }>();
  const shared: Array<{ line: number; letter: string; run: string; analyte: string; other: string; otherLine: number }> = [];
  const order = new DateOrder();
  const read = readRows(RESULTS_KIND, sheet, options, (row) => resultRow(row, seen, runs, shared, order));
  const problems = read.problems;
  if (shared.length) {
    const s = shared[0];
    const labels = new Set(shared.map((x) => labelKey(x.run))).size;
    const more = labels > 1 ? ` (${labels} run labels are shared like this)` : '';
    problems.push(
      problem<ResultsField>(
        'warning',
        'shared-run',
        s.line,
        s.letter,
        'run',
        `run "${s.run}" holds results of ${s.analyte} here and of ${s.other} on row ${s.otherLine}${more}: runs are read per analyte, so each analyte's results with this label form a run of their own. If one label was meant to name one run of one analyte, make the labels unique`,
      ),
    );
  }
  order.report((line, letter, message) => problems.push(problem<ResultsField>('warning', 'unsorted-dates', line, letter, 'date', message)));
  const report = makeReport<ResultsField>({ problems, columns: read.columns, delimiter: sheet.delimiter, rowCount: read.rowCount, encoding: sheet.encoding, decimal: read.decimal });
  if (!report.ok) return report;
  const results = read.records;
  const analytes = groupInOrder(results, (r) => labelKey(r.analyte)).map((g) => ({
    analyte: g[0].analyte,
    levels: groupInOrder(g, (r) => labelKey(r.level)).map((l) => ({ level: l[0].level, results: l })),
  }));
  const candidate: ControlResultsFile = {
    name: options.name ?? 'results',
    origin: options.origin ?? '',
    importedAt: options.importedAt ?? new Date().toISOString(),
    results,
    analytes,
  };
  return { ...report, candidate };
}

function resultRow(
  row: RowReader<ResultsField>,
  seen: Map<string, number>,
  runs: Map<string, { analyte: string; analyteKey: string; line: number }>,
  shared: Array<{ line: number; letter: string; run: string; analyte: string; other: string; otherLine: number }>,
  order: DateOrder,
): ControlResult | undefined {
  let bad = !requireFields(row, RESULTS_REQUIRED);
  const value = row.number('value');
  const target = row.number('target');
  const sd = row.number('sd');
  if (value === undefined || target === undefined || sd === undefined) bad = true;
  if (typeof sd === 'number' && !(sd > 0)) {
    row.problem('error', 'not-positive', 'sd', `sd must be greater than 0 (got ${row.text('sd')}): z = (value − target)/sd needs a positive SD`);
    bad = true;
  }
  const date = row.date('date');
  if (date === undefined) bad = true;
  checkUnits(RESULTS_KIND, row, ['value', 'target', 'sd']);

  const analyte = row.text('analyte');
  const level = row.text('level');
  const run = row.text('run');
  if (analyte !== '' && run !== '') {
    const rk = labelKey(run);
    const ak = labelKey(analyte);
    const first = runs.get(rk);
    if (!first) runs.set(rk, { analyte, analyteKey: ak, line: row.line });
    else if (first.analyteKey !== ak) shared.push({ line: row.line, letter: row.letter('run'), run, analyte, other: first.analyte, otherLine: first.line });
  }
  if (analyte !== '' && level !== '') order.see(`${labelKey(analyte)}\u0000${labelKey(level)}`, `${analyte} level ${level}`, date, row.line, row.letter('date'));
  if (bad || value == null || target == null || sd == null) return undefined;

  const key = [labelKey(analyte), labelKey(level), labelKey(run), date ?? '', String(value)].join('\u0000');
  const earlier = seen.get(key);
  if (earlier !== undefined) {
    row.problem(
      'warning',
      'duplicate-row',
      'value',
      `this result repeats row ${earlier} (same analyte, level, run${date ? ', date' : ''} and value): if it is a copy, delete it — a repeated row counts twice when the results are reviewed`,
    );
  } else seen.set(key, row.line);

  return {
    analyte,
    level,
    run,
    value,
    target,
    sd,
    date: date ?? null,
    instrument: row.text('instrument'),
    lot: row.text('lot'),
    unit: row.text('unit'),
    note: row.text('note'),
    line: row.line,
  };
}

/** The user accepted the report: the results are handed over. Refuses a report with errors. */
export function acceptResults(result: ResultsImport, rename?: string): ControlResultsFile {
  if (!result.ok || !result.candidate) {
    throw new Error(`the control results file has ${result.errorCount} error${result.errorCount === 1 ? '' : 's'}: fix them before importing`);
  }
  return rename ? { ...result.candidate, name: rename } : result.candidate;
}
