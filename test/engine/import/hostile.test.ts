/**
 * Hostile numbers and headers in the three kinds of lab file (variation table, control results,
 * EQA results). A value that reads one way as a thousands separator and another as a decimal
 * mark ("1,000", "1.000") is decided by the file's own evidence or reported with its row and
 * column; a header never loses the words that change what its column means. That spreadsheet
 * programs write ";" as the list separator where the comma is the decimal mark, and that an
 * absolute limit is in the result's unit while a percent limit is relative: common practice, no
 * source. Every value is invented.
 */
import { readHeader, RESULTS_KIND, EQA_KIND, parseResultsText, parseEqaText, formatReading } from '../../../src/engine/import';
import type { ImportReport } from '../../../src/engine/import';
import { TABLE_KIND, parseTableText } from '../../../src/engine/table';

type AnyReport = ImportReport;

const errorsOf = (r: AnyReport): string[] => r.problems.filter((p) => p.severity === 'error').map((p) => `${p.code} ${p.row} ${p.column ?? '-'}`);

/** One data row per kind, with `x` in a numeric column (the table's level, the results' value, the EQA result). */
const KINDS: Array<{ name: string; parse: (text: string) => AnyReport; header: (sep: string) => string; row: (x: string, other: string, sep: string) => string; column: string }> = [
  {
    name: 'variation table',
    parse: (t) => parseTableText(t) as unknown as AnyReport,
    header: (s) => ['analyte', 'cvi', 'source', 'level'].join(s),
    row: (x, other, s) => ['Arvelin', other, 'Invented', x].join(s),
    column: 'D',
  },
  {
    name: 'control results file',
    parse: (t) => parseResultsText(t) as unknown as AnyReport,
    header: (s) => ['analyte', 'level', 'run', 'target', 'sd', 'value'].join(s),
    row: (x, other, s) => ['Arvelin', '1', 'R1', '1000', other, x].join(s),
    column: 'F',
  },
  {
    name: 'EQA results file',
    parse: (t) => parseEqaText(t) as unknown as AnyReport,
    header: (s) => ['analyte', 'round', 'assigned', 'sd_pt', 'result'].join(s),
    row: (x, other, s) => ['Arvelin', 'R1', '1000', other, x].join(s),
    column: 'E',
  },
];

const quote = (x: string, sep: string): string => (x.includes(sep) ? `"${x}"` : x);

describe.each(KINDS)('$name: an ambiguous number', (k) => {
  test('"1,000" quoted in a comma file with nothing else to go by is an error naming its row and column', () => {
    const r = k.parse(`${k.header(',')}\n${k.row('"1,000"', '5', ',')}\n`);
    expect(errorsOf(r)).toEqual([`ambiguous-number 2 ${k.column}`]);
    const p = r.problems.find((q) => q.code === 'ambiguous-number')!;
    expect(p.message).toMatch(/"1,000" could be 1000 \(","\s*separating thousands\) or 1 \(","\s*as the decimal mark\)/);
    expect(r.ok).toBe(false);
  });

  test('"1.000" with nothing else to go by is an error too', () => {
    const r = k.parse(`${k.header(',')}\n${k.row('1.000', '5', ',')}\n`);
    expect(errorsOf(r)).toEqual([`ambiguous-number 2 ${k.column}`]);
  });

  test('another field showing a decimal point decides it: "1,000" is one thousand', () => {
    const r = k.parse(`${k.header(',')}\n${k.row('"1,000"', '5.5', ',')}\n`);
    expect(errorsOf(r)).toEqual([]);
    expect(formatReading(r)[0]).toMatch(/decimal mark "\." \(shown by the numbers\)/);
  });

  test('another field showing a decimal comma decides it: "1.000" is one thousand, "1,000" one', () => {
    const thousands = k.parse(`${k.header(';')}\n${k.row('1.000', '5,5', ';')}\n`);
    expect(errorsOf(thousands)).toEqual([]);
    const one = k.parse(`${k.header(',')}\n${k.row(quote('1,000', ','), '"5,5"', ',')}\n`);
    expect(errorsOf(one)).toEqual([]);
  });

  test('the ";" separator decides a comma ("1,000" is one) but not a point ("1.000" stays an error)', () => {
    expect(errorsOf(k.parse(`${k.header(';')}\n${k.row('1,000', '5', ';')}\n`))).toEqual([]);
    expect(errorsOf(k.parse(`${k.header(';')}\n${k.row('1.000', '5', ';')}\n`))).toEqual([`ambiguous-number 2 ${k.column}`]);
  });

  test('a file showing both marks decides nothing: the ambiguous value is an error that cites both', () => {
    const r = k.parse(`${k.header(',')}\n${k.row('"1,000"', '5.5', ',')}\n${k.row('2', '"5,5"', ',')}\n`);
    const p = r.problems.find((q) => q.code === 'ambiguous-number')!;
    expect(`${p.row} ${p.column}`).toBe(`2 ${k.column}`);
    expect(p.message).toMatch(/shows both decimal marks/);
  });
});

describe('headers keep the words that change their meaning', () => {
  test.each(['Limit (mmol/L or %)', 'TEa (abs/rel)', 'Limit (% or U/L)', 'Allowable limit (absolute or percent)', 'limit_abs (mmol/L or %)', 'limit_pct (% or mmol/L)'])(
    'the table\'s %j names both an amount and a percent: ambiguous, never the percent limit alone',
    (header) => {
      expect(readHeader(TABLE_KIND, header)).toMatchObject({ kind: 'ambiguous', candidates: ['limit_abs', 'limit_pct'] });
      const r = parseTableText(`analyte,cvi,source,${header.includes(',') ? `"${header}"` : header}\nArvelin,5.7,Invented,12\n`);
      expect(errorsOf(r as unknown as AnyReport)).toEqual(['ambiguous-header 1 D']);
      expect(r.candidate).toBeUndefined();
    },
  );

  test('"Limit (mmol/L)" is the absolute limit in mmol/L, and the mapping report says so', () => {
    expect(readHeader(TABLE_KIND, 'Limit (mmol/L)')).toEqual({ kind: 'field', field: 'limit_abs', by: 'alias', unit: 'mmol/L' });
    const r = parseTableText('analyte,cvi,source,Limit (mmol/L),Limit (%)\nArvelin,5.7,Invented,0.5,10\n');
    expect(formatReading(r)).toEqual(expect.arrayContaining(['column D "Limit (mmol/L)" → limit_abs, unit mmol/L (another name)', 'column E "Limit (%)" → limit_pct (another name)']));
  });

  test.each(['CVI (SD)', 'CVg (standard deviation)', 'CVI (absolute)'])('a CV column said to be an SD or absolute (%j) is reported, not read as a CV', (header) => {
    expect(readHeader(TABLE_KIND, header)).toMatchObject({ kind: 'ambiguous' });
  });

  test('control results and EQA files: a bracket naming a unit and a percent at once is reported', () => {
    expect(readHeader(RESULTS_KIND, 'Value (mmol/L or %)')).toMatchObject({ kind: 'ambiguous', candidates: ['value'] });
    expect(readHeader(RESULTS_KIND, 'SD (% or mmol/L)')).toMatchObject({ kind: 'ambiguous', candidates: ['sd'] });
    expect(readHeader(EQA_KIND, 'Result (mmol/L or %)')).toMatchObject({ kind: 'ambiguous', candidates: ['result'] });
    expect(readHeader(EQA_KIND, 'sd_pt (mmol/L)')).toEqual({ kind: 'field', field: 'sd_pt', by: 'name', unit: 'mmol/L' });
    expect(readHeader(RESULTS_KIND, 'Note (mmol/L or %)')).toEqual({ kind: 'field', field: 'note', by: 'name' });
  });

  test('words that do not change the meaning are still fine', () => {
    expect(readHeader(TABLE_KIND, 'CVw (within subject)')).toEqual({ kind: 'field', field: 'cvi', by: 'alias' });
    expect(readHeader(TABLE_KIND, 'Limit (% of target)')).toEqual({ kind: 'field', field: 'limit_pct', by: 'alias' });
    expect(readHeader(TABLE_KIND, 'TEa [µmol/L]')).toEqual({ kind: 'field', field: 'limit_abs', by: 'alias', unit: 'µmol/L' });
  });
});
