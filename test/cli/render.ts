/**
 * Rendering a workbook the way a user prints it: LibreOffice headless to PDF, then poppler's
 * pdfinfo, pdftotext and pdftoppm to read the pages back (text, word boxes, pictures).
 */
import * as fs from 'fs';
import * as path from 'path';
import { execFileSync } from 'child_process';
import type ExcelJS from 'exceljs';
import { shownText } from '../../src/cli/document';

/** The LibreOffice program, or '' when it is not installed. */
export function findSoffice(): string {
  try {
    return execFileSync('sh', ['-c', 'command -v soffice || command -v libreoffice'], { encoding: 'utf8' }).trim();
  } catch {
    return '';
  }
}

/** Converts a workbook to PDF in `outDir` (a private LibreOffice profile in `profile`); returns the PDF's path. */
export function toPdf(soffice: string, file: string, outDir: string, profile: string): string {
  fs.mkdirSync(outDir, { recursive: true });
  execFileSync(soffice, ['--headless', `-env:UserInstallation=file://${profile}`, '--convert-to', 'pdf', '--outdir', outDir, file], { stdio: 'pipe', timeout: 180000 });
  const pdf = path.join(outDir, path.basename(file).replace(/\.xlsx$/, '.pdf'));
  if (!fs.existsSync(pdf)) throw new Error(`LibreOffice wrote no ${pdf}`);
  return pdf;
}

export interface PageSize {
  readonly width: number;
  readonly height: number;
}

/** Every page's size in points. */
export function pageSizes(pdf: string): PageSize[] {
  const info = execFileSync('pdfinfo', [pdf], { encoding: 'utf8' });
  const n = Number(/^Pages:\s+(\d+)/m.exec(info)![1]);
  const all = execFileSync('pdfinfo', ['-f', '1', '-l', String(n), pdf], { encoding: 'utf8' });
  return [...all.matchAll(/^Page\s+\d+ size:\s+([\d.]+) x ([\d.]+) pts/gm)].map((m) => ({ width: Number(m[1]), height: Number(m[2]) }));
}

/** The text of each page (pdftotext -layout). */
export function pageTexts(pdf: string): string[] {
  const t = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const pages = t.split('\f');
  if (pages[pages.length - 1].trim() === '') pages.pop();
  return pages;
}

export interface Word {
  readonly page: number;
  readonly xMin: number;
  readonly yMin: number;
  readonly xMax: number;
  readonly yMax: number;
  readonly text: string;
}

const ENTITIES: Record<string, string> = { '&amp;': '&', '&lt;': '<', '&gt;': '>', '&quot;': '"', '&apos;': "'", '&#39;': "'" };

/** Every word with its box (pdftotext -bbox), pages numbered from 1. */
export function pdfWords(pdf: string): Word[] {
  const html = execFileSync('pdftotext', ['-bbox', pdf, '-'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const words: Word[] = [];
  let page = 0;
  for (const m of html.matchAll(/<page [^>]*>|<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)) {
    if (m[0].startsWith('<page')) {
      page++;
      continue;
    }
    const text = m[5].replace(/&(amp|lt|gt|quot|apos|#39);/g, (e) => ENTITIES[e]);
    words.push({ page, xMin: Number(m[1]), yMin: Number(m[2]), xMax: Number(m[3]), yMax: Number(m[4]), text });
  }
  return words;
}

/** Pairs of words on one page whose boxes overlap: text running into its neighbour, or a line cut by the next row. */
export function overlappingWords(words: readonly Word[]): Array<[Word, Word]> {
  const out: Array<[Word, Word]> = [];
  const byPage = new Map<number, Word[]>();
  for (const w of words) byPage.set(w.page, [...(byPage.get(w.page) ?? []), w]);
  for (const list of byPage.values()) {
    const sorted = [...list].sort((a, b) => a.xMin - b.xMin);
    for (let i = 0; i < sorted.length; i++) {
      const a = sorted[i];
      for (let j = i + 1; j < sorted.length && sorted[j].xMin < a.xMax - 0.5; j++) {
        const b = sorted[j];
        const dx = Math.min(a.xMax, b.xMax) - Math.max(a.xMin, b.xMin);
        const dy = Math.min(a.yMax, b.yMax) - Math.max(a.yMin, b.yMin);
        if (dx > 0.5 && dy > 0.3 * Math.min(a.yMax - a.yMin, b.yMax - b.yMin)) out.push([a, b]);
      }
    }
  }
  return out;
}

/** The pictures drawn in a PDF (poppler's pdfimages -list): the page each is drawn on and its object number; masks left out. */
export function pdfImages(pdf: string): Array<{ page: number; object: number }> {
  const list = execFileSync('pdfimages', ['-list', pdf], { encoding: 'utf8' });
  return list
    .split('\n')
    .map((l) => l.trim().split(/\s+/))
    .filter((f) => f[2] === 'image')
    .map((f) => ({ page: Number(f[0]), object: Number(f[10]) }));
}

/** Pictures of the pages, `dpi` dots per inch, as `<prefix>-<page>.png`; returns the files. */
export function pictures(pdf: string, prefix: string, dpi = 60): string[] {
  fs.mkdirSync(path.dirname(prefix), { recursive: true });
  execFileSync('pdftoppm', ['-r', String(dpi), '-png', pdf, prefix], { stdio: 'pipe' });
  const dir = path.dirname(prefix);
  const base = path.basename(prefix);
  return fs.readdirSync(dir).filter((f) => f.startsWith(`${base}-`) && f.endsWith('.png')).sort().map((f) => path.join(dir, f));
}

/**
 * Every word of every cell's shown text is a word of the PDF: nothing is cut or shown as ####.
 * exceljs leaves a cached 0 out of the formula value it reads back; cell.result has it.
 */
export function expectEveryCellWhole(wb: ExcelJS.Workbook, words: readonly Word[]): void {
  const printed = new Set(words.map((w) => w.text));
  const missing: string[] = [];
  for (const ws of wb.worksheets) {
    ws.eachRow((row) =>
      row.eachCell((cell) => {
        const v = cell.value;
        const shown = v && typeof v === 'object' && ('formula' in v || 'sharedFormula' in v) ? shownText({ value: { formula: cell.formula, result: cell.result }, numFmt: cell.numFmt } as unknown as ExcelJS.Cell) : shownText(cell);
        for (const w of shown.split(/\s+/).filter(Boolean)) {
          // A negative number that rounds to zero: LibreOffice prints 0.00 where Excel keeps the sign (common practice, no source).
          const alt = /^-0(\.0+)?$/.test(w) ? w.slice(1) : w;
          if (!printed.has(w) && !printed.has(alt)) missing.push(`${ws.name}!${cell.address}: ${w}`);
        }
      }),
    );
  }
  expect(missing).toEqual([]);
  expect(words.filter((w) => /^#+$/.test(w.text))).toEqual([]);
}
