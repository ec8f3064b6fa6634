/**
 * The risk chart: an SVG string checked by parsing it as XML (xml2js, strict) and reading the
 * marks' data-* attributes and coordinates back against the engine's risk curve.
 */
import { riskChartSvg, riskChartText, riskAxisTop, showRisk } from '../../src/charts/riskChart';
import type { RiskChartInput } from '../../src/charts/riskChart';
import { riskCurve } from '../../src/engine/qc/risk';
import { shiftAxis } from '../../src/engine/qc/power';
import { elements } from '../support/svg';

/** Allowable 10 %, bias 1 %, CV 2 % with 1-3s/2-2s/R-4s at n = 2 (an invented method). */
function input(runSize: number, over: Partial<RiskChartInput> = {}): RiskChartInput {
  const c = riskCurve(10, 1, 2, '1-3s/2-2s/R-4s', 2, runSize, shiftAxis(6, 0.1));
  return { title: 'Risk of unreliable results', procedure: '1-3s/2-2s/R-4s, n=2', runSize, points: c.points, maxRisk: c.maxRisk, argmax: c.argmax, ...over };
}

describe('riskChartSvg', () => {
  test('the curve carries the engine’s points and the peak its maximum, at full precision', async () => {
    const inp = input(300);
    const els = await elements(riskChartSvg(inp));
    const curve = els.find((e) => e.attrs.class === 'risk-curve')!;
    expect(curve.attrs['data-shifts'].split(',').map(Number)).toEqual(inp.points.map((p) => p.shift));
    expect(curve.attrs['data-risks'].split(',').map(Number)).toEqual(inp.points.map((p) => p.risk));
    const peak = els.find((e) => e.attrs.class === 'risk-peak')!;
    expect(Number(peak.attrs['data-max-risk'])).toBe(inp.maxRisk);
    expect(Number(peak.attrs['data-argmax'])).toBe(inp.argmax);
    expect(peak.attrs['data-run-size']).toBe('300');
  });

  test('the peak mark sits on the curve’s highest point and the limit line at 1', async () => {
    const inp = input(300);
    const els = await elements(riskChartSvg(inp));
    const curve = els.find((e) => e.attrs.class === 'risk-curve')!;
    const ys = curve.attrs.d.split(/[ML]/).filter(Boolean).map((p) => Number(p.split(' ')[1]));
    const circle = els.find((e) => e.name === 'circle')!;
    // SVG y grows downwards: the peak is at or above (smaller y than) every plotted point, within rounding.
    expect(Number(circle.attrs.cy)).toBeLessThanOrEqual(Math.min(...ys) + 0.01);
    const limit = els.find((e) => e.attrs.class === 'risk-limit')!;
    expect(limit.attrs['data-limit']).toBe('1');
    // The peak below 1 is drawn below the limit line; at a run size four times longer above it.
    expect(Number(circle.attrs.cy) > Number(limit.attrs.y1)).toBe(inp.maxRisk < 1);
    const long = input(300 * 40);
    const els2 = await elements(riskChartSvg(long));
    const c2 = els2.find((e) => e.name === 'circle')!;
    const l2 = els2.find((e) => e.attrs.class === 'risk-limit')!;
    expect(long.maxRisk).toBeGreaterThan(1);
    expect(Number(c2.attrs.cy)).toBeLessThan(Number(l2.attrs.y1));
  });

  test('every coordinate lies inside the viewBox at the pane’s width and in print', async () => {
    for (const width of [288, 320, 800]) {
      const els = await elements(riskChartSvg(input(2000, { width })));
      const svg = els[0];
      const [, , w, h] = svg.attrs.viewBox.split(' ').map(Number);
      expect(w).toBe(width);
      const outside: string[] = [];
      for (const e of els) {
        for (const [keys, max] of [[['x', 'x1', 'x2', 'cx'], w], [['y', 'y1', 'y2', 'cy'], h]] as const) {
          for (const k of keys) if (e.attrs[k] !== undefined && !(Number(e.attrs[k]) >= 0 && Number(e.attrs[k]) <= max)) outside.push(`${e.name}.${k}=${e.attrs[k]}`);
        }
        if (e.attrs['font-size'] !== undefined && Number(e.attrs['font-size']) < 9) outside.push(`${e.name} font-size ${e.attrs['font-size']}`);
      }
      expect({ width, outside }).toEqual({ width, outside: [] });
    }
  });

  test('screen readers get a title and a description in words; text is escaped', async () => {
    const inp = input(120, { procedure: '1-3s & <n=2>' });
    const svg = riskChartSvg(inp);
    const els = await elements(svg);
    expect(els[0].attrs.role).toBe('img');
    const desc = els.find((e) => e.name === 'desc')!;
    expect(desc.text).toBe(riskChartText(inp));
    expect(desc.text).toContain('1-3s & <n=2> with 120 patient results between QC events');
    expect(desc.text).toContain(inp.maxRisk > 1 ? 'above the acceptable 1' : 'within the acceptable 1');
    expect(svg).toContain('1-3s &amp; &lt;n=2&gt;');
  });

  test('bad input is refused with a RangeError', () => {
    expect(() => riskChartSvg(input(10, { width: 100 }))).toThrow(RangeError);
    expect(() => riskChartSvg(input(10, { maxRisk: Number.NaN }))).toThrow(/finite/);
    expect(() => riskChartSvg(input(10, { points: [{ shift: 0, risk: -1 }] }))).toThrow(/≥ 0/);
  });
});

describe('axis and number helpers', () => {
  test('the risk axis top is 1, 2, 2.5 or 5 times a power of ten, at least the value', () => {
    expect([0.3, 1, 1.08, 2.2, 4, 7, 12].map(riskAxisTop)).toEqual([0.5, 1, 2, 2.5, 5, 10, 20]);
  });
  test('risks are shown with three significant digits', () => {
    expect([0, 0.0012345, 0.998, 1, 12.345, 123.4, 2.5e6].map(showRisk)).toEqual(['0', '0.00123', '0.998', '1', '12.3', '123', '2.50e6']);
  });
});
