/**
 * Lab files through the built `leeway` command (bin/leeway.js runs dist/cli/leeway.js, rebuilt
 * when older than src/): tables in every accepted encoding through `check` and `fill` (the .xlsx
 * read back with exceljs and its text compared byte for byte), files that are not files or too
 * big, wide files, ambiguous numbers and headers, and the control results and EQA files. All input
 * files are generated into temporary folders; every value is invented for the tests.
 */
import { execFileSync, spawnSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { tempDir } from './support';
import { ENCODINGS, ENCODING_NAMES, TEXTS, writeCorpus } from '../support/encodings';
import { IMPORT_LIMITS } from '../../src/engine/import';

const ROOT = path.join(__dirname, '..', '..');
const BIN = path.join(ROOT, 'bin', 'leeway.js');
const EXAMPLES = path.join(ROOT, 'docs', 'examples');

function leeway(...args: string[]): { code: number | null; out: string[]; err: string[] } {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 60000 });
  const lines = (s: string): string[] => s.split('\n').filter((l) => l !== '');
  return { code: r.status, out: lines(r.stdout), err: lines(r.stderr) };
}

async function strings(file: string): Promise<string[]> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  const out: string[] = [];
  wb.worksheets[0].eachRow((row) => row.eachCell((c) => typeof c.value === 'string' && out.push(c.value)));
  return out;
}

describe('leeway check and fill: a table in each encoding lab PCs write', () => {
  const corpus = writeCorpus('enc-cli');

  test.each(ENCODINGS)('%s: check reads it clean, names the encoding, and warns exactly for Windows-1252', (e) => {
    const r = leeway('check', corpus[e]);
    expect(r.code).toBe(0);
    expect(r.err).toEqual([]);
    expect(r.out[0]).toMatch(new RegExp(`^read: encoding ${ENCODING_NAMES[e]}, separator `));
    const warnings = r.out.filter((l) => l.includes(': warning: '));
    if (e === 'cp1252') {
      expect(warnings).toHaveLength(1);
      expect(warnings[0]).toMatch(/^file: warning: the file is not UTF-8: it was read as Windows-1252 .*line 2 now reads "Créatinine"/);
      expect(r.out[r.out.length - 1]).toBe('2 data rows, 0 errors, 1 warning');
    } else {
      expect(warnings).toEqual([]);
      expect(r.out[r.out.length - 1]).toBe('2 data rows, 0 errors, 0 warnings');
    }
  });

  test.each(ENCODINGS)('%s: fill writes every character unchanged (compared as UTF-8 bytes)', async (e) => {
    const out = path.join(tempDir(`fill-${e}`), 'filled.xlsx');
    const r = leeway('fill', '--table', corpus[e], '--out', out, '--date', '2026-02-03');
    expect(r.code).toBe(0);
    if (e === 'cp1252') {
      expect(r.err).toHaveLength(1);
      expect(r.err[0]).toMatch(/^leeway fill: file: warning: the file is not UTF-8: it was read as Windows-1252/);
    } else expect(r.err).toEqual([]);
    const text = await strings(out);
    for (const expected of Object.values(TEXTS)) {
      const found = text.find((s) => s === expected);
      expect({ expected, found: found === undefined ? null : Buffer.from(found, 'utf8').toString('hex') }).toEqual({ expected, found: Buffer.from(expected, 'utf8').toString('hex') });
    }
    expect(text.some((s) => s.includes('\uFFFD') || s.includes('Ã') || s.includes('Â'))).toBe(false);
  });

  test('UTF-16 without its BOM (and a file with an undefined Windows-1252 byte) is refused by check and fill, with the reason', () => {
    const dir = tempDir('enc-bad');
    const nobom = path.join(dir, 'nobom.txt');
    fs.writeFileSync(nobom, Buffer.from('analyte\tcvi\tsource\r\nCréatinine\t4,5\tInvented\r\n', 'utf16le'));
    const check = leeway('check', nobom);
    expect(check.code).toBe(1);
    expect(check.out[0]).toMatch(/^file: error: the file looks like UTF-16 \(little-endian\) without a byte-order mark: that is none of the encodings Leeway reads/);
    const fill = leeway('fill', '--table', nobom, '--out', path.join(dir, 'x.xlsx'));
    expect(fill.code).toBe(1);
    expect(fill.err.join('\n')).toMatch(/UTF-16 \(little-endian\) without a byte-order mark[\s\S]*nothing was written/);
    expect(fs.existsSync(path.join(dir, 'x.xlsx'))).toBe(false);
    const undefinedByte = path.join(dir, 'x81.csv');
    fs.writeFileSync(undefinedByte, Buffer.from([...Buffer.from('analyte,cvi,source\nA'), 0x81, ...Buffer.from(',5,s\n')]));
    expect(leeway('check', undefinedByte).out[0]).toMatch(/^file: error: byte 0x81 on line 2 is neither UTF-8 nor a Windows-1252 character/);
  });
});

describe('leeway check: what is not a file, or too big, or too wide', () => {
  test('/dev/zero is refused at once as a device', () => {
    const r = leeway('check', '/dev/zero');
    expect(r.code).toBe(1);
    expect(r.err).toEqual(['leeway: cannot read the table /dev/zero: it is a device, not a file']);
  });

  test('a named pipe (FIFO) is refused without waiting for a writer; a folder is refused', () => {
    const dir = tempDir('fifo');
    const fifo = path.join(dir, 'pipe.csv');
    execFileSync('mkfifo', [fifo]);
    const r = leeway('check', fifo);
    expect(r.code).toBe(1);
    expect(r.err).toEqual([`leeway: cannot read the table ${fifo}: it is a named pipe, not a file`]);
    expect(leeway('check', dir).err).toEqual([`leeway: cannot read the table ${dir}: it is a folder`]);
    expect(leeway('check', '--results', fifo).err).toEqual([`leeway: cannot read the control results file ${fifo}: it is a named pipe, not a file`]);
  });

  test('a file over the size limit is refused before it is read (a sparse file: no disk used)', () => {
    const file = path.join(tempDir('big'), 'big.csv');
    fs.writeFileSync(file, 'analyte,cvi,source\n');
    fs.truncateSync(file, IMPORT_LIMITS.maxBytes + 1);
    const r = leeway('check', file);
    expect(r.code).toBe(1);
    expect(r.err).toEqual([`leeway: cannot read the table ${file}: it is 104,857,601 bytes (100 MiB), over Leeway's limit of 104,857,600 bytes (100 MiB)`]);
  });

  test('a 10 MB table with 5,000 empty columns after its last value per row reads as its 3 columns', () => {
    const file = path.join(tempDir('wide'), 'wide.csv');
    const tail = ','.repeat(5000);
    const lines = [`analyte,cvi,source${tail}`];
    for (let i = 0; i < 2000; i++) lines.push(`Analyte ${i},${(1 + (i % 9) / 10).toFixed(1)},Invented for tests${tail}`);
    fs.writeFileSync(file, lines.join('\r\n'));
    expect(fs.statSync(file).size).toBeGreaterThan(10_000_000);
    const r = leeway('check', file);
    expect(r.code).toBe(0);
    expect(r.out).toEqual([
      'read: encoding UTF-8, separator ",", decimal mark "." (shown by the numbers)',
      'column A "analyte" → analyte',
      'column B "cvi" → cvi',
      'column C "source" → source',
      '2000 data rows, 0 errors, 0 warnings',
    ]);
  });

  test(`values in more than ${IMPORT_LIMITS.maxColumns} columns: refused with the row`, () => {
    const file = path.join(tempDir('cols'), 'cols.csv');
    fs.writeFileSync(file, `analyte,cvi,source\nA,5,s\n${Array.from({ length: 250 }, (_, i) => i).join(',')}\n`);
    const r = leeway('check', file);
    expect(r.code).toBe(1);
    expect(r.out).toEqual([
      'read: encoding UTF-8, separator ","',
      'row 3: error: row 3 has values in more than 200 columns: Leeway reads at most 200 (empty columns after the last value do not count); delete the columns that are not needed, or save only the range that holds the data',
      '0 data rows, 1 error, 0 warnings',
    ]);
  });
});

describe('leeway check: numbers and headers a user can misread', () => {
  test('a quoted "1,000" in a comma file with no other evidence: an error naming both readings (no longer 1)', () => {
    const file = path.join(tempDir('amb'), 't.csv');
    fs.writeFileSync(file, 'analyte,cvi,source,limit_pct\nArvelin,5,Invented for tests,"1,000"\n');
    const r = leeway('check', file);
    expect(r.code).toBe(1);
    expect(r.out).toContain('row 2, column D (limit_pct): error: limit_pct: "1,000" could be 1000 ("," separating thousands) or 1 ("," as the decimal mark), and no other number in the file shows which mark is the decimal mark: write 1000 for 1000, or "1,0" for 1 (a thousands separator, or exactly three decimals, leaves the mark in doubt)');
  });

  test('"Limit (mmol/L)" is the absolute limit in mmol/L, and the mapping says so; a bare "Limit" asks for a mapping', () => {
    const dir = tempDir('hdr');
    const unit = path.join(dir, 'unit.csv');
    fs.writeFileSync(unit, 'analyte,unit,cvi,source,Limit (mmol/L),level\nArvelin,mmol/L,5.7,Invented for tests,0.6,5\n');
    const r = leeway('check', unit);
    expect(r.code).toBe(0);
    expect(r.out).toContain('column E "Limit (mmol/L)" → limit_abs, unit mmol/L (another name)');
    const bare = path.join(dir, 'bare.csv');
    fs.writeFileSync(bare, 'analyte,cvi,source,Limit\nArvelin,5.7,Invented for tests,12\n');
    const b = leeway('check', bare);
    expect(b.code).toBe(1);
    expect(b.out).toContain('column D "Limit" → ignored');
    expect(b.out.some((l) => l.startsWith('row 1, column D: error: "Limit" does not say whether the limit is a percent'))).toBe(true);
    const mapped = leeway('check', bare, '--map', 'Limit=limit_pct');
    expect(mapped.code).toBe(0);
    expect(mapped.out).toContain('column D "Limit" → limit_pct (your mapping)');
  });
});

describe('leeway check --results and --eqa', () => {
  test('the example files are clean', () => {
    const r = leeway('check', '--results', path.join(EXAMPLES, 'control-results.csv'));
    expect(r.code).toBe(0);
    expect(r.out[r.out.length - 1]).toBe('20 data rows, 0 errors, 0 warnings');
    const e = leeway('check', '--eqa', path.join(EXAMPLES, 'eqa-results.csv'));
    expect(e.code).toBe(0);
    expect(e.out[e.out.length - 1]).toBe('6 data rows, 0 errors, 0 warnings');
  });

  test('a results file with problems: each on its row and column, exit 1; with a table too, each file has its heading', () => {
    const file = path.join(tempDir('res'), 'r.csv');
    fs.writeFileSync(file, 'analyte;level;run;date;value;target;sd\nArvelin;1;R1;2026-01-06;4,1;4,1;0\nBrontase;1;R1;2026-01-05;40;40;1\n');
    const r = leeway('check', '--results', file);
    expect(r.code).toBe(1);
    expect(r.out.slice(-3)).toEqual([
      'row 2, column G (sd): error: sd must be greater than 0 (got 0): z = (value − target)/sd needs a positive SD',
      'row 3, column C (run): warning: run "R1" holds results of Brontase here and of Arvelin on row 2: runs are read per analyte, so each analyte\'s results with this label form a run of their own. If one label was meant to name one run of one analyte, make the labels unique',
      '2 data rows, 1 error, 1 warning',
    ]);
    const both = leeway('check', path.join(EXAMPLES, 'variation-table.csv'), '--results', file, '--eqa', path.join(EXAMPLES, 'eqa-results.csv'));
    expect(both.code).toBe(1);
    expect(both.out.filter((l) => / file |^table /.test(l) && l.endsWith(':'))).toEqual([
      `table ${path.join(EXAMPLES, 'variation-table.csv')}:`,
      `control results file ${file}:`,
      `EQA results file ${path.join(EXAMPLES, 'eqa-results.csv')}:`,
    ]);
  });

  test('--map checks the field against the kinds being read', () => {
    const r = leeway('check', '--eqa', path.join(EXAMPLES, 'eqa-results.csv'), '--map', 'x=cvi');
    expect(r.code).toBe(2);
    expect(r.err[0]).toMatch(/cvi is not one of analyte, round, result, assigned, sd_pt, u_assigned, u_result, unit, date, note/);
  });
});
