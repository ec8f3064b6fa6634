/**
 * What-if figures (src/taskpane/whatif.ts) and the coverage conversion the pane uses
 * (src/taskpane/state.ts): every number must equal the engine's and an independent reference.
 */
import Decimal from 'decimal.js';
import quantile from '@stdlib/stats-base-dists-normal-quantile';
import { whatIf } from '../../src/taskpane/whatif';
import { zOf, DEFAULT_COVERAGE } from '../../src/taskpane/state';
import { tierTable } from '../../src/engine/spec';
import { tierMet } from '../../src/engine/perf';
import { mulberry32, uniform, relClose } from '../support/prng';

const D = Decimal.clone({ precision: 40 });

/** Independent reference with decimal.js: TEa = z·f·CVI + g·√(CVI² + CVG²) (Fraser et al. Ann Clin Biochem 1997;34:8–12). */
function refTotal(cvi: number, cvg: number, f: number, g: number, z: number): number {
  return new D(z).times(f).times(cvi).plus(new D(g).times(new D(cvi).pow(2).plus(new D(cvg).pow(2)).sqrt())).toNumber();
}

const FACTORS = [
  { tier: 'optimum', f: 0.25, g: 0.125 },
  { tier: 'desirable', f: 0.5, g: 0.25 },
  { tier: 'minimum', f: 0.75, g: 0.375 },
] as const;

describe('what-if: the three tiers side by side', () => {
  test('a glucose-like row (CVI 5.7, CVG 6.9) gives the published desirable figures 2.9 / 2.2 / 6.9 %', () => {
    // From memory: the widely reproduced desirable specifications for glucose from the
    // biological-variation database (CVI 5.7 %, CVG 6.9 %): imprecision 2.9 %, bias 2.2 %,
    // total error 6.9 % (z = 1.65), each published rounded to one decimal: tolerance ±0.05.
    const r = whatIf({ cvi: 5.7, cvg: 6.9, z: 1.65 });
    const des = r.rows[1];
    expect(des.tier).toBe('desirable');
    if (!des.cv.ok || !des.bias.ok || !des.total.ok) throw new Error('no figures');
    expect(Math.abs(des.cv.value - 2.9)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(des.bias.value - 2.2)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(des.total.value - 6.9)).toBeLessThanOrEqual(0.05);
  });

  test('equals the engine’s SPEC.TIERS and a decimal.js reference for 500 seeded rows (rel 1e-14)', () => {
    const rand = mulberry32(20260207);
    for (let i = 0; i < 500; i++) {
      const cvi = uniform(rand, 0.1, 40);
      const cvg = uniform(rand, 0, 80);
      const z = uniform(rand, 0, 3);
      const r = whatIf({ cvi, cvg, z });
      const engine = tierTable(cvi, cvg, z);
      r.rows.forEach((row, k) => {
        if (!row.cv.ok || !row.bias.ok || !row.total.ok) throw new Error('no figures');
        expect(row.tier).toBe(engine[k].tier);
        expect(row.cv.value).toBe(engine[k].cv);
        expect(row.bias.value).toBe(engine[k].bias);
        expect(row.total.value).toBe(engine[k].total);
        expect(relClose(row.total.value, refTotal(cvi, cvg, FACTORS[k].f, FACTORS[k].g, z), 1e-14)).toBe(true);
      });
    }
  });

  test('observed bias and CV give observed total error, sigma, share and tier met (common practice, no source)', () => {
    // CVI 5.7, CVG 6.9, z 1.65: desirable TEa = 1.65·2.85 + 0.25·√(5.7² + 6.9²).
    const bias = -1.2;
    const cv = 2.1;
    const r = whatIf({ cvi: 5.7, cvg: 6.9, z: 1.65, observed: { bias, cv } });
    const te = new D(1.2).plus(new D(1.65).times(2.1)).toNumber();
    expect(r.observedTotal).toEqual({ ok: true, value: expect.any(Number) });
    if (!r.observedTotal?.ok) throw new Error('no observed total');
    expect(relClose(r.observedTotal.value, te, 1e-15)).toBe(true);
    FACTORS.forEach((fac, k) => {
      const tea = refTotal(5.7, 6.9, fac.f, fac.g, 1.65);
      const row = r.rows[k];
      if (!row.sigma?.ok || !row.share?.ok) throw new Error('no sigma');
      expect(relClose(row.sigma.value, (tea - 1.2) / 2.1, 1e-13)).toBe(true);
      expect(relClose(row.share.value, te / tea, 1e-13)).toBe(true);
      expect(row.met).toBe(te <= tea);
    });
    expect(r.tierMet).toBe(tierMet(5.7, 6.9, bias, cv, 1.65, 'total'));
    expect(r.tierMet).toBe('desirable');
  });

  test('the tier met is the most stringent row whose allowance covers the observed total error (500 seeded cases)', () => {
    const rand = mulberry32(7);
    for (let i = 0; i < 500; i++) {
      const cvi = uniform(rand, 1, 20);
      const cvg = uniform(rand, 1, 40);
      const obs = { bias: uniform(rand, -8, 8), cv: uniform(rand, 0.2, 10) };
      const r = whatIf({ cvi, cvg, z: 1.65, observed: obs });
      const first = r.rows.find((x) => x.met);
      expect(r.tierMet).toBe(first ? first.tier : 'none');
    }
  });

  test('without CVG only the imprecision allowance is given, and the reason is said', () => {
    const r = whatIf({ cvi: 4, cvg: null, z: 1.65, observed: { bias: 1, cv: 1 } });
    expect(r.rows.map((x) => x.cv.ok && x.cv.value)).toEqual([1, 2, 3]);
    expect(r.rows[0].total).toEqual({ ok: false, why: 'no CVG in the table' });
    expect(r.tierMet).toEqual({ why: 'no CVG in the table' });
  });

  test('a fixed limit adds a row with SPEC.FIXED at the level (± 5 units or ± 10 %, whichever is greater)', () => {
    // At level 40: 100·5/40 = 12.5 % > 10 %; common practice, no source.
    const r = whatIf({ cvi: 12.4, cvg: 18.1, z: 1.65, limits: { level: 40, limitAbs: 5, limitPct: 10 }, observed: { bias: 2, cv: 3 } });
    const fixed = r.rows[3];
    expect(fixed.tier).toBe('fixed');
    expect(fixed.total).toEqual({ ok: true, value: 12.5 });
    if (!fixed.sigma?.ok) throw new Error('no sigma');
    expect(fixed.sigma.value).toBeCloseTo((12.5 - 2) / 3, 14);
  });

  test('a CV of 0 gives no sigma but the engine’s #DIV/0! message instead of Infinity', () => {
    const r = whatIf({ cvi: 5, cvg: 5, z: 1.65, observed: { bias: 1, cv: 0 } });
    expect(r.rows[1].sigma).toEqual({ ok: false, why: expect.stringMatching(/^#DIV\/0! cv must not be zero/) });
  });
});

describe('coverage: a probability is turned into z by ZSCORE’s code', () => {
  test('0.95 one-sided is 1.6448536… and 0.95 two-sided is 1.9599640… (stdlib reference, rel 1e-14)', () => {
    const one = zOf({ ...DEFAULT_COVERAGE, mode: 'probability', probability: 0.95, sides: 1 });
    const two = zOf({ ...DEFAULT_COVERAGE, mode: 'probability', probability: 0.95, sides: 2 });
    if (!one.ok || !two.ok) throw new Error('not ok');
    expect(relClose(one.z, quantile(0.95, 0, 1), 1e-14)).toBe(true);
    expect(relClose(two.z, quantile(0.975, 0, 1), 1e-14)).toBe(true);
    // NIST/SEMATECH e-Handbook table of the normal distribution: 1.645 and 1.960 (3 decimals).
    expect(Math.abs(one.z - 1.645)).toBeLessThan(0.0005);
    expect(Math.abs(two.z - 1.96)).toBeLessThan(0.0005);
  });

  test('the default is z = 1.65 given directly', () => {
    expect(zOf(DEFAULT_COVERAGE)).toEqual({ ok: true, z: 1.65 });
  });

  test('a probability outside (0, 1) or a negative z is refused with the engine’s message', () => {
    expect(zOf({ ...DEFAULT_COVERAGE, mode: 'probability', probability: 1 })).toEqual({ ok: false, why: 'probability must be a probability strictly between 0 and 1 (got 1)' });
    expect(zOf({ ...DEFAULT_COVERAGE, z: -1 })).toMatchObject({ ok: false });
    expect(zOf({ ...DEFAULT_COVERAGE, z: NaN })).toMatchObject({ ok: false });
  });
});
