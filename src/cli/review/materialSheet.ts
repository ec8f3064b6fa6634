/**
 * One sheet per analyte and control material: the review figures (this material alone, and all
 * materials of the analyte read together), its observed performance, the control chart as a
 * picture, and its results with z and the flags. z, the flags and the figures are live formulas
 * (the flags and the all-material figures read the analyte's block on the Results sheet), each
 * with the engine's value cached, so the sheet reads the same with or without the add-in.
 */
import type ExcelJS from 'exceljs';
import type { BodyValue, DocumentSheet } from '../document';
import { SET_IN } from '../document';
import { storedFormula } from '../xlsx';
import { chartSeries } from '../../charts/controlChart';
import type { ChartPoint } from '../../charts/controlChart';
import { labelKey } from '../../engine/labels';
import type { OutCell } from '../../registry/types';
import { NAMESPACE } from '../../registry';
import { QC_REVIEW } from '../../registry/catalogue/qc';
import type { AnalyteReview, MaterialReview } from './model';
import { figure } from './model';
import type { ReviewContext } from './context';
import { reviewSheet } from './context';
import { RESULTS_COLUMNS, blockRange } from './resultsSheet';
import type { Block } from './resultsSheet';
import { renderChart } from './pictures';

/** Most points a chart draws: beyond it, every flagged result and an even spread of the others. */
export const MAX_CHART_POINTS = 400;

const F2 = '0.00';
const F3 = '0.000';
const REVIEW_FORMATS: Readonly<Record<string, string>> = { 'Share of runs flagged': F3, 'Expected false rejection per run': F3, 'Mean z': F2, 'SD of z': F2 };

/**
 * What the flags column shows where no rule fires (QC.FLAGS gives ""). A formula cell whose
 * cached result is empty text is recalculated on opening by programs without the add-in, which
 * then show an error there; a visible mark keeps the cached result.
 */
export const NO_FLAG = '–';

/** Columns of the results table. */
const TABLE = { run: 1, date: 2, value: 3, target: 4, sd: 5, z: 6, flags: 7, line: 8 } as const;
const LETTER = { run: 'A', value: 'C', target: 'D', sd: 'E' } as const;
const LETTER_Z = 'F';
const LETTER_FLAGS = 'G';

/** A cached value as exceljs stores a formula's result. */
function cached(v: OutCell): ExcelJS.CellFormulaValue['result'] {
  if (typeof v === 'object') return { error: v.error as ExcelJS.CellErrorValue['error'] };
  return v;
}

/** A live formula (typed as a user types it) with its cached value. */
function live(ws: ExcelJS.Worksheet, row: number, col: number, typed: string, value: OutCell, format?: string): void {
  const cell = ws.getCell(row, col);
  cell.value = { formula: storedFormula(typed), result: cached(value) };
  if (format && typeof value === 'number') cell.numFmt = format;
  if (typeof value === 'string') cell.alignment = SET_IN;
}

/** A rule as a formula's text argument. */
const quoted = (s: string): string => `"${s.replace(/"/g, '""')}"`;

/** The chart's points of one material, renumbered 1…n in its own run order; at most MAX_CHART_POINTS, every flagged one kept. */
export function materialPoints(a: AnalyteReview, m: MaterialReview): { points: ChartPoint[]; total: number } {
  const key = labelKey(m.level.level);
  const series = chartSeries(a.evaluation).find((s) => labelKey(s.name) === key);
  const all = (series?.points ?? []).map((p, i) => ({ ...p, index: i + 1 }));
  if (all.length <= MAX_CHART_POINTS) return { points: all, total: all.length };
  const flagged = all.filter((p) => p.flags !== '');
  const room = Math.max(0, MAX_CHART_POINTS - flagged.length);
  const others = all.filter((p) => p.flags === '');
  const step = others.length / Math.max(1, room);
  const kept = new Set<ChartPoint>(flagged);
  for (let k = 0; k < room && k * step < others.length; k++) kept.add(others[Math.floor(k * step)]);
  return { points: all.filter((p) => kept.has(p)), total: all.length };
}

/** A sheet's chart: its picture being rendered, and how many of the results it draws. */
export interface PendingChart {
  readonly width: number;
  readonly height: number;
  readonly png: Promise<Buffer>;
  readonly shown: number;
  readonly total: number;
}

/** Starts the chart of one material (rendered while other sheets are written). */
export function startChart(a: AnalyteReview, m: MaterialReview): PendingChart {
  const { points, total } = materialPoints(a, m);
  return { ...renderChart(`${a.analyte} — ${m.level.level}`, m.level.level, points), shown: points.length, total };
}

interface Layout {
  readonly first: number;
  readonly last: number;
}

function ownRange(t: Layout, letter: string): string {
  return `$${letter}$${t.first}:$${letter}$${t.last}`;
}

/** The review figures: this material (its own rows) and all materials (the Results block). */
function writeFigures(doc: DocumentSheet, top: number, a: AnalyteReview, m: MaterialReview, t: Layout, block: Block): void {
  const rule = quoted(a.rule);
  const own = `${NAMESPACE}.QC.REVIEW(${['value', 'target', 'sd'].map((c) => ownRange(t, LETTER[c as 'value'])).join(',')},${rule},${ownRange(t, LETTER.run)})`;
  const R = RESULTS_COLUMNS;
  const all = `${NAMESPACE}.QC.REVIEW(${blockRange(block, R.value)},${blockRange(block, R.target)},${blockRange(block, R.sd)},${rule},${blockRange(block, R.run)},${blockRange(block, R.level)})`;
  QC_REVIEW.labels.forEach((label, k) => {
    const r = top + k;
    doc.put(r, 1, label);
    live(doc.ws, r, 2, `=INDEX(${own},2,${k + 1})`, figure(m.review, label), REVIEW_FORMATS[label]);
    live(doc.ws, r, 3, `=INDEX(${all},2,${k + 1})`, figure(a.review, label), REVIEW_FORMATS[label]);
  });
}

/** Rows the performance block takes. */
function performanceRows(a: AnalyteReview, m: MaterialReview): number {
  if (m.assessment) return 2 + 4 + 1 + (m.runSizeStatement ? 1 : 0);
  return 2 + (a.tableNote ? 1 : 0);
}

/** Observed performance of this material and, with a table, its allowances, sigma and run size. */
function writePerformance(doc: DocumentSheet, top: number, a: AnalyteReview, m: MaterialReview, t: Layout): void {
  const ws = doc.ws;
  let r = top;
  const line = (text: string): void => {
    doc.put(r, 1, text);
    doc.markSpan(r++, 1);
  };
  doc.put(r, 1, 'Observed CV %');
  live(ws, r++, 2, `=${NAMESPACE}.DATA.CV(${ownRange(t, LETTER.value)})`, m.cv, F2);
  doc.put(r, 1, 'Bias % vs targets');
  live(ws, r++, 2, `=${NAMESPACE}.DATA.BIAS(${ownRange(t, LETTER.value)},${ownRange(t, LETTER.target)})`, m.bias, F2);
  const x = m.assessment;
  if (!x) {
    if (a.tableNote) line(`No allowance: ${a.tableNote}.`);
    return;
  }
  const show = (f: typeof x.inUse.cv): OutCell | string => (f.ok ? f.value : f.absent ? f.why : { error: f.code, message: f.message });
  const rows: Array<[string, OutCell | string, string]> = [
    [`Allowable CV % (${x.tier})`, show(x.inUse.cv), F2],
    [`Allowable total % (${x.tier})`, show(x.inUse.total), F2],
    ['Sigma', show(x.inUse.sigma), '0.0'],
    ['Run size (QC.RUNSIZE)', m.runSize, '0'],
  ];
  for (const [label, v, format] of rows) {
    doc.put(r, 1, label);
    doc.put(r++, 2, typeof v === 'object' ? { error: v.error } : v, { format });
  }
  line(`Sigma = (allowable total − |bias|)/CV, the bias against the control targets; run size for ${a.rule} with ${a.n} control${a.n === 1 ? '' : 's'} per QC event (${a.nFrom}), at most one expected unreliable final result.`);
  if (m.runSizeStatement) line(`Note: ${m.runSizeStatement}.`);
}

/** Writes one analyte × material sheet, its chart placed once rendered. */
export async function writeMaterialSheet(ctx: ReviewContext, name: string, a: AnalyteReview, m: MaterialReview, block: Block, pic: PendingChart): Promise<void> {
  const results = m.level.results;
  const dates = results.map((r) => r.date).filter((d): d is string => d !== null);
  const period = dates.length ? `, ${dates[0]} to ${dates[dates.length - 1]}` : '';
  const doc = reviewSheet(ctx, name, `${a.analyte} — ${m.level.level}: control review${period}`);
  doc.text(`Rule ${a.rule} (${a.ruleFrom}). Flags read every material of ${a.analyte} together (Results sheet rows ${block.first}–${block.last}); "This material" reads ${m.level.level} alone.`);
  doc.skip();
  doc.header(['Review figure', `This material (${m.level.level})`, `All materials of ${a.analyte}`]);
  const figuresTop = doc.row;
  doc.skip(QC_REVIEW.labels.length);
  doc.skip();
  const perfTop = doc.row;
  doc.skip(performanceRows(a, m));
  doc.skip();
  const picTop = doc.row;
  const picRows = Math.ceil((pic.height * 0.75) / 15) + 1;
  doc.skip(picRows);
  if (pic.shown < pic.total) doc.note(`The chart draws ${pic.shown} of the ${pic.total} results: every flagged result and an even spread of the others.`);
  doc.skip();
  doc.printTitle(doc.header(['Run', 'Date', 'Value', 'Target', 'SD', 'z', 'Flags', 'Row in file']));
  const t: Layout = { first: doc.row, last: doc.row + results.length - 1 };
  const R = RESULTS_COLUMNS;
  const flagsCall = `${NAMESPACE}.QC.FLAGS(${blockRange(block, R.value)},${blockRange(block, R.target)},${blockRange(block, R.sd)},${quoted(a.rule)},${blockRange(block, R.run)},${blockRange(block, R.level)})`;
  // z and the flags are one shared formula each (written once, the rows below refer to it); a
  // result's flags are found by its row in the file, so the formula is the same on every row.
  const zMaster = `${LETTER_Z}${t.first}`;
  const flagMaster = `${LETTER_FLAGS}${t.first}`;
  const lines = blockRange(block, R.line);
  // The table is a body of plain rows (hundreds per sheet, tens of thousands per workbook).
  const formats: (string | undefined)[] = [];
  formats[TABLE.z - 1] = F2;
  results.forEach((res, i) => {
    const r = doc.row;
    const flag = m.flags[i] === '' ? NO_FLAG : m.flags[i];
    const at = `INDEX(${flagsCall},MATCH($H${r},${lines},0))`;
    const z: BodyValue = i === 0 ? { formula: storedFormula(`=(C${r}-D${r})/E${r}`), result: m.z[i] } : { sharedFormula: zMaster, result: m.z[i] };
    const flags: BodyValue = i === 0 ? { formula: storedFormula(`=IF(${at}="","${NO_FLAG}",${at})`), result: flag } : { sharedFormula: flagMaster, result: flag };
    // In the order of TABLE: run, date, value, target, SD, z, flags, row in file.
    doc.bodyLine([res.run, res.date ?? '', res.value, res.target, res.sd, z, flags, res.line], { formats });
  });
  writeFigures(doc, figuresTop, a, m, t, block);
  writePerformance(doc, perfTop, a, m, t);
  const id = ctx.wb.addImage({ buffer: (await pic.png) as unknown as ExcelJS.Buffer, extension: 'png' });
  doc.ws.addImage(id, { tl: { col: 0, row: picTop - 1 }, ext: { width: pic.width, height: pic.height }, editAs: 'oneCell' });
  doc.finish();
}
