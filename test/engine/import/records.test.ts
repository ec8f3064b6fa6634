/**
 * Splitting delimited text into records, and the import limits. Reference for the CSV grammar:
 * papaparse (a dependency of the project, a widely used CSV parser) writing and reading the same
 * records; seeded property tests (mulberry32). The limits are the project's own (stated in
 * docs/reference/file-formats.md).
 */
import Papa from 'papaparse';
import { splitRecords, IMPORT_LIMITS, prepareBytes } from '../../../src/engine/import';
import { parseTableText, parseTableBytes } from '../../../src/engine/table';
import { TABLE_KIND } from '../../../src/engine/table';
import { mulberry32 } from '../../support/prng';

const trimTrailing = (r: string[]): string[] => {
  let n = r.length;
  while (n > 0 && r[n - 1] === '') n--;
  return r.slice(0, n);
};

const dropBlankEnd = (rows: string[][]): string[][] => {
  let n = rows.length;
  while (n > 0 && rows[n - 1].length === 0) n--;
  return rows.slice(0, n);
};

describe('splitRecords against papaparse', () => {
  const PIECES = ['a', 'Créatinine', 'µmol/L', ',', ';', '\t', '"', '""', '\n', '\r\n', ' ', '=SUM(A1)', '', '5,7', '4 °C'];

  test('property: the records papaparse writes are read back exactly, for each separator (seed 20260302, 600 files)', () => {
    const rand = mulberry32(20260302);
    for (let k = 0; k < 600; k++) {
      const delimiter = ([',', ';', '\t'] as const)[k % 3];
      const rows: string[][] = [];
      const nRows = 1 + Math.floor(rand() * 6);
      const nCols = 1 + Math.floor(rand() * 5);
      for (let i = 0; i < nRows; i++) {
        const row: string[] = [];
        for (let c = 0; c < nCols; c++) {
          let s = '';
          const n = Math.floor(rand() * 3);
          for (let j = 0; j < n; j++) s += PIECES[Math.floor(rand() * PIECES.length)];
          row.push(s);
        }
        rows.push(row);
      }
      const text = Papa.unparse(rows, { delimiter, newline: '\r\n' });
      const got = splitRecords(text, delimiter);
      expect(got.issues).toEqual([]);
      // A blank last record and a final line break look the same in CSV; the importer skips blank rows.
      expect(dropBlankEnd(got.rows)).toEqual(dropBlankEnd(rows.map(trimTrailing)));
      const reference = Papa.parse<string[]>(text, { delimiter, header: false, skipEmptyLines: false }).data;
      expect(dropBlankEnd(got.rows)).toEqual(dropBlankEnd(reference.map(trimTrailing)));
    }
  });

  test('quotes inside an unquoted field are text; a line break inside quotes stays in the field; CR, LF and CRLF all end a record', () => {
    const r = splitRecords('a,=HYPERLINK("x"),c\r\n"line one\nline two",b\rlast,x', ',');
    expect(r.rows).toEqual([['a', '=HYPERLINK("x")', 'c'], ['line one\nline two', 'b'], ['last', 'x']]);
  });

  test('an unclosed quote and text after a closing quote are reported on their record', () => {
    expect(splitRecords('a,b\n"open,c\nd,e\n', ',').issues).toEqual([{ record: 1, kind: 'unclosed-quote' }]);
    expect(splitRecords('a,b\n"x"y,c\n', ',').issues).toEqual([{ record: 1, kind: 'text-after-quote' }]);
    const r = parseTableText('analyte,cvi,source\n"Arvelin"x,5,s\n');
    expect(r.problems.map((p) => [p.code, p.row])).toEqual([['parse', 2]]);
  });
});

describe('import limits', () => {
  test('empty columns after the last value are neither kept nor counted: 5,000 trailing separators per row', () => {
    const tail = ','.repeat(5000);
    const lines = [`analyte,cvi,source${tail}`];
    for (let i = 0; i < 400; i++) lines.push(`Analyte ${i},${(1 + (i % 9) / 10).toFixed(1)},Invented for tests${tail}`);
    const text = lines.join('\r\n');
    expect(text.length).toBeGreaterThan(2_000_000);
    const split = splitRecords(text, ',');
    expect(split.rows.every((r) => r.length === 3)).toBe(true);
    expect(split.headerFields).toBe(5003);
    const r = parseTableText(text);
    expect(r.problems).toEqual([]);
    expect(r.columns.map((c) => c.header)).toEqual(['analyte', 'cvi', 'source']);
    expect(r.rowCount).toBe(400);
  });

  test(`more than ${IMPORT_LIMITS.maxColumns} columns with values: the file is refused at the first such row, nothing read after it`, () => {
    const wide = Array.from({ length: IMPORT_LIMITS.maxColumns + 1 }, (_, i) => `c${i}`).join(',');
    const r = parseTableText(`analyte,cvi,source\nA,5,s\n${wide}\nB,6,s\n`);
    expect(r.ok).toBe(false);
    expect(r.problems.map((p) => [p.code, p.row])).toEqual([['too-many-columns', 3]]);
    expect(r.problems[0].message).toMatch(/row 3 has values in more than 200 columns: Leeway reads at most 200 \(empty columns after the last value do not count\)/);
    const exactly = Array.from({ length: IMPORT_LIMITS.maxColumns }, (_, i) => (i === 0 ? 'analyte' : i === 1 ? 'cvi' : i === 2 ? 'source' : `x${i}`)).join(',');
    expect(parseTableText(`${exactly}\nA,5,s\n`).problems.every((p) => p.code === 'unknown-header')).toBe(true);
  });

  test(`more than ${IMPORT_LIMITS.maxRows.toLocaleString('en-US')} rows (a worksheet's rows): refused`, () => {
    const text = 'analyte,cvi,source\n' + 'A,5,s\n'.repeat(IMPORT_LIMITS.maxRows);
    const r = parseTableText(text);
    expect(r.problems.map((p) => [p.code, p.row])).toEqual([['too-many-rows', IMPORT_LIMITS.maxRows + 1]]);
    // Exactly a worksheet's rows (header included) is read; the duplicates are the only problem then.
    const full = splitRecords('analyte,cvi,source\n' + 'A,5,s\n'.repeat(IMPORT_LIMITS.maxRows - 1), ',');
    expect(full.stopped).toBeUndefined();
    expect(full.rows.length).toBe(IMPORT_LIMITS.maxRows);
  });

  test(`bytes over ${IMPORT_LIMITS.maxBytes} are refused before decoding`, () => {
    const r = parseTableBytes(new Uint8Array(IMPORT_LIMITS.maxBytes + 1));
    expect(r.problems.map((p) => [p.code, p.row, p.severity])).toEqual([['too-large', 0, 'error']]);
    expect(r.problems[0].message).toBe('the file is 104,857,601 bytes (100 MiB): Leeway reads files up to 104,857,600 bytes (100 MiB); save only the table itself');
    expect(prepareBytes(TABLE_KIND, new Uint8Array(10)).ok).toBe(false);
  });
});
