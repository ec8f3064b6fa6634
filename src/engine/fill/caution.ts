/**
 * Texts every filled sheet carries: the caution and the demo marker. The task pane shows the
 * same constants.
 */

export { CAUTION, DEMO_MARKER } from '../caution';

/**
 * Splits text into lines of at most `width` characters at spaces. A longer word stays whole, or
 * with `hard` is cut into pieces of `width` characters (a file path, a SHA-256).
 */
export function wrapText(text: string, width: number, hard = false): string[] {
  const lines: string[] = [];
  let line = '';
  const words = text.split(/\s+/).filter(Boolean);
  const pieces = hard ? words.flatMap((w) => (w.length <= width ? [w] : (w.match(new RegExp(`.{1,${width}}`, 'gu')) ?? [w]))) : words;
  for (const word of pieces) {
    if (line === '') line = word;
    else if (line.length + 1 + word.length <= width) line += ' ' + word;
    else {
      lines.push(line);
      line = word;
    }
  }
  if (line) lines.push(line);
  return lines;
}
