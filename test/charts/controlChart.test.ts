/**
 * The control chart: an SVG string checked by parsing it as XML (xml2js, strict) and reading
 * the marks' data-* attributes back against the data drawn.
 */
import { readFileSync, readdirSync } from 'fs';
import { join } from 'path';
import { chartSeries, ChartSeries, controlChartSvg, cut, escapeXml, Z_EDGE } from '../../src/charts/controlChart';
import { evaluateControls } from '../../src/engine/qc/flags';
import { parseRule } from '../../src/engine/qc/rules';
import { elements, byClass } from '../support/svg';
import type { El } from '../support/svg';

const SERIES: ChartSeries[] = [
  {
    name: 'Low',
    points: [
      { index: 1, z: 0.3, flags: '' },
      { index: 3, z: 2.2, flags: '' },
      { index: 5, z: 2.4, flags: '2-2s' },
      { index: 7, z: -0.123456789012345, flags: '' },
    ],
  },
  {
    name: 'High',
    points: [
      { index: 2, z: -1.1, flags: '' },
      { index: 4, z: 3.3, flags: '1-3s' },
      { index: 6, z: -1.2, flags: 'R-4s' },
      { index: 8, z: 0.1, flags: '' },
    ],
  },
];

describe('the control chart as SVG', () => {
  test('is well-formed XML with an accessible name and description', async () => {
    const svg = controlChartSvg({ title: 'Glucose', series: SERIES });
    const els = await elements(svg);
    const root = els[0];
    expect(root.name).toBe('svg');
    expect(root.attrs.xmlns).toBe('http://www.w3.org/2000/svg');
    expect(root.attrs.role).toBe('img');
    expect(root.attrs['aria-label']).toBe('Glucose');
    expect(root.attrs.width).toBe('288');
    expect(root.attrs['font-family']).toBe('sans-serif');
    const title = els.find((e) => e.name === 'title' && e.parent === root);
    const desc = els.find((e) => e.name === 'desc' && e.parent === root);
    expect(title?.text).toBe('Glucose');
    expect(desc?.attrs.id).toBe(root.attrs['aria-describedby']);
    expect(desc?.text).toMatch(/^Control results in SD units from their target, in run order: 8 results of 2 materials \(Low: 4; High: 4\)/);
    expect(desc?.text).toMatch(/3 flagged: Low at 5 \(z \+2\.40\): 2-2s; High at 4 \(z \+3\.30\): 1-3s; High at 6 \(z −1\.20\): R-4s\.$/);
  });

  test('one line per material, and a mark per result carrying z at full precision and its flags', async () => {
    const els = await elements(controlChartSvg({ title: 'QC', series: SERIES, width: 640 }));
    const lines = byClass(els, 'series');
    expect(lines.map((l) => l.attrs['data-material'])).toEqual(['Low', 'High']);
    for (const l of lines) expect(l.name).toBe('path');
    // Each line passes through its points in order: one M and (points − 1) L commands.
    expect(lines[0].attrs.d.match(/[ML]/g)).toEqual(['M', 'L', 'L', 'L']);
    const points = byClass(els, 'point');
    expect(points).toHaveLength(8);
    for (const s of SERIES) {
      for (const p of s.points) {
        const mark = points.find((e) => e.attrs['data-material'] === s.name && Number(e.attrs['data-index']) === p.index);
        expect(mark).toBeDefined();
        expect(Number(mark?.attrs['data-z'])).toBe(p.z);
        expect(mark?.attrs['data-flags']).toBe(p.flags);
      }
    }
  });

  test('flagged results are ringed and labelled with the terms they complete', async () => {
    const els = await elements(controlChartSvg({ title: 'QC', series: SERIES }));
    const flagged = byClass(els, 'flagged');
    expect(flagged.map((e) => e.attrs['data-flags']).sort()).toEqual(['1-3s', '2-2s', 'R-4s']);
    expect(byClass(els, 'flag-ring').map((e) => e.attrs['data-flags']).sort()).toEqual(['1-3s', '2-2s', 'R-4s']);
    const labels = byClass(els, 'flag-label');
    expect(labels.map((g) => g.attrs['data-flags']).sort()).toEqual(['1-3s', '2-2s', 'R-4s']);
    for (const g of labels) {
      const text = els.find((e) => e.parent === g && e.name === 'text');
      expect(text?.text).toBe(g.attrs['data-flags']);
    }
    // The ring is centred on the mark's own point: the label belongs to the right result.
    const rings = byClass(els, 'flag-ring');
    const low5 = rings.find((r) => r.attrs['data-flags'] === '2-2s');
    const lowMarks = byClass(els, 'point').filter((e) => e.attrs['data-material'] === 'Low');
    const line = byClass(els, 'series')[0].attrs.d.split(/[ML]/).filter(Boolean);
    const third = line[lowMarks.findIndex((e) => e.attrs['data-index'] === '5')].split(' ');
    expect(low5?.attrs.cx).toBe(third[0]);
    expect(low5?.attrs.cy).toBe(third[1]);
  });

  test('labels of flagged results do not overlap when there is room', async () => {
    const dense: ChartSeries[] = [
      { name: 'A', points: Array.from({ length: 12 }, (_v, i) => ({ index: i + 1, z: i % 2 ? 2.5 : -2.5, flags: i % 2 ? '1-2.5s' : '2-2s/R-4s' })) },
    ];
    for (const width of [288, 800]) {
      const els = await elements(controlChartSvg({ title: 'dense', series: dense, width }));
      const boxes = byClass(els, 'flag-label').map((g) => {
        const r = els.find((e) => e.parent === g && e.name === 'rect') as El;
        return { x: Number(r.attrs.x), y: Number(r.attrs.y), w: Number(r.attrs.width), h: Number(r.attrs.height) };
      });
      expect(boxes).toHaveLength(12);
      for (let i = 0; i < boxes.length; i++) {
        for (let j = i + 1; j < boxes.length; j++) {
          const a = boxes[i];
          const b = boxes[j];
          const apart = a.x + a.w <= b.x || b.x + b.w <= a.x || a.y + a.h <= b.y || b.y + b.h <= a.y;
          expect(apart).toBe(true);
        }
        // Inside the drawing.
        expect(boxes[i].x).toBeGreaterThanOrEqual(0);
        expect(boxes[i].x + boxes[i].w).toBeLessThanOrEqual(width);
      }
    }
  });

  test('escapes material names and titles written by users ("<&>" and quotes)', async () => {
    const name = 'Lot <7> & "B"\'';
    const svg = controlChartSvg({ title: 'Na+ <&> "QC"', series: [{ name, points: [{ index: 1, z: 3.5, flags: '1-3s' }] }] });
    expect(svg).not.toContain('<7>');
    expect(svg).not.toContain('& "');
    const els = await elements(svg);
    expect(els[0].attrs['aria-label']).toBe('Na+ <&> "QC"');
    expect(byClass(els, 'series')[0].attrs['data-material']).toBe(name);
    const legend = byClass(els, 'legend-entry').find((e) => e.attrs['data-material'] === name) as El;
    expect(els.find((e) => e.parent === legend && e.name === 'text')?.text).toBe(name);
    expect(escapeXml('<&>"\'')).toBe('&lt;&amp;&gt;&quot;&#39;');
  });

  test(`results beyond ±${Z_EDGE} SD are drawn on the edge and marked`, async () => {
    const series: ChartSeries[] = [
      {
        name: 'A',
        points: [
          { index: 1, z: 6.2, flags: '1-3s' },
          { index: 2, z: 4.4, flags: '1-3s' },
          { index: 3, z: -9, flags: '1-3s' },
          { index: 4, z: Z_EDGE, flags: '1-3s' },
        ],
      },
    ];
    const els = await elements(controlChartSvg({ title: 'edge', series }));
    const frame = byClass(els, 'frame')[0];
    const top = Number(frame.attrs.y);
    const bottom = top + Number(frame.attrs.height);
    const points = byClass(els, 'point');
    const yOfLine = byClass(els, 'series')[0]
      .attrs.d.split(/[ML]/)
      .filter(Boolean)
      .map((xy) => Number(xy.split(' ')[1]));
    expect(points.map((p) => p.attrs['data-clamped'] ?? '')).toEqual(['up', '', 'down', '']);
    expect(Number(points[0].attrs['data-z'])).toBe(6.2);
    expect(yOfLine[0]).toBeCloseTo(top, 2);
    expect(yOfLine[2]).toBeCloseTo(bottom, 2);
    expect(yOfLine[3]).toBeCloseTo(top, 2);
    expect(yOfLine[1]).toBeGreaterThan(top + 1);
    expect(byClass(els, 'clamp').map((c) => c.attrs['data-clamped'])).toEqual(['up', 'down']);
    expect(byClass(els, 'legend-entry').some((e) => e.attrs['data-key'] === 'clamp')).toBe(true);
  });

  test('the SD lines at 0, ±1, ±2, ±3 with their labels; the 0 line halfway down the plot', async () => {
    const els = await elements(controlChartSvg({ title: 'lines', series: SERIES }));
    const lines = byClass(els, 'sd-line');
    expect(lines.map((l) => Number(l.attrs['data-sd']))).toEqual([3, 2, 1, 0, -1, -2, -3]);
    expect(byClass(els, 'sd-label').map((l) => l.text)).toEqual(['+3 SD', '+2 SD', '+1 SD', '0', '−1 SD', '−2 SD', '−3 SD']);
    const frame = byClass(els, 'frame')[0];
    const mid = Number(frame.attrs.y) + Number(frame.attrs.height) / 2;
    expect(Number(lines[3].attrs.y1)).toBeCloseTo(mid, 1);
    // ±3 SD at 3/4.5 of the half-height from the middle.
    expect(Number(lines[0].attrs.y1)).toBeCloseTo(mid - (3 / Z_EDGE) * (Number(frame.attrs.height) / 2), 1);
  });

  test('coordinates have two decimals; every drawn coordinate lies inside the drawing', async () => {
    const svg = controlChartSvg({ title: 'fixed', series: SERIES, width: 300 });
    const els = await elements(svg);
    const width = Number(els[0].attrs.width);
    const height = Number(els[0].attrs.height);
    for (const e of els) {
      for (const a of ['x', 'y', 'x1', 'y1', 'x2', 'y2', 'cx', 'cy', 'r']) {
        if (e.attrs[a] === undefined || e.name === 'svg') continue;
        expect(e.attrs[a]).toMatch(/^-?\d+\.\d{2}$/);
      }
      if (e.attrs.d) {
        for (const num of e.attrs.d.match(/-?[\d.]+/g) ?? []) {
          if (/^[01]$/.test(num)) continue; // arc flags
          expect(num).toMatch(/^-?\d+\.\d{2}$/);
        }
      }
      for (const a of ['x', 'x1', 'x2', 'cx']) if (e.attrs[a] !== undefined) expect(Number(e.attrs[a])).toBeLessThanOrEqual(width);
      for (const a of ['y', 'y1', 'y2', 'cy']) if (e.attrs[a] !== undefined) expect(Number(e.attrs[a])).toBeLessThanOrEqual(height);
    }
  });

  test('distinct marker shapes for six materials, so colour is not the only cue', async () => {
    const series: ChartSeries[] = Array.from({ length: 6 }, (_v, k) => ({ name: `M${k}`, points: [{ index: k, z: k / 3, flags: '' }] }));
    const els = await elements(controlChartSvg({ title: 'shapes', series }));
    const shapes = byClass(els, 'point').map((p) => (p.attrs.d.match(/[A-Za-z]/g) ?? []).join(''));
    expect(new Set(shapes).size).toBe(6);
  });

  test('long names and titles are cut by characters, with "…"', async () => {
    const long = 'A very long control material name, lot 123456';
    const els = await elements(controlChartSvg({ title: 'T'.repeat(200), series: [{ name: long, points: [{ index: 1, z: 0, flags: '' }] }] }));
    const title = byClass(els, 'title')[0].text;
    expect(title.endsWith('…')).toBe(true);
    expect(Array.from(title).length).toBeLessThan(60);
    const legend = byClass(els, 'legend-entry')[0];
    const text = els.find((e) => e.parent === legend && e.name === 'text')?.text ?? '';
    expect(text).toBe(cut(long, 16));
    expect(text).toBe('A very long con…');
    // The full name stays in the data attribute and the description.
    expect(legend.attrs['data-material']).toBe(long);
    expect(cut('abc', 3)).toBe('abc');
    expect(cut('abcd', 3)).toBe('ab…');
  });

  test('no results: an empty frame that says so', async () => {
    const els = await elements(controlChartSvg({ title: 'none', series: [] }));
    expect(byClass(els, 'empty')[0].text).toBe('No control results');
    expect(byClass(els, 'point')).toHaveLength(0);
  });

  test('bad input: width outside 200–4000 px, z not finite', () => {
    expect(() => controlChartSvg({ title: 't', series: SERIES, width: 100 })).toThrow(RangeError);
    expect(() => controlChartSvg({ title: 't', series: SERIES, width: NaN })).toThrow(RangeError);
    expect(() => controlChartSvg({ title: 't', series: [{ name: 'a', points: [{ index: 1, z: NaN, flags: '' }] }] })).toThrow(/z and index must be finite/);
  });

  test('from an evaluation of control results: one series per material, positions in run order', async () => {
    const ev = evaluateControls({
      values: [0, 2.1, 'x', 2.3, -0.4, 0.2],
      target: [0, 0, 0, 0, 0, 0],
      sd: [1, 1, 1, 1, 1, 1],
      rule: parseRule('2-2s'),
      runs: ['d1', 'd2', 'd2', 'd1', 'd2', 'd3'],
      levels: ['L1', 'L1', 'L2', 'L2', 'L2', 'L1'],
    });
    const series = chartSeries(ev);
    // Run order: d1 (rows 1, 4), d2 (rows 2, 5), d3 (row 6).
    expect(series).toEqual([
      {
        name: 'L1',
        points: [
          { index: 1, z: 0, flags: '', label: 'run d1' },
          { index: 3, z: 2.1, flags: '2-2s', label: 'run d2' },
          { index: 5, z: 0.2, flags: '', label: 'run d3' },
        ],
      },
      {
        name: 'L2',
        points: [
          { index: 2, z: 2.3, flags: '', label: 'run d1' },
          { index: 4, z: -0.4, flags: '', label: 'run d2' },
        ],
      },
    ]);
    const els = await elements(controlChartSvg({ title: 'from data', series }));
    expect(byClass(els, 'series')).toHaveLength(2);
  });
});

describe('the charts layer', () => {
  // The chart is shared by the browser task pane and the command line: no DOM, no Node, and
  // imports from the engine only.
  test('imports nothing but the engine, and touches no DOM or Node globals', () => {
    const dir = join(__dirname, '..', '..', 'src', 'charts');
    for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts'))) {
      const text = readFileSync(join(dir, file), 'utf8');
      const imports = [...text.matchAll(/from '([^']+)'/g)].map((m) => m[1]);
      for (const i of imports) expect(i).toMatch(/^(\.\.\/engine\/|\.\/)/);
      expect(text).not.toMatch(/\b(document|window|require|process|Buffer)\b[.(]/);
    }
  });
});
