/**
 * The review's package writer (src/cli/review/package.ts) read back by exceljs and JSZip: values,
 * formulas with their cached results (0 and text included), shared formulas, table bodies, styles,
 * merges, page set-up, pictures and sheet order; text kept whole (the characters XML cannot
 * hold written as _xHHHH_, ECMA-376 Part 1, ST_Xstring, from memory); what it does not write is
 * refused rather than dropped.
 */
import * as fs from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import * as zlib from 'zlib';
import JSZip from 'jszip';
import { tempDir } from './support';
import { newWorkbook } from '../../src/cli/files';
import { DocumentSheet } from '../../src/cli/document';
import { WorkbookPackage } from '../../src/cli/review/package';
import { tableCrc32 } from '../../src/cli/review/zip';
import { mulberry32 } from '../support/prng';
import { svgToPng } from '../../src/cli/picture';

const DATE = '2026-02-03';

async function readBack(bytes: Buffer): Promise<{ wb: ExcelJS.Workbook; zip: JSZip }> {
  const file = path.join(tempDir('package'), 'book.xlsx');
  fs.writeFileSync(file, bytes);
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  return { wb, zip: await JSZip.loadAsync(bytes) };
}

/** A finished document sheet in a workbook of its own, as the review builds each sheet. */
function sheet(name: string, fill: (doc: DocumentSheet) => void): ExcelJS.Workbook {
  const wb = newWorkbook();
  const doc = new DocumentSheet(wb.addWorksheet(name), { title: name, demo: false, date: DATE });
  doc.title(name);
  fill(doc);
  doc.finish();
  return wb;
}

describe('the review package writer', () => {
  test('values, cached results, shared formulas, a table body, styles, merges, page set-up and a picture read back as written', async () => {
    const pkg = new WorkbookPackage({ creator: 'Leeway test', title: 'A & B <test>' });
    const png = svgToPng('<svg xmlns="http://www.w3.org/2000/svg" width="40" height="20"><rect width="40" height="20" fill="red"/></svg>', 1);
    // Written out of order: the second tab first, as the review writes its Results sheet.
    pkg.addWorkbook(
      sheet('Second', (doc) => {
        doc.header(['Run', 'Value']);
        doc.bodyLine(['R1', 1]);
      }),
      2,
    );
    const first = sheet('First', (doc) => {
      doc.header(['Label', 'Value', 'z', 'Flag']);
      const r = doc.line(['plain', 2.5, null, 'text "quoted" & <angled>'], { formats: [undefined, '0.000'] });
      doc.ws.getCell(r, 3).value = { formula: 'B5*0', result: 0 };
      doc.put(r + 1, 1, 'logical');
      doc.put(r + 1, 2, true);
      doc.put(r + 2, 1, 'error');
      doc.put(r + 2, 2, { error: '#N/A' });
      doc.skip(2);
      const top = doc.row;
      doc.bodyLine(['A', 1, { formula: `B${top}*2`, result: 2 }, { formula: `IF(B${top}>1,"high","–")`, result: '–' }], { formats: [undefined, undefined, '0.00'] });
      doc.bodyLine(['B', 0, { sharedFormula: `C${top}`, result: 0 }, { sharedFormula: `D${top}`, result: '–' }], { formats: [undefined, undefined, '0.00'] });
      doc.bodyLine(['C', 3, { sharedFormula: `C${top}`, result: 6 }, { sharedFormula: `D${top}`, result: 'high' }], { formats: [undefined, undefined, '0.00'] });
      const id = doc.ws.workbook.addImage({ buffer: png as unknown as ExcelJS.Buffer, extension: 'png' });
      doc.ws.addImage(id, { tl: { col: 1, row: 2 }, ext: { width: 40, height: 20 }, editAs: 'oneCell' });
    });
    pkg.addWorkbook(first, 1);
    const { wb } = await readBack(await pkg.finish());
    expect(wb.worksheets.map((w) => w.name)).toEqual(['First', 'Second']);
    expect(wb.creator).toBe('Leeway test');
    expect(wb.title).toBe('A & B <test>');
    const ws = wb.getWorksheet('First')!;
    const rowOf = (text: string): number => {
      let found = 0;
      ws.eachRow((row, r) => void (!found && row.getCell(1).value === text && (found = r)));
      return found;
    };
    const r = rowOf('plain');
    expect(ws.getCell(r, 2).value).toBe(2.5);
    expect(ws.getCell(r, 2).numFmt).toBe('0.000');
    expect(ws.getCell(r, 3).formula).toBe('B5*0');
    expect(ws.getCell(r, 3).result).toBe(0);
    expect(ws.getCell(r, 4).value).toBe('text "quoted" & <angled>');
    expect(ws.getCell(r, 4).alignment).toEqual({ horizontal: 'left', indent: 1 });
    expect(ws.getCell(rowOf('logical'), 2).value).toBe(true);
    expect(ws.getCell(rowOf('error'), 2).value).toEqual({ error: '#N/A' });
    const top = rowOf('A');
    expect([0, 1, 2].map((k) => ws.getCell(top + k, 3).formula)).toEqual([`B${top}*2`, `B${top + 1}*2`, `B${top + 2}*2`]);
    expect([0, 1, 2].map((k) => ws.getCell(top + k, 3).result)).toEqual([2, 0, 6]);
    expect([0, 1, 2].map((k) => ws.getCell(top + k, 4).result)).toEqual(['–', '–', 'high']);
    expect(ws.getCell(top + 1, 3).numFmt).toBe('0.00');
    expect(ws.getCell(top, 1).value).toBe('A');
    expect(ws.getCell(top, 1).alignment).toBeUndefined();
    expect(ws.getRow(top).height).toBe(15);
    // The document layer's print set-up and sign-off.
    expect(ws.pageSetup).toMatchObject({ paperSize: 9, fitToPage: true, fitToWidth: 1, fitToHeight: 0, printTitlesRow: '2:2' });
    expect(ws.headerFooter.oddFooter).toContain(DATE);
    expect(Object.keys((ws as unknown as { _merges: object })._merges).length).toBeGreaterThan(0);
    const images = ws.getImages();
    expect(images).toHaveLength(1);
    expect(images[0].range.tl.nativeCol).toBe(1);
    expect(images[0].range.tl.nativeRow).toBe(2);
    expect((images[0].range as unknown as { ext: { width: number } }).ext.width).toBe(40);
    expect(Buffer.compare(wb.getImage(Number(images[0].imageId)).buffer as unknown as Buffer, png)).toBe(0);
    expect(wb.getWorksheet('Second')!.getCell(3, 1).value).toBe('R1');
  });

  test('text keeps every character: those XML cannot hold, and text that reads as their escape, are written as _xHHHH_', async () => {
    const pkg = new WorkbookPackage({ creator: 'Leeway test', title: 'text' });
    pkg.addWorkbook(
      sheet('T', (doc) => {
        doc.line(['bell\u0007here', 'code _x0041_ kept', ' leading space']);
      }),
      1,
    );
    const { wb, zip } = await readBack(await pkg.finish());
    const strings = await zip.file('xl/sharedStrings.xml')!.async('string');
    expect(strings).toContain('bell_x0007_here');
    expect(strings).toContain('code _x005F_x0041_ kept');
    expect(strings).toContain('<t xml:space="preserve"> leading space</t>');
    expect(wb.getWorksheet('T')!.getCell(2, 3).value).toBe(' leading space');
  });

  test('the zip checksum where Node has none of its own: CRC-32 of "123456789" is CBF43926, and it agrees with zlib on seeded bytes', () => {
    // The check value of CRC-32/ISO-HDLC, as the CRC RevEng catalogue lists it; from memory.
    expect(tableCrc32(Buffer.from('123456789'))).toBe(0xcbf43926);
    const rand = mulberry32(20261205);
    const bytes = Uint8Array.from({ length: 4096 }, () => Math.floor(rand() * 256));
    const native = (zlib as unknown as { crc32?: (d: Uint8Array) => number }).crc32;
    if (native) expect(tableCrc32(bytes)).toBe(native(bytes));
    expect(tableCrc32(new Uint8Array(0))).toBe(0);
  });

  test('what it does not write is refused: a hyperlink, a date, a comment; a gap in the tabs', async () => {
    const refused = (set: (ws: ExcelJS.Worksheet) => void): (() => void) => () => {
      const wb = newWorkbook();
      set(wb.addWorksheet('S'));
      new WorkbookPackage({ creator: 'x', title: 'x' }).addWorkbook(wb, 1);
    };
    expect(refused((ws) => void (ws.getCell('A1').value = { text: 'site', hyperlink: 'https://example.invalid' }))).toThrow(/hyperlink/);
    expect(refused((ws) => void (ws.getCell('A1').value = new Date(Date.UTC(2026, 0, 1))))).toThrow(/dates/);
    expect(refused((ws) => void (ws.getCell('A1').note = 'a comment'))).toThrow(/comments/);
    const pkg = new WorkbookPackage({ creator: 'x', title: 'x' });
    pkg.addWorkbook(sheet('A', () => undefined), 2);
    await expect(pkg.finish()).rejects.toThrow(/no sheet at tab 1/);
  });
});
