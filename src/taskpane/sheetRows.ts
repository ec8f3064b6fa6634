/**
 * Reading observed bias and CV from a worksheet (a filled sheet, or the lab's own): find the
 * header row above the active cell, match its columns (analyte, specimen, CVI, CVG by the table's
 * header names; observed bias and CV by the names below), and read the active row or every row.
 * Pure: works on the values the host read in one batch.
 */
import { matchHeader, normaliseHeader } from '../engine/table';
import type { GridCell } from '../engine/table';
import { readDecimal } from '../engine/table';
import type { ActiveSheet } from './host';
import { columnLetters } from '../engine/fill/a1';
import { TIER_CELL_LABEL, Z_CELL_LABEL } from '../engine/fill';

/** Normalised header names read as the observed bias and the observed (analytical) CV. */
const BIAS_NAMES = new Set(['bias', 'observedbias', 'biasobserved', 'measuredbias', 'methodbias', 'estimatedbias', 'meanbias']);
const CV_NAMES = new Set(['cv', 'cva', 'observedcv', 'cvobserved', 'measuredcv', 'analyticalcv', 'methodcv', 'labcv', 'withinlabcv', 'imprecision', 'observedimprecision']);

export interface SheetColumns {
  /** 1-based sheet row of the header. */
  readonly headerRow: number;
  /** 0-based offsets into the grid's rows, or -1 when absent. */
  readonly analyte: number;
  readonly specimen: number;
  readonly cvi: number;
  readonly cvg: number;
  readonly bias: number;
  readonly cv: number;
}

export interface SheetRowReading {
  readonly row: number;
  readonly analyte: string;
  readonly specimen: string;
  readonly cvi: number | null;
  readonly cvg: number | null;
  readonly bias: number | null;
  readonly cv: number | null;
  /** "B12" style addresses of the bias and CV read, for the pane to show. */
  readonly biasCell: string | null;
  readonly cvCell: string | null;
}

function text(v: GridCell): string {
  return v === null || v === undefined ? '' : String(v).trim();
}

function numberOf(v: GridCell): number | null {
  if (typeof v === 'number') return Number.isFinite(v) ? v : null;
  const t = text(v);
  if (t === '') return null;
  const x = readDecimal(t);
  return x === null || x === undefined || !Number.isFinite(x) ? null : x;
}

function columnsOf(cells: readonly GridCell[], headerRow: number): SheetColumns | null {
  const find = (pred: (h: string) => boolean): number => cells.findIndex((c) => typeof c === 'string' && pred(c));
  const analyte = find((c) => matchHeader(c)?.field === 'analyte');
  if (analyte < 0) return null;
  return {
    headerRow,
    analyte,
    specimen: find((c) => matchHeader(c)?.field === 'specimen'),
    cvi: find((c) => matchHeader(c)?.field === 'cvi'),
    cvg: find((c) => matchHeader(c)?.field === 'cvg'),
    bias: find((c) => BIAS_NAMES.has(normaliseHeader(c))),
    cv: find((c) => CV_NAMES.has(normaliseHeader(c))),
  };
}

/** The nearest header row at or above `sheetRow` (one with an analyte column), or null. */
export function headerAbove(sheet: ActiveSheet, sheetRow: number): SheetColumns | null {
  const g = sheet.grid;
  for (let i = Math.min(sheetRow - g.firstRow, g.values.length - 1); i >= 0; i--) {
    const cols = columnsOf(g.values[i], g.firstRow + i);
    if (cols) return cols;
  }
  return null;
}

function reading(sheet: ActiveSheet, cols: SheetColumns, i: number): SheetRowReading | null {
  const g = sheet.grid;
  const row = g.values[i];
  if (!row) return null;
  const analyte = text(row[cols.analyte]);
  if (analyte === '') return null;
  const at = (k: number): GridCell => (k >= 0 ? row[k] : null);
  const addr = (k: number): string | null => (k >= 0 ? `${columnLetters(g.firstColumn + k)}${g.firstRow + i}` : null);
  return {
    row: g.firstRow + i,
    analyte,
    specimen: text(at(cols.specimen)),
    cvi: numberOf(at(cols.cvi)),
    cvg: numberOf(at(cols.cvg)),
    bias: numberOf(at(cols.bias)),
    cv: numberOf(at(cols.cv)),
    biasCell: addr(cols.bias),
    cvCell: addr(cols.cv),
  };
}

/** The active row, read under its header; null with a reason when there is nothing to read. */
export function readActiveRow(sheet: ActiveSheet): { ok: true; value: SheetRowReading; columns: SheetColumns } | { ok: false; why: string } {
  const cols = headerAbove(sheet, sheet.activeRow);
  if (!cols) return { ok: false, why: `no header row with an analyte column above row ${sheet.activeRow} of ${sheet.grid.sheet}` };
  if (sheet.activeRow <= cols.headerRow) return { ok: false, why: `the active cell is on the header row (${cols.headerRow}): select a cell in an analyte's row` };
  const r = reading(sheet, cols, sheet.activeRow - sheet.grid.firstRow);
  if (!r) return { ok: false, why: `row ${sheet.activeRow} has no analyte` };
  return { ok: true, value: r, columns: cols };
}

/** Every analyte row under the header that is above the active cell (or the first header on the sheet). */
export function readAllRows(sheet: ActiveSheet): { ok: true; rows: SheetRowReading[]; columns: SheetColumns } | { ok: false; why: string } {
  const g = sheet.grid;
  const cols = headerAbove(sheet, Math.max(sheet.activeRow, g.firstRow)) ?? headerAbove(sheet, g.firstRow + g.values.length - 1);
  if (!cols) return { ok: false, why: `no header row with an analyte column on ${g.sheet}` };
  const rows: SheetRowReading[] = [];
  for (let i = cols.headerRow - g.firstRow + 1; i < g.values.length; i++) {
    const r = reading(sheet, cols, i);
    if (r) rows.push(r);
  }
  return { ok: true, rows, columns: cols };
}

/** The block label the fill planner writes beside a filled sheet's tier cell (src/engine/fill/plan.ts). */
const sameLabel = (label: string) => (v: string): boolean => v.toLowerCase() === label.toLowerCase();
const isTierLabel = sameLabel(TIER_CELL_LABEL);
const isZLabel = sameLabel(Z_CELL_LABEL);

export interface FoundTierCell {
  /** Absolute address, e.g. "$B$4". */
  readonly tierCell: string;
  readonly zCell: string | null;
  /** What the tier cell holds now. */
  readonly tier: string;
}

/**
 * The tier cell of a sheet Leeway filled (in this session or an earlier one): the first non-empty
 * cell right of the label "Tier (whole sheet)" in its row (the next cell on a new sheet; further
 * right below a template's table, where the value clears the label); the z cell likewise. Null
 * when the sheet has no such label.
 */
export function findTierCell(sheet: ActiveSheet): FoundTierCell | null {
  const g = sheet.grid;
  let tier: FoundTierCell | null = null;
  let z: string | null = null;
  const valueRight = (row: GridCell[], j: number): number => {
    for (let k = j + 1; k < row.length; k++) if (row[k] !== null && row[k] !== '') return k;
    return j + 1;
  };
  g.values.forEach((row, i) => {
    row.forEach((v, j) => {
      if (typeof v !== 'string') return;
      const at = (k: number): string => `$${columnLetters(g.firstColumn + k)}$${g.firstRow + i}`;
      if (!tier && isTierLabel(v.trim())) {
        const k = valueRight(row, j);
        tier = { tierCell: at(k), zCell: null, tier: text(row[k]) };
      }
      if (!z && isZLabel(v.trim())) z = at(valueRight(row, j));
    });
  });
  if (!tier) return null;
  return { ...(tier as FoundTierCell), zCell: z };
}
