/**
 * The EQA results file (the project's own simple CSV): one row per analyte and round, read by the
 * same rules as a variation table. Columns: analyte, round (the scheme's round or sample label),
 * result (the laboratory's), assigned (the assigned value), sd_pt (the standard deviation for
 * proficiency assessment) — required; u_assigned (the standard uncertainty of the assigned
 * value; blank or absent means 0), u_result (the laboratory's own standard uncertainty of its
 * result, for the ζ score; blank or absent means none), unit, date, note — optional. result,
 * assigned, sd_pt, u_assigned and u_result are in the result's unit; sd_pt > 0 and u_assigned,
 * u_result ≥ 0, as the z, z′ and ζ scores of ISO 13528:2015 need.
 *
 * Checks: required columns and cells; numbers; sd_pt > 0; u_assigned ≥ 0; readable dates; a unit
 * stated in a header against the row's unit (warning). Across rows: the same analyte and round
 * twice (error: one result per analyte and round, or the round would be scored twice); dates
 * going back within an analyte (warning; the file order is kept).
 */
import { checkUnits, makeReport, prepareBytes, prepareGrid, prepareText, readRows } from './read';
import type { ImportKind, Prepared, RowReader } from './read';
import { problem } from './read';
import type { UnitRule } from './headers';
import type { ImportProblem, ImportReport, ReadOptions } from './types';
import { DateOrder, groupInOrder, labelKey, requireFields } from './order';

export type EqaField = 'analyte' | 'round' | 'result' | 'assigned' | 'sd_pt' | 'u_assigned' | 'u_result' | 'unit' | 'date' | 'note';

export const EQA_FIELDS: readonly EqaField[] = ['analyte', 'round', 'result', 'assigned', 'sd_pt', 'u_assigned', 'u_result', 'unit', 'date', 'note'];
export const EQA_REQUIRED: readonly EqaField[] = ['analyte', 'round', 'result', 'assigned', 'sd_pt'];
export const EQA_NUMERIC: readonly EqaField[] = ['result', 'assigned', 'sd_pt', 'u_assigned', 'u_result'];

/** Other names for each field, in normalised form (lower case, no spaces _ - . : /). */
export const EQA_ALIASES: Readonly<Record<EqaField, readonly string[]>> = {
  analyte: ['test', 'measurand', 'analytename', 'component', 'parameter', 'name'],
  round: ['roundid', 'roundno', 'roundnumber', 'survey', 'distribution', 'challenge', 'cycle', 'schemeround', 'event'],
  result: ['value', 'reportedvalue', 'reported', 'yourresult', 'labresult', 'ownresult', 'measuredvalue'],
  assigned: ['assignedvalue', 'xpt', 'target', 'targetvalue', 'referencevalue', 'consensus', 'consensusvalue'],
  sd_pt: ['sigmapt', 'σpt', 'sdforproficiencyassessment', 'standarddeviationforproficiencyassessment', 'targetsd'],
  u_assigned: ['uxpt', 'uassignedvalue', 'uncertaintyofassignedvalue', 'uncertaintyassigned'],
  u_result: ['uresult', 'ulab', 'labuncertainty', 'uncertaintyofresult', 'uncertaintyresult', 'ownuncertainty'],
  unit: ['units', 'uom'],
  date: ['datetime', 'time', 'timestamp', 'resultdate', 'rounddate'],
  note: ['notes', 'comment', 'comments', 'remark', 'remarks'],
};

const UNITS: Readonly<Record<EqaField, UnitRule>> = {
  analyte: 'text',
  round: 'text',
  result: 'amount',
  assigned: 'amount',
  sd_pt: 'spread',
  u_assigned: 'spread',
  u_result: 'spread',
  unit: 'text',
  date: 'text',
  note: 'text',
};

export const EQA_KIND: ImportKind<EqaField> = {
  noun: 'EQA results file',
  fields: EQA_FIELDS,
  aliases: EQA_ALIASES,
  units: UNITS,
  required: EQA_REQUIRED,
  numeric: EQA_NUMERIC,
  dates: ['date'],
  unitField: 'unit',
  needs: 'a header row (analyte, round, result, assigned, sd_pt) and one row per analyte and round',
};

/** One EQA result. Optional texts are '' when blank; date is ISO 8601 (no zone) or null. */
export interface EqaResult {
  readonly analyte: string;
  readonly round: string;
  /** The laboratory's result. */
  readonly result: number;
  /** The assigned value x_pt. */
  readonly assigned: number;
  /** The standard deviation for proficiency assessment, > 0. */
  readonly sdPt: number;
  /** The standard uncertainty of the assigned value, ≥ 0 (0 when not given). */
  readonly uAssigned: number;
  /** The laboratory's standard uncertainty of its result, ≥ 0; null when not given (no ζ score). */
  readonly uResult: number | null;
  readonly unit: string;
  readonly date: string | null;
  readonly note: string;
  readonly line: number;
}

export interface EqaAnalyteResults {
  readonly analyte: string;
  /** In file order. */
  readonly results: readonly EqaResult[];
}

export interface EqaResultsFile {
  readonly name: string;
  readonly origin: string;
  readonly importedAt: string;
  /** Every result in file order. */
  readonly results: readonly EqaResult[];
  /** Grouped by analyte (case and spaces ignored), in order of first appearance. */
  readonly analytes: readonly EqaAnalyteResults[];
}

export type EqaMapping = Readonly<Record<string, EqaField | null>>;

export interface EqaOptions extends ReadOptions<EqaField> {
  readonly name?: string;
  readonly origin?: string;
  readonly importedAt?: string;
}

export interface EqaImport extends ImportReport<EqaField> {
  readonly candidate?: EqaResultsFile;
}

export type EqaProblem = ImportProblem<EqaField>;

export function parseEqaBytes(bytes: Uint8Array, options: EqaOptions = {}): EqaImport {
  return readEqa(prepareBytes(EQA_KIND, bytes), options);
}

export function parseEqaText(text: string, options: EqaOptions = {}): EqaImport {
  return readEqa(prepareText(EQA_KIND, text), options);
}

export function parseEqaGrid(grid: readonly (readonly (string | number | boolean | null | undefined)[])[], options: EqaOptions = {}): EqaImport {
  return readEqa(prepareGrid(EQA_KIND, grid, options), options);
}

function readEqa(prepared: Prepared<EqaField>, options: EqaOptions): EqaImport {
  if (!prepared.ok) return prepared.report;
  const { sheet } = prepared;
  const seen = new Map<string, number>();
  const order = new DateOrder();
  const read = readRows(EQA_KIND, sheet, options, (row) => eqaRow(row, seen, order));
  const problems = read.problems;
  order.report((line, letter, message) => problems.push(problem<EqaField>('warning', 'unsorted-dates', line, letter, 'date', message)));
  const report = makeReport<EqaField>({ problems, columns: read.columns, delimiter: sheet.delimiter, rowCount: read.rowCount, encoding: sheet.encoding, decimal: read.decimal });
  if (!report.ok) return report;
  const results = read.records;
  const candidate: EqaResultsFile = {
    name: options.name ?? 'eqa',
    origin: options.origin ?? '',
    importedAt: options.importedAt ?? new Date().toISOString(),
    results,
    analytes: groupInOrder(results, (r) => labelKey(r.analyte)).map((g) => ({ analyte: g[0].analyte, results: g })),
  };
  return { ...report, candidate };
}

function eqaRow(row: RowReader<EqaField>, seen: Map<string, number>, order: DateOrder): EqaResult | undefined {
  let bad = !requireFields(row, EQA_REQUIRED);
  const result = row.number('result');
  const assigned = row.number('assigned');
  const sdPt = row.number('sd_pt');
  const u = row.has('u_assigned') ? row.number('u_assigned') : null;
  const uResult = row.has('u_result') ? row.number('u_result') : null;
  if (result === undefined || assigned === undefined || sdPt === undefined || u === undefined || uResult === undefined) bad = true;
  if (typeof sdPt === 'number' && !(sdPt > 0)) {
    row.problem('error', 'not-positive', 'sd_pt', `sd_pt must be greater than 0 (got ${row.text('sd_pt')}): the z score divides by it`);
    bad = true;
  }
  if (typeof u === 'number' && u < 0) {
    row.problem('error', 'negative', 'u_assigned', `u_assigned must not be negative (got ${row.text('u_assigned')}): it is a standard uncertainty`);
    bad = true;
  }
  if (typeof uResult === 'number' && uResult < 0) {
    row.problem('error', 'negative', 'u_result', `u_result must not be negative (got ${row.text('u_result')}): it is a standard uncertainty`);
    bad = true;
  }
  const date = row.date('date');
  if (date === undefined) bad = true;
  checkUnits(EQA_KIND, row, ['result', 'assigned', 'sd_pt', 'u_assigned', 'u_result']);

  const analyte = row.text('analyte');
  const round = row.text('round');
  if (analyte !== '') order.see(labelKey(analyte), analyte, date, row.line, row.letter('date'));
  if (analyte !== '' && round !== '') {
    const key = `${labelKey(analyte)}\u0000${labelKey(round)}`;
    const first = seen.get(key);
    if (first !== undefined) {
      row.problem('error', 'duplicate-row', 'round', `${analyte}, round ${round} is listed twice: also on row ${first}; keep one result per analyte and round`);
      bad = true;
    } else seen.set(key, row.line);
  }
  if (bad || result == null || assigned == null || sdPt == null) return undefined;
  return {
    analyte,
    round,
    result,
    assigned,
    sdPt,
    uAssigned: u ?? 0,
    uResult: uResult ?? null,
    unit: row.text('unit'),
    date: date ?? null,
    note: row.text('note'),
    line: row.line,
  };
}

/** The user accepted the report: the EQA results are handed over. Refuses a report with errors. */
export function acceptEqa(result: EqaImport, rename?: string): EqaResultsFile {
  if (!result.ok || !result.candidate) {
    throw new Error(`the EQA results file has ${result.errorCount} error${result.errorCount === 1 ? '' : 's'}: fix them before importing`);
  }
  return rename ? { ...result.candidate, name: rename } : result.candidate;
}
