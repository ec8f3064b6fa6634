/**
 * The summary sheet's content: one row per picked analyte with its tier, allowable
 * total error at that tier, observed bias/CV/total error, sigma, the most stringent tier met and
 * the QC.PLAN choice, all from the engine; and the provenance and caution lines above it.
 * Pure, so the numbers can be checked without Excel.
 */
import type { VariationRow, VariationTable } from '../engine/table';
import type { Tier } from '../engine/tiers';
import { assess, explain } from '../engine/assess';
import type { Fig } from '../engine/assess';
import { CAUTION, DEMO_MARKER } from '../engine/caution';
import { VERSION } from '../engine/version';
import type { SummaryRow } from './host';
import type { Observed } from './state';
import { displayName } from './analytes';

/** Header texts of the summary table, in column order: the chart reads the first two. */
export const SUMMARY_HEADERS = [
  'Analyte',
  'Sigma',
  'Tier met',
  'Tier',
  'Allowable total error %',
  'Bias %',
  'CV %',
  'Observed total error %',
  'Rule',
  'Controls per run',
  'Runs',
  'Detection',
  'False rejection per run',
  'Note',
] as const;

/** A figure as the summary shows it: the number, or the reason there is none. */
function shown(f: Fig<number>): number | string {
  return f.ok ? f.value : explain(f);
}

/** One analyte's row: the engine's assessment chain at the analyte's tier, with its QC plan. */
export function summaryRow(r: VariationRow, tier: Tier, z: number, obs: Observed | undefined): SummaryRow {
  const a = assess({ spec: r, tier, z, observed: obs, plan: true });
  const base = { analyte: displayName(r), specimen: r.specimen, tier, allowable: shown(a.inUse.total) };
  if (!obs) {
    return { ...base, bias: '', cv: '', observedTotal: '', sigma: '', tierMet: 'no observed data', rule: '', controls: '', runs: '', detection: '', falseRejection: '' };
  }
  const tierMet = a.tierMet.ok ? a.tierMet.value : explain(a.tierMet);
  const common = { ...base, bias: obs.bias, cv: obs.cv, observedTotal: shown(a.observedTotal), tierMet };
  if (!a.inUse.total.ok) return { ...common, sigma: '', rule: '', controls: '', runs: '', detection: '', falseRejection: '' };
  const sigma = shown(a.inUse.sigma);
  if (!a.plan.ok) return { ...common, sigma, rule: explain(a.plan), controls: '', runs: '', detection: '', falseRejection: '' };
  const p = a.plan.value;
  return {
    ...common,
    sigma,
    rule: p.targetMet ? p.rule : `${p.rule} (target not met)`,
    controls: p.n,
    runs: p.runs,
    detection: p.detection,
    falseRejection: p.falseRejectionPerRun,
  };
}

export function summaryHeader(table: VariationTable, sheetTier: Tier, z: number, date: string): string[] {
  const lines = ['Leeway — summary: tier met, sigma metric and QC plan by analyte'];
  if (table.demo) lines.push(DEMO_MARKER);
  lines.push(
    `Table: ${table.name} (${table.origin || 'origin not recorded'}, imported ${table.importedAt.slice(0, 10)})`,
    `Sheet tier: ${sheetTier} (an analyte's own tier where one was chosen) · z = ${z} · QC plan: QC.PLAN, detection ≥ 0.90, false rejection per run ≤ 0.05, critical shift at z = 1.65`,
    `Made on ${date} by Leeway ${VERSION} from the figures in the task pane (values, not formulas)`,
    `Caution: ${CAUTION}`,
  );
  return lines;
}

/**
 * Row values in SUMMARY_HEADERS order. A figure that could not be computed is left blank in its
 * numeric column (so the chart shows a gap, not a zero) and its reason goes to the Note column.
 */
export function summaryCells(r: SummaryRow): Array<number | string> {
  const notes: string[] = [];
  const numeric = (v: number | string, what: string): number | string => {
    if (typeof v === 'number' || v === '') return v;
    notes.push(`${what}: ${v}`);
    return '';
  };
  const row = [
    r.analyte,
    numeric(r.sigma, 'sigma'),
    r.tierMet,
    r.tier,
    numeric(r.allowable, 'allowable total error'),
    r.bias,
    r.cv,
    numeric(r.observedTotal, 'observed total error'),
    r.rule,
    r.controls,
    r.runs,
    r.detection,
    r.falseRejection,
  ];
  row.push(notes.join('; '));
  return row;
}
