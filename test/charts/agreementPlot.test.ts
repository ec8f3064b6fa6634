/**
 * The difference plot: an SVG string parsed as strict XML (xml2js), its marks read back against
 * the data and DATA.AGREEMENT's figures (the points' data-* attributes; the bands' positions
 * on the plot's own scale), the text equivalent checked, text escaped, bad input refused.
 */
import { agreementPlotSvg, showFigure } from '../../src/charts/agreementPlot';
import type { AgreementPlotInput } from '../../src/charts/agreementPlot';
import { evaluate } from '../../src/registry';
import { mulberry32 } from '../support/prng';
import { elements } from '../support/svg';

/** A comparison of n invented pairs (seeded) and its figures from DATA.AGREEMENT. */
function study(n: number, seed: number, scale: 'absolute' | 'percent' = 'absolute'): AgreementPlotInput {
  const rnd = mulberry32(seed);
  const x = Array.from({ length: n }, () => 50 + 100 * rnd());
  const y = x.map((v) => v * 1.02 + (rnd() - 0.5) * 6);
  const f = evaluate('DATA.AGREEMENT', [x.map((v) => [v]), y.map((v) => [v]), scale])[1] as number[];
  const points = x.map((xv, i) => ({ mean: (xv + y[i]) / 2, difference: scale === 'absolute' ? y[i] - xv : (200 * (y[i] - xv)) / (xv + y[i]) }));
  return {
    title: 'Difference plot <demo & test>',
    points,
    meanDifference: { value: f[0], low: f[1], high: f[2] },
    lower: { value: f[4], low: f[5], high: f[6] },
    upper: { value: f[7], low: f[8], high: f[9] },
    scale,
  };
}

describe('difference plot', () => {
  test('one circle per pair, carrying the pair exactly; pairs outside the limits marked', async () => {
    const input = study(40, 7);
    const els = await elements(agreementPlotSvg(input));
    const circles = els.filter((e) => e.name === 'circle');
    expect(circles).toHaveLength(40);
    circles.forEach((c, i) => {
      expect(Number(c.attrs['data-mean'])).toBe(input.points[i].mean);
      expect(Number(c.attrs['data-difference'])).toBe(input.points[i].difference);
      const off = input.points[i].difference < input.lower.value || input.points[i].difference > input.upper.value;
      expect(c.attrs.class.includes('outside')).toBe(off);
    });
  });

  test('the bands sit in order on one scale: lower below mean below upper, each interval around its line', async () => {
    const input = study(25, 11);
    const els = await elements(agreementPlotSvg(input));
    const bands = els.filter((e) => e.name === 'g' && e.attrs.class === 'band');
    expect(bands.map((b) => b.attrs['data-band'])).toEqual(['upper', 'mean', 'lower']);
    expect(Number(bands[0].attrs['data-value'])).toBe(input.upper.value);
    const rects = els.filter((e) => e.name === 'rect' && e.attrs['fill-opacity']);
    const lines = els.filter((e) => e.name === 'line' && (e.attrs.stroke === '#3d6b45' || e.attrs.stroke === '#8a4b16'));
    const yUpper = Number(lines[0].attrs.y1);
    const yMean = Number(lines[1].attrs.y1);
    const yLower = Number(lines[2].attrs.y1);
    expect(yUpper).toBeLessThan(yMean);
    expect(yMean).toBeLessThan(yLower);
    rects.forEach((r, i) => {
      const y = [yUpper, yMean, yLower][i];
      expect(Number(r.attrs.y)).toBeLessThanOrEqual(y);
      expect(Number(r.attrs.y) + Number(r.attrs.height)).toBeGreaterThanOrEqual(y);
    });
    // A point's position on the same linear scale as the mean line (within the 0.01 px rounding).
    const circles = els.filter((e) => e.name === 'circle');
    const k = (yLower - yUpper) / (input.upper.value - input.lower.value);
    circles.forEach((c, i) => expect(Math.abs(Number(c.attrs.cy) - (yMean - (input.points[i].difference - input.meanDifference.value) * k))).toBeLessThan(0.02));
  });

  test('the text equivalent gives the figures and the count outside; text is escaped', async () => {
    const input = study(30, 3, 'percent');
    const svg = agreementPlotSvg(input);
    const els = await elements(svg);
    const desc = els.find((e) => e.name === 'desc')!.text;
    expect(desc).toMatch(/^30 pairs: the difference in % of the pair’s mean against the mean of the pair\./);
    expect(desc).toContain(`Mean difference ${showFigure(input.meanDifference.value)}% (95 % CI ${showFigure(input.meanDifference.low)} to ${showFigure(input.meanDifference.high)})`);
    expect(els.find((e) => e.name === 'svg')!.attrs.role).toBe('img');
    expect(svg).toContain('Difference plot &lt;demo &amp; test&gt;');
  });

  test('fits the pane at 288 px and widens for print; bad input is refused', () => {
    const input = study(10, 5);
    expect(agreementPlotSvg(input)).toMatch(/^<svg [^>]*width="288"/);
    expect(agreementPlotSvg({ ...input, width: 900 })).toMatch(/^<svg [^>]*width="900"/);
    expect(() => agreementPlotSvg({ ...input, width: 100 })).toThrow(RangeError);
    expect(() => agreementPlotSvg({ ...input, upper: { value: NaN, low: 0, high: 1 } })).toThrow(RangeError);
    expect(() => agreementPlotSvg({ ...input, points: [{ mean: Infinity, difference: 0 }] })).toThrow(RangeError);
  });

  test('figures shown with three significant digits and a true minus sign', () => {
    expect(showFigure(-3.0578)).toBe('−3.06');
    expect(showFigure(12.345)).toBe('12.3');
    expect(showFigure(0)).toBe('0');
  });
});
