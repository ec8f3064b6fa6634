/**
 * Texts every filled sheet carries: the caution of SPEC.md section 9 and the demo marker of
 * section 8. The task pane shows the same constants.
 */

export const CAUTION =
  'These figures support, and do not replace, the judgement of the laboratory director. Quality ' +
  'specifications, control rules and uncertainty estimates must be set and approved under the ' +
  "laboratory's own quality system and local regulations and accreditation rules; biological-variation " +
  'data must come from a critically appraised source.';

export const DEMO_MARKER = 'DEMO — invented data, not for clinical use';

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
