/**
 * Texts every filled sheet carries: the caution and the demo marker. The task pane shows the
 * same constants.
 */

export { CAUTION, DEMO_MARKER } from '../caution';

/**
 * Splits text into lines of at most `width` characters at spaces. A longer word stays whole, or
 * with `hard` is cut into pieces of at most `width` characters: after a "/" or "\\" where it
 * can (a file path), else anywhere (a SHA-256).
 */
export function wrapText(text: string, width: number, hard = false): string[] {
  const lines: string[] = [];
  let line = '';
  const words = text.split(/\s+/).filter(Boolean);
  const pieces = hard ? words.flatMap((w) => (w.length <= width ? [w] : cutWord(w, width))) : words;
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

function cutWord(word: string, width: number): string[] {
  const out: string[] = [];
  let rest = word;
  while (rest.length > width) {
    const head = rest.slice(0, width);
    const sep = Math.max(head.lastIndexOf('/'), head.lastIndexOf('\\'));
    const cut = sep >= width / 2 ? sep + 1 : width;
    out.push(rest.slice(0, cut));
    rest = rest.slice(cut);
  }
  if (rest) out.push(rest);
  return out;
}
