/**
 * The one fill planner (SPEC.md section 6). From a variation table, the rows chosen, the sheet's
 * tier (and optionally a tier per row) and z, it lays out a sheet as data: input values, derived
 * columns as live LEEWAY formulas pointing at the row's input cells, at one tier cell and at one z
 * cell (or, in values mode, the numbers those formulas give), the provenance block, the caution,
 * and the list of non-empty target cells it would change. Nothing is written here.
 *
 * Derived columns and their formulas (percent numbers; f = 0.25/0.50/0.75 and g =
 * 0.125/0.25/0.375 for optimum/desirable/minimum; Fraser et al. Ann Clin Biochem 1997;34:8–12):
 *   Allowable CV %              =LEEWAY.SPEC.CV(cvi, tier)            f·CVI
 *   Allowable bias %            =LEEWAY.SPEC.BIAS(cvi, cvg, tier)     g·√(CVI²+CVG²)
 *   Allowable total error %     =LEEWAY.SPEC.TOTAL(cvi, cvg, tier, z) z·f·CVI + g·√(CVI²+CVG²)
 *   Max. standard uncertainty % =LEEWAY.SPEC.MU(cvi, tier)            f·CVI (k = 1)
 *   Fixed limit %               =LEEWAY.SPEC.FIXED(level, abs, pct)   max(100·abs/level, pct); the percent limit alone when there is no absolute part
 * where tier is the row's own tier cell when it is not blank, else the sheet's tier cell.
 */
import { allowableBias, allowableImprecision, allowableTotalError, allowableUncertainty } from '../spec';
import { fixedLimit } from '../assess';
import { LeewayError, naError } from '../errors';
import { TIERS } from '../tiers';
import type { Tier } from '../tiers';
import { VERSION } from '../version';
import { rowKey } from '../table/parse';
import type { NumericField, VariationRow } from '../table/types';
import { a1, columnLetters, MAX_COLUMNS, MAX_ROWS } from './a1';
import type { CellRef } from './a1';
import { CAUTION, DEMO_MARKER, wrapText } from './caution';
import { COLUMN_HEADERS, matchTemplateHeader } from './headers';
import type {
  CellContent,
  CellError,
  CellResult,
  CellRole,
  Conflict,
  DerivedField,
  ExistingCell,
  FillField,
  FillPlan,
  FillRequest,
  PlannedCell,
  PlannedColumn,
  PlannedRow,
  PlanProblem,
  PlanResult,
  Provenance,
  SheetSnapshot,
} from './types';
import { DERIVED_FIELDS } from './types';

export const TITLE = 'Leeway — analytical performance specifications';

/** The labels beside a filled sheet's tier cell and z cell (the task pane finds them by these). */
export const TIER_CELL_LABEL = 'Tier (whole sheet)';
export const Z_CELL_LABEL = 'z (coverage factor)';

/** What the block says when the caller has no fingerprint of the table file (the task pane keeps rows, not the file). */
export const NO_FINGERPRINT = 'not recorded (imported in the pane)';

/** The number format that shows `decimals` decimals ("0", "0.0", "0.00", …). */
export function decimalsFormat(decimals: number): string {
  return decimals === 0 ? '0' : `0.${'0'.repeat(decimals)}`;
}

/** More decimals than a double holds digits for are left to the cell's own format. */
const MAX_SHOWN_DECIMALS = 15;

/** Characters per line of the caution in the block. */
const CAUTION_WIDTH = 95;

/** New-sheet column order: inputs and results first; the long text columns (source, note) last, where their text can run on. */
const NEW_SHEET_ORDER: readonly FillField[] = ['analyte', 'specimen', 'unit', 'cvi', 'cvg', 'tier', 'spec_cv', 'spec_bias', 'spec_total', 'spec_mu'];
const LIMIT_FIELDS: readonly FillField[] = ['limit_abs', 'limit_pct', 'level', 'fixed_pct'];

/** The inputs each derived column's formula reads. */
const NEEDS: Readonly<Record<DerivedField, readonly FillField[]>> = {
  spec_cv: ['cvi'],
  spec_bias: ['cvi', 'cvg'],
  spec_total: ['cvi', 'cvg'],
  spec_mu: ['cvi'],
  fixed_pct: ['limit_abs', 'limit_pct', 'level'],
};

const WIDTHS: Partial<Record<FillField, number>> = {
  analyte: 24,
  specimen: 11,
  unit: 10,
  cvi: 8,
  cvg: 8,
  source: 28,
  tier: 11,
  note: 26,
  limit_abs: 11,
  limit_pct: 9,
  level: 9,
};

const isDerived = (f: FillField): f is DerivedField => (DERIVED_FIELDS as readonly string[]).includes(f);

function text(t: string): CellContent {
  return { kind: 'text', text: t };
}

function numberCell(x: number): CellContent {
  return { kind: 'number', value: x };
}

function errorOf(e: unknown): CellError {
  if (e instanceof LeewayError) return { error: e.code, message: e.message };
  return { error: '#VALUE!', message: e instanceof Error ? e.message : String(e) };
}

function compute(f: () => number): CellResult {
  try {
    const x = f();
    return Number.isFinite(x) ? x : { error: '#NUM!', message: 'the result is not a finite number: an input is out of range' };
  } catch (e) {
    return errorOf(e);
  }
}

/** The value one derived column has on one row, as the registry's evaluate() gives it for the same formula. */
export function derivedValue(field: DerivedField, row: VariationRow, tier: Tier, z: number): CellResult | undefined {
  const cvg = (): number => {
    if (row.cvg === null) throw naError('cvg is blank: enter a number');
    return row.cvg;
  };
  switch (field) {
    case 'spec_cv':
      return compute(() => allowableImprecision(row.cvi, tier));
    case 'spec_bias':
      return compute(() => allowableBias(row.cvi, cvg(), tier));
    case 'spec_total':
      return compute(() => allowableTotalError(row.cvi, cvg(), tier, z));
    case 'spec_mu':
      return compute(() => allowableUncertainty(row.cvi, tier, 1));
    case 'fixed_pct': {
      const fixed = fixedLimit(row);
      if (fixed.ok) return fixed.value;
      if (!fixed.absent) return { error: fixed.code, message: fixed.message };
      return row.level === null ? undefined : '';
    }
  }
}

/** A column's formula on one row, given the letters of the columns it reads. */
export function derivedFormula(field: DerivedField, r: number, col: Partial<Record<FillField, string>>, tierCell: string, zCell: string): string {
  const at = (f: FillField): string => `${col[f]}${r}`;
  const tier = col.tier ? `IF(${at('tier')}="",${tierCell},${at('tier')})` : tierCell;
  switch (field) {
    case 'spec_cv':
      return `=LEEWAY.SPEC.CV(${at('cvi')},${tier})`;
    case 'spec_bias':
      return `=LEEWAY.SPEC.BIAS(${at('cvi')},${at('cvg')},${tier})`;
    case 'spec_total':
      return `=LEEWAY.SPEC.TOTAL(${at('cvi')},${at('cvg')},${tier},${zCell})`;
    case 'spec_mu':
      return `=LEEWAY.SPEC.MU(${at('cvi')},${tier})`;
    case 'fixed_pct':
      return `=IF(${at('limit_abs')}="",IF(${at('limit_pct')}="","",${at('limit_pct')}),LEEWAY.SPEC.FIXED(${at('level')},${at('limit_abs')},N(${at('limit_pct')})))`;
  }
}

const MEANING: Readonly<Record<DerivedField, string>> = {
  spec_cv: 'Allowable imprecision, % = f·CVI (f = 0.25 / 0.50 / 0.75 for optimum / desirable / minimum). Sources: Cotlove et al. Clin Chem 1970; Fraser et al. Ann Clin Biochem 1997.',
  spec_bias: 'Allowable bias, % = g·√(CVI² + CVG²) (g = 0.125 / 0.25 / 0.375). Sources: Gowans et al. Scand J Clin Lab Invest 1988; Fraser et al. 1997.',
  spec_total: 'Allowable total error, % = z·f·CVI + g·√(CVI² + CVG²). Sources: Fraser et al. 1997; Sandberg et al. Clin Chem Lab Med 2015.',
  spec_mu: 'Maximum allowable standard measurement uncertainty, % = f·CVI (k = 1).',
  fixed_pct: 'A fixed (regulatory or EQA) limit as a percent at the level: max(100·abs/level, pct); the percent limit alone when there is no absolute part.',
};

const GENERIC: Readonly<Record<DerivedField, string>> = {
  spec_cv: '=LEEWAY.SPEC.CV(cvi, tier)',
  spec_bias: '=LEEWAY.SPEC.BIAS(cvi, cvg, tier)',
  spec_total: '=LEEWAY.SPEC.TOTAL(cvi, cvg, tier, z)',
  spec_mu: '=LEEWAY.SPEC.MU(cvi, tier)',
  fixed_pct: '=LEEWAY.SPEC.FIXED(level, limit_abs, limit_pct)',
};

function sameContent(existing: ExistingCell, c: CellContent): boolean {
  switch (c.kind) {
    case 'number':
      return typeof existing === 'number' && existing === c.value;
    case 'text':
      return typeof existing === 'string' && existing === c.text;
    case 'formula':
      return typeof existing === 'string' && existing.replace(/\s+/g, '').toUpperCase() === c.formula.replace(/\s+/g, '').toUpperCase();
    case 'error':
      return false;
  }
}

/** What a cell would hold, as the user would type it (for the conflict list). */
export function shown(c: CellContent): string {
  switch (c.kind) {
    case 'number':
      return String(c.value);
    case 'text':
      return c.text;
    case 'formula':
      return c.formula;
    case 'error':
      return c.error.error;
  }
}

function isEmpty(v: ExistingCell | undefined): boolean {
  return v === null || v === undefined || v === '';
}

function existingAt(s: SheetSnapshot | undefined, row: number, col: number): ExistingCell {
  if (!s) return null;
  const r = s.cells[row - s.origin.row];
  if (!r) return null;
  const v = r[col - s.origin.col];
  return v === undefined ? null : v;
}

function snapshotBounds(s: SheetSnapshot): { lastRow: number; lastCol: number; firstRow: number } {
  let lastRow = s.origin.row - 1;
  let lastCol = s.origin.col - 1;
  let firstRow = 0;
  s.cells.forEach((row, i) => {
    row.forEach((v, j) => {
      if (!isEmpty(v)) {
        lastRow = Math.max(lastRow, s.origin.row + i);
        lastCol = Math.max(lastCol, s.origin.col + j);
        if (firstRow === 0) firstRow = s.origin.row + i;
      }
    });
  });
  return { lastRow, lastCol, firstRow };
}

interface Layout {
  columns: PlannedColumn[];
  headerRow: number;
  blockAt: CellRef;
  /** Rows of the table, in order, with the sheet row each goes to. */
  placed: Array<{ row: VariationRow; at: number }>;
  writeHeaders: boolean;
}

/** Plans a fill. Never throws for bad input: a request that cannot be planned returns its problems. */
export function planFill(req: FillRequest): PlanResult {
  const problems: PlanProblem[] = [];
  const rows = req.rows ?? req.table.rows;
  if (rows.length === 0) problems.push({ where: '', message: 'no rows to fill: choose at least one analyte' });
  if (!(Number.isFinite(req.z) && req.z >= 0)) problems.push({ where: '', message: `z must be a finite number ≥ 0 (got ${req.z})` });
  if (!(TIERS as readonly string[]).includes(req.tier)) problems.push({ where: '', message: `tier must be one of optimum, desirable, minimum (got ${String(req.tier)})` });
  for (const [key, t] of Object.entries(req.rowTiers ?? {})) {
    if (!(TIERS as readonly string[]).includes(t)) problems.push({ where: '', message: `the tier for ${key.replace('\u0000', ' ')} must be optimum, desirable or minimum (got ${String(t)})` });
  }
  if (req.tableSha256 !== undefined && !/^[0-9a-f]{64}$/.test(req.tableSha256)) problems.push({ where: '', message: `the table's SHA-256 must be 64 lower-case hex digits (got ${req.tableSha256})` });
  if (!/^\d{4}-\d{2}-\d{2}$/.test(req.date)) problems.push({ where: '', message: `date must be YYYY-MM-DD (got ${req.date})` });
  const decimals = req.decimals ?? 2;
  if (!(Number.isInteger(decimals) && decimals >= 0 && decimals <= 15)) problems.push({ where: '', message: `decimals must be a whole number from 0 to 15 (got ${decimals})` });
  if (problems.length) return { ok: false, problems };

  const rowTiers = req.rowTiers ?? {};
  const hasRowTiers = Object.keys(rowTiers).length > 0;
  const layout = req.target.kind === 'new-sheet' ? newSheetLayout(rows, req.table.demo) : templateLayout(req, rows, problems, hasRowTiers);
  if (!layout || problems.length) return { ok: false, problems };

  const snapshot = req.target.kind === 'template' ? req.target.sheet : undefined;
  const sheetName = req.target.kind === 'template' ? req.target.sheet.name : req.target.sheetName;
  const version = req.version ?? VERSION;
  const sources = [...new Set(rows.map((r) => r.source))];
  const provenance: Provenance = {
    tableName: req.table.name,
    tableOrigin: req.table.origin,
    tableImported: req.table.importedAt,
    sources,
    tableSha256: req.tableSha256 ?? null,
    tableRows: req.table.rows.length,
    rowsFilled: rows.length,
    tier: req.tier,
    z: req.z,
    date: req.date,
    version,
    mode: req.mode,
    demo: req.table.demo,
  };

  const letters: Partial<Record<FillField, string>> = {};
  for (const c of layout.columns) letters[c.field] = c.letter;
  const derivedCols = layout.columns.filter((c) => isDerived(c.field));
  const firstDataRow = layout.placed.length ? Math.min(...layout.placed.map((p) => p.at)) : layout.headerRow + 1;

  const cells: PlannedCell[] = [];
  const put = (row: number, col: number, content: CellContent, role: CellRole, extra: { format?: string; note?: string } = {}): void => {
    cells.push({ row, col, address: a1({ row, col }), content, role, ...extra });
  };

  // The block: title, demo marker, tier and z cells, provenance, column formulas, caution.
  const b = layout.blockAt;
  const labelCol = b.col;
  const valueCol = b.col + 1;
  let r = b.row;
  put(r++, labelCol, text(req.table.demo ? `${TITLE} — DEMO` : TITLE), 'title');
  if (req.table.demo) put(r++, labelCol, text(DEMO_MARKER), 'demo');
  const tierRef = { row: r, col: valueCol };
  const tierCell = a1(tierRef, true);
  put(r, labelCol, text(TIER_CELL_LABEL), 'label');
  put(r++, valueCol, text(req.tier), 'tier', {
    note:
      req.mode === 'live'
        ? 'The tier of every row whose own tier cell is blank: optimum, desirable or minimum. Change it to recompute the sheet.'
        : 'The tier the values below were computed at. They are numbers: changing this cell does not recompute them (fill with live formulas for that).',
  });
  const zRef = { row: r, col: valueCol };
  const zCell = a1(zRef, true);
  put(r, labelCol, text(Z_CELL_LABEL), 'label');
  put(r++, valueCol, numberCell(req.z), 'z', { note: 'Coverage factor for imprecision in the total-error model; 1.65 is one-sided 95 %.' });
  const pairs: Array<[string, string]> = [
    ['Table', req.table.name],
    ['Table source', req.table.origin || '(not recorded)'],
    ['Table SHA-256', req.tableSha256 ?? (req.table.demo ? 'none: the built-in demo table is not a file' : NO_FINGERPRINT)],
    ['Table rows', `${req.table.rows.length} in the table; ${rows.length} filled here`],
    ['Table imported', req.table.importedAt.slice(0, 10)],
    ['Data sources', summariseSources(sources)],
    ['Filled on', req.date],
    ['Program', `Leeway ${version}`],
    ['Derived columns', req.mode === 'live' ? 'live LEEWAY formulas (the Leeway add-in computes them)' : "values computed at fill time; each column's formula is in its header's note and below"],
  ];
  for (const [label, value] of pairs) {
    put(r, labelCol, text(label), 'label');
    if (value !== '') put(r, valueCol, text(value), 'provenance');
    r++;
  }
  if (derivedCols.length && layout.placed.length) {
    const first = layout.placed[0].at;
    for (const c of derivedCols) {
      put(r, labelCol, text(`${c.header} (${c.letter})`), 'label');
      put(r++, valueCol, text(`${derivedFormula(c.field as DerivedField, first, letters, tierCell, zCell)}  (row ${first})`), 'provenance');
    }
  }
  const caution = wrapText(CAUTION, CAUTION_WIDTH);
  put(r, labelCol, text('Caution'), 'label');
  caution.forEach((line) => put(r++, valueCol, text(line), 'caution'));

  // Header row.
  if (layout.writeHeaders) {
    for (const c of layout.columns) {
      const note = isDerived(c.field) ? headerNote(c.field, req.mode, firstDataRow, letters, tierCell, zCell, version, decimals) : undefined;
      put(layout.headerRow, c.col, text(c.header), 'header', note ? { note } : {});
    }
  }

  // Data rows.
  const format = decimalsFormat(decimals);
  const placedRows: PlannedRow[] = [];
  for (const { row, at } of layout.placed) {
    const key = rowKey(row.analyte, row.specimen);
    const tier = rowTiers[key] ?? req.tier;
    placedRows.push({ key, analyte: row.analyte, specimen: row.specimen, row: at });
    for (const c of layout.columns) {
      const f = c.field;
      if (isDerived(f)) {
        const value = derivedValue(f, row, tier, req.z);
        if (req.mode === 'live') {
          if (f === 'fixed_pct' && !(letters.limit_abs && letters.limit_pct && letters.level)) continue;
          put(at, c.col, { kind: 'formula', formula: derivedFormula(f, at, letters, tierCell, zCell), result: value ?? '' }, 'derived', { format });
        } else if (value !== undefined && value !== '') {
          put(at, c.col, typeof value === 'number' ? numberCell(value) : typeof value === 'string' ? text(value) : { kind: 'error', error: value }, 'derived', { format });
        }
        continue;
      }
      const content = inputContent(f, row, rowTiers[key]);
      const written = content?.kind === 'number' ? req.writtenDecimals?.[key]?.[f as NumericField] : undefined;
      if (content) put(at, c.col, content, f === 'tier' ? 'row-tier' : 'input', written !== undefined && written <= MAX_SHOWN_DECIMALS ? { format: decimalsFormat(written) } : {});
    }
  }

  // Conflicts with what the sheet already holds.
  const conflicts: Conflict[] = [];
  let unchanged = 0;
  const kept: PlannedCell[] = [];
  for (const c of cells) {
    const existing = existingAt(snapshot, c.row, c.col);
    if (isEmpty(existing)) {
      kept.push(c);
    } else if (sameContent(existing, c.content)) {
      unchanged++;
    } else {
      conflicts.push({ address: c.address, row: c.row, col: c.col, existing: existing as string | number | boolean, planned: shown(c.content) });
      kept.push(c);
    }
  }
  kept.sort((p, q) => p.row - q.row || p.col - q.col);
  const maxRow = kept.reduce((m, c) => Math.max(m, c.row), 0);
  const maxCol = kept.reduce((m, c) => Math.max(m, c.col), 0);
  if (maxRow > MAX_ROWS || maxCol > MAX_COLUMNS) {
    return { ok: false, problems: [{ where: '', message: `the fill does not fit on a sheet: it needs row ${maxRow} and column ${maxCol} (the limits are ${MAX_ROWS} rows, ${MAX_COLUMNS} columns)` }] };
  }

  const columnWidths: Record<number, number> = {};
  if (req.target.kind === 'new-sheet') {
    for (const c of layout.columns) columnWidths[c.col] = isDerived(c.field) ? 12 : WIDTHS[c.field] ?? 12;
    columnWidths[labelCol] = Math.max(columnWidths[labelCol] ?? 0, 30);
  }
  const overwrite = req.overwrite ?? false;
  const plan: FillPlan = {
    sheetName,
    target: req.target.kind,
    mode: req.mode,
    cells: kept,
    tierCell,
    zCell,
    headerRow: layout.headerRow,
    columns: layout.columns,
    rows: placedRows,
    conflicts,
    unchanged,
    overwrite,
    writable: conflicts.length === 0 || overwrite,
    columnWidths,
    provenance,
  };
  return { ok: true, plan };
}

function summariseSources(sources: readonly string[]): string {
  const all = sources.join('; ');
  return all.length <= 200 ? all : `${sources.length} sources: see the Source column`;
}

function headerNote(f: DerivedField, mode: FillRequest['mode'], firstRow: number, letters: Partial<Record<FillField, string>>, tierCell: string, zCell: string, version: string, decimals: number): string {
  const tierText = letters.tier ? `the row's own tier (column ${letters.tier}) when it is not blank, else the sheet's tier in ${tierCell}` : `the sheet's tier in ${tierCell}`;
  const lines = [MEANING[f], `Formula: ${GENERIC[f]}; tier = ${tierText}${f === 'spec_total' ? `; z in ${zCell}` : ''}.`, `On row ${firstRow}: ${derivedFormula(f, firstRow, letters, tierCell, zCell)}`];
  if (mode === 'values') lines.push(`Values computed by Leeway ${version} at fill time and stored as full-precision numbers (shown to ${decimals} decimals).`);
  return lines.join('\n');
}

function inputContent(f: FillField, row: VariationRow, rowTier: Tier | undefined): CellContent | undefined {
  const t = (s: string): CellContent | undefined => (s === '' ? undefined : text(s));
  const n = (x: number | null): CellContent | undefined => (x === null ? undefined : numberCell(x));
  switch (f) {
    case 'analyte':
      return t(row.analyte);
    case 'specimen':
      return t(row.specimen);
    case 'unit':
      return t(row.unit);
    case 'source':
      return t(row.source);
    case 'note':
      return t(row.note);
    case 'cvi':
      return n(row.cvi);
    case 'cvg':
      return n(row.cvg);
    case 'limit_abs':
      return n(row.limitAbs);
    case 'limit_pct':
      return n(row.limitPct);
    case 'level':
      return n(row.level);
    case 'tier':
      return rowTier ? text(rowTier) : undefined;
    default:
      return undefined;
  }
}

function blockHeight(demo: boolean, derivedCount: number): number {
  return 1 + (demo ? 1 : 0) + 2 + 9 + derivedCount + wrapText(CAUTION, CAUTION_WIDTH).length;
}

function newSheetLayout(rows: readonly VariationRow[], demo: boolean): Layout {
  const fields: FillField[] = [...NEW_SHEET_ORDER];
  if (rows.some((r) => r.limitAbs !== null || r.limitPct !== null)) fields.push(...LIMIT_FIELDS);
  fields.push('source');
  if (rows.some((r) => r.note !== '')) fields.push('note');
  const columns = fields.map((field, i) => ({ field, col: i + 1, letter: columnLetters(i + 1), header: COLUMN_HEADERS[field] }));
  const headerRow = 1 + blockHeight(demo, fields.filter(isDerived).length) + 1;
  return {
    columns,
    headerRow,
    blockAt: { row: 1, col: 1 },
    placed: rows.map((row, i) => ({ row, at: headerRow + 1 + i })),
    writeHeaders: true,
  };
}

function templateLayout(req: FillRequest, rows: readonly VariationRow[], problems: PlanProblem[], hasRowTiers: boolean): Layout | undefined {
  if (req.target.kind !== 'template') return undefined;
  const t = req.target;
  const s = t.sheet;
  const bounds = snapshotBounds(s);
  const headerAt = t.headerAt ?? (bounds.firstRow ? { row: bounds.firstRow, col: s.origin.col } : undefined);
  if (!headerAt) {
    problems.push({ where: '', message: `sheet "${s.name}" is empty: a template needs a header row (Analyte, CVI %, …)` });
    return undefined;
  }
  const columns: PlannedColumn[] = [];
  const seen = new Map<FillField, PlannedColumn>();
  const lastCol = Math.max(bounds.lastCol, headerAt.col);
  for (let col = headerAt.col; col <= lastCol; col++) {
    const v = existingAt(s, headerAt.row, col);
    if (typeof v !== 'string' || v.trim() === '') continue;
    const field = matchTemplateHeader(v, t.mapping);
    if (!field) continue;
    const letter = columnLetters(col);
    const earlier = seen.get(field);
    if (earlier) {
      problems.push({ where: `${letter}${headerAt.row}`, message: `"${v.trim()}" and "${earlier.header}" (column ${earlier.letter}) both match ${field}: correct the header match` });
      continue;
    }
    const pc = { field, col, letter, header: v.trim() };
    seen.set(field, pc);
    columns.push(pc);
  }
  if (!seen.has('analyte')) {
    problems.push({ where: `row ${headerAt.row}`, message: `the header row ${headerAt.row} of "${s.name}" has no analyte column: name one "Analyte" or correct the header match` });
  }
  for (const c of columns) {
    if (!isDerived(c.field)) continue;
    for (const need of NEEDS[c.field]) {
      if (!seen.has(need)) {
        problems.push({ where: `column ${c.letter}`, message: `"${c.header}" (column ${c.letter}) needs a ${COLUMN_HEADERS[need]} column, which the template lacks: add one to the header row or correct the header match` });
      }
    }
  }
  if (hasRowTiers && !seen.has('tier')) {
    problems.push({ where: `row ${headerAt.row}`, message: 'tiers were chosen for single analytes but the template has no tier column: add a "Tier" column or use one tier for the sheet' });
  }
  if (problems.length) return undefined;

  // Rows: an analyte the template already lists keeps its row; the others go to rows whose analyte cell is empty.
  const analyteCol = seen.get('analyte')!.col;
  const specimenCol = seen.get('specimen')?.col;
  const byKey = new Map<string, number>();
  const lastRow = Math.max(bounds.lastRow, headerAt.row);
  for (let row = headerAt.row + 1; row <= lastRow; row++) {
    const a = existingAt(s, row, analyteCol);
    if (typeof a !== 'string' || a.trim() === '') continue;
    const sp = specimenCol ? existingAt(s, row, specimenCol) : '';
    const key = rowKey(a, typeof sp === 'string' ? sp : String(sp ?? ''));
    if (!byKey.has(key)) byKey.set(key, row);
    const loose = rowKey(a, '');
    if (!byKey.has(loose)) byKey.set(loose, row);
  }
  const used = new Set<number>();
  const placed: Array<{ row: VariationRow; at: number }> = [];
  const pending: VariationRow[] = [];
  for (const row of rows) {
    const exact = byKey.get(rowKey(row.analyte, row.specimen));
    const loose = specimenCol ? undefined : byKey.get(rowKey(row.analyte, ''));
    const at = exact ?? loose;
    if (at !== undefined && !used.has(at)) {
      used.add(at);
      placed.push({ row, at });
    } else {
      pending.push(row);
    }
  }
  let next = headerAt.row + 1;
  for (const row of pending) {
    while (used.has(next) || !isEmpty(existingAt(s, next, analyteCol))) next++;
    used.add(next);
    placed.push({ row, at: next });
  }
  placed.sort((p, q) => p.at - q.at);
  const blockAt = t.blockAt ?? { row: headerAt.row, col: lastCol + 2 };
  return { columns, headerRow: headerAt.row, blockAt, placed, writeHeaders: false };
}
