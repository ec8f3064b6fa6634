/**
 * The built-in demo table, from src/engine/demo, always marked as demo
 * data; and, for the what-if view, the demo's observed bias and CV computed from its invented
 * raw data by the DATA engine (within-lab CV of the replication study, one-way ANOVA by day;
 * mean percent bias against the EQA targets).
 */
import type { VariationTable } from '../engine/table';
import { demoTable as engineDemoTable, demoData } from '../engine/demo';
import { oneWayPrecision } from '../engine/data/precision';
import { cvPercent, meanPercentBias } from '../engine/data/describe';
import { keyOf } from './analytes';

export const DEMO_ID = 'demo';

let cached: VariationTable | null = null;

export function demoTable(): VariationTable {
  if (!cached) cached = engineDemoTable();
  return cached;
}

export interface DemoObserved {
  readonly key: string;
  readonly bias: number;
  readonly cv: number;
}

/** Observed bias (DATA.BIAS on the EQA results) and within-lab CV (DATA.PRECISION) of each demo analyte. */
export function demoObserved(): DemoObserved[] {
  return demoData().map((d) => {
    const p = oneWayPrecision(d.replication.map((r) => r.result), d.replication.map((r) => r.day));
    return {
      key: keyOf(d),
      bias: meanPercentBias(d.eqa.map((e) => e.result), d.eqa.map((e) => e.target)),
      cv: cvPercent(p.withinLabSd, p.mean),
    };
  });
}
