/**
 * The assessment chain (src/engine/assess.ts): the one place the allowance → observed total
 * error → sigma → tier met → QC plan chain is computed. Each figure equals the engine function
 * the catalogue names for it; absences and errors say why.
 */
import { assess, explain, fixedLimit } from '../../src/engine/assess';
import { allowableTotalError, fixedLimitPercent } from '../../src/engine/spec';
import { sigmaMetric, tierMet } from '../../src/engine/perf';
import { planQc } from '../../src/engine/qc/plan';
import { derivedValue } from '../../src/engine/fill/plan';
import { whatIf } from '../../src/taskpane/whatif';
import type { VariationRow } from '../../src/engine/table';

const row = (over: Partial<VariationRow>): VariationRow => ({
  analyte: 'Demo analyte',
  specimen: '',
  unit: 'mmol/L',
  cvi: 5.7,
  cvg: 6.9,
  source: 'invented for the test',
  limitAbs: null,
  limitPct: null,
  level: null,
  note: '',
  line: 2,
  ...over,
});

describe('the fixed limit, one rule everywhere', () => {
  test('a percent limit without a level is that percent, in the chain, the fill and What-if alike', () => {
    const r = row({ limitPct: 10 });
    expect(fixedLimit(r)).toEqual({ ok: true, value: 10 });
    expect(derivedValue('fixed_pct', r, 'desirable', 1.65)).toBe(10);
    const w = whatIf({ cvi: r.cvi, cvg: r.cvg, z: 1.65, limits: r });
    expect(w.rows.map((x) => x.tier)).toEqual(['optimum', 'desirable', 'minimum', 'fixed']);
    expect(w.rows[3].total).toEqual({ ok: true, value: 10 });
  });

  test('an absolute limit is SPEC.FIXED at the level (± 0.3 units or ± 10 %, whichever is greater; common practice, no source)', () => {
    const r = row({ limitAbs: 0.3, limitPct: 10, level: 2 });
    expect(fixedLimit(r)).toEqual({ ok: true, value: fixedLimitPercent(2, 0.3, 10) });
    expect(derivedValue('fixed_pct', r, 'desirable', 1.65)).toBe(15);
  });

  test('an absolute limit without a level is the error a blank level cell gives SPEC.FIXED', () => {
    const f = fixedLimit(row({ limitAbs: 0.3 }));
    expect(f.ok).toBe(false);
    expect(explain(f)).toBe('#N/A level is blank: enter a number');
    expect(derivedValue('fixed_pct', row({ limitAbs: 0.3 }), 'desirable', 1.65)).toEqual({ error: '#N/A', message: 'level is blank: enter a number' });
  });

  test('no limit columns: no fixed limit, and no fixed row', () => {
    const a = assess({ spec: row({}), tier: 'desirable', z: 1.65 });
    expect(a.fixed).toEqual({ ok: false, absent: true, why: 'no fixed limit in the table' });
    expect(a.rows.map((r) => r.basis)).toEqual(['optimum', 'desirable', 'minimum']);
  });
});

describe('the chain', () => {
  test('each figure is the catalogue function’s value at the tier in use', () => {
    const obs = { bias: -1.2, cv: 2.1 };
    for (const tier of ['optimum', 'desirable', 'minimum'] as const) {
      const a = assess({ spec: row({}), tier, z: 1.65, observed: obs, plan: true });
      const total = allowableTotalError(5.7, 6.9, tier, 1.65);
      expect(a.inUse.basis).toBe(tier);
      expect(a.inUse.total).toEqual({ ok: true, value: total });
      expect(a.inUse.sigma).toEqual({ ok: true, value: sigmaMetric(total, obs.bias, obs.cv) });
      expect(a.tierMet).toEqual({ ok: true, value: tierMet(5.7, 6.9, obs.bias, obs.cv, 1.65, 'total') });
      expect(a.plan).toEqual({ ok: true, value: planQc(total, obs.bias, obs.cv) });
    }
  });

  test('without CVG: no bias or total allowance, no sigma, no tier met, no plan — each says why', () => {
    const a = assess({ spec: row({ cvg: null }), tier: 'desirable', z: 1.65, observed: { bias: 1, cv: 2 }, plan: true });
    expect(a.inUse.cv.ok).toBe(true);
    expect(explain(a.inUse.total)).toBe('no CVG in the table');
    expect(explain(a.inUse.sigma)).toBe('no CVG in the table');
    expect(explain(a.tierMet)).toBe('no CVG in the table');
    expect(explain(a.plan)).toBe('no CVG in the table');
  });

  test('without observed data: allowances only', () => {
    const a = assess({ spec: row({}), tier: 'minimum', z: 1.65, plan: true });
    expect(a.inUse.total.ok).toBe(true);
    expect(explain(a.observedTotal)).toBe('no observed bias and CV');
    expect(explain(a.plan)).toBe('no observed bias and CV');
    expect(a.inUse.met).toBeUndefined();
  });

  test('an engine error stops only the figures that need it, with its code and message', () => {
    const a = assess({ spec: row({}), tier: 'desirable', z: 1.65, observed: { bias: 1, cv: 0 }, plan: true });
    expect(a.observedTotal.ok).toBe(true);
    expect(a.inUse.sigma).toMatchObject({ ok: false, absent: false, code: '#DIV/0!' });
    expect(a.plan).toMatchObject({ ok: false, absent: false, code: '#DIV/0!' });
  });
});
