/**
 * Checks across rows that result files share: time order within a series (warned, never
 * reordered), and grouping in order of first appearance.
 */
import type { RowReader } from './read';

/** Case and surrounding spaces ignored: "Arvelin " and "arvelin" are one analyte. */
export function labelKey(s: string): string {
  return s.trim().toLowerCase();
}

/**
 * Remembers, per series, the last date seen and every place where a date goes back in time; one
 * warning per series at its first such place, with the count.
 */
export class DateOrder {
  private readonly last = new Map<string, { date: string; line: number }>();
  private readonly back = new Map<string, { line: number; date: string; before: string; beforeLine: number; count: number; letter: string; name: string }>();

  see(series: string, name: string, date: string | null | undefined, line: number, letter: string): void {
    if (!date) return;
    const prev = this.last.get(series);
    if (prev && date < prev.date) {
      const b = this.back.get(series);
      if (b) b.count++;
      else this.back.set(series, { line, date, before: prev.date, beforeLine: prev.line, count: 1, letter, name });
    }
    if (!prev || date >= prev.date) this.last.set(series, { date, line });
  }

  /** One warning per series whose dates go back. */
  report(warn: (line: number, letter: string, message: string) => void): void {
    for (const b of this.back.values()) {
      const more = b.count > 1 ? ` (${b.count} places in ${b.name})` : '';
      warn(
        b.line,
        b.letter,
        `the dates of ${b.name} are not in time order${more}: ${b.date.replace('T', ' ')} here comes after ${b.before.replace('T', ' ')} on row ${b.beforeLine}. The results are kept and read in file order; if file order is not time order, sort the file by date`,
      );
    }
  }
}

/** Groups items by a key in order of first appearance, each group in file order. */
export function groupInOrder<T>(items: readonly T[], key: (t: T) => string): T[][] {
  const groups = new Map<string, T[]>();
  for (const t of items) {
    const k = key(t);
    const g = groups.get(k);
    if (g) g.push(t);
    else groups.set(k, [t]);
  }
  return [...groups.values()];
}

/** Every required field present: a blank one is an error on the row. Returns false when one is blank. */
export function requireFields<F extends string>(row: RowReader<F>, fields: readonly F[]): boolean {
  let ok = true;
  for (const f of fields) {
    if (row.text(f) === '') {
      row.problem('error', 'missing-value', f, `${f} is blank: it is required`);
      ok = false;
    }
  }
  return ok;
}
