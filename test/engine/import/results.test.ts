/**
 * Control results files and EQA results files through the generic importer. The example files are
 * invented (docs/examples, marked "DEMO — invented data, not for clinical use"). That an SD for z
 * must be positive, that a standard uncertainty is never negative, and that ISO 13528:2015 scores
 * divide by sd_pt, are common practice, no source beyond the standard's definitions (from memory).
 */
import * as fs from 'fs';
import * as path from 'path';
import { parseResultsBytes, parseResultsText, parseEqaBytes, parseEqaText, acceptResults, acceptEqa, formatReading, parseResultsGrid } from '../../../src/engine/import';
import type { ImportReport } from '../../../src/engine/import';

const EXAMPLES = path.join(__dirname, '..', '..', '..', 'docs', 'examples');
const where = (r: ImportReport): string[] => r.problems.map((p) => `${p.severity} ${p.code} ${p.row} ${p.column ?? '-'}${p.field ? ' ' + p.field : ''}`);
const HEAD = 'analyte,level,run,date,value,target,sd';

describe('control results file', () => {
  test('the example file is clean; results are grouped by analyte and level in file order', () => {
    const r = parseResultsBytes(fs.readFileSync(path.join(EXAMPLES, 'control-results.csv')), { name: 'qc', importedAt: '2026-02-01T00:00:00.000Z' });
    expect(r.problems).toEqual([]);
    expect(r.encoding).toBe('UTF-8 with BOM');
    const file = acceptResults(r);
    expect(file.results).toHaveLength(20);
    expect(file.analytes.map((a) => [a.analyte, a.levels.map((l) => [l.level, l.results.length])])).toEqual([
      ['Arvelin', [['1', 5], ['2', 5]]],
      ['Brontase', [['1', 5], ['2', 5]]],
    ]);
    expect(file.results[0]).toMatchObject({ analyte: 'Arvelin', level: '1', run: '2026-01-05 08:00', date: '2026-01-05T08:00', target: 4.1, sd: 0.09, unit: 'mmol/L', line: 2 });
    expect(file.results[0].note).toBe('DEMO — invented data, not for clinical use');
  });

  test('missing required columns: one error each, naming the field', () => {
    const r = parseResultsText('analyte,value,date\nArvelin,5,2026-01-05\n');
    expect(where(r)).toEqual(['error missing-column 1 - level', 'error missing-column 1 - run', 'error missing-column 1 - target', 'error missing-column 1 - sd']);
    expect(r.candidate).toBeUndefined();
  });

  test('blank required cells, non-numbers and sd ≤ 0: errors on their rows and columns; nothing accepted', () => {
    const r = parseResultsText(`${HEAD}\nArvelin,1,R1,2026-01-05,high,4.1,0.09\nArvelin,1,R2,2026-01-06,4.2,4.1,0\nArvelin,1,R3,2026-01-07,4.2,4.1,-0.1\nArvelin,,R4,2026-01-08,4.2,4.1,0.09\n`);
    expect(where(r)).toEqual(['error not-a-number 2 E value', 'error not-positive 3 G sd', 'error not-positive 4 G sd', 'error missing-value 5 B level']);
    expect(r.problems[1].message).toBe('sd must be greater than 0 (got 0): z = (value − target)/sd needs a positive SD');
    expect(() => acceptResults(r)).toThrow(/4 errors/);
  });

  test('a run label shared by two analytes: one warning for the file, at the first place, with the count', () => {
    const r = parseResultsText(`${HEAD}\nArvelin,1,R1,,4.1,4.1,0.1\nBrontase,1,R1,,40,40,1\nArvelin,1,R2,,4.1,4.1,0.1\nBrontase,1,R2,,40,40,1\nBrontase,2,R1,,120,120,3\n`);
    expect(where(r)).toEqual(['warning shared-run 3 C run']);
    expect(r.problems[0].message).toMatch(/^run "R1" holds results of Brontase here and of Arvelin on row 2 \(2 run labels are shared like this\): runs are read per analyte/);
    expect(r.ok).toBe(true);
  });

  test('dates that go back within an analyte and level: a warning, and the results stay in file order', () => {
    const r = parseResultsText(`${HEAD}\nArvelin,1,R1,2026-01-06,4.1,4.1,0.1\nArvelin,1,R2,2026-01-05,4.2,4.1,0.1\nArvelin,2,R2,2026-01-05,7.8,7.8,0.2\nArvelin,1,R3,2026-01-04,4.0,4.1,0.1\n`);
    expect(where(r)).toEqual(['warning unsorted-dates 3 D date']);
    expect(r.problems[0].message).toBe('the dates of Arvelin level 1 are not in time order (2 places in Arvelin level 1): 2026-01-05 here comes after 2026-01-06 on row 2. The results are kept and read in file order; if file order is not time order, sort the file by date');
    expect(acceptResults(r).results.map((x) => x.run)).toEqual(['R1', 'R2', 'R2', 'R3']);
  });

  test('the same analyte, level, run, date and value twice: a warning (a copy would count twice)', () => {
    const r = parseResultsText(`${HEAD}\nArvelin,1,R1,2026-01-05 08:00,4.1,4.1,0.1\nArvelin,1,R1,2026-01-05 08:00,4.1,4.1,0.1\nArvelin,1,R1,2026-01-05 08:00,4.3,4.1,0.1\n`);
    expect(where(r)).toEqual(['warning duplicate-row 3 E value']);
    expect(r.problems[0].message).toMatch(/repeats row 2 \(same analyte, level, run, date and value\)/);
  });

  test('dates: ISO, dotted day-first, slash dates decided by the file or reported with both readings, and unreadable ones', () => {
    const ok = parseResultsText(`${HEAD}\nA,1,R1,5.1.2026,4,4,1\nA,1,R2,2026-01-06T07:30,4,4,1\nA,1,R3,25/01/2026,4,4,1\nA,1,R4,03/02/2026 8:15 PM,4,4,1\n`);
    expect(ok.problems).toEqual([]);
    expect(acceptResults(ok).results.map((x) => x.date)).toEqual(['2026-01-05', '2026-01-06T07:30', '2026-01-25', '2026-02-03T20:15']);
    const ambiguous = parseResultsText(`${HEAD}\nA,1,R1,03/02/2026,4,4,1\nA,1,R2,31/02/2026,4,4,1\nA,1,R3,yesterday,4,4,1\n`);
    expect(where(ambiguous)).toEqual(['error ambiguous-date 2 D date', 'error not-a-date 3 D date', 'error not-a-date 4 D date']);
    expect(ambiguous.problems[0].message).toBe('date "03/02/2026" could be 2026-02-03 (day/month/year) or 2026-03-02 (month/day/year), and no other date in the file decides: write dates as YYYY-MM-DD');
  });

  test('decimal commas with ";", and units in headers checked against the unit column', () => {
    const r = parseResultsText('analyte;level;run;value [mmol/L];target;sd;unit\nArvelin;1;R1;4,12;4,10;0,09;mmol/L\nArvelin;2;R1;7,9;7,85;0,15;µmol/L\n');
    expect(r.decimal).toEqual({ mark: ',', by: 'numbers' });
    expect(where(r)).toEqual(['warning unit-mismatch 3 D value']);
    expect(acceptResults(r).results.map((x) => [x.value, x.target, x.sd])).toEqual([[4.12, 4.1, 0.09], [7.9, 7.85, 0.15]]);
    expect(formatReading(r)).toContain('column D "value [mmol/L]" → value, unit mmol/L');
  });

  test('other header names map by alias; a worksheet range reads the same', () => {
    const r = parseResultsGrid([
      ['Test', 'Control level', 'Batch', 'Result', 'Mean', 'Standard deviation', 'Analyzer', 'Control lot'],
      ['Arvelin', 1, 'B1', 4.12, 4.1, 0.09, 'A', 'L1'],
    ]);
    expect(r.problems).toEqual([]);
    expect(r.columns.map((c) => c.field)).toEqual(['analyte', 'level', 'run', 'value', 'target', 'sd', 'instrument', 'lot']);
    expect(acceptResults(r).results[0]).toMatchObject({ level: '1', value: 4.12, instrument: 'A', lot: 'L1' });
  });
});

describe('EQA results file', () => {
  const EQA = 'analyte,round,result,assigned,sd_pt,u_assigned';

  test('the example file is clean; a blank u_assigned is 0', () => {
    const r = parseEqaBytes(fs.readFileSync(path.join(EXAMPLES, 'eqa-results.csv')));
    expect(r.problems).toEqual([]);
    const file = acceptEqa(r);
    expect(file.analytes.map((a) => [a.analyte, a.results.map((x) => x.round)])).toEqual([
      ['Arvelin', ['2026-1', '2026-2', '2026-3']],
      ['Brontase', ['2026-1', '2026-2', '2026-3']],
    ]);
    expect(file.results[2]).toMatchObject({ result: 6.94, assigned: 6.75, sdPt: 0.27, uAssigned: 0, date: '2026-07-13' });
  });

  test('without a u_assigned column every u_assigned is 0', () => {
    const r = parseEqaText('analyte,round,result,assigned,sd_pt\nArvelin,1,5.3,5.2,0.2\n');
    expect(acceptEqa(r).results[0].uAssigned).toBe(0);
  });

  test('u_result, the laboratory\'s own standard uncertainty, is read for the ζ score; blank or absent is none, negative an error', () => {
    const r = parseEqaText('analyte,round,result,assigned,sd_pt,u_assigned,u_result\nArvelin,1,5.3,5.2,0.2,0.02,0.05\nArvelin,2,5.3,5.2,0.2,0.02,\n');
    expect(acceptEqa(r).results.map((x) => x.uResult)).toEqual([0.05, null]);
    expect(acceptEqa(parseEqaText('analyte,round,result,assigned,sd_pt\nArvelin,1,5.3,5.2,0.2\n')).results[0].uResult).toBeNull();
    expect(where(parseEqaText('analyte,round,result,assigned,sd_pt,u_result\nArvelin,1,5.3,5.2,0.2,-0.05\n'))).toEqual(['error negative 2 F u_result']);
  });

  test('missing required columns, non-numbers, sd_pt ≤ 0 and u_assigned < 0', () => {
    expect(where(parseEqaText('analyte,result\nArvelin,5\n'))).toEqual(['error missing-column 1 - round', 'error missing-column 1 - assigned', 'error missing-column 1 - sd_pt']);
    const r = parseEqaText(`${EQA}\nArvelin,1,n/a,5.2,0.2,0.01\nArvelin,2,5.3,5.2,0,0.01\nArvelin,3,5.3,5.2,-0.2,\nArvelin,4,5.3,5.2,0.2,-0.01\n`);
    expect(where(r)).toEqual(['error not-a-number 2 C result', 'error not-positive 3 E sd_pt', 'error not-positive 4 E sd_pt', 'error negative 5 F u_assigned']);
  });

  test('the same analyte and round twice is an error; dates going back are a warning', () => {
    const r = parseEqaText('analyte,round,date,result,assigned,sd_pt\nArvelin,1,2026-04-01,5.3,5.2,0.2\nArvelin,2,2026-01-01,5.3,5.2,0.2\nArvelin, 1 ,2026-05-01,5.1,5.2,0.2\n');
    expect(where(r)).toEqual(['warning unsorted-dates 3 C date', 'error duplicate-row 4 B round']);
    expect(r.problems[1].message).toBe('Arvelin, round 1 is listed twice: also on row 2; keep one result per analyte and round');
  });
});
