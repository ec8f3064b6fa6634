/**
 * Header matching keeps the words that change a column's meaning: a unit in brackets, a "%".
 * That an absolute limit is in the result's unit and a percent limit relative to the level, and
 * that an SD in percent is a CV, is common practice, no source.
 */
import { readHeader, looksLikeUnit, RESULTS_KIND, EQA_KIND, parseResultsText } from '../../../src/engine/import';
import { TABLE_KIND, matchHeader, parseTableText, formatReading } from '../../../src/engine/table';
import type { ImportResult } from '../../../src/engine/table';

const where = (r: ImportResult): string[] => r.problems.map((p) => `${p.severity} ${p.code} ${p.row} ${p.column ?? '-'}${p.field ? ' ' + p.field : ''}`);

describe('limit columns of a variation table', () => {
  test.each([
    ['Limit (mmol/L)', 'limit_abs', 'mmol/L'],
    ['TEa [µmol/L]', 'limit_abs', 'µmol/L'],
    ['Fixed limit (U/L)', 'limit_abs', 'U/L'],
    ['Limit (abs.)', 'limit_abs', undefined],
    ['limit_abs (g/dL)', 'limit_abs', 'g/dL'],
    ['Limit (%)', 'limit_pct', undefined],
    ['Limit %', 'limit_pct', undefined],
    ['TEa %', 'limit_pct', undefined],
    ['limit_pct', 'limit_pct', undefined],
  ])('%j reads as %s (unit %j)', (header, field, unit) => {
    const r = readHeader(TABLE_KIND, header);
    expect(r).toEqual(unit === undefined ? { kind: 'field', field, by: expect.any(String) } : { kind: 'field', field, by: expect.any(String), unit });
  });

  test.each(['Limit', 'TEa', 'Fixed limit', 'Limit (fixed)', 'limit_pct (mmol/L)', 'limit_abs (%)', 'Limit % (mmol/L)'])('%j is ambiguous: absolute or percent', (header) => {
    expect(readHeader(TABLE_KIND, header)).toMatchObject({ kind: 'ambiguous', candidates: ['limit_abs', 'limit_pct'] });
    expect(matchHeader(header)).toBeUndefined();
  });

  test('a bare "Limit" column with values is an error asking for a mapping; its values are not read', () => {
    const r = parseTableText('analyte,cvi,source,Limit\nArvelin,5.7,Invented,12\n');
    expect(where(r)).toEqual(['error ambiguous-header 1 D']);
    expect(r.problems[0].message).toMatch(/"Limit" does not say whether the limit is a percent or an amount in the result's unit: map it to limit_abs or limit_pct/);
    expect(r.columns[3]).toMatchObject({ header: 'Limit', field: null, by: 'none' });
  });

  test('an empty "Limit" column is only a warning; mapping it by hand settles it', () => {
    expect(where(parseTableText('analyte,cvi,source,Limit\nArvelin,5.7,Invented,\n'))).toEqual(['warning ambiguous-header 1 D']);
    const mapped = parseTableText('analyte,cvi,source,Limit\nArvelin,5.7,Invented,12\n', { mapping: { Limit: 'limit_pct' } });
    expect(mapped.problems).toEqual([]);
    expect(mapped.candidate!.rows[0].limitPct).toBe(12);
  });

  test('"Limit (mmol/L)" is an absolute limit with its unit, shown in the mapping; no longer a 600 % limit', () => {
    const r = parseTableText('analyte,unit,cvi,source,Limit (mmol/L),level\nArvelin,mmol/L,5.7,Invented,0.6,5\n');
    expect(r.problems).toEqual([]);
    expect(r.candidate!.rows[0]).toMatchObject({ limitAbs: 0.6, limitPct: null, level: 5 });
    expect(r.columns[4]).toEqual({ index: 5, letter: 'E', header: 'Limit (mmol/L)', field: 'limit_abs', by: 'alias', unit: 'mmol/L' });
    expect(formatReading(r)).toContain('column E "Limit (mmol/L)" → limit_abs, unit mmol/L (another name)');
  });

  test('a limit unit that differs from the row\'s unit is a warning on that row only (µ and case do not matter)', () => {
    const r = parseTableText('analyte,unit,cvi,source,TEa [µmol/L],Level (µmol/L)\nArvelin,umol/L,5.7,Invented,3,60\nBrontase,mmol/L,5.7,Invented,3,60\nCalpidine,mmol/L,5.7,Invented,,\n');
    expect(where(r)).toEqual(['warning unit-mismatch 3 E limit_abs', 'warning unit-mismatch 3 F level']);
    expect(r.problems[0].message).toBe("limit_abs is in µmol/L by its header but this row's unit is mmol/L: the value is read as written; convert it or correct the unit");
  });
});

describe('other columns with units', () => {
  test('a CV column with a concentration unit is reported (is it an SD?); "(%)" and words are fine', () => {
    expect(readHeader(TABLE_KIND, 'CVI (mmol/L)')).toMatchObject({ kind: 'ambiguous', candidates: ['cvi'] });
    expect(readHeader(TABLE_KIND, 'CV_I (%)')).toEqual({ kind: 'field', field: 'cvi', by: 'name' });
    expect(readHeader(TABLE_KIND, 'CVw (within subject)')).toEqual({ kind: 'field', field: 'cvi', by: 'alias' });
  });

  test('results: an SD in % is a CV and is reported; value/target/sd units are kept', () => {
    expect(readHeader(RESULTS_KIND, 'SD (%)')).toMatchObject({ kind: 'ambiguous', candidates: ['sd'] });
    expect(readHeader(RESULTS_KIND, 'Value [mmol/L]')).toEqual({ kind: 'field', field: 'value', by: 'name', unit: 'mmol/L' });
    expect(readHeader(RESULTS_KIND, 'Target SD (mmol/L)')).toEqual({ kind: 'field', field: 'sd', by: 'alias', unit: 'mmol/L' });
    expect(readHeader(EQA_KIND, 'sd_pt %')).toMatchObject({ kind: 'ambiguous', candidates: ['sd_pt'] });
    const r = parseResultsText('analyte,level,run,value,target,SD (%)\nArvelin,1,R1,5,5,2\n');
    expect(r.problems.map((p) => [p.code, p.column, p.severity])).toEqual([
      ['missing-column', null, 'error'],
      ['ambiguous-header', 'F', 'error'],
    ]);
  });

  test.each(['mmol/L', 'µmol/L', 'U/L', 'g/dL', '10^9/L', '×10⁹/L', 'fL', 'mmHg', 'U', 'IU', 'mmol/mol', 'kPa'])('%j looks like a unit', (u) => {
    expect(looksLikeUnit(u)).toBe(true);
  });

  test.each(['fixed', 'from the EQA scheme', 'abs or pct', 'between subject', ''])('%j does not look like a unit', (u) => {
    expect(looksLikeUnit(u)).toBe(false);
  });
});
