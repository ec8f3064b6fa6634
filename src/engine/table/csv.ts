/**
 * Export of an accepted table back to CSV, with the canonical column names. Text that a spreadsheet
 * would read as a formula (starting with = + - @), or that starts with an apostrophe, is written with a leading apostrophe, the
 * usual guard against formula injection; parseTableText() takes it off again, so export and
 * import round-trip.
 */
import Papa from 'papaparse';
import type { Field, VariationRow, VariationTable } from './types';
import { FIELDS } from './types';

export interface CsvOptions {
  /** ',' (default), ';' or '\t'. */
  readonly delimiter?: ',' | ';' | '\t';
  /** '.' (default) or ','; ',' is refused with a comma delimiter. */
  readonly decimal?: '.' | ',';
  /** Start with a UTF-8 BOM (some spreadsheet programs need it to read UTF-8); default false. */
  readonly bom?: boolean;
}

function guardText(t: string): string {
  return /^[=+\-@']/.test(t) ? `'${t}` : t;
}

function cell(row: VariationRow, f: Field, decimal: '.' | ','): string {
  const num = (x: number | null): string => (x === null ? '' : decimal === ',' ? String(x).replace('.', ',') : String(x));
  switch (f) {
    case 'analyte':
      return guardText(row.analyte);
    case 'specimen':
      return guardText(row.specimen);
    case 'unit':
      return guardText(row.unit);
    case 'cvi':
      return num(row.cvi);
    case 'cvg':
      return num(row.cvg);
    case 'source':
      return guardText(row.source);
    case 'limit_abs':
      return num(row.limitAbs);
    case 'limit_pct':
      return num(row.limitPct);
    case 'level':
      return num(row.level);
    case 'note':
      return guardText(row.note);
  }
}

/** The table as CSV text, one header row (canonical names) and one row per analyte and specimen. */
export function tableToCsv(table: VariationTable, options: CsvOptions = {}): string {
  const delimiter = options.delimiter ?? ',';
  const decimal = options.decimal ?? '.';
  if (delimiter === ',' && decimal === ',') throw new Error('a decimal comma needs ; or tab as the separator');
  const data = table.rows.map((r) => FIELDS.map((f) => cell(r, f, decimal)));
  const text = Papa.unparse({ fields: [...FIELDS], data }, { delimiter, newline: '\r\n', quotes: false });
  return (options.bom ? '\uFEFF' : '') + text + '\r\n';
}
