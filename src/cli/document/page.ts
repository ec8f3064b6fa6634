/**
 * Page set-up of a printed sheet: paper, orientation chosen from the sheet's width, fit to one
 * page wide and as many tall as needed, margins, the header row repeated on every page, the
 * print area, and the page header and footer. Layout choices here are common practice, no source.
 */
import type ExcelJS from 'exceljs';
import { columnLetters } from '../../engine/fill';
import { DEMO_MARKER } from '../../engine/caution';
import { textUnits } from './measure';

export type Paper = 'A4' | 'Letter';

export const PAPERS: readonly Paper[] = ['A4', 'Letter'];

/** Paper in points (width × height, portrait) and its code in the file format (ECMA-376: 1 Letter, 9 A4). */
const PAPER: Readonly<Record<Paper, { width: number; height: number; code: number }>> = {
  A4: { width: 595.28, height: 841.89, code: 9 },
  Letter: { width: 612, height: 792, code: 1 },
};

/** Margins in inches: 0.5 left and right, 0.75 top and bottom, header and footer 0.3 from the edge. */
export const MARGINS = { left: 0.5, right: 0.5, top: 0.75, bottom: 0.75, header: 0.3, footer: 0.3 } as const;

/** Below this scale a sheet that would fit portrait goes landscape instead (text stays readable). */
export const PORTRAIT_MIN_SCALE = 0.85;

export type Orientation = 'portrait' | 'landscape';

/** Printable width and height in points of a paper in an orientation, inside the margins. */
export function printable(paper: Paper, orientation: Orientation): { width: number; height: number } {
  const p = PAPER[paper];
  const [w, h] = orientation === 'portrait' ? [p.width, p.height] : [p.height, p.width];
  return { width: w - 72 * (MARGINS.left + MARGINS.right), height: h - 72 * (MARGINS.top + MARGINS.bottom) };
}

/**
 * Portrait when the sheet fits the portrait width at PORTRAIT_MIN_SCALE or more, else landscape.
 * `contentPoints` is the printed width of the columns at 100 %.
 */
export function chooseOrientation(contentPoints: number, paper: Paper): Orientation {
  return contentPoints * PORTRAIT_MIN_SCALE <= printable(paper, 'portrait').width ? 'portrait' : 'landscape';
}

/** The scale fit-to-width gives (1 when the sheet is narrower than the page), a whole percent rounded down as Excel sets it. */
export function fitScale(contentPoints: number, paper: Paper, orientation: Orientation): number {
  return Math.min(1, Math.floor((100 * printable(paper, orientation).width) / contentPoints) / 100);
}

export interface PageOptions {
  readonly paper: Paper;
  readonly orientation: Orientation;
  /** Last column and row of what prints. */
  readonly lastCol: number;
  readonly lastRow: number;
  /** The table's header row, repeated at the top of every page. */
  readonly titleRow?: number;
}

export function applyPageSetup(ws: ExcelJS.Worksheet, o: PageOptions): void {
  ws.pageSetup = {
    ...ws.pageSetup,
    paperSize: PAPER[o.paper].code as ExcelJS.PageSetup['paperSize'],
    orientation: o.orientation,
    fitToPage: true,
    fitToWidth: 1,
    fitToHeight: 0,
    margins: { ...MARGINS },
    printArea: `A1:${columnLetters(o.lastCol)}${o.lastRow}`,
    horizontalCentered: false,
    ...(o.titleRow ? { printTitlesRow: `${o.titleRow}:${o.titleRow}` } : {}),
  };
}

export interface HeaderFooterText {
  /** The document's title: left of the page header. */
  readonly title: string;
  /** Invented data: the demo marker right of the page header. */
  readonly demo: boolean;
  /** The date the document is of (YYYY-MM-DD): left of the footer. */
  readonly date: string;
  /** "Leeway 0.1.0": right of the footer. */
  readonly program: string;
}

/** Text for a header or footer section: "&" is the format codes' escape, written "&&". */
function literal(t: string): string {
  return t.replace(/&/g, '&&');
}

/**
 * The page header and footer strings (Excel's codes: &L &C &R sections, &P page, &N pages).
 * When the title and the demo marker would not fit side by side in `widthUnits` (the printed
 * width in column units), the marker goes on a second line under the title.
 */
export function headerFooterStrings(t: HeaderFooterText, widthUnits = Infinity): { header: string; footer: string } {
  const sideBySide = textUnits(t.title) + textUnits(DEMO_MARKER) + 4 <= widthUnits;
  const header = !t.demo ? `&L${literal(t.title)}` : sideBySide ? `&L${literal(t.title)}&R${literal(DEMO_MARKER)}` : `&L${literal(t.title)}\n${literal(DEMO_MARKER)}`;
  const footer = `&L${literal(t.date)}&CPage &P of &N&R${literal(t.program)}`;
  return { header, footer };
}

export function applyHeaderFooter(ws: ExcelJS.Worksheet, t: HeaderFooterText, widthUnits?: number): void {
  const { header, footer } = headerFooterStrings(t, widthUnits);
  ws.headerFooter = { differentFirst: false, differentOddEven: false, oddHeader: header, oddFooter: footer };
}
