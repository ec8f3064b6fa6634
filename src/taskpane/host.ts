/**
 * The pane's narrow window onto the workbook. Every read and write the pane makes goes through
 * one PaneHost; the real one (excelHost in excel/host.ts) calls Excel.run with one batch per
 * task, and the browser tests hand in a fake that records what it was given. Nothing else in the
 * pane touches the Excel or Office globals.
 */
import type { GridCell } from '../engine/table';
import type { FillPlan, SheetSnapshot } from '../engine/fill';

/** A rectangle of cell values as Excel reports them (row-major). */
export interface CellGrid {
  readonly sheet: string;
  /** The address as Excel writes it, e.g. "Sheet1!B2:F14". */
  readonly address: string;
  /** 1-based sheet row and column of the top-left cell. */
  readonly firstRow: number;
  readonly firstColumn: number;
  readonly values: GridCell[][];
}

/** The used range of the active sheet and the row of the active cell. */
export interface ActiveSheet {
  readonly grid: CellGrid;
  /** 1-based sheet row of the active cell. */
  readonly activeRow: number;
}

/** The active cell as Excel shows it. */
export interface ActiveCell {
  readonly sheet: string;
  /** Without the sheet, e.g. "J7". */
  readonly address: string;
  /** The formula as Excel shows it ("" or the value for a plain cell). */
  readonly formula: string;
  readonly value: GridCell;
}

/** A reference to read: sheet null means the active sheet. */
export interface RangeRef {
  readonly sheet: string | null;
  readonly address: string;
}

/** One summary row: what the pane computed for one analyte. */
export interface SummaryRow {
  readonly analyte: string;
  readonly specimen: string;
  readonly tier: string;
  readonly allowable: number | string;
  readonly bias: number | string;
  readonly cv: number | string;
  readonly observedTotal: number | string;
  readonly sigma: number | string;
  readonly tierMet: string;
  readonly rule: string;
  readonly controls: number | string;
  readonly runs: number | string;
  readonly detection: number | string;
  readonly falseRejection: number | string;
  /** QC.RUNSIZE of the plan: patient results between QC events (acceptable risk 1). */
  readonly runSize: number | string;
}

export interface SummaryRequest {
  readonly sheetName: string;
  readonly rows: readonly SummaryRow[];
  /** Provenance and caution lines written above the table. */
  readonly header: readonly string[];
}

export interface SummaryResult {
  readonly sheet: string;
  readonly tableAddress: string;
  readonly chartSeriesAddress: string;
}

export interface TierCellWrite {
  readonly sheet: string;
  readonly cell: string;
  readonly tier: string;
}

/** The active sheet as a fill target: its used range and where the selection is. */
export interface TargetSheet {
  readonly snapshot: SheetSnapshot;
  /** 1-based top-left cell and size of the selection. */
  readonly selection: { readonly row: number; readonly col: number; readonly rows: number; readonly cols: number; readonly address: string };
}

export interface FillOutcome {
  readonly sheet: string;
  /** Cells written. */
  readonly cells: number;
}

/** What one cell of a written block holds. */
export type BlockContent =
  | { readonly kind: 'formula'; readonly formula: string }
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'text'; readonly text: string };

/** How a block cell looks: the roles of the fill's blocks, plus a plain figure. */
export type BlockStyle = 'title' | 'demo' | 'header' | 'label' | 'provenance' | 'caution' | 'figure';

export interface BlockCell {
  readonly content: BlockContent;
  /** Excel number format ("0.00"); absent: General. */
  readonly format?: string;
  readonly style?: BlockStyle;
}

/**
 * One rectangle of a block: `cells[r][c]` goes to (row + r, col + c). A null entry is written
 * nothing but must be empty too: it is room a formula above it spills into.
 */
export interface BlockArea {
  /** 1-based top-left cell. */
  readonly row: number;
  readonly col: number;
  readonly cells: ReadonlyArray<ReadonlyArray<BlockCell | null>>;
  /** Least width (characters) of each of the area's columns, by offset from `col`: widened, never narrowed. */
  readonly widths?: readonly number[];
}

export interface BlockWrite {
  readonly sheet: string;
  readonly areas: readonly BlockArea[];
  /** The user confirmed replacing what the areas' cells hold. */
  readonly overwrite: boolean;
}

export interface BlockOutcome {
  readonly sheet: string;
  /** Address of each area written, e.g. "F2:H30". */
  readonly addresses: readonly string[];
  /** Cells written (null entries not counted). */
  readonly cells: number;
  /** Non-empty cells replaced on the user's confirmation. */
  readonly overwritten: readonly string[];
}

export interface PaneHost {
  /** Shown in the pane: "Excel", or why there is no workbook. */
  readonly label: string;
  /** False outside Excel: reads and writes are refused with a message. */
  readonly available: boolean;
  readSelection(): Promise<CellGrid>;
  readActiveSheet(): Promise<ActiveSheet>;
  readActiveCell(): Promise<ActiveCell>;
  /** The values of several ranges, in one batch, in the order asked. */
  readRanges(refs: readonly RangeRef[]): Promise<GridCell[][][]>;
  /** Names of the workbook's sheets (to keep a new sheet's name unique). */
  sheetNames(): Promise<string[]>;
  /** The active sheet and selection, read before a fill into a range or template. */
  readTarget(): Promise<TargetSheet>;
  /** Executes a writable plan in one batch (the Excel writer). */
  writeFill(plan: FillPlan): Promise<FillOutcome>;
  setTierCell(w: TierCellWrite): Promise<void>;
  writeSummary(req: SummaryRequest): Promise<SummaryResult>;
  /**
   * Writes rectangles of formulas and values, with number formats and styles, on one sheet in
   * one batch. Refuses with an OccupiedError (writing nothing) when a covered cell is not empty,
   * unless `overwrite` is set.
   */
  writeBlock(req: BlockWrite): Promise<BlockOutcome>;
}

/** Raised when the host cannot do what was asked; the message is for the user. */
export class HostError extends Error {}

/** A block refused because cells it covers are not empty; nothing was written. */
export class OccupiedError extends HostError {
  constructor(readonly addresses: readonly string[]) {
    super(
      `${addresses.length === 1 ? '1 cell where the block goes already holds' : `${addresses.length} cells where the block goes already hold`} something ` +
        `(${addresses.slice(0, 5).join(', ')}${addresses.length > 5 ? ', …' : ''}): nothing was written. ` +
        'Confirm replacing them, or make room beside the data.',
    );
    this.name = 'OccupiedError';
  }
}

/** Outside Excel (a plain browser): the library and what-if work, the workbook does not. */
export function noWorkbookHost(why: string): PaneHost {
  const refuse = async (): Promise<never> => {
    throw new HostError(`No workbook: ${why}`);
  };
  return {
    label: why,
    available: false,
    readSelection: refuse,
    readActiveSheet: refuse,
    readActiveCell: refuse,
    readRanges: refuse,
    sheetNames: refuse,
    readTarget: refuse,
    writeFill: refuse,
    setTierCell: refuse,
    writeSummary: refuse,
    writeBlock: refuse,
  };
}
