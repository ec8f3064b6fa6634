/**
 * Numbers in a file and the file's decimal mark. How people and spreadsheets in several locales
 * write numbers (a decimal mark occurs once; thousands groups have three digits; Excel writes ";"
 * as the CSV separator where the comma is the decimal mark) is common practice, no source. Each
 * decision rule of docs/reference/file-formats.md has its own test here.
 */
import { readNumberText, decideDecimalMark } from '../../../src/engine/import';
import { parseTableText, parseTableGrid, formatProblem } from '../../../src/engine/table';
import type { ImportResult } from '../../../src/engine/table';

const where = (r: ImportResult): string[] => r.problems.map((p) => `${p.severity} ${p.code} ${p.row} ${p.column ?? '-'}`);

describe('readNumberText: a value on its own', () => {
  test.each([
    ['5.7', 5.7, '.'],
    ['5,7', 5.7, ','],
    ['-0,25', -0.25, ','],
    ['0,250', 0.25, ','],
    ['1234,5', 1234.5, ','],
    ['1234.567', 1234.567, '.'],
    ['1,00', 1, ','],
    ['1,0000', 1, ','],
    [',5', 0.5, ','],
    ['12', 12, null],
    ['1e-3', 0.001, null],
    ['1.5e3', 1500, '.'],
    ['5.', 5, null],
    ['5,7 %', 5.7, ','],
    ['1,000,000', 1000000, '.'],
    ['1.000.000', 1000000, ','],
    ['1,234.5', 1234.5, '.'],
    ['1.234,5', 1234.5, ','],
    ['12,345,678.25', 12345678.25, '.'],
    ['1,234.', 1234, '.'],
  ])('%j is %d and shows the decimal mark %j', (text, value, mark) => {
    expect(readNumberText(text)).toEqual({ kind: 'number', value, decimal: mark });
  });

  test.each([
    ['1,000', ',', 1, 1000],
    ['1.000', '.', 1, 1000],
    ['12,345', ',', 12.345, 12345],
    ['-999.999', '.', -999.999, -999999],
    ['1,500 %', ',', 1.5, 1500],
  ])('%j is ambiguous: decimal %d or thousands %d', (text, mark, asDecimal, asThousands) => {
    expect(readNumberText(text)).toEqual({ kind: 'ambiguous', mark, asDecimal, asThousands });
  });

  test.each(['', 'twelve', '1.234.5', '1 234', "1'234", '1,23,456', '0,234.5', '1,234,5', '5..7', '1e400', 'NaN', 'Infinity', '0x10', '1,000e3x'])('%j is not a number', (text) => {
    expect(readNumberText(text)).toEqual({ kind: 'none' });
  });
});

describe('the file decides an ambiguous value (one rule per test)', () => {
  test('rule 1 (the file\'s numbers): numbers that show a decimal point make "1,000" one thousand and "1.000" one', () => {
    const r = parseTableText('analyte,cvi,source,level,limit_pct\nA,5.7,s,"1,000",1.000\n');
    expect(r.problems).toEqual([]);
    expect(r.decimal).toEqual({ mark: '.', by: 'numbers' });
    expect(r.candidate!.rows[0]).toMatchObject({ level: 1000, limitPct: 1 });
  });

  test('rule 1 (the file\'s numbers), the other way: numbers that show a decimal comma make "1,000" one and "1.000" one thousand', () => {
    const r = parseTableText('analyte;cvi;source;level;limit_pct\nA;5,7;s;1.000;1,000\n');
    expect(r.problems).toEqual([]);
    expect(r.decimal).toEqual({ mark: ',', by: 'numbers' });
    expect(r.candidate!.rows[0]).toMatchObject({ level: 1000, limitPct: 1 });
  });

  test('rule 1 (the file\'s numbers): a value that shows both marks is evidence too ("1,234.5" → point; "1.234,5" → comma)', () => {
    const point = parseTableText('analyte\tcvi\tsource\tlevel\tlimit_pct\nA\t5\ts\t1,234.5\t2.000\n');
    expect(point.decimal).toEqual({ mark: '.', by: 'numbers' });
    expect(point.candidate!.rows[0]).toMatchObject({ level: 1234.5, limitPct: 2 });
    const comma = parseTableText('analyte\tcvi\tsource\tlevel\tlimit_pct\nA\t5\ts\t1.234,5\t2.000\n');
    expect(comma.decimal).toEqual({ mark: ',', by: 'numbers' });
    expect(comma.candidate!.rows[0]).toMatchObject({ level: 1234.5, limitPct: 2000 });
  });

  test('rule 3 (the separator): with ";" as separator and no number showing a mark, a comma is decimal ("1,000" is one) but a point stays undecided', () => {
    const r = parseTableText('analyte;cvi;source;level;limit_pct\nA;5;s;1,000;12\nB;6;s;4;1.000\n');
    expect(r.decimal).toEqual({ mark: ',', by: 'separator' });
    expect(where(r)).toEqual(['error ambiguous-number 3 E']);
    expect(r.problems[0].message).toMatch(/"1\.000" could be 1000 \("\." separating thousands\) or 1 \("\." as the decimal mark\)/);
  });

  test('rule 4 (otherwise): a comma- or tab-separated file where no number shows its mark: the ambiguous value is an error naming its row, column and both readings', () => {
    const r = parseTableText('analyte,cvi,source,limit_pct\nArvelin,5,Invented,"1,000"\n');
    expect(r.ok).toBe(false);
    expect(r.decimal).toEqual({ mark: null, by: 'none' });
    expect(formatProblem(r.problems[0])).toBe(
      'row 2, column D (limit_pct): error: limit_pct: "1,000" could be 1000 ("," separating thousands) or 1 ("," as the decimal mark), and no other number in the file shows which mark is the decimal mark: write 1000 for 1000, or "1,0" for 1 (a thousands separator, or exactly three decimals, leaves the mark in doubt)',
    );
    const tab = parseTableText('analyte\tcvi\tsource\tlevel\nA\t5\ts\t12,345\n');
    expect(where(tab)).toEqual(['error ambiguous-number 2 D']);
    expect(tab.problems[0].message).toContain('"12,3450" for 12.345');
  });

  test('rule 2 (both marks shown): numbers showing both marks decide nothing: an ambiguous value is an error that cites one of each', () => {
    const r = parseTableText('analyte\tcvi\tcvg\tsource\tlevel\nA\t5,7\t6.9\ts\t1.000\n');
    expect(r.decimal).toEqual({ mark: null, by: 'mixed' });
    expect(where(r)).toEqual(['error ambiguous-number 2 E']);
    expect(r.problems[0].message).toContain('a decimal comma in row 2, column B: "5,7"; a decimal point in row 2, column C: "6.9"');
  });

  test('quoted fields are numbers like any other: a quoted "1,000" is decided by the same evidence', () => {
    const r = parseTableText('analyte,cvi,source,limit_pct\n"Arvelin","5.7","s","1,000"\n');
    expect(r.candidate!.rows[0]).toMatchObject({ cvi: 5.7, limitPct: 1000 });
  });

  test('numbers a worksheet already holds are no evidence; text cells in the range are read by the same rules', () => {
    const r = parseTableGrid([
      ['analyte', 'cvi', 'source', 'level'],
      ['A', 5.7, 's', '1,000'],
    ]);
    expect(where(r)).toEqual(['error ambiguous-number 2 D']);
  });

  test('decideDecimalMark reports what decided', () => {
    const none = { count: 0 };
    const one = { count: 1, first: { row: 2, column: 'B', text: '5,7' } };
    expect(decideDecimalMark(one, none, ',')).toMatchObject({ mark: ',', by: 'numbers' });
    expect(decideDecimalMark(none, one, ';')).toMatchObject({ mark: '.', by: 'numbers' });
    expect(decideDecimalMark(one, one, ';')).toMatchObject({ mark: null, by: 'mixed' });
    expect(decideDecimalMark(none, none, ';')).toMatchObject({ mark: ',', by: 'separator' });
    expect(decideDecimalMark(none, none, '\t')).toMatchObject({ mark: null, by: 'none' });
    expect(decideDecimalMark(none, none, ',')).toMatchObject({ mark: null, by: 'none' });
  });
});
