/**
 * Task pane in Chromium: importing a table in each encoding lab PCs write (generated into a
 * temporary folder by test/support/encodings.ts; every value invented). The pane reads the file's
 * bytes through the importer's decoder: every character survives into the stored table, the report
 * names the encoding, and the Windows-1252 warning appears for that file only. Also: a file with
 * values in too many columns is refused, and a limit column's unit shows in the header mapping.
 */
import * as fs from 'fs';
import { describeInBrowser, usePane } from './harness';
import { importFile, tempCsv } from './helpers';
import { ENCODINGS, ENCODING_NAMES, TEXTS, writeCorpus } from '../support/encodings';

interface StoredRow {
  analyte: string;
  unit: string;
  source: string;
  note: string;
}

describeInBrowser('task pane: lab files in every accepted encoding', () => {
  const open = usePane();
  const corpus = writeCorpus('enc-pane');

  test('each encoding: named in the report, warned about only for Windows-1252, every character kept in the stored table', async () => {
    const { context, page, errors } = await open();
    for (const e of ENCODINGS) {
      await importFile(page, corpus[e], `table ${e}`);
      const summary = (await page.textContent('#report-summary')) ?? '';
      expect({ e, summary }).toEqual({ e, summary: expect.stringMatching(new RegExp(`^2 data rows, 0 errors, ${e === 'cp1252' ? 1 : 0} warnings? · separator .* · ${ENCODING_NAMES[e]}( ·|$)`)) });
      const encodingWarnings = await page.$$eval('#problems li[data-code="encoding"]', (els) => els.map((x) => x.textContent ?? ''));
      if (e === 'cp1252') {
        expect(encodingWarnings).toHaveLength(1);
        expect(encodingWarnings[0]).toMatch(/^WarningFilethe file is not UTF-8: it was read as Windows-1252/);
        expect(encodingWarnings[0]).toContain('line 2 now reads "Créatinine"');
      } else {
        expect({ e, encodingWarnings }).toEqual({ e, encodingWarnings: [] });
      }
      await page.click('#accept-import');
      await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Imported'));
      const rows = await page.evaluate(() => {
        const index = JSON.parse(localStorage.getItem('leeway.tables.v1') ?? '[]') as Array<{ id: string }>;
        const last = index[index.length - 1];
        return JSON.parse(localStorage.getItem(`leeway.table.v1.${last.id}`) ?? '[]') as StoredRow[];
      });
      const first = rows[0];
      const hex = (s: string): string => Buffer.from(s, 'utf8').toString('hex');
      expect({ e, analyte: hex(first.analyte), unit: hex(first.unit), source: hex(first.source), note: hex(first.note) }).toEqual({
        e,
        analyte: hex(TEXTS.analyte),
        unit: hex(TEXTS.unit),
        source: hex(TEXTS.source),
        note: hex(TEXTS.note),
      });
    }
    expect(errors).toEqual([]);
    await context.close();
  });

  test('UTF-16 without a BOM is refused in the pane with the reason; nothing can be imported', async () => {
    const { context, page } = await open();
    const file = tempCsv('nobom.txt', '');
    fs.writeFileSync(file, Buffer.from('analyte\tcvi\tsource\r\nCréatinine\t4,5\tInvented\r\n', 'utf16le'));
    await importFile(page, file);
    expect(await page.textContent('#problems')).toContain('looks like UTF-16 (little-endian) without a byte-order mark');
    expect(await page.isDisabled('#accept-import')).toBe(true);
    await context.close();
  });

  test('values in more than 200 columns: refused on the row where it happens', async () => {
    const { context, page } = await open();
    const file = tempCsv('wide.csv', `analyte,cvi,source\nA,5,s\n${Array.from({ length: 201 }, (_, i) => i).join(',')}\n`);
    await importFile(page, file);
    const item = await page.$eval('#problems li', (e) => [e.getAttribute('data-code'), e.getAttribute('data-row'), e.textContent]);
    expect(item[0]).toBe('too-many-columns');
    expect(item[1]).toBe('3');
    expect(item[2]).toMatch(/^ErrorRow 3row 3 has values in more than 200 columns/);
    expect(await page.isDisabled('#accept-import')).toBe(true);
    await context.close();
  });

  test('the header mapping shows a limit column read as absolute, with its unit', async () => {
    const { context, page } = await open();
    const file = tempCsv('unit.csv', 'analyte,unit,cvi,source,Limit (mmol/L),level\nArvelin,mmol/L,5.7,Invented for tests,0.6,5\n');
    await importFile(page, file);
    expect(await page.$eval('#review select[data-header="Limit (mmol/L)"]', (e) => (e as HTMLSelectElement).value)).toBe('limit_abs');
    expect(await page.$eval('#review .mapping', (e) => (e as HTMLDetailsElement).open)).toBe(true);
    expect(await page.textContent('#review .mapping .unit')).toBe(' unit mmol/L');
    await context.close();
  });
});
