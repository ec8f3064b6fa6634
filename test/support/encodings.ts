/**
 * A small corpus of variation tables in the encodings lab PCs write, generated into a temporary
 * folder by the tests that use it (nothing committed, nothing written into the project). Every
 * value is invented for the tests; the text holds the characters that encodings break: é, µ, °,
 * ±, the en dash and the euro sign (Windows-1252 bytes 0x96 and 0x80).
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';

/** The strings every encoding must carry through unchanged. */
export const TEXTS = {
  analyte: 'Créatinine',
  unit: 'µmol/L',
  source: 'Invented for tests (2026-01) – ± 5 % at 4 °C',
  note: 'stored at 4 °C; kit 12 € (invented)',
} as const;

export type CorpusEncoding = 'cp1252' | 'utf8' | 'utf8-bom' | 'utf16le-bom' | 'utf16be-bom';

export const ENCODINGS: readonly CorpusEncoding[] = ['cp1252', 'utf8', 'utf8-bom', 'utf16le-bom', 'utf16be-bom'];

/** What the report calls each encoding. */
export const ENCODING_NAMES: Readonly<Record<CorpusEncoding, string>> = {
  cp1252: 'Windows-1252',
  utf8: 'UTF-8',
  'utf8-bom': 'UTF-8 with BOM',
  'utf16le-bom': 'UTF-16LE with BOM',
  'utf16be-bom': 'UTF-16BE with BOM',
};

/** The table's text: comma-separated for the 8-bit encodings, tab-separated (as Excel's "Unicode Text") for UTF-16. */
export function tableText(encoding: CorpusEncoding): string {
  const sep = encoding.startsWith('utf16') ? '\t' : ',';
  const q = (s: string): string => (sep === ',' && /[,"]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const rows = [
    ['analyte', 'specimen', 'unit', 'cvi', 'cvg', 'source', 'note'],
    [TEXTS.analyte, 'sérum', TEXTS.unit, '4.5', '13.6', TEXTS.source, TEXTS.note],
    ['Arvelin', 'serum', 'mmol/L', '5.7', '6.9', 'Invented for tests (2026-01)', ''],
  ];
  return rows.map((r) => r.map(q).join(sep)).join('\r\n') + '\r\n';
}

const CP1252_EXTRA: Readonly<Record<string, number>> = { '€': 0x80, '–': 0x96 };

/** Windows-1252 bytes of a text (Latin-1 characters, the euro sign and the en dash). */
export function cp1252Bytes(text: string): Buffer {
  const out = Buffer.alloc(text.length);
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    const extra = CP1252_EXTRA[text[i]];
    if (extra !== undefined) out[i] = extra;
    else if (c <= 0xff && !(c >= 0x80 && c <= 0x9f)) out[i] = c;
    else throw new Error(`no Windows-1252 byte for U+${c.toString(16)}`);
  }
  return out;
}

export function encode(text: string, encoding: CorpusEncoding): Buffer {
  switch (encoding) {
    case 'cp1252':
      return cp1252Bytes(text);
    case 'utf8':
      return Buffer.from(text, 'utf8');
    case 'utf8-bom':
      return Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, 'utf8')]);
    case 'utf16le-bom':
      return Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    case 'utf16be-bom': {
      const le = Buffer.from(text, 'utf16le');
      for (let i = 0; i < le.length; i += 2) [le[i], le[i + 1]] = [le[i + 1], le[i]];
      return Buffer.concat([Buffer.from([0xfe, 0xff]), le]);
    }
  }
}

/** Writes the corpus into a new temporary folder: one table per encoding. Returns encoding → path. */
export function writeCorpus(prefix: string): Record<CorpusEncoding, string> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `leeway-${prefix}-`));
  const out = {} as Record<CorpusEncoding, string>;
  for (const e of ENCODINGS) {
    const file = path.join(dir, `table-${e}.csv`);
    fs.writeFileSync(file, encode(tableText(e), e));
    out[e] = file;
  }
  return out;
}
