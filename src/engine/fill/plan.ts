/**
 * The one fill planner. From a variation table, the rows chosen, the sheet's tier (and optionally
 * a tier per row) and z, it lays out a sheet as data: input values, derived columns as live
 * LEEWAY formulas pointing at the row's input cells, at one tier cell and at one z cell (or, in
 * values mode, the numbers those formulas give), the provenance block and the caution, and the
 * lists of what it found: non-empty target cells (left as they are unless overwriting is
 * confirmed), cells it never writes (merged), table rows the template lacks and template rows the
 * table lacks. Nothing is written here.
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
import { readTier, TIERS } from '../tiers';
import type { Tier } from '../tiers';
import { VERSION } from '../version';
import { rowKey } from '../table/parse';
import type { NumericField, VariationRow } from '../table/types';
import { a1, columnLetters, MAX_COLUMNS, MAX_ROWS, sheetPrefix } from './a1';
import { besideBlock, belowBlock, TITLE, TIER_CELL_LABEL, Z_CELL_LABEL } from './block';
import type { BlockCell, BlockText, PlacedBlock } from './block';
import { COLUMN_HEADERS } from './headers';
import { findHeaderRow, headerRowAt, HEADER_SCAN_ROWS } from './scan';
import type { HeaderColumn, HeaderRow } from './scan';
import { rangeText, SheetIndex } from './sheet';
import { uniqueSheetName } from './util';
import type {
  AmbiguousRow,
  AnalyteName,
  BlockedCell,
  BlockSheet,
  CellContent,
  CellError,
  CellResult,
  CellRole,
  Conflict,
  DerivedField,
  ExistingCell,
  FillField,
  FillRequest,
  PlannedCell,
  PlannedColumn,
  PlannedRow,
  PlanProblem,
  PlanResult,
  Provenance,
  TemplateOnlyRow,
  TemplateReport,
  TemplateTarget,
} from './types';
import { DERIVED_FIELDS } from './types';

export { TITLE, TIER_CELL_LABEL, Z_CELL_LABEL };

/** The name of the sheet a template fill adds for its provenance when the rows below the table are taken. */
export const PROVENANCE_SHEET = 'Leeway provenance';
/** Widths in characters of that sheet's label and value columns. */
const PROVENANCE_LABEL_WIDTH = 18;
const PROVENANCE_VALUE_WIDTH = 40;

/** What the block says when the caller has no fingerprint of the table file (the task pane keeps rows, not the file). */
export const NO_FINGERPRINT = 'not recorded (imported in the pane)';
/** What the block says of the built-in demo table, which is no file. */
const DEMO_FINGERPRINT = 'none: the built-in demo table is not a file';

/** The number format that shows `decimals` decimals ("0", "0.0", "0.00", …). */
export function decimalsFormat(decimals: number): string {
  return decimals === 0 ? '0' : `0.${'0'.repeat(decimals)}`;
}

/** More decimals than a double holds digits for are left to the cell's own format. */
const MAX_SHOWN_DECIMALS = 15;

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

const EMPTY_REPORT: TemplateReport = {
  header: 'given',
  tableRange: '',
  notInTemplate: [],
  noRoom: [],
  noRoomReason: '',
  appended: [],
  missingFromTable: [],
  ambiguous: [],
  belowTable: [],
  provenanceAt: '',
  notes: [],
};

/** Checks the request as a whole; the problems, or an empty list. */
function requestProblems(req: FillRequest, rows: readonly VariationRow[]): PlanProblem[] {
  const problems: PlanProblem[] = [];
  if (rows.length === 0) problems.push({ where: '', message: 'no rows to fill: choose at least one analyte' });
  if (!(Number.isFinite(req.z) && req.z >= 0)) problems.push({ where: '', message: `z must be a finite number ≥ 0 (got ${req.z})` });
  if (!(TIERS as readonly string[]).includes(req.tier)) problems.push({ where: '', message: `tier must be one of optimum, desirable, minimum (got ${String(req.tier)})` });
  for (const [key, t] of Object.entries(req.rowTiers ?? {})) {
    if (!(TIERS as readonly string[]).includes(t)) problems.push({ where: '', message: `the tier for ${key.replace('\u0000', ' ')} must be optimum, desirable or minimum (got ${String(t)})` });
  }
  if (!/^\d{4}-\d{2}-\d{2}$/.test(req.date)) problems.push({ where: '', message: `date must be YYYY-MM-DD (got ${req.date})` });
  const decimals = req.decimals ?? 2;
  if (!(Number.isInteger(decimals) && decimals >= 0 && decimals <= 15)) problems.push({ where: '', message: `decimals must be a whole number from 0 to 15 (got ${decimals})` });
  if (req.tableSha256 !== undefined && !/^[0-9a-f]{64}$/.test(req.tableSha256)) problems.push({ where: '', message: `the table's SHA-256 must be 64 lower-case hex digits (got ${req.tableSha256})` });
  return problems;
}

/** What every plan shares: the provenance, the block's texts, the number format. */
interface Common {
  readonly rows: readonly VariationRow[];
  readonly rowTiers: Readonly<Record<string, Tier>>;
  readonly provenance: Provenance;
  readonly format: string;
  readonly decimals: number;
}

/**
 * The provenance as label and value pairs, the same on every sheet a fill writes (a new sheet, the
 * rows below a template's table, a provenance sheet of its own): the table file's SHA-256 when the
 * caller read the file, else why there is none.
 */
function provenancePairs(req: FillRequest, p: Provenance): Array<[string, string]> {
  return [
    ['Table', p.tableName],
    ['Table source', p.tableOrigin || '(not recorded)'],
    ['Table SHA-256', p.tableSha256 ?? (p.demo ? DEMO_FINGERPRINT : NO_FINGERPRINT)],
    ['Table rows', `${p.tableRows} in the table; ${p.rowsFilled} filled here`],
    ['Table imported', p.tableImported.slice(0, 10)],
    ['Data sources', summariseSources(p.sources)],
    ['Filled on', p.date],
    ['Program', `Leeway ${p.version}`],
    [
      'Derived columns',
      p.mode === 'live'
        ? 'live LEEWAY formulas (the Leeway add-in computes them)'
        : req.target.kind === 'new-sheet'
          ? "values computed at fill time; each column's formula is in its header's note and below"
          : "values computed at fill time; each column's formula is below",
    ],
  ];
}

/** Plans a fill. Never throws for bad input: a request that cannot be planned returns its problems. */
export function planFill(req: FillRequest): PlanResult {
  const rows = req.rows ?? req.table.rows;
  const problems = requestProblems(req, rows);
  if (problems.length) return { ok: false, problems };
  const decimals = req.decimals ?? 2;
  const version = req.version ?? VERSION;
  const sources = [...new Set(rows.map((r) => r.source))];
  const provenance: Provenance = {
    tableName: req.table.name,
    tableOrigin: req.table.origin,
    tableImported: req.table.importedAt,
    tableSha256: req.tableSha256 ?? null,
    tableRows: req.table.rows.length,
    rowsFilled: rows.length,
    sources,
    tier: req.tier,
    z: req.z,
    date: req.date,
    version,
    mode: req.mode,
    demo: req.table.demo,
  };
  const common: Common = { rows, rowTiers: req.rowTiers ?? {}, provenance, decimals, format: decimalsFormat(decimals) };
  return req.target.kind === 'new-sheet' ? planNewSheet(req, req.target.sheetName, common) : planTemplate(req, req.target, common);
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

/**
 * The number format of an input number written with a known count of decimals ("14.0" → "0.0"),
 * or none (the cell's own format). On a template (`onlyWhereShown`) the format is planned only
 * where it changes what the page shows: a General cell already shows 5.7 as 5.7, but 14.0 as 14,
 * so only the second gets a format, and the lab's styles part changes only where it must. A
 * template cell that has a format of its own keeps it: the command line's package writer applies a
 * planned format only over General (the task pane has no written decimals to pass: its library
 * keeps numbers, not the file's text).
 */
function writtenFormat(req: FillRequest, key: string, f: FillField, content: CellContent, onlyWhereShown = false): { format?: string } {
  if (content.kind !== 'number') return {};
  const written = req.writtenDecimals?.[key]?.[f as NumericField];
  if (written === undefined || written > MAX_SHOWN_DECIMALS) return {};
  if (onlyWhereShown && generalShows(content.value, written)) return {};
  return { format: decimalsFormat(written) };
}

/**
 * True when a cell formatted General certainly shows `x` with exactly `decimals` decimals: its
 * shortest decimal form has them, no exponent, and at most 10 significant digits (General shows
 * up to 11 characters in a column of the default width; common practice, no source). When in doubt
 * false, and the format is written.
 */
function generalShows(x: number, decimals: number): boolean {
  const s = String(Math.abs(x));
  if (/e/i.test(s)) return false;
  const [whole, fraction = ''] = s.split('.');
  const digits = (whole.replace(/^0+/, '') + fraction).replace(/^0+/, '').length;
  return digits <= 10 && fraction.length === decimals;
}

function blockText(req: FillRequest, c: Common, derived: readonly PlannedColumn[], firstRow: number | undefined, letters: Partial<Record<FillField, string>>, documents?: string, sheetNote = ''): BlockText {
  return {
    demo: req.table.demo,
    tier: req.tier,
    z: req.z,
    mode: req.mode,
    pairs: provenancePairs(req, c.provenance),
    documents,
    formulas: (tierRef, zRef) => (firstRow === undefined ? [] : derived.map((d) => [`${d.header} (${d.letter})`, `${derivedFormula(d.field as DerivedField, firstRow, letters, tierRef, zRef)}  (${sheetNote}row ${firstRow})`] as const)),
  };
}

function toPlanned(cells: readonly BlockCell[]): PlannedCell[] {
  return cells.map((b) => ({ row: b.row, col: b.col, address: a1(b), content: b.content, role: b.role, ...(b.note ? { note: b.note } : {}) }));
}

function tooBig(cells: readonly PlannedCell[]): PlanProblem | undefined {
  const maxRow = cells.reduce((m, c) => Math.max(m, c.row), 0);
  const maxCol = cells.reduce((m, c) => Math.max(m, c.col), 0);
  if (maxRow > MAX_ROWS || maxCol > MAX_COLUMNS) {
    return { where: '', message: `the fill does not fit on a sheet: it needs row ${maxRow} and column ${maxCol} (the limits are ${MAX_ROWS} rows, ${MAX_COLUMNS} columns)` };
  }
  return undefined;
}

// ---- a new sheet --------------------------------------------------------------------------------

function planNewSheet(req: FillRequest, sheetName: string, c: Common): PlanResult {
  const fields: FillField[] = [...NEW_SHEET_ORDER];
  if (c.rows.some((r) => r.limitAbs !== null || r.limitPct !== null)) fields.push(...LIMIT_FIELDS);
  fields.push('source');
  if (c.rows.some((r) => r.note !== '')) fields.push('note');
  const columns: PlannedColumn[] = fields.map((field, i) => ({ field, col: i + 1, letter: columnLetters(i + 1), header: COLUMN_HEADERS[field] }));
  const letters: Partial<Record<FillField, string>> = {};
  for (const col of columns) letters[col.field] = col.letter;
  const derivedCols = columns.filter((col) => isDerived(col.field));

  // The block's height does not depend on the row its formula lines name.
  const height = besideBlock({ row: 1, col: 1 }, blockText(req, c, derivedCols, 1, letters)).bottom;
  const headerRow = height + 2;
  const firstRow = headerRow + 1;
  const block = besideBlock({ row: 1, col: 1 }, blockText(req, c, derivedCols, firstRow, letters));
  const tierCell = a1(block.tier, true);
  const zCell = a1(block.z, true);
  const cells: PlannedCell[] = toPlanned(block.cells);
  const put = (row: number, col: number, content: CellContent, role: CellRole, extra: { format?: string; note?: string } = {}): void => {
    cells.push({ row, col, address: a1({ row, col }), content, role, ...extra });
  };
  for (const col of columns) {
    const note = isDerived(col.field) ? headerNote(col.field, req.mode, firstRow, letters, tierCell, zCell, c.provenance.version, c.decimals) : undefined;
    put(headerRow, col.col, text(col.header), 'header', note ? { note } : {});
  }
  const placedRows: PlannedRow[] = [];
  c.rows.forEach((row, i) => {
    const at = firstRow + i;
    const key = rowKey(row.analyte, row.specimen);
    const tier = c.rowTiers[key] ?? req.tier;
    placedRows.push({ key, analyte: row.analyte, specimen: row.specimen, row: at });
    for (const col of columns) {
      const f = col.field;
      if (isDerived(f)) {
        const value = derivedValue(f, row, tier, req.z);
        if (req.mode === 'live') {
          if (f === 'fixed_pct' && !(letters.limit_abs && letters.limit_pct && letters.level)) continue;
          put(at, col.col, { kind: 'formula', formula: derivedFormula(f, at, letters, tierCell, zCell), result: value ?? '' }, 'derived', { format: c.format });
        } else if (value !== undefined && value !== '') {
          put(at, col.col, typeof value === 'number' ? numberCell(value) : typeof value === 'string' ? text(value) : { kind: 'error', error: value }, 'derived', { format: c.format });
        }
        continue;
      }
      const content = inputContent(f, row, c.rowTiers[key]);
      if (content) put(at, col.col, content, f === 'tier' ? 'row-tier' : 'input', writtenFormat(req, key, f, content));
    }
  });
  cells.sort((p, q) => p.row - q.row || p.col - q.col);
  const big = tooBig(cells);
  if (big) return { ok: false, problems: [big] };
  const columnWidths: Record<number, number> = {};
  for (const col of columns) columnWidths[col.col] = isDerived(col.field) ? 12 : WIDTHS[col.field] ?? 12;
  columnWidths[1] = Math.max(columnWidths[1] ?? 0, 30);
  return {
    ok: true,
    plan: {
      sheetName,
      target: 'new-sheet',
      mode: req.mode,
      cells,
      tierCell,
      zCell,
      headerRow,
      columns,
      rows: placedRows,
      conflicts: [],
      blocked: [],
      unchanged: 0,
      overwrite: req.overwrite ?? false,
      writable: true,
      columnWidths,
      provenance: c.provenance,
      template: EMPTY_REPORT,
    },
  };
}

// ---- a template ---------------------------------------------------------------------------------

/** Footnote marks: *, †, ‡, §, ¶, #, superscript digits, "(1)", "1)", "[1]", or a leading Note/Source word. */
const FOOTNOTE = /^\s*(?:[*†‡§¶#¹²³⁴⁵⁶⁷⁸⁹⁰]|\(\d{1,2}\)|\d{1,2}\)|\[\d{1,2}\]|(?:notes?|nb|n\.b\.|sources?|footnotes?|remarks?)\b)/i;

/** A row whose only content is one text cell that is merged across columns or starts with a footnote mark. */
function isFootnoteRow(index: SheetIndex, row: number): boolean {
  const line = index.line(row);
  if (!line || line.size !== 1) return false;
  const [col, v] = [...line.entries()][0];
  if (typeof v !== 'string') return false;
  const m = index.mergeAt(row, col);
  return (m !== undefined && m.right > m.left) || FOOTNOTE.test(v);
}

/** A cell's text, or the text of the merged range it lies in (a name merged down several rows). */
function textAt(index: SheetIndex, row: number, col: number): string {
  let v = index.get(row, col);
  if (isEmpty(v)) {
    const m = index.mergeAt(row, col);
    if (m) v = index.get(m.top, m.left);
  }
  if (typeof v === 'number') return String(v);
  return typeof v === 'string' ? v.trim() : '';
}

interface Placement {
  readonly row: VariationRow;
  readonly at: number;
  /** True when the template already lists this row (its analyte and specimen cells are left alone). */
  readonly matched: boolean;
}

/** A number the formulas will read from an input cell: the value, null for a blank, or 'unknown' for anything that is not a number. */
type Effective = number | null | 'unknown';

function describe(name: AnalyteName): string {
  return name.specimen ? `${name.analyte} (${name.specimen})` : name.analyte;
}

function planTemplate(req: FillRequest, t: TemplateTarget, c: Common): PlanResult {
  const problems: PlanProblem[] = [];
  const s = t.sheet;
  const index = new SheetIndex(s);
  const mapping = t.mapping ?? {};
  const notes: string[] = [];

  // 1. The header row: given, or the best of the first rows.
  let header: HeaderRow | undefined;
  if (t.headerAt) header = headerRowAt(index, t.headerAt, mapping);
  else {
    if (index.rows.length === 0) return { ok: false, problems: [{ where: '', message: `sheet "${s.name}" is empty: a template needs a header row (Analyte, CVI %, …)`, code: 'no-header' }] };
    header = findHeaderRow(index, mapping);
    if (!header) {
      return {
        ok: false,
        problems: [
          {
            where: '',
            code: 'no-header',
            message: `no header row found in the first ${HEADER_SCAN_ROWS} rows of sheet "${s.name}": a header row names an analyte column ("Analyte") and at least one other column Leeway fills (Specimen, CVI %, CVG %, Source, Allowable total error %, …); rename the headers, or point at the header row's first cell`,
          },
        ],
      };
    }
  }
  const headerRow = header.at.row;
  for (const d of header.duplicates) {
    problems.push({ where: `${d.letter}${headerRow}`, message: `"${d.header}" and "${d.first.header}" (column ${d.first.letter}) both match ${d.field}: correct the header match` });
  }
  const seen = new Map<FillField, HeaderColumn>(header.columns.map((h) => [h.field, h]));
  if (!seen.has('analyte')) {
    problems.push({ where: `row ${headerRow}`, message: `the header row ${headerRow} of "${s.name}" has no analyte column: name one "Analyte" or correct the header match` });
  }
  for (const col of header.columns) {
    if (!isDerived(col.field)) continue;
    for (const need of NEEDS[col.field]) {
      if (!seen.has(need)) {
        problems.push({ where: `column ${col.letter}`, message: `"${col.header}" (column ${col.letter}) needs a ${COLUMN_HEADERS[need]} column, which the template lacks: add one to the header row or correct the header match` });
      }
    }
  }
  if (Object.keys(c.rowTiers).length > 0 && !seen.has('tier')) {
    problems.push({ where: `row ${headerRow}`, message: 'tiers were chosen for single analytes but the template has no tier column: add a "Tier" column or use one tier for the sheet' });
  }
  if (problems.length) return { ok: false, problems };
  const columns: PlannedColumn[] = header.columns.map((h) => ({ field: h.field, col: h.col, letter: h.letter, header: h.header }));
  const letters: Partial<Record<FillField, string>> = {};
  for (const col of columns) letters[col.field] = col.letter;
  const left = header.at.col;
  const right = Math.max(header.lastCol, ...columns.map((col) => col.col));

  // 2. The template's table: the rows below the header down to the first blank or footnote row.
  let lastDataRow = headerRow;
  for (let r = headerRow + 1; r <= index.readThrough && r <= MAX_ROWS; r++) {
    if (index.spanIsEmpty(r, left, right) || isFootnoteRow(index, r)) break;
    lastDataRow = r;
  }

  // 3. Matching: analyte and specimen both; without a specimen column, the analyte alone when the table lists it once.
  const analyteCol = seen.get('analyte')!.col;
  const specimenCol = seen.get('specimen')?.col;
  const placements: Placement[] = [];
  const placedKeys = new Set<string>();
  const ambiguous: AmbiguousRow[] = [];
  const ambiguousAnalytes = new Set<string>();
  const missingFromTable: TemplateOnlyRow[] = [];
  const byKey = new Map<string, VariationRow>();
  const byAnalyte = new Map<string, VariationRow[]>();
  for (const row of c.rows) {
    const key = rowKey(row.analyte, row.specimen);
    if (!byKey.has(key)) byKey.set(key, row);
    const a = row.analyte.trim().toLowerCase();
    const list = byAnalyte.get(a);
    if (list) list.push(row);
    else byAnalyte.set(a, [row]);
  }
  for (let r = headerRow + 1; r <= lastDataRow; r++) {
    const analyte = textAt(index, r, analyteCol);
    if (analyte === '') continue;
    const specimen = specimenCol ? textAt(index, r, specimenCol) : '';
    let hit: VariationRow | undefined;
    if (specimenCol) hit = byKey.get(rowKey(analyte, specimen));
    else {
      const list = byAnalyte.get(analyte.toLowerCase()) ?? [];
      if (list.length === 1) hit = list[0];
      else if (list.length > 1) {
        ambiguous.push({ row: r, analyte, specimens: list.map((x) => x.specimen || '(none)') });
        ambiguousAnalytes.add(analyte.toLowerCase());
        continue;
      }
    }
    if (hit) {
      placements.push({ row: hit, at: r, matched: true });
      placedKeys.add(rowKey(hit.analyte, hit.specimen));
    } else missingFromTable.push({ row: r, analyte, specimen });
  }
  const notInTemplate = c.rows.filter((row) => !placedKeys.has(rowKey(row.analyte, row.specimen)) && !ambiguousAnalytes.has(row.analyte.trim().toLowerCase()));

  // Rows further down that name a table analyte the table part did not have: a hint, never filled.
  const belowTable: TemplateOnlyRow[] = [];
  if (notInTemplate.length) {
    const wanted = new Set(notInTemplate.map((row) => row.analyte.trim().toLowerCase()));
    for (const r of index.rowsBetween(lastDataRow + 1, index.lastRow)) {
      const analyte = textAt(index, r, analyteCol);
      if (analyte && wanted.has(analyte.toLowerCase())) belowTable.push({ row: r, analyte, specimen: specimenCol ? textAt(index, r, specimenCol) : '' });
    }
  }

  // 4. Appending (only when asked): truly empty rows directly below the table, one left empty above any content further down.
  let appended: Placement[] = [];
  let noRoom: VariationRow[] = [];
  let noRoomReason = '';
  if (t.append && notInTemplate.length) {
    const start = lastDataRow + 1;
    const next = nextTakenRow(index, start);
    const room = next === undefined ? MAX_ROWS - lastDataRow : Math.max(0, next - start - 1);
    appended = notInTemplate.slice(0, room).map((row, i) => ({ row, at: start + i, matched: false }));
    noRoom = notInTemplate.slice(room);
    if (noRoom.length && next !== undefined) {
      const empty = next - start;
      noRoomReason =
        next > index.readThrough
          ? `rows below ${index.readThrough} were not read`
          : `row ${next} holds other content${empty === 0 ? ' directly below the table' : `, ${empty} empty row${empty === 1 ? '' : 's'} below the table, one of which stays empty`}; appending writes only into empty rows directly below the table and keeps one empty row above other content`;
    }
    placements.push(...appended);
  }
  placements.sort((p, q) => p.at - q.at);
  // The provenance counts the table rows this sheet received (matched or appended), each once.
  const counted: Common = { ...c, provenance: { ...c.provenance, rowsFilled: new Set(placements.map((p) => rowKey(p.row.analyte, p.row.specimen))).size } };
  const tableBottom = Math.max(lastDataRow, ...appended.map((p) => p.at));

  // 5. The cells of the rows, and what each derived formula will read.
  const cells: PlannedCell[] = [];
  const conflicts: Conflict[] = [];
  const blocked: BlockedCell[] = [];
  let unchanged = 0;
  const overwrite = req.overwrite ?? false;
  /** Decides one target cell: written, unchanged, a conflict (kept unless overwrite) or blocked. Returns true when the planned content will be in the cell. */
  const target = (row: number, col: number, content: CellContent, role: CellRole, extra: { format?: string; note?: string } = {}, onSheet = true): boolean => {
    const cell: PlannedCell = { row, col, address: a1({ row, col }), content, role, ...extra };
    if (!onSheet) {
      cells.push(cell);
      return true;
    }
    const merge = index.mergeAt(row, col);
    const lock = merge ? { reason: `merged ${rangeText(merge)}` } : index.lockedAt(row, col);
    const existing = index.get(row, col);
    if (!lock && isEmpty(existing) && row <= index.readThrough) {
      cells.push(cell);
      return true;
    }
    if (!isEmpty(existing) && sameContent(existing, content)) {
      unchanged++;
      return true;
    }
    if (lock) {
      blocked.push({ address: cell.address, row, col, planned: shown(content), reason: lock.reason });
      return false;
    }
    if (isEmpty(existing)) {
      blocked.push({ address: cell.address, row, col, planned: shown(content), reason: `row ${row} was not read` });
      return false;
    }
    conflicts.push({ address: cell.address, row, col, existing: existing as string | number | boolean, planned: shown(content) });
    if (overwrite) cells.push(cell);
    return overwrite;
  };

  // The block's place: below the table when the rows there are empty, else a sheet of its own.
  const derivedCols = columns.filter((col) => isDerived(col.field));
  const firstRow = placements.length ? placements[0].at : undefined;
  const span = (() => {
    let w = 0;
    for (let col = left; col <= right; col++) w += index.width(col);
    return w;
  })();
  let block: PlacedBlock;
  let blockSheet: BlockSheet | undefined;
  let tierPrefix = '';
  let provenanceAt: string;
  const tableRange = rangeText({ top: headerRow, left, bottom: tableBottom, right });
  if (t.blockAt) {
    block = besideBlock(t.blockAt, blockText(req, counted, derivedCols, firstRow, letters));
    provenanceAt = `${rangeText({ top: block.cells[0].row, left: t.blockAt.col, bottom: block.bottom, right: block.right })} (the place asked for)`;
  } else {
    const below = belowBlock(tableBottom + 2, left, span, (col) => index.width(col), blockText(req, counted, derivedCols, firstRow, letters));
    let free = true;
    for (let r = tableBottom + 1; r <= below.bottom && free; r++) free = index.rowIsEmpty(r);
    if (free) {
      block = below;
      provenanceAt = `below the table, ${rangeText({ top: tableBottom + 2, left, bottom: below.bottom, right: left })}`;
    } else {
      const name = uniqueSheetName(PROVENANCE_SHEET, s.sheetNames ?? [s.name]);
      tierPrefix = sheetPrefix(name);
      const documents = `sheet "${s.name}", ${tableRange} (header row ${headerRow}): its formulas read the tier and z cells below`;
      // Two columns that print on one portrait page (58 characters in all), long values wrapped.
      block = besideBlock({ row: 1, col: 1 }, blockText(req, counted, derivedCols, firstRow, letters, documents, `sheet "${s.name}", `), tierPrefix, PROVENANCE_VALUE_WIDTH - 2);
      blockSheet = { name, cells: toPlanned(block.cells), columnWidths: { 1: PROVENANCE_LABEL_WIDTH, 2: PROVENANCE_VALUE_WIDTH } };
      provenanceAt = `the sheet "${name}" (the rows below the table are not empty)`;
    }
  }
  const tierCell = tierPrefix + a1(block.tier, true);
  const zCell = tierPrefix + a1(block.z, true);

  const placedRows: PlannedRow[] = [];
  for (const p of placements) {
    const row = p.row;
    const key = rowKey(row.analyte, row.specimen);
    const rowTier = c.rowTiers[key];
    placedRows.push({ key, analyte: row.analyte, specimen: row.specimen, row: p.at });
    const eff: Partial<Record<FillField, Effective | string>> = {};
    const kept: string[] = [];
    for (const col of columns) {
      const f = col.field;
      if (isDerived(f)) continue;
      if (p.matched && (f === 'analyte' || f === 'specimen')) continue;
      const content = inputContent(f, row, rowTier);
      const existing = index.get(p.at, col.col);
      if (content && target(p.at, col.col, content, f === 'tier' ? 'row-tier' : 'input', writtenFormat(req, key, f, content, true))) {
        eff[f] = content.kind === 'number' ? content.value : content.kind === 'text' ? content.text : 'unknown';
        continue;
      }
      // The cell keeps what it holds, and the formula will read that.
      if (isEmpty(existing)) eff[f] = f === 'tier' ? '' : null;
      else {
        eff[f] = typeof existing === 'number' ? existing : f === 'tier' && typeof existing === 'string' ? existing : 'unknown';
        if (content) kept.push(`${col.header} ${JSON.stringify(existing)} (the table has ${shown(content)})`);
        else if (f !== 'tier') kept.push(`${col.header} ${JSON.stringify(existing)} (the table has none)`);
      }
    }
    /** What the formula will read from an input column: the written or kept number, null for blank, 'unknown' for anything else. */
    const numberOf = (f: FillField, fallback: number | null): Effective => {
      if (!letters[f]) return fallback;
      const v = eff[f];
      if (v === undefined) return fallback;
      return typeof v === 'string' ? 'unknown' : v;
    };
    const effective = {
      cvi: numberOf('cvi', row.cvi),
      cvg: numberOf('cvg', row.cvg),
      limit_abs: numberOf('limit_abs', row.limitAbs),
      limit_pct: numberOf('limit_pct', row.limitPct),
      level: numberOf('level', row.level),
    } as Partial<Record<FillField, Effective>>;
    let tier: Tier | undefined = rowTier ?? req.tier;
    let tierUnknown = false;
    if (letters.tier) {
      const w = eff.tier;
      if (typeof w === 'string' && w !== '' && w !== 'unknown') tier = readTierOrUndefined(w);
      tierUnknown = w === 'unknown' || tier === undefined;
    }
    for (const col of derivedCols) {
      const f = col.field as DerivedField;
      const unknown = NEEDS[f].filter((n) => effective[n] === 'unknown').map((n) => `${letters[n]}${p.at}`);
      if (tierUnknown && f !== 'fixed_pct') unknown.push(`${letters.tier}${p.at}`);
      let value: CellResult | undefined;
      if (unknown.length === 0 && tier) {
        const inputs: VariationRow = {
          ...row,
          cvi: effective.cvi as number,
          cvg: effective.cvg as number | null,
          limitAbs: effective.limit_abs as number | null,
          limitPct: effective.limit_pct as number | null,
          level: effective.level as number | null,
        };
        value = inputs.cvi === null && f !== 'fixed_pct' ? { error: '#N/A', message: 'cvi is blank: enter a number' } : derivedValue(f, inputs, tier, req.z);
      }
      if (req.mode === 'live') {
        if (f === 'fixed_pct' && !(letters.limit_abs && letters.limit_pct && letters.level)) continue;
        const stored = target(p.at, col.col, { kind: 'formula', formula: derivedFormula(f, p.at, letters, tierCell, zCell), result: unknown.length ? '' : value ?? '' }, 'derived', { format: c.format });
        if (stored && unknown.length) notes.push(`${col.letter}${p.at}: its formula reads a cell that holds no number (${unknown.join(', ')}), so no result is stored with it; the add-in computes it`);
      } else if (unknown.length) {
        notes.push(`${col.letter}${p.at} was left empty: it would read a cell that holds no number (${unknown.join(', ')})`);
      } else if (value !== undefined && value !== '') {
        target(p.at, col.col, typeof value === 'number' ? numberCell(value) : typeof value === 'string' ? text(value) : { kind: 'error', error: value }, 'derived', { format: c.format });
      }
    }
    if (kept.length && derivedCols.length) notes.push(`${describe(row)} (row ${p.at}): the derived columns use the sheet's own ${kept.join(', ')}`);
  }

  // 6. The block's cells.
  for (const b of block.cells) {
    if (blockSheet) break;
    target(b.row, b.col, b.content, b.role, b.note ? { note: b.note } : {});
  }
  if (!blockSheet && s.printArea && s.printArea.length) {
    const inPrint = (row: number, col: number): boolean => s.printArea!.some((r) => row >= r.top && row <= r.bottom && col >= r.left && col <= r.right);
    if (!block.cells.every((b) => inPrint(b.row, b.col))) {
      notes.push(`the sheet's print area (${s.printArea.map(rangeText).join(', ')}) leaves out the provenance block (${provenanceAt.replace(/^below the table, /, '')}): it prints only if the print area is extended to it`);
    }
    if (appended.some((p) => !inPrint(p.at, left))) notes.push(`the sheet's print area (${s.printArea.map(rangeText).join(', ')}) leaves out rows appended below the table`);
  }

  cells.sort((p, q) => p.row - q.row || p.col - q.col);
  const big = tooBig(cells);
  if (big) return { ok: false, problems: [big] };
  const name = (row: VariationRow): AnalyteName => ({ analyte: row.analyte, specimen: row.specimen });
  const template: TemplateReport = {
    header: t.headerAt ? 'given' : 'scanned',
    tableRange,
    notInTemplate: notInTemplate.map(name),
    noRoom: noRoom.map(name),
    noRoomReason,
    appended: placedRows.filter((r) => appended.some((a) => a.at === r.row)),
    missingFromTable,
    ambiguous,
    belowTable,
    provenanceAt,
    notes,
  };
  return {
    ok: true,
    plan: {
      sheetName: s.name,
      target: 'template',
      mode: req.mode,
      cells,
      tierCell,
      zCell,
      ...(blockSheet ? { blockSheet } : {}),
      headerRow,
      columns,
      rows: placedRows,
      conflicts,
      blocked,
      unchanged,
      overwrite,
      writable: true,
      columnWidths: {},
      provenance: counted.provenance,
      template,
    },
  };
}

/** A tier word as the worksheet functions read it, or undefined when they would refuse it. */
function readTierOrUndefined(word: string): Tier | undefined {
  try {
    return readTier(word);
  } catch {
    return undefined;
  }
}

/** The first row at or after `from` that holds content, lies in a merge, or was not read; undefined when there is none. */
function nextTakenRow(index: SheetIndex, from: number): number | undefined {
  let next: number | undefined = index.firstRowFrom(from);
  for (const m of index.merges) {
    if (m.bottom < from) continue;
    const top = Math.max(m.top, from);
    if (next === undefined || top < next) next = top;
  }
  if (index.readThrough < MAX_ROWS && (next === undefined || index.readThrough + 1 < next)) next = Math.max(from, index.readThrough + 1);
  return next;
}
