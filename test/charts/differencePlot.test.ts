/**
 * The difference plot: an SVG string checked by parsing it as XML (xml2js, strict) and reading the
 * marks' data-* attributes and coordinates back against the pairs and the agreement figures
 * (DATA.AGREEMENT, from the registry, on the same pairs).
 */
import * as fs from 'fs';
import * as path from 'path';
import { differencePlotSvg, pairDifference, showValue } from '../../src/charts/differencePlot';
import type { AgreementLines, DifferencePair } from '../../src/charts/differencePlot';
import { svgToPng } from '../../src/cli/picture';
import { evaluate } from '../../src/registry';
import { mulberry32 } from '../support/prng';
import { elements, byClass } from '../support/svg';
import type { El } from '../support/svg';

/** Seeded pairs (seed 7041): 30 results on two methods, the second 2 % higher with 3 % noise. */
function pairs(): DifferencePair[] {
  const rand = mulberry32(7041);
  return Array.from({ length: 30 }, (_, i) => {
    const x = 20 + 180 * rand();
    const y = x * 1.02 * (1 + 0.03 * (rand() + rand() + rand() - 1.5));
    return { x: Number(x.toFixed(1)), y: Number(y.toFixed(1)), label: `S${i + 1}` };
  });
}

function agreementOf(ps: readonly DifferencePair[], scale: 'absolute' | 'percent'): AgreementLines {
  const out = evaluate('DATA.AGREEMENT', [ps.map((p) => [p.x]), ps.map((p) => [p.y]), scale]);
  const v = (label: string): number => out[1][out[0].indexOf(label)] as number;
  return {
    meanDifference: v('Mean difference'),
    meanDifferenceLow: v('Mean difference low'),
    meanDifferenceHigh: v('Mean difference high'),
    lowerLimit: v('Lower limit'),
    lowerLimitLow: v('Lower limit low'),
    lowerLimitHigh: v('Lower limit high'),
    upperLimit: v('Upper limit'),
    upperLimitLow: v('Upper limit low'),
    upperLimitHigh: v('Upper limit high'),
  };
}

/** The y of a value in the plot area, from the area's own stated range and box. */
function yOfArea(area: El, v: number): number {
  const top = Number(area.attrs['data-top']);
  const h = Number(area.attrs['data-height']);
  const lo = Number(area.attrs['data-y-low']);
  const hi = Number(area.attrs['data-y-high']);
  return top + ((hi - v) / (hi - lo)) * h;
}

function xOfArea(area: El, v: number): number {
  const left = Number(area.attrs['data-left']);
  const w = Number(area.attrs['data-width']);
  const lo = Number(area.attrs['data-x-low']);
  const hi = Number(area.attrs['data-x-high']);
  return left + ((v - lo) / (hi - lo)) * w;
}

describe('the difference plot as SVG', () => {
  const ps = pairs();

  test.each(['absolute', 'percent'] as const)('one point per pair at (mean, difference) on the %s scale', async (scale) => {
    const a = agreementOf(ps, scale);
    const els = await elements(differencePlotSvg({ title: 'Demo', pairs: ps, agreement: a, scale, unit: 'U/L' }));
    const area = byClass(els, 'plot-area')[0];
    expect(area.attrs['data-scale']).toBe(scale);
    const points = byClass(els, 'point');
    expect(points).toHaveLength(ps.length);
    ps.forEach((p, i) => {
      const mark = points.find((e) => Number(e.attrs['data-index']) === i + 1)!;
      const d = scale === 'absolute' ? p.y - p.x : (100 * (p.y - p.x)) / ((p.x + p.y) / 2);
      expect(Number(mark.attrs['data-difference'])).toBeCloseTo(d, 12);
      expect(Number(mark.attrs['data-mean'])).toBe((p.x + p.y) / 2);
      // Coordinates are written with two decimals: within 0.005 px of the exact position.
      expect(Math.abs(Number(mark.attrs.cy) - yOfArea(area, d))).toBeLessThanOrEqual(0.0051);
      expect(Math.abs(Number(mark.attrs.cx) - xOfArea(area, (p.x + p.y) / 2))).toBeLessThanOrEqual(0.0051);
      expect(mark.name).toBe('circle');
    });
    // The mean of the plotted differences is DATA.AGREEMENT's mean difference (same pairs, same scale).
    const meanD = points.reduce((s, e) => s + Number(e.attrs['data-difference']), 0) / points.length;
    expect(meanD).toBeCloseTo(a.meanDifference, 10);
  });

  test('lines at the mean difference and the two limits, each over a band spanning its interval', async () => {
    const a = agreementOf(ps, 'absolute');
    const els = await elements(differencePlotSvg({ title: 'Demo', pairs: ps, agreement: a, width: 640 }));
    const area = byClass(els, 'plot-area')[0];
    const lines = byClass(els, 'agreement-line');
    expect(lines.map((l) => l.attrs['data-kind'])).toEqual(['upper', 'mean', 'lower']);
    const expected = { upper: a.upperLimit, mean: a.meanDifference, lower: a.lowerLimit } as const;
    for (const l of lines) {
      const v = expected[l.attrs['data-kind'] as keyof typeof expected];
      expect(Number(l.attrs['data-value'])).toBe(v);
      expect(l.attrs.y1).toBe(l.attrs.y2);
      expect(Math.abs(Number(l.attrs.y1) - yOfArea(area, v))).toBeLessThanOrEqual(0.0051);
    }
    // The mean line is solid, the limits dashed.
    expect(lines.find((l) => l.attrs['data-kind'] === 'mean')!.attrs['stroke-dasharray']).toBeUndefined();
    expect(lines.find((l) => l.attrs['data-kind'] === 'upper')!.attrs['stroke-dasharray']).toBeDefined();
    const bands = byClass(els, 'band');
    const intervals = { upper: [a.upperLimitLow, a.upperLimitHigh], mean: [a.meanDifferenceLow, a.meanDifferenceHigh], lower: [a.lowerLimitLow, a.lowerLimitHigh] } as const;
    expect(bands).toHaveLength(3);
    for (const b of bands) {
      const [lo, hi] = intervals[b.attrs['data-kind'] as keyof typeof intervals];
      const y = Number(b.attrs.y);
      const h = Number(b.attrs.height);
      expect(Math.abs(y - yOfArea(area, hi))).toBeLessThanOrEqual(0.0051);
      expect(Math.abs(y + h - yOfArea(area, lo))).toBeLessThanOrEqual(0.011);
      // The band contains its line.
      const line = lines.find((l) => l.attrs['data-kind'] === b.attrs['data-kind'])!;
      expect(Number(line.attrs.y1)).toBeGreaterThan(y);
      expect(Number(line.attrs.y1)).toBeLessThan(y + h);
    }
    // A point above the upper limit is drawn above its line (smaller y), one below the lower limit below it.
    const upperY = Number(lines[0].attrs.y1);
    for (const p of byClass(els, 'point')) {
      const d = Number(p.attrs['data-difference']);
      if (d > a.upperLimit) expect(Number(p.attrs.cy)).toBeLessThan(upperY);
    }
  });

  test('every line named with its value in the margin, the labels never overlapping, inside the drawing', async () => {
    // Close lines: the labels must be pushed apart.
    const a: AgreementLines = { meanDifference: 0.1, meanDifferenceLow: 0.05, meanDifferenceHigh: 0.15, lowerLimit: 0, lowerLimitLow: -0.05, lowerLimitHigh: 0.05, upperLimit: 0.2, upperLimitLow: 0.15, upperLimitHigh: 0.25 };
    const few: DifferencePair[] = [{ x: 10, y: 10.1 }, { x: 20, y: 20.1 }, { x: 30, y: 30.1 }];
    for (const width of [288, 320, 800]) {
      const els = await elements(differencePlotSvg({ title: 'Close', pairs: few, agreement: a, width }));
      const root = els[0];
      const labels = byClass(els, 'line-label');
      expect(labels.map((l) => l.text)).toEqual([`upper ${showValue(0.2)}`, `mean ${showValue(0.1)}`, `lower ${showValue(0)}`]);
      const ys = labels.map((l) => Number(l.attrs.y));
      const fs = Number(labels[0].attrs['font-size']);
      expect(ys[1] - ys[0]).toBeGreaterThanOrEqual(fs);
      expect(ys[2] - ys[1]).toBeGreaterThanOrEqual(fs);
      // Estimated right end of each label (0.62 em per character) inside the drawing.
      for (const l of labels) expect(Number(l.attrs.x) + Array.from(l.text).length * 0.62 * fs).toBeLessThanOrEqual(Number(root.attrs.width));
    }
  });

  test('well-formed, accessible, escaped; the description gives the figures', async () => {
    const a = agreementOf(ps, 'percent');
    const svg = differencePlotSvg({ title: 'A & B <demo>', pairs: ps, agreement: a, scale: 'percent', id: 'p 1' });
    const els = await elements(svg);
    const root = els[0];
    expect(root.attrs.role).toBe('img');
    expect(root.attrs['aria-label']).toBe('A & B <demo>');
    expect(root.attrs.width).toBe('320');
    const desc = els.find((e) => e.name === 'desc')!;
    expect(desc.attrs.id).toBe('p-1-desc');
    expect(desc.text).toContain('Difference plot of 30 pairs');
    expect(desc.text).toContain(`Mean difference ${showValue(a.meanDifference)}`);
    expect(svg).not.toMatch(/NaN|Infinity/);
    // The text equivalent counts the pairs outside the limits (what a reader of the picture sees).
    const outside = ps.map((p) => pairDifference(p, 'percent')).filter((d) => d < a.lowerLimit || d > a.upperLimit).length;
    expect(desc.text).toContain(`${outside} pair(s) outside the limits.`);
  });

  test('fits the task pane at 288 px and widens for print', () => {
    const a = agreementOf(ps, 'absolute');
    expect(differencePlotSvg({ title: 't', pairs: ps, agreement: a, width: 288 })).toMatch(/^<svg [^>]*width="288"/);
    expect(differencePlotSvg({ title: 't', pairs: ps, agreement: a, width: 900 })).toMatch(/^<svg [^>]*width="900"/);
  });

  test('the values beside the lines with the decimals asked for (as the table beside the plot shows them)', async () => {
    const a = agreementOf(ps, 'percent');
    const els = await elements(differencePlotSvg({ title: 't', pairs: ps, agreement: a, scale: 'percent', decimals: 2 }));
    expect(byClass(els, 'line-label').map((l) => l.text)).toEqual([`upper ${showValue(a.upperLimit, 2)}`, `mean ${showValue(a.meanDifference, 2)}`, `lower ${showValue(a.lowerLimit, 2)}`]);
    expect(showValue(-1.666, 2)).toBe('−1.67');
    expect(showValue(0.696, 2)).toBe('0.70');
    expect(showValue(-0.001, 2)).toBe('0.00');
    expect(() => differencePlotSvg({ title: 't', pairs: ps, agreement: a, decimals: 1.5 })).toThrow(/decimals/);
  });

  test('refuses a width out of range, a non-finite pair or figure, and a percent difference of a pair with mean 0', () => {
    const a = agreementOf(ps, 'absolute');
    expect(() => differencePlotSvg({ title: 't', pairs: ps, agreement: a, width: 100 })).toThrow(/width/);
    expect(() => differencePlotSvg({ title: 't', pairs: [{ x: 1, y: NaN }], agreement: a })).toThrow(/pair 1/);
    expect(() => differencePlotSvg({ title: 't', pairs: ps, agreement: { ...a, upperLimit: Infinity } })).toThrow(/upperLimit/);
    expect(() => pairDifference({ x: -1, y: 1 }, 'percent')).toThrow(/mean of 0/);
  });

  test('at least two labelled ticks on each axis, in order, inside the plot, at pane and print widths', async () => {
    for (const width of [288, 320, 640]) {
      for (const set of [ps, ps.map((p) => ({ x: p.x / 10 + 8, y: p.y / 10 + 8 })), ps.slice(0, 5)]) {
        const els = await elements(differencePlotSvg({ title: 't', pairs: set, agreement: agreementOf(set, 'absolute'), width }));
        const area = byClass(els, 'plot-area')[0];
        const left = Number(area.attrs['data-left']);
        const right = left + Number(area.attrs['data-width']);
        const xTicks = byClass(els, 'tick').filter((t) => t.attrs['text-anchor'] === 'middle');
        const yTicks = byClass(els, 'tick').filter((t) => t.attrs['text-anchor'] === 'end');
        expect(xTicks.length).toBeGreaterThanOrEqual(2);
        expect(yTicks.length).toBeGreaterThanOrEqual(2);
        const xs = xTicks.map((t) => Number(t.attrs.x));
        expect(xs).toEqual([...xs].sort((a, b) => a - b));
        for (const x of xs) expect(x >= left - 0.01 && x <= right + 0.01).toBe(true);
        const values = xTicks.map((t) => Number(t.text.replace('−', '-')));
        expect(values).toEqual([...values].sort((a, b) => a - b));
      }
    }
  });

  test('no pairs: an empty plot that says so', async () => {
    const a = agreementOf(ps, 'absolute');
    const els = await elements(differencePlotSvg({ title: 't', pairs: [], agreement: a }));
    expect(byClass(els, 'point')).toHaveLength(0);
    expect(byClass(els, 'empty')[0].text).toBe('No pairs');
  });

  test('renders to PNG at pane and print widths (pictures kept in out/charts to be looked at)', () => {
    const dir = path.join(__dirname, '..', '..', 'out', 'charts');
    fs.mkdirSync(dir, { recursive: true });
    for (const [width, scale] of [[320, 'percent'], [640, 'absolute']] as const) {
      const png = svgToPng(differencePlotSvg({ title: `Difference plot, ${width} px`, pairs: ps, agreement: agreementOf(ps, scale), scale, unit: 'U/L', width }), 1);
      expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
      fs.writeFileSync(path.join(dir, `difference-${width}.png`), png);
    }
  });
});
