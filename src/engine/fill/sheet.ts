/**
 * A read-only index over a SheetSnapshot: the non-empty cells by row and column, merged and
 * locked ranges, column widths. Built once per plan; it holds only the cells that have content,
 * so a stray value far down or far right costs one entry, never a rectangle up to it.
 */
import { a1Range } from './a1';
import type { CellRange, ExistingCell, LockedRange, SheetSnapshot } from './types';

/** The spreadsheet's default column width in characters (Calibri 11, 8 digits plus padding): common practice, no source. */
export const DEFAULT_COLUMN_WIDTH = 8.43;

export function rangeText(r: CellRange): string {
  return a1Range({ row: r.top, col: r.left }, { row: r.bottom, col: r.right });
}

function isEmpty(v: ExistingCell | undefined): boolean {
  return v === null || v === undefined || v === '';
}

function inside(r: CellRange, row: number, col: number): boolean {
  return row >= r.top && row <= r.bottom && col >= r.left && col <= r.right;
}

export class SheetIndex {
  readonly name: string;
  private readonly byRow = new Map<number, Map<number, ExistingCell>>();
  /** Rows with content, ascending. */
  readonly rows: readonly number[];
  readonly firstRow: number;
  readonly lastRow: number;
  readonly lastCol: number;
  readonly merges: readonly CellRange[];
  readonly locked: readonly LockedRange[];
  /** Rows after this one are not known (not read); Infinity when everything was read. */
  readonly readThrough: number;
  private readonly widths: Readonly<Record<number, number>>;
  private readonly defaultWidth: number;

  constructor(s: SheetSnapshot) {
    this.name = s.name;
    const put = (row: number, col: number, v: ExistingCell): void => {
      if (isEmpty(v)) return;
      let line = this.byRow.get(row);
      if (!line) this.byRow.set(row, (line = new Map()));
      line.set(col, v);
    };
    s.cells.forEach((line, i) => line.forEach((v, j) => put(s.origin.row + i, s.origin.col + j, v)));
    for (const c of s.sparse ?? []) put(c.row, c.col, c.value);
    this.rows = [...this.byRow.keys()].sort((a, b) => a - b);
    this.firstRow = this.rows.length ? this.rows[0] : 0;
    this.lastRow = this.rows.length ? this.rows[this.rows.length - 1] : 0;
    let lastCol = 0;
    for (const line of this.byRow.values()) for (const c of line.keys()) lastCol = Math.max(lastCol, c);
    this.lastCol = lastCol;
    this.merges = (s.merges ?? []).filter((m) => m.bottom > m.top || m.right > m.left);
    this.locked = s.locked ?? [];
    this.readThrough = s.readThrough ?? Infinity;
    this.widths = s.columnWidths ?? {};
    this.defaultWidth = s.defaultColumnWidth ?? DEFAULT_COLUMN_WIDTH;
  }

  get(row: number, col: number): ExistingCell {
    return this.byRow.get(row)?.get(col) ?? null;
  }

  /** The non-empty cells of a row, by column (undefined when the row is empty). */
  line(row: number): ReadonlyMap<number, ExistingCell> | undefined {
    return this.byRow.get(row);
  }

  /** The merged range (of more than one cell) that holds this cell. */
  mergeAt(row: number, col: number): CellRange | undefined {
    return this.merges.find((m) => inside(m, row, col));
  }

  lockedAt(row: number, col: number): LockedRange | undefined {
    return this.locked.find((l) => inside(l.range, row, col));
  }

  /** No content in any column of the row, no merge across it, and the row was read. */
  rowIsEmpty(row: number): boolean {
    if (row > this.readThrough) return false;
    if (this.byRow.has(row)) return false;
    return !this.merges.some((m) => row >= m.top && row <= m.bottom);
  }

  /** No content in columns left..right of the row. */
  spanIsEmpty(row: number, left: number, right: number): boolean {
    if (row > this.readThrough) return false;
    const line = this.byRow.get(row);
    if (!line) return true;
    for (const c of line.keys()) if (c >= left && c <= right) return false;
    return true;
  }

  /** Width of a column in characters (0 when hidden). */
  width(col: number): number {
    const w = this.widths[col];
    return w === undefined ? this.defaultWidth : w;
  }

  /** The first row at or after `from` with content. */
  firstRowFrom(from: number): number | undefined {
    const i = this.lowerBound(from);
    return i < this.rows.length ? this.rows[i] : undefined;
  }

  private lowerBound(from: number): number {
    let lo = 0;
    let hi = this.rows.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.rows[mid] < from) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /** Rows with content in [from, to], ascending. */
  rowsBetween(from: number, to: number): number[] {
    const lo = this.lowerBound(from);
    const out: number[] = [];
    for (let i = lo; i < this.rows.length && this.rows[i] <= to; i++) out.push(this.rows[i]);
    return out;
  }
}
