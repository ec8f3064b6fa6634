/**
 * An .xlsx workbook as a package: a zip of parts (ECMA-376 Part 2, Open Packaging Conventions)
 * found through [Content_Types].xml and the relationship parts. This module opens one, tells the
 * user plainly when a file is something else (an .xls, an encrypted workbook, an OpenDocument
 * file, a zip that holds no workbook), reads the parts a template fill needs, and writes the
 * package back with only the parts the fill changed replaced: every other part keeps its bytes.
 *
 * Zip: JSZip (the zip library exceljs itself uses; it keeps an entry's compressed bytes when the
 * entry is not replaced). Parts are decoded as strict UTF-8 (a byte sequence that is not UTF-8 is
 * reported, never replaced by U+FFFD).
 */
import type JSZipType from 'jszip';
import { attr, localName, prefixFor, rootOf, tags, textBetween, XmlError, elementEnd } from './xml';
import type { Tag } from './xml';

export class WorkbookError extends Error {}

/** Namespace URIs, transitional (ECMA-376) and strict (ISO/IEC 29500 strict). */
export const NS = {
  main: ['http://schemas.openxmlformats.org/spreadsheetml/2006/main', 'http://purl.oclc.org/ooxml/spreadsheetml/main'],
  rel: ['http://schemas.openxmlformats.org/officeDocument/2006/relationships', 'http://purl.oclc.org/ooxml/officeDocument/relationships'],
};

const REL_TYPE = (strict: boolean, type: string): string => `${strict ? NS.rel[1] : NS.rel[0]}/${type}`;

const WORKBOOK_TYPES: Record<string, string> = {
  'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml': 'xlsx',
  'application/vnd.openxmlformats-officedocument.spreadsheetml.template.main+xml': 'xltx',
  'application/vnd.ms-excel.sheet.macroEnabled.main+xml': 'xlsm',
  'application/vnd.ms-excel.template.macroEnabled.main+xml': 'xltm',
};

export const WORKSHEET_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml';

export interface Relationship {
  readonly id: string;
  readonly type: string;
  /** The target as a package path without a leading "/" ("xl/worksheets/sheet1.xml"); external targets are left out. */
  readonly path: string;
}

export interface SheetEntry {
  readonly name: string;
  readonly sheetId: number;
  readonly rid: string;
  /** 0-based position in the workbook (what localSheetId counts). */
  readonly index: number;
  /** The part's path, or '' when the relationship is missing. */
  readonly path: string;
  readonly kind: 'worksheet' | 'chartsheet' | 'dialogsheet' | 'macrosheet' | 'other';
  /** True for a sheet the workbook hides (state hidden or veryHidden). */
  readonly hidden: boolean;
}

export interface DefinedName {
  readonly name: string;
  readonly localSheetId?: number;
  readonly text: string;
}

/** Reads a part as UTF-8 text (a byte order mark is kept as U+FEFF so it is written back). */
export function decodePart(bytes: Uint8Array, path: string): string {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) {
    throw new WorkbookError(`its part ${path} is UTF-16 text, which Leeway does not edit: open the workbook in a spreadsheet program and save it again`);
  }
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    throw new WorkbookError(`the workbook is damaged: its part ${path} is not UTF-8 text`);
  }
}

export function encodePart(text: string): Uint8Array {
  return new TextEncoder().encode(text);
}

function loadJSZip(): typeof JSZipType {
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  return require('jszip') as typeof JSZipType;
}

/** Resolves a relationship target against the folder of the part that holds the relationships. */
export function resolveTarget(sourcePart: string, target: string): string {
  if (target.startsWith('/')) return target.slice(1);
  const base = sourcePart.includes('/') ? sourcePart.slice(0, sourcePart.lastIndexOf('/') + 1) : '';
  const parts = (base + target).split('/');
  const out: string[] = [];
  for (const p of parts) {
    if (p === '..') out.pop();
    else if (p !== '.' && p !== '') out.push(p);
  }
  return out.join('/');
}

/** The relationships part of a part: xl/workbook.xml → xl/_rels/workbook.xml.rels. */
export function relsPathOf(part: string): string {
  const i = part.lastIndexOf('/');
  return `${part.slice(0, i + 1)}_rels/${part.slice(i + 1)}.rels`;
}

export function parseRels(xml: string, sourcePart: string): Relationship[] {
  const out: Relationship[] = [];
  for (const t of tags(xml)) {
    if (t.kind === 'close' || localName(t.name) !== 'Relationship') continue;
    if (attr(t, 'TargetMode') === 'External') continue;
    const id = attr(t, 'Id');
    const type = attr(t, 'Type');
    const target = attr(t, 'Target');
    if (id && type && target !== undefined) out.push({ id, type, path: resolveTarget(sourcePart, decodeURIComponentSafe(target)) });
  }
  return out;
}

function decodeURIComponentSafe(s: string): string {
  try {
    return decodeURIComponent(s);
  } catch {
    return s;
  }
}

/** Says what a file is when it is not a zip package. */
function notAZip(bytes: Uint8Array): string {
  const head = Array.from(bytes.subarray(0, 8));
  if (bytes.length === 0) return 'the file is empty';
  if (head.join(',') === [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1].join(',')) {
    const utf16 = (s: string): Buffer => Buffer.from(s, 'utf16le');
    const b = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    if (b.includes(utf16('EncryptedPackage'))) {
      return 'it is an encrypted workbook (protected by a password to open): Leeway cannot read it; save a copy without the password to open and fill that';
    }
    return 'it is an Excel 97–2003 workbook (.xls) or another older Office file: open it in a spreadsheet program and save it as an Excel workbook (.xlsx)';
  }
  const text = Buffer.from(bytes.subarray(0, 512)).toString('utf8');
  if (/^\s*</.test(text)) return 'it is an XML or HTML file, not an Excel workbook (.xlsx): open it in a spreadsheet program and save it as an Excel workbook';
  // eslint-disable-next-line no-control-regex -- tab, line feed and carriage return are what a text file holds
  if (/^[\x09\x0a\x0d\x20-\x7e\u00a0-\uffff]*$/.test(text) && /[,;\t]/.test(text)) return 'it is a text (CSV) file, not an Excel workbook (.xlsx): a template must be an .xlsx workbook';
  return 'it is not an Excel workbook (.xlsx): the file is not a zip package';
}

export class WorkbookPackage {
  readonly strict: boolean;
  readonly kind: string;
  readonly workbookPath: string;
  readonly sheets: readonly SheetEntry[];
  readonly definedNames: readonly DefinedName[];
  readonly sharedStringsPath?: string;
  readonly stylesPath?: string;
  readonly workbookRelsPath: string;
  private readonly texts = new Map<string, string>();
  private readonly changed = new Map<string, string>();

  private constructor(
    private readonly zip: JSZipType,
    init: { strict: boolean; kind: string; workbookPath: string; sheets: SheetEntry[]; definedNames: DefinedName[]; sharedStringsPath?: string; stylesPath?: string; texts: Map<string, string> },
  ) {
    this.strict = init.strict;
    this.kind = init.kind;
    this.workbookPath = init.workbookPath;
    this.workbookRelsPath = relsPathOf(init.workbookPath);
    this.sheets = init.sheets;
    this.definedNames = init.definedNames;
    this.sharedStringsPath = init.sharedStringsPath;
    this.stylesPath = init.stylesPath;
    for (const [k, v] of init.texts) this.texts.set(k, v);
  }

  /** Opens a workbook from its bytes; a file that is not one gives a WorkbookError that says what it is. */
  static async open(bytes: Uint8Array): Promise<WorkbookPackage> {
    const isZip = bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && (bytes[2] === 3 || bytes[2] === 5 || bytes[2] === 7);
    if (!isZip) throw new WorkbookError(notAZip(bytes));
    const JSZip = loadJSZip();
    let zip: JSZipType;
    try {
      zip = await JSZip.loadAsync(bytes);
    } catch {
      throw new WorkbookError('the file is damaged: its zip structure cannot be read');
    }
    const texts = new Map<string, string>();
    const read = async (path: string): Promise<string | undefined> => {
      const f = zip.file(path);
      if (!f) return undefined;
      let data: Uint8Array;
      try {
        data = await f.async('uint8array');
      } catch {
        throw new WorkbookError(`the file is damaged: its part ${path} cannot be unpacked`);
      }
      const text = decodePart(data, path);
      texts.set(path, text);
      return text;
    };
    const ct = await read('[Content_Types].xml');
    if (ct === undefined) {
      if (zip.file('mimetype')) {
        const m = (await zip.file('mimetype')!.async('string')).trim();
        if (m.includes('opendocument.spreadsheet')) throw new WorkbookError('it is an OpenDocument spreadsheet (.ods): save it as an Excel workbook (.xlsx)');
        throw new WorkbookError(`it is an OpenDocument file (${m}), not an Excel workbook (.xlsx)`);
      }
      throw new WorkbookError('it is a zip file but not an Excel workbook (.xlsx): it has no [Content_Types].xml');
    }
    const where = { part: '[Content_Types].xml' };
    return wrapXml(where, async () => {
      where.part = '_rels/.rels';
      const rootRels = await read('_rels/.rels');
      where.part = '[Content_Types].xml';
      const officeDoc = rootRels ? parseRels(rootRels, '').find((r) => r.type === REL_TYPE(false, 'officeDocument') || r.type === REL_TYPE(true, 'officeDocument')) : undefined;
      const overrides = new Map<string, string>();
      for (const t of tags(ct)) {
        if (t.kind !== 'close' && localName(t.name) === 'Override') overrides.set((attr(t, 'PartName') ?? '').replace(/^\//, ''), attr(t, 'ContentType') ?? '');
      }
      const mainType = officeDoc ? overrides.get(officeDoc.path) ?? '' : '';
      if (!officeDoc || !WORKBOOK_TYPES[mainType]) {
        if (mainType.includes('spreadsheetml') || mainType.includes('ms-excel.sheet.binary')) {
          throw new WorkbookError('it is an Excel binary workbook (.xlsb): save it as an Excel workbook (.xlsx)');
        }
        if (mainType.includes('wordprocessingml')) throw new WorkbookError('it is a Word document, not an Excel workbook (.xlsx)');
        if (mainType.includes('presentationml')) throw new WorkbookError('it is a PowerPoint presentation, not an Excel workbook (.xlsx)');
        throw new WorkbookError('it is a zip file but not an Excel workbook (.xlsx): it has no workbook part');
      }
      const strict = officeDoc.type === REL_TYPE(true, 'officeDocument');
      const workbookPath = officeDoc.path;
      where.part = workbookPath;
      const wbXml = await read(workbookPath);
      if (wbXml === undefined) throw new WorkbookError(`the workbook is damaged: its part ${workbookPath} is missing`);
      where.part = relsPathOf(workbookPath);
      const relsXml = (await read(relsPathOf(workbookPath))) ?? '';
      const rels = parseRels(relsXml, workbookPath);
      where.part = workbookPath;
      const root = rootOf(wbXml);
      const relPrefix = prefixFor(root, NS.rel);
      const sheets: SheetEntry[] = [];
      const definedNames: DefinedName[] = [];
      let inName: Tag | undefined;
      for (const t of tags(wbXml)) {
        const name = localName(t.name);
        if (name === 'sheet' && t.kind !== 'close') {
          const rid = t.attrs.find((a) => localName(a.name) === 'id' && (relPrefix === undefined ? a.name.includes(':') : a.name === `${relPrefix}:id`))?.value ?? '';
          const rel = rels.find((r) => r.id === rid);
          const type = rel ? rel.type.slice(rel.type.lastIndexOf('/') + 1) : '';
          const kind = (['worksheet', 'chartsheet', 'dialogsheet', 'macrosheet'] as const).find((k) => k === type || (k === 'macrosheet' && type === 'xlMacrosheet')) ?? 'other';
          const state = attr(t, 'state');
          sheets.push({ name: attr(t, 'name') ?? '', sheetId: Number(attr(t, 'sheetId') ?? 0), rid, index: sheets.length, path: rel?.path ?? '', kind, hidden: state === 'hidden' || state === 'veryHidden' });
        } else if (name === 'definedName') {
          if (t.kind === 'open') inName = t;
          else if (t.kind === 'close' && inName) {
            const local = attr(inName, 'localSheetId');
            definedNames.push({ name: attr(inName, 'name') ?? '', ...(local !== undefined ? { localSheetId: Number(local) } : {}), text: textBetween(wbXml, inName.end, t.start) });
            inName = undefined;
          }
        }
      }
      const sst = rels.find((r) => r.type.endsWith('/sharedStrings'));
      const styles = rels.find((r) => r.type.endsWith('/styles'));
      if (sst) await read(sst.path);
      if (styles) await read(styles.path);
      return new WorkbookPackage(zip, {
        strict,
        kind: WORKBOOK_TYPES[mainType],
        workbookPath,
        sheets,
        definedNames,
        sharedStringsPath: sst && texts.has(sst.path) ? sst.path : undefined,
        stylesPath: styles && texts.has(styles.path) ? styles.path : undefined,
        texts,
      });
    });
  }

  /** A part's text (read on first use); undefined when the package has no such part. */
  async text(path: string): Promise<string | undefined> {
    const changed = this.changed.get(path);
    if (changed !== undefined) return changed;
    const known = this.texts.get(path);
    if (known !== undefined) return known;
    const f = this.zip.file(path);
    if (!f) return undefined;
    const text = decodePart(await f.async('uint8array'), path);
    this.texts.set(path, text);
    return text;
  }

  has(path: string): boolean {
    return this.zip.file(path) !== null;
  }

  /** Every part's path, in the package's order. */
  paths(): string[] {
    const out: string[] = [];
    this.zip.forEach((p, f) => {
      if (!f.dir) out.push(p);
    });
    return out;
  }

  /** Replaces (or adds) a part. */
  put(path: string, text: string): void {
    this.changed.set(path, text);
  }

  /** Removes a part (a calculation chain that would name cells that no longer hold formulas). */
  remove(path: string): void {
    this.changed.delete(path);
    this.zip.remove(path);
  }

  /** The parts put since opening. */
  changedParts(): string[] {
    return [...this.changed.keys()];
  }

  /** The package with the changed parts replaced; every other entry keeps its compressed bytes. */
  async bytes(): Promise<Buffer> {
    for (const [path, text] of this.changed) this.zip.file(path, encodePart(text), { binary: true, createFolders: false });
    return this.zip.generateAsync({ type: 'nodebuffer', compression: 'DEFLATE', compressionOptions: { level: 6 }, platform: 'DOS' });
  }
}

/** Runs a reading step and turns a malformed part into a plain message that names the part. */
export async function wrapXml<T>(where: { part: string }, f: () => Promise<T>): Promise<T> {
  try {
    return await f();
  } catch (e) {
    if (e instanceof XmlError) throw new WorkbookError(`the workbook is damaged: its part ${where.part} is not well-formed XML (${e.message})`);
    throw e;
  }
}

export { elementEnd };
