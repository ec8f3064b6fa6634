/**
 * The decoder of lab files. References outside the project: GNU libc's iconv (Debian's
 * /usr/bin/iconv, charset CP1252) for the Windows-1252 table — Node 20's TextDecoder cannot serve,
 * it decodes 'windows-1252' bytes 0x80–0x9F as ISO-8859-1 C1 controls; Node's Buffer for UTF-8
 * and UTF-16; a fatal TextDecoder for well-formed UTF-8 (the Unicode Standard, chapter 3,
 * table 3-7). Seeded property tests (mulberry32).
 */
import { execFileSync } from 'child_process';
import { decodeText, scanUtf8 } from '../../../src/engine/text/decode';
import { mulberry32 } from '../../support/prng';

const bytes = (...b: number[]): Uint8Array => new Uint8Array(b);
const utf8 = (s: string): Uint8Array => new Uint8Array(Buffer.from(s, 'utf8'));
const utf16le = (s: string, bom = true): Uint8Array => new Uint8Array(Buffer.concat([Buffer.from(bom ? [0xff, 0xfe] : []), Buffer.from(s, 'utf16le')]));
const utf16be = (s: string, bom = true): Uint8Array => {
  const le = Buffer.from(s, 'utf16le');
  for (let i = 0; i < le.length; i += 2) [le[i], le[i + 1]] = [le[i + 1], le[i]];
  return new Uint8Array(Buffer.concat([Buffer.from(bom ? [0xfe, 0xff] : []), le]));
};
/** Windows-1252 bytes of a text through Node's WHATWG encoder table (latin1 covers the text used here). */
const cp1252 = (s: string): Uint8Array => new Uint8Array(Buffer.from(s, 'latin1'));

const SAMPLE = 'analyte;unit;note\r\nCréatinine;µmol/L;4 °C, ± 5 %\r\n';

describe('decodeText: the accepted encodings', () => {
  test('UTF-8 without BOM (and plain ASCII) is UTF-8, with no warning', () => {
    expect(decodeText(utf8(SAMPLE))).toEqual({ ok: true, text: SAMPLE, encoding: 'UTF-8' });
    expect(decodeText(utf8('analyte,cvi\nA,5\n'))).toEqual({ ok: true, text: 'analyte,cvi\nA,5\n', encoding: 'UTF-8' });
  });

  test('UTF-8 with BOM: the BOM is dropped and named', () => {
    const r = decodeText(new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(SAMPLE)]));
    expect(r).toEqual({ ok: true, text: SAMPLE, encoding: 'UTF-8 with BOM' });
  });

  test('UTF-16 LE and BE with BOM, including a character outside the BMP (a surrogate pair)', () => {
    const text = SAMPLE + '𝜇 (U+1D707)\r\n';
    expect(decodeText(utf16le(text))).toEqual({ ok: true, text, encoding: 'UTF-16LE with BOM' });
    expect(decodeText(utf16be(text))).toEqual({ ok: true, text, encoding: 'UTF-16BE with BOM' });
  });

  test('bytes that are not UTF-8 are Windows-1252, with a warning that names it and shows how the first such word reads', () => {
    const r = decodeText(cp1252(SAMPLE));
    expect(r.ok).toBe(true);
    if (!r.ok) throw new Error('unreachable');
    expect(r.text).toBe(SAMPLE);
    expect(r.encoding).toBe('Windows-1252');
    expect(r.warning).toMatch(/read as Windows-1252/);
    expect(r.warning).toContain('line 2 now reads "Créatinine"');
    expect(r.warning).toMatch(/CSV UTF-8/);
  });

  test('every Windows-1252 byte 0x80–0xFF decodes as GNU libc iconv (CP1252) decodes it; the bytes iconv refuses are the five refused here', () => {
    const iconv = (b: number): string | null => {
      try {
        return execFileSync('iconv', ['-f', 'CP1252', '-t', 'UTF-8'], { input: Buffer.from([0x78, b, 0x79]), stdio: ['pipe', 'pipe', 'ignore'] }).toString('utf8');
      } catch {
        return null;
      }
    };
    const refused: number[] = [];
    for (let b = 0x80; b <= 0xff; b++) {
      const reference = iconv(b);
      // A leading "x" and trailing "y" keep the byte from forming UTF-8 with its neighbours.
      const r = decodeText(bytes(0x78, b, 0x79));
      if (reference === null) {
        refused.push(b);
        expect({ b, r }).toEqual({ b, r: expect.objectContaining({ ok: false, reason: 'cp1252-undefined' }) });
      } else {
        expect({ b, r }).toEqual({ b, r: expect.objectContaining({ ok: true, encoding: 'Windows-1252', text: reference }) });
      }
    }
    expect(refused).toEqual([0x81, 0x8d, 0x8f, 0x90, 0x9d]);
  });

  test('the five bytes Windows-1252 leaves undefined are refused, never mapped to C1 controls', () => {
    for (const b of [0x81, 0x8d, 0x8f, 0x90, 0x9d]) {
      const r = decodeText(bytes(0x61, 0x0a, 0x62, b, 0x0a));
      expect(r).toEqual({ ok: false, reason: 'cp1252-undefined', message: expect.stringContaining(`byte 0x${b.toString(16).toUpperCase()} on line 2 is neither UTF-8 nor a Windows-1252 character`) });
      if (!r.ok) expect(r.message).toMatch(/none of the encodings Leeway reads/);
    }
  });
});

describe('decodeText: what is refused', () => {
  test('NUL bytes (binary content, /dev/zero) are refused as not a text table', () => {
    const r = decodeText(new Uint8Array(4096));
    expect(r).toMatchObject({ ok: false, reason: 'binary' });
    if (!r.ok) expect(r.message).toMatch(/control byte 0x00 on line 1: it is not a text table/);
    expect(decodeText(bytes(0x50, 0x4b, 0x03, 0x04, 0x14, 0x00))).toMatchObject({ ok: false, reason: 'binary' });
  });

  test('other control bytes are refused with their line; tab, LF and CR are text', () => {
    expect(decodeText(utf8('a\tb\r\nc\n'))).toMatchObject({ ok: true });
    const r = decodeText(utf8('a,b\nc\u0007,d\n'));
    expect(r).toMatchObject({ ok: false, reason: 'binary' });
    if (!r.ok) expect(r.message).toContain('0x07 on line 2');
  });

  test('UTF-16 without BOM is refused and named, little- and big-endian', () => {
    const le = decodeText(utf16le(SAMPLE, false));
    expect(le).toMatchObject({ ok: false, reason: 'utf16-without-bom' });
    if (!le.ok) expect(le.message).toMatch(/looks like UTF-16 \(little-endian\) without a byte-order mark: that is none of the encodings Leeway reads/);
    const be = decodeText(utf16be(SAMPLE, false));
    expect(be).toMatchObject({ ok: false, reason: 'utf16-without-bom' });
    if (!be.ok) expect(be.message).toMatch(/big-endian/);
  });

  test('valid UTF-8 characters and non-UTF-8 bytes in one file: refused (either reading garbles part of it)', () => {
    const mixed = new Uint8Array([...utf8('µmol/L\n'), ...cp1252('Créatinine\n')]);
    const r = decodeText(mixed);
    expect(r).toMatchObject({ ok: false, reason: 'mixed' });
    if (!r.ok) expect(r.message).toMatch(/line 1 holds UTF-8 characters, but byte 0xE9 on line 2 is not UTF-8/);
  });

  test('a BOM followed by bytes that are not its encoding, odd UTF-16, a broken surrogate, UTF-32', () => {
    expect(decodeText(new Uint8Array([0xef, 0xbb, 0xbf, ...cp1252('Créatinine')]))).toMatchObject({ ok: false, reason: 'bad-utf8-after-bom' });
    expect(decodeText(bytes(0xff, 0xfe, 0x41, 0x00, 0x42))).toMatchObject({ ok: false, reason: 'bad-utf16' });
    expect(decodeText(bytes(0xff, 0xfe, 0x00, 0xd8, 0x41, 0x00))).toMatchObject({ ok: false, reason: 'bad-utf16' });
    expect(decodeText(bytes(0xff, 0xfe, 0x00, 0xd8))).toMatchObject({ ok: false, reason: 'bad-utf16' });
    expect(decodeText(bytes(0xff, 0xfe, 0x00, 0x00, 0x41, 0x00, 0x00, 0x00))).toMatchObject({ ok: false, reason: 'utf32' });
  });
});

describe('UTF-8 validation and decoding against the reference decoder', () => {
  test('property: scanUtf8 finds an error exactly when a fatal TextDecoder throws (seed 20260301, 20,000 byte strings)', () => {
    const rand = mulberry32(20260301);
    const fatal = new TextDecoder('utf-8', { fatal: true });
    // Bytes drawn mostly from the ranges that make UTF-8 interesting: lead bytes, continuations, edges.
    const pool = [0x41, 0x0a, 0x7f, 0x80, 0x8f, 0x90, 0x9f, 0xa0, 0xbf, 0xc0, 0xc1, 0xc2, 0xdf, 0xe0, 0xe1, 0xec, 0xed, 0xee, 0xef, 0xf0, 0xf1, 0xf3, 0xf4, 0xf5, 0xff];
    for (let k = 0; k < 20000; k++) {
      const n = 1 + Math.floor(rand() * 6);
      const b = new Uint8Array(n);
      for (let i = 0; i < n; i++) b[i] = pool[Math.floor(rand() * pool.length)];
      let valid = true;
      try {
        fatal.decode(b);
      } catch {
        valid = false;
      }
      expect({ b: Array.from(b), valid: scanUtf8(b, 0).firstInvalid < 0 }).toEqual({ b: Array.from(b), valid });
    }
  });

  test('without a platform TextDecoder the decoder gives the same text (the fallback path)', () => {
    const saved = (globalThis as { TextDecoder?: unknown }).TextDecoder;
    try {
      delete (globalThis as { TextDecoder?: unknown }).TextDecoder;
      const text = SAMPLE + 'ﬁ € 𝜇 z\n';
      expect(decodeText(utf8(text))).toEqual({ ok: true, text, encoding: 'UTF-8' });
    } finally {
      (globalThis as { TextDecoder?: unknown }).TextDecoder = saved;
    }
  });

  test('property: no decoded text ever holds U+FFFD (seed 7, 2,000 random byte strings)', () => {
    const rand = mulberry32(7);
    for (let k = 0; k < 2000; k++) {
      const b = new Uint8Array(1 + Math.floor(rand() * 40));
      for (let i = 0; i < b.length; i++) b[i] = 0x20 + Math.floor(rand() * 0xe0);
      const r = decodeText(b);
      if (r.ok) expect(r.text.includes('\uFFFD')).toBe(false);
      else expect(r.message.length).toBeGreaterThan(20);
    }
  });
});
