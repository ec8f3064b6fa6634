/**
 * Reading and editing one worksheet part (ECMA-376 Part 1, 18.3: worksheet, sheetData, row, c,
 * mergeCells, cols). Reading keeps only the cells that hold something (a stray value at ZZ200000
 * is one entry) and the sheet's merged ranges, column widths and formulas that span cells.
 * Editing splices the cells a fill writes into their rows, in row and column order, and changes
 * nothing else of the part but the dimension and a touched row's spans.
 */
import type { CellContent, CellRange, LockedRange, SheetCell } from '../../engine/fill';
import { columnLetters, columnNumber, a1 } from '../../engine/fill';
import { storedFormula, typedFormula } from '../xlsx';
import { applySplices, attr, elementEnd, escapeText, localName, setAttr, tags, textBetween, XmlError } from './xml';
import type { Splice, Tag } from './xml';
import type { StyleBook } from './styles';

/** Characters of padding Excel adds to a column's stored width (5 px at a 7 px digit, ECMA-376 Part 1, 18.3.1.13). */
const WIDTH_PADDING = 0.71;

/** "_x000D_"-style escapes of ST_Xstring (ECMA-376 Part 1, 22.9.2.19), decoded. */
export function decodeXstring(s: string): string {
  return s.includes('_x') ? s.replace(/_x([0-9A-Fa-f]{4})_/g, (_m, h: string) => String.fromCharCode(parseInt(h, 16))) : s;
}

/** Characters XML 1.0 cannot carry, and literal "_xHHHH_" texts, escaped as ST_Xstring. */
export function encodeXstring(s: string): string {
  return s
    .replace(/_x([0-9A-Fa-f]{4})_/g, '_x005F_x$1_')
    // eslint-disable-next-line no-control-regex -- XML 1.0 forbids these characters; they are written escaped as _xHHHH_
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g, (c) => `_x${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}_`);
}

/** Reads "B3" or "B3:C4" as a range. */
export function parseRef(ref: string): CellRange | undefined {
  const m = /^\$?([A-Za-z]{1,3})\$?(\d+)(?::\$?([A-Za-z]{1,3})\$?(\d+))?$/.exec(ref.trim());
  if (!m) return undefined;
  const left = columnNumber(m[1]);
  const right = m[3] ? columnNumber(m[3]) : left;
  const top = Number(m[2]);
  const bottom = m[4] ? Number(m[4]) : top;
  if (left === undefined || right === undefined) return undefined;
  return { top: Math.min(top, bottom), left: Math.min(left, right), bottom: Math.max(top, bottom), right: Math.max(left, right) };
}

export function refText(r: CellRange): string {
  return r.top === r.bottom && r.left === r.right ? a1({ row: r.top, col: r.left }) : `${a1({ row: r.top, col: r.left })}:${a1({ row: r.bottom, col: r.right })}`;
}

/** The shared strings of a workbook (ECMA-376 Part 1, 18.4): rich-text runs joined, phonetic runs left out. */
export function readSharedStrings(xml: string): string[] {
  const out: string[] = [];
  let cur: string | undefined;
  let phonetic = 0;
  let tOpen = -1;
  for (const t of tags(xml)) {
    const n = localName(t.name);
    if (n === 'si') {
      if (t.kind === 'open') cur = '';
      else if (t.kind === 'empty') out.push('');
      else if (cur !== undefined) {
        out.push(decodeXstring(cur));
        cur = undefined;
      }
    } else if (n === 'rPh') {
      if (t.kind === 'open') phonetic++;
      else if (t.kind === 'close') phonetic--;
    } else if (n === 't') {
      if (t.kind === 'open') tOpen = t.end;
      else if (t.kind === 'close' && cur !== undefined && phonetic === 0) cur += textBetween(xml, tOpen, t.start);
    }
  }
  return out;
}

/**
 * Moves the relative references of a formula by rows and columns (how a shared formula reads in
 * the cells it is shared with). Absolute parts ($A, $1) and text in quotes stay.
 */
export function shiftFormula(formula: string, dRow: number, dCol: number): string {
  if (dRow === 0 && dCol === 0) return formula;
  return formula
    .split(/("(?:[^"]|"")*")/)
    .map((part, i) =>
      i % 2 === 1
        ? part
        : part.replace(/(?<![A-Za-z0-9_.$])(\$?)([A-Za-z]{1,3})(\$?)([0-9]+)(?![0-9A-Za-z_(])/g, (m, dc: string, col: string, dr: string, row: string) => {
            const c = columnNumber(col);
            if (c === undefined) return m;
            const nc = dc ? c : c + dCol;
            const nr = dr ? Number(row) : Number(row) + dRow;
            if (nc < 1 || nr < 1) return m;
            return `${dc}${columnLetters(nc)}${dr}${nr}`;
          }),
    )
    .join('');
}

export interface SheetRead {
  /** Cells that hold something: values, formulas as "=…" (add-in calls in their typed form). */
  readonly cells: SheetCell[];
  readonly merges: CellRange[];
  readonly locked: LockedRange[];
  /** Widths in characters by column (0 for hidden columns). */
  readonly widths: Record<number, number>;
  readonly defaultWidth: number;
  /** Style index by column, for cells a fill creates. */
  readonly columnStyles: Map<number, number>;
  /** The cells that hold formulas (when overwritten, the workbook's calculation chain must go). */
  readonly formulaCells: Set<string>;
}

interface OpenCell {
  row: number;
  col: number;
  t: string;
  f?: { text: string; t?: string; ref?: string; si?: string };
  v?: string;
  is?: string;
}

/** Reads a worksheet part. `strings` are the workbook's shared strings. */
export function readSheet(xml: string, strings: readonly string[]): SheetRead {
  const cells: SheetCell[] = [];
  const merges: CellRange[] = [];
  const locked: LockedRange[] = [];
  const widths: Record<number, number> = {};
  const columnStyles = new Map<number, number>();
  const formulaCells = new Set<string>();
  const shared = new Map<string, { formula: string; row: number; col: number }>();
  let defaultWidth: number | undefined;
  let baseWidth = 8;
  let row = 0;
  let col = 0;
  let cell: OpenCell | undefined;
  let textStart = -1;
  let inIs = false;
  let phonetic = 0;
  let fOpen: Tag | undefined;

  const finish = (c: OpenCell): void => {
    let value: string | number | boolean | undefined;
    if (c.f) {
      formulaCells.add(a1({ row: c.row, col: c.col }));
      let text = c.f.text;
      if (c.f.t === 'shared' && c.f.si !== undefined) {
        if (text.trim() !== '') shared.set(c.f.si, { formula: text, row: c.row, col: c.col });
        else {
          const master = shared.get(c.f.si);
          text = master ? shiftFormula(master.formula, c.row - master.row, c.col - master.col) : '';
        }
      }
      const ref = c.f.ref ? parseRef(c.f.ref) : undefined;
      if (ref && (c.f.t === 'array' || c.f.t === 'dataTable')) {
        locked.push({ range: ref, reason: `part of the ${c.f.t === 'array' ? 'array formula' : 'data table'} ${refText(ref)}` });
      } else if (ref && c.f.t === 'shared' && (ref.bottom > ref.top || ref.right > ref.left)) {
        locked.push({ range: { top: c.row, left: c.col, bottom: c.row, right: c.col }, reason: `the first cell of the shared formula ${refText(ref)}, which the cells after it read` });
      }
      if (text !== '') value = typedFormula(text);
    }
    if (value === undefined) {
      switch (c.t) {
        case 's':
          if (c.v !== undefined) value = strings[Number(c.v)] ?? '';
          break;
        case 'inlineStr':
          value = c.is;
          break;
        case 'str':
        case 'e':
        case 'd':
          value = c.v;
          break;
        case 'b':
          if (c.v !== undefined) value = c.v.trim() === '1' || c.v.trim().toLowerCase() === 'true';
          break;
        default:
          if (c.v !== undefined && c.v.trim() !== '') {
            const x = Number(c.v);
            value = Number.isFinite(x) ? x : c.v;
          }
      }
    }
    if (value !== undefined && value !== '') cells.push({ row: c.row, col: c.col, value });
  };

  for (const t of tags(xml)) {
    const n = localName(t.name);
    if (cell) {
      if (n === 'c' && t.kind === 'close') {
        finish(cell);
        cell = undefined;
      } else if (n === 'f') {
        if (t.kind === 'open') fOpen = t;
        else if (t.kind === 'empty') cell.f = { text: '', t: attr(t, 't'), ref: attr(t, 'ref'), si: attr(t, 'si') };
        else if (fOpen) {
          cell.f = { text: textBetween(xml, fOpen.end, t.start), t: attr(fOpen, 't'), ref: attr(fOpen, 'ref'), si: attr(fOpen, 'si') };
          fOpen = undefined;
        }
      } else if (n === 'v') {
        if (t.kind === 'open') textStart = t.end;
        else if (t.kind === 'close') cell.v = textBetween(xml, textStart, t.start);
      } else if (n === 'is') {
        inIs = t.kind === 'open';
        if (t.kind === 'open') cell.is = '';
      } else if (n === 'rPh') {
        if (t.kind === 'open') phonetic++;
        else if (t.kind === 'close') phonetic--;
      } else if (n === 't' && inIs) {
        if (t.kind === 'open') textStart = t.end;
        else if (t.kind === 'close' && phonetic === 0) cell.is = (cell.is ?? '') + decodeXstring(textBetween(xml, textStart, t.start));
      }
      continue;
    }
    switch (n) {
      case 'row':
        if (t.kind === 'close') break;
        row = attr(t, 'r') !== undefined ? Number(attr(t, 'r')) : row + 1;
        col = 0;
        break;
      case 'c': {
        if (t.kind === 'close') break;
        const ref = attr(t, 'r');
        const at = ref ? parseRef(ref) : undefined;
        if (at) {
          row = at.top;
          col = at.left;
        } else col++;
        const c: OpenCell = { row, col, t: attr(t, 't') ?? 'n' };
        if (t.kind === 'empty') finish(c);
        else cell = c;
        break;
      }
      case 'mergeCell': {
        const r = parseRef(attr(t, 'ref') ?? '');
        if (r && (r.bottom > r.top || r.right > r.left)) merges.push(r);
        break;
      }
      case 'sheetFormatPr': {
        const d = attr(t, 'defaultColWidth');
        const b = attr(t, 'baseColWidth');
        if (d !== undefined && Number.isFinite(Number(d))) defaultWidth = Math.max(0, Number(d) - WIDTH_PADDING);
        if (b !== undefined && Number.isFinite(Number(b))) baseWidth = Number(b);
        break;
      }
      case 'col': {
        if (t.kind === 'close') break;
        const min = Number(attr(t, 'min'));
        const max = Math.min(Number(attr(t, 'max')), 16384);
        if (!(min >= 1 && max >= min)) break;
        const hidden = attr(t, 'hidden') === '1' || attr(t, 'hidden') === 'true';
        const w = attr(t, 'width');
        const style = attr(t, 'style');
        // A column range can cover every column (min 1, max 16384): store what differs from the default, capped.
        for (let k = min; k <= Math.min(max, min + 1023); k++) {
          if (hidden) widths[k] = 0;
          else if (w !== undefined && Number.isFinite(Number(w))) widths[k] = Math.max(0, Number(w) - WIDTH_PADDING);
          if (style !== undefined) columnStyles.set(k, Number(style));
        }
        break;
      }
      default:
        break;
    }
  }
  return { cells, merges, locked, widths, defaultWidth: defaultWidth ?? baseWidth + 0.43, columnStyles, formulaCells };
}

/** One cell a fill writes. */
export interface CellEdit {
  readonly row: number;
  readonly col: number;
  readonly content: CellContent;
  /** A number format for the cell, applied only when the cell's own format is General. */
  readonly format?: string;
}

/** The text of a number as a cell value: the shortest decimal that reads back as the same double. */
function numberText(x: number): string {
  if (!Number.isFinite(x)) throw new Error(`not a finite number: ${x}`);
  return String(x);
}

function tText(p: string, text: string): string {
  const space = /^\s|\s$|[\n\t]/.test(text) ? ' xml:space="preserve"' : '';
  return `<${p}t${space}>${escapeText(encodeXstring(text))}</${p}t>`;
}

/** A cell element for planned content. `attrs` are the attributes kept from the cell it replaces. */
export function cellXml(p: string, ref: string, style: number | undefined, content: CellContent, attrs = ''): string {
  const s = style !== undefined && style !== 0 ? ` s="${style}"` : '';
  const open = (t?: string): string => `<${p}c r="${ref}"${s}${t ? ` t="${t}"` : ''}${attrs}>`;
  const v = (x: string): string => `<${p}v>${escapeText(x)}</${p}v>`;
  switch (content.kind) {
    case 'number':
      return `${open()}${v(numberText(content.value))}</${p}c>`;
    case 'text':
      return `${open('inlineStr')}<${p}is>${tText(p, content.text)}</${p}is></${p}c>`;
    case 'error':
      return `${open('e')}${v(content.error.error)}</${p}c>`;
    case 'formula': {
      // As exceljs writes a formula with its cached result: a number as <v>, text as t="str", an error as t="e".
      const f = `<${p}f>${escapeText(storedFormula(content.formula))}</${p}f>`;
      const r = content.result;
      if (typeof r === 'number') return `${open()}${f}${v(numberText(r))}</${p}c>`;
      if (typeof r === 'string') return `${open('str')}${f}${v(encodeXstring(r))}</${p}c>`;
      return `${open('e')}${f}${v(r.error)}</${p}c>`;
    }
  }
}

/** Attributes of a replaced cell that stay: everything but its reference, style, type and the metadata of its old value. */
function keptAttrs(t: Tag): string {
  return t.attrs
    .filter((a) => !['r', 's', 't', 'cm', 'vm'].includes(a.name))
    .map((a) => ` ${a.name}="${a.value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;')}"`)
    .join('');
}

export interface SheetEditResult {
  readonly xml: string;
  /** Addresses of written cells that held a formula before. */
  readonly replacedFormulas: string[];
}

/**
 * Writes cells into a worksheet part. Existing cells keep their style (a derived cell whose format
 * is General gets a copy of its style with the planned number format); new cells take the row's
 * style (when the row has one) or the column's. Rows and cells stay in order; nothing outside the
 * touched rows, the dimension and those rows' spans changes.
 */
export function editSheet(xml: string, edits: readonly CellEdit[], styles: StyleBook, columnStyles: ReadonlyMap<number, number>, formulaCells: ReadonlySet<string>): SheetEditResult {
  const root = rootTag(xml);
  const p = root.name.includes(':') ? root.name.slice(0, root.name.indexOf(':') + 1) : '';
  const byRow = new Map<number, CellEdit[]>();
  for (const e of edits) {
    const list = byRow.get(e.row);
    if (list) list.push(e);
    else byRow.set(e.row, [e]);
  }
  for (const list of byRow.values()) list.sort((a, b) => a.col - b.col);
  const splices: Splice[] = [];
  const replacedFormulas: string[] = [];
  let sheetData: Tag | undefined;
  let dimension: Tag | undefined;
  let sheetPr: Tag | undefined;
  for (const t of tags(xml)) {
    const n = localName(t.name);
    if (n === 'dimension' && t.kind !== 'close') dimension = t;
    if (n === 'sheetPr' && t.kind !== 'close' && !sheetPr) sheetPr = t;
    if (n === 'sheetData' && t.kind !== 'close') {
      sheetData = t;
      break;
    }
  }
  if (!sheetData) throw new XmlError('the worksheet has no sheetData');
  const dataEnd = elementEnd(xml, sheetData);

  const newRow = (r: number): string => {
    const cellsXml = byRow.get(r)!.map((e) => cellXml(p, a1(e), styles.styleFor(columnStyles.get(e.col), e.format), e.content)).join('');
    return `<${p}row r="${r}">${cellsXml}</${p}row>`;
  };
  const pending = [...byRow.keys()].sort((a, b) => a - b);
  let next = 0;
  const insertRowsBefore = (limit: number, at: number): void => {
    let text = '';
    while (next < pending.length && pending[next] < limit) text += newRow(pending[next++]);
    if (text) splices.push({ start: at, end: at, text });
  };

  if (sheetData.kind === 'empty') {
    const text = pending.map(newRow).join('');
    next = pending.length;
    splices.push({ start: sheetData.start, end: sheetData.end, text: `<${p}sheetData>${text}</${p}sheetData>` });
  } else {
    let rowNum = 0;
    for (const t of tags(xml, sheetData.end, dataEnd)) {
      const n = localName(t.name);
      if (n !== 'row' || t.kind === 'close') continue;
      const explicit = attr(t, 'r');
      const r = explicit !== undefined ? Number(explicit) : rowNum + 1;
      rowNum = r;
      const before = next;
      insertRowsBefore(r, t.start);
      // A row numbered by its position would be renumbered by a row inserted before it: give it its number.
      const needsNumber = next > before && explicit === undefined;
      if (next < pending.length && pending[next] === r) {
        next++;
        editRow(xml, t, r, needsNumber, byRow.get(r)!, p, styles, columnStyles, formulaCells, splices, replacedFormulas);
      } else if (needsNumber) splices.push({ start: t.start, end: t.end, text: setAttr(xml.slice(t.start, t.end), 'r', String(r)) });
    }
    const closeStart = xml.lastIndexOf('<', dataEnd - 1);
    insertRowsBefore(Infinity, closeStart);
  }

  // The dimension: the used range grows to the cells written.
  let used: CellRange | undefined = dimension ? parseRef(attr(dimension, 'ref') ?? '') : undefined;
  for (const e of edits) {
    used = used
      ? { top: Math.min(used.top, e.row), left: Math.min(used.left, e.col), bottom: Math.max(used.bottom, e.row), right: Math.max(used.right, e.col) }
      : { top: e.row, left: e.col, bottom: e.row, right: e.col };
  }
  if (used && edits.length) {
    if (dimension) splices.push({ start: dimension.start, end: dimension.end, text: setAttr(xml.slice(dimension.start, dimension.end), 'ref', refText(used)) });
    else {
      const at = sheetPr ? elementEnd(xml, sheetPr) : root.end;
      splices.push({ start: at, end: at, text: `<${p}dimension ref="${refText(used)}"/>` });
    }
  }
  return { xml: applySplices(xml, splices), replacedFormulas };
}

function rootTag(xml: string): Tag {
  for (const t of tags(xml)) if (t.kind !== 'close') return t;
  throw new XmlError('the part has no root element');
}

function editRow(
  xml: string,
  rowTag: Tag,
  r: number,
  rowNumberAdded: boolean,
  edits: readonly CellEdit[],
  p: string,
  styles: StyleBook,
  columnStyles: ReadonlyMap<number, number>,
  formulaCells: ReadonlySet<string>,
  splices: Splice[],
  replacedFormulas: string[],
): void {
  const rowStyle = attr(rowTag, 'customFormat') === '1' || attr(rowTag, 'customFormat') === 'true' ? Number(attr(rowTag, 's') ?? 0) : undefined;
  const styleOfNew = (col: number): number | undefined => rowStyle ?? columnStyles.get(col);
  let startTag = xml.slice(rowTag.start, rowTag.end);
  if (rowNumberAdded) startTag = setAttr(startTag, 'r', String(r));
  const spans = attr(rowTag, 'spans');
  if (spans !== undefined) {
    const nums = spans.split(/[\s:]+/).map(Number).filter(Number.isFinite);
    const lo = Math.min(...nums, ...edits.map((e) => e.col));
    const hi = Math.max(...nums, ...edits.map((e) => e.col));
    startTag = setAttr(startTag, 'spans', `${lo}:${hi}`);
  }
  if (rowTag.kind === 'empty') {
    const open = startTag.replace(/\s*\/>$/, '>');
    const body = edits.map((e) => cellXml(p, a1(e), styles.styleFor(styleOfNew(e.col), e.format), e.content)).join('');
    splices.push({ start: rowTag.start, end: rowTag.end, text: `${open}${body}</${rowTag.name}>` });
    return;
  }
  if (startTag !== xml.slice(rowTag.start, rowTag.end)) splices.push({ start: rowTag.start, end: rowTag.end, text: startTag });
  const rowEnd = elementEnd(xml, rowTag);
  const closeStart = xml.lastIndexOf('<', rowEnd - 1);
  let i = 0;
  let col = 0;
  let depth = 0;
  for (const t of tags(xml, rowTag.end, closeStart)) {
    const n = localName(t.name);
    if (depth > 0) {
      if (n === 'c' && t.kind === 'close') depth = 0;
      continue;
    }
    if (n !== 'c') {
      if (t.kind === 'open' || t.kind === 'empty') {
        // Anything after the cells (an extLst): new cells go before it.
        while (i < edits.length) {
          const e = edits[i++];
          splices.push({ start: t.start, end: t.start, text: cellXml(p, a1(e), styles.styleFor(styleOfNew(e.col), e.format), e.content) });
        }
        break;
      }
      continue;
    }
    if (t.kind === 'close') continue;
    const ref = attr(t, 'r');
    const at = ref ? parseRef(ref) : undefined;
    col = at ? at.left : col + 1;
    const end = t.kind === 'empty' ? t.end : elementEnd(xml, t);
    if (t.kind === 'open') depth = 1;
    let inserted = false;
    while (i < edits.length && edits[i].col < col) {
      const e = edits[i++];
      splices.push({ start: t.start, end: t.start, text: cellXml(p, a1(e), styles.styleFor(styleOfNew(e.col), e.format), e.content) });
      inserted = true;
    }
    if (i < edits.length && edits[i].col === col) {
      const e = edits[i++];
      const own = attr(t, 's');
      const style = styles.styleFor(own !== undefined ? Number(own) : styleOfNew(col), e.format);
      const address = a1(e);
      if (formulaCells.has(address)) replacedFormulas.push(address);
      splices.push({ start: t.start, end, text: cellXml(p, address, style, e.content, keptAttrs(t)) });
    } else if (inserted && !ref) {
      // A cell numbered by its position would be renumbered by a cell inserted before it.
      const tagText = xml.slice(t.start, t.end);
      splices.push({ start: t.start, end: t.end, text: setAttr(tagText, 'r', a1({ row: r, col })) });
    }
  }
  while (i < edits.length) {
    const e = edits[i++];
    splices.push({ start: closeStart, end: closeStart, text: cellXml(p, a1(e), styles.styleFor(styleOfNew(e.col), e.format), e.content) });
  }
}
