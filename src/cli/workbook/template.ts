/**
 * A lab's workbook as a fill template: the snapshot the planner reads from one of its sheets, and
 * the package with the plan's cells written into that sheet's part. Parts the fill changes: the
 * sheet, the styles when a derived cell needs a number format, and — only when the provenance
 * goes to a sheet of its own — the new sheet with the workbook part, its relationships and
 * [Content_Types].xml. When a fill overwrites a cell that held a formula, the workbook's
 * calculation chain (a cache of formula cells a spreadsheet rebuilds when it is missing) is
 * dropped, since it would name a cell that no longer holds one. Every other part keeps its bytes.
 */
import type { SaxesParser as SaxesParserType } from 'saxes';
import type { CellRange, FillPlan, SheetSnapshot } from '../../engine/fill';
import { MAX_COLUMNS, MAX_ROWS } from '../../engine/fill';
import { NS, WORKSHEET_TYPE, WorkbookError, WorkbookPackage, parseRels, wrapXml } from './package';
import type { SheetEntry } from './package';
import { cellXml, editSheet, parseRef, readSharedStrings, readSheet, refText } from './sheet';
import type { SheetRead } from './sheet';
import { StyleBook } from './styles';
import { applySplices, attr, elementEnd, escapeAttr, localName, prefixFor, rootOf, tags } from './xml';
import type { Splice } from './xml';
import { a1 } from '../../engine/fill';

/** Parses a part fully with a namespace-aware XML parser; a part that is not well-formed is refused. */
export function checkWellFormed(xml: string, part: string): void {
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const { SaxesParser } = require('saxes') as { SaxesParser: typeof SaxesParserType };
  const parser = new SaxesParser({ xmlns: true, position: true });
  try {
    parser.write(xml.replace(/^\uFEFF/, '')).close();
  } catch (e) {
    throw new Error(`the part ${part} Leeway wrote is not well-formed XML (${(e as Error).message}): nothing was written`, { cause: e });
  }
}

/** A print area as a defined name gives it ("'My sheet'!$A$1:$F$30,Sheet1!$A:$C"): its ranges. */
export function parsePrintArea(text: string): CellRange[] {
  const out: CellRange[] = [];
  for (const part of text.split(',')) {
    const ref = part.slice(part.lastIndexOf('!') + 1).replace(/\$/g, '').trim();
    const cols = /^([A-Za-z]{1,3}):([A-Za-z]{1,3})$/.exec(ref);
    const rows = /^(\d+):(\d+)$/.exec(ref);
    if (cols) {
      const r = parseRef(`${cols[1]}1:${cols[2]}1`);
      if (r) out.push({ top: 1, left: r.left, bottom: MAX_ROWS, right: r.right });
    } else if (rows) out.push({ top: Number(rows[1]), left: 1, bottom: Number(rows[2]), right: MAX_COLUMNS });
    else {
      const r = parseRef(ref);
      if (r) out.push(r);
    }
  }
  return out;
}

export class TemplateWorkbook {
  private readonly read = new Map<string, { xml: string; sheet: SheetRead }>();
  private readonly notes: string[] = [];
  private constructor(readonly pkg: WorkbookPackage) {}

  static async open(bytes: Uint8Array): Promise<TemplateWorkbook> {
    return new TemplateWorkbook(await WorkbookPackage.open(bytes));
  }

  get sheets(): readonly SheetEntry[] {
    return this.pkg.sheets;
  }

  /** The sheet to fill: the one named (case-insensitive, as spreadsheets compare names), or the first worksheet the workbook shows. */
  pick(name: string | undefined, label: string): SheetEntry {
    const all = this.pkg.sheets;
    const list = all.map((s) => `"${s.name}"`).join(', ');
    if (name === undefined) {
      const usable = all.filter((s) => s.kind === 'worksheet' && s.path && this.pkg.has(s.path));
      const first = usable.find((s) => !s.hidden) ?? usable[0];
      if (!first) throw new WorkbookError(`the template ${label} has no worksheet${all.length ? ` (it has ${list})` : ''}`);
      return first;
    }
    const found = all.find((s) => s.name === name) ?? all.find((s) => s.name.toLowerCase() === name.toLowerCase());
    if (!found) throw new WorkbookError(`the template ${label} has no sheet "${name}" (it has ${list})`);
    if (found.kind !== 'worksheet') throw new WorkbookError(`the sheet "${found.name}" of ${label} is a ${found.kind === 'chartsheet' ? 'chart sheet' : found.kind}, not a worksheet: choose a worksheet with --sheet`);
    if (!found.path || !this.pkg.has(found.path)) throw new WorkbookError(`the workbook is damaged: the part of sheet "${found.name}" is missing`);
    return found;
  }

  private async load(entry: SheetEntry): Promise<{ xml: string; sheet: SheetRead }> {
    const known = this.read.get(entry.path);
    if (known) return known;
    const where = { part: entry.path };
    return wrapXml(where, async () => {
      let strings: string[] = [];
      if (this.pkg.sharedStringsPath) {
        where.part = this.pkg.sharedStringsPath;
        strings = readSharedStrings((await this.pkg.text(this.pkg.sharedStringsPath)) ?? '');
      }
      where.part = entry.path;
      const xml = (await this.pkg.text(entry.path)) ?? '';
      const root = rootOf(xml);
      if (localName(root.name) !== 'worksheet' || prefixFor(root, NS.main) === undefined) throw new WorkbookError(`the part of sheet "${entry.name}" is not a worksheet`);
      const out = { xml, sheet: readSheet(xml, strings) };
      this.read.set(entry.path, out);
      return out;
    });
  }

  /** What the planner needs of a sheet. */
  async snapshot(entry: SheetEntry): Promise<SheetSnapshot> {
    const { sheet } = await this.load(entry);
    const printArea = this.pkg.definedNames.filter((d) => d.name.toLowerCase() === '_xlnm.print_area' && d.localSheetId === entry.index).flatMap((d) => parsePrintArea(d.text));
    return {
      name: entry.name,
      origin: { row: 1, col: 1 },
      cells: [],
      sparse: sheet.cells,
      merges: sheet.merges,
      locked: sheet.locked,
      columnWidths: sheet.widths,
      defaultColumnWidth: sheet.defaultWidth,
      ...(printArea.length ? { printArea } : {}),
      sheetNames: this.pkg.sheets.map((s) => s.name),
    };
  }

  /** Writes a plan into the package; the bytes of the filled workbook and the parts that changed. */
  async fill(entry: SheetEntry, plan: FillPlan): Promise<{ bytes: Buffer; changed: string[]; notes: string[] }> {
    if (!plan.writable) throw new Error('the plan is not writable');
    const { xml, sheet } = await this.load(entry);
    const where = { part: this.pkg.stylesPath ?? entry.path };
    const changed = await wrapXml(where, async () => {
      const stylesXml = this.pkg.stylesPath ? await this.pkg.text(this.pkg.stylesPath) : undefined;
      const styles = new StyleBook(stylesXml);
      if (styles.missing && plan.cells.some((c) => c.format)) this.notes.push('the workbook has no styles part: derived values were written without a number format');
      where.part = entry.path;
      const edits = plan.cells.map((c) => ({ row: c.row, col: c.col, content: c.content, ...(c.format ? { format: c.format } : {}) }));
      const edited = editSheet(xml, edits, styles, sheet.columnStyles, sheet.formulaCells);
      this.pkg.put(entry.path, edited.xml);
      where.part = this.pkg.workbookRelsPath;
      if (edited.replacedFormulas.length) await this.dropCalcChain();
      where.part = this.pkg.workbookPath;
      if (plan.blockSheet) await this.addBlockSheet(plan, styles);
      if (styles.changed && this.pkg.stylesPath) this.pkg.put(this.pkg.stylesPath, styles.toXml());
      return this.pkg.changedParts();
    });
    for (const part of changed) checkWellFormed((await this.pkg.text(part)) ?? '', part);
    return { bytes: await this.pkg.bytes(), changed, notes: this.notes };
  }

  private async dropCalcChain(): Promise<void> {
    const relsPath = this.pkg.workbookRelsPath;
    const relsXml = (await this.pkg.text(relsPath)) ?? '';
    const chain = parseRels(relsXml, this.pkg.workbookPath).find((r) => r.type.endsWith('/calcChain'));
    if (!chain) return;
    const splices: Splice[] = [];
    for (const t of tags(relsXml)) {
      if (t.kind !== 'close' && localName(t.name) === 'Relationship' && attr(t, 'Id') === chain.id) {
        splices.push({ start: t.start, end: elementEnd(relsXml, t), text: '' });
      }
    }
    this.pkg.put(relsPath, applySplices(relsXml, splices));
    const ct = (await this.pkg.text('[Content_Types].xml')) ?? '';
    const ctSplices: Splice[] = [];
    for (const t of tags(ct)) {
      if (t.kind !== 'close' && localName(t.name) === 'Override' && (attr(t, 'PartName') ?? '').replace(/^\//, '') === chain.path) ctSplices.push({ start: t.start, end: elementEnd(ct, t), text: '' });
    }
    if (ctSplices.length) this.pkg.put('[Content_Types].xml', applySplices(ct, ctSplices));
    if (this.pkg.has(chain.path)) this.pkg.remove(chain.path);
  }

  private async addBlockSheet(plan: FillPlan, styles: StyleBook): Promise<void> {
    const block = plan.blockSheet!;
    const pkg = this.pkg;
    const mainNs = pkg.strict ? NS.main[1] : NS.main[0];
    const relNs = pkg.strict ? NS.rel[1] : NS.rel[0];
    // The part: beside the workbook's other worksheets, the first free sheetN.xml.
    const first = pkg.sheets.find((s) => s.kind === 'worksheet' && s.path);
    const folder = first ? first.path.slice(0, first.path.lastIndexOf('/') + 1) : `${pkg.workbookPath.slice(0, pkg.workbookPath.lastIndexOf('/') + 1)}worksheets/`;
    const taken = new Set(pkg.paths().map((p) => p.toLowerCase()));
    let k = 1;
    while (taken.has(`${folder}sheet${k}.xml`.toLowerCase())) k++;
    const path = `${folder}sheet${k}.xml`;

    const rows = new Map<number, string[]>();
    let bottom = 1;
    let right = 1;
    for (const c of block.cells) {
      const style = styles.styleFor(undefined, c.format);
      const list = rows.get(c.row) ?? [];
      list.push(cellXml('', a1(c), style, c.content));
      rows.set(c.row, list);
      bottom = Math.max(bottom, c.row);
      right = Math.max(right, c.col);
    }
    const sheetData = [...rows.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([r, cells]) => `<row r="${r}">${cells.join('')}</row>`)
      .join('');
    const cols = Object.entries(block.columnWidths)
      .map(([col, w]) => `<col min="${col}" max="${col}" width="${w}" customWidth="1"/>`)
      .join('');
    const sheetXml =
      '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n' +
      `<worksheet xmlns="${mainNs}" xmlns:r="${relNs}"><dimension ref="${refText({ top: 1, left: 1, bottom, right })}"/><sheetFormatPr defaultRowHeight="15"/>` +
      `${cols ? `<cols>${cols}</cols>` : ''}<sheetData>${sheetData}</sheetData></worksheet>`;
    pkg.put(path, sheetXml);

    // The relationship from the workbook.
    const relsPath = pkg.workbookRelsPath;
    const relsXml = (await pkg.text(relsPath)) ?? '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"></Relationships>';
    const ids = new Set<string>();
    for (const t of tags(relsXml)) if (t.kind !== 'close' && localName(t.name) === 'Relationship') ids.add(attr(t, 'Id') ?? '');
    let n = ids.size + 1;
    while (ids.has(`rId${n}`)) n++;
    const rid = `rId${n}`;
    const wbFolder = pkg.workbookPath.slice(0, pkg.workbookPath.lastIndexOf('/') + 1);
    const target = path.startsWith(wbFolder) ? path.slice(wbFolder.length) : `/${path}`;
    const relsRoot = rootOf(relsXml);
    const rp = relsRoot.name.includes(':') ? relsRoot.name.slice(0, relsRoot.name.indexOf(':') + 1) : '';
    pkg.put(relsPath, insertBeforeClose(relsXml, relsRoot, `<${rp}Relationship Id="${rid}" Type="${relNs}/worksheet" Target="${escapeAttr(target)}"/>`));

    // The sheet in the workbook, after the others.
    const wbXml = (await pkg.text(pkg.workbookPath)) ?? '';
    const wbRoot = rootOf(wbXml);
    const wp = wbRoot.name.includes(':') ? wbRoot.name.slice(0, wbRoot.name.indexOf(':') + 1) : '';
    const relPrefix = prefixFor(wbRoot, NS.rel);
    const ridAttr = relPrefix ? `${relPrefix}:id="${rid}"` : `xmlns:lwr="${relNs}" lwr:id="${rid}"`;
    const sheetId = Math.max(0, ...pkg.sheets.map((s) => s.sheetId)) + 1;
    const entry = `<${wp}sheet name="${escapeAttr(block.name)}" sheetId="${sheetId}" ${ridAttr}/>`;
    let sheetsTag: ReturnType<typeof rootOf> | undefined;
    for (const t of tags(wbXml)) {
      if (localName(t.name) === 'sheets' && t.kind !== 'close') {
        sheetsTag = t;
        break;
      }
    }
    if (!sheetsTag) throw new WorkbookError('the workbook part lists no sheets');
    if (sheetsTag.kind === 'empty') {
      const open = wbXml.slice(sheetsTag.start, sheetsTag.end).replace(/\s*\/>$/, '>');
      pkg.put(pkg.workbookPath, applySplices(wbXml, [{ start: sheetsTag.start, end: sheetsTag.end, text: `${open}${entry}</${sheetsTag.name}>` }]));
    } else {
      const end = elementEnd(wbXml, sheetsTag);
      const close = wbXml.lastIndexOf('<', end - 1);
      pkg.put(pkg.workbookPath, applySplices(wbXml, [{ start: close, end: close, text: entry }]));
    }

    // Its content type.
    const ct = (await pkg.text('[Content_Types].xml')) ?? '';
    const ctRoot = rootOf(ct);
    const cp = ctRoot.name.includes(':') ? ctRoot.name.slice(0, ctRoot.name.indexOf(':') + 1) : '';
    pkg.put('[Content_Types].xml', insertBeforeClose(ct, ctRoot, `<${cp}Override PartName="/${escapeAttr(path)}" ContentType="${WORKSHEET_TYPE}"/>`));
  }
}

/** Inserts text just before the closing tag of a part's root element. */
function insertBeforeClose(xml: string, root: ReturnType<typeof rootOf>, text: string): string {
  if (root.kind === 'empty') {
    const open = xml.slice(root.start, root.end).replace(/\s*\/>$/, '>');
    return applySplices(xml, [{ start: root.start, end: root.end, text: `${open}${text}</${root.name}>` }]);
  }
  const end = elementEnd(xml, root);
  const close = xml.lastIndexOf('<', end - 1);
  return applySplices(xml, [{ start: close, end: close, text }]);
}
