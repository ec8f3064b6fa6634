/**
 * Finding a template's header row. A lab's sheet often starts with a title (merged across the
 * table), the lab's name, a line for the reviewer, and only then the header row; so the header is
 * the row, among the first 30 rows that hold anything, whose cells name the most fill columns
 * (Analyte, Specimen, CVI %, …). A row needs an analyte column and at least one other fill column
 * to count; a row whose only content lies in cells merged across columns is a title, never a
 * header. Ties go to the upper row. The task pane and the command line use the same function.
 */
import { columnLetters } from './a1';
import type { CellRef } from './a1';
import { matchTemplateHeader } from './headers';
import { SheetIndex } from './sheet';
import type { FillField, SheetSnapshot, TemplateMapping } from './types';

/** How many rows (from the first that holds anything) the header scan reads. */
export const HEADER_SCAN_ROWS = 30;

export interface HeaderColumn {
  readonly field: FillField;
  readonly col: number;
  readonly letter: string;
  /** The template's own header text (trimmed). */
  readonly header: string;
}

export interface HeaderCell {
  readonly col: number;
  readonly text: string;
}

export interface HeaderRow {
  /** The first cell of the header row: its row and the column of its first non-empty cell (or the cell given). */
  readonly at: CellRef;
  /** Every text cell of the row from `at` on, matched or not (what the pane shows for correction). */
  readonly cells: readonly HeaderCell[];
  /** The cells that name a fill column (first of each field). */
  readonly columns: readonly HeaderColumn[];
  /** Cells that name a field an earlier cell of the row already names. */
  readonly duplicates: readonly (HeaderColumn & { readonly first: HeaderColumn })[];
  /** The last column of the row that holds anything. */
  readonly lastCol: number;
}

/** The header row that starts at a given cell (the user pointed at it). */
export function headerRowAt(sheet: SheetSnapshot | SheetIndex, at: CellRef, mapping: TemplateMapping = {}): HeaderRow {
  const index = sheet instanceof SheetIndex ? sheet : new SheetIndex(sheet);
  const line = index.line(at.row);
  const cols = line ? [...line.keys()].filter((c) => c >= at.col).sort((a, b) => a - b) : [];
  const cells: HeaderCell[] = [];
  const columns: HeaderColumn[] = [];
  const duplicates: Array<HeaderColumn & { first: HeaderColumn }> = [];
  const seen = new Map<FillField, HeaderColumn>();
  for (const col of cols) {
    const v = index.get(at.row, col);
    if (typeof v !== 'string' || v.trim() === '') continue;
    cells.push({ col, text: v.trim() });
    const field = matchTemplateHeader(v, mapping);
    if (!field) continue;
    const hc = { field, col, letter: columnLetters(col), header: v.trim() };
    const first = seen.get(field);
    if (first) duplicates.push({ ...hc, first });
    else {
      seen.set(field, hc);
      columns.push(hc);
    }
  }
  return { at, cells, columns, duplicates, lastCol: cols.length ? cols[cols.length - 1] : at.col };
}

/** True when every non-empty cell of the row lies in a range merged across two or more columns (a title band). */
function isTitleRow(index: SheetIndex, row: number): boolean {
  const line = index.line(row);
  if (!line) return false;
  for (const col of line.keys()) {
    const m = index.mergeAt(row, col);
    if (!m || m.right === m.left) return false;
  }
  return true;
}

/** The best header row among the first HEADER_SCAN_ROWS rows that hold anything, or undefined when no row qualifies. */
export function findHeaderRow(sheet: SheetSnapshot | SheetIndex, mapping: TemplateMapping = {}): HeaderRow | undefined {
  const index = sheet instanceof SheetIndex ? sheet : new SheetIndex(sheet);
  let best: HeaderRow | undefined;
  for (const row of index.rows.slice(0, HEADER_SCAN_ROWS)) {
    if (isTitleRow(index, row)) continue;
    const line = index.line(row)!;
    const first = Math.min(...line.keys());
    const h = headerRowAt(index, { row, col: first }, mapping);
    if (!h.columns.some((c) => c.field === 'analyte') || h.columns.length < 2) continue;
    if (!best || h.columns.length > best.columns.length) best = h;
  }
  return best;
}
