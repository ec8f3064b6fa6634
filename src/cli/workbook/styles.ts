/**
 * The workbook's cell formats (styles.xml, ECMA-376 Part 1, 18.8): a fill that writes a derived
 * value into a cell formatted General gives it a copy of that cell's format with the planned
 * number format ("0.00"), appended to cellXfs; the lab's own number formats, fonts, borders and
 * fills are never changed. Built-in number formats 1 ("0") and 2 ("0.00") are used as they are
 * (ECMA-376 Part 1, 18.8.30); others are added to numFmts from id 164 up.
 */
import { applySplices, attr, elementEnd, escapeAttr, localName, rootOf, setAttr, tags } from './xml';
import type { Splice, Tag } from './xml';

const BUILT_IN: Readonly<Record<string, number>> = { General: 0, '0': 1, '0.00': 2 };

interface Xf {
  readonly raw: string;
  readonly numFmtId: number;
}

export class StyleBook {
  private readonly xfs: Xf[] = [];
  private readonly formats = new Map<string, number>();
  private readonly added: string[] = [];
  private readonly addedFormats: Array<{ id: number; code: string }> = [];
  private readonly memo = new Map<string, number>();
  private cellXfs?: Tag;
  private numFmts?: Tag;
  private readonly prefix: string;
  /** True when the workbook has no styles part: number formats are then not written. */
  readonly missing: boolean;

  constructor(private readonly xml: string | undefined) {
    this.missing = xml === undefined;
    if (xml === undefined) {
      this.prefix = '';
      return;
    }
    const root = rootOf(xml);
    this.prefix = root.name.includes(':') ? root.name.slice(0, root.name.indexOf(':') + 1) : '';
    let depth = 0;
    for (const t of tags(xml)) {
      const n = localName(t.name);
      if (n === 'numFmts' && t.kind !== 'close') this.numFmts = t;
      if (n === 'numFmt' && t.kind !== 'close') {
        const id = Number(attr(t, 'numFmtId'));
        const code = attr(t, 'formatCode');
        if (Number.isFinite(id) && code !== undefined && !this.formats.has(code)) this.formats.set(code, id);
      }
      if (n === 'cellXfs') {
        if (t.kind === 'open') {
          this.cellXfs = t;
          depth = 1;
        } else if (t.kind === 'empty') this.cellXfs = t;
        else depth = 0;
        continue;
      }
      if (depth === 1 && n === 'xf' && t.kind !== 'close') {
        const end = elementEnd(xml, t);
        this.xfs.push({ raw: xml.slice(t.start, end), numFmtId: Number(attr(t, 'numFmtId') ?? 0) });
      }
    }
  }

  /** True when styles were added. */
  get changed(): boolean {
    return this.added.length > 0;
  }

  /**
   * The style index for a cell whose style is `base` (undefined: none) that should show `format`.
   * A base whose number format is not General keeps its own format; no format keeps the base.
   */
  styleFor(base: number | undefined, format: string | undefined): number | undefined {
    if (format === undefined || this.missing || this.xfs.length === 0) return base;
    const index = base !== undefined && base >= 0 && base < this.xfs.length ? base : 0;
    const xf = this.xfs[index];
    if (!this.isGeneral(xf.numFmtId)) return base;
    const key = `${index}|${format}`;
    const known = this.memo.get(key);
    if (known !== undefined) return known;
    const id = this.formatId(format);
    const startEnd = xf.raw.indexOf('>') + 1;
    let start = xf.raw.slice(0, startEnd);
    start = setAttr(setAttr(start, 'numFmtId', String(id)), 'applyNumberFormat', '1');
    const out = this.xfs.length + this.added.length;
    this.added.push(start + xf.raw.slice(startEnd));
    this.memo.set(key, out);
    return out;
  }

  /** Number format 0, or a format whose code is "General" (LibreOffice writes General as format 164). */
  private isGeneral(id: number): boolean {
    if (id === 0) return true;
    for (const [code, known] of this.formats) if (known === id) return code.trim().toLowerCase() === 'general';
    return false;
  }

  private formatId(code: string): number {
    const builtIn = BUILT_IN[code];
    if (builtIn !== undefined) return builtIn;
    const known = this.formats.get(code);
    if (known !== undefined) return known;
    const id = Math.max(163, ...this.formats.values(), ...this.addedFormats.map((f) => f.id)) + 1;
    this.addedFormats.push({ id, code });
    this.formats.set(code, id);
    return id;
  }

  /** The styles part with the added formats; the part as it was when nothing was added. */
  toXml(): string {
    const xml = this.xml;
    if (xml === undefined || !this.changed || !this.cellXfs) return xml ?? '';
    const p = this.prefix;
    const splices: Splice[] = [];
    const total = this.xfs.length + this.added.length;
    const cx = this.cellXfs;
    if (cx.kind === 'empty') {
      const open = setAttr(xml.slice(cx.start, cx.end), 'count', String(total)).replace(/\s*\/>$/, '>');
      splices.push({ start: cx.start, end: cx.end, text: `${open}${this.added.join('')}</${cx.name}>` });
    } else {
      splices.push({ start: cx.start, end: cx.end, text: setAttr(xml.slice(cx.start, cx.end), 'count', String(total)) });
      const end = elementEnd(xml, cx);
      const close = xml.lastIndexOf('<', end - 1);
      splices.push({ start: close, end: close, text: this.added.join('') });
    }
    if (this.addedFormats.length) {
      const items = this.addedFormats.map((f) => `<${p}numFmt numFmtId="${f.id}" formatCode="${escapeAttr(f.code)}"/>`).join('');
      const nf = this.numFmts;
      if (nf && nf.kind === 'open') {
        const count = Number(attr(nf, 'count') ?? 0) + this.addedFormats.length;
        splices.push({ start: nf.start, end: nf.end, text: setAttr(xml.slice(nf.start, nf.end), 'count', String(count)) });
        const end = elementEnd(xml, nf);
        const close = xml.lastIndexOf('<', end - 1);
        splices.push({ start: close, end: close, text: items });
      } else if (nf) {
        splices.push({ start: nf.start, end: nf.end, text: `<${p}numFmts count="${this.addedFormats.length}">${items}</${p}numFmts>` });
      } else {
        const root = rootOf(xml);
        splices.push({ start: root.end, end: root.end, text: `<${p}numFmts count="${this.addedFormats.length}">${items}</${p}numFmts>` });
      }
    }
    return applySplices(xml, splices);
  }
}
