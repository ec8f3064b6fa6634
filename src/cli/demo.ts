/**
 * `leeway demo [--out FILE] [--force] [--live] [--paper A4|Letter]`: the demo workbook (invented data). The
 * invented table's specifications at the desirable tier (the fill planner, as `leeway fill`
 * writes them), the invented raw replication, EQA and method-comparison data, observed
 * performance computed from them with the DATA functions, sigma and the QC plan (the engine's
 * assessment chain), measurement uncertainty, and a summary. Every sheet says "DEMO — invented
 * data, not for clinical use" and carries the caution; each is a printable document (the
 * document-sheet layer: page set-up, header and footer, sign-off).
 */
import type ExcelJS from 'exceljs';
import { UsageError } from './call';
import type { Io } from './main';
import { one, readOptions } from './options';
import { writeWorkbookAtomically, today, newWorkbook } from './files';
import { writePlan } from './xlsx';
import { DocumentSheet, planDocument } from './document';
import type { DocValue, Paper } from './document';
import { readPaper } from './fill';
import { svgToPng } from './picture';
import { CELL_PADDING, columnPoints, longestWord } from './document';
import { differencePlotSvg } from '../charts/differencePlot';
import type { AgreementLines } from '../charts/differencePlot';
import { evaluate, evaluateLabelled, findFunction } from '../registry';
import type { Arg } from '../registry';
import type { OutCell } from '../registry/types';
import { demoData, demoTable, demoVerification, DEMO_ANALYSERS, DEMO_LAB, DEMO_MARKER, reportedDecimals, REPLICATES_PER_DAY, REPLICATION_DAYS, VERIFICATION_MATERIALS } from '../engine/demo';
import type { DemoAnalyteData, VerificationAnalyte, VerificationMaterial } from '../engine/demo';
import { planFill, decimalsFormat, columnLetters } from '../engine/fill';
import { rowKey } from '../engine/table';
import type { FillMode } from '../engine/fill';
import { VERSION } from '../engine/version';
import { assess } from '../engine/assess';
import type { Fig } from '../engine/assess';
import type { QcPlan } from '../engine/qc/plan';
import { QC_PLAN } from '../registry/catalogue/qc';
import { DATA_AGREEMENT } from '../registry/catalogue/verify';
import { writeEqaSheet } from './eqa';
import type { EqaSheetInput } from './eqa';
import { demoEqaInput } from './eqa/demo';

export const DEMO_USAGE = `  leeway demo [--out FILE] [--force] [--live] [--date YYYY-MM-DD] [--paper A4|Letter]
                                   build the demo workbook (invented data) in FILE (default leeway-demo.xlsx)`;

export const DEFAULT_DEMO_FILE = 'leeway-demo.xlsx';

/** Standard uncertainty of the EQA assigned values, %: invented for the demo. */
const DEMO_U_REF = 0.6;

/** A figure from the registry: a number, text, or an error shown as its code. */
function show(v: OutCell | undefined): DocValue {
  if (v === undefined) return null;
  if (typeof v === 'object') return { error: v.error };
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  return v;
}

/** One value of a function. */
function scalar(name: string, args: readonly Arg[]): OutCell {
  return evaluate(name, args)[0][0];
}

function pick(m: Map<string, OutCell> | undefined, label: string): OutCell | undefined {
  return m?.get(label);
}

const num = (v: OutCell | undefined): number | undefined => (typeof v === 'number' ? v : undefined);

const col = (xs: readonly number[]): number[][] => xs.map((x) => [x]);
const colText = (xs: readonly string[]): string[][] => xs.map((x) => [x]);

interface Observed {
  readonly data: DemoAnalyteData;
  readonly cvi: number;
  readonly cvg: number;
  readonly allowable: OutCell | undefined;
  readonly precision: Map<string, OutCell> | undefined;
  readonly cv: OutCell | undefined;
  readonly bias: OutCell | undefined;
  readonly rmsBias: OutCell | undefined;
  readonly compare: Map<string, OutCell> | undefined;
  readonly observedTotal: OutCell | undefined;
  readonly sigma: OutCell | undefined;
  readonly share: OutCell | undefined;
  readonly tierMet: OutCell | undefined;
  readonly shift: OutCell | undefined;
  readonly qc: Map<string, OutCell> | undefined;
  readonly uBias: OutCell | undefined;
  readonly expanded: OutCell | undefined;
  readonly muLimit: OutCell | undefined;
}

/** A figure of the assessment chain as a cell: its value, or its error (an absence is no cell). */
function cellOf<T extends number | string | boolean>(f: Fig<T>): OutCell | undefined {
  if (f.ok) return f.value;
  return f.absent ? undefined : { error: f.code, message: f.message };
}

/** QC.PLAN's spill as label → value, from the chain's plan. */
function planCells(f: Fig<QcPlan>): Map<string, OutCell> | undefined {
  if (!f.ok) {
    const c = cellOf(f as Fig<number>);
    return c === undefined ? undefined : new Map(QC_PLAN.labels.map((l) => [l, c]));
  }
  const p = f.value;
  const values: Record<(typeof QC_PLAN.labels)[number], OutCell> = {
    Rule: p.rule,
    'Controls per run': p.n,
    Runs: p.runs,
    Detection: p.detection,
    'False rejection per run': p.falseRejectionPerRun,
    'Target met': p.targetMet,
    'Run size': p.runSize,
  };
  return new Map(QC_PLAN.labels.map((l) => [l, values[l]]));
}

/**
 * Every figure of the demo: the statistics from the invented raw data through the registry
 * (as the sheets' formulas compute them), then the assessment chain at the desirable tier.
 */
export function demoFigures(): Observed[] {
  const table = demoTable();
  return demoData().map((data, i) => {
    const r = table.rows[i];
    const precision = evaluateLabelled('DATA.PRECISION', [col(data.replication.map((x) => x.result)), colText(data.replication.map((x) => x.day))]);
    const cv = pick(precision, 'Within-lab CV %');
    const results = col(data.eqa.map((x) => x.result));
    const targets = col(data.eqa.map((x) => x.target));
    const bias = scalar('DATA.BIAS', [results, targets]);
    const rmsBias = scalar('DATA.RMSBIAS', [results, targets]);
    const compare = evaluateLabelled('DATA.COMPARE', [col(data.comparison.map((x) => x.x)), col(data.comparison.map((x) => x.y)), 'passing-bablok', data.level]);
    const observed = num(cv) !== undefined && num(bias) !== undefined ? { bias: num(bias)!, cv: num(cv)! } : null;
    const chain = assess({ spec: r, tier: 'desirable', z: 1.65, observed, plan: true });
    const biasValues = col(data.eqa.map((x) => (100 * (x.result - x.target)) / x.target));
    const uBias = scalar('MU.BIAS', [biasValues, DEMO_U_REF]);
    const expanded = num(cv) !== undefined && num(uBias) !== undefined ? scalar('MU.COMBINE', [num(cv)!, num(uBias)!, 2]) : undefined;
    const muLimit = scalar('SPEC.MU', [r.cvi, 'desirable', 2]);
    return {
      data,
      cvi: r.cvi,
      cvg: r.cvg as number,
      allowable: cellOf(chain.inUse.total),
      precision,
      cv,
      bias,
      rmsBias,
      compare,
      observedTotal: cellOf(chain.observedTotal),
      sigma: cellOf(chain.inUse.sigma),
      share: cellOf(chain.inUse.share),
      tierMet: cellOf(chain.tierMet),
      shift: chain.plan.ok ? chain.plan.value.criticalShift : undefined,
      qc: planCells(chain.plan),
      uBias,
      expanded,
      muLimit,
    };
  });
}

const P2 = '0.00';
const P3 = '0.000';

/** The number format of results reported at a level (about three significant digits). */
function levelFormat(level: number): string {
  return decimalsFormat(reportedDecimals(level));
}

interface DemoContext {
  readonly wb: ExcelJS.Workbook;
  readonly figures: readonly Observed[];
  readonly mode: FillMode;
  readonly date: string;
  readonly paper: Paper;
}

/** A new sheet of the demo as a document, with its banner: title, demo marker, the scenario, the caution. */
function demoSheet(ctx: DemoContext, name: string, title: string): DocumentSheet {
  const doc = new DocumentSheet(ctx.wb.addWorksheet(name), { title: `${title} — DEMO`, pageTitle: `Leeway demo — ${name}`, demo: true, date: ctx.date, paper: ctx.paper });
  doc.title(`${title} — DEMO`);
  doc.demoMarker();
  doc.text(`${DEMO_LAB}: bringing ${DEMO_ANALYSERS.candidate} into service beside ${DEMO_ANALYSERS.current}. Leeway ${VERSION}.`);
  doc.caution();
  doc.skip();
  return doc;
}

/** What the run size means, under the tables that show it. */
const RUN_SIZE_NOTES = [
  'Run size: the most patient results between QC events that keep the expected number of unreliable final results at most 1',
  '(results in error beyond the allowance, reported before QC catches a shift; Parvin’s model, CLSI C24; LEEWAY.QC.PLAN’s Run size). 0: even one is too many; at most 1000000 is reported.',
] as const;

/**
 * Headers over their columns (call after finish(), when the widths are set): over numbers set to
 * the right; over text after the first column set in by one character as the text below it is,
 * where the column has room for it.
 */
function alignHeaders(doc: DocumentSheet, header: number, first: number, last: number): void {
  doc.ws.getRow(header).eachCell((cell, c) => {
    let numbers = false;
    for (let r = first; r <= last && !numbers; r++) numbers = typeof doc.ws.getCell(r, c).value === 'number';
    const room = (doc.ws.getColumn(c).width ?? 0) - longestWord(String(cell.value), { bold: true }) - CELL_PADDING;
    if (numbers) cell.alignment = { ...(cell.alignment ?? {}), horizontal: 'right' };
    else if (c > 1 && room >= INDENT_UNITS) cell.alignment = { ...(cell.alignment ?? {}), horizontal: 'left', indent: 1 };
  });
}

/** Units an indent of one takes (as the document layer counts it). */
const INDENT_UNITS = 1.5;

/** Summary first: what a reviewer reads. */
function summarySheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'Summary', 'Leeway demo: verification summary');
  const header = doc.header(['Analyte', 'Specimen', 'Allowable total error % (desirable)', 'Within-lab CV %', 'Bias % (EQA)', 'Observed total error %', 'Share of allowance', 'Sigma', 'Tier met', 'QC rule', 'Controls per run', 'Runs', 'Detection', 'Target met', 'Run size', 'Expanded uncertainty % (k = 2)']);
  for (const f of ctx.figures) {
    doc.line(
      [f.data.analyte, f.data.specimen, show(f.allowable), show(f.cv), show(f.bias), show(f.observedTotal), show(f.share), show(f.sigma), show(f.tierMet), show(pick(f.qc, 'Rule')), show(pick(f.qc, 'Controls per run')), show(pick(f.qc, 'Runs')), show(pick(f.qc, 'Detection')), show(pick(f.qc, 'Target met')), show(pick(f.qc, 'Run size')), show(f.expanded)],
      { formats: [undefined, undefined, P2, P2, P2, P2, P2, '0.0', undefined, undefined, '0', '0', P3, undefined, '0', P2] },
    );
  }
  const rows = doc.row - 1;
  doc.skip();
  doc.note('Observed total error = |bias| + 1.65·CV (LEEWAY.PERF.TOTAL); sigma = (allowable − |bias|)/CV (LEEWAY.PERF.SIGMA); tier met by total error (LEEWAY.PERF.TIER);');
  doc.note('QC rule: the simplest candidate reaching 90 % detection of the critical shift with ≤ 5 % false rejection (LEEWAY.QC.PLAN). Details on the other sheets.');
  for (const n of RUN_SIZE_NOTES) doc.note(n);
  doc.note('Precision claims, trueness and agreement of the new analyser: the Verification sheet.');
  doc.finish();
  alignHeaders(doc, header, header + 1, rows);
}

/** Specifications: the fill planner, exactly as leeway fill writes a new sheet. */
function specificationsSheet(ctx: DemoContext): void {
  const ws = ctx.wb.addWorksheet('Specifications');
  const table = demoTable();
  // The invented table's CVs are written with one decimal (24.0, not 24).
  const writtenDecimals = Object.fromEntries(table.rows.map((r) => [rowKey(r.analyte, r.specimen), { cvi: 1, cvg: 1 }]));
  const planned = planFill({ table, tier: 'desirable', z: 1.65, mode: ctx.mode, target: { kind: 'new-sheet', sheetName: 'Specifications' }, date: ctx.date, writtenDecimals });
  if (!planned.ok) throw new Error(planned.problems.map((p) => p.message).join('; '));
  writePlan(ws, planned.plan);
  planDocument(ws, planned.plan, { paper: ctx.paper, pageTitle: 'Leeway demo — Specifications' }).finish();
}

interface RowOut {
  readonly values: readonly DocValue[];
  readonly formats?: readonly (string | undefined)[];
}

/** A sheet of results per analyte (a table at the top) computed from the invented raw data listed below it. */
interface ResultsAndRaw {
  readonly resultsHeader: readonly string[];
  readonly rawHeader: readonly string[];
  readonly raw: (f: Observed) => RowOut[];
  /** The analyte's results row, given the sheet rows of its raw data. */
  readonly results: (f: Observed, first: number, last: number, row: number) => RowOut;
}

function writeResultsAndRaw(doc: DocumentSheet, figures: readonly Observed[], s: ResultsAndRaw): void {
  doc.header(s.resultsHeader);
  const top = doc.row;
  doc.skip(figures.length + 1);
  doc.text('Raw data (invented)', { bold: true });
  doc.printTitle(doc.header(s.rawHeader));
  const spans = figures.map((f) => {
    const first = doc.row;
    for (const r of s.raw(f)) doc.line(r.values, { formats: r.formats });
    return [first, doc.row - 1] as const;
  });
  figures.forEach((f, i) => {
    const r = s.results(f, spans[i][0], spans[i][1], top + i);
    r.values.forEach((v, j) => doc.put(top + i, j + 1, v, { format: r.formats?.[j] }));
  });
}

/** Replication: raw data and the one-way ANOVA per analyte. */
function replicationSheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'Replication', `Leeway demo: precision, 5 days × 5 replicates on ${DEMO_ANALYSERS.candidate}`);
  const labels = ['Mean', 'Repeatability SD', 'Between-group SD', 'Within-lab SD', 'Repeatability CV %', 'Within-lab CV %', 'Groups', 'Results'];
  writeResultsAndRaw(doc, ctx.figures, {
    resultsHeader: ['Analyte', 'Unit', ...labels, 'Formula'],
    rawHeader: ['Analyte', 'Day', 'Result'],
    raw: (f) => f.data.replication.map((x) => ({ values: [f.data.analyte, x.day, x.result], formats: [undefined, undefined, levelFormat(f.data.level)] })),
    results: (f, first, last) => ({
      values: [f.data.analyte, f.data.unit, ...labels.map((l) => show(pick(f.precision, l))), `=LEEWAY.DATA.PRECISION(C${first}:C${last},B${first}:B${last})`],
      formats: [undefined, undefined, P3, P3, P3, P3, P2, P2, '0', '0'],
    }),
  });
  doc.finish();
}

/**
 * EQA: the invented rounds per analyte scored and judged (z or z′ and ζ as live formulas, band,
 * running mean and RMS, the EQA limit by SPEC.FIXED), a chart per analyte, and an invented
 * comparison round among the laboratory's own analysers scored against their consensus.
 */
function eqaSheet(ctx: DemoContext): void {
  writeEqaSheet(ctx.wb, demoEqaSheetInput(ctx.figures, ctx.date, ctx.paper));
}

/** The demo's EQA sheet input (invented rounds and scheme), for the demo workbook and `leeway review --demo`. */
export function demoEqaSheetInput(figures: readonly Observed[] = demoFigures(), date: string = today(), paper: Paper = 'A4'): EqaSheetInput {
  const table = demoTable();
  const analytes = figures.map((f, i) => ({ data: f.data, cvi: f.cvi, limitAbs: table.rows[i].limitAbs, limitPct: table.rows[i].limitPct, expandedPercent: num(f.expanded) }));
  const intro = [`${DEMO_LAB}: bringing ${DEMO_ANALYSERS.candidate} into service beside ${DEMO_ANALYSERS.current}. Leeway ${VERSION}.`];
  return demoEqaInput(analytes, { date, paper, intro });
}

/** Method comparison: Passing–Bablok at the medical decision level. */
function comparisonSheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'Comparison', `Leeway demo: method comparison, x = ${DEMO_ANALYSERS.current}, y = ${DEMO_ANALYSERS.candidate}`);
  const labels = ['Slope', 'Slope low 95%', 'Slope high 95%', 'Intercept', 'Intercept low 95%', 'Intercept high 95%', 'Bias at level', 'Bias at level %'];
  writeResultsAndRaw(doc, ctx.figures, {
    resultsHeader: ['Analyte', 'Level', ...labels, 'Formula'],
    rawHeader: ['Analyte', 'Sample', 'x: analyser A', 'y: analyser B'],
    raw: (f) => {
      const fmt = levelFormat(f.data.level);
      return f.data.comparison.map((x) => ({ values: [f.data.analyte, x.sample, x.x, x.y], formats: [undefined, undefined, fmt, fmt] }));
    },
    results: (f, first, last, row) => ({
      values: [f.data.analyte, f.data.level, ...labels.map((l) => show(pick(f.compare, l))), `=LEEWAY.DATA.COMPARE(C${first}:C${last},D${first}:D${last},"passing-bablok",B${row})`],
      formats: [undefined, undefined, ...labels.map(() => P3)],
    }),
  });
  doc.finish();
}

/** Position (1-based) of a label in a labelled spill: the k of =INDEX(LEEWAY.NAME(…),2,k). */
function spillIndex(name: string, label: string): number {
  const k = findFunction(name)?.labels?.indexOf(label) ?? -1;
  if (k < 0) throw new Error(`${name} has no figure "${label}"`);
  return k + 1;
}

/** Formula text of one figure of a labelled spill. */
function indexFormula(name: string, args: string, label: string): string {
  return `=INDEX(LEEWAY.${name}(${args}),2,${spillIndex(name, label)})`;
}

/** The scale the demo's limits of agreement are on: the demo's errors are proportional, so the differences grow with the level. */
const AGREEMENT_SCALE = 'percent';
/** DATA.AGREEMENT's labels but the count of pairs (shown in a column of its own). */
const AGREEMENT_LABELS = DATA_AGREEMENT.labels.filter((l): l is Exclude<(typeof DATA_AGREEMENT.labels)[number], 'Pairs'> => l !== 'Pairs');
const TRUENESS_LABELS = ['Mean', 'Bias', 'Bias %', 'Standard error', 'df', 'Verification low', 'Verification high', 'Verified'] as const;
/** Width in px the difference plots are drawn at for print, and how much larger they are placed (legible after the page's fit-to-width scale). */
const PLOT_WIDTH = 480;
const PLOT_ZOOM = 1.15;
const PLOTS_PER_ROW = 2;
/** Pixels of a default row (15 points at 96 px per inch). */
const ROW_PX = 20;

/** The figures of one material of the verification study, each from the registry. */
interface MaterialFigures {
  readonly m: VerificationMaterial;
  readonly values: number[][];
  readonly groups: string[][];
  readonly precision: Map<string, OutCell>;
  readonly verify: Map<string, OutCell>;
  readonly repeatabilityLimits: Map<string, OutCell> | undefined;
  readonly withinLabLimits: Map<string, OutCell> | undefined;
  readonly sigma: Map<string, OutCell> | undefined;
  readonly trueness: Map<string, OutCell> | undefined;
}

/** CV limits when the CV and its df are numbers. */
function cvLimitsOf(cv: OutCell | undefined, df: OutCell | undefined): Map<string, OutCell> | undefined {
  return num(cv) !== undefined && num(df) !== undefined ? evaluateLabelled('DATA.CVLIMITS', [num(cv)!, num(df)!]) : undefined;
}

/** Every figure of the verification study: precision, CV limits, sigma against the analyte's allowance in use, trueness. */
function verificationFigures(figures: readonly Observed[]): Array<{ analyte: VerificationAnalyte; observed: Observed; materials: MaterialFigures[]; agreement: Map<string, OutCell> }> {
  return demoVerification().map((a) => {
    const observed = figures.find((f) => f.data.analyte === a.analyte);
    if (!observed) throw new Error(`the verification study names ${a.analyte}, which is not a demo analyte`);
    const materials = a.materials.map((m): MaterialFigures => {
      const values = col(m.replication.map((x) => x.result));
      const groups = colText(m.replication.map((x) => x.day));
      const precision = evaluateLabelled('DATA.PRECISION', [values, groups]);
      const verify = evaluateLabelled('VERIFY.PRECISION', [values, groups, m.claim.repeatability, m.claim.withinLab, VERIFICATION_MATERIALS]);
      const wlCv = pick(precision, 'Within-lab CV %');
      const wlDf = pick(precision, 'Within-lab df');
      const inputs = [observed.allowable, observed.bias, wlCv, wlDf, observed.uBias].map(num);
      return {
        m,
        values,
        groups,
        precision,
        verify,
        repeatabilityLimits: cvLimitsOf(pick(precision, 'Repeatability CV %'), pick(verify, 'Repeatability df')),
        withinLabLimits: cvLimitsOf(wlCv, wlDf),
        sigma: inputs.every((x) => x !== undefined) ? evaluateLabelled('PERF.SIGMALIMITS', inputs as number[]) : undefined,
        trueness: m.assigned ? evaluateLabelled('VERIFY.TRUENESS', [values, groups, m.assigned.value, m.assigned.u, 1]) : undefined,
      };
    });
    const pairs = observed.data.comparison;
    const agreement = evaluateLabelled('DATA.AGREEMENT', [col(pairs.map((p) => p.x)), col(pairs.map((p) => p.y)), AGREEMENT_SCALE]);
    return { analyte: a, observed, materials, agreement };
  });
}

/** Rows of the Comparison sheet's raw data of each analyte (x in C, y in D), read back from the sheet. */
function comparisonRows(ctx: DemoContext): Map<string, [number, number]> {
  const ws = ctx.wb.getWorksheet('Comparison');
  if (!ws) throw new Error('the Comparison sheet is built before the Verification sheet reads it');
  const spans = new Map<string, [number, number]>();
  const samples = new Set(ctx.figures.flatMap((f) => f.data.comparison.map((p) => p.sample)));
  ws.eachRow((row, r) => {
    const analyte = row.getCell(1).value;
    if (typeof analyte !== 'string' || !samples.has(String(row.getCell(2).value))) return;
    const s = spans.get(analyte);
    spans.set(analyte, s ? [s[0], r] : [r, r]);
  });
  return spans;
}

/** The verification study's two sheets: the figures, and the raw data with every figure's formula. */
const VERIFICATION_SHEET = 'Verification';
const VERIFICATION_DATA_SHEET = 'Verification data';
/** How a formula on the figures sheet names a range of the data sheet. */
const DATA_REF = `'${VERIFICATION_DATA_SHEET}'!`;

/** The figures sheet being written: cells filled by address, each computed figure's formula text kept for the list. */
/** Formulas per table row: precision (CV, df, CV low and high, limit, verdict), sigma (allowable, CV, df, sigma and its limits), trueness, agreement. */
const FORMULAS_PER_ROW = { precision: 6, sigma: 6, trueness: 8, agreement: 11 } as const;

class FormulaLog {
  readonly lines: Array<[string, string]> = [];
  constructor(private readonly doc: DocumentSheet) {}

  /** A figure in a cell, with the formula that computes it (none for an input). */
  put(row: number, column: number, value: DocValue, format?: string, formula?: string): void {
    this.doc.put(row, column, value, { format });
    if (formula) this.lines.push([`${columnLetters(column)}${row}`, formula]);
  }
}

/** A table's header and room for its rows; returns the first row. */
function tableAt(doc: DocumentSheet, heading: string, header: readonly string[], rows: number, notes: readonly string[]): number {
  doc.text(heading, { bold: true });
  doc.header(header);
  const first = doc.row;
  doc.skip(rows);
  for (const n of notes) doc.note(n);
  doc.skip();
  return first;
}

/**
 * The verification study on two sheets: precision claims, CV limits, sigma, trueness, every figure's
 * formula, agreement with its difference plots; and the invented raw data.
 */
function verificationSheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, VERIFICATION_SHEET, `Leeway demo: verification of ${DEMO_ANALYSERS.candidate} before it reports patient results`);
  // Four different tables, each starting a page: none of their headers is repeated above another's rows.
  doc.noPrintTitle();
  const data = demoSheet(ctx, VERIFICATION_DATA_SHEET, 'Leeway demo: verification study, raw data (invented)');
  const study = verificationFigures(ctx.figures);
  const log = new FormulaLog(doc);
  const materials = study.flatMap((s) => s.materials.map((mf) => ({ s, mf })));
  doc.text(`Replication on two invented control materials per analyte, ${REPLICATION_DAYS} days × ${REPLICATES_PER_DAY} replicates each (CLSI EP15-A3 design); claims and assigned values invented. The raw data: the ${VERIFICATION_DATA_SHEET} sheet.`);
  doc.skip();
  const precisionTop = tableAt(
    doc,
    'Precision against the manufacturer’s claims',
    ['Analyte', 'Material', 'Precision', 'CV %', 'df', 'CV low 95%', 'CV high 95%', 'Claim % (invented)', 'Verification limit %', 'Verified'],
    materials.length * 2,
    [
      `Verification limit = claim·√(χ²(1 − α/L; df)/df), α = 0.05 shared by the L = ${VERIFICATION_MATERIALS} materials of an analyte (LEEWAY.VERIFY.PRECISION).`,
      '"yes": the study is consistent with the claim; "no": more imprecision than the claim allows, a finding to investigate. CV limits: LEEWAY.DATA.CVLIMITS.',
    ],
  );
  const sigmaTop = tableAt(
    doc,
    'Sigma with its confidence limits',
    ['Analyte', 'Material', 'Allowable total error % (desirable)', 'Bias % (EQA)', 'u(bias) %', 'Within-lab CV %', 'Within-lab df', 'Sigma', 'Sigma low 95%', 'Sigma high 95%'],
    materials.length,
    ['Sigma = (allowable − |bias|)/CV with limits from the uncertainty of the CV (its df) and of the bias (LEEWAY.PERF.SIGMALIMITS). Bias (EQA) and u(bias) are the analyte’s figures on the Performance and Uncertainty sheets.'],
  );
  const truenessMaterials = materials.filter((x) => x.mf.trueness);
  const truenessTop = tableAt(
    doc,
    'Trueness against an assigned value',
    ['Analyte', 'Material', 'Unit', 'Assigned value (invented)', 'u(assigned) (invented)', ...TRUENESS_LABELS],
    truenessMaterials.length,
    ['Verification interval = assigned ± t·√(SE² + u(assigned)²); "yes" when the mean lies inside it (LEEWAY.VERIFY.TRUENESS).'],
  );
  const formulaCount =
    materials.length * 2 * FORMULAS_PER_ROW.precision + materials.length * FORMULAS_PER_ROW.sigma + truenessMaterials.length * FORMULAS_PER_ROW.trueness + study.length * FORMULAS_PER_ROW.agreement;
  doc.text('Formulas of the figures on this sheet (as text: each figure is the registry’s value of its formula; with the add-in, type it into that cell to recompute)', { bold: true });
  doc.header(['Cell', 'Formula']);
  const formulaTop = doc.row;
  doc.skip(formulaCount + 1);
  const agreementTop = tableAt(
    doc,
    `Agreement of ${DEMO_ANALYSERS.candidate} with ${DEMO_ANALYSERS.current} (the Comparison sheet’s patient samples)`,
    ['Analyte', 'Pairs', 'Scale', ...AGREEMENT_LABELS.map((l) => `${l} %`)],
    study.length,
    ['Differences in % of the pair’s mean, as the errors grow with the level; limits = mean ± 1.96 SD, each with its 95 % interval (LEEWAY.DATA.AGREEMENT).'],
  );
  const plotRows = Math.ceil((plotHeight() * PLOT_ZOOM) / ROW_PX) + 1;
  const plotTop = doc.row;
  doc.skip(plotRows * Math.ceil(study.length / PLOTS_PER_ROW));
  const raw = writeVerificationRaw(data, materials.map((x) => ({ analyte: x.s.analyte, m: x.mf.m })));
  // The tables, now that the raw data rows are known.
  materials.forEach(({ s, mf }, i) => precisionRows(log, precisionTop + 2 * i, s.analyte.analyte, mf, raw[i]));
  materials.forEach(({ s, mf }, i) => sigmaRow(log, sigmaTop + i, s, mf, precisionTop + 2 * i + 1));
  truenessMaterials.forEach(({ s, mf }, i) => truenessRow(log, truenessTop + i, s.analyte, mf, raw[materials.findIndex((x) => x.mf === mf)]));
  const comparison = comparisonRows(ctx);
  study.forEach((s, i) => agreementRow(log, agreementTop + i, s.analyte.analyte, s.agreement, comparison.get(s.analyte.analyte)));
  if (log.lines.length !== formulaCount) throw new Error(`the verification sheet has ${log.lines.length} formulas, not ${formulaCount}`);
  log.lines.forEach(([address, formula], i) => {
    doc.put(formulaTop + i, 1, address);
    doc.put(formulaTop + i, 2, formula);
    doc.markSpan(formulaTop + i, 2);
  });
  const dataLayout = data.finish();
  // The raw data run over several pages, and programs fit different numbers of rows on one (their fit-to-width scales
  // differ): the data sheet's sign-off starts a page of its own, so none splits it.
  if (!dataLayout.pageBreakBefore) data.ws.getRow(dataLayout.signOffRow - 1).addPageBreak();
  const layout = doc.finish();
  for (const [top, n] of [[precisionTop, materials.length * 2], [sigmaTop, materials.length], [truenessTop, truenessMaterials.length], [agreementTop, study.length]]) alignHeaders(doc, top - 1, top, top + n - 1);
  placeDifferencePlots(ctx.wb, doc, study, plotTop, plotRows, layout.contentPoints);
  // Page breaks where each part fits a page in any program that prints the sheet (the fit-to-width scale differs between
  // them): the precision table with the banner; sigma and trueness; the formulas; the agreement table with the first
  // row of plots; each further row of plots, the last with the sign-off. No picture is cut by a page break.
  const breaks = [sigmaTop - 3, formulaTop - 3, agreementTop - 3];
  for (let k = 1; k < Math.ceil(study.length / PLOTS_PER_ROW); k++) breaks.push(plotTop + k * plotRows - 1);
  for (const r of breaks) doc.ws.getRow(r).addPageBreak();
}

function writeVerificationRaw(doc: DocumentSheet, list: ReadonlyArray<{ analyte: VerificationAnalyte; m: VerificationMaterial }>): Array<[number, number]> {
  doc.text('Raw data (invented)', { bold: true });
  doc.printTitle(doc.header(['Analyte', 'Material', 'Day', 'Result']));
  const spans = list.map(({ analyte, m }) => {
    const first = doc.row;
    const fmt = levelFormat(m.level);
    for (const x of m.replication) doc.line([analyte.analyte, m.material, x.day, x.result], { formats: [undefined, undefined, undefined, fmt] });
    return [first, doc.row - 1] as [number, number];
  });
  doc.skip();
  return spans;
}

function precisionRows(log: FormulaLog, row: number, analyte: string, mf: MaterialFigures, [first, last]: [number, number]): void {
  const data = `${DATA_REF}D${first}:D${last},${DATA_REF}C${first}:C${last}`;
  const rep = row;
  const wl = row + 1;
  const verifyArgs = `${data},H${rep},H${wl},${VERIFICATION_MATERIALS}`;
  const parts = [
    { r: rep, name: 'repeatability', cv: 'Repeatability CV %', df: ['VERIFY.PRECISION', 'Repeatability df', verifyArgs] as const, limits: mf.repeatabilityLimits, claim: mf.m.claim.repeatability, limit: 'Repeatability limit %', verified: 'Repeatability verified' },
    { r: wl, name: 'within-lab', cv: 'Within-lab CV %', df: ['DATA.PRECISION', 'Within-lab df', data] as const, limits: mf.withinLabLimits, claim: mf.m.claim.withinLab, limit: 'Within-lab limit %', verified: 'Within-lab verified' },
  ];
  for (const p of parts) {
    log.put(p.r, 1, analyte);
    log.put(p.r, 2, mf.m.material);
    log.put(p.r, 3, p.name);
    log.put(p.r, 4, show(pick(mf.precision, p.cv)), P2, indexFormula('DATA.PRECISION', data, p.cv));
    const dfMap = p.df[0] === 'VERIFY.PRECISION' ? mf.verify : mf.precision;
    log.put(p.r, 5, show(pick(dfMap, p.df[1])), '0.0', indexFormula(p.df[0], p.df[2], p.df[1]));
    log.put(p.r, 6, show(pick(p.limits, 'Low')), P2, indexFormula('DATA.CVLIMITS', `D${p.r},E${p.r}`, 'Low'));
    log.put(p.r, 7, show(pick(p.limits, 'High')), P2, indexFormula('DATA.CVLIMITS', `D${p.r},E${p.r}`, 'High'));
    log.put(p.r, 8, p.claim, '0.0');
    log.put(p.r, 9, show(pick(mf.verify, p.limit)), P2, indexFormula('VERIFY.PRECISION', verifyArgs, p.limit));
    log.put(p.r, 10, show(pick(mf.verify, p.verified)), undefined, indexFormula('VERIFY.PRECISION', verifyArgs, p.verified));
  }
}

function sigmaRow(log: FormulaLog, r: number, s: { analyte: VerificationAnalyte; observed: Observed }, mf: MaterialFigures, wlRow: number): void {
  const o = s.observed;
  const table = demoTable().rows.find((x) => x.analyte === s.analyte.analyte)!;
  log.put(r, 1, s.analyte.analyte);
  log.put(r, 2, mf.m.material);
  log.put(r, 3, show(o.allowable), P2, `=LEEWAY.SPEC.TOTAL(${table.cvi},${table.cvg},"desirable",1.65)`);
  log.put(r, 4, show(o.bias), P2);
  log.put(r, 5, show(o.uBias), P2);
  log.put(r, 6, show(pick(mf.precision, 'Within-lab CV %')), P2, `=D${wlRow}`);
  log.put(r, 7, show(pick(mf.precision, 'Within-lab df')), '0.0', `=E${wlRow}`);
  const args = `C${r},D${r},F${r},G${r},E${r}`;
  (['Sigma', 'Low', 'High'] as const).forEach((l, k) => log.put(r, 8 + k, show(pick(mf.sigma, l)), '0.0', indexFormula('PERF.SIGMALIMITS', args, l)));
}

function truenessRow(log: FormulaLog, r: number, a: VerificationAnalyte, mf: MaterialFigures, [first, last]: [number, number]): void {
  const assigned = mf.m.assigned!;
  const fmt = levelFormat(mf.m.level);
  log.put(r, 1, a.analyte);
  log.put(r, 2, mf.m.material);
  log.put(r, 3, a.unit);
  log.put(r, 4, assigned.value, fmt);
  log.put(r, 5, assigned.u, fmt);
  const args = `${DATA_REF}D${first}:D${last},${DATA_REF}C${first}:C${last},D${r},E${r},1`;
  const formats: Record<(typeof TRUENESS_LABELS)[number], string | undefined> = { Mean: P3, Bias: P3, 'Bias %': P2, 'Standard error': P3, df: '0.0', 'Verification low': P3, 'Verification high': P3, Verified: undefined };
  TRUENESS_LABELS.forEach((l, k) => log.put(r, 6 + k, show(pick(mf.trueness, l)), formats[l], indexFormula('VERIFY.TRUENESS', args, l)));
}

function agreementRow(log: FormulaLog, r: number, analyte: string, agreement: Map<string, OutCell>, rows: [number, number] | undefined): void {
  if (!rows) throw new Error(`no comparison data of ${analyte} on the Comparison sheet`);
  const args = `Comparison!C${rows[0]}:C${rows[1]},Comparison!D${rows[0]}:D${rows[1]},C${r}`;
  log.put(r, 1, analyte);
  log.put(r, 2, show(pick(agreement, 'Pairs')), '0', indexFormula('DATA.AGREEMENT', args, 'Pairs'));
  log.put(r, 3, AGREEMENT_SCALE);
  AGREEMENT_LABELS.forEach((l, k) => log.put(r, 4 + k, show(pick(agreement, l)), P2, indexFormula('DATA.AGREEMENT', args, l)));
}

/** Height in px of a difference plot drawn PLOT_WIDTH wide (it does not depend on the data). */
function plotHeight(): number {
  const zero = { meanDifference: 0, meanDifferenceLow: 0, meanDifferenceHigh: 0, lowerLimit: 0, lowerLimitLow: 0, lowerLimitHigh: 0, upperLimit: 0, upperLimitLow: 0, upperLimitHigh: 0 };
  const m = /height="([\d.]+)"/.exec(differencePlotSvg({ title: '', pairs: [], agreement: zero, width: PLOT_WIDTH }));
  return Number(m![1]);
}

/** The agreement figures a plot draws, when every one is a number. */
function agreementLines(a: Map<string, OutCell>): AgreementLines | undefined {
  const v = (l: (typeof AGREEMENT_LABELS)[number]): number | undefined => num(pick(a, l));
  const lines = {
    meanDifference: v('Mean difference'),
    meanDifferenceLow: v('Mean difference low'),
    meanDifferenceHigh: v('Mean difference high'),
    lowerLimit: v('Lower limit'),
    lowerLimitLow: v('Lower limit low'),
    lowerLimitHigh: v('Lower limit high'),
    upperLimit: v('Upper limit'),
    upperLimitLow: v('Upper limit low'),
    upperLimitHigh: v('Upper limit high'),
  };
  return Object.values(lines).every((x) => x !== undefined) ? (lines as AgreementLines) : undefined;
}

/** The difference plots as pictures in the rows kept for them, PLOTS_PER_ROW across, within the printed width. */
function placeDifferencePlots(wb: ExcelJS.Workbook, doc: DocumentSheet, study: ReturnType<typeof verificationFigures>, top: number, rowsEach: number, contentPoints: number): void {
  const gap = 12;
  const widthPx = (contentPoints * 96) / 72;
  const ext = Math.min(PLOT_WIDTH * PLOT_ZOOM, (widthPx - gap * (PLOTS_PER_ROW - 1)) / PLOTS_PER_ROW);
  const height = plotHeight();
  study.forEach((s, i) => {
    const lines = agreementLines(s.agreement);
    if (!lines) return;
    const pairs = s.observed.data.comparison.map((p) => ({ x: p.x, y: p.y, label: p.sample }));
    const svg = differencePlotSvg({ title: `${s.analyte.analyte}: analyser B − analyser A (DEMO)`, pairs, agreement: lines, scale: AGREEMENT_SCALE, unit: s.analyte.unit, decimals: 2, width: PLOT_WIDTH, id: `difference-${i + 1}` });
    const image = wb.addImage({ buffer: svgToPng(svg, 2) as unknown as ExcelJS.Buffer, extension: 'png' });
    const across = i % PLOTS_PER_ROW;
    const row = top + Math.floor(i / PLOTS_PER_ROW) * rowsEach;
    doc.ws.addImage(image, { tl: { col: colAt(doc, (across * (ext + gap) * 72) / 96), row: row - 1 }, ext: { width: ext, height: (height * ext) / PLOT_WIDTH }, editAs: 'oneCell' });
  });
}

/** The fractional column (0-based, as exceljs anchors pictures) at a distance in points from the sheet's left edge. */
function colAt(doc: DocumentSheet, points: number): number {
  let left = 0;
  for (let c = 1; ; c++) {
    const w = columnPoints(doc.ws.getColumn(c).width ?? 9);
    if (left + w > points) return c - 1 + (points - left) / w;
    left += w;
  }
}

/** Performance against the desirable specification. */
function performanceSheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'Performance', 'Leeway demo: observed performance against the desirable specification');
  doc.header(['Analyte', 'CVI %', 'CVG %', 'Allowable total error %', 'Within-lab CV %', 'Bias % (EQA)', 'Observed total error %', 'Share of allowance', 'Sigma', 'Tier met']);
  for (const f of ctx.figures) doc.line([f.data.analyte, f.cvi, f.cvg, show(f.allowable), show(f.cv), show(f.bias), show(f.observedTotal), show(f.share), show(f.sigma), show(f.tierMet)], { formats: [undefined, undefined, undefined, P2, P2, P2, P2, P2, '0.0'] });
  doc.skip();
  doc.note('=LEEWAY.SPEC.TOTAL(cvi, cvg, "desirable", 1.65); =LEEWAY.PERF.TOTAL(bias, cv); =LEEWAY.PERF.SHARE(observed, allowable); =LEEWAY.PERF.SIGMA(allowable, bias, cv); =LEEWAY.PERF.TIER(cvi, cvg, bias, cv)');
  doc.finish();
}

/** QC plan. */
function qcSheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'QC plan', 'Leeway demo: internal QC design');
  const labels = ['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met', 'Run size'];
  const header = doc.header(['Analyte', 'Allowable total error %', 'Bias %', 'CV %', 'Sigma', 'Critical shift (SD)', ...labels]);
  for (const f of ctx.figures) doc.line([f.data.analyte, show(f.allowable), show(f.bias), show(f.cv), show(f.sigma), show(f.shift), ...labels.map((l) => show(pick(f.qc, l)))], { formats: [undefined, P2, P2, P2, '0.0', P2, undefined, '0', '0', P3, P3, undefined, '0'] });
  const rows = doc.row - 1;
  doc.skip();
  doc.note('=LEEWAY.QC.SHIFT(allowable, bias, cv); =LEEWAY.QC.PLAN(allowable, bias, cv): target detection 0.90 at the critical shift, false rejection per run ≤ 0.05.');
  for (const n of RUN_SIZE_NOTES) doc.note(n);
  doc.note('=LEEWAY.QC.RUNSIZE(allowable, bias, cv, rule, controls per run) gives the same figure; LEEWAY.QC.RISK the expected number of unreliable final results at another run size.');
  doc.finish();
  alignHeaders(doc, header, header + 1, rows);
}

/** Measurement uncertainty. */
function uncertaintySheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'Uncertainty', 'Leeway demo: measurement uncertainty (within-lab CV and EQA bias)');
  doc.header(['Analyte', 'u(Rw) % = within-lab CV', 'u(bias) %', 'Expanded U % (k = 2)', 'Maximum allowable U % (desirable, k = 2)', 'Within the allowance']);
  for (const f of ctx.figures) {
    const within = num(f.expanded) !== undefined && num(f.muLimit) !== undefined ? (num(f.expanded)! <= num(f.muLimit)! ? 'yes' : 'no') : null;
    doc.line([f.data.analyte, show(f.cv), show(f.uBias), show(f.expanded), show(f.muLimit), within], { formats: [undefined, P2, P2, P2, P2] });
  }
  doc.skip();
  doc.note(`=LEEWAY.MU.BIAS(bias_values, ${DEMO_U_REF}); =LEEWAY.MU.COMBINE(u_rw, u_bias, 2); =LEEWAY.SPEC.MU(cvi, "desirable", 2)`);
  doc.finish();
}

/** Builds the demo workbook (in memory): ten sheets, each a printable document. */
export function buildDemoWorkbook(options: { mode?: FillMode; date?: string; paper?: Paper } = {}): ExcelJS.Workbook {
  const wb = newWorkbook();
  wb.creator = `Leeway ${VERSION}`;
  wb.title = `Leeway demo workbook — ${DEMO_MARKER}`;
  const ctx: DemoContext = { wb, figures: demoFigures(), mode: options.mode ?? 'values', date: options.date ?? today(), paper: options.paper ?? 'A4' };
  for (const sheet of [summarySheet, specificationsSheet, replicationSheet, eqaSheet, comparisonSheet, verificationSheet, performanceSheet, qcSheet, uncertaintySheet]) sheet(ctx);
  // The verification sheet reads the Comparison sheet's rows, so it is built after it and then placed after Replication.
  const order = ['Summary', 'Specifications', 'Replication', VERIFICATION_SHEET, VERIFICATION_DATA_SHEET, 'EQA', 'Comparison', 'Performance', 'QC plan', 'Uncertainty'];
  // exceljs orders sheets by each worksheet's orderNo (set by addWorksheet; not in its type declarations).
  for (const ws of wb.worksheets as Array<ExcelJS.Worksheet & { orderNo: number }>) ws.orderNo = order.indexOf(ws.name) + 1;
  if (wb.worksheets.map((w) => w.name).join() !== order.join()) throw new Error(`demo sheets out of order: ${wb.worksheets.map((w) => w.name).join(', ')}`);
  for (const ws of wb.worksheets) ws.views = [{ state: 'normal', zoomScale: 100 }];
  return wb;
}

export async function demoCommand(args: string[], io: Io): Promise<number> {
  const o = readOptions('demo', args, { values: ['out', 'date', 'paper'], flags: ['force', 'live'] });
  if (o.positional.length) throw new UsageError(`demo: unexpected argument ${o.positional[0]} (use --out FILE)`);
  const out = one(o, 'out') ?? DEFAULT_DEMO_FILE;
  const date = one(o, 'date');
  if (date !== undefined && !/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new UsageError(`demo: --date must be YYYY-MM-DD (got ${date})`);
  const wb = buildDemoWorkbook({ mode: o.flags.has('live') ? 'live' : 'values', date, paper: readPaper(one(o, 'paper'), 'demo') });
  await writeWorkbookAtomically(wb, out, o.flags.has('force'));
  io.out(`wrote ${out}: the demo workbook (${wb.worksheets.map((w) => w.name).join(', ')}) — ${DEMO_MARKER}`);
  return 0;
}
