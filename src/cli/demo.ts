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
import { evaluate } from '../registry';
import type { Arg } from '../registry';
import type { OutCell } from '../registry/types';
import { demoData, demoTable, DEMO_ANALYSERS, DEMO_LAB, DEMO_MARKER, reportedDecimals } from '../engine/demo';
import type { DemoAnalyteData } from '../engine/demo';
import { planFill, decimalsFormat } from '../engine/fill';
import { rowKey } from '../engine/table';
import type { FillMode } from '../engine/fill';
import { VERSION } from '../engine/version';
import { assess } from '../engine/assess';
import type { Fig } from '../engine/assess';
import type { QcPlan } from '../engine/qc/plan';
import { QC_PLAN } from '../registry/catalogue/qc';
import { writeEqaSheet } from './eqa';
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

/** A labelled spill as label → value (an error fills every label). */
function labelled(name: string, args: readonly Arg[]): Map<string, OutCell> {
  const out = evaluate(name, args);
  const m = new Map<string, OutCell>();
  if (out.length === 1) {
    m.set('*', out[0][0]);
    return m;
  }
  out[0].forEach((label, i) => m.set(String(label), out[1][i]));
  return m;
}

function pick(m: Map<string, OutCell> | undefined, label: string): OutCell | undefined {
  if (!m) return undefined;
  return m.get(label) ?? m.get('*');
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
    return c === undefined ? undefined : new Map([['*', c]]);
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
    const precision = labelled('DATA.PRECISION', [col(data.replication.map((x) => x.result)), colText(data.replication.map((x) => x.day))]);
    const cv = pick(precision, 'Within-lab CV %');
    const results = col(data.eqa.map((x) => x.result));
    const targets = col(data.eqa.map((x) => x.target));
    const bias = scalar('DATA.BIAS', [results, targets]);
    const rmsBias = scalar('DATA.RMSBIAS', [results, targets]);
    const compare = labelled('DATA.COMPARE', [col(data.comparison.map((x) => x.x)), col(data.comparison.map((x) => x.y)), 'passing-bablok', data.level]);
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

/** Summary first: what a reviewer reads. */
function summarySheet(ctx: DemoContext): void {
  const doc = demoSheet(ctx, 'Summary', 'Leeway demo: verification summary');
  doc.header(['Analyte', 'Specimen', 'Allowable total error % (desirable)', 'Within-lab CV %', 'Bias % (EQA)', 'Observed total error %', 'Share of allowance', 'Sigma', 'Tier met', 'QC rule', 'Controls per run', 'Runs', 'Detection', 'Target met', 'Expanded uncertainty % (k = 2)']);
  for (const f of ctx.figures) {
    doc.line(
      [f.data.analyte, f.data.specimen, show(f.allowable), show(f.cv), show(f.bias), show(f.observedTotal), show(f.share), show(f.sigma), show(f.tierMet), show(pick(f.qc, 'Rule')), show(pick(f.qc, 'Controls per run')), show(pick(f.qc, 'Runs')), show(pick(f.qc, 'Detection')), show(pick(f.qc, 'Target met')), show(f.expanded)],
      { formats: [undefined, undefined, P2, P2, P2, P2, P2, '0.0', undefined, undefined, '0', '0', P3, undefined, P2] },
    );
  }
  doc.skip();
  doc.note('Observed total error = |bias| + 1.65·CV (LEEWAY.PERF.TOTAL); sigma = (allowable − |bias|)/CV (LEEWAY.PERF.SIGMA); tier met by total error (LEEWAY.PERF.TIER);');
  doc.note('QC rule: the simplest candidate reaching 90 % detection of the critical shift with ≤ 5 % false rejection (LEEWAY.QC.PLAN). Details on the other sheets.');
  doc.finish();
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
  const table = demoTable();
  const analytes = ctx.figures.map((f, i) => ({ data: f.data, cvi: f.cvi, limitAbs: table.rows[i].limitAbs, limitPct: table.rows[i].limitPct, expandedPercent: num(f.expanded) }));
  const intro = [`${DEMO_LAB}: bringing ${DEMO_ANALYSERS.candidate} into service beside ${DEMO_ANALYSERS.current}. Leeway ${VERSION}.`];
  writeEqaSheet(ctx.wb, demoEqaInput(analytes, { date: ctx.date, paper: ctx.paper, intro }));
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
  const labels = ['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met'];
  doc.header(['Analyte', 'Allowable total error %', 'Bias %', 'CV %', 'Sigma', 'Critical shift (SD)', ...labels]);
  for (const f of ctx.figures) doc.line([f.data.analyte, show(f.allowable), show(f.bias), show(f.cv), show(f.sigma), show(f.shift), ...labels.map((l) => show(pick(f.qc, l)))], { formats: [undefined, P2, P2, P2, '0.0', P2, undefined, '0', '0', P3, P3] });
  doc.skip();
  doc.note('=LEEWAY.QC.SHIFT(allowable, bias, cv); =LEEWAY.QC.PLAN(allowable, bias, cv): target detection 0.90 at the critical shift, false rejection per run ≤ 0.05.');
  doc.finish();
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

/** Builds the demo workbook (in memory): eight sheets, each a printable document. */
export function buildDemoWorkbook(options: { mode?: FillMode; date?: string; paper?: Paper } = {}): ExcelJS.Workbook {
  const wb = newWorkbook();
  wb.creator = `Leeway ${VERSION}`;
  wb.title = `Leeway demo workbook — ${DEMO_MARKER}`;
  const ctx: DemoContext = { wb, figures: demoFigures(), mode: options.mode ?? 'values', date: options.date ?? today(), paper: options.paper ?? 'A4' };
  for (const sheet of [summarySheet, specificationsSheet, replicationSheet, eqaSheet, comparisonSheet, performanceSheet, qcSheet, uncertaintySheet]) sheet(ctx);
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
