/**
 * `leeway review --results R.csv --out OUT.xlsx [--rule RULE] [--table T.csv [--tier T]]
 *   [--run-size N] [--force] [--date D] [--paper A4|Letter] [--map HEADER=FIELD]` and
 * `leeway review --demo --out OUT.xlsx`: a review workbook of a period's control results.
 *
 * The results file is read by the same importer and report as `leeway check --results`: a file
 * with errors prints the report and writes nothing (exit 1); warnings are printed and the review
 * goes on (dates out of order are reported and the file order is kept). The workbook: a Summary,
 * one sheet per analyte and material (figures, chart, results with live flags), and the Results
 * sheet (every result as read). Every sheet is a printable document with the provenance and the
 * caution.
 */
import { createHash } from 'crypto';
import * as path from 'path';
import { UsageError } from '../call';
import type { Io } from '../main';
import { one, readOptions } from '../options';
import { readKindMappings } from '../check';
import { readBytes, checkOutput, writeBytesAtomically, today, newWorkbook } from '../files';
import { readPaper } from '../fill';
import { progressBar } from '../progress';
import type { Progress } from '../progress';
import type { Paper } from '../document';
import { parseResultsBytes, acceptResults, formatProblem, formatReport, parseEqaBytes, acceptEqa } from '../../engine/import';
import type { EqaResultsFile } from '../../engine/import';
import { writeEqaSheet } from '../eqa';
import { demoEqaSheetInput } from '../demo';
import type { EqaLimit } from '../../engine/eqaRounds';
import type { ControlResultsFile } from '../../engine/import';
import { parseTableBytes, acceptImport, formatReport as formatTableReport, formatProblem as formatTableProblem } from '../../engine/table';
import type { VariationTable } from '../../engine/table';
import { demoControlsCsv, demoTable, DEMO_MARKER } from '../../engine/demo';
import { readTier } from '../../engine/tiers';
import type { Tier } from '../../engine/tiers';
import { parseRule } from '../../engine/qc/rules';
import { LeewayError } from '../../engine/errors';
import { VERSION } from '../../engine/version';
import { analyteBlock, reviewAnalyte, DEFAULT_REVIEW_RULE } from './model';
import type { AnalyteReview, ReviewRequest } from './model';
import type { Provenance, ReviewContext, ReviewSheetWriter } from './context';
import { writeSummarySheet, SUMMARY_SHEET } from './summarySheet';
import { writeResultsSheet, RESULTS_SHEET } from './resultsSheet';
import type { Block } from './resultsSheet';
import { startChart, writeMaterialSheet } from './materialSheet';
import type { PendingChart } from './materialSheet';
import { sheetNames } from './names';
import { WorkbookPackage } from './package';

export type { ReviewSheetWriter, ReviewContext } from './context';

export const REVIEW_USAGE = `  leeway review --results R.csv --out OUT.xlsx [--rule RULE] [--table T.csv [--tier T]]
              [--run-size N] [--eqa E.csv] [--force] [--date YYYY-MM-DD] [--paper A4|Letter]
              [--map HEADER=FIELD]
  leeway review --demo --out OUT.xlsx
                                   a review workbook of a period's control results: a summary, one
                                   sheet per analyte and material (review figures, control chart,
                                   results with their flags) and the results as read; with --eqa an
                                   EQA results file adds a sheet of EQA scores across rounds`;

export const DEMO_REVIEW_FILE = 'leeway-review-demo.xlsx';

/** Charts being rendered ahead of the sheet being written. */
const CHARTS_AHEAD = 8;

export interface ReviewBuild {
  readonly file: ControlResultsFile;
  readonly table?: VariationTable;
  readonly tier: Tier;
  readonly rule?: string;
  readonly labRunSize?: number;
  readonly provenance: Provenance;
  readonly paper: Paper;
  /** Sheets added after the review's own (an EQA sheet, say). */
  readonly extraSheets?: readonly ReviewSheetWriter[];
  readonly progress?: Progress;
}

/** Every figure, analyte by analyte. */
export function reviewAll(request: ReviewRequest): AnalyteReview[] {
  return request.file.analytes.map((a) => reviewAnalyte(a, analyteBlock(a), request));
}

/** Gives a finished sheet's workbook its views and writes its sheets into the package from tab `position` on. */
function place(pkg: WorkbookPackage, ctx: ReviewContext, position: number): number {
  for (const ws of ctx.wb.worksheets) ws.views = [{ state: 'normal', zoomScale: 100 }];
  return pkg.addWorkbook(ctx.wb, position);
}

/**
 * Builds the review workbook: the Summary, one sheet per analyte and material, the Results sheet,
 * then any extra sheets. Each sheet is built in an exceljs workbook of its own, finished by the
 * document-sheet layer and written into the package at once (see ./package.ts), so no more than
 * one sheet is held in memory. The Results sheet is built first (the flags refer to its rows) and
 * placed after the analytes' sheets.
 */
export async function buildReviewPackage(b: ReviewBuild): Promise<{ bytes: Buffer; analytes: AnalyteReview[] }> {
  const pkg = new WorkbookPackage({
    creator: `Leeway ${VERSION}`,
    title: b.provenance.demo ? `Leeway control review — ${DEMO_MARKER}` : 'Leeway control review',
  });
  const sheet = (): ReviewContext => ({ wb: newWorkbook(), provenance: b.provenance, paper: b.paper });
  const sheetWith = (write: (ctx: ReviewContext) => unknown): ReviewContext => {
    const ctx = sheet();
    write(ctx);
    return ctx;
  };
  const request: ReviewRequest = { file: b.file, table: b.table, tier: b.tier, rule: b.rule, labRunSize: b.labRunSize };
  const analytes = reviewAll(request);
  const names = sheetNames(analytes.map((a) => a.materials.map((m) => `${a.analyte} ${m.level.level}`)), [SUMMARY_SHEET, RESULTS_SHEET]);
  const charts = analytes.flatMap((a, ai) => a.materials.map((m, mi) => ({ a, ai, m, mi })));
  // Each sheet's workbook is a short-lived value, left to the collector once written.
  place(pkg, sheetWith((ctx) => writeSummarySheet(ctx, analytes, b.labRunSize)), 1);
  let blocks: Block[] = [];
  place(pkg, sheetWith((ctx) => (blocks = writeResultsSheet(ctx, analytes))), charts.length + 2);
  // Charts render on worker threads, a few sheets ahead of the sheet that places each.
  const pending: PendingChart[] = [];
  const start = (k: number): void => {
    if (k < charts.length) pending[k] = startChart(charts[k].a, charts[k].m);
  };
  for (let k = 0; k < CHARTS_AHEAD; k++) start(k);
  for (let k = 0; k < charts.length; k++) {
    start(k + CHARTS_AHEAD);
    const { a, ai, m, mi } = charts[k];
    const ctx = sheet();
    await writeMaterialSheet(ctx, names[ai][mi], a, m, blocks[ai], pending[k]);
    place(pkg, ctx, k + 2);
    delete pending[k];
    b.progress?.update(k + 1, charts.length);
    // The renderer's native memory is released by finalizers that run between turns of the event loop.
    await new Promise((resolve) => setImmediate(resolve));
  }
  let position = charts.length + 3;
  for (const write of b.extraSheets ?? []) {
    const ctx = sheet();
    await write(ctx);
    position += place(pkg, ctx, position);
  }
  return { bytes: await pkg.finish(), analytes };
}

function readRunSize(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const n = Number(text);
  if (!(text.trim() !== '' && Number.isInteger(n) && n >= 1 && n <= 1000000)) throw new UsageError(`review: --run-size must be a whole number of patient results from 1 to 1,000,000 (got ${text})`);
  return n;
}

function readRuleOption(text: string | undefined): string | undefined {
  if (text === undefined) return undefined;
  try {
    parseRule(text);
  } catch (e) {
    if (e instanceof LeewayError) throw new UsageError(`review: --rule ${text}: ${e.message}`);
    throw e;
  }
  return text.trim();
}

function readTierOption(text: string | undefined): Tier {
  if (text === undefined) return 'desirable';
  try {
    return readTier(text);
  } catch (e) {
    throw new UsageError(`review: --tier ${e instanceof LeewayError ? e.message.replace(/^tier /, '') : text}`);
  }
}

const sha256 = (bytes: Uint8Array): string => createHash('sha256').update(bytes).digest('hex');

/** Reads the variation table; prints its report and returns undefined when it has errors. */
function readTable(file: string, io: Io): { table: VariationTable; sha256: string } | undefined {
  const bytes = readBytes(file, 'table');
  const imported = parseTableBytes(bytes, { name: path.basename(file), origin: path.resolve(file) });
  if (!imported.ok) {
    for (const line of formatTableReport(imported)) io.err(line);
    io.err(`leeway review: the table ${file} has errors: nothing was written (see leeway check)`);
    return undefined;
  }
  for (const p of imported.problems) io.err(`leeway review: table: ${formatTableProblem(p)}`);
  return { table: acceptImport(imported), sha256: sha256(bytes) };
}

/** The EQA limits of the variation table (its fixed limits), by analyte; none without a table. */
function eqaLimits(table: VariationTable | undefined): Record<string, EqaLimit> | undefined {
  if (!table) return undefined;
  const limits: Record<string, EqaLimit> = {};
  for (const r of table.rows) {
    if (r.limitAbs === null && r.limitPct === null) continue;
    if (limits[r.analyte] === undefined) limits[r.analyte] = { absolute: r.limitAbs, percent: r.limitPct };
  }
  return limits;
}

export async function reviewCommand(args: string[], io: Io): Promise<number> {
  const o = readOptions('review', args, { values: ['results', 'out', 'rule', 'table', 'tier', 'run-size', 'date', 'paper', 'map', 'eqa'], flags: ['force', 'demo'], repeatable: ['map'] });
  if (o.positional.length) throw new UsageError(`review: unexpected argument ${o.positional[0]} (the results file goes after --results)`);
  const demo = o.flags.has('demo');
  const resultsPath = one(o, 'results');
  if (demo && resultsPath) throw new UsageError('review: --demo builds its own invented results: leave out --results');
  if (!demo && !resultsPath) throw new UsageError('review needs --results R.csv (or --demo)');
  const out = one(o, 'out') ?? (demo ? DEMO_REVIEW_FILE : undefined);
  if (!out) throw new UsageError('review needs --out OUT.xlsx');
  const rule = readRuleOption(one(o, 'rule'));
  const tier = readTierOption(one(o, 'tier'));
  if (one(o, 'tier') !== undefined && !one(o, 'table') && !demo) throw new UsageError('review: --tier needs --table (the allowances come from a variation table)');
  const labRunSize = readRunSize(one(o, 'run-size'));
  const date = one(o, 'date') ?? today();
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new UsageError(`review: --date must be YYYY-MM-DD (got ${date})`);
  const paper = readPaper(one(o, 'paper'), 'review');
  const mappings = readKindMappings(o.values.get('map'), 'review', ['results', 'eqa']);
  const mapping = mappings.results;
  const force = o.flags.has('force');
  checkOutput(out, force);

  const bytes = demo ? new TextEncoder().encode(demoControlsCsv()) : readBytes(resultsPath as string, 'control results file');
  const fileName = demo ? 'demo control results (invented, built in)' : path.basename(resultsPath as string);
  const report = parseResultsBytes(bytes, { name: fileName, origin: demo ? 'built-in demo' : path.resolve(resultsPath as string), mapping, importedAt: `${date}T00:00:00.000Z` });
  if (!report.ok) {
    for (const line of formatReport(report)) io.err(line);
    io.err(`leeway review: the control results file ${resultsPath} has errors: nothing was written (see leeway check --results)`);
    return 1;
  }
  for (const p of report.problems) io.err(`leeway review: ${formatProblem(p)}`);
  const file = acceptResults(report);

  let table: { table: VariationTable; sha256: string } | undefined;
  const tablePath = one(o, 'table');
  if (tablePath) {
    table = readTable(tablePath, io);
    if (!table) return 1;
  } else if (demo) table = { table: demoTable(), sha256: '' };

  let eqa: { file: EqaResultsFile; bytes: Uint8Array; name: string } | undefined;
  const eqaPath = one(o, 'eqa');
  if (eqaPath) {
    const eqaBytes = readBytes(eqaPath, 'EQA results file');
    const eqaReport = parseEqaBytes(eqaBytes, { name: path.basename(eqaPath), origin: path.resolve(eqaPath), mapping: mappings.eqa, importedAt: `${date}T00:00:00.000Z` });
    if (!eqaReport.ok) {
      for (const line of formatReport(eqaReport)) io.err(line);
      io.err(`leeway review: the EQA results file ${eqaPath} has errors: nothing was written (see leeway check --eqa)`);
      return 1;
    }
    for (const p of eqaReport.problems) io.err(`leeway review: EQA: ${formatProblem(p)}`);
    eqa = { file: acceptEqa(eqaReport), bytes: eqaBytes, name: path.basename(eqaPath) };
  }

  const provenance: Provenance = {
    fileName,
    sha256: sha256(bytes),
    rows: report.rowCount,
    table: table ? { name: table.table.name, sha256: table.sha256 } : undefined,
    tier,
    rule: rule ? `${rule} for every analyte` : table ? 'per analyte, the QC plan from the table (see Summary)' : `${DEFAULT_REVIEW_RULE} for every analyte (the default)`,
    date,
    demo,
  };
  const bar = progressBar('reviewing');
  const extraSheets: ReviewSheetWriter[] = [];
  if (demo && !eqa) {
    // The invented demo's EQA rounds, so the demo review shows the EQA sheet as --eqa writes it.
    extraSheets.push((ctx) => {
      writeEqaSheet(ctx.wb, demoEqaSheetInput(undefined, ctx.provenance.date, ctx.paper));
    });
  }
  if (eqa) {
    const found = eqa;
    extraSheets.push((ctx) => {
      writeEqaSheet(ctx.wb, { results: found.file.results, limits: eqaLimits(table?.table), source: { kind: 'file', name: found.name, bytes: found.bytes }, date: ctx.provenance.date, paper: ctx.paper });
    });
  }
  const { bytes: workbook, analytes } = await buildReviewPackage({ file, table: table?.table, tier, rule, labRunSize, provenance, paper, progress: bar, extraSheets });
  await writeBytesAtomically(workbook, out, force);
  bar.done();
  const sheets = analytes.reduce((n, a) => n + a.materials.length, 0);
  const n = file.results.length;
  io.out(`wrote ${out}: ${n} control result${n === 1 ? '' : 's'}, ${analytes.length} analyte${analytes.length === 1 ? '' : 's'}, ${sheets} analyte × material sheet${sheets === 1 ? '' : 's'}, a summary and the results as read${eqa ? `, and an EQA sheet (${eqa.file.results.length} EQA result${eqa.file.results.length === 1 ? '' : 's'})` : demo ? ', and the EQA sheet of the invented rounds' : ''}${demo ? ` — ${DEMO_MARKER}` : ''}`);
  return 0;
}
