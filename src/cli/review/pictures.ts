/**
 * The control charts of a review as PNG pictures, rendered on Node's worker threads while the
 * sheets are written (resvg's renderAsync), with the same renderer settings as svgToPng in
 * ../picture.ts: scale 1 (the picture is shown at three quarters of its pixel width), a white
 * background and the fonts of rendererFonts (Liberation Sans preferred).
 */
import type ResvgModule from '@resvg/resvg-js';
import { controlChartSvg } from '../../charts/controlChart';
import { rendererFonts } from '../picture';
import type { ChartPoint } from '../../charts/controlChart';

/** The chart's drawing width in pixels, and its width on the sheet (fits a portrait page at 100 %). */
export const CHART_WIDTH = 640;
export const CHART_SHOWN_WIDTH = 480;

export interface ChartPicture {
  readonly png: Buffer;
  /** Size on the sheet, pixels. */
  readonly width: number;
  readonly height: number;
}

/** The drawing's height in pixels, as the SVG states it. */
function svgHeight(svg: string): number {
  const m = /<svg[^>]*\bheight="([\d.]+)"/.exec(svg);
  if (!m) throw new Error('the chart has no height');
  return Number(m[1]);
}

/** Starts rendering a chart; the picture's size on the sheet is known at once. */
export function renderChart(title: string, name: string, points: readonly ChartPoint[]): { width: number; height: number; png: Promise<Buffer> } {
  const svg = controlChartSvg({ title, series: [{ name, points }], width: CHART_WIDTH });
  const height = Math.round((svgHeight(svg) * CHART_SHOWN_WIDTH) / CHART_WIDTH);
  // Loaded on first use, so commands that draw nothing start without the renderer.
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const { renderAsync } = require('@resvg/resvg-js') as typeof ResvgModule;
  const png = renderAsync(svg, {
    fitTo: { mode: 'zoom', value: 1 },
    background: 'white',
    font: rendererFonts(svg),
  }).then((r) => r.asPng());
  return { width: CHART_SHOWN_WIDTH, height, png };
}
