/**
 * Text measured in spreadsheet column-width units (one unit = the width of the digit "0" in the
 * workbook's default font, how both Excel and LibreOffice count column widths), and the lines
 * it takes when wrapped. An estimate, not a font engine: each character counts by class, bold
 * text a little more, and every estimate errs wide so that text is never cut.
 *
 * Method: widths by character class relative to the digit width of a proportional sans font
 * (narrow i l . , ; space ≈ 0.5; f r t ( ) - / ≈ 0.7; digits 1; lower case ≈ 0.95; upper case
 * ≈ 1.2; m w ≈ 1.55; M W @ % ≈ 1.7; anything else 1.2). Against the fonts a workbook falls back
 * to on a machine without Calibri (DejaVu Sans, Liberation Sans) the estimate was checked by
 * rendering through LibreOffice (see docs/reference/printing.md); common practice, no source.
 */

/** Points of one wrapped line of 11-point text (a default row is 15 points). */
export const LINE_POINTS = 15;

/** Units added to every column for the cell's own margins. */
export const CELL_PADDING = 1.5;

const NARROW = new Set([...'il.,;:|!\'ij `']);
const SEMI = new Set([...'frt()[]{}-/"*']);
const WIDE_LOWER = new Set([...'mw']);
const WIDE = new Set([...'MW@%']);

function charUnits(ch: string): number {
  if (NARROW.has(ch)) return 0.5;
  if (SEMI.has(ch)) return 0.7;
  if (ch >= '0' && ch <= '9') return 1;
  if (WIDE_LOWER.has(ch)) return 1.55;
  if (WIDE.has(ch)) return 1.7;
  if (ch >= 'a' && ch <= 'z') return 0.95;
  if (ch >= 'A' && ch <= 'Z') return 1.2;
  return 1.2;
}

/** charUnits of the ASCII characters, looked up rather than worked out: every cell is measured several times. */
const ASCII_UNITS = Float64Array.from({ length: 128 }, (_, code) => charUnits(String.fromCharCode(code)));

export interface TextStyle {
  readonly bold?: boolean;
  /** Font size in points (11 default). */
  readonly size?: number;
}

/** The width of one line of text, in column-width units. */
export function textUnits(text: string, style: TextStyle = {}): number {
  let w = 0;
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code < 128) w += ASCII_UNITS[code];
    else {
      // A character beyond ASCII (a pair of UTF-16 units counts once, as before).
      const cp = text.codePointAt(i) as number;
      w += charUnits(String.fromCodePoint(cp));
      if (cp > 0xffff) i++;
    }
  }
  return w * (style.bold ? 1.1 : 1) * ((style.size ?? 11) / 11);
}

/** The width of the widest line of a text (lines split at line breaks). */
export function widestLine(text: string, style: TextStyle = {}): number {
  if (!text.includes('\n')) return textUnits(text, style);
  return Math.max(0, ...text.split('\n').map((l) => textUnits(l, style)));
}

/** The width of the longest word: a wrapped column narrower than this breaks a word. */
export function longestWord(text: string, style: TextStyle = {}): number {
  if (!/\s/.test(text)) return textUnits(text, style);
  return Math.max(0, ...text.split(/\s+/).map((w) => textUnits(w, style)));
}

/**
 * Lines a text takes wrapped into `width` units (the column width): greedy word wrap as
 * spreadsheet programs do it; a word longer than a line is broken across lines.
 */
export function wrappedLines(text: string, width: number, style: TextStyle = {}): number {
  const avail = Math.max(1, width - CELL_PADDING);
  const space = textUnits(' ', style);
  let lines = 0;
  for (const para of text.split('\n')) {
    let count = 0;
    let line = -1;
    for (const word of para.split(/\s+/).filter(Boolean)) {
      const w = textUnits(word, style);
      if (line >= 0 && line + space + w <= avail) {
        line += space + w;
        continue;
      }
      const n = Math.max(1, Math.ceil(w / avail));
      count += n;
      line = w - (n - 1) * avail;
    }
    lines += Math.max(1, count);
  }
  return Math.max(1, lines);
}

/** Points one column-width unit takes on paper at 100 % (7 pixels at 96 pixels an inch). */
export const POINTS_PER_UNIT = 5.25;

/**
 * Points a column of `units` width takes on paper at 100 %: Excel's pixels for a stored width,
 * truncate((256·w + truncate(128/7))/256 · 7) with a 7-pixel digit, at 96 pixels an inch
 * (ECMA-376 Part 1, col width, from memory).
 */
export function columnPoints(units: number): number {
  return Math.trunc(((256 * units + Math.trunc(128 / 7)) / 256) * 7) * 0.75;
}
