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
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { Resvg } from '@resvg/resvg-js';
import type { ResvgRenderOptions } from '@resvg/resvg-js';

/** The family every picture asks for first. */
const FAMILY = 'Liberation Sans';
const FAMILY_FILES = ['LiberationSans-Regular.ttf', 'LiberationSans-Bold.ttf', 'LiberationSans-Italic.ttf', 'LiberationSans-BoldItalic.ttf'];

/**
 * Text Liberation Sans draws whole: ASCII, Latin-1 and the dashes, quotes, bullet, ellipsis and
 * minus sign the charts use (all in the WGL4 set the family covers; from memory, and checked
 * against the system's fonts in test/cli/picture.test.ts). Text beyond it needs the system's
 * other fonts for their glyphs.
 */
const FAMILY_COVERS = /^[\t\n\r\u0020-\u007e\u00a0-\u00ff\u2013\u2014\u2018-\u201e\u2020-\u2022\u2026\u2212]*$/;

let familyFiles: readonly string[] | null | undefined;

/** The family's font files, found once in the usual font folders (null when it is not installed). */
function findFamilyFiles(): readonly string[] | null {
  if (familyFiles !== undefined) return familyFiles;
  const home = os.homedir();
  const roots = [
    process.env.XDG_DATA_HOME ? path.join(process.env.XDG_DATA_HOME, 'fonts') : path.join(home, '.local', 'share', 'fonts'),
    path.join(home, '.fonts'),
    '/usr/share/fonts',
    '/usr/local/share/fonts',
    '/Library/Fonts',
    path.join(home, 'Library', 'Fonts'),
    ...(process.env.WINDIR ? [path.join(process.env.WINDIR, 'Fonts')] : []),
  ];
  const found = new Map<string, string>();
  const walk = (dir: string, depth: number): void => {
    let entries: fs.Dirent[];
    try {
      entries = fs.readdirSync(dir, { withFileTypes: true });
    } catch {
      return;
    }
    for (const e of entries) {
      if (e.isDirectory() && depth < 4) walk(path.join(dir, e.name), depth + 1);
      else if (FAMILY_FILES.includes(e.name) && !found.has(e.name)) found.set(e.name, path.join(dir, e.name));
    }
  };
  for (const root of roots) walk(root, 0);
  familyFiles = found.has(FAMILY_FILES[0]) ? FAMILY_FILES.filter((f) => found.has(f)).map((f) => found.get(f) as string) : null;
  return familyFiles;
}

/**
 * The fonts a drawing is rendered with. Loading every installed font takes a third of a chart's
 * rendering time, so a drawing whose text the preferred family draws whole gets that family's
 * files alone (found once per run); any other text, or a machine without the family, gets all
 * the system's fonts, so every glyph is found. Either way the same family draws the text.
 */
export function rendererFonts(svg: string): NonNullable<ResvgRenderOptions['font']> {
  const files = FAMILY_COVERS.test(svg) ? findFamilyFiles() : null;
  if (files) return { loadSystemFonts: false, fontFiles: [...files], defaultFontFamily: FAMILY, sansSerifFamily: FAMILY };
  return { loadSystemFonts: true, defaultFontFamily: FAMILY, sansSerifFamily: FAMILY };
}

/** The PNG bytes of an SVG document, rendered `scale` times its own pixel size (2 prints sharply). */
export function svgToPng(svg: string, scale = 2): Buffer {
  if (!(scale > 0 && scale <= 8)) throw new RangeError(`picture scale must be in (0, 8] (got ${scale})`);
  const renderer = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: scale },
    background: 'white',
    font: rendererFonts(svg),
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
