/**
 * `leeway demo`: every sheet marked as invented demo data and carrying the caution; figures equal
 * the registry's evaluate() on the invented raw data; and the workbook converts to PDF with
 * LibreOffice headless (skipped, saying so, when soffice is not installed).
 */
import * as fs from 'fs';
import * as path from 'path';
import { execFileSync } from 'child_process';
import ExcelJS from 'exceljs';
import { leeway, tempDir, strayFiles } from './support';
import { CAUTION, DEMO_MARKER } from '../../src/engine/fill';
import { demoData, demoTable } from '../../src/engine/demo';
import { evaluate, findFunction } from '../../src/registry';
import { relClose } from '../support/prng';

const SHEETS = ['Summary', 'Specifications', 'Replication', 'EQA', 'Comparison', 'Performance', 'QC plan', 'Uncertainty'];

async function build(): Promise<{ file: string; wb: ExcelJS.Workbook; dir: string }> {
  const dir = tempDir('demo');
  const file = path.join(dir, 'demo.xlsx');
  const r = await leeway('demo', '--out', file, '--date', '2026-02-03');
  expect(r.code).toBe(0);
  expect(r.out[0]).toContain(DEMO_MARKER);
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  return { file, wb, dir };
}

const texts = (ws: ExcelJS.Worksheet): string[] => {
  const out: string[] = [];
  ws.eachRow((row) => row.eachCell((c) => typeof c.value === 'string' && out.push(c.value)));
  return out;
};

describe('leeway demo', () => {
  let built: { file: string; wb: ExcelJS.Workbook; dir: string };
  beforeAll(async () => {
    built = await build();
  });

  test('the sheets, each marked as demo data with the caution of SPEC.md section 9', () => {
    expect(built.wb.worksheets.map((w) => w.name)).toEqual(SHEETS);
    for (const ws of built.wb.worksheets) {
      const t = texts(ws);
      expect(t).toContain(DEMO_MARKER);
      const caution = t.filter((x) => CAUTION.includes(x) && x.length > 20).join(' ');
      expect(caution).toBe(CAUTION);
    }
    expect(strayFiles(built.dir, ['demo.xlsx'])).toEqual([]);
  });

  test('the specifications sheet is the fill planner’s, at the desirable tier, over the twelve invented analytes', () => {
    const ws = built.wb.getWorksheet('Specifications')!;
    const t = texts(ws);
    for (const r of demoTable().rows) expect(t).toContain(r.analyte);
    expect(t).toContain('desirable');
    expect(t).toContain('Demo chemistry (invented)');
  });

  test('the summary’s figures equal the registry’s on the invented raw data', () => {
    const ws = built.wb.getWorksheet('Summary')!;
    let header = 0;
    ws.eachRow((row, r) => {
      if (row.getCell(1).value === 'Analyte' && !header) header = r;
    });
    expect(header).toBeGreaterThan(0);
    const table = demoTable();
    demoData().forEach((d, i) => {
      const row = ws.getRow(header + 1 + i);
      expect(row.getCell(1).value).toBe(d.analyte);
      const te = evaluate('SPEC.TOTAL', [table.rows[i].cvi, table.rows[i].cvg, 'desirable', 1.65])[0][0] as number;
      expect(relClose(row.getCell(3).value as number, te, 1e-15)).toBe(true);
      if (findFunction('DATA.PRECISION')) {
        const p = evaluate('DATA.PRECISION', [d.replication.map((x) => [x.result]), d.replication.map((x) => [x.day])]);
        const cv = p[1][p[0].indexOf('Within-lab CV %')] as number;
        expect(relClose(row.getCell(4).value as number, cv, 1e-15)).toBe(true);
      } else {
        console.log('DATA.PRECISION is not in this build: the summary’s CV column is empty');
      }
      if (findFunction('DATA.BIAS')) {
        const b = evaluate('DATA.BIAS', [d.eqa.map((x) => [x.result]), d.eqa.map((x) => [x.target])])[0][0] as number;
        expect(relClose(row.getCell(5).value as number, b, 1e-15)).toBe(true);
      }
      if (findFunction('QC.PLAN')) expect(typeof row.getCell(10).value).toBe('string');
    });
  });

  test('the EQA sheet: every invented round scored by a live EQA.ZSCORE the registry reproduces, running figures equal DATA.BIAS and DATA.RMSBIAS, a chart per analyte', () => {
    const ws = built.wb.getWorksheet('EQA')!;
    let header = 0;
    ws.eachRow((row, r) => {
      if (!header && row.getCell(1).value === 'Analyte' && row.getCell(2).value === 'Round') header = r;
    });
    expect(header).toBeGreaterThan(0);
    const names: string[] = [];
    ws.getRow(header).eachCell((c, k) => void (names[k] = String(c.value)));
    const col = (n: string) => names.indexOf(n);
    let r = header + 1;
    for (const d of demoData()) {
      d.eqa.forEach((x, i) => {
        const row = ws.getRow(r + i);
        expect(row.getCell(col('Analyte')).value).toBe(d.analyte);
        expect(row.getCell(col('Round')).value).toBe(x.sample);
        expect(row.getCell(col('Result')).value).toBe(x.result);
        expect(row.getCell(col('Assigned value')).value).toBe(x.target);
        const score = row.getCell(col('Score')).value as ExcelJS.CellFormulaValue;
        expect(score.formula).toMatch(/^_xldudf_LEEWAY_EQA_ZSCORE\(/);
        const args = [x.result, x.target, row.getCell(col('sd_pt')).value as number];
        if (row.getCell(col('Score type')).value === 'z′') args.push(row.getCell(col('u(assigned)')).value as number);
        // exceljs reads a cached 0 back as no result (the file holds <v>0</v>).
        expect(evaluate('EQA.ZSCORE', args)[0][0]).toBe(score.result ?? (x.result === x.target ? 0 : 'missing'));
        expect(['satisfactory', 'questionable', 'unsatisfactory']).toContain(row.getCell(col('Band')).value);
      });
      const last = ws.getRow(r + d.eqa.length - 1);
      const results = d.eqa.map((x) => [x.result]);
      const targets = d.eqa.map((x) => [x.target]);
      const mean = evaluate('DATA.BIAS', [results, targets])[0][0] as number;
      const rms = evaluate('DATA.RMSBIAS', [results, targets])[0][0] as number;
      expect(Math.abs((last.getCell(col('Running mean deviation %')).value as number) - mean)).toBeLessThanOrEqual(1e-13 * rms);
      expect(relClose(last.getCell(col('Running RMS deviation %')).value as number, rms, 1e-14)).toBe(true);
      r += d.eqa.length + 1;
    }
    expect(ws.getImages()).toHaveLength(demoData().length);
    expect(texts(ws).some((t) => /provider's own evaluation .* is the one of record/.test(t))).toBe(true);
  });

  test('the EQA sheet’s invented inter-analyser rounds: the consensus is EQA.CONSENSUS’s on the analysers’ results', () => {
    const ws = built.wb.getWorksheet('EQA')!;
    const rows: number[] = [];
    ws.eachRow((row, r) => {
      if (row.getCell(1).value === 'Robust mean') rows.push(r);
    });
    expect(rows).toHaveLength(3);
    for (const h of rows) {
      const values: number[] = [];
      for (let r = h + 3; typeof ws.getCell(r, 2).value === 'number'; r++) values.push(ws.getCell(r, 2).value as number);
      expect(values).toHaveLength(7);
      const c = evaluate('EQA.CONSENSUS', [values.map((v) => [v])]);
      expect(ws.getCell(h + 1, 1).value).toBe(c[1][0]);
      expect(ws.getCell(h + 1, 2).value).toBe(c[1][1]);
      expect(ws.getCell(h + 1, 4).value).toBe(c[1][3]);
    }
  });

  test('an existing output is refused without --force', async () => {
    const r = await leeway('demo', '--out', built.file);
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/exists/);
  });

  test('LibreOffice headless converts it to PDF', () => {
    let soffice: string;
    try {
      soffice = execFileSync('sh', ['-c', 'command -v soffice || command -v libreoffice'], { encoding: 'utf8' }).trim();
    } catch {
      soffice = '';
    }
    if (!soffice) {
      console.log('SKIPPED: soffice (LibreOffice) is not installed; the PDF conversion check did not run');
      return;
    }
    const outDir = path.join(built.dir, 'pdf');
    fs.mkdirSync(outDir);
    execFileSync(soffice, ['--headless', `-env:UserInstallation=file://${path.join(built.dir, 'lo-profile')}`, '--convert-to', 'pdf', '--outdir', outDir, built.file], { stdio: 'pipe', timeout: 180000 });
    const pdf = path.join(outDir, 'demo.pdf');
    expect(fs.existsSync(pdf)).toBe(true);
    const head = fs.readFileSync(pdf).subarray(0, 5).toString('latin1');
    expect(head).toBe('%PDF-');
    expect(fs.statSync(pdf).size).toBeGreaterThan(20000);
  }, 200000);
});
