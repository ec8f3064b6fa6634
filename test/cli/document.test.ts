/**
 * The document-sheet layer, read back with exceljs from what `leeway fill` and `leeway demo`
 * write: page set-up, page header and footer, the repeated header row, the sign-off block, the
 * caution, number formats that show what was typed, and widths. Page layout facts (A4 is
 * paper code 9 and Letter 1 in the file format, margins, fit to one page wide) are common
 * practice, no source; the header/footer codes &P, &N, &L, &C, &R and "&&" for a literal
 * ampersand are the spreadsheet file format's (ECMA-376 Part 1, headerFooter, from memory).
 */
import * as fs from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { leeway, tempDir, TABLES } from './support';
import { CAUTION, DEMO_MARKER, TITLE } from '../../src/engine/fill';
import { VERSION } from '../../src/engine/version';
import { DocumentSheet, SET_IN, tableBodyOf, SIGN_OFF_FIELDS, SIGN_OFF_ROLES, SIGN_OFF_TITLE, chooseOrientation, headerFooterStrings, printable, shownText, signOffGroups, wrappedLines } from '../../src/cli/document';
import { newWorkbook } from '../../src/cli/files';
import type { BodyValue } from '../../src/cli/document';

const PRINT = path.join(TABLES, 'print.csv');
const DATE = '2026-02-03';

async function read(file: string): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  return wb;
}

/** Row of the first cell in column A holding `text`. */
function rowOf(ws: ExcelJS.Worksheet, text: string, col = 1): number {
  let found = 0;
  ws.eachRow((row, r) => {
    if (!found && row.getCell(col).value === text) found = r;
  });
  if (!found) throw new Error(`no "${text}" in column ${col} of ${ws.name}`);
  return found;
}

/** The sign-off block: its title, the three roles below the captions, each with ruled lines. */
function expectSignOff(ws: ExcelJS.Worksheet, lastCol: number): void {
  const top = rowOf(ws, SIGN_OFF_TITLE);
  const captions = ws.getRow(top + 1);
  const found: string[] = [];
  captions.eachCell((c) => typeof c.value === 'string' && found.push(c.value));
  expect(found).toEqual([...SIGN_OFF_FIELDS]);
  SIGN_OFF_ROLES.forEach((role, k) => {
    const r = top + 2 + k;
    expect(ws.getCell(r, 1).value).toBe(role);
    for (let c = 2; c <= lastCol; c++) expect(ws.getCell(r, c).border?.bottom?.style).toBe('thin');
    expect(ws.getRow(r).height).toBeGreaterThanOrEqual(24);
  });
  // Within the printed width: nothing right of the last printed column.
  const lastPrinted = ws.pageSetup.printArea!.split(':')[1].replace(/\d+$/, '').replace(/\$/g, '');
  expect(ws.getColumn(lastCol).letter).toBe(lastPrinted);
}

describe('leeway fill: the printed document', () => {
  let ws: ExcelJS.Worksheet;
  let headerRow: number;
  beforeAll(async () => {
    const dir = tempDir('doc');
    const out = path.join(dir, 'o.xlsx');
    const r = await leeway('fill', '--table', PRINT, '--out', out, '--date', DATE);
    expect(r.code).toBe(0);
    ws = (await read(out)).worksheets[0];
    headerRow = rowOf(ws, 'Analyte');
  });

  test('page set-up: A4, landscape for a wide sheet, one page wide and as many tall as needed, margins, print area', () => {
    const p = ws.pageSetup;
    expect(p.paperSize).toBe(9);
    expect(p.orientation).toBe('landscape');
    expect(p.fitToPage).toBe(true);
    expect(p.fitToWidth).toBe(1);
    expect(p.fitToHeight).toBe(0);
    expect(p.margins).toMatchObject({ left: 0.5, right: 0.5, top: 0.75, bottom: 0.75, header: 0.3, footer: 0.3 });
    expect(p.printArea).toMatch(/^\$?A\$?1:\$?P\$?\d+$/);
  });

  test('the table’s header row is repeated on every printed page', () => {
    expect(ws.pageSetup.printTitlesRow).toMatch(new RegExp(`^\\$?${headerRow}:\\$?${headerRow}$`));
  });

  test('page header and footer: title, page of pages, the fill date, the program version', () => {
    expect(ws.headerFooter.oddHeader).toBe(`&L${TITLE}`);
    expect(ws.headerFooter.oddFooter).toBe(`&L${DATE}&CPage &P of &N&RLeeway ${VERSION}`);
  });

  test('the sign-off block follows the content, within the printed width', () => {
    const lastCol = ws.getRow(headerRow).cellCount;
    expectSignOff(ws, lastCol);
    expect(rowOf(ws, SIGN_OFF_TITLE)).toBeGreaterThan(rowOf(ws, 'Analyte 67'));
  });

  test('numbers show as they were typed: 14.0 as "0.0", 6.90 and 3.20 as "0.00"; derived figures at --decimals (2)', () => {
    const cvi = ws.getCell(headerRow + 1, 4);
    expect(cvi.value).toBe(14);
    expect(cvi.numFmt).toBe('0.0');
    expect(shownText(cvi)).toBe('14.0');
    expect(ws.getCell(headerRow + 1, 5).numFmt).toBe('0.00');
    expect(shownText(ws.getCell(headerRow + 3, 4))).toBe('3.20');
    expect(ws.getCell(headerRow + 1, 7).numFmt).toBe('0.00');
  });

  test('every column is at least as wide as its widest number, so no number shows as ####', () => {
    // A column-width unit is the width of one digit (common practice, no source): a column of width w holds w digits.
    ws.eachRow((row, r) => {
      if (r <= headerRow) return;
      row.eachCell((c, col) => {
        if (typeof c.value === 'number') expect(ws.getColumn(col).width!).toBeGreaterThanOrEqual(shownText(c).length + 1);
      });
    });
  });

  test('long text (Source, Note) wraps and its row is tall enough for the lines; header texts wrap', () => {
    const source = ws.getCell(headerRow + 1, 15);
    expect(ws.getCell(headerRow, 15).value).toBe('Source');
    expect(source.alignment?.wrapText).toBe(true);
    expect(ws.getCell(headerRow + 2, 16).alignment?.wrapText).toBe(true);
    // The long source is 110 characters: at most WRAP_WIDTH (36) a line, it needs at least 3 lines of 15 points.
    expect(String(source.value).length).toBe(110);
    expect(ws.getRow(headerRow + 1).height).toBeGreaterThanOrEqual(45);
    for (let c = 1; c <= 16; c++) expect(ws.getCell(headerRow, c).alignment?.wrapText).toBe(true);
  });

  test('the caution is on the sheet once, whole', () => {
    const texts: string[] = [];
    ws.eachRow((row) => row.eachCell((c) => typeof c.value === 'string' && CAUTION.includes(c.value) && c.value.length > 20 && texts.push(c.value)));
    expect(texts.join(' ')).toBe(CAUTION);
  });

  test('the provenance block names the table file by its SHA-256 and row count', () => {
    const sha = require('crypto').createHash('sha256').update(fs.readFileSync(PRINT)).digest('hex') as string;
    expect(ws.getCell(rowOf(ws, 'Table SHA-256'), 2).value).toBe(sha);
    expect(ws.getCell(rowOf(ws, 'Table rows'), 2).value).toBe('70 in the table; 70 filled here');
  });

  test('--paper Letter sets paper code 1; an unknown paper is a usage error', async () => {
    const dir = tempDir('letter');
    const out = path.join(dir, 'l.xlsx');
    expect((await leeway('fill', '--table', PRINT, '--out', out, '--date', DATE, '--paper', 'letter')).code).toBe(0);
    expect((await read(out)).worksheets[0].pageSetup.paperSize).toBe(1);
    const bad = await leeway('fill', '--table', PRINT, '--out', path.join(dir, 'x.xlsx'), '--paper', 'A3');
    expect(bad.code).toBe(2);
    expect(bad.err[0]).toMatch(/--paper must be A4 or Letter/);
  });
});

describe('leeway demo: every sheet is a printed document', () => {
  let wb: ExcelJS.Workbook;
  beforeAll(async () => {
    const dir = tempDir('demodoc');
    const out = path.join(dir, 'd.xlsx');
    expect((await leeway('demo', '--out', out, '--date', DATE)).code).toBe(0);
    wb = await read(out);
  });

  test('page set-up, demo marker in the page header, footer, repeated header row and sign-off on each of the ten sheets', () => {
    expect(wb.worksheets).toHaveLength(10);
    for (const ws of wb.worksheets) {
      expect(ws.pageSetup).toMatchObject({ paperSize: 9, fitToPage: true, fitToWidth: 1, fitToHeight: 0 });
      expect(ws.headerFooter.oddHeader).toBe(`&LLeeway demo — ${ws.name}&R${DEMO_MARKER}`);
      expect(ws.headerFooter.oddFooter).toBe(`&L${DATE}&CPage &P of &N&RLeeway ${VERSION}`);
      if (ws.name === 'Verification') {
        // Four different tables, each starting a page of its own: no header repeated above another table's rows.
        expect(ws.pageSetup.printTitlesRow).toBeUndefined();
      } else {
        const title = Number(/^\$?(\d+):/.exec(ws.pageSetup.printTitlesRow!)![1]);
        expect(ws.getCell(title, 1).value).toBe('Analyte');
        expect(ws.getCell(title, 1).font?.bold).toBe(true);
      }
      expectSignOff(ws, Number(ws.getColumn(ws.pageSetup.printArea!.split(':')[1].replace(/[\d$]/g, '')).number));
    }
  });

  test('sheets with raw data repeat the raw data’s header row, the long table; the EQA sheet its rounds table’s', () => {
    const titleOf = (ws: ExcelJS.Worksheet) => Number(/^\$?(\d+):/.exec(ws.pageSetup.printTitlesRow!)![1]);
    for (const name of ['Replication', 'Comparison']) {
      const ws = wb.getWorksheet(name)!;
      expect(ws.getCell(titleOf(ws) - 1, 1).value).toBe('Raw data (invented)');
    }
    const eqa = wb.getWorksheet('EQA')!;
    expect(eqa.getCell(titleOf(eqa) - 1, 1).value).toBe('Rounds');
    expect([1, 2].map((c) => eqa.getCell(titleOf(eqa), c).value)).toEqual(['Analyte', 'Round']);
  });

  test('each results row’s formula points at its own analyte’s raw data rows (the layout moved them)', () => {
    for (const [name, col] of [['Replication', 11], ['Comparison', 11]] as const) {
      const ws = wb.getWorksheet(name)!;
      const top = rowOf(ws, 'Analyte') + 1;
      let rows = 0;
      for (let r = top; typeof ws.getCell(r, 1).value === 'string'; r++) {
        rows++;
        const m = /\(([A-Z])(\d+):[A-Z](\d+),/.exec(String(ws.getCell(r, col).value))!;
        const [first, last] = [Number(m[2]), Number(m[3])];
        for (let k = first; k <= last; k++) expect(ws.getCell(k, 1).value).toBe(ws.getCell(r, 1).value);
        expect(ws.getCell(first - 1, 1).value).not.toBe(ws.getCell(r, 1).value);
        expect(ws.getCell(last + 1, 1).value).not.toBe(ws.getCell(r, 1).value);
        expect(typeof ws.getCell(first, m[1].charCodeAt(0) - 64).value).toBe('number');
      }
      expect(rows).toBe(12);
    }
  });

  test('the demo table’s CVs show one decimal (24.0, 58.0)', () => {
    const ws = wb.getWorksheet('Specifications')!;
    const r = rowOf(ws, 'Hexolane');
    expect(shownText(ws.getCell(r, 4))).toBe('24.0');
    expect(shownText(ws.getCell(rowOf(ws, 'Galvorin'), 5))).toBe('58.0');
  });
});

describe('the layer’s parts', () => {
  test('header and footer codes: an ampersand in a title is doubled', () => {
    expect(headerFooterStrings({ title: 'QC & EQA', demo: false, date: DATE, program: 'Leeway 1' })).toEqual({ header: '&LQC && EQA', footer: `&L${DATE}&CPage &P of &N&RLeeway 1` });
  });

  test('a demo title too long to sit beside the demo marker puts the marker on a second line', () => {
    const t = { title: 'x'.repeat(60), demo: true, date: DATE, program: 'Leeway 1' };
    expect(headerFooterStrings(t, 200).header).toBe(`&L${'x'.repeat(60)}&R${DEMO_MARKER}`);
    expect(headerFooterStrings(t, 90).header).toBe(`&L${'x'.repeat(60)}\n${DEMO_MARKER}`);
  });

  test('orientation: portrait while the sheet fits the portrait width at 85 % or more, else landscape', () => {
    // A4 is 595.28 × 841.89 points (ISO 216, 210 × 297 mm); margins 0.5 inch left and right.
    expect(printable('A4', 'portrait').width).toBeCloseTo(595.28 - 72, 6);
    expect(chooseOrientation(400, 'A4')).toBe('portrait');
    expect(chooseOrientation(523.28 / 0.85 - 1, 'A4')).toBe('portrait');
    expect(chooseOrientation(523.28 / 0.85 + 1, 'A4')).toBe('landscape');
  });

  test('sign-off lines: columns 2… split into three groups covering them all, in order', () => {
    const widths = [0, 20, 10, 10, 10, 10, 10, 10, 10, 10, 10, 10];
    const g = signOffGroups(widths, 11);
    expect(g[0][0]).toBe(2);
    expect(g[2][1]).toBe(11);
    expect(g[1][0]).toBe(g[0][1] + 1);
    expect(g[2][0]).toBe(g[1][1] + 1);
    expect(signOffGroups([0, 10, 5, 5, 5], 4)).toEqual([[2, 2], [3, 3], [4, 4]]);
  });

  test('wrapped lines: words stay whole; a word longer than the line is broken', () => {
    expect(wrappedLines('Analyte', 20)).toBe(1);
    expect(wrappedLines('aaaa aaaa', 6)).toBe(2);
    expect(wrappedLines('0000000000', 6)).toBe(3);
    expect(wrappedLines('one\ntwo', 30)).toBe(2);
  });

  test('a narrow sheet goes portrait and is widened to 80 units for the sign-off; the layer adds the caution when the sheet lacks it; finishing twice is refused', () => {
    const wb = newWorkbook();
    const doc = new DocumentSheet(wb.addWorksheet('EQA'), { title: 'EQA round', demo: false, date: DATE });
    doc.title('EQA round');
    doc.header(['Sample', 'Result', 'z']);
    doc.line(['S1', 5.2, 0.4], { formats: [undefined, '0.0', '0.00'] });
    const layout = doc.finish();
    expect(layout.orientation).toBe('portrait');
    expect(layout.lastCol).toBeGreaterThan(4);
    expect(layout.widths.reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(80);
    expect(layout.widths.slice(1, 3).every((w) => w < 12)).toBe(true); // the table's own columns keep their widths
    const texts: string[] = [];
    doc.ws.eachRow((row) => row.eachCell((c) => typeof c.value === 'string' && CAUTION.includes(c.value) && c.value.length > 20 && texts.push(c.value)));
    expect(texts.join(' ')).toBe(CAUTION);
    expect(doc.ws.pageSetup.printTitlesRow).toMatch(/^\$?2:\$?2$/);
    expect(() => doc.finish()).toThrow(/already finished/);
  });

  test('a table body (plain rows) is measured, paged and styled as the same rows written as cells', () => {
    const note = 'a long note that runs on and on past the widest a column may be before it wraps, so its column wraps and its rows grow';
    const formats = [undefined, '0.00', '0.000', undefined, undefined];
    const rows: BodyValue[][] = [
      ['=R1', 1.5, { formula: '(B5-1)/2', result: 0.25 }, 'short', true],
      ['R2', -12.345, { sharedFormula: 'C5', result: 0 }, note, { error: '#N/A' }],
      ['R3', null, { sharedFormula: 'C5', result: '1-3s' }, '', false],
      ['R4', 1234567.891, { sharedFormula: 'C5', result: { error: '#DIV/0!' } }, `${note} ${note}`, null],
    ];
    const build = (asBody: boolean): { doc: DocumentSheet; layout: ReturnType<DocumentSheet['finish']> } => {
      const doc = new DocumentSheet(newWorkbook().addWorksheet('T'), { title: 'Table', demo: false, date: DATE });
      doc.title('Table');
      doc.header(['Run', 'Value', 'z', 'Note', 'Seen']);
      for (const values of rows) {
        if (asBody) {
          doc.bodyLine(values, { formats });
          continue;
        }
        // As cells: plain values through line(), formulas as the review's sheets write them.
        const r = doc.line(values.map((v) => (typeof v === 'object' && v !== null && !('error' in v) ? null : (v as string | number | boolean | null | { error: string }))), { formats });
        values.forEach((v, i) => {
          if (!(typeof v === 'object' && v !== null && ('formula' in v || 'sharedFormula' in v))) return;
          const cell = doc.ws.getCell(r, i + 1);
          cell.value = ('formula' in v ? { formula: v.formula, result: v.result } : { sharedFormula: v.sharedFormula, result: v.result }) as ExcelJS.CellValue;
          if (typeof v.result === 'number' && formats[i]) cell.numFmt = formats[i] as string;
          if (typeof v.result === 'string') cell.alignment = SET_IN;
        });
      }
      return { doc, layout: doc.finish() };
    };
    const cells = build(false);
    const body = build(true);
    expect(body.layout).toEqual(cells.layout);
    expect(cells.layout.widths[3]).toBeGreaterThan(40); // the note column wrapped at its widest
    const table = tableBodyOf(body.doc.ws)!;
    expect(tableBodyOf(cells.doc.ws)).toBeUndefined();
    expect([...table.rows.keys()]).toHaveLength(rows.length);
    for (const [r, row] of table.rows) {
      expect(row.height).toBe(cells.doc.ws.getRow(r).height);
      expect(body.doc.ws.findRow(r)).toBeUndefined(); // no exceljs row: the body holds it
      rows[0].forEach((_v, i) => {
        const cell = cells.doc.ws.getCell(r, i + 1);
        const style = table.style(row, i + 1);
        if (row.values[i] === null) return expect(style).toBeUndefined();
        expect({ numFmt: style?.numFmt, alignment: style?.alignment }).toEqual({ numFmt: cell.numFmt, alignment: cell.alignment });
      });
    }
    // Rows of several lines read from the top, as cells of such rows do.
    expect(Math.max(...[...table.rows.values()].map((row) => row.height))).toBeGreaterThan(15);
  });
});
