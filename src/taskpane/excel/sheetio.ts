/**
 * The task pane's Excel I/O behind one narrow interface. Every call is one Excel.run; a fill
 * loads what it needs in one sync (the target cells, to check that nothing changed since the
 * plan was made) and writes everything in one more: two syncs whatever the number of rows.
 * Writes are grouped into column runs, so the number of range objects grows with the columns,
 * not the rows. This file only executes a FillPlan; every decision is the planner's.
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
}

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

/** Column runs: contiguous rows of one column with one number format and one role style. */
export function columnRuns(cells: readonly PlannedCell[]): PlannedCell[][] {
  const byCol = new Map<number, PlannedCell[]>();
  for (const c of cells) {
    const list = byCol.get(c.col);
    if (list) list.push(c);
    else byCol.set(c.col, [c]);
  }
  const runs: PlannedCell[][] = [];
  for (const col of [...byCol.keys()].sort((a, b) => a - b)) {
    const list = byCol.get(col)!.sort((a, b) => a.row - b.row);
    let run: PlannedCell[] = [];
    for (const c of list) {
      const prev = run[run.length - 1];
      if (prev && (c.row !== prev.row + 1 || c.format !== prev.format || ROLE_STYLES[c.role] !== ROLE_STYLES[prev.role])) {
        runs.push(run);
        run = [];
      }
      run.push(c);
    }
    if (run.length) runs.push(run);
  }
  return runs;
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
  if (plan.cells.length === 0) throw new FillWriteError('empty-plan', 'the plan has no cells to write');
}

export function createSheetIO(run: ExcelRun, options: SheetIOOptions = {}): SheetIO {
  const notes = options.notes ?? 'notes';
  return {
    async readUsed(sheetName, address) {
      return run(async (context) => {
        const sheet = context.workbook.worksheets.getItem(sheetName);
        const range = address ? sheet.getRange(address) : sheet.getUsedRangeOrNullObject(true);
        range.load(['isNullObject', 'formulas', 'rowIndex', 'columnIndex']);
        await context.sync();
        if (range.isNullObject) return { name: sheetName, origin: { row: 1, col: 1 }, cells: [] };
        return {
          name: sheetName,
          origin: { row: range.rowIndex + 1, col: range.columnIndex + 1 },
          cells: (range.formulas as unknown[][]).map((r) => r.map(fromExcel)),
        };
      });
    },

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
      return run(async (context) => {
        const sheet = plan.target === 'new-sheet' ? context.workbook.worksheets.add(plan.sheetName) : context.workbook.worksheets.getItem(plan.sheetName);
        // Sync 1: read the rectangle the plan covers, to find cells changed since planning.
        const b = bounds(plan.cells);
        const probe = sheet.getRange(a1Range({ row: b.top, col: b.left }, { row: b.bottom, col: b.right }));
        probe.load('formulas');
        await context.sync();
        const now = probe.formulas as unknown[][];
        const confirmed = new Set(plan.overwrite ? plan.conflicts.map((c) => c.address) : []);
        const changed: string[] = [];
        for (const c of plan.cells) {
          const v = fromExcel(now[c.row - b.top]?.[c.col - b.left]);
          if (v !== null && !confirmed.has(c.address)) changed.push(c.address);
        }
        if (changed.length) {
          throw new FillWriteError('changed', `cells changed since the fill was planned (${changed.slice(0, 5).join(', ')}${changed.length > 5 ? ', …' : ''}): nothing was written; plan the fill again`);
        }

        // Sync 2: everything else.
        context.application.suspendApiCalculationUntilNextSync();
        for (const run of columnRuns(plan.cells)) {
          const first = run[0];
          const last = run[run.length - 1];
          const range = sheet.getRange(a1Range({ row: first.row, col: first.col }, { row: last.row, col: first.col }));
          if (first.format !== undefined) range.numberFormat = run.map((c) => [c.format ?? 'General']);
          range.formulas = run.map((c) => [excelInput(c.content)]);
          const style = ROLE_STYLES[first.role];
          if (style) {
            if (style.bold) range.format.font.bold = true;
            if (style.italic) range.format.font.italic = true;
            if (style.size) range.format.font.size = style.size;
            if (style.color) range.format.font.color = style.color;
            if (style.fill) range.format.fill.color = style.fill;
            if (style.wrap) range.format.wrapText = true;
            if (style.bottomBorder) range.format.borders.getItem('EdgeBottom').style = 'Continuous';
          }
        }
        const tierCell = sheet.getRange(plan.tierCell.replace(/\$/g, ''));
        tierCell.dataValidation.clear();
        tierCell.dataValidation.rule = { list: { inCellDropDown: true, source: TIER_CHOICES } };
        if (notes !== 'none') {
          for (const c of plan.cells) {
            if (!c.note) continue;
            if (notes === 'notes') sheet.notes.add(c.address, c.note);
            else context.workbook.comments.add(`${plan.sheetName}!${c.address}`, c.note);
          }
        }
        for (const [col, chars] of Object.entries(plan.columnWidths)) {
          const letter = columnLetters(Number(col));
          sheet.getRange(`${letter}:${letter}`).format.columnWidth = chars * POINTS_PER_CHARACTER;
        }
        if (plan.target === 'new-sheet') sheet.activate();
        await context.sync();
        return { sheetName: plan.sheetName, cellsWritten: plan.cells.length, overwritten: [...confirmed] };
      });
    },
  };
}

/** The SheetIO on the real Excel host. */
export function excelSheetIO(options: SheetIOOptions = {}): SheetIO {
  return createSheetIO((batch) => Excel.run(batch), options);
}
