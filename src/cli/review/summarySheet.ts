/**
 * The Summary sheet: one row per analyte and control material with the review figures of that
 * material, the runs flagged when all the analyte's materials are read together, observed CV and
 * bias against the control targets, and — with a variation table — the allowances at the tier,
 * sigma and the run size of the rule in use; notes say where each rule came from and whether
 * the laboratory's own run size exceeds the computed one.
 */
import type { DocValue } from '../document';
import type { OutCell } from '../../registry/types';
import type { AnalyteReview, MaterialReview } from './model';
import { figure } from './model';
import type { ReviewContext } from './context';
import { reviewSheet } from './context';

export const SUMMARY_SHEET = 'Summary';

function show(v: OutCell | string | undefined): DocValue {
  if (v === undefined) return null;
  if (typeof v === 'object') return { error: v.error };
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  return v;
}

/** How a rule was chosen, in a word or two for the table. */
export function ruleSource(from: string): string {
  if (from.startsWith('QC plan')) return 'QC plan';
  if (from.startsWith('given')) return '--rule';
  return 'default';
}

function tableFigures(m: MaterialReview): DocValue[] {
  const x = m.assessment;
  if (!x) return [null, null, null, null];
  const f = (g: typeof x.inUse.cv): DocValue => (g.ok ? g.value : g.absent ? null : { error: g.code });
  return [f(x.inUse.cv), f(x.inUse.total), f(x.inUse.sigma), show(m.runSize)];
}

/** Writes the Summary sheet (the workbook's first). */
export function writeSummarySheet(ctx: ReviewContext, analytes: readonly AnalyteReview[], labRunSize: number | undefined): void {
  const doc = reviewSheet(ctx, SUMMARY_SHEET, 'Control review: summary');
  const tier = ctx.provenance.tier;
  const lab = labRunSize !== undefined;
  doc.printTitle(
    doc.header([
      'Analyte', 'Material', 'Rule', 'Rule from', 'Results', 'Runs', 'Runs flagged', 'Share of runs flagged', 'Expected false rejection per run',
      'Runs flagged, all materials', 'Mean z', 'SD of z', 'Results beyond 2 SD', 'Observed CV %', 'Bias % vs targets',
      `Allowable CV % (${tier})`, `Allowable total % (${tier})`, 'Sigma', 'Run size', ...(lab ? [`Lab run size ${labRunSize}`] : []),
    ]),
  );
  const formats = [undefined, undefined, undefined, undefined, '0', '0', '0', '0.000', '0.000', '0', '0.00', '0.00', '0', '0.00', '0.00', '0.00', '0.00', '0.0', '0'];
  analytes.forEach((a) =>
    a.materials.forEach((m) => {
      const r = (label: string): DocValue => show(figure(m.review, label));
      const labWord = typeof m.runSize === 'number' && lab ? (labRunSize > m.runSize ? 'exceeds' : 'within') : null;
      doc.line(
        [
          a.analyte, m.level.level, a.rule, ruleSource(a.ruleFrom), r('Results'), r('Runs'), r('Runs flagged'), r('Share of runs flagged'),
          r('Expected false rejection per run'), show(figure(a.review, 'Runs flagged')), r('Mean z'), r('SD of z'), r('Results beyond 2 SD'), show(m.cv), show(m.bias),
          ...tableFigures(m), ...(lab ? [labWord] : []),
        ],
        { formats },
      );
    }),
  );
  doc.skip();
  for (const line of summaryNotes(analytes, tier, ctx.provenance.table !== undefined)) doc.note(line);
  doc.finish();
}

/** The notes under the table: how to read it, where each rule came from, the run-size statements. */
export function summaryNotes(analytes: readonly AnalyteReview[], tier: string, table: boolean): string[] {
  const notes = [
    'Figures per material read that material alone (LEEWAY.QC.REVIEW); "Runs flagged, all materials" reads every material of the analyte together, as the flags on each sheet do (the rule\'s across-material terms).',
    'A stable method flags a share of runs near, usually somewhat above, the expected false rejection, with mean z near 0 and SD of z near 1; a share several times the expected one, or SD of z well above 1, calls for a look at the sheet.',
    'Observed CV = SD of the results / their mean (LEEWAY.DATA.CV); bias = mean of 100·(value − target)/target (LEEWAY.DATA.BIAS), against the control targets, not a reference method.',
  ];
  if (table) notes.push(`Allowances from the variation table at the ${tier} tier; sigma = (allowable total − |bias|)/CV; run size = LEEWAY.QC.RUNSIZE(allowable total, bias, CV, rule, controls per QC event).`);
  else notes.push('No variation table was given (--table): no allowances, sigma or run size.');
  for (const a of analytes) {
    if (ruleSource(a.ruleFrom) === 'QC plan') notes.push(`${a.analyte}: rule ${a.rule}, ${a.ruleFrom}; run size with ${a.n} controls per QC event.`);
    if (a.tableNote) notes.push(`${a.analyte}: ${a.tableNote}.`);
    for (const m of a.materials) if (m.runSizeStatement) notes.push(`${a.analyte} ${m.level.level}: ${m.runSizeStatement}.`);
  }
  return notes;
}
