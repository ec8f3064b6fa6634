/**
 * The invented year of demo control results: deterministic, complete, marked as demo data, and
 * the two planted events — a shift of about +2 SD for a month and a doubled SD for another
 * month — are caught by the flags and the review figures while the other months look stable.
 * Expectations on a stable series (mean z near 0, SD of z near 1, few flags) are common
 * practice, no source; the rules are those of Westgard JO et al. Clin Chem 1981;27:493–501.
 */
import { demoControls, demoControlsCsv, CONTROL_EVENTS, CONTROL_MATERIALS, CONTROLS_NOTE, demoTable } from '../../../src/engine/demo';
import type { DemoControlResult } from '../../../src/engine/demo';
import { controlReview } from '../../../src/engine/qc/review';
import { evaluateControls } from '../../../src/engine/qc/flags';
import { parseRule } from '../../../src/engine/qc/rules';
import { parseResultsText } from '../../../src/engine/import';

const RULE = parseRule('1-3s/2-2s/R-4s/4-1s');
const all = demoControls();

function ofAnalyte(analyte: string): DemoControlResult[] {
  return all.filter((r) => r.analyte === analyte);
}

const month = (r: DemoControlResult): number => Number(r.date.slice(5, 7));

function review(rows: readonly DemoControlResult[]) {
  return controlReview({ values: rows.map((r) => r.value), target: rows.map((r) => r.target), sd: rows.map((r) => r.sd), rule: RULE, runs: rows.map((r) => r.run), levels: rows.map((r) => r.level) });
}

/** Share of runs flagged per month, flags read over the whole year (all materials together). */
function flaggedShareByMonth(rows: readonly DemoControlResult[]): number[] {
  const ev = evaluateControls({ values: rows.map((r) => r.value), target: rows.map((r) => r.target), sd: rows.map((r) => r.sd), rule: RULE, runs: rows.map((r) => r.run), levels: rows.map((r) => r.level) });
  const runs = Array.from({ length: 12 }, () => new Set<number>());
  const flagged = Array.from({ length: 12 }, () => new Set<number>());
  rows.forEach((r, i) => {
    runs[month(r) - 1].add(ev.run[i]);
    if (ev.flags[i] !== '') flagged[month(r) - 1].add(ev.run[i]);
  });
  return runs.map((s, m) => flagged[m].size / s.size);
}

describe('demo control results (invented, 2025)', () => {
  test('the same on every call: a seeded year, every day, every demo analyte, two materials', () => {
    expect(demoControls()).toEqual(all);
    const analytes = demoTable().rows.map((r) => r.analyte);
    expect(all).toHaveLength(365 * analytes.length * CONTROL_MATERIALS.length);
    expect(new Set(all.map((r) => r.analyte))).toEqual(new Set(analytes));
    expect(new Set(all.map((r) => r.level))).toEqual(new Set(CONTROL_MATERIALS.map((m) => m.name)));
    expect(all[0].date).toBe('2025-01-01');
    expect(all[all.length - 1].date).toBe('2025-12-31');
    expect(new Set(all.map((r) => r.instrument)).size).toBe(1);
    for (const r of all) {
      expect(r.note).toBe(CONTROLS_NOTE);
      expect(r.sd).toBeGreaterThan(0);
    }
  });

  test('reads through the control results importer with no problem at all', () => {
    const report = parseResultsText(demoControlsCsv());
    expect(report.problems).toEqual([]);
    expect(report.candidate?.results).toHaveLength(all.length);
    expect(report.candidate?.results[5].value).toBe(all[5].value);
  });

  test('outside the planted months every analyte looks stable: mean z near 0, SD of z near 1', () => {
    for (const analyte of new Set(all.map((r) => r.analyte))) {
      const rows = ofAnalyte(analyte).filter((r) => !(analyte === CONTROL_EVENTS.shift.analyte && month(r) === CONTROL_EVENTS.shift.month) && !(analyte === CONTROL_EVENTS.imprecision.analyte && month(r) === CONTROL_EVENTS.imprecision.month));
      const r = review(rows);
      expect(Math.abs(r.meanZ as number)).toBeLessThan(0.15);
      // Rounding to the reported decimals adds a little spread to the tightest materials.
      expect(r.sdZ as number).toBeGreaterThan(0.85);
      expect(r.sdZ as number).toBeLessThan(1.2);
    }
  });

  test('the shift month: mean z about +2 and far more runs flagged than in any other month', () => {
    const { analyte, month: m } = CONTROL_EVENTS.shift;
    const rows = ofAnalyte(analyte);
    const inMonth = review(rows.filter((r) => month(r) === m));
    expect(inMonth.meanZ as number).toBeGreaterThan(1.6);
    expect(inMonth.meanZ as number).toBeLessThan(2.4);
    const shares = flaggedShareByMonth(rows);
    expect(shares[m - 1]).toBeGreaterThan(0.3);
    for (let k = 0; k < 12; k++) if (k !== m - 1) expect(shares[k]).toBeLessThan(shares[m - 1] / 3);
  });

  test('the imprecision month: SD of z about 2, mean z near 0, and more runs flagged than in any other month', () => {
    const { analyte, month: m } = CONTROL_EVENTS.imprecision;
    const rows = ofAnalyte(analyte);
    const inMonth = review(rows.filter((r) => month(r) === m));
    expect(inMonth.sdZ as number).toBeGreaterThan(1.6);
    expect(inMonth.sdZ as number).toBeLessThan(2.5);
    expect(Math.abs(inMonth.meanZ as number)).toBeLessThan(0.6);
    const shares = flaggedShareByMonth(rows);
    for (let k = 0; k < 12; k++) if (k !== m - 1) expect(shares[k]).toBeLessThan(shares[m - 1]);
    expect(shares[m - 1]).toBeGreaterThan(0.15);
  });
});
