/**
 * What every chart shares about text and coordinates. No font is measured: text is sized from a
 * generous width per character (CHAR_EM of the font size, an upper bound for common sans-serif
 * fonts), so a drawing does not depend on the font installed. Coordinates are written with two
 * decimals.
 */

/** The width of one character, in em: an upper bound for common sans-serif fonts. */
export const CHAR_EM = 0.62;

/** A coordinate with two decimals (never "-0.00"). */
export function f(x: number): string {
  const s = x.toFixed(2);
  return s === '-0.00' ? '0.00' : s;
}

/** Text escaped for XML content and attribute values. */
export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

/** Cuts text to at most `max` characters (code points), ending with "…" when cut. */
export function cut(text: string, max: number): string {
  const chars = Array.from(text);
  if (chars.length <= max) return text;
  if (max <= 1) return '…';
  return chars.slice(0, max - 1).join('') + '…';
}

/** How many characters of a font size fit in a width (at least 1). */
export function fits(width: number, fontSize: number): number {
  return Math.max(1, Math.floor(width / (CHAR_EM * fontSize)));
}

/** The estimated width of a text (an upper bound for common sans-serif fonts). */
export function textWidth(text: string, fontSize: number): number {
  return Array.from(text).length * CHAR_EM * fontSize;
}

/**
 * A key's entries laid out left to right from `left`, a new row whenever the next would pass
 * `right`: each entry's x and row, and the number of rows (0 without entries).
 */
export function flowKey(widths: readonly number[], left: number, right: number): { placed: Array<{ x: number; row: number }>; rows: number } {
  const placed: Array<{ x: number; row: number }> = [];
  let x = left;
  let row = 0;
  for (const w of widths) {
    if (x > left && x + w > right) {
      row++;
      x = left;
    }
    placed.push({ x, row });
    x += w;
  }
  return { placed, rows: widths.length ? row + 1 : 0 };
}
