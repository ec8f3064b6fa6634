/**
 * An invented year (2025) of daily internal-QC results for the demo analytes: two control
 * materials per analyte measured once a day on the new fictional analyser, from a fixed seed, so
 * the file is the same on every machine. Every value is invented; the file says so in its note
 * column and every output built from it carries the demo marker.
 *
 * Each material has a target and an SD in use (the CV of the scenario's invented precision
 * experiment at that concentration); results are drawn around the target with that SD and rounded as the analyser
 * reports them. Two events are planted for a review to find:
 *   - a shift: every result of one analyte moves up by about 2 SD for one month;
 *   - a loss of precision: the SD of one other analyte's results doubles for another month.
 */
import { DEMO_ANALYSERS, demoData, reportedDecimals } from './scenario';
import { mulberry32, normalDeviates } from './random';

export const CONTROLS_SEED = 20250101;
export const CONTROLS_YEAR = 2025;

/** The two materials: name and concentration as a share of the analyte's precision level. */
export const CONTROL_MATERIALS: ReadonlyArray<{ readonly name: string; readonly factor: number }> = [
  { name: 'Level 1', factor: 0.7 },
  { name: 'Level 2', factor: 1.6 },
];

/** The planted events: analyte, month (1–12) and what happens. */
export const CONTROL_EVENTS = {
  shift: { analyte: 'Brontase', month: 5, sd: 2 },
  imprecision: { analyte: 'Irvastine', month: 10, factor: 2 },
} as const;

export const CONTROLS_NOTE = 'DEMO — invented data';

/** One invented control result (a row of the demo control results file). */
export interface DemoControlResult {
  readonly analyte: string;
  readonly level: string;
  /** The run label: the day and the analyte's code, "2025-03-14/ARV" (one run per analyte a day). */
  readonly run: string;
  readonly date: string;
  readonly value: number;
  readonly target: number;
  readonly sd: number;
  readonly instrument: string;
  readonly lot: string;
  readonly unit: string;
  readonly note: string;
}

/** A number to `digits` significant digits. */
function significant(x: number, digits: number): number {
  return Number(x.toPrecision(digits));
}

/** Every day of the year as YYYY-MM-DD, and its month. */
function days(year: number): Array<{ date: string; month: number }> {
  const out: Array<{ date: string; month: number }> = [];
  for (let t = Date.UTC(year, 0, 1); new Date(t).getUTCFullYear() === year; t += 86400000) {
    const d = new Date(t);
    out.push({ date: d.toISOString().slice(0, 10), month: d.getUTCMonth() + 1 });
  }
  return out;
}

/**
 * The invented year of control results, in the order a laboratory information system exports
 * them: day by day, within a day analyte by analyte, Level 1 then Level 2.
 */
export function demoControls(): DemoControlResult[] {
  const rand = mulberry32(CONTROLS_SEED);
  const z = normalDeviates(rand);
  const materials = demoData().flatMap((d) =>
    CONTROL_MATERIALS.map((m) => {
      const target = significant(d.level * m.factor, 4);
      const cv = replicationCv(d.replication.map((r) => r.result)) / 100;
      return { analyte: d.analyte, unit: d.unit, level: m.name, target, sd: significant(cv * target, 3), decimals: reportedDecimals(target) };
    }),
  );
  const out: DemoControlResult[] = [];
  for (const day of days(CONTROLS_YEAR)) {
    for (const m of materials) {
      const shifted = m.analyte === CONTROL_EVENTS.shift.analyte && day.month === CONTROL_EVENTS.shift.month;
      const loose = m.analyte === CONTROL_EVENTS.imprecision.analyte && day.month === CONTROL_EVENTS.imprecision.month;
      const mean = m.target + (shifted ? CONTROL_EVENTS.shift.sd * m.sd : 0);
      const spread = m.sd * (loose ? CONTROL_EVENTS.imprecision.factor : 1);
      const f = 10 ** m.decimals;
      const value = Math.round((mean + spread * z()) * f) / f;
      out.push({
        analyte: m.analyte,
        level: m.level,
        run: `${day.date}/${m.analyte.slice(0, 3).toUpperCase()}`,
        date: day.date,
        value,
        target: m.target,
        sd: m.sd,
        instrument: DEMO_ANALYSERS.candidate,
        lot: `DEMO-${m.level.replace(/\s+/g, '')}-25`,
        unit: m.unit,
        note: CONTROLS_NOTE,
      });
    }
  }
  return out;
}

/** The CV of the analyser seen in the scenario's precision experiment (sample SD / mean of its results), %. */
function replicationCv(results: readonly number[]): number {
  const n = results.length;
  const mean = results.reduce((a, b) => a + b, 0) / n;
  const ss = results.reduce((a, b) => a + (b - mean) * (b - mean), 0);
  return (100 * Math.sqrt(ss / (n - 1))) / mean;
}

/** The demo control results as a CSV file's text (comma separated, decimal point, header row). */
export function demoControlsCsv(): string {
  const quote = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const lines = ['analyte,level,run,date,value,target,sd,instrument,lot,unit,note'];
  for (const r of demoControls()) {
    lines.push([r.analyte, r.level, r.run, r.date, String(r.value), String(r.target), String(r.sd), r.instrument, r.lot, r.unit, r.note].map(quote).join(','));
  }
  return lines.join('\n') + '\n';
}
