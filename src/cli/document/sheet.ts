/**
 * A printed document sheet: every worksheet Leeway creates with exceljs is written through one
 * (the plain fill, the demo, and the review, verification and EQA sheets to come). It writes
 * rows with a cursor, remembers what each row is (a line of text across the page, a table's
 * header row, a table row), and `finish()` makes the sheet a document someone can sign:
 * the caution, a sign-off block (Prepared by / Reviewed by / Approved by, each with Name,
 * Signature and Date lines) after the content, column widths from the content, long text
 * wrapped with row heights to match, the page set-up (orientation from the sheet's width, one
 * page wide, the header row repeated on every page) and the page header and footer.
 */
import type ExcelJS from 'exceljs';
import { CAUTION, DEMO_MARKER } from '../../engine/caution';
import { VERSION } from '../../engine/version';
import { wrapText } from '../../engine/fill';
import { CELL_PADDING, LINE_POINTS, POINTS_PER_UNIT, columnPoints, longestWord, textUnits, widestLine, wrappedLines } from './measure';
import type { TextStyle } from './measure';
import { applyHeaderFooter, applyPageSetup, chooseOrientation, fitScale, printable } from './page';
import type { Orientation, Paper } from './page';

/** What a cell can hold: a number, text (always stored as text, "=…" included), a logical, an error, or nothing. */
export type DocValue = number | string | boolean | null | undefined | { readonly error: string };

export interface DocumentOptions {
  /** The document's title, printed in the page header of every page (unless pageTitle is given). */
  readonly title: string;
  /** A shorter title for the page header. */
  readonly pageTitle?: string;
  /** Invented data: the page header carries the demo marker too. */
  readonly demo: boolean;
  /** The date the document is of (a fill's date), YYYY-MM-DD: printed in the footer. */
  readonly date: string;
  /** Paper size, A4 by default. */
  readonly paper?: Paper;
  /** Program version in the footer; default src/engine/version.ts. */
  readonly version?: string;
}

export interface LineStyle {
  readonly bold?: boolean;
  readonly italic?: boolean;
  /** Points (11 default). */
  readonly size?: number;
  /** ARGB colour, "FFC00000". */
  readonly color?: string;
}

/** A formula's cached result, as the engine gives it. */
export type FormulaResult = number | string | boolean | { readonly error: string };

/**
 * A cell of a table body (see DocumentSheet.bodyLine): what put() takes, or a formula as the file
 * stores it with its cached result, or a cell of a shared formula (the master cell's formula moved
 * to this cell) with its cached result.
 */
export type BodyValue = DocValue | { readonly formula: string; readonly result: FormulaResult } | { readonly sharedFormula: string; readonly result: FormulaResult };

/** A row of a table body. */
export interface BodyRow {
  readonly values: readonly BodyValue[];
  /** A number format per column, applied to numbers (and to formulas whose result is a number). */
  readonly formats?: readonly (string | undefined)[];
  /** Points; set by finish(). */
  height: number;
}

/** A body cell's format, as exceljs writes a cell's style. */
export interface BodyStyle {
  readonly numFmt?: string;
  readonly alignment?: Readonly<Partial<ExcelJS.Alignment>>;
}

/**
 * The table body of a finished sheet: rows kept as plain values rather than exceljs cells (a
 * review's tables hold tens of thousands of rows). Only a writer that reads it (the review's
 * package writer) writes them; exceljs's own writer would write the sheet without them.
 */
export interface TableBody {
  readonly rows: ReadonlyMap<number, BodyRow>;
  /** The format of a body cell (shared objects: equal formats are the same object). */
  style(row: BodyRow, col: number): BodyStyle | undefined;
}

const BODIES = new WeakMap<ExcelJS.Worksheet, TableBody>();

/** The table body of a sheet written with bodyLine(), if any. */
export function tableBodyOf(ws: ExcelJS.Worksheet): TableBody | undefined {
  return BODIES.get(ws);
}

function isFormula(v: BodyValue): v is { readonly formula: string; readonly result: FormulaResult } | { readonly sharedFormula: string; readonly result: FormulaResult } {
  return typeof v === 'object' && v !== null && ('formula' in v || 'sharedFormula' in v);
}

/** The text a body cell shows, as shownText() reads an exceljs cell. */
function shownBody(v: BodyValue, format: string | undefined): string {
  const x = isFormula(v) ? v.result : v;
  if (x === null || x === undefined) return '';
  if (typeof x === 'number') return shownNumber(x, format);
  if (typeof x === 'string') return x;
  if (typeof x === 'boolean') return x ? 'TRUE' : 'FALSE';
  return String(x.error);
}

/** Text set in by one character, as put() sets it (a formula's text result is always set in). */
function bodySetIn(v: BodyValue, col: number): boolean {
  if (isFormula(v)) return typeof v.result === 'string';
  return typeof v === 'string' && (col > 1 || FORMULA_LIKE.test(v));
}

export interface RowOptions {
  readonly bold?: boolean;
  /** A number format per column ("0.00"), applied to numbers. */
  readonly formats?: readonly (string | undefined)[];
}

/** Roles a sign-off names, in order. */
export const SIGN_OFF_ROLES = ['Prepared by', 'Reviewed by', 'Approved by'] as const;
/** The lines each role signs on. */
export const SIGN_OFF_FIELDS = ['Name', 'Signature', 'Date'] as const;
export const SIGN_OFF_TITLE = 'Sign-off';
/** Characters a line of the caution holds. */
export const CAUTION_LINE = 64;

/** Widest a wrapped long-text column gets, and the widest any column gets before it wraps. */
export const WRAP_WIDTH = 36;
export const MAX_WIDTH = 72;
const MIN_WIDTH = 5;
const EXCELJS_DEFAULT_WIDTH = 9;
/** Header texts wrap into at most about this many lines before their column widens. */
const HEADER_LINES = 3;
/** A header text up to this wide stays on one line. */
const SHORT_HEADER = 14;
/** The narrowest printed width (units) a sheet gets: room for the sign-off lines. */
const MIN_PRINT_UNITS = 80;
const EXTRA_COLUMN = 12;
/** Points of a sign-off row: room to sign. */
const SIGN_ROW_POINTS = 30;
const FORMULA_LIKE = /^[=+\-@]/;
/** Units an indent of 1 takes (the gap that keeps wrapped text off the number before it). */
const INDENT_UNITS = 1.5;

/**
 * Text set in by one character. One object shared by every such cell (never changed in place:
 * a cell whose alignment changes gets a new object), so a writer meets it once.
 */
export const SET_IN: Readonly<Partial<ExcelJS.Alignment>> = { horizontal: 'left', indent: 1 };

const RED = 'FFC00000';
const GREY = 'FF595959';

/** The text a cell shows (numbers as their format shows them), for measuring. */
export function shownText(cell: ExcelJS.Cell): string {
  const v = cell.value;
  if (v === null || v === undefined) return '';
  if (typeof v === 'string') return v;
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (typeof v === 'number') return shownNumber(v, cell.numFmt);
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  if (typeof v === 'object') {
    if ('error' in v) return String(v.error);
    if ('richText' in v) return v.richText.map((p) => p.text).join('');
    // A formula read back from a file may carry no result (exceljs drops a cached 0): it shows its result or nothing.
    if ('result' in v || 'formula' in v || 'sharedFormula' in v) {
      const r = (v as ExcelJS.CellFormulaValue).result;
      if (typeof r === 'number') return shownNumber(r, cell.numFmt);
      if (r && typeof r === 'object' && 'error' in r) return String(r.error);
      return r === undefined || r === null ? '' : String(r);
    }
  }
  return String(v);
}

function shownNumber(x: number, format: string | undefined): string {
  const m = /^0(?:\.(0+))?$/.exec(format ?? '');
  if (m) return x.toFixed(m[1]?.length ?? 0);
  const s = String(x);
  return s.length <= 11 ? s : String(Number(x.toPrecision(9)));
}

/** A cell inside a merged range other than its first: it shows nothing of its own. */
function isCovered(cell: ExcelJS.Cell): boolean {
  return cell.isMerged && cell.master.address !== cell.address;
}

function styleOf(cell: ExcelJS.Cell): TextStyle {
  return { bold: cell.font?.bold === true, size: cell.font?.size };
}

export class DocumentSheet {
  /** The next row the cursor writes. */
  row = 1;
  private readonly spans = new Map<number, number>();
  private readonly headers = new Set<number>();
  private readonly wrapCols = new Set<number>();
  private readonly fixedHeights = new Map<number, number>();
  /** Rows whose line across the page was merged and wrapped. */
  private readonly wrapped = new Set<number>();
  private titleRow: number | undefined;
  private repeatNone = false;
  private hasCaution = false;
  private finished = false;
  /** Table-body rows (bodyLine), by row. */
  private readonly body = new Map<number, BodyRow>();
  private readonly bodyStyles = new Map<string, BodyStyle>();

  constructor(
    readonly ws: ExcelJS.Worksheet,
    readonly options: DocumentOptions,
  ) {}

  /** The sheet's heading: a line across the page in large bold type. */
  title(text: string): number {
    return this.text(text, { bold: true, size: 14 });
  }

  /** The demo marker line (red, bold). */
  demoMarker(): number {
    return this.text(DEMO_MARKER, { bold: true, color: RED });
  }

  /** A line of text across the printed width (wrapped to it). */
  text(text: string, style: LineStyle = {}): number {
    const r = this.row++;
    const cell = this.ws.getCell(r, 1);
    cell.value = text;
    applyFont(cell, style);
    this.spans.set(r, 1);
    return r;
  }

  /** A note under a table: a line across the page in grey italic. */
  note(text: string): number {
    return this.text(text, { italic: true, color: GREY });
  }

  /**
   * The caution, in lines of at most CAUTION_LINE characters across the page (each its own
   * cell, so a reader of the cells finds the text once). Returns its first row.
   */
  caution(): number {
    this.hasCaution = true;
    const first = this.row;
    for (const line of wrapText(CAUTION, CAUTION_LINE)) this.text(line, { italic: true });
    return first;
  }

  /** A table's header row: bold, wrapped, ruled below. The first one is repeated on every printed page unless printTitle() names another. */
  header(labels: readonly string[]): number {
    const r = this.row++;
    labels.forEach((label, i) => {
      const cell = this.ws.getCell(r, i + 1);
      cell.value = label;
      styleHeader(cell);
    });
    this.markHeader(r);
    return r;
  }

  /** A table row at the cursor. */
  line(values: readonly DocValue[], opts: RowOptions = {}): number {
    const r = this.row++;
    values.forEach((v, i) => this.put(r, i + 1, v, { format: opts.formats?.[i], bold: opts.bold }));
    return r;
  }

  /**
   * A table row at the cursor kept as plain values, not exceljs cells: for tables of thousands of
   * rows. It prints, measures and is styled as line() would write it (text set in, formats on
   * numbers); formulas come with their cached results. Only the review's package writer writes
   * body rows (see tableBodyOf).
   */
  bodyLine(values: readonly BodyValue[], opts: { formats?: readonly (string | undefined)[] } = {}): number {
    const r = this.row++;
    this.body.set(r, { values, formats: opts.formats, height: LINE_POINTS });
    if (!BODIES.has(this.ws)) BODIES.set(this.ws, { rows: this.body, style: (row, col) => this.bodyStyle(row, col) });
    return r;
  }

  private bodyStyle(row: BodyRow, col: number): BodyStyle | undefined {
    const v = row.values[col - 1];
    if (v === null || v === undefined) return undefined;
    const shown = isFormula(v) ? v.result : v;
    const format = typeof shown === 'number' ? row.formats?.[col - 1] : undefined;
    const setIn = bodySetIn(v, col);
    const wrap = this.wrapCols.has(col);
    const top = row.height > LINE_POINTS;
    const key = `${format ?? ''}|${setIn}|${wrap}|${top}`;
    let style = this.bodyStyles.get(key);
    if (!style) {
      // As setWidths() and setHeights() restyle cells of wrapped columns and rows of several lines.
      let alignment: Partial<ExcelJS.Alignment> | undefined = setIn ? SET_IN : undefined;
      if (wrap) alignment = { ...(alignment ?? {}), wrapText: true, vertical: 'top', indent: 1 };
      if (top) alignment = { ...(alignment ?? {}), vertical: 'top' };
      style = { ...(format ? { numFmt: format } : {}), ...(alignment ? { alignment } : {}) };
      this.bodyStyles.set(key, style);
    }
    return style;
  }

  /** Each body cell that shows something: its row, column, text and whether it is set in. */
  private eachBodyCell(fn: (r: number, c: number, text: string, setIn: boolean) => void): void {
    for (const [r, row] of this.body) {
      row.values.forEach((v, i) => {
        const t = shownBody(v, row.formats?.[i]);
        if (t !== '') fn(r, i + 1, t, bodySetIn(v, i + 1));
      });
    }
  }

  /**
   * One cell anywhere (a table filled after the rows below it). Text is stored as text ("=…"
   * included) and, after the first column or when it looks like a formula, set in by one character.
   */
  put(row: number, col: number, value: DocValue, opts: { format?: string; bold?: boolean } = {}): void {
    if (value === null || value === undefined) return;
    const cell = this.ws.getCell(row, col);
    cell.value = value as ExcelJS.CellValue;
    // Text set in by one character: it never touches a right-aligned number in the column before.
    if (typeof value === 'string' && (col > 1 || FORMULA_LIKE.test(value))) cell.alignment = SET_IN;
    if (opts.format && typeof value === 'number') cell.numFmt = opts.format;
    if (opts.bold) cell.font = { ...(cell.font ?? {}), bold: true };
  }

  /** Leaves rows empty. */
  skip(n = 1): void {
    this.row += n;
  }

  /** Columns of long text (a source, a note): wrapped, at most WRAP_WIDTH wide. */
  wrap(...cols: number[]): void {
    for (const c of cols) this.wrapCols.add(c);
  }

  /** The header row repeated at the top of every printed page. */
  printTitle(row: number): void {
    this.titleRow = row;
  }

  /**
   * No header row repeated on the printed pages: for a sheet of several different tables, each
   * starting a page of its own, where one table's header above another's rows would mislead.
   */
  noPrintTitle(): void {
    this.titleRow = undefined;
    this.repeatNone = true;
  }

  /** Marks a row written by someone else (a fill plan's writer) as a table header row. */
  markHeader(row: number): void {
    this.headers.add(row);
    if (this.titleRow === undefined && !this.repeatNone) this.titleRow = row;
  }

  /** Marks a cell written by someone else as a line of text running from its column across the printed width. */
  markSpan(row: number, fromCol: number): void {
    this.spans.set(row, fromCol);
  }

  /** Says the sheet already carries the caution (a fill plan's block has it). */
  markCaution(): void {
    this.hasCaution = true;
  }

  /**
   * Makes the sheet a printable document: the caution (unless it is there), the sign-off block,
   * widths, wrapping, heights, page set-up, header and footer. Call once, last.
   */
  finish(): PrintLayout {
    if (this.finished) throw new Error(`sheet "${this.ws.name}" is already finished`);
    this.finished = true;
    const lastContentRow = this.lastUsedRow();
    this.row = lastContentRow + 2;
    let lastCol = Math.max(4, this.lastTableCol());
    const widths = this.setWidths(lastCol);
    lastCol = this.widenForSignOff(lastCol, widths);
    if (!this.hasCaution && !this.sheetHasCaution()) {
      const room = widths.slice(1, lastCol + 1).reduce((a, b) => a + b, 0) - CELL_PADDING;
      this.hasCaution = true;
      for (const line of linesWithin(CAUTION, room)) this.text(line, { italic: true });
      this.row++;
    }
    const signOff = this.signOff(lastCol, widths);
    this.layOutSpans(lastCol, widths);
    const heights = this.setHeights(lastCol, widths);
    const paper = this.options.paper ?? 'A4';
    const contentPoints = widths.slice(1, lastCol + 1).reduce((s, w) => s + columnPoints(w), 0);
    const orientation = chooseOrientation(contentPoints, paper);
    const lastRow = signOff.last;
    const pageBreak = this.keepSignOffTogether(signOff.first, lastRow, heights, contentPoints, paper, orientation);
    applyPageSetup(this.ws, { paper, orientation, lastCol, lastRow, titleRow: this.titleRow });
    // The page header's text is not scaled with the sheet: its room is the printable width in units at 100 %.
    const headerUnits = printable(paper, orientation).width / POINTS_PER_UNIT;
    applyHeaderFooter(this.ws, { title: this.options.pageTitle ?? this.options.title, demo: this.options.demo, date: this.options.date, program: `Leeway ${this.options.version ?? VERSION}` }, headerUnits);
    return { lastCol, lastRow, orientation, paper, titleRow: this.titleRow, signOffRow: signOff.first, widths: widths.slice(1, lastCol + 1), contentPoints, scale: fitScale(contentPoints, paper, orientation), pageBreakBefore: pageBreak };
  }

  /** A sheet narrower than MIN_PRINT_UNITS gets empty columns on the right, so the sign-off lines are long enough to sign on. */
  private widenForSignOff(lastCol: number, widths: number[]): number {
    let total = widths.slice(1, lastCol + 1).reduce((a, b) => a + b, 0);
    let c = lastCol;
    while (total < MIN_PRINT_UNITS) {
      c++;
      widths[c] = EXTRA_COLUMN;
      this.ws.getColumn(c).width = EXTRA_COLUMN;
      total += EXTRA_COLUMN;
    }
    return c;
  }

  private lastUsedRow(): number {
    let last = 0;
    this.ws.eachRow({ includeEmpty: false }, (row, r) => {
      row.eachCell({ includeEmpty: false }, (cell) => {
        if (shownText(cell) !== '') last = Math.max(last, r);
      });
    });
    this.eachBodyCell((r) => (last = Math.max(last, r)));
    return Math.max(last, this.row - 1);
  }

  /** The rightmost column with content that is not a line across the page. */
  private lastTableCol(): number {
    let last = 1;
    this.ws.eachRow({ includeEmpty: false }, (row, r) => {
      row.eachCell({ includeEmpty: false }, (cell, c) => {
        if (shownText(cell) !== '' && this.spans.get(r) !== c) last = Math.max(last, c);
      });
    });
    this.eachBodyCell((r, c) => (last = Math.max(last, c)));
    return last;
  }

  private sheetHasCaution(): boolean {
    const texts: string[] = [];
    const isPart = (v: unknown): v is string => typeof v === 'string' && CAUTION.includes(v) && v.length > 20;
    // In row order, body rows among the others.
    const found = new Map<number, string[]>();
    this.ws.eachRow((row, r) => row.eachCell((c) => void (isPart(c.value) && found.set(r, [...(found.get(r) ?? []), c.value]))));
    for (const [r, row] of this.body) for (const v of row.values) if (isPart(v)) found.set(r, [...(found.get(r) ?? []), v]);
    for (const r of [...found.keys()].sort((a, b) => a - b)) texts.push(...(found.get(r) ?? []));
    return texts.join(' ') === CAUTION;
  }

  /** Column widths from the content; index = column number (0 unused). */
  private setWidths(lastCol: number): number[] {
    const content = new Array<number>(lastCol + 1).fill(0);
    const words = new Array<number>(lastCol + 1).fill(0);
    const header = new Array<number>(lastCol + 1).fill(0);
    this.ws.eachRow({ includeEmpty: false }, (row, r) => {
      row.eachCell({ includeEmpty: false }, (cell, c) => {
        if (c > lastCol || this.spans.get(r) === c) return;
        const t = shownText(cell);
        if (t === '') return;
        const style = styleOf(cell);
        if (this.headers.has(r)) {
          const whole = textUnits(t, style);
          header[c] = Math.max(header[c], (whole <= SHORT_HEADER ? whole : Math.max(longestWord(t, style), whole / HEADER_LINES)) + CELL_PADDING);
        } else {
          // Wrapped columns get an indent below; other cells may carry one already.
          const indent = this.wrapCols.has(c) ? INDENT_UNITS : (cell.alignment?.indent ?? 0) * INDENT_UNITS;
          content[c] = Math.max(content[c], widestLine(t, style) + CELL_PADDING + indent);
          words[c] = Math.max(words[c], longestWord(t, style) + CELL_PADDING + indent);
        }
      });
    });
    // Body cells: plain type (not bold, 11 points), set in or not.
    this.eachBodyCell((r, c, t, setIn) => {
      if (c > lastCol) return;
      const indent = this.wrapCols.has(c) || setIn ? INDENT_UNITS : 0;
      content[c] = Math.max(content[c], widestLine(t) + CELL_PADDING + indent);
      words[c] = Math.max(words[c], longestWord(t) + CELL_PADDING + indent);
    });
    const widths = [0];
    for (let c = 1; c <= lastCol; c++) {
      let w = Math.max(content[c], header[c], MIN_WIDTH);
      if (this.wrapCols.has(c) && w > WRAP_WIDTH) w = Math.max(WRAP_WIDTH, Math.min(words[c], MAX_WIDTH), header[c]);
      else if (w > MAX_WIDTH) {
        this.wrapCols.add(c);
        w = Math.max(MAX_WIDTH, header[c]);
      }
      w = Math.ceil(w * 2) / 2;
      // exceljs leaves a column of width 9 (its default) out of the file, and a program reading the
      // file then gives it its own default (8.43 in Excel): keep clear of it.
      if (w === EXCELJS_DEFAULT_WIDTH) w += 0.5;
      widths.push(w);
      this.ws.getColumn(c).width = w;
    }
    for (const c of this.wrapCols) {
      if (c > lastCol) continue;
      this.ws.getColumn(c).eachCell({ includeEmpty: false }, (cell, r) => {
        if (this.headers.has(r) || this.spans.get(r) === c) return;
        cell.alignment = { ...(cell.alignment ?? {}), wrapText: true, vertical: 'top', indent: 1 };
      });
    }
    return widths;
  }

  /** The sign-off block after the content; returns its first and last rows. */
  private signOff(lastCol: number, widths: number[]): { first: number; last: number } {
    const groups = signOffGroups(widths, lastCol);
    const first = this.row;
    const titleCell = this.ws.getCell(first, 1);
    titleCell.value = SIGN_OFF_TITLE;
    titleCell.font = { bold: true };
    const captions = first + 1;
    groups.forEach(([from], i) => {
      const cell = this.ws.getCell(captions, from);
      cell.value = SIGN_OFF_FIELDS[i];
      cell.font = { italic: true, color: { argb: GREY } };
    });
    SIGN_OFF_ROLES.forEach((role, k) => {
      const r = captions + 1 + k;
      const label = this.ws.getCell(r, 1);
      label.value = role;
      label.font = { bold: true };
      label.alignment = { vertical: 'bottom' };
      for (const [from, to] of groups) {
        if (to > from) this.ws.mergeCells(r, from, r, to);
        for (let c = from; c <= to; c++) this.ws.getCell(r, c).border = { bottom: { style: 'thin' } };
      }
      this.fixedHeights.set(r, SIGN_ROW_POINTS);
    });
    const need = textUnits(SIGN_OFF_ROLES[1], { bold: true }) + CELL_PADDING;
    if (widths[1] < need) {
      widths[1] = Math.ceil(need * 2) / 2;
      this.ws.getColumn(1).width = widths[1];
    }
    this.row = captions + 1 + SIGN_OFF_ROLES.length;
    return { first, last: this.row - 1 };
  }

  /**
   * Lines across the page: one that fits the printed width from its column runs on over the
   * empty cells to its right, as typed text does; a longer one is merged up to the last column
   * and wrapped (readers that walk cells one by one then see its text in each merged cell).
   */
  private layOutSpans(lastCol: number, widths: number[]): void {
    for (const [r, from] of this.spans) {
      let to = lastCol;
      for (let c = from + 1; c <= lastCol; c++) {
        if (shownText(this.ws.getCell(r, c)) !== '') {
          to = c - 1;
          break;
        }
      }
      const cell = this.ws.getCell(r, from);
      let room = 0;
      for (let c = from; c <= to; c++) room += widths[c];
      if (widestLine(shownText(cell), styleOf(cell)) + CELL_PADDING <= room) continue;
      if (to > from) this.ws.mergeCells(r, from, r, to);
      cell.alignment = { ...(cell.alignment ?? {}), wrapText: true, vertical: 'top' };
      this.wrapped.add(r);
    }
  }

  /** Every row's height set explicitly (from its wrapped lines), so every program pages it alike. Returns heights by row. */
  private setHeights(lastCol: number, widths: number[]): number[] {
    const heights: number[] = [0];
    for (let r = 1; r < this.row; r++) {
      const fixed = this.fixedHeights.get(r);
      const body = this.body.get(r);
      if (body) {
        body.height = fixed ?? this.bodyHeight(body, lastCol, widths);
        heights.push(body.height);
        continue;
      }
      let h = LINE_POINTS;
      const row = this.ws.getRow(r);
      row.eachCell({ includeEmpty: false }, (cell, c) => {
        if (c > lastCol || isCovered(cell)) return;
        const t = shownText(cell);
        if (t === '') return;
        const style = styleOf(cell);
        const span = this.spans.get(r) === c;
        const width = span ? spanWidth(this.ws, r, c, lastCol, widths) : widths[c];
        const wraps = (span && this.wrapped.has(r)) || (!span && this.headers.has(r)) || this.wrapCols.has(c) || cell.alignment?.wrapText === true;
        const indent = cell.alignment?.indent ? INDENT_UNITS * cell.alignment.indent : 0;
        const lines = wraps ? wrappedLines(t, width - indent, style) : t.split('\n').length;
        h = Math.max(h, lines * LINE_POINTS * Math.max(1, (style.size ?? 11) / 11));
      });
      const height = fixed ?? h;
      row.height = height;
      if (height > LINE_POINTS && fixed === undefined && !this.headers.has(r)) topAlign(row);
      heights.push(height);
    }
    return heights;
  }

  /** A body row's height: as setHeights() measures a row of cells (plain type; wrapped in wrapped columns). */
  private bodyHeight(row: BodyRow, lastCol: number, widths: number[]): number {
    let h = LINE_POINTS;
    row.values.forEach((v, i) => {
      const c = i + 1;
      const t = shownBody(v, row.formats?.[i]);
      if (c > lastCol || t === '') return;
      const wraps = this.wrapCols.has(c);
      const indent = wraps || bodySetIn(v, c) ? INDENT_UNITS : 0;
      const lines = wraps ? wrappedLines(t, widths[c] - indent) : t.split('\n').length;
      h = Math.max(h, lines * LINE_POINTS);
    });
    return h;
  }

  /**
   * A manual page break before the sign-off block when it would otherwise start near the foot of
   * a page and be split. The estimate uses the row heights set here and Excel's fit-to-width
   * scale; a twentieth of a page is kept in reserve. Programs that draw the sheet in a wider
   * font than Excel (see docs/reference/printing.md) fit more rows and may not need the break.
   */
  private keepSignOffTogether(first: number, last: number, heights: number[], contentPoints: number, paper: Paper, orientation: Orientation): boolean {
    const scale = fitScale(contentPoints, paper, orientation);
    const page = printable(paper, orientation).height / scale;
    const title = this.titleRow ? heights[this.titleRow] : 0;
    let used = 0;
    for (let r = 1; r < first; r++) {
      if (used + heights[r] > page) used = title;
      used += heights[r];
    }
    let block = 0;
    for (let r = first; r <= last; r++) block += heights[r];
    if (used + block > page * 0.95 && first > 1) {
      this.ws.getRow(first - 1).addPageBreak();
      return true;
    }
    return false;
  }
}

/** What finish() laid out: for tests and for callers that report it. */
export interface PrintLayout {
  readonly lastCol: number;
  readonly lastRow: number;
  readonly orientation: Orientation;
  readonly paper: Paper;
  readonly titleRow: number | undefined;
  readonly signOffRow: number;
  /** Column widths 1…lastCol, in column-width units. */
  readonly widths: readonly number[];
  /** Printed width of the columns at 100 %, points. */
  readonly contentPoints: number;
  /** The fit-to-width scale the page set-up asks for (≤ 1). */
  readonly scale: number;
  /** A manual page break was put before the sign-off block. */
  readonly pageBreakBefore: boolean;
}

/** Columns 2…lastCol split into the Name, Signature and Date lines (about 40 %, 35 %, 25 % of the width). */
export function signOffGroups(widths: readonly number[], lastCol: number): Array<[number, number]> {
  const cols: number[] = [];
  for (let c = 2; c <= lastCol; c++) cols.push(c);
  const total = cols.reduce((s, c) => s + widths[c], 0);
  const cum: number[] = [];
  cols.forEach((c, i) => cum.push((i ? cum[i - 1] : 0) + widths[c]));
  const cut = (from: number, latest: number, share: number): number => {
    let i = from;
    while (i < latest && cum[i] < share * total) i++;
    return i;
  };
  const end0 = cut(0, cols.length - 3, 0.4);
  const end1 = cut(end0 + 1, cols.length - 2, 0.75);
  return [
    [cols[0], cols[end0]],
    [cols[end0 + 1], cols[end1]],
    [cols[end1 + 1], cols[cols.length - 1]],
  ];
}

function spanWidth(ws: ExcelJS.Worksheet, row: number, from: number, lastCol: number, widths: number[]): number {
  let w = 0;
  for (let c = from; c <= lastCol; c++) {
    if (c > from && ws.getCell(row, c).master.address !== ws.getCell(row, from).address) break;
    w += widths[c];
  }
  return w;
}

/** Text split at spaces into lines each at most `units` wide (a longer word stays whole on its line). */
export function linesWithin(text: string, units: number, style: TextStyle = {}): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    const next = line === '' ? word : `${line} ${word}`;
    if (line !== '' && textUnits(next, style) > units) {
      lines.push(line);
      line = word;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

/** Every cell of a row of several lines set to the top, so a row reads from its first line. */
function topAlign(row: ExcelJS.Row): void {
  row.eachCell({ includeEmpty: false }, (cell) => {
    if (!isCovered(cell)) cell.alignment = { ...(cell.alignment ?? {}), vertical: 'top' };
  });
}

function applyFont(cell: ExcelJS.Cell, s: LineStyle): void {
  const font: Partial<ExcelJS.Font> = {};
  if (s.bold) font.bold = true;
  if (s.italic) font.italic = true;
  if (s.size) font.size = s.size;
  if (s.color) font.color = { argb: s.color };
  if (Object.keys(font).length) cell.font = font;
}

/** A table header cell: bold, wrapped, ruled below. */
export function styleHeader(cell: ExcelJS.Cell): void {
  cell.font = { ...(cell.font ?? {}), bold: true };
  cell.border = { bottom: { style: 'thin' } };
  cell.alignment = { wrapText: true, vertical: 'bottom' };
}
