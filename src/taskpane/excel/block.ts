/**
 * Writes a block of formulas and values beside the user's data (the verification figures, the
 * control flags and review) in one Excel.run with two syncs: the first reads what the covered
 * cells hold and the widths of their columns, the second writes everything. A covered cell that
 * is not empty stops the write before anything is sent, unless the user confirmed replacing it:
 * the user's data is never lost by accident. Columns are widened to the block's least widths,
 * never narrowed.
 */
import type { BlockArea, BlockCell, BlockOutcome, BlockStyle, BlockWrite } from '../host';
import { HostError, OccupiedError } from '../host';
import { a1, a1Range, columnLetters, needsTextGuard, MAX_COLUMNS, MAX_ROWS } from '../../engine/fill';
import { POINTS_PER_CHARACTER, ROLE_STYLES } from './styles';
import type { RoleStyle } from './styles';

const STYLE_OF: Readonly<Record<BlockStyle, RoleStyle | undefined>> = {
  title: ROLE_STYLES.title,
  demo: ROLE_STYLES.demo,
  header: ROLE_STYLES.header,
  label: ROLE_STYLES.label,
  caution: ROLE_STYLES.caution,
  provenance: undefined,
  figure: undefined,
};

/** What to hand Excel's formula setter so the cell holds exactly this content. */
export function blockInput(c: BlockCell): string | number {
  const k = c.content;
  if (k.kind === 'number') return k.value;
  if (k.kind === 'formula') return k.formula;
  return needsTextGuard(k.text) ? `'${k.text}` : k.text;
}

function extent(area: BlockArea): { rows: number; cols: number } {
  const rows = area.cells.length;
  const cols = rows ? area.cells[0].length : 0;
  if (!rows || !cols || area.cells.some((r) => r.length !== cols)) throw new HostError('the block to write is empty or not rectangular');
  if (area.row < 1 || area.col < 1 || area.row + rows - 1 > MAX_ROWS || area.col + cols - 1 > MAX_COLUMNS) {
    throw new HostError(`the block does not fit on the sheet (it would reach row ${area.row + rows - 1}, column ${area.col + cols - 1})`);
  }
  return { rows, cols };
}

export function areaAddress(area: BlockArea): string {
  const { rows, cols } = extent(area);
  return a1Range({ row: area.row, col: area.col }, { row: area.row + rows - 1, col: area.col + cols - 1 });
}

function occupied(v: unknown): boolean {
  return v !== '' && v !== null && v !== undefined;
}

function styleRange(range: Excel.Range, style: RoleStyle): void {
  if (style.bold) range.format.font.bold = true;
  if (style.italic) range.format.font.italic = true;
  if (style.size) range.format.font.size = style.size;
  if (style.color) range.format.font.color = style.color;
  if (style.fill) range.format.fill.color = style.fill;
  if (style.bottomBorder) range.format.borders.getItem('EdgeBottom').style = 'Continuous';
}

/** One area's formulas and formats as whole-rectangle arrays; styles cell by cell where set. */
function writeArea(sheet: Excel.Worksheet, area: BlockArea, clear: boolean): number {
  const range = sheet.getRange(areaAddress(area));
  // Null leaves a cell as it is; a confirmed overwrite clears the spill room too.
  range.formulas = area.cells.map((r) => r.map((c) => (c ? blockInput(c) : clear ? '' : null))) as (string | number)[][];
  range.numberFormat = area.cells.map((r) => r.map((c) => (c ? c.format ?? 'General' : null))) as string[][];
  let written = 0;
  area.cells.forEach((r, i) =>
    r.forEach((c, j) => {
      if (!c) return;
      written++;
      const style = c.style ? STYLE_OF[c.style] : undefined;
      if (style) styleRange(sheet.getRange(a1({ row: area.row + i, col: area.col + j })), style);
    }),
  );
  return written;
}

/** Executes a block write in one batch (two syncs). */
export async function writeBlockTo(context: Excel.RequestContext, req: BlockWrite): Promise<BlockOutcome> {
  if (!req.areas.length) throw new HostError('there is nothing to write');
  const sheet = context.workbook.worksheets.getItem(req.sheet);
  const probes = req.areas.map((area) => {
    const r = sheet.getRange(areaAddress(area));
    r.load('formulas');
    const widths = (area.widths ?? []).map((_w, j) => {
      const f = sheet.getRange(a1({ row: area.row, col: area.col + j })).format;
      f.load('columnWidth');
      return f;
    });
    return { area, r, widths };
  });
  await context.sync();
  const taken: string[] = [];
  for (const { area, r } of probes) {
    (r.formulas as unknown[][]).forEach((row, i) =>
      row.forEach((v, j) => {
        if (occupied(v)) taken.push(a1({ row: area.row + i, col: area.col + j }));
      }),
    );
  }
  if (taken.length && !req.overwrite) throw new OccupiedError(taken);

  context.application.suspendApiCalculationUntilNextSync();
  let cells = 0;
  for (const { area, widths } of probes) {
    cells += writeArea(sheet, area, req.overwrite);
    widths.forEach((f, j) => {
      const want = (area.widths as readonly number[])[j] * POINTS_PER_CHARACTER;
      if (f.columnWidth < want) {
        const letter = columnLetters(area.col + j);
        sheet.getRange(`${letter}:${letter}`).format.columnWidth = want;
      }
    });
  }
  await context.sync();
  return { sheet: req.sheet, addresses: req.areas.map(areaAddress), cells, overwritten: taken };
}
