/**
 * `leeway demo [--out FILE] [--force] [--live]`: the demo workbook (invented data). The
 * invented table's specifications at the desirable tier (the fill planner, as `leeway fill`
 * writes them), the invented raw replication, EQA and method-comparison data, observed
 * performance computed from them with the DATA functions, sigma and the QC plan (the engine's
 * assessment chain), measurement uncertainty, and a summary. Every sheet says "DEMO — invented
 * data, not for clinical use" and carries the caution.
 */
import type ExcelJS from 'exceljs';
import { UsageError } from './call';
import type { Io } from './main';
import { one, readOptions } from './options';
import { writeWorkbookAtomically, today, newWorkbook } from './files';
import { headerHeight, printSetup, writePlan } from './xlsx';
import { evaluate } from '../registry';
import type { Arg } from '../registry';
import type { OutCell } from '../registry/types';
import { demoData, demoTable, DEMO_ANALYSERS, DEMO_LAB, DEMO_MARKER, reportedDecimals } from '../engine/demo';
import type { DemoAnalyteData } from '../engine/demo';
import { planFill, CAUTION, wrapText } from '../engine/fill';
import type { FillMode } from '../engine/fill';
import { VERSION } from '../engine/version';
import { assess } from '../engine/assess';
import type { Fig } from '../engine/assess';
import type { QcPlan } from '../engine/qc/plan';
import { QC_PLAN } from '../registry/catalogue/qc';

export const DEMO_USAGE = `  leeway demo [--out FILE] [--force] [--live]
                                   build the demo workbook (invented data) in FILE (default leeway-demo.xlsx)`;

export const DEFAULT_DEMO_FILE = 'leeway-demo.xlsx';

/** Standard uncertainty of the EQA assigned values, %: invented for the demo. */
const DEMO_U_REF = 0.6;

type Value = number | string | boolean | null | { error: string };

/** A figure from the registry: a number, text, or an error shown as its code. */
function show(v: OutCell | undefined): Value {
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

/** Writes rows onto a sheet with a cursor; the first rows of every sheet are the demo banner. */
class SheetBuilder {
  row = 1;
  readonly headers: Array<[number, string[]]> = [];
  constructor(readonly ws: ExcelJS.Worksheet) {}

  banner(title: string): void {
    const t = this.ws.getCell(this.row++, 1);
    t.value = `${title} — DEMO`;
    t.font = { bold: true, size: 14 };
    const d = this.ws.getCell(this.row++, 1);
    d.value = DEMO_MARKER;
    d.font = { bold: true, color: { argb: 'FFC00000' } };
    this.ws.getCell(this.row++, 1).value = `${DEMO_LAB}: bringing ${DEMO_ANALYSERS.candidate} into service beside ${DEMO_ANALYSERS.current}. Leeway ${VERSION}.`;
    for (const line of wrapText(CAUTION, 90)) {
      const c = this.ws.getCell(this.row++, 1);
      c.value = line;
      c.font = { italic: true };
    }
    this.row++;
  }

  line(values: readonly Value[], opts: { bold?: boolean; formats?: readonly (string | undefined)[]; header?: boolean } = {}): number {
    const r = this.row++;
    if (opts.header) this.headers.push([r, values.map((v) => (typeof v === 'string' ? v : ''))]);
    values.forEach((v, i) => {
      if (v === null) return;
      const cell = this.ws.getCell(r, i + 1);
      cell.value = v as ExcelJS.CellValue;
      if (typeof v === 'string' && v.startsWith('=')) cell.alignment = { horizontal: 'left', indent: 1 };
      const f = opts.formats?.[i];
      if (f && typeof v === 'number') cell.numFmt = f;
      if (opts.bold || opts.header) cell.font = { bold: true };
      if (opts.header) {
        cell.border = { bottom: { style: 'thin' } };
        cell.alignment = { wrapText: true, vertical: 'bottom' };
      }
    });
    return r;
  }

  note(text: string): void {
    const c = this.ws.getCell(this.row++, 1);
    c.value = text;
    c.font = { italic: true, color: { argb: 'FF595959' } };
  }

  /** Sets column widths, then the header rows' heights to fit their wrapped texts. */
  widths(ws: readonly number[]): void {
    ws.forEach((w, i) => (this.ws.getColumn(i + 1).width = w));
    for (const [r, texts] of this.headers) this.ws.getRow(r).height = headerHeight(texts.map((t, i) => [t, ws[i] ?? 10] as const));
  }
}

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

/** Builds the demo workbook (in memory). */
export function buildDemoWorkbook(options: { mode?: FillMode; date?: string } = {}): ExcelJS.Workbook {
  const wb = newWorkbook();
  wb.creator = `Leeway ${VERSION}`;
  wb.title = `Leeway demo workbook — ${DEMO_MARKER}`;
  const figures = demoFigures();
  const table = demoTable();

  // Summary first: what a reviewer reads.
  const sum = new SheetBuilder(wb.addWorksheet('Summary'));
  sum.banner('Leeway demo: verification summary');
  sum.line(['Analyte', 'Specimen', 'Allowable total error % (desirable)', 'Within-lab CV %', 'Bias % (EQA)', 'Observed total error %', 'Share of allowance', 'Sigma', 'Tier met', 'QC rule', 'Controls per run', 'Runs', 'Detection', 'Target met', 'Expanded uncertainty % (k = 2)'], { header: true });
  for (const f of figures) {
    sum.line(
      [f.data.analyte, f.data.specimen, show(f.allowable), show(f.cv), show(f.bias), show(f.observedTotal), show(f.share), show(f.sigma), show(f.tierMet), show(pick(f.qc, 'Rule')), show(pick(f.qc, 'Controls per run')), show(pick(f.qc, 'Runs')), show(pick(f.qc, 'Detection')), show(pick(f.qc, 'Target met')), show(f.expanded)],
      { formats: [undefined, undefined, P2, P2, P2, P2, P2, '0.0', undefined, undefined, '0', '0', P3, undefined, P2] },
    );
  }
  sum.row++;
  sum.note('Observed total error = |bias| + 1.65·CV (LEEWAY.PERF.TOTAL); sigma = (allowable − |bias|)/CV (LEEWAY.PERF.SIGMA); tier met by total error (LEEWAY.PERF.TIER);');
  sum.note('QC rule: the simplest candidate reaching 90 % detection of the critical shift with ≤ 5 % false rejection (LEEWAY.QC.PLAN). Details on the other sheets.');
  sum.widths([14, 10, 14, 10, 10, 12, 11, 8, 11, 24, 9, 6, 10, 8, 13]);

  // Specifications: the fill planner, exactly as leeway fill writes a new sheet.
  const specWs = wb.addWorksheet('Specifications');
  const planned = planFill({ table, tier: 'desirable', z: 1.65, mode: options.mode ?? 'values', target: { kind: 'new-sheet', sheetName: 'Specifications' }, date: options.date ?? today() });
  if (!planned.ok) throw new Error(planned.problems.map((p) => p.message).join('; '));
  writePlan(specWs, planned.plan);

  // Replication: raw data and the one-way ANOVA per analyte.
  const rep = new SheetBuilder(wb.addWorksheet('Replication'));
  rep.banner(`Leeway demo: precision, 5 days × 5 replicates on ${DEMO_ANALYSERS.candidate}`);
  const precLabels = ['Mean', 'Repeatability SD', 'Between-group SD', 'Within-lab SD', 'Repeatability CV %', 'Within-lab CV %', 'Groups', 'Results'];
  rep.line(['Analyte', 'Unit', ...precLabels, 'Formula'], { header: true });
  const resultsHeaderRow = rep.row - 1;
  const resultRows = figures.length;
  rep.row += resultRows + 1;
  rep.line(['Raw data (invented)'], { bold: true });
  rep.line(['Analyte', 'Day', 'Result'], { header: true });
  const rawStart: number[] = [];
  for (const f of figures) {
    rawStart.push(rep.row);
    const fmt = reportedDecimals(f.data.level) === 0 ? '0' : `0.${'0'.repeat(reportedDecimals(f.data.level))}`;
    for (const x of f.data.replication) rep.line([f.data.analyte, x.day, x.result], { formats: [undefined, undefined, fmt] });
  }
  figures.forEach((f, i) => {
    const first = rawStart[i];
    const last = first + f.data.replication.length - 1;
    const r = resultsHeaderRow + 1 + i;
    const vals = precLabels.map((l) => show(pick(f.precision, l)));
    const formats = [undefined, undefined, P3, P3, P3, P3, P2, P2, '0', '0'];
    [f.data.analyte, f.data.unit, ...vals, `=LEEWAY.DATA.PRECISION(C${first}:C${last},B${first}:B${last})`].forEach((v, j) => {
      if (v === null) return;
      const c = rep.ws.getCell(r, j + 1);
      c.value = v as ExcelJS.CellValue;
      if (formats[j] && typeof v === 'number') c.numFmt = formats[j]!;
      if (typeof v === 'string' && v.startsWith('=')) c.alignment = { horizontal: 'left', indent: 1 };
    });
  });
  rep.widths([14, 9, 10, 12, 12, 11, 12, 10, 8, 8, 44]);

  // EQA: raw data, mean and RMS bias, and the bias uncertainty.
  const eqa = new SheetBuilder(wb.addWorksheet('EQA'));
  eqa.banner(`Leeway demo: external quality assessment, ${DEMO_ANALYSERS.candidate}`);
  eqa.line(['Analyte', 'Mean bias %', 'RMS bias %', `u(bias) % (u_ref ${DEMO_U_REF} %, invented)`, 'Formula'], { header: true });
  const eqaHeader = eqa.row - 1;
  eqa.row += figures.length + 1;
  eqa.line(['Raw data (invented)'], { bold: true });
  eqa.line(['Analyte', 'Sample', 'Assigned value', 'Result', 'Bias %'], { header: true });
  const eqaStart: number[] = [];
  for (const f of figures) {
    eqaStart.push(eqa.row);
    const d = reportedDecimals(f.data.level);
    const fmt = d === 0 ? '0' : `0.${'0'.repeat(d)}`;
    for (const x of f.data.eqa) eqa.line([f.data.analyte, x.sample, x.target, x.result, (100 * (x.result - x.target)) / x.target], { formats: [undefined, undefined, fmt, fmt, P2] });
  }
  figures.forEach((f, i) => {
    const first = eqaStart[i];
    const last = first + f.data.eqa.length - 1;
    const r = eqaHeader + 1 + i;
    [f.data.analyte, show(f.bias), show(f.rmsBias), show(f.uBias), `=LEEWAY.DATA.BIAS(D${first}:D${last},C${first}:C${last})`].forEach((v, j) => {
      if (v === null) return;
      const c = eqa.ws.getCell(r, j + 1);
      c.value = v as ExcelJS.CellValue;
      if (j >= 1 && j <= 3 && typeof v === 'number') c.numFmt = P2;
      if (typeof v === 'string' && v.startsWith('=')) c.alignment = { horizontal: 'left', indent: 1 };
    });
  });
  eqa.widths([14, 12, 12, 14, 44]);

  // Method comparison: Passing–Bablok at the medical decision level.
  const cmp = new SheetBuilder(wb.addWorksheet('Comparison'));
  cmp.banner(`Leeway demo: method comparison, x = ${DEMO_ANALYSERS.current}, y = ${DEMO_ANALYSERS.candidate}`);
  const cmpLabels = ['Slope', 'Slope low 95%', 'Slope high 95%', 'Intercept', 'Intercept low 95%', 'Intercept high 95%', 'Bias at level', 'Bias at level %'];
  cmp.line(['Analyte', 'Level', ...cmpLabels, 'Formula'], { header: true });
  const cmpHeader = cmp.row - 1;
  cmp.row += figures.length + 1;
  cmp.line(['Raw data (invented)'], { bold: true });
  cmp.line(['Analyte', 'Sample', 'x: analyser A', 'y: analyser B'], { header: true });
  const cmpStart: number[] = [];
  for (const f of figures) {
    cmpStart.push(cmp.row);
    const d = reportedDecimals(f.data.level);
    const fmt = d === 0 ? '0' : `0.${'0'.repeat(d)}`;
    for (const x of f.data.comparison) cmp.line([f.data.analyte, x.sample, x.x, x.y], { formats: [undefined, undefined, fmt, fmt] });
  }
  figures.forEach((f, i) => {
    const first = cmpStart[i];
    const last = first + f.data.comparison.length - 1;
    const r = cmpHeader + 1 + i;
    [f.data.analyte, f.data.level, ...cmpLabels.map((l) => show(pick(f.compare, l))), `=LEEWAY.DATA.COMPARE(C${first}:C${last},D${first}:D${last},"passing-bablok",B${r})`].forEach((v, j) => {
      if (v === null) return;
      const c = cmp.ws.getCell(r, j + 1);
      c.value = v as ExcelJS.CellValue;
      if (j >= 2 && j <= 9 && typeof v === 'number') c.numFmt = P3;
      if (typeof v === 'string' && v.startsWith('=')) c.alignment = { horizontal: 'left', indent: 1 };
    });
  });
  cmp.widths([14, 8, 11, 11, 9, 10, 10, 10, 10, 10, 60]);

  // Performance against the desirable specification.
  const perf = new SheetBuilder(wb.addWorksheet('Performance'));
  perf.banner('Leeway demo: observed performance against the desirable specification');
  perf.line(['Analyte', 'CVI %', 'CVG %', 'Allowable total error %', 'Within-lab CV %', 'Bias % (EQA)', 'Observed total error %', 'Share of allowance', 'Sigma', 'Tier met'], { header: true });
  for (const f of figures) perf.line([f.data.analyte, f.cvi, f.cvg, show(f.allowable), show(f.cv), show(f.bias), show(f.observedTotal), show(f.share), show(f.sigma), show(f.tierMet)], { formats: [undefined, undefined, undefined, P2, P2, P2, P2, P2, '0.0'] });
  perf.row++;
  perf.note('=LEEWAY.SPEC.TOTAL(cvi, cvg, "desirable", 1.65); =LEEWAY.PERF.TOTAL(bias, cv); =LEEWAY.PERF.SHARE(observed, allowable); =LEEWAY.PERF.SIGMA(allowable, bias, cv); =LEEWAY.PERF.TIER(cvi, cvg, bias, cv)');
  perf.widths([14, 8, 8, 14, 11, 11, 13, 11, 8, 11]);

  // QC plan.
  const qc = new SheetBuilder(wb.addWorksheet('QC plan'));
  qc.banner('Leeway demo: internal QC design');
  const qcLabels = ['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met'];
  qc.line(['Analyte', 'Allowable total error %', 'Bias %', 'CV %', 'Sigma', 'Critical shift (SD)', ...qcLabels], { header: true });
  for (const f of figures) qc.line([f.data.analyte, show(f.allowable), show(f.bias), show(f.cv), show(f.sigma), show(f.shift), ...qcLabels.map((l) => show(pick(f.qc, l)))], { formats: [undefined, P2, P2, P2, '0.0', P2, undefined, '0', '0', P3, P3] });
  qc.row++;
  qc.note('=LEEWAY.QC.SHIFT(allowable, bias, cv); =LEEWAY.QC.PLAN(allowable, bias, cv): target detection 0.90 at the critical shift, false rejection per run ≤ 0.05.');
  qc.widths([14, 13, 9, 9, 8, 11, 24, 10, 7, 10, 12, 9]);

  // Measurement uncertainty.
  const mu = new SheetBuilder(wb.addWorksheet('Uncertainty'));
  mu.banner('Leeway demo: measurement uncertainty (within-lab CV and EQA bias)');
  mu.line(['Analyte', 'u(Rw) % = within-lab CV', 'u(bias) %', 'Expanded U % (k = 2)', 'Maximum allowable U % (desirable, k = 2)', 'Within the allowance'], { header: true });
  for (const f of figures) {
    const within = num(f.expanded) !== undefined && num(f.muLimit) !== undefined ? (num(f.expanded)! <= num(f.muLimit)! ? 'yes' : 'no') : null;
    mu.line([f.data.analyte, show(f.cv), show(f.uBias), show(f.expanded), show(f.muLimit), within], { formats: [undefined, P2, P2, P2, P2] });
  }
  mu.row++;
  mu.note(`=LEEWAY.MU.BIAS(bias_values, ${DEMO_U_REF}); =LEEWAY.MU.COMBINE(u_rw, u_bias, 2); =LEEWAY.SPEC.MU(cvi, "desirable", 2)`);
  mu.widths([14, 14, 11, 13, 18, 12]);

  for (const ws of wb.worksheets) {
    printSetup(ws);
    ws.headerFooter = { oddHeader: `&L${DEMO_MARKER}&R&A`, oddFooter: `&LLeeway ${VERSION} demo workbook&RPage &P of &N` };
    ws.views = [{ state: 'normal', zoomScale: 100 }];
  }
  return wb;
}

export async function demoCommand(args: string[], io: Io): Promise<number> {
  const o = readOptions('demo', args, { values: ['out', 'date'], flags: ['force', 'live'] });
  if (o.positional.length) throw new UsageError(`demo: unexpected argument ${o.positional[0]} (use --out FILE)`);
  const out = one(o, 'out') ?? DEFAULT_DEMO_FILE;
  const date = one(o, 'date');
  if (date !== undefined && !/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new UsageError(`demo: --date must be YYYY-MM-DD (got ${date})`);
  const wb = buildDemoWorkbook({ mode: o.flags.has('live') ? 'live' : 'values', date });
  await writeWorkbookAtomically(wb, out, o.flags.has('force'));
  io.out(`wrote ${out}: the demo workbook (${wb.worksheets.map((w) => w.name).join(', ')}) — ${DEMO_MARKER}`);
  return 0;
}
