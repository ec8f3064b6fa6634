/**
 * Text encodings of lab files: the one decoder the task pane and the command line share.
 *
 * Accepted: UTF-8 with or without a byte-order mark (BOM EF BB BF); UTF-16 little- or big-endian
 * with its BOM (FF FE, FE FF); and Windows code page 1252, the code page spreadsheet programs on
 * Western-European Windows write for plain "CSV". Bytes without a BOM that are valid UTF-8 are
 * UTF-8 (plain ASCII is both); bytes without a BOM that are not valid UTF-8 are read as
 * Windows-1252 with a warning naming the encoding. Everything else is refused, never patched:
 * no character is replaced by U+FFFD or dropped. Refused are NUL bytes and other control bytes
 * (binary content, or UTF-16 without its BOM), the five byte values Windows-1252 leaves
 * undefined (0x81 0x8D 0x8F 0x90 0x9D; the WHATWG decoder would map them to C1 controls, so
 * they are checked here explicitly), text that mixes valid multi-byte UTF-8 with bytes that are
 * not UTF-8 (two encodings in one file: reading it either way garbles part of it), a BOM
 * followed by bytes that are not that encoding, and UTF-32.
 *
 * Method: UTF-8 is validated by the well-formedness table of the Unicode Standard (chapter 3,
 * table 3-7) and decoded by the platform's TextDecoder (fatal mode) when there is one, by the same
 * table otherwise. Windows-1252 and UTF-16 are decoded here from their code tables (the
 * Windows-1252 table of the WHATWG Encoding Standard, index-windows-1252); both are exact.
 */

/** The encodings a file can be read in, as the report names them. */
export type TextEncodingName = 'UTF-8' | 'UTF-8 with BOM' | 'UTF-16LE with BOM' | 'UTF-16BE with BOM' | 'Windows-1252';

/** Why a file was refused. */
export type DecodeFailure =
  | 'binary'
  | 'utf16-without-bom'
  | 'utf32'
  | 'bad-utf8-after-bom'
  | 'bad-utf16'
  | 'mixed'
  | 'cp1252-undefined';

export type DecodeResult =
  | {
      readonly ok: true;
      /** The text without its BOM. */
      readonly text: string;
      readonly encoding: TextEncodingName;
      /** Set when the encoding was inferred rather than marked (Windows-1252): what to check. */
      readonly warning?: string;
    }
  | {
      readonly ok: false;
      readonly reason: DecodeFailure;
      /** Says what was found, where (line of the file, 1-based), and what to do. */
      readonly message: string;
    };

/** What a file must be in, for the messages. */
export const ACCEPTED_ENCODINGS = 'UTF-8 with or without BOM, UTF-16 LE/BE with BOM, or Windows-1252';

const RESAVE = 'Save it from the spreadsheet as "CSV UTF-8 (comma delimited)" and check it again.';

// Only what this file needs of the platform's TextDecoder (Node and browsers both have it).
interface FatalDecoder {
  decode(input: Uint8Array): string;
}
type DecoderConstructor = new (label: string, options?: { fatal?: boolean; ignoreBOM?: boolean }) => FatalDecoder;

function platformUtf8(): FatalDecoder | undefined {
  const ctor = (globalThis as unknown as { TextDecoder?: DecoderConstructor }).TextDecoder;
  if (typeof ctor !== 'function') return undefined;
  try {
    return new ctor('utf-8', { fatal: true, ignoreBOM: true });
  } catch {
    return undefined;
  }
}

/** Windows-1252 bytes 0x80–0x9F (WHATWG index-windows-1252); 0 marks the five undefined bytes. Bytes 0xA0–0xFF are U+00A0–U+00FF. */
const CP1252_HIGH: readonly number[] = [
  0x20ac, 0, 0x201a, 0x0192, 0x201e, 0x2026, 0x2020, 0x2021, 0x02c6, 0x2030, 0x0160, 0x2039, 0x0152, 0, 0x017d, 0,
  0, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022, 0x2013, 0x2014, 0x02dc, 0x2122, 0x0161, 0x203a, 0x0153, 0, 0x017e, 0x0178,
];

/** Code units per String.fromCharCode call (well below any engine's argument limit). */
const CHUNK = 8192;

function fromUnits(units: Uint16Array): string {
  return String.fromCharCode.apply(null, units as unknown as number[]);
}

function hex(b: number): string {
  return `0x${b.toString(16).toUpperCase().padStart(2, '0')}`;
}

/** 1-based line of a byte offset, counting LF bytes (UTF-8 and Windows-1252 share them with ASCII). */
function lineOfByte(bytes: Uint8Array, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset && i < bytes.length; i++) if (bytes[i] === 0x0a) line++;
  return line;
}

/** A control character that has no place in a text table: C0 controls other than tab, LF, CR; and DEL. */
function isStrayControl(c: number): boolean {
  return (c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d) || c === 0x7f;
}

/**
 * Decodes the bytes of a lab file (a table, a control results file, an EQA file). Never throws;
 * a file that is none of the accepted encodings gives `ok: false` with a message.
 */
export function decodeText(bytes: Uint8Array): DecodeResult {
  const n = bytes.length;
  if (n >= 4 && ((bytes[0] === 0xff && bytes[1] === 0xfe && bytes[2] === 0 && bytes[3] === 0) || (bytes[0] === 0 && bytes[1] === 0 && bytes[2] === 0xfe && bytes[3] === 0xff))) {
    return fail('utf32', `the file is UTF-32 (it starts with a UTF-32 byte-order mark): Leeway reads ${ACCEPTED_ENCODINGS}. ${RESAVE}`);
  }
  if (n >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return utf8(bytes, 3);
  if (n >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return utf16(bytes, true);
  if (n >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return utf16(bytes, false);

  const control = firstStrayControlByte(bytes);
  if (control >= 0) {
    const guess = bytes[control] === 0 ? utf16Guess(bytes) : null;
    if (guess) {
      return fail(
        'utf16-without-bom',
        `the file looks like UTF-16 (${guess === 'le' ? 'little' : 'big'}-endian) without a byte-order mark: that is none of the encodings Leeway reads (${ACCEPTED_ENCODINGS}), because without the mark the byte order is a guess. Save it from the spreadsheet as "CSV UTF-8 (comma delimited)", or as "Unicode Text" (which writes the mark), and check it again.`,
      );
    }
    return fail(
      'binary',
      `the file holds the control byte ${hex(bytes[control])} on line ${lineOfByte(bytes, control)}: it is not a text table in any encoding Leeway reads (${ACCEPTED_ENCODINGS}); is it a workbook (.xlsx) or another binary file? ${RESAVE}`,
    );
  }

  const scan = scanUtf8(bytes, 0);
  if (scan.firstInvalid < 0) return { ok: true, text: decodeValidUtf8(bytes, 0), encoding: 'UTF-8' };
  const bad = scan.firstInvalid;
  if (scan.firstMultibyte >= 0) {
    return fail(
      'mixed',
      `the file mixes two encodings: line ${lineOfByte(bytes, scan.firstMultibyte)} holds UTF-8 characters, but byte ${hex(bytes[bad])} on line ${lineOfByte(bytes, bad)} is not UTF-8: reading it either way would change characters. ${RESAVE}`,
    );
  }
  for (let i = 0; i < n; i++) {
    const b = bytes[i];
    if (b >= 0x80 && b <= 0x9f && CP1252_HIGH[b - 0x80] === 0) {
      return fail(
        'cp1252-undefined',
        `byte ${hex(b)} on line ${lineOfByte(bytes, i)} is neither UTF-8 nor a Windows-1252 character: the file is none of the encodings Leeway reads (${ACCEPTED_ENCODINGS}). ${RESAVE}`,
      );
    }
  }
  const text = decodeCp1252(bytes);
  // Every byte before `bad` is ASCII (no multi-byte sequence came first), and Windows-1252 maps
  // one byte to one character: `bad` is the first non-ASCII character's index in the text too.
  return { ok: true, text, encoding: 'Windows-1252', warning: cp1252Warning(text, bad, lineOfByte(bytes, bad)) };
}

function fail(reason: DecodeFailure, message: string): DecodeResult {
  return { ok: false, reason, message };
}

/** The word around the first non-ASCII character, for the user to see how it was read. */
function wordAt(text: string, at: number): string {
  const stop = /[\s,;"]/;
  let a = at;
  let b = at + 1;
  while (a > 0 && at - a < 20 && !stop.test(text[a - 1])) a--;
  while (b < text.length && b - at < 20 && !stop.test(text[b])) b++;
  return text.slice(a, b);
}

function cp1252Warning(text: string, at: number, line: number): string {
  const sample = wordAt(text, at);
  return `the file is not UTF-8: it was read as Windows-1252 (what spreadsheet programs on Western-European Windows write for plain "CSV")${sample ? `; line ${line} now reads "${sample}"` : ''}. If a character looks wrong, the file is in another encoding. ${RESAVE}`;
}

/** First C0 control byte other than tab, LF and CR (or DEL); -1 when none. */
function firstStrayControlByte(bytes: Uint8Array): number {
  for (let i = 0; i < bytes.length; i++) if (isStrayControl(bytes[i])) return i;
  return -1;
}

/**
 * UTF-16 without a BOM shows as NUL bytes at every other position (ASCII text, high byte 0):
 * at odd offsets for little-endian, at even offsets for big-endian. Looked for in the first 4 KiB.
 */
function utf16Guess(bytes: Uint8Array): 'le' | 'be' | null {
  const m = Math.min(bytes.length, 4096) & ~1;
  if (m < 4) return null;
  let even = 0;
  let odd = 0;
  for (let i = 0; i < m; i += 2) {
    if (bytes[i] === 0) even++;
    if (bytes[i + 1] === 0) odd++;
  }
  const pairs = m / 2;
  if (odd >= 0.3 * pairs && even <= 0.05 * pairs) return 'le';
  if (even >= 0.3 * pairs && odd <= 0.05 * pairs) return 'be';
  return null;
}

/**
 * Validates UTF-8 from `start` (Unicode Standard table 3-7: no overlong forms, no surrogates,
 * nothing above U+10FFFF). Returns the offset of the first ill-formed byte (-1 when none) and of
 * the first well-formed multi-byte sequence before it (-1 when none).
 */
export function scanUtf8(bytes: Uint8Array, start: number): { firstInvalid: number; firstMultibyte: number } {
  let firstMultibyte = -1;
  const n = bytes.length;
  let i = start;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) need = 1;
    else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      if (b === 0xe0) lo = 0xa0;
      else if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      if (b === 0xf0) lo = 0x90;
      else if (b === 0xf4) hi = 0x8f;
    } else return { firstInvalid: i, firstMultibyte };
    if (i + need >= n) return { firstInvalid: i, firstMultibyte };
    const second = bytes[i + 1];
    if (second < lo || second > hi) return { firstInvalid: i, firstMultibyte };
    for (let k = 2; k <= need; k++) {
      const c = bytes[i + k];
      if (c < 0x80 || c > 0xbf) return { firstInvalid: i, firstMultibyte };
    }
    if (firstMultibyte < 0) firstMultibyte = i;
    i += need + 1;
  }
  return { firstInvalid: -1, firstMultibyte };
}

/** Decodes bytes already known to be well-formed UTF-8. */
function decodeValidUtf8(bytes: Uint8Array, start: number): string {
  const body = start === 0 ? bytes : bytes.subarray(start);
  const platform = platformUtf8();
  if (platform) return platform.decode(body);
  const parts: string[] = [];
  const units = new Uint16Array(CHUNK + 2);
  let u = 0;
  let i = 0;
  while (i < body.length) {
    const b = body[i];
    let cp: number;
    if (b < 0x80) {
      cp = b;
      i++;
    } else if (b < 0xe0) {
      cp = ((b & 0x1f) << 6) | (body[i + 1] & 0x3f);
      i += 2;
    } else if (b < 0xf0) {
      cp = ((b & 0x0f) << 12) | ((body[i + 1] & 0x3f) << 6) | (body[i + 2] & 0x3f);
      i += 3;
    } else {
      cp = ((b & 0x07) << 18) | ((body[i + 1] & 0x3f) << 12) | ((body[i + 2] & 0x3f) << 6) | (body[i + 3] & 0x3f);
      i += 4;
    }
    if (cp >= 0x10000) {
      cp -= 0x10000;
      units[u++] = 0xd800 + (cp >> 10);
      units[u++] = 0xdc00 + (cp & 0x3ff);
    } else units[u++] = cp;
    if (u >= CHUNK) {
      parts.push(fromUnits(units.subarray(0, u)));
      u = 0;
    }
  }
  if (u) parts.push(fromUnits(units.subarray(0, u)));
  return parts.join('');
}

function utf8(bytes: Uint8Array, start: number): DecodeResult {
  const scan = scanUtf8(bytes, start);
  if (scan.firstInvalid >= 0) {
    const i = scan.firstInvalid;
    return fail('bad-utf8-after-bom', `the file starts with a UTF-8 byte-order mark, but byte ${hex(bytes[i])} on line ${lineOfByte(bytes, i)} is not UTF-8: part of it was saved in another encoding. ${RESAVE}`);
  }
  const text = decodeValidUtf8(bytes, start);
  const control = firstStrayControlChar(text);
  if (control) return fail('binary', `the file holds the control character ${control.what} on line ${control.line}: it is not a text table. ${RESAVE}`);
  return { ok: true, text, encoding: 'UTF-8 with BOM' };
}

function firstStrayControlChar(text: string): { what: string; line: number } | null {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (isStrayControl(c)) {
      let line = 1;
      for (let k = 0; k < i; k++) if (text.charCodeAt(k) === 0x0a) line++;
      return { what: `U+${c.toString(16).toUpperCase().padStart(4, '0')}`, line };
    }
  }
  return null;
}

function utf16(bytes: Uint8Array, little: boolean): DecodeResult {
  const name = little ? 'UTF-16LE' : 'UTF-16BE';
  if ((bytes.length & 1) !== 0) {
    return fail('bad-utf16', `the file starts with a ${name} byte-order mark but has an odd number of bytes: it is cut short or not UTF-16. ${RESAVE}`);
  }
  const parts: string[] = [];
  const units = new Uint16Array(CHUNK);
  let u = 0;
  let line = 1;
  let pendingHigh = false;
  for (let i = 2; i < bytes.length; i += 2) {
    const c = little ? bytes[i] | (bytes[i + 1] << 8) : (bytes[i] << 8) | bytes[i + 1];
    if (c === 0x0a) line++;
    if (isStrayControl(c)) {
      const what = `U+${c.toString(16).toUpperCase().padStart(4, '0')}`;
      return fail('binary', `the file holds the control character ${what} on line ${line}: it is not a text table. ${RESAVE}`);
    }
    const high = c >= 0xd800 && c <= 0xdbff;
    const low = c >= 0xdc00 && c <= 0xdfff;
    if ((pendingHigh && !low) || (!pendingHigh && low)) {
      return fail('bad-utf16', `the file starts with a ${name} byte-order mark but line ${line} holds a broken character (an unpaired surrogate): it is not valid UTF-16. ${RESAVE}`);
    }
    pendingHigh = high;
    units[u++] = c;
    if (u === CHUNK) {
      parts.push(fromUnits(units));
      u = 0;
    }
  }
  if (pendingHigh) return fail('bad-utf16', `the file starts with a ${name} byte-order mark but ends in half a character: it is cut short. ${RESAVE}`);
  if (u) parts.push(fromUnits(units.subarray(0, u)));
  return { ok: true, text: parts.join(''), encoding: little ? 'UTF-16LE with BOM' : 'UTF-16BE with BOM' };
}

/** Windows-1252 bytes (the five undefined ones already refused) as text. */
function decodeCp1252(bytes: Uint8Array): string {
  const parts: string[] = [];
  const units = new Uint16Array(CHUNK);
  let u = 0;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    units[u++] = b >= 0x80 && b <= 0x9f ? CP1252_HIGH[b - 0x80] : b;
    if (u === CHUNK) {
      parts.push(fromUnits(units));
      u = 0;
    }
  }
  if (u) parts.push(fromUnits(units.subarray(0, u)));
  return parts.join('');
}
