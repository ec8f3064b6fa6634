/**
 * The chart of a material with many results: at most MAX_CHART_POINTS drawn, every flagged result
 * among them, in the material's own run order; and the chart placed on the sheet as a PNG.
 */
import { parseResultsText, acceptResults } from '../../src/engine/import';
import { reviewAnalyte, analyteBlock } from '../../src/cli/review/model';
import { materialPoints, MAX_CHART_POINTS, startChart } from '../../src/cli/review/materialSheet';
import { CHART_SHOWN_WIDTH } from '../../src/cli/review/pictures';
import { pngSize } from '../../src/cli/picture';
import { mulberry32 } from '../support/prng';
import { normalDeviates } from '../../src/engine/demo/random';

/** 1,500 daily results of one material (seed 7), a 1-3s planted every 97th result. */
function manyResults(): string {
  const z = normalDeviates(mulberry32(7));
  const lines = ['analyte,level,run,value,target,sd'];
  for (let k = 1; k <= 1500; k++) {
    const v = k % 97 === 0 ? 3.6 : Math.max(-2.5, Math.min(2.5, z()));
    lines.push(`ALPHA,L1,r${k},${(100 + 2 * v).toFixed(2)},100,2`);
  }
  return lines.join('\n') + '\n';
}

describe('the chart of a material with many results', () => {
  const file = acceptResults(parseResultsText(manyResults()));
  const a = reviewAnalyte(file.analytes[0], analyteBlock(file.analytes[0]), { file, tier: 'desirable', rule: '1-3s' });
  const m = a.materials[0];

  test('draws at most the limit, every flagged result included, indexes in run order', () => {
    const { points, total } = materialPoints(a, m);
    expect(total).toBe(1500);
    expect(points.length).toBeLessThanOrEqual(MAX_CHART_POINTS);
    const flagged = m.flags.map((f, i) => (f === '' ? -1 : i + 1)).filter((i) => i > 0);
    expect(flagged.length).toBe(15);
    expect(points.filter((p) => p.flags !== '').map((p) => p.index)).toEqual(flagged);
    for (let i = 1; i < points.length; i++) expect(points[i].index).toBeGreaterThan(points[i - 1].index);
  });

  test('renders to a PNG whose size on the sheet keeps the drawing\'s proportions', async () => {
    const chart = startChart(a, m);
    const png = await chart.png;
    const size = pngSize(png);
    expect(chart.width).toBe(CHART_SHOWN_WIDTH);
    expect(Math.abs(chart.height / chart.width - size.height / size.width)).toBeLessThan(0.01);
    expect(chart.shown).toBeLessThanOrEqual(MAX_CHART_POINTS);
  });
});
