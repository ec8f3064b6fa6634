/**
 * The filled workbook and the demo printed through LibreOffice headless (PDF), read back with
 * poppler (pdfinfo, pdftotext, pdftoppm): one page wide on every page, the header row repeated,
 * page header and footer, the sign-off on one page, every cell's text whole, and no text running
 * into another. Pictures of the pages are kept in out/print/ to be looked at. Skipped, saying so,
 * when soffice is not installed. Layout facts are common practice, no source; A4 is 595.28 ×
 * 841.89 points (ISO 216: 210 × 297 mm).
 */
import * as fs from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { leeway, tempDir, TABLES } from './support';
import { expectEveryCellWhole, findSoffice, overlappingWords, pageSizes, pageTexts, pdfImages, pdfWords, pictures, toPdf } from './render';
import type { Word } from './render';
import { DEMO_MARKER, TITLE } from '../../src/engine/fill';
import { VERSION } from '../../src/engine/version';
import { SIGN_OFF_FIELDS, SIGN_OFF_ROLES, SIGN_OFF_TITLE } from '../../src/cli/document';

const DATE = '2026-02-03';
const OUT = path.join(__dirname, '..', '..', 'out', 'print');
const SOFFICE = findSoffice();
const A4_LANDSCAPE = { width: 841.89, height: 595.28 };

interface Rendered {
  readonly pdf: string;
  readonly wb: ExcelJS.Workbook;
  readonly pages: string[];
  readonly words: Word[];
  readonly sizes: { width: number; height: number }[];
}

async function render(name: string, args: string[], profile: string): Promise<Rendered> {
  const dir = tempDir(`print-${name}`);
  const file = path.join(dir, `${name}.xlsx`);
  const r = await leeway(...args, '--out', file, '--date', DATE);
  expect(r.code).toBe(0);
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  const pdf = toPdf(SOFFICE, file, OUT, profile);
  for (const old of fs.readdirSync(OUT).filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png'))) fs.rmSync(path.join(OUT, old));
  pictures(pdf, path.join(OUT, name), 60);
  return { pdf, wb, pages: pageTexts(pdf), words: pdfWords(pdf), sizes: pageSizes(pdf) };
}


/** Every page: the page header's title, "Page k of N", the date and the program in the footer. */
function expectHeaderFooter(pages: readonly string[], title: (page: number) => string, demo: boolean): void {
  pages.forEach((text, i) => {
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain(title(i));
    expect(flat).toContain(`Page ${i + 1} of ${pages.length}`);
    expect(flat).toContain(DATE);
    expect(flat).toContain(`Leeway ${VERSION}`);
    if (demo) expect(flat).toContain(DEMO_MARKER);
  });
}

/** The sign-off: on one page, title, captions and the three roles together; `count` blocks in all. */
function expectSignOffs(pages: readonly string[], count: number): void {
  const withTitle = pages.filter((p) => new RegExp(`^\\s*${SIGN_OFF_TITLE}\\s*$`, 'm').test(p));
  expect(withTitle).toHaveLength(count);
  for (const p of withTitle) {
    for (const role of SIGN_OFF_ROLES) expect(p).toContain(role);
    const captions = p.split('\n').find((l) => SIGN_OFF_FIELDS.every((f) => l.includes(f)));
    expect(captions).toBeDefined();
  }
}

const describeIf = SOFFICE ? describe : describe.skip;
if (!SOFFICE) console.log('SKIPPED: soffice (LibreOffice) is not installed; the printed-page checks did not run');

describeIf('printed through LibreOffice: leeway fill', () => {
  let long: Rendered;
  let short: Rendered;
  beforeAll(async () => {
    const profile = path.join(tempDir('lo'), 'profile');
    long = await render('fill-print', ['fill', '--table', path.join(TABLES, 'print.csv')], profile);
    short = await render('fill-good', ['fill', '--table', path.join(TABLES, 'good.csv')], profile);
  }, 300000);

  test('A4 landscape; the 3-row table on one page; the 70-row table on several, each holding the full width with the header row', () => {
    for (const s of [...long.sizes, ...short.sizes]) {
      expect(Math.abs(s.width - A4_LANDSCAPE.width)).toBeLessThan(1);
      expect(Math.abs(s.height - A4_LANDSCAPE.height)).toBeLessThan(1);
    }
    expect(short.pages).toHaveLength(1);
    expect(long.pages.length).toBeGreaterThanOrEqual(2);
    // Fit to one page wide: no page holds a part of the width only. Every page carries the first
    // and the last column's header (the header row is repeated) and the right page margin is kept.
    for (const p of long.pages) {
      expect(p).toMatch(/^\s*Analyte\s.*\sNote\s*$/m);
    }
    const rightEdge = A4_LANDSCAPE.width - 0.5 * 72 + 1;
    expect(long.words.filter((w) => w.xMax > rightEdge)).toEqual([]);
  });

  test('every row printed once, in order, and no page without rows or the sign-off', () => {
    const names = ['Arvelin', 'Brontase', 'Calpidine', ...Array.from({ length: 67 }, (_, i) => `Analyte ${String(i + 1).padStart(2, '0')}`)];
    const seen: string[] = [];
    for (const p of long.pages) for (const line of p.split('\n')) {
      const m = /^\s*(Arvelin|Brontase|Calpidine|Analyte \d\d)\s/.exec(line);
      if (m) seen.push(m[1]);
    }
    expect(seen).toEqual(names);
    for (const p of long.pages) expect(/^\s*(Arvelin|Analyte \d\d)\s|Prepared by/m.test(p)).toBe(true);
  });

  test('page header and footer on every page; the sign-off together on the last page', () => {
    expectHeaderFooter(long.pages, () => TITLE, false);
    expectHeaderFooter(short.pages, () => TITLE, false);
    expectSignOffs(long.pages, 1);
    expect(long.pages[long.pages.length - 1]).toContain('Approved by');
  });

  test('nothing is cut: every cell’s text whole, 14.0 printed as 14.0, no text running into another', () => {
    expectEveryCellWhole(long.wb, long.words);
    expectEveryCellWhole(short.wb, short.words);
    const printed = long.words.map((w) => w.text);
    expect(printed).toEqual(expect.arrayContaining(['14.0', '6.90', '3.20']));
    expect(overlappingWords(long.words)).toEqual([]);
    expect(overlappingWords(short.words)).toEqual([]);
    // The wrapped long source stays within its row: its last line is above the next row's analyte.
    const last = long.words.find((w) => w.text === 'read' && w.page === 1)!;
    const next = long.words.find((w) => w.text === 'Brontase' && w.page === 1)!;
    expect(last.yMax).toBeLessThanOrEqual(next.yMin + 0.5);
  });
});

describeIf('printed through LibreOffice: leeway demo', () => {
  let demo: Rendered;
  beforeAll(async () => {
    demo = await render('demo', ['demo'], path.join(tempDir('lo'), 'profile'));
  }, 300000);

  test('each sheet one page wide: every page carries its sheet’s repeated header row, last column included', () => {
    const lastHeader = new Map<string, string>();
    // The Verification sheet repeats no header: its four tables each start a page (checked below).
    const repeating = demo.wb.worksheets.filter((ws) => ws.pageSetup.printTitlesRow !== undefined);
    expect(demo.wb.worksheets.filter((ws) => !repeating.includes(ws)).map((ws) => ws.name)).toEqual(['Verification']);
    for (const ws of repeating) {
      const row = Number(/^\$?(\d+):/.exec(ws.pageSetup.printTitlesRow!)![1]);
      const texts: string[] = [];
      ws.getRow(row).eachCell((c) => typeof c.value === 'string' && texts.push(c.value));
      lastHeader.set(ws.name, texts[texts.length - 1].split(/\s+/)[0]);
    }
    let checked = 0;
    demo.pages.forEach((p) => {
      const sheet = /Leeway demo — ([A-Za-z ]+?)\s{2,}/.exec(p)?.[1].trim();
      expect(sheet !== undefined && (lastHeader.has(sheet) || sheet === 'Verification')).toBe(true);
      if (sheet === 'Verification') return;
      expect(p).toMatch(/^\s*Analyte\s/m);
      expect(p).toContain(lastHeader.get(sheet!)!);
      checked++;
    });
    expect(checked).toBe(demo.pages.filter((p) => !/Leeway demo — Verification\s{2,}/.test(p)).length);
    expect(new Set(demo.pages.map((p) => /Leeway demo — ([A-Za-z ]+?)\s{2,}/.exec(p)![1].trim()))).toEqual(new Set(demo.wb.worksheets.map((w) => w.name)));
  });

  test('page header with the demo marker, footer on every page; one sign-off per sheet', () => {
    expectHeaderFooter(demo.pages, (i) => `Leeway demo — ${/Leeway demo — ([A-Za-z ]+?)\s{2,}/.exec(demo.pages[i])![1].trim()}`, true);
    expectSignOffs(demo.pages, demo.wb.worksheets.length);
    expect(demo.wb.worksheets).toHaveLength(10);
  });

  test('nothing is cut and no text runs into another', () => {
    expectEveryCellWhole(demo.wb, demo.words);
    expect(overlappingWords(demo.words)).toEqual([]);
  });

  test('the verification sheet: the agreement table starts a page with the first two difference plots printed on it, the third on the next page with the sign-off', () => {
    const sheetOf = (p: string): string | undefined => /Leeway demo — ([A-Za-z ]+?)\s{2,}/.exec(p)?.[1].trim();
    const pages = demo.pages.map((p, i) => ({ p, n: i + 1 })).filter(({ p }) => sheetOf(p) === 'Verification');
    expect(pages.length).toBeGreaterThanOrEqual(3);
    const agreement = pages.find(({ p }) => p.includes('Agreement of Analyser B'))!;
    // The table's heading comes straight after the page header (no other table's header repeated above it): a page of its own from there.
    const lines = agreement.p.split('\n').filter((l) => l.trim() !== '');
    const at = lines.findIndex((l) => /^\s*Agreement of Analyser B/.test(l));
    expect(at).toBeGreaterThan(0);
    expect(lines.slice(0, at).some((l) => /^\s*Analyte\s.*Verified\s*$/.test(l))).toBe(false);
    expect(at).toBeLessThanOrEqual(2);
    // The precision table's header is printed once, on the sheet's first page, above its own rows only.
    const precisionHeader = /^\s*Analyte\s+Material\s+Precision\s.*Verified\s*$/m;
    expect(pages.filter(({ p }) => precisionHeader.test(p)).map(({ n }) => n)).toEqual([pages[0].n]);
    const images = pdfImages(demo.pdf).filter((im) => sheetOf(demo.pages[im.page - 1]) === 'Verification');
    // A picture appears once per page it is drawn on (poppler's pdfimages, one "image" row per placement).
    const onPage = (n: number): number => images.filter((im) => im.page === n).length;
    expect(onPage(agreement.n)).toBeGreaterThanOrEqual(2);
    expect(onPage(agreement.n + 1)).toBeGreaterThanOrEqual(1);
    expect(new Set(images.map((im) => im.object)).size).toBe(3);
    expect(demo.pages[agreement.n]).toMatch(/Approved by/);
  });
});
