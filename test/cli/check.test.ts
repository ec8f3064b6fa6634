/**
 * `leeway check` gives the same report as the table library the task pane uses, on every file
 * of the CSV corpus (test/fixtures/tables), and exits 1 exactly when there are errors.
 */
import * as fs from 'fs';
import * as path from 'path';
import { leeway, tempDir, TABLES } from './support';
import { parseTableText, parseTableBytes, formatReading, formatReport } from '../../src/engine/table';

const CORPUS = fs.readdirSync(TABLES).filter((f) => /\.(csv|tsv)$/.test(f));

describe('leeway check on the CSV corpus', () => {
  test('the corpus is there', () => {
    expect(CORPUS.length).toBeGreaterThanOrEqual(12);
  });

  test.each(CORPUS)('%s: the same report as the pane’s importer, exit 1 iff errors', async (file) => {
    const full = path.join(TABLES, file);
    const expected = parseTableText(fs.readFileSync(full, 'utf8'));
    const r = await leeway('check', full);
    // First how the file was read and mapped (from its bytes), then the report of problems.
    const reading = formatReading(parseTableBytes(fs.readFileSync(full)));
    expect(r.out.slice(0, reading.length)).toEqual(reading);
    expect(r.out.slice(reading.length)).toEqual(formatReport(expected));
    expect(r.code).toBe(expected.errorCount > 0 ? 1 : 0);
    expect(r.err).toEqual([]);
  });

  test('a header mapping on the command line is applied as in the pane', async () => {
    const r = await leeway('check', path.join(TABLES, 'aliases.csv'), '--map', 'Owner=note');
    expect(r.code).toBe(0);
    expect(r.out).toEqual([
      'read: encoding UTF-8, separator ",", decimal mark "." (shown by the numbers)',
      'column A "Test" → analyte (another name)',
      'column B "Sample type" → specimen (another name)',
      'column C "CV_I (%)" → cvi',
      'column D "CVb %" → cvg (another name)',
      'column E "Reference" → source (another name)',
      'column F "Owner" → note (your mapping)',
      'column G "Limit %" → limit_pct (another name)',
      '1 data row, 0 errors, 0 warnings',
    ]);
  });

  test('the 5 MB file of the corpus (generated here) reads through leeway check too', async () => {
    const dir = tempDir('check');
    const file = path.join(dir, 'big.csv');
    const lines = ['analyte,cvi,cvg,source'];
    for (let i = 0; lines.length < 140000; i++) lines.push(`Analyte ${i},${(1 + (i % 90) / 10).toFixed(1)},${(2 + (i % 40) / 10).toFixed(1)},"Invented for tests, row ${i} (2026-01)"`);
    fs.writeFileSync(file, lines.join('\n'));
    expect(fs.statSync(file).size).toBeGreaterThan(5 * 1024 * 1024);
    const r = await leeway('check', file);
    expect(r.code).toBe(0);
    expect(r.out).toEqual([
      'read: encoding UTF-8, separator ",", decimal mark "." (shown by the numbers)',
      'column A "analyte" → analyte',
      'column B "cvi" → cvi',
      'column C "cvg" → cvg',
      'column D "source" → source',
      `${lines.length - 1} data rows, 0 errors, 0 warnings`,
    ]);
  });

  test('no file, or one that cannot be read: exit 2 and 1 with a message', async () => {
    expect((await leeway('check')).code).toBe(2);
    const r = await leeway('check', path.join(TABLES, 'no-such.csv'));
    expect(r.code).toBe(1);
    expect(r.err[0]).toMatch(/cannot read the table .*no-such\.csv: no such file/);
  });
});
