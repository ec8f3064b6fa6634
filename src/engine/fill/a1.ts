/**
 * A1 cell addresses: 1-based rows and columns as a spreadsheet shows them (row 1 is the first
 * row, column 1 is "A"). Excel's grid is 1,048,576 rows by 16,384 columns (XFD).
 */

export const MAX_ROWS = 1048576;
export const MAX_COLUMNS = 16384;

export interface CellRef {
  /** 1-based row. */
  readonly row: number;
  /** 1-based column (1 = A). */
  readonly col: number;
}

/** Column number to letters: 1 → A, 27 → AA, 16384 → XFD. */
export function columnLetters(col: number): string {
  if (!Number.isInteger(col) || col < 1) throw new RangeError(`column must be a whole number ≥ 1 (got ${col})`);
  let n = col;
  let s = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

/** Letters to column number: A → 1, XFD → 16384; undefined for anything else. */
export function columnNumber(letters: string): number | undefined {
  if (!/^[A-Za-z]{1,3}$/.test(letters)) return undefined;
  let n = 0;
  for (const ch of letters.toUpperCase()) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n;
}

/** "C7" for {row 7, col 3}; absolute gives "$C$7". */
export function a1(ref: CellRef, absolute = false): string {
  const d = absolute ? '$' : '';
  return `${d}${columnLetters(ref.col)}${d}${ref.row}`;
}

/** "B3:D9" for a rectangle (a single cell gives "B3"). */
export function a1Range(from: CellRef, to: CellRef): string {
  if (from.row === to.row && from.col === to.col) return a1(from);
  return `${a1(from)}:${a1(to)}`;
}

/** Reads "C7" or "$C$7" (any case); undefined when it is not a cell address inside Excel's grid. */
export function parseA1(text: string): CellRef | undefined {
  const m = /^\s*\$?([A-Za-z]{1,3})\$?(\d{1,7})\s*$/.exec(text);
  if (!m) return undefined;
  const col = columnNumber(m[1]);
  const row = Number(m[2]);
  if (col === undefined || col > MAX_COLUMNS || row < 1 || row > MAX_ROWS) return undefined;
  return { row, col };
}

/** Quotes a sheet name for a formula reference when it needs it: 'My sheet'!A1. */
export function sheetPrefix(name: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(name) && !parseA1(name) ? `${name}!` : `'${name.replace(/'/g, "''")}'!`;
}
