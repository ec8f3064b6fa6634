/**
 * The Results sheet: every control result as read from the file, the analytes one after another
 * (file order within each). Each analyte's rows form one block, and the flags on the material
 * sheets are QC.FLAGS over that block: all materials of the analyte read together, as the rule's
 * across-material terms need.
 */
import type { AnalyteReview } from './model';
import type { ReviewContext } from './context';
import { reviewSheet } from './context';

export const RESULTS_SHEET = 'Results';

/** Columns of the Results sheet, fixed so formulas can name them. */
export const RESULTS_COLUMNS = { line: 'A', analyte: 'B', level: 'C', run: 'D', date: 'E', value: 'F', target: 'G', sd: 'H' } as const;

/** Where an analyte's block lies on the Results sheet (sheet rows, inclusive). */
export interface Block {
  readonly first: number;
  readonly last: number;
}

const OPTIONAL = ['unit', 'lot', 'instrument', 'note'] as const;
const OPTIONAL_HEADERS: Record<(typeof OPTIONAL)[number], string> = { unit: 'Unit', lot: 'Lot', instrument: 'Instrument', note: 'Note' };

/** An absolute reference to one column of a block: Results!$F$12:$F$745. */
export function blockRange(block: Block, column: string): string {
  return `${RESULTS_SHEET}!$${column}$${block.first}:$${column}$${block.last}`;
}

/** Writes the Results sheet; returns each analyte's block, in the order of `analytes`. */
export function writeResultsSheet(ctx: ReviewContext, analytes: readonly AnalyteReview[]): Block[] {
  const doc = reviewSheet(ctx, RESULTS_SHEET, 'Control results as read');
  const optional = OPTIONAL.filter((f) => analytes.some((a) => a.results.some((r) => r[f] !== '')));
  doc.printTitle(doc.header(['Row in file', 'Analyte', 'Material', 'Run', 'Date', 'Value', 'Target', 'SD', ...optional.map((f) => OPTIONAL_HEADERS[f])]));
  const blocks: Block[] = [];
  for (const a of analytes) {
    const first = doc.row;
    // A body of plain rows: the sheet holds every result of the file.
    for (const r of a.results) doc.bodyLine([r.line, r.analyte, r.level, r.run, r.date ?? '', r.value, r.target, r.sd, ...optional.map((f) => r[f])]);
    blocks.push({ first, last: doc.row - 1 });
  }
  doc.finish();
  return blocks;
}
