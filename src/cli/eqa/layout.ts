/**
 * Pictures on a finished document sheet, and page breaks that keep each picture (and the sign-off
 * block) on one page. Pictures are placed after the document layer has set the column widths and
 * row heights, into rows left empty for them, so they never change the widths; each is kept
 * within the printed width of the sheet's columns.
 */
import type ExcelJS from 'exceljs';
import { columnPoints, printable } from '../document';
import type { PrintLayout } from '../document';

/** Points of a pixel at 96 pixels an inch (how a picture's size is stored). */
const POINTS_PER_PIXEL = 0.75;
/** Points between two pictures side by side. */
const GAP_POINTS = 12;

/** A picture to place: its PNG and its size in pixels at 100 %. */
export interface Picture {
  readonly png: Buffer;
  readonly width: number;
  readonly height: number;
}

/** Rows a picture of `heightPx` takes at `rowPoints` a row, with one row of space below. */
export function rowsFor(heightPx: number, rowPoints: number): number {
  return Math.ceil((heightPx * POINTS_PER_PIXEL) / rowPoints) + 1;
}

/** Where each picture went: its first row and column (1-based) and its size in points. */
export interface Placed {
  readonly row: number;
  readonly col: number;
  readonly widthPoints: number;
  readonly heightPoints: number;
}

/**
 * Places pictures `perRow` to a row of pictures, from `firstRow`, `rowsEach` sheet rows per row of
 * pictures. Pictures shrink (keeping their shape) when `perRow` of them and the gaps are wider
 * than the sheet's printed columns; a second picture starts at the first column clear of the one
 * before it.
 */
export function placePictures(wb: ExcelJS.Workbook, ws: ExcelJS.Worksheet, layout: PrintLayout, pictures: readonly Picture[], firstRow: number, rowsEach: number, perRow: number): Placed[] {
  const colPts = layout.widths.map(columnPoints);
  const room = colPts.reduce((a, b) => a + b, 0);
  const placed: Placed[] = [];
  pictures.forEach((p, i) => {
    const slot = (room - GAP_POINTS * (perRow - 1)) / perRow;
    const k = Math.min(1, slot / (p.width * POINTS_PER_PIXEL));
    const w = p.width * k;
    const h = p.height * k;
    const row = firstRow + Math.floor(i / perRow) * rowsEach;
    // The column to start at: the first whose left edge is clear of the pictures before it in the row.
    const wantLeft = (i % perRow) * (slot + GAP_POINTS);
    let col = 0;
    let left = 0;
    while (col < colPts.length - 1 && left < wantLeft - 0.5) left += colPts[col++];
    // A picture that would run past the last column starts the row instead.
    if (left + w * POINTS_PER_PIXEL > room + 0.5) col = 0;
    const id = wb.addImage({ buffer: p.png as unknown as ExcelJS.Buffer, extension: 'png' });
    ws.addImage(id, { tl: { col, row: row - 1 }, ext: { width: w, height: h }, editAs: 'oneCell' });
    placed.push({ row, col: col + 1, widthPoints: w * POINTS_PER_PIXEL, heightPoints: h * POINTS_PER_PIXEL });
  });
  return placed;
}

/**
 * Manual page breaks so that no block of rows (a row of pictures, the sign-off) is split between
 * two pages, by the row heights the document layer set and the page set-up's fit-to-width scale
 * (the same estimate the document layer uses for its sign-off block). Returns the rows a break
 * was put after.
 */
export function keepBlocksTogether(ws: ExcelJS.Worksheet, layout: PrintLayout, blocks: ReadonlyArray<readonly [number, number]>): number[] {
  const page = printable(layout.paper, layout.orientation).height / layout.scale;
  const height = (r: number): number => ws.getRow(r).height ?? 15;
  const titleH = layout.titleRow ? height(layout.titleRow) : 0;
  const starts = new Map(blocks.map(([a, b]) => [a, b]));
  // exceljs keeps a sheet's manual breaks in rowBreaks (the row a break follows); its types leave it out.
  const manual = new Set((ws as unknown as { rowBreaks: Array<{ id: number }> }).rowBreaks.map((b) => b.id));
  const added: number[] = [];
  let used = 0;
  for (let r = 1; r <= layout.lastRow; r++) {
    const end = starts.get(r);
    if (end !== undefined && r > 1 && !manual.has(r - 1)) {
      let bh = 0;
      for (let k = r; k <= end; k++) bh += height(k);
      if (used + bh > page && used > titleH) {
        ws.getRow(r - 1).addPageBreak();
        manual.add(r - 1);
        added.push(r - 1);
        used = layout.titleRow && r > layout.titleRow ? titleH : 0;
      }
    }
    if (used + height(r) > page) used = layout.titleRow && r > layout.titleRow ? titleH : 0;
    used += height(r);
    if (manual.has(r)) used = layout.titleRow && r >= layout.titleRow ? titleH : 0;
  }
  return added;
}
