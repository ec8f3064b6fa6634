/**
 * The EQA chart: an SVG string checked by parsing it as XML (xml2js, strict) and reading marks,
 * limit lines and the running mean back against the data, through the percent scale the chart's
 * own grid lines state.
 */
import { eqaChartRounds, eqaChartSvg } from '../../src/charts/eqaChart';
import type { EqaChartRound } from '../../src/charts/eqaChart';
import { eqaRounds } from '../../src/engine/eqaRounds';
import { mulberry32, uniform } from '../support/prng';
import { elements } from '../support/svg';
import type { El } from '../support/svg';

const cls = (els: El[], c: string): El[] => els.filter((e) => (e.attrs.class ?? '').split(' ').includes(c));

/** The chart's percent → y map, from two of its labelled grid lines. */
function scaleOf(els: El[]): (p: number) => number {
  const grid = cls(els, 'grid').map((g) => ({ p: Number(g.attrs['data-percent']), y: Number(g.attrs.y1) }));
  expect(grid.length).toBeGreaterThanOrEqual(3);
  const a = grid[0];
  const b = grid[grid.length - 1];
  return (p) => a.y + ((p - a.p) * (b.y - a.y)) / (b.p - a.p);
}

const rounds: EqaChartRound[] = [
  { label: 'R-01', deviation: 2.5, runningMean: 2.5, limit: 6 },
  { label: 'R-02', deviation: -7.1, runningMean: -2.3, limit: 6 },
  { label: 'R-03', deviation: null, runningMean: null, limit: 6 },
  { label: 'R-04', deviation: 4, runningMean: -0.2, limit: 8 },
];

describe('eqaChartSvg', () => {
  test('one mark per round with a deviation, at its y; the outside round is a diamond', async () => {
    const els = await elements(eqaChartSvg({ title: 'Demo analyte — deviation by round', rounds, width: 320 }));
    const y = scaleOf(els);
    const points = cls(els, 'point');
    expect(points.map((p) => p.attrs['data-round']).sort()).toEqual(['R-01', 'R-02', 'R-04']);
    for (const p of points) {
      const dev = Number(p.attrs['data-deviation']);
      // A circle's centre, or the middle of a diamond's highest and lowest corners.
      const ys = p.name === 'circle' ? [Number(p.attrs.cy)] : [...p.attrs.d.matchAll(/[ML][\d.]+ ([\d.]+)/g)].map((m) => Number(m[1]));
      const cy = (Math.min(...ys) + Math.max(...ys)) / 2;
      expect(Math.abs(cy - y(dev))).toBeLessThanOrEqual(0.02);
    }
    expect(cls(els, 'outside').map((p) => p.attrs['data-round'])).toEqual(['R-02']);
    expect(cls(els, 'missing').map((p) => p.attrs['data-round'])).toEqual(['R-03']);
  });

  test('the ±limit lines at the limit’s y, stepping where the limit changes', async () => {
    const els = await elements(eqaChartSvg({ title: 'Limits', rounds, width: 560 }));
    const y = scaleOf(els);
    const limits = cls(els, 'limit');
    expect(limits.map((l) => Number(l.attrs['data-limit']))).toEqual([6, 6, 6, 8]);
    for (const l of limits) expect(Math.abs(Number(l.attrs.y1) - y(Number(l.attrs['data-limit'])))).toBeLessThanOrEqual(0.01);
    const [plus, minus] = cls(els, 'limit-line');
    // Each drawn line's heights, from its path: +6 for three rounds then +8; −6 then −8.
    const heights = (d: string) => [...d.matchAll(/[ML][\d.]+ ([\d.]+)H/g)].map((m) => Number(m[1]));
    expect(heights(plus.attrs.d).map((h) => Math.round(h * 100))).toEqual([6, 6, 6, 8].map((p) => Math.round(y(p) * 100)));
    expect(heights(minus.attrs.d).map((h) => Math.round(h * 100))).toEqual([-6, -6, -6, -8].map((p) => Math.round(y(p) * 100)));
  });

  test('the running mean is a line through each round’s mean, broken where there is none', async () => {
    const els = await elements(eqaChartSvg({ title: 'Mean', rounds, width: 560 }));
    const y = scaleOf(els);
    const [mean] = cls(els, 'running-mean');
    const moves = [...mean.attrs.d.matchAll(/([ML])([\d.]+) ([\d.]+)/g)].map((m) => ({ op: m[1], y: Number(m[3]) }));
    expect(moves.map((m) => m.op)).toEqual(['M', 'L', 'M']);
    [2.5, -2.3, -0.2].forEach((p, i) => expect(Math.abs(moves[i].y - y(p))).toBeLessThanOrEqual(0.01));
  });

  test('a text title, a description and every round labelled; labels turn when they do not fit', async () => {
    const many = Array.from({ length: 10 }, (_, i) => ({ label: `EQA-26-${String(i + 1).padStart(2, '0')}`, deviation: i - 6, runningMean: 0, limit: 5 }));
    const svg = eqaChartSvg({ title: 'Arvelin <serum> & more', rounds: many, width: 320 });
    const els = await elements(svg);
    expect(cls(els, 'title')[0].text).toBe('Arvelin <serum> & more');
    expect(els.find((e) => e.name === 'desc')!.text).toMatch(/10 rounds .* 10 drawn, 1 outside the EQA limit/);
    const labels = cls(els, 'round-label');
    expect(labels.map((l) => l.text)).toEqual(many.map((r) => r.label));
    expect(labels.every((l) => /rotate/.test(l.attrs.transform ?? ''))).toBe(true);
    const wide = await elements(eqaChartSvg({ title: 't', rounds: many.slice(0, 3), width: 560 }));
    expect(cls(wide, 'round-label').some((l) => l.attrs.transform)).toBe(false);
  });

  test('at 320 px every text starts inside the drawing and the title wraps to two lines, the second cut to fit', async () => {
    const svg = eqaChartSvg({ title: 'A very long analyte name that will not fit on one line of the pane at all, nor on two lines of it', rounds, width: 320 });
    const els = await elements(svg);
    const W = Number(els[0].attrs.width);
    expect(W).toBe(320);
    for (const t of els.filter((e) => e.name === 'text')) {
      const x = Number(t.attrs.x);
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThanOrEqual(W);
    }
    const title = cls(els, 'title').map((t) => t.text);
    expect(title).toHaveLength(2);
    expect(title[0]).toBe('A very long analyte name that will not');
    expect(title[1].endsWith('…')).toBe(true);
    for (const t of title) expect(Array.from(t).length * 0.62 * 12).toBeLessThanOrEqual(320 - 16);
  });

  test('no limit: no limit lines and no legend key for it; no rounds: says so', async () => {
    const els = await elements(eqaChartSvg({ title: 'x', rounds: rounds.map((r) => ({ ...r, limit: null })) }));
    expect(cls(els, 'limit-line')).toHaveLength(0);
    expect(els.filter((e) => e.attrs['data-key'] === 'limit')).toHaveLength(0);
    const empty = await elements(eqaChartSvg({ title: 'x', rounds: [] }));
    expect(cls(empty, 'empty')[0].text).toBe('No EQA rounds');
  });

  test('bad input is a RangeError', () => {
    expect(() => eqaChartSvg({ title: 'x', rounds, width: 100 })).toThrow(RangeError);
    expect(() => eqaChartSvg({ title: 'x', rounds: [{ label: 'a', deviation: NaN, runningMean: null, limit: null }] })).toThrow(RangeError);
    expect(() => eqaChartSvg({ title: 'x', rounds: [{ label: 'a', deviation: 1, runningMean: null, limit: -1 }] })).toThrow(RangeError);
  });

  // Seed 2620: random rounds from the engine; every drawn mark lies inside the plot's frame and
  // at its deviation's y (the scale leaves room for every deviation, mean and limit).
  test('engine rounds drawn: every mark inside the frame, at its y', async () => {
    const rand = mulberry32(2620);
    for (let k = 0; k < 20; k++) {
      const input = Array.from({ length: 1 + Math.floor(rand() * 12) }, (_, i) => {
        const assigned = uniform(rand, 1, 500);
        return { round: `R${i}`, result: assigned * (1 + uniform(rand, -0.3, 0.3)), assigned, sdPt: assigned * 0.05, uAssigned: 0 };
      });
      const a = eqaRounds('P', input, { limit: { absolute: uniform(rand, 0, 10), percent: uniform(rand, 1, 12) } });
      const els = await elements(eqaChartSvg({ title: 'P', rounds: eqaChartRounds(a), width: 320 + Math.floor(rand() * 400) }));
      const y = scaleOf(els);
      const frame = cls(els, 'frame')[0];
      const top = Number(frame.attrs.y);
      const bottom = top + Number(frame.attrs.height);
      const circles = cls(els, 'point').filter((p) => p.name === 'circle');
      for (const c of circles) {
        const cy = Number(c.attrs.cy);
        expect(cy).toBeGreaterThanOrEqual(top);
        expect(cy).toBeLessThanOrEqual(bottom);
        expect(Math.abs(cy - y(Number(c.attrs['data-deviation'])))).toBeLessThanOrEqual(0.01);
      }
      expect(cls(els, 'point')).toHaveLength(input.length);
    }
  });
});
