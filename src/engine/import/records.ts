/**
 * Splitting delimited text into records and fields: comma, semicolon or tab; fields in double
 * quotes may hold the separator, line breaks and doubled quotes (""); a quote inside an unquoted
 * field is an ordinary character; line ends CRLF, LF or CR. A record is one row as a spreadsheet
 * shows the file (a quoted line break does not start a new row).
 *
 * Empty fields after a record's last non-empty field are counted, not kept: a file saved from a
 * wide, mostly empty range (thousands of trailing separators per line) costs one step per
 * separator and no memory. Reading stops at the first record that uses more than
 * IMPORT_LIMITS.maxColumns columns (up to its last value) or when the records exceed
 * IMPORT_LIMITS.maxRows.
 */
import { IMPORT_LIMITS } from './limits';

export type Delimiter = ',' | ';' | '\t';

export interface RecordIssue {
  /** 0-based record (the header is record 0). */
  readonly record: number;
  readonly kind: 'unclosed-quote' | 'text-after-quote';
}

export interface Records {
  /** Each record's fields, trailing empty fields left out (an all-empty record is []). */
  readonly rows: string[][];
  readonly issues: readonly RecordIssue[];
  /** Fields in the header record (record 0), trailing empty ones included. */
  readonly headerFields: number;
  /** Set when reading stopped at a limit; the records before it are in `rows`. */
  readonly stopped?: { readonly limit: 'columns' | 'rows'; readonly record: number };
}

export interface RecordLimits {
  readonly maxColumns: number;
  readonly maxRows: number;
}

const QUOTE = 34;
const CR = 13;
const LF = 10;

/**
 * The separator is read off the header line (outside quotes): the one of tab, semicolon and comma
 * that occurs most often there; on a tie tab, then semicolon. Data rows are no guide: their text
 * may hold any separator, and decimal commas look like separators.
 */
export function guessDelimiter(text: string): Delimiter {
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

export function splitRecords(text: string, delimiter: Delimiter, limits: RecordLimits = IMPORT_LIMITS): Records {
  const d = delimiter.charCodeAt(0);
  const n = text.length;
  const rows: string[][] = [];
  const issues: RecordIssue[] = [];
  let row: string[] = [];
  let empties = 0;
  let stopped: Records['stopped'];
  let headerFields = 0;
  let i = 0;

  const push = (value: string): boolean => {
    if (value === '') {
      empties++;
      return true;
    }
    if (row.length + empties + 1 > limits.maxColumns) {
      stopped = { limit: 'columns', record: rows.length };
      return false;
    }
    while (empties > 0) {
      row.push('');
      empties--;
    }
    row.push(value);
    return true;
  };
  const end = (): void => {
    if (rows.length === 0) headerFields = row.length + empties;
    rows.push(row);
    row = [];
    empties = 0;
  };

  while (i < n) {
    let value: string;
    if (text.charCodeAt(i) === QUOTE) {
      let parts = '';
      let from = i + 1;
      for (;;) {
        const k = text.indexOf('"', from);
        if (k < 0) {
          issues.push({ record: rows.length, kind: 'unclosed-quote' });
          value = parts + text.slice(from);
          i = n;
          break;
        }
        if (text.charCodeAt(k + 1) === QUOTE) {
          parts += text.slice(from, k + 1);
          from = k + 2;
          continue;
        }
        value = parts + text.slice(from, k);
        i = k + 1;
        break;
      }
      if (i < n) {
        let j = i;
        while (j < n) {
          const c = text.charCodeAt(j);
          if (c === d || c === CR || c === LF) break;
          j++;
        }
        if (j > i) {
          issues.push({ record: rows.length, kind: 'text-after-quote' });
          value += text.slice(i, j);
          i = j;
        }
      }
    } else {
      let j = i;
      while (j < n) {
        const c = text.charCodeAt(j);
        if (c === d || c === CR || c === LF) break;
        j++;
      }
      value = j === i ? '' : text.slice(i, j);
      i = j;
    }
    if (!push(value)) break;
    if (i >= n) {
      end();
      break;
    }
    const c = text.charCodeAt(i);
    if (c === d) {
      i++;
      if (i >= n) {
        push('');
        end();
        break;
      }
      continue;
    }
    i += c === CR && text.charCodeAt(i + 1) === LF ? 2 : 1;
    end();
    if (i < n && rows.length >= limits.maxRows) {
      const rest = /\S/g;
      rest.lastIndex = i;
      if (rest.test(text)) stopped = { limit: 'rows', record: rows.length };
      break;
    }
  }
  if (rows.length === 0 && stopped) headerFields = row.length + empties;
  return stopped ? { rows, issues, headerFields, stopped } : { rows, issues, headerFields };
}
