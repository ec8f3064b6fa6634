/**
 * Numbers in a file, and the file's decimal mark.
 *
 * A number is read as it shows itself when it can only be read one way:
 * - no mark: "12", "-3", "1e-3";
 * - one mark that cannot separate thousands: "5.7", "0,25", "1234,5", "1,00", ",5" (a thousands
 *   separator has one to three digits before it, the first not 0, and exactly three after);
 * - marks that can only be thousands separators: "1,000,000", "1.000.000" (a decimal mark occurs
 *   once), or both marks: "1,234.5", "1.234,5" (the last one is the decimal mark, the groups
 *   before it three digits each).
 * What is left is ambiguous: one mark with one to three digits before it (not starting with 0)
 * and exactly three after: "1,000" is one thousand or one, "12.345" twelve thousand or twelve.
 * Such a value is decided by the file's decimal mark (decideDecimalMark below) or not at all:
 * then it is an error that names both readings. A trailing "%" is allowed (5.7 % is 5.7). Spaces
 * or apostrophes separating thousands ("1 234", "1'234") are not read: the value is not a number.
 */

export type Mark = ',' | '.';

export type NumberReading =
  | {
      readonly kind: 'number';
      readonly value: number;
      /** The decimal mark this text shows (evidence for the file), or null when it shows none. */
      readonly decimal: Mark | null;
    }
  | {
      readonly kind: 'ambiguous';
      readonly mark: Mark;
      /** The value with `mark` as the decimal mark ("1,000" → 1). */
      readonly asDecimal: number;
      /** The value with `mark` separating thousands ("1,000" → 1000). */
      readonly asThousands: number;
    }
  | { readonly kind: 'none' };

const NONE: NumberReading = { kind: 'none' };

const SIMPLE = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/;
const AMBIGUOUS = /^[+-]?[1-9]\d{0,2}[.,]\d{3}$/;
const GROUPED_COMMA = /^[+-]?[1-9]\d{0,2}(,\d{3})+(\.\d*)?$/;
const GROUPED_POINT = /^[+-]?[1-9]\d{0,2}(\.\d{3})+(,\d*)?$/;

function finite(s: string): number | undefined {
  const x = Number(s);
  return Number.isFinite(x) ? x : undefined;
}

/** What a text cell holds as a number, read without context. */
export function readNumberText(text: string): NumberReading {
  let t = text.trim().replace(/\u00A0|\u202F/g, ' ');
  if (t.endsWith('%')) t = t.slice(0, -1).trimEnd();
  if (t === '') return NONE;
  if (AMBIGUOUS.test(t)) {
    const mark = (t.includes(',') ? ',' : '.') as Mark;
    const asDecimal = finite(t.replace(mark, '.'));
    const asThousands = finite(t.replace(mark, ''));
    if (asDecimal === undefined || asThousands === undefined) return NONE;
    return { kind: 'ambiguous', mark, asDecimal, asThousands };
  }
  if (SIMPLE.test(t)) {
    const mark: Mark | null = t.includes(',') ? ',' : t.includes('.') ? '.' : null;
    const value = finite(mark === ',' ? t.replace(',', '.') : t);
    if (value === undefined) return NONE;
    // "5." or "5," shows a mark but no decimals: no evidence about the file.
    const shows = mark !== null && /[.,]\d/.test(t) ? mark : null;
    return { kind: 'number', value, decimal: shows };
  }
  if (GROUPED_COMMA.test(t)) {
    const value = finite(t.replace(/,/g, ''));
    return value === undefined ? NONE : { kind: 'number', value, decimal: '.' };
  }
  if (GROUPED_POINT.test(t)) {
    const value = finite(t.replace(/\./g, '').replace(',', '.'));
    return value === undefined ? NONE : { kind: 'number', value, decimal: ',' };
  }
  return NONE;
}

/** Where a file shows a decimal mark: the first cell that shows it, and how many do. */
export interface MarkEvidence {
  readonly count: number;
  /** Spreadsheet row and column letters of the first such cell, and its text. */
  readonly first?: { readonly row: number; readonly column: string; readonly text: string };
}

/**
 * The file's decimal mark, and what decided it:
 * - `numbers`: numbers in the file show one decimal mark and none shows the other;
 * - `separator`: no number shows a mark and the fields are separated by ";" — spreadsheet
 *   programs write ";" where the comma is the decimal mark. This decides a comma only: it makes
 *   "1,000" one, but leaves "1.000" undecided (";" is also the list separator where the point is
 *   the decimal mark and thousands are grouped otherwise, as in Switzerland);
 * - `mixed`: numbers show both marks (rows written on different computers): nothing is decided;
 * - `none`: nothing shows a mark and the separator is a comma or a tab (written in every locale).
 */
export interface DecimalDecision {
  readonly mark: Mark | null;
  readonly by: 'numbers' | 'separator' | 'mixed' | 'none';
  readonly comma: MarkEvidence;
  readonly point: MarkEvidence;
}

export function decideDecimalMark(comma: MarkEvidence, point: MarkEvidence, delimiter: string): DecimalDecision {
  if (comma.count > 0 && point.count > 0) return { mark: null, by: 'mixed', comma, point };
  if (comma.count > 0) return { mark: ',', by: 'numbers', comma, point };
  if (point.count > 0) return { mark: '.', by: 'numbers', comma, point };
  if (delimiter === ';') return { mark: ',', by: 'separator', comma, point };
  return { mark: null, by: 'none', comma, point };
}

function plain(x: number): string {
  return String(x);
}

/** The ambiguous text rewritten so that its mark can only be decimal: "1,000" → "1,0", "1,500" → "1,5", "12,345" → "12,3450". */
function decimalSpelling(text: string, mark: Mark): string {
  const t = text.trim().replace(/\s*%$/, '');
  const at = t.indexOf(mark);
  const whole = t.slice(0, at);
  const decimals = t.slice(at + 1);
  const trimmed = decimals.replace(/0+$/, '');
  return `${whole}${mark}${trimmed === '' ? '0' : trimmed.length === 3 ? trimmed + '0' : trimmed}`;
}

/**
 * An ambiguous value read with the file's decision: its value, or the reason it stays
 * undecided (a sentence naming both readings and what to write instead).
 */
export function resolveAmbiguous(
  text: string,
  r: Extract<NumberReading, { kind: 'ambiguous' }>,
  d: DecimalDecision,
): { readonly value: number } | { readonly why: string } {
  if (d.by === 'numbers') return { value: d.mark === r.mark ? r.asDecimal : r.asThousands };
  if (d.by === 'separator' && r.mark === ',') return { value: r.asDecimal };
  const both = `"${text.trim()}" could be ${plain(r.asThousands)} ("${r.mark}" separating thousands) or ${plain(r.asDecimal)} ("${r.mark}" as the decimal mark)`;
  const at = (e: MarkEvidence): string => (e.first ? `row ${e.first.row}, column ${e.first.column}: "${e.first.text}"` : '');
  let why: string;
  if (d.by === 'mixed') why = `the file shows both decimal marks (a decimal comma in ${at(d.comma)}; a decimal point in ${at(d.point)})`;
  else if (d.by === 'separator') why = `the ";" separator points to a decimal comma, which does not decide a "${r.mark}", and no other number in the file shows its decimal mark`;
  else why = 'no other number in the file shows which mark is the decimal mark';
  const fix = `write ${plain(r.asThousands)} for ${plain(r.asThousands)}, or "${decimalSpelling(text, r.mark)}" for ${plain(r.asDecimal)}`;
  return { why: `${both}, and ${why}: ${fix} (a thousands separator, or exactly three decimals, leaves the mark in doubt)` };
}

/**
 * How many decimals a number is written with: the digits after its decimal mark ("14.0" → 1,
 * "5,70" → 2, "1,234.5" → 1, "12" and "5." → 0). `mark` is the decimal mark it was read with
 * (null: it shows none). Undefined for exponent notation ("1.5e-3"), which fixes no count of
 * decimals. A display fact only: the value read is the same.
 */
export function decimalsWritten(text: string, mark: Mark | null): number | undefined {
  let t = text.trim().replace(/\u00A0|\u202F/g, ' ');
  if (t.endsWith('%')) t = t.slice(0, -1).trimEnd();
  if (/[eE]/.test(t)) return undefined;
  if (mark === null) return 0;
  const at = t.lastIndexOf(mark);
  if (at < 0) return 0;
  return /^\d*/.exec(t.slice(at + 1))![0].length;
}
