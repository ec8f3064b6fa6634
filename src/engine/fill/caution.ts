/**
 * Texts every filled sheet carries: the caution of SPEC.md section 9 and the demo marker of
 * section 8. The task pane shows the same constants.
 */

export { CAUTION, DEMO_MARKER } from '../caution';

/** Splits text into lines of at most `width` characters at spaces (a longer word stays whole). */
export function wrapText(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
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
