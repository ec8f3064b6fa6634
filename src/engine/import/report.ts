/**
 * An import report as lines of text (the command line prints them; the task pane shows the same
 * facts in its own layout): how the file was read and how each header was mapped, then one line
 * per problem, then the counts.
 */
import type { ImportColumn, ImportProblem, ImportReport } from './types';

/** One problem as one line: "row 4, column C (cvi): error: cvi must not be negative (got -2)". */
export function formatProblem(p: ImportProblem): string {
  if (p.row === 0) return `file: ${p.severity}: ${p.message}`;
  if (p.column === null && p.field === undefined) return `row ${p.row}: ${p.severity}: ${p.message}`;
  const where = p.column === null ? `row ${p.row}, column ${p.field ?? '?'} (missing)` : `row ${p.row}, column ${p.column}${p.field ? ` (${p.field})` : ''}`;
  return `${where}: ${p.severity}: ${p.message}`;
}

/** The problems, one line each, then a count. */
export function formatReport(result: ImportReport): string[] {
  const lines = result.problems.map(formatProblem);
  const n = (k: number, w: string): string => `${k} ${w}${k === 1 ? '' : 's'}`;
  lines.push(`${n(result.rowCount, 'data row')}, ${n(result.errorCount, 'error')}, ${n(result.warningCount, 'warning')}`);
  return lines;
}

/** The separator as the report names it. */
export function separatorName(delimiter: string): string {
  return delimiter === '\t' ? 'tab' : `"${delimiter}"`;
}

/** How the decimal mark was settled, in a few words ('' when no number was read). */
export function decimalText(result: ImportReport): string {
  const d = result.decimal;
  if (!d) return '';
  switch (d.by) {
    case 'numbers':
      return `decimal mark "${d.mark}" (shown by the numbers)`;
    case 'separator':
      return 'decimal comma (from the ";" separator)';
    case 'mixed':
      return 'decimal marks "," and "." both shown (a value that could be either is an error)';
    case 'none':
      return 'no number shows its decimal mark';
  }
}

/** "→ limit_abs, unit mmol/L (another name)" for one column. */
export function columnText(c: ImportColumn): string {
  if (c.field === null) return `${c.by === 'user' ? 'ignored (your mapping)' : 'ignored'}`;
  const by = c.by === 'alias' ? ' (another name)' : c.by === 'user' ? ' (your mapping)' : '';
  return `${c.field}${c.unit !== undefined ? `, unit ${c.unit}` : ''}${by}`;
}

/**
 * How the file was read: one line with the encoding, separator and decimal mark found, then one
 * line per column with its header and the field it feeds (and the unit its header states).
 */
export function formatReading(result: ImportReport): string[] {
  const facts = [
    result.encoding ? `encoding ${result.encoding}` : '',
    result.delimiter ? `separator ${separatorName(result.delimiter)}` : '',
    decimalText(result),
  ].filter((s) => s !== '');
  const lines = facts.length ? [`read: ${facts.join(', ')}`] : [];
  for (const c of result.columns) {
    lines.push(`column ${c.letter} ${c.header === '' ? '(no header)' : `"${c.header}"`} → ${columnText(c)}`);
  }
  return lines;
}
