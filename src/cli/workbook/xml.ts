/**
 * A small XML scanner that keeps offsets. The template fill edits a part by splicing new text
 * between the exact characters of the tags it changes; everything else in the part — unknown
 * elements and attributes, namespace declarations, mc:Ignorable, extLst, whitespace, quoting —
 * stays as it was, character for character. Only what OOXML parts contain is handled: elements,
 * attributes, character data, entities, comments, processing instructions and CDATA (a DOCTYPE is
 * refused: Office Open XML packages must not carry one, ECMA-376 Part 2, 8.1.4). Every part the
 * fill rewrites is then checked by a full parser (saxes, see checkWellFormed) before it is
 * written.
 */

export class XmlError extends Error {}

export interface Attr {
  /** The name as written, prefix included ("r:id"). */
  readonly name: string;
  /** The value with entities decoded. */
  readonly value: string;
}

export interface Tag {
  readonly kind: 'open' | 'close' | 'empty';
  /** The name as written, prefix included. */
  readonly name: string;
  /** Index of "<". */
  readonly start: number;
  /** Index after ">". */
  readonly end: number;
  /** Attributes (open and empty tags). */
  readonly attrs: readonly Attr[];
}

const ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

/** Decodes the five predefined entities and character references. */
export function decodeEntities(s: string): string {
  if (!s.includes('&')) return s;
  return s.replace(/&(#x[0-9a-fA-F]+|#[0-9]+|[a-zA-Z]+);/g, (m, e: string) => {
    if (e[0] === '#') {
      const code = e[1] === 'x' || e[1] === 'X' ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
      return Number.isFinite(code) && code <= 0x10ffff ? String.fromCodePoint(code) : m;
    }
    const v = ENTITIES[e];
    if (v === undefined) throw new XmlError(`unknown entity &${e};`);
    return v;
  });
}

/** Escapes text for element content. */
export function escapeText(s: string): string {
  return s.replace(/[&<>]/g, (c) => (c === '&' ? '&amp;' : c === '<' ? '&lt;' : '&gt;'));
}

/** Escapes text for a double-quoted attribute value. */
export function escapeAttr(s: string): string {
  return s.replace(/[&<>"\t\n\r]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\t': '&#9;', '\n': '&#10;', '\r': '&#13;' })[c] as string);
}

const ATTR = /([^\s=/>]+)\s*=\s*(?:"([^"]*)"|'([^']*)')/g;

function parseAttrs(s: string): Attr[] {
  const out: Attr[] = [];
  ATTR.lastIndex = 0;
  let m: RegExpExecArray | null;
  while ((m = ATTR.exec(s)) !== null) out.push({ name: m[1], value: decodeEntities(m[2] ?? m[3] ?? '') });
  return out;
}

/**
 * The tags of `xml` from `from`, in document order (comments, processing instructions and CDATA
 * sections skipped). Stops at `to`.
 */
export function* tags(xml: string, from = 0, to = xml.length): Generator<Tag> {
  let i = from;
  while (i < to) {
    const lt = xml.indexOf('<', i);
    if (lt < 0 || lt >= to) return;
    if (xml.startsWith('<!--', lt)) {
      const e = xml.indexOf('-->', lt + 4);
      if (e < 0) throw new XmlError('a comment is not closed');
      i = e + 3;
      continue;
    }
    if (xml.startsWith('<![CDATA[', lt)) {
      const e = xml.indexOf(']]>', lt + 9);
      if (e < 0) throw new XmlError('a CDATA section is not closed');
      i = e + 3;
      continue;
    }
    if (xml.startsWith('<?', lt)) {
      const e = xml.indexOf('?>', lt + 2);
      if (e < 0) throw new XmlError('a processing instruction is not closed');
      i = e + 2;
      continue;
    }
    if (xml.startsWith('<!', lt)) throw new XmlError('the part has a document type declaration, which Office Open XML does not allow');
    // Find the closing ">" outside quoted attribute values.
    let j = lt + 1;
    let quote = '';
    for (; j < xml.length; j++) {
      const ch = xml[j];
      if (quote) {
        if (ch === quote) quote = '';
      } else if (ch === '"' || ch === "'") quote = ch;
      else if (ch === '>') break;
    }
    if (j >= xml.length) throw new XmlError('a tag is not closed');
    const inner = xml.slice(lt + 1, j);
    const end = j + 1;
    i = end;
    if (inner[0] === '/') {
      yield { kind: 'close', name: inner.slice(1).trim(), start: lt, end, attrs: [] };
      continue;
    }
    const empty = inner.endsWith('/');
    const body = empty ? inner.slice(0, -1) : inner;
    const sp = body.search(/\s/);
    const name = sp < 0 ? body : body.slice(0, sp);
    if (name === '') throw new XmlError('a tag has no name');
    yield { kind: empty ? 'empty' : 'open', name, start: lt, end, attrs: sp < 0 ? [] : parseAttrs(body.slice(sp)) };
  }
}

export function attr(t: Tag, name: string): string | undefined {
  return t.attrs.find((a) => a.name === name)?.value;
}

/** The local part of a qualified name ("x:row" → "row"). */
export function localName(qname: string): string {
  const i = qname.indexOf(':');
  return i < 0 ? qname : qname.slice(i + 1);
}

/** The prefix a root element binds to one of the namespace URIs ('' for the default namespace), or undefined. */
export function prefixFor(root: Tag, uris: readonly string[]): string | undefined {
  for (const a of root.attrs) {
    if (!uris.includes(a.value)) continue;
    if (a.name === 'xmlns') return '';
    if (a.name.startsWith('xmlns:')) return a.name.slice(6);
  }
  return undefined;
}

/** The first element tag of a part (its root). */
export function rootOf(xml: string): Tag {
  for (const t of tags(xml)) if (t.kind !== 'close') return t;
  throw new XmlError('the part has no root element');
}

/** The end (index after ">") of the element whose start tag is `open`, found by counting nesting of the same name. */
export function elementEnd(xml: string, open: Tag): number {
  if (open.kind === 'empty') return open.end;
  let depth = 0;
  for (const t of tags(xml, open.start)) {
    if (t.name !== open.name) continue;
    if (t.kind === 'open') depth++;
    else if (t.kind === 'close') {
      depth--;
      if (depth === 0) return t.end;
    }
  }
  throw new XmlError(`<${open.name}> is not closed`);
}

/** The character data of a simple element (text between its start and end tag, CDATA included), decoded. */
export function textBetween(xml: string, start: number, end: number): string {
  const raw = xml.slice(start, end);
  if (!raw.includes('<')) return decodeEntities(raw);
  let out = '';
  let i = 0;
  while (i < raw.length) {
    const c = raw.indexOf('<![CDATA[', i);
    if (c < 0) {
      out += decodeEntities(raw.slice(i).replace(/<[^>]*>/g, ''));
      break;
    }
    out += decodeEntities(raw.slice(i, c).replace(/<[^>]*>/g, ''));
    const e = raw.indexOf(']]>', c);
    out += raw.slice(c + 9, e < 0 ? raw.length : e);
    i = e < 0 ? raw.length : e + 3;
  }
  return out;
}

/** Replaces (or adds) one attribute in a start tag's text, leaving the rest of the tag as written. */
export function setAttr(tagText: string, name: string, value: string): string {
  const re = new RegExp(`(\\s${name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\s*=\\s*)("[^"]*"|'[^']*')`);
  if (re.test(tagText)) return tagText.replace(re, (_m, lead: string) => `${lead}"${escapeAttr(value)}"`);
  const close = tagText.endsWith('/>') ? tagText.length - 2 : tagText.length - 1;
  return `${tagText.slice(0, close)} ${name}="${escapeAttr(value)}"${tagText.slice(close)}`;
}

/** Removes one attribute from a start tag's text. */
export function removeAttr(tagText: string, name: string): string {
  const re = new RegExp(`\\s${name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\s*=\\s*("[^"]*"|'[^']*')`);
  return tagText.replace(re, '');
}

export interface Splice {
  readonly start: number;
  readonly end: number;
  readonly text: string;
}

/** Applies non-overlapping splices to a text. */
export function applySplices(xml: string, splices: readonly Splice[]): string {
  const sorted = [...splices].sort((a, b) => a.start - b.start || a.end - b.end);
  let out = '';
  let at = 0;
  for (const s of sorted) {
    if (s.start < at) throw new XmlError('two edits of a part overlap');
    out += xml.slice(at, s.start) + s.text;
    at = s.end;
  }
  return out + xml.slice(at);
}
