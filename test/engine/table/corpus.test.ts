/**
 * The variation-table importer on the CSV corpus of test/fixtures/tables (every file invented
 * for the tests, see its README). Expected rows and columns are read off the fixture files as a
 * spreadsheet shows them (header = row 1): common practice, no source.
 */
import * as fs from 'fs';
import * as path from 'path';
import { parseTableText, acceptImport, formatProblem } from '../../../src/engine/table';
import type { ImportResult } from '../../../src/engine/table';

const DIR = path.join(__dirname, '..', '..', 'fixtures', 'tables');
const read = (f: string): ImportResult => parseTableText(fs.readFileSync(path.join(DIR, f), 'utf8'), { name: f, origin: f, importedAt: '2026-01-02T03:04:05.000Z' });
const where = (r: ImportResult): string[] => r.problems.map((p) => `${p.severity} ${p.code} ${p.row} ${p.column ?? '-'}${p.field ? ' ' + p.field : ''}`);

describe('variation-table import: the CSV corpus', () => {
  test('a clean comma file with every column reads every value, blanks as null', () => {
    const r = read('good.csv');
    expect(r.ok).toBe(true);
    expect(r.problems).toEqual([]);
    expect(r.delimiter).toBe(',');
    const rows = acceptImport(r).rows;
    expect(rows).toHaveLength(3);
    expect(rows[0]).toEqual({ analyte: 'Arvelin', specimen: 'serum', unit: 'mmol/L', cvi: 5.7, cvg: 6.9, source: 'Invented for tests (2026-01)', limitAbs: null, limitPct: null, level: null, note: '', line: 2 });
    expect(rows[1]).toMatchObject({ limitAbs: 5, limitPct: 10, level: 80, line: 3 });
    expect(rows[2]).toMatchObject({ cvg: null, limitPct: 8, line: 4 });
  });

  test('a byte-order mark does not end up in the first header', () => {
    const r = read('bom.csv');
    expect(r.ok).toBe(true);
    expect(r.columns[0]).toMatchObject({ header: 'analyte', field: 'analyte', by: 'name' });
    expect(r.candidate!.rows.map((x) => x.cvi)).toEqual([5.7, 12.4]);
  });

  test('semicolons and decimal commas', () => {
    const r = read('semicolon-decimal-comma.csv');
    expect(r.delimiter).toBe(';');
    expect(r.ok).toBe(true);
    expect(r.candidate!.rows.map((x) => [x.cvi, x.cvg])).toEqual([[5.7, 6.9], [12.4, 18.1], [24, 31.5]]);
  });

  test('tabs, with decimal points and decimal commas mixed row by row', () => {
    const r = read('tabs.tsv');
    expect(r.delimiter).toBe('\t');
    expect(r.candidate!.rows.map((x) => [x.cvi, x.cvg])).toEqual([[5.7, 6.9], [12.4, 18.1]]);
  });

  test('quoted fields keep their separators, doubled quotes and line breaks; a multi-line field is one row', () => {
    const r = read('quoted.csv');
    expect(r.ok).toBe(true);
    const rows = r.candidate!.rows;
    expect(rows[0]).toMatchObject({ analyte: 'Elostrin, free', cvi: 4.5, source: 'Invented for tests, 2026-01', note: 'line one\nline two', line: 2 });
    expect(rows[1]).toMatchObject({ analyte: 'Fenquilate "F"', source: 'Invented; tests (2026-01)', note: '=HYPERLINK("x")', line: 3 });
    expect(rows[2].line).toBe(4);
  });

  test('other header names map by alias; an unknown header is a warning and its column is ignored', () => {
    const r = read('aliases.csv');
    expect(r.ok).toBe(true);
    expect(r.columns.map((c) => c.field)).toEqual(['analyte', 'specimen', 'cvi', 'cvg', 'source', null, 'limit_pct']);
    expect(where(r)).toEqual(['warning unknown-header 1 F']);
    expect(r.candidate!.rows[0]).toMatchObject({ analyte: 'Arvelin', specimen: 'serum', cvi: 5.7, cvg: 6.9, limitPct: 12 });
  });

  test('a user mapping puts an unknown header to use, or ignores a known one', () => {
    const text = fs.readFileSync(path.join(DIR, 'aliases.csv'), 'utf8');
    const r = parseTableText(text, { mapping: { Owner: 'note', 'Limit %': null } });
    expect(r.problems).toEqual([]);
    expect(r.candidate!.rows[0]).toMatchObject({ note: 'someone', limitPct: null });
    expect(r.columns[5]).toMatchObject({ field: 'note', by: 'user' });
  });

  test('missing required columns: one error each, on row 1, naming the field; nothing imported', () => {
    const r = read('missing-required.csv');
    expect(r.ok).toBe(false);
    expect(r.candidate).toBeUndefined();
    expect(where(r)).toEqual(['error missing-column 1 - cvi', 'error missing-column 1 - source']);
    expect(() => acceptImport(r)).toThrow(/2 errors/);
  });

  test('duplicate analyte+specimen (case and spaces ignored) is an error on the second row, naming the first', () => {
    const r = read('duplicate.csv');
    expect(where(r)).toEqual(['error duplicate-row 4 A analyte']);
    expect(r.problems[0].message).toMatch(/row 2/);
  });

  test('negative, non-numeric and thousands-separated CVs and blank required cells: each with its row and column', () => {
    const r = read('bad-cv.csv');
    expect(where(r)).toEqual([
      'error negative 2 B cvi',
      'error not-a-number 3 B cvi',
      'error negative 4 C cvg',
      'error not-a-number 5 B cvi',
      'error missing-value 6 B cvi',
      'error missing-value 6 D source',
    ]);
    expect(formatProblem(r.problems[1])).toBe('row 3, column B (cvi): error: cvi must be a number (got "twelve"); use . or , as the decimal mark and no thousands separator');
  });

  test('an empty file and a header without rows are errors', () => {
    expect(where(read('empty.csv'))).toEqual(['error empty-file 1 A']);
    expect(where(read('header-only.csv'))).toEqual(['error no-data 2 A']);
  });

  test('an unquoted decimal comma in a comma file: the row has a field too many, with a hint', () => {
    const r = read('comma-decimal-in-comma-file.csv');
    expect(where(r)).toEqual(['error extra-fields 2 E']);
    expect(r.problems[0].message).toMatch(/decimal comma/);
  });
});

describe('variation-table import: size', () => {
  // A generated file of about 5 MB (not committed): every row is read, and a bad cell far down
  // is reported on its own spreadsheet row.
  test('a 5 MB file reads completely and locates a problem on row 40,002', () => {
    const lines = ['analyte,specimen,unit,cvi,cvg,source,note'];

    let size = lines[0].length;
    for (let i = 0; size < 5 * 1024 * 1024; i++) {
      const cvi = i === 40000 ? '-1' : (1 + (i % 97) / 10).toFixed(1);
      const line = `Analyte ${i},serum,mmol/L,${cvi},${(2 + (i % 53) / 10).toFixed(1)},"Invented for tests, generated row ${i} (2026-01)",a note that makes the row longer than most`;
      lines.push(line);
      size += line.length + 1;
    }
    const text = lines.join('\n');
    expect(text.length).toBeGreaterThanOrEqual(5 * 1024 * 1024);
    const r = parseTableText(text);
    expect(r.rowCount).toBe(lines.length - 1);
    expect(where(r)).toEqual(['error negative 40002 D cvi']);
  });
});
