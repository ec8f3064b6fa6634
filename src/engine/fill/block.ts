/**
 * The block every fill writes: title, demo marker, the tier cell and the z cell every derived
 * formula reads, the provenance and the caution. Three layouts:
 *   - beside: label in one column, value in the next (a new sheet, whose columns the fill sizes;
 *     or a block the caller placed);
 *   - below a template's table: one text per row in the table's first column, wrapped to the
 *     table's own width, so nothing is cut by a neighbour cell and nothing runs past the columns
 *     the sheet already prints; only the tier and z values sit in a cell of their own, in the
 *     first column far enough right for their labels to show whole;
 *   - a sheet of its own (when the rows below the table are not empty), beside layout, opening
 *     with the sheet and range it documents.
 */
import { a1 } from './a1';
import type { CellRef } from './a1';
import { CAUTION, DEMO_MARKER, wrapText } from './caution';
import type { CellContent, CellRole, FillMode } from './types';

export const TITLE = 'Leeway — analytical performance specifications';

/** The labels beside a filled sheet's tier cell and z cell (the task pane finds them by these). */
export const TIER_CELL_LABEL = 'Tier (whole sheet)';
export const Z_CELL_LABEL = 'z (coverage factor)';

/** Characters per line of the caution in the beside layout. */
export const CAUTION_WIDTH = 95;

/** The narrowest wrap width of the block below a table, in characters. */
const MIN_WRAP = 24;

export interface BlockCell {
  readonly row: number;
  readonly col: number;
  readonly content: CellContent;
  readonly role: CellRole;
  readonly note?: string;
}

/** What the block says; `formulas` gets the tier and z references the block decided on. */
export interface BlockText {
  readonly demo: boolean;
  readonly tier: string;
  readonly z: number;
  readonly mode: FillMode;
  /** Label and value pairs of the provenance, in order. */
  readonly pairs: ReadonlyArray<readonly [string, string]>;
  /** Label and text of each derived column's formula, given the tier and z references to use. */
  readonly formulas: (tierRef: string, zRef: string) => ReadonlyArray<readonly [string, string]>;
  /** An opening line (the sheet and range a provenance sheet documents). */
  readonly documents?: string;
}

export interface PlacedBlock {
  readonly cells: readonly BlockCell[];
  readonly tier: CellRef;
  readonly z: CellRef;
  /** Last row the block uses. */
  readonly bottom: number;
  /** Last column the block writes. */
  readonly right: number;
}

const text = (t: string): CellContent => ({ kind: 'text', text: t });

function tierNote(mode: FillMode): string {
  return mode === 'live'
    ? 'The tier of every row whose own tier cell is blank: optimum, desirable or minimum. Change it to recompute the sheet.'
    : 'The tier the values were computed at. They are numbers: changing this cell does not recompute them (fill with live formulas for that).';
}

const Z_NOTE = 'Coverage factor for imprecision in the total-error model; 1.65 is one-sided 95 %.';

export function titleText(demo: boolean): string {
  return demo ? `${TITLE} — DEMO` : TITLE;
}

/**
 * Label in `at.col`, value in the next column; the tier and z cells in that value column. With
 * `wrap`, a value longer than `wrap` characters continues on the rows below (a provenance sheet
 * whose two columns print on one page); without, a value is one cell.
 */
export function besideBlock(at: CellRef, b: BlockText, tierPrefix = '', wrap?: number): PlacedBlock {
  const cells: BlockCell[] = [];
  const labelCol = at.col;
  const valueCol = at.col + 1;
  let r = at.row;
  const put = (row: number, col: number, content: CellContent, role: CellRole, note?: string): void => {
    cells.push(note ? { row, col, content, role, note } : { row, col, content, role });
  };
  const value = (t: string, role: CellRole): void => {
    const lines = wrap === undefined ? [t] : wrapText(t, wrap, true);
    for (const line of lines) put(r++, valueCol, text(line), role);
  };
  put(r++, labelCol, text(titleText(b.demo)), 'title');
  if (b.demo) put(r++, labelCol, text(DEMO_MARKER), 'demo');
  if (b.documents) {
    put(r, labelCol, text('Documents'), 'label');
    value(b.documents, 'provenance');
  }
  const tier = { row: r, col: valueCol };
  put(r, labelCol, text(TIER_CELL_LABEL), 'label');
  put(r++, valueCol, text(b.tier), 'tier', tierNote(b.mode));
  const z = { row: r, col: valueCol };
  put(r, labelCol, text(Z_CELL_LABEL), 'label');
  put(r++, valueCol, { kind: 'number', value: b.z }, 'z', Z_NOTE);
  for (const [label, v] of b.pairs) {
    put(r, labelCol, text(label), 'label');
    if (v !== '') value(v, 'provenance');
    else r++;
  }
  for (const [label, v] of b.formulas(tierPrefix + a1(tier, true), tierPrefix + a1(z, true))) {
    // In narrow columns the column's name goes with its formula, so the label column stays short.
    put(r, labelCol, text(wrap === undefined ? label : 'Formula'), 'label');
    value(wrap === undefined ? v : `${label}: ${v}`, 'provenance');
  }
  put(r, labelCol, text('Caution'), 'label');
  for (const line of wrapText(CAUTION, wrap ?? CAUTION_WIDTH)) put(r++, valueCol, text(line), 'caution');
  return { cells, tier, z, bottom: r - 1, right: valueCol };
}

/**
 * The block below a table, from row `top` in column `left`. `width(col)` is a column's width in
 * characters; `span` the table's width in characters (the wrap width).
 */
export function belowBlock(top: number, left: number, span: number, width: (col: number) => number, b: BlockText): PlacedBlock {
  // Widths count digits; a line of text in a proportional font runs a little wider, hence 95 %.
  const wrap = Math.max(MIN_WRAP, Math.floor(span * 0.95) - 1);
  const cells: BlockCell[] = [];
  let r = top;
  const lines = (t: string, role: CellRole): void => {
    for (const line of wrapText(t, wrap, true)) cells.push({ row: r++, col: left, content: text(line), role });
  };
  lines(titleText(b.demo), 'title');
  if (b.demo) lines(DEMO_MARKER, 'demo');
  if (b.documents) lines(b.documents, 'provenance');
  // The value column: the first visible column right of the label whose left edge clears the label.
  const need = Math.max(TIER_CELL_LABEL.length, Z_CELL_LABEL.length) + 1;
  let valueCol = left + 1;
  let room = width(left);
  while ((room < need || width(valueCol) <= 0) && valueCol < left + 64) {
    room += width(valueCol);
    valueCol++;
  }
  const tier = { row: r, col: valueCol };
  cells.push({ row: r, col: left, content: text(TIER_CELL_LABEL), role: 'label' });
  cells.push({ row: r++, col: valueCol, content: text(b.tier), role: 'tier', note: tierNote(b.mode) });
  const z = { row: r, col: valueCol };
  cells.push({ row: r, col: left, content: text(Z_CELL_LABEL), role: 'label' });
  cells.push({ row: r++, col: valueCol, content: { kind: 'number', value: b.z }, role: 'z', note: Z_NOTE });
  for (const [label, value] of b.pairs) lines(value === '' ? label : `${label}: ${value}`, 'provenance');
  for (const [label, value] of b.formulas(a1(tier, true), a1(z, true))) lines(`${label}: ${value}`, 'provenance');
  lines(`Caution: ${CAUTION}`, 'caution');
  return { cells, tier, z, bottom: r - 1, right: valueCol };
}
