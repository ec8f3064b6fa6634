/**
 * The summary sheet's figures (src/taskpane/summaryRows.ts) equal what the worksheet functions
 * give for the same inputs: SPEC.TOTAL, PERF.TOTAL, PERF.SIGMA, PERF.TIER and QC.PLAN through the
 * registry that Excel and the CLI evaluate.
 */
import { summaryRow, summaryHeader, summaryCells, SUMMARY_HEADERS } from '../../src/taskpane/summaryRows';
import { evaluate } from '../../src/registry';
import type { VariationRow } from '../../src/engine/table';
import { demoTable } from '../../src/engine/demo';
import { CAUTION, DEMO_MARKER } from '../../src/engine/caution';
import { mulberry32, uniform } from '../support/prng';

const one = (name: string, ...args: Array<number | string>) => evaluate(name, args)[0][0];

const row = (cvi: number, cvg: number | null): VariationRow => ({ analyte: 'Arvelin', specimen: 'serum', unit: '', cvi, cvg, source: 'Invented for tests (2026-01)', limitAbs: null, limitPct: null, level: null, note: '', line: 2 });

describe('summary rows', () => {
  test('each figure equals the worksheet function’s for 60 seeded analytes', () => {
    const rand = mulberry32(99);
    for (let i = 0; i < 60; i++) {
      const cvi = uniform(rand, 1, 15);
      const cvg = uniform(rand, 2, 30);
      const bias = uniform(rand, -4, 4);
      const cv = uniform(rand, 0.3, 5);
      const tier = (['optimum', 'desirable', 'minimum'] as const)[i % 3];
      const s = summaryRow(row(cvi, cvg), tier, 1.65, { bias, cv, from: 'typed' });
      const tea = one('SPEC.TOTAL', cvi, cvg, tier, 1.65) as number;
      expect(s.allowable).toBe(tea);
      expect(s.observedTotal).toBe(one('PERF.TOTAL', bias, cv, 1.65));
      expect(s.sigma).toBe(one('PERF.SIGMA', tea, bias, cv));
      expect(s.tierMet).toBe(one('PERF.TIER', cvi, cvg, bias, cv, 1.65, 'total'));
      const plan = evaluate('QC.PLAN', [tea, bias, cv]);
      expect(plan[0]).toEqual(['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met', 'Run size']);
      const [rule, n, runs, det, fr, met, runSize] = plan[1];
      expect(s.rule).toBe(met === 'yes' || met === true || met === 'TRUE' ? rule : `${rule} (target not met)`);
      expect([s.controls, s.runs, s.detection, s.falseRejection, s.runSize]).toEqual([n, runs, det, fr, runSize]);
      expect(s.runSize).toBe(one('QC.RUNSIZE', tea, bias, cv, rule as string, n as number));
    }
  });

  test('without observed data the row says so and has no sigma or plan', () => {
    const s = summaryRow(row(5, 6), 'desirable', 1.65, undefined);
    expect(s).toMatchObject({ sigma: '', tierMet: 'no observed data', rule: '', runSize: '' });
    expect(summaryCells(s)).toHaveLength(SUMMARY_HEADERS.length);
  });

  test('without CVG there is no total allowance: the reason goes to the Note column', () => {
    const s = summaryRow(row(5, null), 'desirable', 1.65, { bias: 1, cv: 1, from: 'typed' });
    const cells = summaryCells(s);
    expect(cells[SUMMARY_HEADERS.indexOf('Allowable total error %')]).toBe('');
    expect(cells[SUMMARY_HEADERS.indexOf('Note')]).toMatch(/no CVG/);
  });

  test('the header lines carry the provenance, the demo marker for the demo table and the caution', () => {
    const lines = summaryHeader(demoTable(), 'minimum', 1.65, '2026-02-03');
    expect(lines).toContain(DEMO_MARKER);
    expect(lines.some((l) => l.includes('minimum') && l.includes('1.65'))).toBe(true);
    expect(lines.some((l) => l.includes('2026-02-03') && /Leeway \d+\.\d+\.\d+/.test(l))).toBe(true);
    expect(lines[lines.length - 1]).toBe(`Caution: ${CAUTION}`);
  });
});
