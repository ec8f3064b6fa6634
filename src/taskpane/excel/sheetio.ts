/**
 * The task pane's Excel I/O behind one narrow interface. Every call is one Excel.run; a fill
 * loads what it needs in one sync (the target cells, to check that nothing changed since the
 * plan was made) and writes everything in one more: two syncs whatever the number of rows.
 * Writes are grouped into column runs (null entries leave a cell as it is), so the number of
 * range objects grows with the columns, not the rows. A template's provenance goes to a sheet of
 * its own when the plan says so, in the same batch. Reading a template loads the used range's
 * size first and then at most READ_CELL_LIMIT cells, so a stray value far away costs nothing.
 * This file only executes a FillPlan; every decision is the planner's.
 */
import type { CellContent, FillPlan, PlannedCell, SheetSnapshot, ExistingCell } from '../../engine/fill';
import { a1Range, columnLetters, needsTextGuard } from '../../engine/fill';
import { POINTS_PER_CHARACTER, ROLE_STYLES, TIER_CHOICES } from './styles';

/** Excel.run's shape, so tests can hand in office-addin-mock's. */
export type ExcelRun = <T>(batch: (context: Excel.RequestContext) => Promise<T>) => Promise<T>;

/** A rectangle read from a sheet: values (formulas as "=…"), 1-based origin. */
export interface RangeRead {
  readonly sheetName: string;
  /** The address as Excel reports it, e.g. "Sheet1!B2:F9". */
  readonly address: string;
  readonly origin: { readonly row: number; readonly col: number };
  readonly values: (string | number | boolean | null)[][];
}

export interface WriteReport {
  readonly sheetName: string;
  readonly cellsWritten: number;
  /** Addresses of non-empty cells that were overwritten (the plan's confirmed conflicts). */
  readonly overwritten: readonly string[];
}

export interface SheetIO {
  /** The used range of a sheet (or the given address on it) as a snapshot for planFill's template target. */
  readUsed(sheetName: string, address?: string): Promise<SheetSnapshot>;
  /** The user's selection (for importing a table from a range). */
  readSelection(): Promise<RangeRead>;
  /** The workbook's sheet names, in tab order. */
  sheetNames(): Promise<string[]>;
  /** Executes a writable plan. Refuses a plan with unconfirmed conflicts, or when a target cell changed since the plan was made. */
  write(plan: FillPlan): Promise<WriteReport>;
}

export type FillWriteErrorCode = 'not-writable' | 'changed' | 'empty-plan';

/** A refused write; the message is for the user. */
export class FillWriteError extends Error {
  readonly code: FillWriteErrorCode;
  constructor(code: FillWriteErrorCode, message: string) {
    super(message);
    this.code = code;
    this.name = 'FillWriteError';
  }
}

export interface SheetIOOptions {
  /** How header notes are attached: worksheet notes (ExcelApi 1.18), threaded comments (ExcelApi 1.10), or not at all. Default "notes". */
  readonly notes?: 'notes' | 'comments' | 'none';
  /** readUsed also reads merged areas (ExcelApi 1.13) and the widths of the first columns. Default false. */
  readonly layout?: boolean;
}

/** The most cells readUsed loads: a used range stretched by a far stray value is read only from its first rows. */
export const READ_CELL_LIMIT = 1_000_000;
/** Column widths read for placing the provenance block (the table's first columns). */
const WIDTH_COLUMNS = 64;

/** What to hand Excel's formula setter so the cell ends up holding exactly the planned content. */
export function excelInput(c: CellContent): string | number {
  switch (c.kind) {
    case 'number':
      return c.value;
    case 'formula':
      return c.formula;
    case 'error':
      return c.error.error;
    case 'text':
      return needsTextGuard(c.text) ? `'${c.text}` : c.text;
  }
}

function fromExcel(v: unknown): ExistingCell {
  if (v === '' || v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  return String(v);
}

/**
 * One rectangle of one column to write: `cells[i]` is the planned cell of row top + i, or null
 * for a row the plan does not touch. Excel leaves a cell unchanged when its entry in a 2-D
 * values, formulas or numberFormat array is null (Office Add-ins documentation, "Blank and null
 * values in Excel add-ins").
 */
export interface ColumnRun {
  readonly col: number;
  readonly top: number;
  readonly cells: readonly (PlannedCell | null)[];
}

/**
 * The plan's cells grouped into column runs. Unstyled cells of one column and one number format
 * form one run from their first to their last row, gaps as nulls, so the number of ranges does
 * not grow with the rows even when some rows leave a column blank. Styled cells (headers, the
 * block) form runs of contiguous rows, so no style reaches a cell the plan does not write.
 */
export function columnRuns(cells: readonly PlannedCell[]): ColumnRun[] {
  const groups = new Map<string, PlannedCell[]>();
  for (const c of cells) {
    const styled = ROLE_STYLES[c.role] !== undefined;
    const key = styled ? `${c.col}|s|${c.role}|${c.format ?? ''}` : `${c.col}|u|${c.format ?? ''}`;
    const list = groups.get(key);
    if (list) list.push(c);
    else groups.set(key, [c]);
  }
  const runs: ColumnRun[] = [];
  for (const [key, list] of groups) {
    list.sort((a, b) => a.row - b.row);
    const styled = key.includes('|s|');
    let start = 0;
    for (let i = 1; i <= list.length; i++) {
      if (i < list.length && (!styled || list[i].row === list[i - 1].row + 1)) continue;
      const part = list.slice(start, i);
      const top = part[0].row;
      const span: (PlannedCell | null)[] = new Array(part[part.length - 1].row - top + 1).fill(null);
      for (const c of part) span[c.row - top] = c;
      runs.push({ col: part[0].col, top, cells: span });
      start = i;
    }
  }
  return runs.sort((a, b) => a.col - b.col || a.top - b.top);
}

function bounds(cells: readonly PlannedCell[]): { top: number; left: number; bottom: number; right: number } {
  let top = Infinity;
  let left = Infinity;
  let bottom = 0;
  let right = 0;
  for (const c of cells) {
    top = Math.min(top, c.row);
    left = Math.min(left, c.col);
    bottom = Math.max(bottom, c.row);
    right = Math.max(right, c.col);
  }
  return { top, left, bottom, right };
}

/** Checks a plan before anything is sent to Excel. */
export function assertWritable(plan: FillPlan): void {
  if (!plan.writable) {
    throw new FillWriteError('not-writable', `${plan.conflicts.length} target cell${plan.conflicts.length === 1 ? '' : 's'} already hold something (${plan.conflicts.slice(0, 5).map((c) => c.address).join(', ')}${plan.conflicts.length > 5 ? ', …' : ''}): confirm overwriting them, or choose another place`);
  }
  if (plan.cells.length === 0 && !plan.blockSheet?.cells.length) throw new FillWriteError('empty-plan', 'the plan has no cells to write');
}

/** The used range (or `address`) of a sheet as a snapshot, in two syncs. */
async function readUsedIn(context: Excel.RequestContext, sheetName: string, address: string | undefined, options: SheetIOOptions): Promise<SheetSnapshot> {
  const sheet = context.workbook.worksheets.getItem(sheetName);
  const range = address ? sheet.getRange(address) : sheet.getUsedRangeOrNullObject(true);
  range.load(['isNullObject', 'rowIndex', 'columnIndex', 'rowCount', 'columnCount']);
  await context.sync();
  if (range.isNullObject) return { name: sheetName, origin: { row: 1, col: 1 }, cells: [] };
  // A used range far larger than any template (a stray value at ZZ200000) is read from its first rows only.
  const rows = Math.min(range.rowCount, Math.max(1, Math.floor(READ_CELL_LIMIT / Math.max(1, range.columnCount))));
  const part = rows < range.rowCount ? range.getResizedRange(rows - range.rowCount, 0) : range;
  part.load('formulas');
  const merged = options.layout ? part.getMergedAreasOrNullObject() : undefined;
  merged?.load(['isNullObject', 'areas/items/rowIndex', 'areas/items/columnIndex', 'areas/items/rowCount', 'areas/items/columnCount']);
  const widths = options.layout ? Array.from({ length: Math.min(WIDTH_COLUMNS, range.columnIndex + range.columnCount) }, (_, i) => sheet.getCell(0, i).format) : [];
  for (const w of widths) w.load('columnWidth');
  await context.sync();
  const columnWidths: Record<number, number> = {};
  widths.forEach((w, i) => (columnWidths[i + 1] = w.columnWidth / POINTS_PER_CHARACTER));
  return {
    name: sheetName,
    origin: { row: range.rowIndex + 1, col: range.columnIndex + 1 },
    cells: (part.formulas as unknown[][]).map((r) => r.map(fromExcel)),
    ...(merged && !merged.isNullObject ? { merges: merged.areas.items.map((a) => ({ top: a.rowIndex + 1, left: a.columnIndex + 1, bottom: a.rowIndex + a.rowCount, right: a.columnIndex + a.columnCount })) } : {}),
    ...(widths.length ? { columnWidths } : {}),
    ...(rows < range.rowCount ? { readThrough: range.rowIndex + rows } : {}),
  };
}

/** Sync 1 of a write: refuses when a planned cell changed since planning (unless confirmed). */
async function assertUnchanged(context: Excel.RequestContext, sheet: Excel.Worksheet, plan: FillPlan, confirmed: ReadonlySet<string>): Promise<void> {
  if (!plan.cells.length) return;
  const b = bounds(plan.cells);
  const probe = sheet.getRange(a1Range({ row: b.top, col: b.left }, { row: b.bottom, col: b.right }));
  probe.load('formulas');
  await context.sync();
  const now = probe.formulas as unknown[][];
  const changed: string[] = [];
  for (const c of plan.cells) {
    const v = fromExcel(now[c.row - b.top]?.[c.col - b.left]);
    if (v !== null && !confirmed.has(c.address)) changed.push(c.address);
  }
  if (changed.length) {
    throw new FillWriteError('changed', `cells changed since the fill was planned (${changed.slice(0, 5).join(', ')}${changed.length > 5 ? ', …' : ''}): nothing was written; plan the fill again`);
  }
}

function applyStyle(range: Excel.Range, role: PlannedCell['role']): void {
  const style = ROLE_STYLES[role];
  if (!style) return;
  if (style.bold) range.format.font.bold = true;
  if (style.italic) range.format.font.italic = true;
  if (style.size) range.format.font.size = style.size;
  if (style.color) range.format.font.color = style.color;
  if (style.fill) range.format.fill.color = style.fill;
  if (style.wrap) range.format.wrapText = true;
  if (style.bottomBorder) range.format.borders.getItem('EdgeBottom').style = 'Continuous';
}

/** Queues the cells of one sheet (one range per column run), their notes and column widths. */
function queueCells(context: Excel.RequestContext, target: Excel.Worksheet, name: string, cells: readonly PlannedCell[], widths: Readonly<Record<number, number>>, notes: NonNullable<SheetIOOptions['notes']>): void {
  for (const run of columnRuns(cells)) {
    const first = run.cells[0]!;
    const range = target.getRange(a1Range({ row: run.top, col: run.col }, { row: run.top + run.cells.length - 1, col: run.col }));
    if (first.format !== undefined) range.numberFormat = run.cells.map((c) => [c ? c.format ?? 'General' : null]) as string[][];
    range.formulas = run.cells.map((c) => [c ? excelInput(c.content) : null]) as (string | number)[][];
    applyStyle(range, first.role);
  }
  if (notes !== 'none') {
    for (const c of cells) {
      if (!c.note) continue;
      if (notes === 'notes') target.notes.add(c.address, c.note);
      else context.workbook.comments.add(`${name}!${c.address}`, c.note);
    }
  }
  for (const [col, chars] of Object.entries(widths)) {
    const letter = columnLetters(Number(col));
    target.getRange(`${letter}:${letter}`).format.columnWidth = chars * POINTS_PER_CHARACTER;
  }
}

/** A writable plan in two syncs: the check that nothing changed, then everything else. */
async function writeIn(context: Excel.RequestContext, plan: FillPlan, notes: NonNullable<SheetIOOptions['notes']>): Promise<WriteReport> {
  const sheet = plan.target === 'new-sheet' ? context.workbook.worksheets.add(plan.sheetName) : context.workbook.worksheets.getItem(plan.sheetName);
  const confirmed = new Set(plan.overwrite ? plan.conflicts.map((c) => c.address) : []);
  await assertUnchanged(context, sheet, plan, confirmed);
  // Sync 2: everything else; the provenance block on a sheet of its own when the plan says so.
  context.application.suspendApiCalculationUntilNextSync();
  const blockSheet = plan.blockSheet ? context.workbook.worksheets.add(plan.blockSheet.name) : undefined;
  queueCells(context, sheet, plan.sheetName, plan.cells, plan.columnWidths, notes);
  if (blockSheet && plan.blockSheet) queueCells(context, blockSheet, plan.blockSheet.name, plan.blockSheet.cells, plan.blockSheet.columnWidths, notes);
  const tierCell = (blockSheet ?? sheet).getRange(plan.tierCell.replace(/^.*!/, '').replace(/\$/g, ''));
  tierCell.dataValidation.clear();
  tierCell.dataValidation.rule = { list: { inCellDropDown: true, source: TIER_CHOICES } };
  if (plan.target === 'new-sheet') sheet.activate();
  await context.sync();
  return { sheetName: plan.sheetName, cellsWritten: plan.cells.length + (plan.blockSheet?.cells.length ?? 0), overwritten: [...confirmed] };
}

export function createSheetIO(run: ExcelRun, options: SheetIOOptions = {}): SheetIO {
  const notes = options.notes ?? 'notes';
  return {
    readUsed: (sheetName, address) => run((context) => readUsedIn(context, sheetName, address, options)),
    async readSelection() {
      return run(async (context) => {
        const range = context.workbook.getSelectedRange();
        range.load(['address', 'values', 'rowIndex', 'columnIndex']);
        range.worksheet.load('name');
        await context.sync();
        return {
          sheetName: range.worksheet.name,
          address: range.address,
          origin: { row: range.rowIndex + 1, col: range.columnIndex + 1 },
          values: (range.values as unknown[][]).map((r) => r.map(fromExcel)),
        };
      });
    },
    async sheetNames() {
      return run(async (context) => {
        const sheets = context.workbook.worksheets;
        sheets.load('items/name');
        await context.sync();
        return sheets.items.map((s) => s.name);
      });
    },
    async write(plan) {
      assertWritable(plan);
      return run((context) => writeIn(context, plan, notes));
    },
  };
}

/** The SheetIO on the real Excel host. */
export function excelSheetIO(options: SheetIOOptions = {}): SheetIO {
  return createSheetIO((batch) => Excel.run(batch), options);
}
