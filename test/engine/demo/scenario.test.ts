/**
 * The invented demo scenario. The raw data are generated from a fixed seed;
 * these checks hold the generator to its design (common practice, no source: a 5×5 precision
 * run, 10 EQA samples, 40 paired patient samples).
 */
import { demoTable, demoData, DEMO_SOURCE, REPLICATION_DAYS, REPLICATES_PER_DAY, EQA_SAMPLES, COMPARISON_SAMPLES } from '../../../src/engine/demo';
import { parseTableText, tableToCsv, acceptImport } from '../../../src/engine/table';

describe('demo scenario', () => {
  test('twelve invented analytes, marked as demo, every source saying it is invented', () => {
    const t = demoTable();
    expect(t.demo).toBe(true);
    expect(t.rows).toHaveLength(12);
    expect(new Set(t.rows.map((r) => r.analyte)).size).toBe(12);
    for (const r of t.rows) expect(r.source).toBe(DEMO_SOURCE);
    expect(DEMO_SOURCE).toMatch(/^DEMO — invented/);
  });

  test('the demo table passes the same import check as a lab’s own table', () => {
    const t = demoTable();
    const r = parseTableText(tableToCsv(t), { name: t.name, origin: t.origin, importedAt: t.importedAt, demo: true });
    expect(r.problems).toEqual([]);
    expect(acceptImport(r)).toEqual(t);
  });

  test('the raw data have the planned design and are the same on every call', () => {
    const a = demoData();
    const b = demoData();
    expect(a).toEqual(b);
    expect(a).toHaveLength(12);
    for (const d of a) {
      expect(d.replication).toHaveLength(REPLICATION_DAYS * REPLICATES_PER_DAY);
      expect(new Set(d.replication.map((x) => x.day)).size).toBe(REPLICATION_DAYS);
      expect(d.eqa).toHaveLength(EQA_SAMPLES);
      expect(d.comparison).toHaveLength(COMPARISON_SAMPLES);
      const all = [...d.replication.map((x) => x.result), ...d.eqa.flatMap((x) => [x.target, x.result]), ...d.comparison.flatMap((x) => [x.x, x.y])];
      for (const x of all) {
        expect(Number.isFinite(x)).toBe(true);
        expect(x).toBeGreaterThan(0);
      }
      // The replicates centre on the design level (within 10 %: bias and noise are a few percent).
      const m = d.replication.reduce((s, x) => s + x.result, 0) / d.replication.length;
      expect(Math.abs(m / d.level - 1)).toBeLessThan(0.1);
    }
  });
});
