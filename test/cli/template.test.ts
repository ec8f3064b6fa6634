/**
 * `leeway fill --template` on the template corpus (test/fixtures/templates, made by openpyxl and
 * LibreOffice; see its README). What is checked, and against what:
 * - package structure: parts, relationships and content types as ECMA-376 Part 2 (Open Packaging
 *   Conventions) defines them; a worksheet's elements and their order as ECMA-376 Part 1, 18.3;
 * - byte-for-byte preservation: the raw (uncompressed) bytes of every part the fill had no need to
 *   touch, compared between input and output, and within the edited sheet part the text outside
 *   sheetData and every row that was not written;
 * - values: derived cells equal the registry's evaluate() on the same inputs (relative 1e-15), the
 *   stored add-in formula is storedFormula() of the planner's (the exceljs writer's rule);
 * - the SHA-256 of the table file: Node's crypto (FIPS 180-4);
 * - layout rules (header scan, matching, conflicts, appending, provenance placement) are the
 *   project's own, documented in docs/reference/templates.md.
 */
import * as fs from 'fs';
import * as path from 'path';
import { createHash } from 'crypto';
import { execFileSync } from 'child_process';
import JSZip from 'jszip';
import ExcelJS from 'exceljs';
import { leeway, tempDir, strayFiles } from './support';
import { TemplateWorkbook } from '../../src/cli/workbook/template';
import { storedFormula } from '../../src/cli/xlsx';
import { CAUTION, a1 } from '../../src/engine/fill';
import { evaluate } from '../../src/registry';
import { VERSION } from '../../src/engine/version';
import { relClose } from '../support/prng';

const FIXTURES = path.join(__dirname, '..', 'fixtures', 'templates');
const TABLE = path.join(FIXTURES, 'table.csv');
const DATE = '2026-02-03';

/** Every part of a package: its name and its raw (uncompressed) bytes. */
async function parts(file: string): Promise<Map<string, Buffer>> {
  const zip = await JSZip.loadAsync(fs.readFileSync(file));
  const out = new Map<string, Buffer>();
  for (const [name, entry] of Object.entries(zip.files)) if (!entry.dir) out.set(name, await entry.async('nodebuffer'));
  return out;
}

/** A sheet read back with the project's reader: values by address, merges. */
async function sheetOf(file: string, name?: string): Promise<{ values: Map<string, unknown>; merges: string[] }> {
  const wb = await TemplateWorkbook.open(fs.readFileSync(file));
  const s = await wb.snapshot(wb.pick(name, file));
  const values = new Map<string, unknown>();
  for (const c of s.sparse ?? []) values.set(a1(c), c.value);
  return { values, merges: (s.merges ?? []).map((m) => `${a1({ row: m.top, col: m.left })}:${a1({ row: m.bottom, col: m.right })}`) };
}

async function fill(file: string, ...extra: string[]): Promise<{ out: string; dir: string; r: Awaited<ReturnType<typeof leeway>> }> {
  const dir = tempDir('tpl');
  const out = path.join(dir, 'filled.xlsx');
  const r = await leeway('fill', '--table', TABLE, '--template', path.join(FIXTURES, file), '--out', out, '--date', DATE, ...extra);
  return { out, dir, r };
}

const total = (cvi: number, cvg: number): number => evaluate('SPEC.TOTAL', [cvi, cvg, 'desirable', 1.65])[0][0] as number;

/** The sheet part's text outside sheetData, with the dimension's reference taken out. */
function outsideSheetData(xml: string): string {
  const start = xml.indexOf('<sheetData');
  const end = xml.indexOf('</sheetData>');
  return (xml.slice(0, start) + xml.slice(end < 0 ? xml.indexOf('/>', start) + 2 : end + 12)).replace(/<dimension ref="[^"]*"\/>/, '<dimension/>');
}

/** Row elements of a sheet part, by row number. */
function rowsOf(xml: string): Map<number, string> {
  const out = new Map<number, string>();
  for (const m of xml.matchAll(/<row\b[^>]*?\br="(\d+)"[^>]*?(?:\/>|>[\s\S]*?<\/row>)/g)) out.set(Number(m[1]), m[0]);
  return out;
}

describe.each(['lab.xlsx', 'lab-libreoffice.xlsx'])('a default fill of %s', (file) => {
  let before: Map<string, Buffer>;
  let after: Map<string, Buffer>;
  let run: Awaited<ReturnType<typeof fill>>;
  beforeAll(async () => {
    run = await fill(file);
    before = await parts(path.join(FIXTURES, file));
    after = await parts(run.out);
  });

  test('exits 0, finds the header at row 6 itself and reports what it left alone and what it could not match', () => {
    expect(run.r.err).toEqual([]);
    expect(run.r.code).toBe(0);
    const out = run.r.out.join('\n');
    expect(run.r.out[0]).toMatch(/^wrote .*filled\.xlsx: sheet "Verification", 2 analytes/);
    expect(out).toContain('left 1 non-empty target cell as it was (add --overwrite to replace them):');
    expect(out).toContain(`  E8 holds 5; Leeway would write "${total(12.4, 18.1)}"`);
    // "Calpidine" without a specimen does not fill the template's "Calpidine | Urine" row.
    expect(out).toContain('the table has no row for 2 analytes of the template (left blank): Calpidine (Urine) (row 9), Elmicate (Serum) (row 10)');
    expect(out).toContain('the template does not list 2 analytes of the table (not added; add --append to add them in empty rows below the table): Calpidine, Dorvane (Serum)');
    expect(out).toContain('provenance and caution: the sheet "Leeway provenance" (the rows below the table are not empty)');
    expect(strayFiles(run.dir, ['filled.xlsx'])).toEqual([]);
  });

  test('every part the fill did not need is identical byte for byte; the only new part is the provenance sheet', () => {
    const needed = new Set(['xl/worksheets/sheet1.xml', 'xl/styles.xml', 'xl/workbook.xml', 'xl/_rels/workbook.xml.rels', '[Content_Types].xml']);
    const added = [...after.keys()].filter((k) => !before.has(k));
    expect(added).toHaveLength(1);
    expect(added[0]).toMatch(/^xl\/worksheets\/sheet\d+\.xml$/);
    expect([...before.keys()].filter((k) => !after.has(k))).toEqual([]);
    let same = 0;
    for (const [name, bytes] of before) {
      if (needed.has(name)) continue;
      expect({ name, equal: bytes.equals(after.get(name)!) }).toEqual({ name, equal: true });
      same++;
    }
    // Charts, drawings, the table object, comments, the theme, the other sheet … (at least 8 parts).
    expect(same).toBeGreaterThanOrEqual(8);
    expect([...before.keys()].some((k) => k.startsWith('xl/charts/'))).toBe(true);
  });

  test('in the sheet part, everything outside sheetData but the dimension, and every row not written, is as it was', () => {
    const x0 = before.get('xl/worksheets/sheet1.xml')!.toString('utf8');
    const x1 = after.get('xl/worksheets/sheet1.xml')!.toString('utf8');
    expect(outsideSheetData(x1)).toBe(outsideSheetData(x0));
    const r0 = rowsOf(x0);
    const r1 = rowsOf(x1);
    for (const [r, text] of r0) if (r !== 7 && r !== 8) expect(r1.get(r)).toBe(text);
    // Rows and cells stay in order.
    expect([...r1.keys()]).toEqual([...r1.keys()].sort((a, b) => a - b));
    for (const text of r1.values()) {
      const cols = [...text.matchAll(/<c r="([A-Z]+)\d+"/g)].map((m) => m[1].length * 100 + m[1].charCodeAt(m[1].length - 1));
      expect(cols).toEqual([...cols].sort((a, b) => a - b));
    }
  });

  test('the styles part only gains cell formats at the end of cellXfs', () => {
    const s0 = before.get('xl/styles.xml')!.toString('utf8');
    const s1 = after.get('xl/styles.xml')!.toString('utf8');
    const inner = (s: string): string => s.slice(s.indexOf('>', s.indexOf('<cellXfs')) + 1, s.indexOf('</cellXfs>'));
    expect(inner(s1).startsWith(inner(s0))).toBe(true);
    expect(s1.slice(0, s1.indexOf('<cellXfs'))).toBe(s0.slice(0, s0.indexOf('<cellXfs')));
    expect(s1.slice(s1.indexOf('</cellXfs>'))).toBe(s0.slice(s0.indexOf('</cellXfs>')));
  });

  test('what was there is still there; the empty target cells hold the table’s values and the registry’s results', async () => {
    const a = await sheetOf(path.join(FIXTURES, file), 'Verification');
    const b = await sheetOf(run.out, 'Verification');
    for (const [addr, v] of a.values) expect([addr, b.values.get(addr)]).toEqual([addr, v]);
    expect(b.merges).toEqual(a.merges);
    expect(b.values.get('C7')).toBe(5.7);
    expect(b.values.get('D7')).toBe(6.9);
    expect(relClose(b.values.get('E7') as number, total(5.7, 6.9), 1e-15)).toBe(true);
    expect(b.values.get('C8')).toBe(12.4);
    expect(b.values.get('E8')).toBe(5);
    for (const addr of ['C9', 'D9', 'E9', 'C10', 'A13', 'A14']) expect(b.values.has(addr)).toBe(false);
    const data0 = await sheetOf(path.join(FIXTURES, file), 'Data');
    const data1 = await sheetOf(run.out, 'Data');
    expect([...data1.values]).toEqual([...data0.values]);
  });

  test('the provenance sheet names the sheet and range it documents, the table, its SHA-256 and row count, tier, z, date, version, and the caution', async () => {
    const p = await sheetOf(run.out, 'Leeway provenance');
    const sha = createHash('sha256').update(fs.readFileSync(TABLE)).digest('hex');
    // Column B, top to bottom: long values continue on the rows below (at spaces, or inside a path or hash).
    const colB = [...p.values].filter(([addr]) => /^B\d+$/.test(addr)).map(([, v]) => String(v));
    const flat = colB.join(' ');
    const tight = colB.join('');
    expect(p.values.get('A2')).toBe('Documents');
    expect(flat).toContain('sheet "Verification", A6:F10 (header row 6): its formulas read the tier and z cells below');
    for (const t of ['table.csv', path.resolve(TABLE), sha, DATE, `Leeway ${VERSION}`]) expect(tight).toContain(t);
    const tierRow = [...p.values].find(([, v]) => v === 'Tier (whole sheet)')![0].slice(1);
    expect(p.values.get(`B${tierRow}`)).toBe('desirable');
    expect(p.values.get(`B${Number(tierRow) + 1}`)).toBe(1.65);
    // The table has 4 rows; the template lists 2 of them (rows 7 and 8), so 2 were filled.
    expect(p.values.get(`B${[...p.values].find(([, v]) => v === 'Table rows')![0].slice(1)}`)).toBe('4 in the table; 2 filled here');
    expect(flat).toContain(CAUTION);
    // Two columns of 18 and 40 characters: every value line fits its column.
    for (const t of colB) expect(t.length).toBeLessThanOrEqual(38);
  });
});

describe('a template made by exceljs (built here): notes, validation, a defined name, a merged title, a second sheet', () => {
  test('every part but the sheet and the styles is identical byte for byte; the notes and validation are still there', async () => {
    const dir = tempDir('exceljs');
    const tpl = path.join(dir, 'template.xlsx');
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Verification');
    ws.getCell('A1').value = 'Method verification (invented)';
    ws.mergeCells('A1:D1');
    ws.getRow(3).values = ['Analyte', 'Specimen', 'CVI %', 'Allowable CV %'];
    ws.getRow(4).values = ['Arvelin', 'Serum'];
    ws.getCell('A3').note = 'Invented note on the header';
    ws.getCell('B4').dataValidation = { type: 'list', allowBlank: true, formulae: ['"Serum,Urine"'] };
    wb.definedNames.add('Verification!$A$4', 'FirstAnalyte');
    wb.addWorksheet('Other').getCell('A1').value = 'untouched';
    await wb.xlsx.writeFile(tpl);
    const out = path.join(dir, 'filled.xlsx');
    const r = await leeway('fill', '--table', TABLE, '--template', tpl, '--out', out, '--date', DATE);
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    const before = await parts(tpl);
    const after = await parts(out);
    expect([...after.keys()].sort()).toEqual([...before.keys()].sort());
    const changed = [...before.keys()].filter((k) => !before.get(k)!.equals(after.get(k)!)).sort();
    expect(changed).toEqual(['xl/styles.xml', 'xl/worksheets/sheet1.xml']);
    expect([...before.keys()].some((k) => k.startsWith('xl/comments'))).toBe(true);
    const back = new ExcelJS.Workbook();
    await back.xlsx.readFile(out);
    const v = back.getWorksheet('Verification')!;
    expect(v.getCell('C4').value).toBe(5.7);
    expect(v.getCell('D4').value).toBe(evaluate('SPEC.CV', [5.7, 'desirable'])[0][0]);
    expect(v.getCell('D4').numFmt).toBe('0.00');
    expect(v.getCell('B4').dataValidation).toMatchObject({ type: 'list', formulae: ['"Serum,Urine"'] });
    expect(v.getCell('A3').note).toBe('Invented note on the header');
    // The title, wrapped to the four columns' width (4 × 8.43 characters).
    expect(`${v.getCell('A6').value} ${v.getCell('A7').value}`).toBe('Leeway — analytical performance specifications');
  });
});

describe('page set-up, and numbers as the table file writes them', () => {
  test('a General cell shows 14.0 and 6.90 as written; a cell the lab formatted keeps its format; 12.4 needs no format; the block names the file by its SHA-256', async () => {
    const dir = tempDir('decimals');
    const csv = path.join(dir, 'written.csv');
    fs.writeFileSync(csv, 'analyte,specimen,unit,cvi,cvg,source\nArvelin,Serum,mmol/L,14.0,6.90,Invented for tests (2026-01)\nBrontase,Serum,U/L,12.4,18.10,Invented for tests (2026-01)\n');
    const tpl = path.join(dir, 'template.xlsx');
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Verification');
    ws.getRow(1).values = ['Analyte', 'Specimen', 'CVI %', 'CVG %'];
    ws.getRow(2).values = ['Arvelin', 'Serum'];
    ws.getRow(3).values = ['Brontase', 'Serum'];
    // The lab's own format on one input cell.
    ws.getCell('D3').numFmt = '0.000';
    await wb.xlsx.writeFile(tpl);
    const out = path.join(dir, 'filled.xlsx');
    const r = await leeway('fill', '--table', csv, '--template', tpl, '--out', out, '--date', DATE);
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    const back = new ExcelJS.Workbook();
    await back.xlsx.readFile(out);
    const v = back.getWorksheet('Verification')!;
    expect([v.getCell('C2').value, v.getCell('C2').numFmt]).toEqual([14, '0.0']);
    expect([v.getCell('D2').value, v.getCell('D2').numFmt]).toEqual([6.9, '0.00']);
    // 12.4 in General already shows as written: no format is added.
    expect(v.getCell('C3').value).toBe(12.4);
    expect(v.getCell('C3').numFmt ?? 'General').toBe('General');
    expect([v.getCell('D3').value, v.getCell('D3').numFmt]).toEqual([18.1, '0.000']);
    const sha = createHash('sha256').update(fs.readFileSync(csv)).digest('hex');
    const block: string[] = [];
    v.eachRow((row) => row.eachCell((c) => typeof c.value === 'string' && block.push(c.value)));
    expect(block.join('')).toContain(sha);
    expect(block.join(' ')).toContain('Table rows: 2 in the table; 2 filled here');
  });

  test('--paper is refused with a template: the template keeps its own page set-up', async () => {
    const dir = tempDir('paper');
    const out = path.join(dir, 'filled.xlsx');
    const r = await leeway('fill', '--table', TABLE, '--template', path.join(FIXTURES, 'lab.xlsx'), '--out', out, '--paper', 'Letter');
    expect(r.code).not.toBe(0);
    expect(r.err.join('\n')).toMatch(/--paper is for a new workbook/);
    expect(fs.existsSync(out)).toBe(false);
  });
});

describe('overwriting, live formulas, appending', () => {
  test('--overwrite replaces the hand-entered value and says so', async () => {
    const { out, r } = await fill('lab.xlsx', '--overwrite');
    expect(r.code).toBe(0);
    expect(r.out).toContain('overwrote 1 cell: E8');
    const b = await sheetOf(out, 'Verification');
    expect(relClose(b.values.get('E8') as number, total(12.4, 18.1), 1e-15)).toBe(true);
  });

  test('--live: each derived cell stores the add-in formula (as the exceljs writer stores it) and the registry’s result', async () => {
    const { out, r } = await fill('printable.xlsx', '--live');
    expect(r.code).toBe(0);
    const xml = (await parts(out)).get('xl/worksheets/sheet1.xml')!.toString('utf8');
    const cellXml = (addr: string): string => new RegExp(`<c r="${addr}"[^>]*>.*?</c>`).exec(xml)![0];
    const te = cellXml('G4');
    const tierCell = /_xldudf_LEEWAY_SPEC_TOTAL\(C4,D4,(\$[A-Z]+\$\d+),(\$[A-Z]+\$\d+)\)/.exec(te)!;
    expect(te).toContain(`<f>${storedFormula(`=LEEWAY.SPEC.TOTAL(C4,D4,${tierCell[1]},${tierCell[2]})`)}</f>`);
    expect(relClose(Number(/<v>([^<]*)<\/v>/.exec(te)![1]), total(5.7, 6.9), 1e-15)).toBe(true);
    const cv = cellXml('E5');
    expect(cv).toContain(`<f>${storedFormula(`=LEEWAY.SPEC.CV(C5,${tierCell[1]})`)}</f>`);
    expect(Number(/<v>([^<]*)<\/v>/.exec(cv)![1])).toBe(evaluate('SPEC.CV', [12.4, 'desirable'])[0][0]);
    expect(xml).not.toMatch(/<f>=/);
  });

  test('--append writes the table’s other analytes into empty rows directly below the table', async () => {
    const dir = tempDir('app');
    const csv = path.join(dir, 't.csv');
    fs.writeFileSync(csv, fs.readFileSync(TABLE, 'utf8') + 'Ferrolin,Serum,mmol/L,2.5,3.5,Invented for tests (2026-01)\r\n');
    const out = path.join(dir, 'o.xlsx');
    const r = await leeway('fill', '--table', csv, '--template', path.join(FIXTURES, 'printable.xlsx'), '--out', out, '--date', DATE, '--append');
    expect(r.code).toBe(0);
    expect(r.out).toContain('appended 1 analyte below the table: Ferrolin (Serum) (row 8)');
    const b = await sheetOf(out);
    expect(b.values.get('A8')).toBe('Ferrolin');
    expect(b.values.get('B8')).toBe('Serum');
    expect(b.values.get('C8')).toBe(2.5);
    // The provenance follows, one blank row below.
    expect(b.values.has('A9')).toBe(false);
    expect(b.values.get('A10')).toBe('Leeway — analytical performance specifications');
  });

  test('--append never writes into a footnote or a merged band below the table: it reports that there is no room', async () => {
    const lab = await fill('lab.xlsx', '--append');
    expect(lab.r.out.join('\n')).toMatch(/no room to append 2 analytes \(row 12 holds other content, 1 empty row below the table, one of which stays empty; .*\): Calpidine, Dorvane \(Serum\)/);
    const merged = await fill('merged.xlsx', '--append');
    expect(merged.r.out.join('\n')).toMatch(/no room to append 1 analyte \(row 5 holds other content directly below the table; .*\): Calpidine/);
    const b = await sheetOf(merged.out);
    expect(b.values.has('A5')).toBe(false);
  });
});

describe('merged cells, the header scan, a far stray cell', () => {
  test('merged target cells are never written (listed with their range); the merges and the rows around them stay', async () => {
    const { out, r } = await fill('merged.xlsx', '--overwrite');
    expect(r.code).toBe(0);
    const text = r.out.join('\n');
    expect(text).toContain('did not write 2 cells that cannot be written without changing the sheet’s layout:'.replace('’', "'"));
    expect(text).toContain('  B3 (merged B3:C3); Leeway would write "5.7"');
    expect(text).toContain('  C3 (merged B3:C3); Leeway would write "6.9"');
    const b = await sheetOf(out);
    expect(b.merges).toEqual(['B3:C3', 'A5:D5']);
    expect(b.values.has('B3')).toBe(false);
    expect(b.values.get('B2')).toBe(12.4);
    expect(b.values.get('C4')).toBe(2.4);
    // Calpidine is not in the template: it does not land in the merged band.
    expect(text).toContain('the template does not list 1 analyte of the table (not added; add --append to add them in empty rows below the table): Calpidine');
  });

  test('a template with no header row in its first rows is refused with how to point at it', async () => {
    const dir = tempDir('nohead');
    const tpl = path.join(dir, 't.xlsx');
    const zip = await JSZip.loadAsync(fs.readFileSync(path.join(FIXTURES, 'printable.xlsx')));
    const sheet = (await zip.file('xl/worksheets/sheet1.xml')!.async('string')).replace(/<row r="3"[\s\S]*?<\/row>/, '');
    zip.file('xl/worksheets/sheet1.xml', sheet);
    fs.writeFileSync(tpl, await zip.generateAsync({ type: 'nodebuffer' }));
    const r = await leeway('fill', '--table', TABLE, '--template', tpl, '--out', path.join(dir, 'o.xlsx'));
    expect(r.code).toBe(1);
    const err = r.err.join('\n');
    expect(err).toMatch(/no header row found in the first 30 rows of sheet "Specifications"/);
    expect(err).toContain('point at the first cell of the header row with --at CELL (for example --at A6), and at another sheet with --sheet NAME');
    expect(strayFiles(dir, ['t.xlsx'])).toEqual([]);
  });

  test('a value at ZZ200000 is kept and costs nothing: the fill is the same as on the sheet without it', async () => {
    const stray = await fill('stray.xlsx');
    const plain = await fill('printable.xlsx');
    expect(stray.r.code).toBe(0);
    expect(stray.r.out.slice(1)).toEqual(plain.r.out.slice(1));
    const b = await sheetOf(stray.out);
    expect(b.values.get('ZZ200000')).toBe('stray');
    const xml = (await parts(stray.out)).get('xl/worksheets/sheet1.xml')!.toString('utf8');
    expect(xml).toMatch(/<dimension ref="A1:ZZ200000"\/>/);
  });

  test('a print area and page set-up are kept as they are; a block they leave out is reported', async () => {
    const { out, r } = await fill('printarea.xlsx');
    expect(r.out.join('\n')).toMatch(/the sheet's print area \(A1:G8\) leaves out the provenance block \(A9:A\d+\)/);
    const before = await parts(path.join(FIXTURES, 'printarea.xlsx'));
    const after = await parts(out);
    expect(after.get('xl/workbook.xml')!.equals(before.get('xl/workbook.xml')!)).toBe(true);
    expect(outsideSheetData(after.get('xl/worksheets/sheet1.xml')!.toString('utf8'))).toBe(outsideSheetData(before.get('xl/worksheets/sheet1.xml')!.toString('utf8')));
  });
});

describe('in place, and files that are not .xlsx workbooks', () => {
  test('--template X --out X --force keeps every other part byte for byte and leaves no temporary file', async () => {
    const dir = tempDir('inplace');
    const file = path.join(dir, 'lab.xlsx');
    fs.copyFileSync(path.join(FIXTURES, 'lab-libreoffice.xlsx'), file);
    const before = await parts(file);
    const r = await leeway('fill', '--table', TABLE, '--template', file, '--out', file, '--force', '--date', DATE);
    expect(r.code).toBe(0);
    const after = await parts(file);
    const needed = new Set(['xl/worksheets/sheet1.xml', 'xl/workbook.xml', 'xl/_rels/workbook.xml.rels', '[Content_Types].xml', 'xl/styles.xml']);
    for (const [name, bytes] of before) if (!needed.has(name)) expect({ name, equal: bytes.equals(after.get(name)!) }).toEqual({ name, equal: true });
    expect(strayFiles(dir, ['lab.xlsx'])).toEqual([]);
    // Without --force the same command is refused and the file is left alone.
    const again = await leeway('fill', '--table', TABLE, '--template', file, '--out', file);
    expect(again.code).toBe(1);
    expect((await parts(file)).size).toBe(after.size);
  });

  const cases: Array<[string, () => Promise<Buffer> | Buffer, RegExp]> = [
    ['an .xls workbook', () => fs.readFileSync(path.join(FIXTURES, 'lab.xls')), /is an Excel 97–2003 workbook \(\.xls\).*save it as an Excel workbook \(\.xlsx\)/],
    ['an encrypted workbook', () => fs.readFileSync(path.join(FIXTURES, 'encrypted.xlsx')), /is an encrypted workbook \(protected by a password to open\)/],
    ['an OpenDocument spreadsheet', () => fs.readFileSync(path.join(FIXTURES, 'lab.ods')), /is an OpenDocument spreadsheet \(\.ods\)/],
    ['a CSV file', () => fs.readFileSync(TABLE), /is a text \(CSV\) file/],
    ['an empty file', () => Buffer.alloc(0), /the file is empty/],
    ['a damaged zip', () => fs.readFileSync(path.join(FIXTURES, 'lab.xlsx')).subarray(0, 2000), /is damaged: its zip structure cannot be read/],
    [
      'a zip that holds no workbook',
      async () => {
        const z = new JSZip();
        z.file('readme.txt', 'hello');
        return z.generateAsync({ type: 'nodebuffer' });
      },
      /is a zip file but not an Excel workbook \(\.xlsx\)/,
    ],
    [
      'a workbook whose sheet part is not well-formed',
      async () => {
        const z = await JSZip.loadAsync(fs.readFileSync(path.join(FIXTURES, 'printable.xlsx')));
        z.file('xl/worksheets/sheet1.xml', '<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData><row r="1"><c r="A1"');
        return z.generateAsync({ type: 'nodebuffer' });
      },
      /is damaged: its part xl\/worksheets\/sheet1\.xml is not well-formed XML/,
    ],
  ];
  test.each(cases)('%s: a plain message naming the file, exit 1, nothing written', async (_what, make, message) => {
    const dir = tempDir('notxlsx');
    const tpl = path.join(dir, 'template.xlsx');
    fs.writeFileSync(tpl, await make());
    const r = await leeway('fill', '--table', TABLE, '--template', tpl, '--out', path.join(dir, 'o.xlsx'));
    expect(r.code).toBe(1);
    const err = r.err.join('\n');
    expect(err).toMatch(/^leeway: cannot read the template .*template\.xlsx: /);
    expect(err).toMatch(message);
    expect(err).not.toMatch(/Cannot read properties|undefined|null|https?:|at [\w.]+ \(/);
    expect(strayFiles(dir, ['template.xlsx'])).toEqual([]);
  });
});

describe('printed: LibreOffice renders a filled template to PDF', () => {
  const which = (cmd: string): string => {
    try {
      return execFileSync('sh', ['-c', `command -v ${cmd}`], { encoding: 'utf8' }).trim();
    } catch {
      return '';
    }
  };

  test.each(['printable.xlsx', 'printable-libreoffice.xlsx'])('%s: the provenance and the caution print whole, on the page of the figures', async (file) => {
    const soffice = which('soffice') || which('libreoffice');
    const pdftotext = which('pdftotext');
    const pdftoppm = which('pdftoppm');
    if (!soffice || !pdftotext || !pdftoppm) {
      console.log(`SKIPPED: ${!soffice ? 'soffice (LibreOffice)' : 'pdftotext/pdftoppm (poppler-utils)'} is not installed; the print check of ${file} did not run`);
      return;
    }
    const { out, dir } = await fill(file);
    const pdfDir = path.join(dir, 'pdf');
    fs.mkdirSync(pdfDir);
    execFileSync(soffice, ['--headless', `-env:UserInstallation=file://${path.join(dir, 'lo-profile')}`, '--convert-to', 'pdf', '--outdir', pdfDir, out], { stdio: 'pipe', timeout: 180000 });
    const pdf = path.join(pdfDir, 'filled.pdf');
    const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [pdf], { encoding: 'utf8' }))![1]);
    expect(pages).toBe(1);
    const page1 = execFileSync(pdftotext, ['-f', '1', '-l', '1', '-layout', pdf, '-'], { encoding: 'utf8' });
    // The figures: the header, an analyte row and its allowable total error shown to two decimals.
    expect(page1).toMatch(/Allowable\s+Allowable\s+total error/);
    expect(page1).toMatch(/Arvelin\s+Serum\s+5\.7\s+6\.9\s+2\.85\s+2\.24\s+6\.94/);
    // The block, with whole labels and the caution's last words.
    for (const t of ['Leeway — analytical performance specifications', 'Tier (whole sheet)', 'z (coverage factor)', 'desirable', 'Table: table.csv', 'Table SHA-256:', 'Filled on: 2026-02-03', `Program: Leeway ${VERSION}`, 'critically appraised source.']) {
      expect(page1).toContain(t);
    }
    const words = page1.replace(/\s+/g, ' ');
    expect(words).toContain(CAUTION.replace(/\s+/g, ' ').slice(-60));
    // The picture, kept for a look: out/templates/<file>-1.png.
    const keep = path.join(__dirname, '..', '..', 'out', 'templates');
    fs.mkdirSync(keep, { recursive: true });
    execFileSync(pdftoppm, ['-png', '-r', '70', '-f', '1', '-l', '1', pdf, path.join(keep, file.replace(/\.xlsx$/, ''))]);
    expect(fs.readdirSync(keep).some((f) => f.startsWith(file.replace(/\.xlsx$/, '')) && f.endsWith('.png'))).toBe(true);
  }, 200000);
});
