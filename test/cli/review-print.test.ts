/**
 * The review workbook printed through LibreOffice (PDF) and read back with poppler: one page wide,
 * page header and footer on every page, the caution and one sign-off per sheet, every cell's text
 * whole and no text running into another. Pictures of the pages are left in out/print/ to be
 * looked at. Skipped, saying so, when soffice is not installed. Layout facts are common
 * practice, no source.
 */
import * as fs from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { leeway, tempDir } from './support';
import { expectEveryCellWhole, findSoffice, overlappingWords, pageSizes, pageTexts, pdfWords, pictures, toPdf } from './render';
import type { Word } from './render';
import { VERSION } from '../../src/engine/version';
import { SIGN_OFF_ROLES, SIGN_OFF_TITLE } from '../../src/cli/document';

const DATE = '2026-02-03';
const OUT = path.join(__dirname, '..', '..', 'out', 'print');
const SOFFICE = findSoffice();
const A4 = { width: 595.28, height: 841.89 };

/** A small period: two analytes, two materials, 20 daily runs, one 1-3s and one 2-2s planted. */
function resultsCsv(): string {
  const lines = ['analyte,level,run,date,value,target,sd,lot'];
  for (const analyte of ['Arvelin', 'Brontase']) {
    for (let k = 1; k <= 20; k++) {
      const date = `2025-04-${String(k).padStart(2, '0')}`;
      let z1 = Math.sin(k * 1.7) * 0.9;
      let z2 = Math.cos(k * 1.3) * 0.8;
      if (analyte === 'Arvelin' && k === 7) z1 = 3.4;
      if (analyte === 'Brontase' && k === 12) [z1, z2] = [-2.3, -2.6];
      lines.push(`${analyte},Level 1,${analyte.slice(0, 3)}-${k},${date},${(5 + 0.1 * z1).toFixed(3)},5,0.1,DEMO-L1`);
      lines.push(`${analyte},Level 2,${analyte.slice(0, 3)}-${k},${date},${(12 + 0.25 * z2).toFixed(3)},12,0.25,DEMO-L2`);
    }
  }
  return lines.join('\n') + '\n';
}


const describeIf = SOFFICE ? describe : describe.skip;
if (!SOFFICE) console.log('SKIPPED: soffice (LibreOffice) is not installed; the printed review was not checked');

describeIf('printed through LibreOffice: leeway review', () => {
  let wb: ExcelJS.Workbook;
  let pages: string[];
  let words: Word[];
  let sizes: { width: number; height: number }[];

  beforeAll(async () => {
    const dir = tempDir('review-print');
    const results = path.join(dir, 'results.csv');
    fs.writeFileSync(results, resultsCsv());
    const file = path.join(dir, 'review-print.xlsx');
    const r = await leeway('review', '--results', results, '--out', file, '--date', DATE);
    expect(r.code).toBe(0);
    wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(file);
    const pdf = toPdf(SOFFICE, file, OUT, path.join(tempDir('lo'), 'profile'));
    for (const old of fs.readdirSync(OUT).filter((f) => f.startsWith('review-print-') && f.endsWith('.png'))) fs.rmSync(path.join(OUT, old));
    pictures(pdf, path.join(OUT, 'review-print'), 60);
    pages = pageTexts(pdf);
    words = pdfWords(pdf);
    sizes = pageSizes(pdf);
  }, 300000);

  const sheetOf = (page: string): string | undefined => /Leeway control review — (.+?)(\s{2,}|\n)/.exec(page)?.[1].trim();

  test('A4 pages, every one inside the right margin; every sheet printed', () => {
    for (const s of sizes) {
      const portrait = Math.abs(s.width - A4.width) < 1 && Math.abs(s.height - A4.height) < 1;
      const landscape = Math.abs(s.width - A4.height) < 1 && Math.abs(s.height - A4.width) < 1;
      expect(portrait || landscape).toBe(true);
    }
    for (const w of words) expect(w.xMax).toBeLessThanOrEqual(sizes[w.page - 1].width - 0.5 * 72 + 1);
    expect(new Set(pages.map(sheetOf))).toEqual(new Set(wb.worksheets.map((w) => w.name)));
  });

  test('page header and footer on every page', () => {
    pages.forEach((text, i) => {
      const flat = text.replace(/\s+/g, ' ');
      expect(sheetOf(text)).toBeDefined();
      expect(flat).toContain(`Page ${i + 1} of ${pages.length}`);
      expect(flat).toContain(DATE);
      expect(flat).toContain(`Leeway ${VERSION}`);
    });
  });

  test('the caution on every sheet and one whole sign-off per sheet', () => {
    for (const ws of wb.worksheets) {
      const own = pages.filter((p) => sheetOf(p) === ws.name).join('\n').replace(/\s+/g, ' ');
      expect(own).toContain('These figures support, and do not replace, the judgement of the');
      expect(own).toContain('laboratory director');
    }
    const withTitle = pages.filter((p) => new RegExp(`^\\s*${SIGN_OFF_TITLE}\\s*$`, 'm').test(p));
    expect(withTitle).toHaveLength(wb.worksheets.length);
    for (const p of withTitle) for (const role of SIGN_OFF_ROLES) expect(p).toContain(role);
  });

  test('nothing is cut and no text runs into another; the flags and figures print', () => {
    expectEveryCellWhole(wb, words);
    // No error mark of any kind on the printed review (#NAME?, #N/A, …), not only ####.
    expect(words.filter((w) => /^#/.test(w.text))).toEqual([]);
    expect(overlappingWords(words)).toEqual([]);
    const printed = words.map((w) => w.text);
    expect(printed).toEqual(expect.arrayContaining(['1-3s', '2-2s']));
  });
});
