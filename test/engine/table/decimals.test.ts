/**
 * The decimals a number is written with in a table file, kept beside the row so a filled sheet
 * shows 14.0 as 14.0. Showing a value with the decimals it was recorded with is common practice,
 * no source. The values read are unchanged.
 */
import { parseTableText, parseTableGrid, rowKey } from '../../../src/engine/table';
import { decimalsWritten } from '../../../src/engine/import/numbers';

describe('decimalsWritten', () => {
  test('counts the digits after the decimal mark the number was read with', () => {
    expect(decimalsWritten('14.0', '.')).toBe(1);
    expect(decimalsWritten('5,70', ',')).toBe(2);
    expect(decimalsWritten('1,234.5', '.')).toBe(1);
    expect(decimalsWritten('1.234,50', ',')).toBe(2);
    expect(decimalsWritten('12', null)).toBe(0);
    expect(decimalsWritten('5.', null)).toBe(0);
    expect(decimalsWritten('1,000,000', '.')).toBe(0);
    expect(decimalsWritten(' 6.90 %', '.')).toBe(2);
  });

  test('exponent notation fixes no count of decimals', () => {
    expect(decimalsWritten('1.5e-3', '.')).toBeUndefined();
    expect(decimalsWritten('2E2', null)).toBeUndefined();
  });
});

describe('ImportResult.decimals', () => {
  test('a file: each number’s decimals by row key; the values are the numbers read', () => {
    const r = parseTableText('analyte,specimen,cvi,cvg,source,limit_abs,level\nArvelin,serum,14.0,6.90,src,5,80.0\nBrontase,,12,1e1,src,,\n');
    expect(r.ok).toBe(true);
    expect(r.candidate!.rows.map((x) => [x.cvi, x.cvg])).toEqual([[14, 6.9], [12, 10]]);
    expect(r.decimals).toEqual({
      [rowKey('Arvelin', 'serum')]: { cvi: 1, cvg: 2, limit_abs: 0, level: 1 },
      [rowKey('Brontase', '')]: { cvi: 0 },
    });
  });

  test('decimal comma with ; separator, and an ambiguous "1,000" decided by the file', () => {
    const r = parseTableText('analyte;cvi;cvg;source;limit_abs;level\nArvelin;5,70;1,000;src;;\nB;4,5;6;src;;\n');
    expect(r.ok).toBe(true);
    expect(r.candidate!.rows[0].cvg).toBe(1);
    expect(r.decimals![rowKey('Arvelin', '')]).toEqual({ cvi: 2, cvg: 3 });
  });

  test('a worksheet range gives numbers: no decimals are recorded', () => {
    const r = parseTableGrid([['analyte', 'cvi', 'source'], ['Arvelin', 14, 'src']]);
    expect(r.ok).toBe(true);
    expect(r.decimals).toBeUndefined();
  });
});
