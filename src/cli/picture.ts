/**
 * Pictures for workbooks written by the command line: an SVG drawn by the shared chart code
 * (src/charts) rendered to PNG, so the task pane (inline SVG) and a written workbook show the same
 * drawing.
 *
 * Rendering uses resvg (a Rust SVG renderer with prebuilt binaries, no browser, no network) and the
 * machine's installed fonts. The charts size and cut every text by a generous width per character,
 * so the picture's layout does not depend on which sans-serif font is found; a machine with no
 * font at all still gets the lines and marks.
 */
import { Resvg } from '@resvg/resvg-js';

/** The PNG bytes of an SVG document, rendered `scale` times its own pixel size (2 prints sharply). */
export function svgToPng(svg: string, scale = 2): Buffer {
  if (!(scale > 0 && scale <= 8)) throw new RangeError(`picture scale must be in (0, 8] (got ${scale})`);
  const renderer = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: scale },
    background: 'white',
    font: {
      loadSystemFonts: true,
      defaultFontFamily: 'Liberation Sans',
      sansSerifFamily: 'Liberation Sans',
    },
  });
  return renderer.render().asPng();
}

/** Width and height in pixels of a PNG (from its IHDR chunk). */
export function pngSize(png: Uint8Array): { width: number; height: number } {
  const signature = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  if (png.length < 24 || signature.some((b, i) => png[i] !== b)) throw new RangeError('not a PNG');
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  return { width: view.getUint32(16), height: view.getUint32(20) };
}
