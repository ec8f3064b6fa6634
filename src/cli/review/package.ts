/**
 * The review workbook's .xlsx package, written sheet by sheet.
 *
 * Why not exceljs's own writer: a review of 50,000 results holds about 800,000 cells, and exceljs
 * keeps every cell of every sheet in memory, then builds a second model of each for writing and
 * holds every sheet's XML uncompressed until the archive is made: over a gigabyte and most of the
 * run time. Its streaming writer (4.4) places no pictures on a worksheet. So each sheet is still
 * built with exceljs and made a printed document by the document-sheet layer, in a workbook of its
 * own; this writer then turns that one finished sheet into its SpreadsheetML part, hands the part
 * to the archive (compressed on the thread pool) and the sheet is dropped. Styles and shared
 * strings are collected across sheets and written last, with the workbook part (sheet order,
 * print areas and print titles) and the document properties.
 *
 * What it writes of a sheet: values (numbers, text, logicals, errors), formulas and shared
 * formulas with their cached results, fonts, alignment, borders, solid fills and number formats,
 * column widths, row heights, merged cells, page set-up and margins, page header and footer,
 * manual page breaks, the sheet view, and pictures anchored at a cell. A sheet holding anything
 * else (a hyperlink, rich text, a date value, conditional formats, data validation, a comment, a
 * filter, a table) is refused with an error rather than written without it. A sheet's table body
 * (rows the document-sheet layer keeps as plain values: DocumentSheet.bodyLine) is written with
 * it. Text cells keep every character: the characters XML cannot hold are written as _xHHHH_
 * (ECMA-376 Part 1, ST_Xstring).
 */
import type ExcelJS from 'exceljs';
import { columnLetters } from '../../engine/fill';
import { tableBodyOf } from '../document';
import { ZipBuilder } from './zip';

const NS_MAIN = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const NS_REL = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const NS_PKG_REL = 'http://schemas.openxmlformats.org/package/2006/relationships';
const REL = {
  document: `${NS_REL}/officeDocument`,
  core: 'http://schemas.openxmlformats.org/package/2006/relationships/metadata/core-properties',
  app: `${NS_REL}/extended-properties`,
  worksheet: `${NS_REL}/worksheet`,
  styles: `${NS_REL}/styles`,
  strings: `${NS_REL}/sharedStrings`,
  drawing: `${NS_REL}/drawing`,
  image: `${NS_REL}/image`,
};
const CT = 'application/vnd.openxmlformats-officedocument';
const XML_HEAD = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n';
/** English Metric Units per pixel at 96 pixels an inch (ECMA-376 Part 1, 20.1.2.1; from memory). */
const EMU_PER_PIXEL = 9525;
/** exceljs's cell types (its ValueType enumeration). */
const TYPE = { null: 0, merge: 1, number: 2, string: 3, date: 4, hyperlink: 5, formula: 6, sharedString: 7, richText: 8, boolean: 9, error: 10 } as const;
/** Number formats every spreadsheet program knows by number (ECMA-376 Part 1, 18.8.30). */
const BUILT_IN_FORMATS: Readonly<Record<string, number>> = { General: 0, '0': 1, '0.00': 2, '#,##0': 3, '#,##0.00': 4, '0%': 9, '0.00%': 10, '0.00E+00': 11, '@': 49 };
/**
 * The calculation engine and application the package names, as exceljs (and so every other
 * workbook Leeway writes) names them. A reader takes both as a sign that the cached results are
 * current: Excel recalculates a workbook from an older engine on opening, and LibreOffice
 * recalculates files another application wrote (checked: with the application named "Leeway" it
 * recalculates, and the flags print as errors); either would replace the cached results of the
 * add-in's formulas with errors where the add-in is not installed.
 */
const CALC_ID = 171027;
const APPLICATION = 'Microsoft Excel';
const DEFAULT_FONT = '<font><sz val="11"/><name val="Calibri"/><family val="2"/></font>';

/** Characters XML 1.0 cannot hold: controls but tab, line feed and return; unpaired surrogates. */
// eslint-disable-next-line no-control-regex -- these are the characters it finds
const INVALID = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;
/** Those, and an underscore that would make text read as an _xHHHH_ escape. */
const NOT_XML = new RegExp(`${INVALID.source}|_(?=x[0-9a-fA-F]{4}_)`, 'g');
const MARKUP = /[&<>"]/g;
const ENTITY: Readonly<Record<string, string>> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' };

/** Text for an element or attribute: markup escaped; a character XML cannot hold is an error. */
function esc(s: string): string {
  if (INVALID.test(s)) throw new Error(`text holds a character a workbook cannot store: ${JSON.stringify(s.slice(0, 40))}`);
  return s.replace(MARKUP, (c) => ENTITY[c]);
}

/** A cell's text: every character kept, those XML cannot hold as _xHHHH_ (and a literal "_x" escape-alike as _x005F_). */
function cellText(s: string): string {
  const kept = s.replace(NOT_XML, (c) => `_x${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}_`);
  return kept.replace(MARKUP, (c) => ENTITY[c]);
}

function textElement(s: string): string {
  const space = /^\s|\s$/.test(s) ? ' xml:space="preserve"' : '';
  return `<t${space}>${cellText(s)}</t>`;
}

function num(x: number): string {
  if (!Number.isFinite(x)) throw new Error(`a cell holds ${x}, which a workbook cannot store`);
  return String(x);
}

/** The fonts, fills, borders, number formats and cell formats of the package, each written once. */
class StyleTable {
  private readonly fonts = new Map<string, number>([[DEFAULT_FONT, 0]]);
  private readonly fills = new Map<string, number>([
    ['<fill><patternFill patternType="none"/></fill>', 0],
    ['<fill><patternFill patternType="gray125"/></fill>', 1],
  ]);
  private readonly borders = new Map<string, number>([['<border><left/><right/><top/><bottom/><diagonal/></border>', 0]]);
  private readonly formats = new Map<string, number>();
  private readonly xfs = new Map<string, number>([['<xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/>', 0]]);
  /** Parts already numbered, by object: exceljs cells often share one font, alignment or border object. */
  private readonly seen = new WeakMap<object, number>();
  private readonly alignments = new Map<string, number>([['', 0]]);
  private readonly byParts = new Map<string, number>();

  /** The cell format number of an exceljs style (0 for none). */
  idOf(style: Partial<ExcelJS.Style> | undefined): number {
    if (!style || !(style.numFmt || style.font || style.fill || style.border || style.alignment)) return 0;
    const numFmt = style.numFmt ? this.formatId(style.numFmt) : 0;
    const font = style.font ? this.part(style.font, this.fonts, fontXml) : 0;
    const fill = style.fill ? this.part(style.fill, this.fills, fillXml) : 0;
    const border = style.border ? this.part(style.border, this.borders, borderXml) : 0;
    const alignment = style.alignment ? this.part(style.alignment, this.alignments, alignmentXml) : 0;
    const key = `${numFmt} ${font} ${fill} ${border} ${alignment}`;
    let id = this.byParts.get(key);
    if (id === undefined) {
      const align = [...this.alignments.keys()][alignment];
      const applies = `${numFmt ? ' applyNumberFormat="1"' : ''}${font ? ' applyFont="1"' : ''}${fill ? ' applyFill="1"' : ''}${border ? ' applyBorder="1"' : ''}${align ? ' applyAlignment="1"' : ''}`;
      id = this.index(this.xfs, `<xf numFmtId="${numFmt}" fontId="${font}" fillId="${fill}" borderId="${border}" xfId="0"${applies}${align ? `>${align}</xf>` : '/>'}`);
      this.byParts.set(key, id);
    }
    return id;
  }

  /** The number of a font, fill, border or alignment in its list. */
  private part<T extends object>(o: T, map: Map<string, number>, toXml: (o: T) => string): number {
    let i = this.seen.get(o);
    if (i === undefined) {
      i = this.index(map, toXml(o));
      this.seen.set(o, i);
    }
    return i;
  }

  private index(map: Map<string, number>, xml: string): number {
    let i = map.get(xml);
    if (i === undefined) {
      i = map.size;
      map.set(xml, i);
    }
    return i;
  }

  private formatId(code: string): number {
    const builtIn = BUILT_IN_FORMATS[code];
    if (builtIn !== undefined) return builtIn;
    let id = this.formats.get(code);
    if (id === undefined) {
      id = 164 + this.formats.size;
      this.formats.set(code, id);
    }
    return id;
  }

  xml(): string {
    const list = (tag: string, map: Map<string, number>): string => `<${tag} count="${map.size}">${[...map.keys()].join('')}</${tag}>`;
    const formats = this.formats.size ? `<numFmts count="${this.formats.size}">${[...this.formats].map(([code, id]) => `<numFmt numFmtId="${id}" formatCode="${esc(code)}"/>`).join('')}</numFmts>` : '';
    return (
      `${XML_HEAD}<styleSheet xmlns="${NS_MAIN}">${formats}${list('fonts', this.fonts)}${list('fills', this.fills)}${list('borders', this.borders)}` +
      '<cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>' +
      `${list('cellXfs', this.xfs)}<cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles><dxfs count="0"/><tableStyles count="0"/></styleSheet>`
    );
  }
}

function colorXml(c: Partial<ExcelJS.Color> | undefined): string {
  if (!c) return '';
  if (c.argb) return `<color rgb="${esc(c.argb)}"/>`;
  if (c.theme !== undefined) return `<color theme="${c.theme}"/>`;
  return '';
}

function fontXml(f: Partial<ExcelJS.Font>): string {
  const underline = f.underline === true ? '<u/>' : typeof f.underline === 'string' ? `<u val="${esc(f.underline)}"/>` : '';
  // In the order the schema lists a font's parts (ECMA-376 Part 1, CT_Font), as spreadsheet programs write them.
  return `<font>${f.bold ? '<b/>' : ''}${f.italic ? '<i/>' : ''}${f.strike ? '<strike/>' : ''}${underline}<sz val="${f.size ?? 11}"/>${colorXml(f.color)}<name val="${esc(f.name ?? 'Calibri')}"/><family val="${f.family ?? 2}"/></font>`;
}

function fillXml(f: ExcelJS.Fill): string {
  if (f.type !== 'pattern' || (f.pattern !== 'solid' && f.pattern !== 'none')) throw new Error(`the review writer writes solid fills only (got ${JSON.stringify(f)})`);
  if (f.pattern === 'none') return '<fill><patternFill patternType="none"/></fill>';
  return `<fill><patternFill patternType="solid"><fgColor rgb="${esc(f.fgColor?.argb ?? 'FFFFFFFF')}"/><bgColor indexed="64"/></patternFill></fill>`;
}

function borderXml(b: Partial<ExcelJS.Borders>): string {
  const side = (tag: string, s: Partial<ExcelJS.Border> | undefined): string => (s?.style ? `<${tag} style="${esc(s.style)}">${colorXml(s.color)}</${tag}>` : `<${tag}/>`);
  return `<border>${side('left', b.left)}${side('right', b.right)}${side('top', b.top)}${side('bottom', b.bottom)}<diagonal/></border>`;
}

function alignmentXml(a: Partial<ExcelJS.Alignment>): string {
  const attrs: string[] = [];
  if (a.horizontal) attrs.push(`horizontal="${esc(a.horizontal)}"`);
  // exceljs says "middle" for the file format's vertical "center".
  if (a.vertical) attrs.push(`vertical="${a.vertical === 'middle' ? 'center' : esc(a.vertical)}"`);
  if (a.textRotation !== undefined) attrs.push(`textRotation="${a.textRotation === 'vertical' ? 255 : a.textRotation}"`);
  if (a.wrapText) attrs.push('wrapText="1"');
  if (a.shrinkToFit) attrs.push('shrinkToFit="1"');
  if (a.indent) attrs.push(`indent="${a.indent}"`);
  return attrs.length ? `<alignment ${attrs.join(' ')}/>` : '';
}

/** What a picture on a sheet is, as exceljs holds it. */
interface PictureModel {
  readonly imageId: string | number;
  readonly range: {
    readonly tl: { readonly nativeCol: number; readonly nativeColOff: number; readonly nativeRow: number; readonly nativeRowOff: number };
    readonly ext?: { readonly width: number; readonly height: number };
    readonly editAs?: string;
  };
}

interface SheetEntry {
  readonly position: number;
  readonly name: string;
  readonly file: number;
  readonly printArea?: string;
  readonly printTitles?: string;
}

/** A sheet name in a formula or defined name: 'Name' with apostrophes doubled. */
const quotedName = (name: string): string => `'${name.replace(/'/g, "''")}'`;

/** "A1:H421" as an absolute reference, "$A$1:$H$421". */
function absolute(range: string): string {
  return range
    .split(':')
    .map((ref) => ref.replace(/^\$?([A-Z]+)\$?(\d+)$/, '$$$1$$$2'))
    .join(':');
}

function dateTime(d: Date): string {
  return `${d.toISOString().slice(0, 19)}Z`;
}

export interface PackageProperties {
  readonly creator: string;
  readonly title: string;
}

export class WorkbookPackage {
  private readonly zip = new ZipBuilder();
  private readonly styles = new StyleTable();
  private readonly strings = new Map<string, number>();
  private stringRefs = 0;
  private readonly sheets: SheetEntry[] = [];
  private drawings = 0;
  private pictures = 0;
  private readonly letters: string[] = [''];

  constructor(private readonly properties: PackageProperties) {}

  /**
   * Writes every worksheet of `wb` (a workbook holding only finished sheets) in its tab order,
   * the first at tab `position` (1 = first). Returns how many were written.
   */
  addWorkbook(wb: ExcelJS.Workbook, position: number): number {
    wb.worksheets.forEach((ws, i) => this.addSheet(wb, ws, position + i));
    return wb.worksheets.length;
  }

  private letter(c: number): string {
    while (this.letters.length <= c) this.letters.push(columnLetters(this.letters.length));
    return this.letters[c];
  }

  private stringIndex(s: string): number {
    this.stringRefs++;
    let i = this.strings.get(s);
    if (i === undefined) {
      i = this.strings.size;
      this.strings.set(s, i);
    }
    return i;
  }

  private addSheet(wb: ExcelJS.Workbook, ws: ExcelJS.Worksheet, position: number): void {
    refuseUnwritten(ws);
    if (this.sheets.some((s) => s.position === position)) throw new Error(`two sheets at tab ${position}`);
    const file = this.sheets.length + 1;
    const pictures = ws.getImages().map((img) => (img as unknown as { model: PictureModel }).model);
    const drawing = pictures.length ? ++this.drawings : 0;
    const parts: string[] = [];
    const setup = ws.pageSetup;
    parts.push(`${XML_HEAD}<worksheet xmlns="${NS_MAIN}" xmlns:r="${NS_REL}">`);
    if (setup.fitToPage) parts.push('<sheetPr><pageSetUpPr fitToPage="1"/></sheetPr>');
    const view = ws.views?.[0] as (Partial<ExcelJS.WorksheetView> & { zoomScale?: number }) | undefined;
    parts.push(`<sheetViews><sheetView workbookViewId="0"${position === 1 ? ' tabSelected="1"' : ''}${view?.zoomScale ? ` zoomScale="${view.zoomScale}"` : ''}/></sheetViews>`);
    parts.push('<sheetFormatPr defaultRowHeight="15"/>');
    const cols: string[] = [];
    (ws.columns ?? []).forEach((column, i) => {
      if (column.width !== undefined) cols.push(`<col min="${i + 1}" max="${i + 1}" width="${column.width}" customWidth="1"${column.hidden ? ' hidden="1"' : ''}/>`);
    });
    if (cols.length) parts.push(`<cols>${cols.join('')}</cols>`);
    parts.push('<sheetData>');
    this.writeRows(ws, parts);
    parts.push('</sheetData>');
    const merges = Object.values((ws as unknown as { _merges: Record<string, { range: string }> })._merges).map((m) => m.range);
    if (merges.length) parts.push(`<mergeCells count="${merges.length}">${merges.map((m) => `<mergeCell ref="${m}"/>`).join('')}</mergeCells>`);
    if (setup.horizontalCentered || setup.verticalCentered) parts.push(`<printOptions${setup.horizontalCentered ? ' horizontalCentered="1"' : ''}${setup.verticalCentered ? ' verticalCentered="1"' : ''}/>`);
    const m = setup.margins;
    if (m) parts.push(`<pageMargins left="${m.left}" right="${m.right}" top="${m.top}" bottom="${m.bottom}" header="${m.header}" footer="${m.footer}"/>`);
    parts.push(pageSetupXml(setup));
    parts.push(headerFooterXml(ws.headerFooter));
    const breaks = (ws as unknown as { rowBreaks?: { id: number; man?: number }[] }).rowBreaks ?? [];
    if (breaks.length) parts.push(`<rowBreaks count="${breaks.length}" manualBreakCount="${breaks.length}">${breaks.map((b) => `<brk id="${b.id}" max="16383" man="1"/>`).join('')}</rowBreaks>`);
    if (drawing) parts.push('<drawing r:id="rId1"/>');
    parts.push('</worksheet>');
    this.zip.add(`xl/worksheets/sheet${file}.xml`, parts.join(''));
    if (drawing) this.addDrawing(wb, file, drawing, pictures);
    this.sheets.push({
      position,
      name: ws.name,
      file,
      printArea: setup.printArea ? `${quotedName(ws.name)}!${absolute(setup.printArea)}` : undefined,
      printTitles: setup.printTitlesRow ? `${quotedName(ws.name)}!${setup.printTitlesRow.split(':').map((r) => `$${r}`).join(':')}` : undefined,
    });
  }

  private writeRows(ws: ExcelJS.Worksheet, parts: string[]): void {
    // Shared formulas: the master cell states the range its dependents cover, known only once
    // they are all seen; its <f> is a placeholder filled in at the end.
    const masters = new Map<string, { formula: string; si: number; lastRow: number; lastCol: number }>();
    const dependents: Array<{ master: string; row: number; col: number }> = [];
    /** One cell with a value; a formula is given with its cached result. */
    const valueCell = (ref: string, r: number, c: number, s: number, v: unknown, result: unknown): string => {
      const sAttr = s ? ` s="${s}"` : '';
      if (typeof v === 'number') return `<c r="${ref}"${sAttr}><v>${num(v)}</v></c>`;
      if (typeof v === 'string') return `<c r="${ref}"${sAttr} t="s"><v>${this.stringIndex(v)}</v></c>`;
      if (typeof v === 'boolean') return `<c r="${ref}"${sAttr} t="b"><v>${v ? 1 : 0}</v></c>`;
      const o = (v ?? {}) as { error?: unknown; formula?: string; sharedFormula?: string };
      if (o.sharedFormula !== undefined) {
        const [t, cachedResult] = formulaResult(result as ExcelJS.CellFormulaValue['result']);
        dependents.push({ master: o.sharedFormula, row: r, col: c });
        return `<c r="${ref}"${sAttr}${t}>\u0000${o.sharedFormula}\u0000${cachedResult}</c>`;
      }
      if (o.formula !== undefined) {
        const [t, cachedResult] = formulaResult(result as ExcelJS.CellFormulaValue['result']);
        masters.set(ref, { formula: o.formula, si: -1, lastRow: r, lastCol: c });
        return `<c r="${ref}"${sAttr}${t}>\u0001${ref}\u0001${cachedResult}</c>`;
      }
      if (o.error !== undefined) return `<c r="${ref}"${sAttr} t="e"><v>${esc(String(o.error))}</v></c>`;
      throw new Error(`sheet "${ws.name}" cell ${ref}: the review writer does not write this kind of value (${JSON.stringify(v)?.slice(0, 60)})`);
    };
    const body = tableBodyOf(ws);
    let lastBodyRow = 0;
    for (const r of body?.rows.keys() ?? []) lastBodyRow = Math.max(lastBodyRow, r);
    const sheetRows = ws as unknown as { findRow(r: number): ExcelJS.Row | undefined };
    const last = Math.max(ws.rowCount, lastBodyRow);
    for (let r = 1; r <= last; r++) {
      const cells: string[] = [];
      let height: number | undefined;
      const bodyRow = body?.rows.get(r);
      if (body && bodyRow) {
        height = bodyRow.height;
        bodyRow.values.forEach((v, i) => {
          if (v === null || v === undefined) return;
          const c = i + 1;
          const s = this.styles.idOf(body.style(bodyRow, c) as Partial<ExcelJS.Style> | undefined);
          const result = typeof v === 'object' && ('formula' in v || 'sharedFormula' in v) ? v.result : undefined;
          cells.push(valueCell(`${this.letter(c)}${r}`, r, c, s, v, result));
        });
      }
      const row = sheetRows.findRow(r);
      if (row) {
        if (bodyRow && row.cellCount) throw new Error(`sheet "${ws.name}" row ${r}: a table-body row holds cells of its own`);
        height = row.height ?? height;
        // Cells as they are (eachCell with includeEmpty would create every missing one).
        const found = row as unknown as { findCell(c: number): ExcelJS.Cell | undefined };
        for (let c = 1; c <= row.cellCount; c++) {
          const cell = found.findCell(c);
          if (!cell) continue;
          const type = cell.type as number;
          const s = this.styles.idOf(cell.style);
          const ref = `${this.letter(c)}${r}`;
          if (cell.note) throw new Error(`sheet "${ws.name}" cell ${ref}: the review writer does not write comments`);
          if (type === TYPE.null || type === TYPE.merge) {
            if (s) cells.push(`<c r="${ref}" s="${s}"/>`);
            continue;
          }
          if (type === TYPE.hyperlink || type === TYPE.richText || type === TYPE.date) throw new Error(`sheet "${ws.name}" cell ${ref}: the review writer does not write hyperlinks, rich text or dates`);
          // A formula's own result: exceljs leaves a cached 0 (or "") out of the value it reports.
          cells.push(valueCell(ref, r, c, s, cell.value, type === TYPE.formula ? cell.result : undefined));
        }
      }
      const ht = height !== undefined ? ` ht="${height}" customHeight="1"` : '';
      if (cells.length || ht) parts.push(cells.length ? `<row r="${r}"${ht}>${cells.join('')}</row>` : `<row r="${r}"${ht}/>`);
    }
    let si = 0;
    for (const d of dependents) {
      const m = masters.get(d.master);
      if (!m) throw new Error(`sheet "${ws.name}": a shared formula refers to ${d.master}, which holds no formula`);
      if (m.si < 0) m.si = si++;
      m.lastRow = Math.max(m.lastRow, d.row);
      m.lastCol = Math.max(m.lastCol, d.col);
    }
    // Fill the placeholders: \u0001REF\u0001 (a formula, shared when it has dependents), \u0000REF\u0000 (a
    // dependent). Neither character can come from a cell: text escapes them and formulas refuse them.
    for (let i = 0; i < parts.length; i++) {
      const p = parts[i];
      if (p.indexOf('\u0000') < 0 && p.indexOf('\u0001') < 0) continue;
      parts[i] = p
        // eslint-disable-next-line no-control-regex -- the placeholder's marker
        .replace(/\u0001([A-Z]+\d+)\u0001/g, (_all, ref: string) => {
          const m = masters.get(ref)!;
          if (m.si < 0) return `<f>${esc(m.formula)}</f>`;
          return `<f t="shared" ref="${ref}:${this.letter(m.lastCol)}${m.lastRow}" si="${m.si}">${esc(m.formula)}</f>`;
        })
        // eslint-disable-next-line no-control-regex -- the placeholder's marker
        .replace(/\u0000([A-Z]+\d+)\u0000/g, (_all, ref: string) => `<f t="shared" si="${masters.get(ref)!.si}"/>`);
    }
  }

  private addDrawing(wb: ExcelJS.Workbook, sheetFile: number, drawing: number, pictures: readonly PictureModel[]): void {
    const anchors: string[] = [];
    const rels: string[] = [];
    pictures.forEach((p, i) => {
      const media = wb.getImage(Number(p.imageId)) as unknown as { buffer?: Buffer; extension: string };
      if (media.extension !== 'png' || !media.buffer) throw new Error('the review writer places PNG pictures given as bytes only');
      const name = `image${++this.pictures}.png`;
      this.zip.add(`xl/media/${name}`, Buffer.from(media.buffer), false);
      const rId = `rId${i + 1}`;
      rels.push(`<Relationship Id="${rId}" Type="${REL.image}" Target="../media/${name}"/>`);
      const tl = p.range.tl;
      const ext = p.range.ext;
      if (!ext) throw new Error('the review writer places pictures by their top-left cell and size only');
      const from = `<xdr:from><xdr:col>${tl.nativeCol}</xdr:col><xdr:colOff>${tl.nativeColOff}</xdr:colOff><xdr:row>${tl.nativeRow}</xdr:row><xdr:rowOff>${tl.nativeRowOff}</xdr:rowOff></xdr:from>`;
      const cx = Math.round(ext.width * EMU_PER_PIXEL);
      const cy = Math.round(ext.height * EMU_PER_PIXEL);
      anchors.push(
        `<xdr:oneCellAnchor${p.range.editAs ? ` editAs="${esc(p.range.editAs)}"` : ''}>${from}<xdr:ext cx="${cx}" cy="${cy}"/>` +
          `<xdr:pic><xdr:nvPicPr><xdr:cNvPr id="${i + 1}" name="Picture ${i + 1}"/><xdr:cNvPicPr><a:picLocks noChangeAspect="1"/></xdr:cNvPicPr></xdr:nvPicPr>` +
          `<xdr:blipFill><a:blip xmlns:r="${NS_REL}" r:embed="${rId}"/><a:stretch><a:fillRect/></a:stretch></xdr:blipFill>` +
          `<xdr:spPr><a:xfrm><a:off x="0" y="0"/><a:ext cx="${cx}" cy="${cy}"/></a:xfrm><a:prstGeom prst="rect"><a:avLst/></a:prstGeom></xdr:spPr></xdr:pic><xdr:clientData/></xdr:oneCellAnchor>`,
      );
    });
    this.zip.add(
      `xl/drawings/drawing${drawing}.xml`,
      `${XML_HEAD}<xdr:wsDr xmlns:xdr="http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing" xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main">${anchors.join('')}</xdr:wsDr>`,
    );
    this.zip.add(`xl/drawings/_rels/drawing${drawing}.xml.rels`, `${XML_HEAD}<Relationships xmlns="${NS_PKG_REL}">${rels.join('')}</Relationships>`);
    this.zip.add(`xl/worksheets/_rels/sheet${sheetFile}.xml.rels`, `${XML_HEAD}<Relationships xmlns="${NS_PKG_REL}"><Relationship Id="rId1" Type="${REL.drawing}" Target="../drawings/drawing${drawing}.xml"/></Relationships>`);
  }

  /** The whole package: the parts written so far, then strings, styles, the workbook and the package's own parts. */
  async finish(): Promise<Buffer> {
    const sheets = [...this.sheets].sort((a, b) => a.position - b.position);
    sheets.forEach((s, i) => {
      if (s.position !== i + 1) throw new Error(`no sheet at tab ${i + 1}`);
    });
    const strings = [...this.strings.keys()].map((s) => `<si>${textElement(s)}</si>`).join('');
    this.zip.add('xl/sharedStrings.xml', `${XML_HEAD}<sst xmlns="${NS_MAIN}" count="${this.stringRefs}" uniqueCount="${this.strings.size}">${strings}</sst>`);
    this.zip.add('xl/styles.xml', this.styles.xml());
    const names: string[] = [];
    sheets.forEach((s, i) => {
      if (s.printArea) names.push(`<definedName name="_xlnm.Print_Area" localSheetId="${i}">${esc(s.printArea)}</definedName>`);
      if (s.printTitles) names.push(`<definedName name="_xlnm.Print_Titles" localSheetId="${i}">${esc(s.printTitles)}</definedName>`);
    });
    this.zip.add(
      'xl/workbook.xml',
      `${XML_HEAD}<workbook xmlns="${NS_MAIN}" xmlns:r="${NS_REL}"><bookViews><workbookView activeTab="0"/></bookViews><sheets>${sheets
        .map((s, i) => `<sheet name="${esc(s.name)}" sheetId="${i + 1}" r:id="rId${s.file}"/>`)
        .join('')}</sheets>${names.length ? `<definedNames>${names.join('')}</definedNames>` : ''}<calcPr calcId="${CALC_ID}"/></workbook>`,
    );
    const n = this.sheets.length;
    const rels = this.sheets.map((s) => `<Relationship Id="rId${s.file}" Type="${REL.worksheet}" Target="worksheets/sheet${s.file}.xml"/>`);
    rels.push(`<Relationship Id="rId${n + 1}" Type="${REL.styles}" Target="styles.xml"/>`, `<Relationship Id="rId${n + 2}" Type="${REL.strings}" Target="sharedStrings.xml"/>`);
    this.zip.add('xl/_rels/workbook.xml.rels', `${XML_HEAD}<Relationships xmlns="${NS_PKG_REL}">${rels.join('')}</Relationships>`);
    this.zip.add(
      '_rels/.rels',
      `${XML_HEAD}<Relationships xmlns="${NS_PKG_REL}"><Relationship Id="rId1" Type="${REL.document}" Target="xl/workbook.xml"/><Relationship Id="rId2" Type="${REL.core}" Target="docProps/core.xml"/><Relationship Id="rId3" Type="${REL.app}" Target="docProps/app.xml"/></Relationships>`,
    );
    const now = dateTime(new Date());
    this.zip.add(
      'docProps/core.xml',
      `${XML_HEAD}<cp:coreProperties xmlns:cp="http://schemas.openxmlformats.org/package/2006/metadata/core-properties" xmlns:dc="http://purl.org/dc/elements/1.1/" xmlns:dcterms="http://purl.org/dc/terms/" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">` +
        `<dc:creator>${esc(this.properties.creator)}</dc:creator><dc:title>${esc(this.properties.title)}</dc:title><dcterms:created xsi:type="dcterms:W3CDTF">${now}</dcterms:created><dcterms:modified xsi:type="dcterms:W3CDTF">${now}</dcterms:modified></cp:coreProperties>`,
    );
    this.zip.add('docProps/app.xml', `${XML_HEAD}<Properties xmlns="http://schemas.openxmlformats.org/officeDocument/2006/extended-properties"><Application>${APPLICATION}</Application></Properties>`);
    const overrides = [
      `<Override PartName="/xl/workbook.xml" ContentType="${CT}.spreadsheetml.sheet.main+xml"/>`,
      ...this.sheets.map((s) => `<Override PartName="/xl/worksheets/sheet${s.file}.xml" ContentType="${CT}.spreadsheetml.worksheet+xml"/>`),
      ...Array.from({ length: this.drawings }, (_, i) => `<Override PartName="/xl/drawings/drawing${i + 1}.xml" ContentType="${CT}.drawing+xml"/>`),
      `<Override PartName="/xl/styles.xml" ContentType="${CT}.spreadsheetml.styles+xml"/>`,
      `<Override PartName="/xl/sharedStrings.xml" ContentType="${CT}.spreadsheetml.sharedStrings+xml"/>`,
      '<Override PartName="/docProps/core.xml" ContentType="application/vnd.openxmlformats-package.core-properties+xml"/>',
      `<Override PartName="/docProps/app.xml" ContentType="${CT}.extended-properties+xml"/>`,
    ];
    this.zip.add(
      '[Content_Types].xml',
      `${XML_HEAD}<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="png" ContentType="image/png"/><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/>${overrides.join('')}</Types>`,
    );
    return this.zip.finish();
  }
}

/** A formula's cached result: its type attribute and <v> element. */
function formulaResult(r: ExcelJS.CellFormulaValue['result']): [string, string] {
  if (r === undefined || r === null) return ['', ''];
  if (typeof r === 'number') return ['', `<v>${num(r)}</v>`];
  if (typeof r === 'string') return [' t="str"', `<v>${cellText(r)}</v>`];
  if (typeof r === 'boolean') return [' t="b"', `<v>${r ? 1 : 0}</v>`];
  if (typeof r === 'object' && 'error' in r) return [' t="e"', `<v>${esc(String(r.error))}</v>`];
  throw new Error(`a formula's cached result the review writer does not write: ${JSON.stringify(r)}`);
}

function pageSetupXml(p: Partial<ExcelJS.PageSetup>): string {
  const attrs: string[] = [];
  if (p.paperSize !== undefined) attrs.push(`paperSize="${p.paperSize}"`);
  if (p.scale !== undefined && !p.fitToPage) attrs.push(`scale="${p.scale}"`);
  if (p.fitToPage) attrs.push(`fitToWidth="${p.fitToWidth ?? 1}"`, `fitToHeight="${p.fitToHeight ?? 1}"`);
  if (p.orientation) attrs.push(`orientation="${esc(p.orientation)}"`);
  return `<pageSetup ${attrs.join(' ')}/>`;
}

function headerFooterXml(h: Partial<ExcelJS.HeaderFooter> | undefined): string {
  if (!h) return '';
  const parts: string[] = [];
  for (const tag of ['oddHeader', 'oddFooter', 'evenHeader', 'evenFooter', 'firstHeader', 'firstFooter'] as const) {
    const text = h[tag];
    if (text) parts.push(`<${tag}>${esc(text)}</${tag}>`);
  }
  if (!parts.length) return '';
  return `<headerFooter${h.differentOddEven ? ' differentOddEven="1"' : ''}${h.differentFirst ? ' differentFirst="1"' : ''}>${parts.join('')}</headerFooter>`;
}

/** Refuses a sheet holding what this writer does not write (rather than dropping it). */
function refuseUnwritten(ws: ExcelJS.Worksheet): void {
  const x = ws as unknown as { conditionalFormattings?: unknown[]; dataValidations?: { model?: object }; hasComments?: boolean; autoFilter?: unknown; tables?: object };
  const what: string[] = [];
  if (x.conditionalFormattings?.length) what.push('conditional formats');
  if (x.dataValidations?.model && Object.keys(x.dataValidations.model).length) what.push('data validation');
  if (x.autoFilter) what.push('a filter');
  if (x.tables && Object.keys(x.tables).length) what.push('a table');
  if (what.length) throw new Error(`sheet "${ws.name}" holds what the review writer does not write: ${what.slice(0, 3).join('; ')}`);
}
