/**
 * A selection read as columns of a study: an optional header row (names), then the data rows.
 * Nothing here guesses a number: a cell that holds text which reads as a number ("12,5" typed
 * into a cell formatted as text) is reported as a problem, with its address, because the
 * worksheet functions would skip it silently; other text and blanks are skipped as the functions
 * skip them, and the view says how many.
 */
import type { CellGrid } from '../host';
import type { GridCell } from '../../engine/table';
import { readDecimal } from '../../engine/table';
import { a1, a1Range, columnLetters } from '../../engine/fill';

/** One column of the selection below its header. */
export interface StudyColumn {
  /** The header text, or "Column C" without a header row. */
  readonly name: string;
  /** 1-based sheet column. */
  readonly col: number;
  readonly cells: readonly GridCell[];
}

export interface StudyGrid {
  readonly sheet: string;
  /** The selection as Excel wrote it ("Sheet1!A1:C21"). */
  readonly address: string;
  /** 1-based sheet rows of the first and last data row. */
  readonly top: number;
  readonly bottom: number;
  /** The sheet row of the header, or null. */
  readonly headerRow: number | null;
  readonly columns: readonly StudyColumn[];
}

const isNumber = (v: GridCell): v is number => typeof v === 'number' && Number.isFinite(v);
const isBlank = (v: GridCell): boolean => v === null || v === undefined || v === '';

/**
 * The first row is a header when none of its cells is a number and at least one is text, while
 * some cell below it in the same columns is a number.
 */
function hasHeader(values: readonly (readonly GridCell[])[]): boolean {
  if (values.length < 2) return false;
  const first = values[0];
  if (first.some(isNumber) || !first.some((v) => typeof v === 'string' && v.trim() !== '')) return false;
  return values.slice(1).some((r) => r.some(isNumber));
}

/** The selection as header and columns. */
export function studyGrid(grid: CellGrid): StudyGrid {
  // Blank rows at the end (a whole column selected) are not part of the study.
  let last = grid.values.length;
  while (last > 0 && grid.values[last - 1].every(isBlank)) last--;
  const values = grid.values.slice(0, last);
  const header = hasHeader(values);
  const width = values.reduce((m, r) => Math.max(m, r.length), 0);
  const body = header ? values.slice(1) : values;
  const top = grid.firstRow + (header ? 1 : 0);
  const columns: StudyColumn[] = [];
  for (let j = 0; j < width; j++) {
    const col = grid.firstColumn + j;
    const h = header ? values[0][j] : null;
    const name = typeof h === 'string' && h.trim() !== '' ? h.trim() : `Column ${columnLetters(col)}`;
    columns.push({ name, col, cells: body.map((r) => r[j] ?? null) });
  }
  return { sheet: grid.sheet, address: grid.address, top, bottom: top + body.length - 1, headerRow: header ? grid.firstRow : null, columns };
}

/** The absolute reference of a column's data rows ("$B$3:$B$22"). */
export function columnRef(g: StudyGrid, c: StudyColumn): string {
  return a1Range({ row: g.top, col: c.col }, { row: g.bottom, col: c.col }).replace(/([A-Z]+)(\d+)/g, '$$$1$$$2');
}

/** Cells of a column of results that hold a number stored as text: their addresses and texts. */
export function numbersAsText(g: StudyGrid, c: StudyColumn): string[] {
  const out: string[] = [];
  c.cells.forEach((v, i) => {
    if (typeof v === 'string' && v.trim() !== '' && readDecimal(v) !== undefined) out.push(`${a1({ row: g.top + i, col: c.col })} holds the text "${v}"`);
  });
  return out;
}

/** Counts of a column's cells: numbers, and cells skipped (text or blank). */
export function counts(c: StudyColumn): { numbers: number; skipped: number } {
  let numbers = 0;
  let skipped = 0;
  for (const v of c.cells) {
    if (isNumber(v)) numbers++;
    else if (!isBlank(v)) skipped++;
  }
  return { numbers, skipped };
}

/** A column as a one-column grid (what a worksheet function receives for a column range). */
export function asColumnGrid(c: StudyColumn): GridCell[][] {
  return c.cells.map((v) => [v ?? null]);
}

/** A problem with the selection, for the user. */
export class SelectionProblem extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SelectionProblem';
  }
}

/** Fails with one message listing the numbers stored as text in the given columns. */
export function refuseNumbersAsText(g: StudyGrid, cols: readonly StudyColumn[]): void {
  const bad = cols.flatMap((c) => numbersAsText(g, c));
  if (bad.length) {
    throw new SelectionProblem(
      `${bad.slice(0, 4).join('; ')}${bad.length > 4 ? `; and ${bad.length - 4} more` : ''}: a number stored as text is not counted by the worksheet functions. ` +
        'Enter it as a number (check the decimal separator), then read the selection again.',
    );
  }
}
