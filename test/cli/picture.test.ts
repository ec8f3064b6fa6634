import { controlChartSvg } from '../../src/charts/controlChart';
import { Resvg } from '@resvg/resvg-js';
import { pngSize, rendererFonts, svgToPng } from '../../src/cli/picture';

describe('svgToPng', () => {
  // PNG layout (signature, IHDR width/height big-endian at bytes 16–23): W3C PNG specification,
  // 2nd edition, sections 5.2 and 11.2.2.
  test('renders the control chart to a PNG of twice its pixel size', () => {
    const svg = controlChartSvg({
      title: 'Test chart',
      series: [{ name: 'Level 1', points: [0, 1, 2, 3].map((i) => ({ index: i, z: i - 1.5, flags: i === 3 ? '1-3s' : '' })) }],
    });
    const m = /<svg[^>]*\bwidth="([\d.]+)"[^>]*\bheight="([\d.]+)"/.exec(svg) ?? /viewBox="0 0 ([\d.]+) ([\d.]+)"/.exec(svg);
    expect(m).not.toBeNull();
    const png = svgToPng(svg, 2);
    const size = pngSize(png);
    expect(size.width).toBe(Math.round(Number(m![1]) * 2));
    expect(size.height).toBe(Math.round(Number(m![2]) * 2));
  });

  test('text the preferred family draws is rendered with its files alone, pixel for pixel as with every system font; other text gets the system fonts', () => {
    const latin = 'Glucose ± 2 × SD – “run” — 5 … −3 ‘ok’ • café straße';
    const svg = controlChartSvg({ title: latin, series: [{ name: 'Level 1 é', points: [0, 1, 2, 3].map((i) => ({ index: i, z: i - 1.5, flags: i === 3 ? '1-3s' : '' })) }] });
    const fonts = rendererFonts(svg);
    const everyFont = new Resvg(svg, { fitTo: { mode: 'zoom', value: 2 }, background: 'white', font: { loadSystemFonts: true, defaultFontFamily: 'Liberation Sans', sansSerifFamily: 'Liberation Sans' } }).render().asPng();
    if (!fonts.fontFiles) console.log('SKIPPED: Liberation Sans is not installed; pictures are rendered with every system font');
    else {
      expect(fonts.loadSystemFonts).toBe(false);
      expect(Buffer.compare(svgToPng(svg, 2), everyFont)).toBe(0);
    }
    expect(rendererFonts(svg.replace('Glucose', 'Glucose Ωμέγα 血糖')).loadSystemFonts).toBe(true);
  });

  test('refuses a scale outside (0, 8] and bytes that are not a PNG', () => {
    expect(() => svgToPng('<svg xmlns="http://www.w3.org/2000/svg" width="1" height="1"/>', 0)).toThrow(/scale/);
    expect(() => pngSize(new Uint8Array(30))).toThrow(/not a PNG/);
  });
});
