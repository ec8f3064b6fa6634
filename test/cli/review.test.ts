/**
 * `leeway review` as a user runs it: the workbook read back with exceljs and every figure checked
 * against the worksheet functions evaluated independently through the registry; the bad inputs a
 * results file can hold; usage errors.
 */
import * as fs from 'fs';
import * as path from 'path';
import { createHash } from 'crypto';
import ExcelJS from 'exceljs';
import { leeway, tempDir, strayFiles } from './support';
import { evaluate } from '../../src/registry';
import type { OutCell } from '../../src/registry/types';
import { typedFormula } from '../../src/cli/xlsx';
import { CAUTION } from '../../src/engine/caution';
import { SIGN_OFF_TITLE, shownText } from '../../src/cli/document';
import { NO_FLAG } from '../../src/cli/review/materialSheet';
import { QC_REVIEW } from '../../src/registry/catalogue/qc';
import { CONTROL_EVENTS, DEMO_MARKER } from '../../src/engine/demo';

const DATE = '2026-02-03';

interface Row {
  analyte: string;
  level: string;
  run: string;
  date: string;
  value: number;
  target: number;
  sd: number;
}

/**
 * Two analytes, two materials, 12 runs each. Planted (z = (value − 100)/2 on L1, (value − 200)/4
 * on L2): ALPHA run 4 holds L1 z = +2.5 and L2 z = +2.25 (2-2s across materials within the run,
 * fired at the run's second result); ALPHA run 9 holds L1 z = −3.5 (1-3s); BETA run 6 L2 z =
 * +3.25 (1-3s). Other results are small, alternating in sign.
 */
function fixtureRows(): Row[] {
  const rows: Row[] = [];
  for (const analyte of ['ALPHA', 'BETA']) {
    for (let k = 1; k <= 12; k++) {
      const date = `2025-03-${String(k).padStart(2, '0')}`;
      let z1 = (k % 2 ? 0.4 : -0.3) + k / 100;
      let z2 = (k % 3 ? -0.2 : 0.5) - k / 200;
      if (analyte === 'ALPHA' && k === 4) [z1, z2] = [2.5, 2.25];
      if (analyte === 'ALPHA' && k === 9) z1 = -3.5;
      if (analyte === 'BETA' && k === 6) z2 = 3.25;
      const run = `${analyte[0]}${k}`;
      rows.push({ analyte, level: 'L1', run, date, value: 100 + 2 * z1, target: 100, sd: 2 });
      rows.push({ analyte, level: 'L2', run, date, value: 200 + 4 * z2, target: 200, sd: 4 });
    }
  }
  return rows;
}

function csv(rows: readonly Row[]): string {
  return ['analyte,level,run,date,value,target,sd', ...rows.map((r) => [r.analyte, r.level, r.run, r.date, r.value, r.target, r.sd].join(','))].join('\n') + '\n';
}

const col = <T>(xs: readonly T[]): T[][] => xs.map((x) => [x]);

function labelledFigures(name: string, args: Parameters<typeof evaluate>[1]): Map<string, OutCell> {
  const out = evaluate(name, args);
  return new Map(out[0].map((l, i) => [String(l), out[1][i]]));
}

/** A cell's cached result (formula cells) or value. */
function cachedOf(cell: ExcelJS.Cell): unknown {
  const v = cell.value;
  // exceljs leaves a cached 0 out of the formula value it reads back; cell.result has it.
  if (v && typeof v === 'object' && ('formula' in v || 'sharedFormula' in v)) return cell.result;
  return v;
}

/** A cell's formula as typed (a shared formula's row moved to this cell), or ''. */
function formulaOf(cell: ExcelJS.Cell): string {
  return cell.formula ? typedFormula(cell.formula) : '';
}

/** The rows of a sheet's table under the header whose first cell is `first`. */
function tableRows(ws: ExcelJS.Worksheet, first: string): number[] {
  let header = 0;
  ws.eachRow((row, r) => {
    if (!header && row.getCell(1).value === first) header = r;
  });
  const rows: number[] = [];
  for (let r = header + 1; r <= ws.rowCount && ws.getCell(r, 3).value !== null && typeof ws.getCell(r, 3).value === 'number'; r++) rows.push(r);
  return rows;
}

function rowOfLabel(ws: ExcelJS.Worksheet, label: string): number {
  let found = 0;
  ws.eachRow((row, r) => {
    if (!found && row.getCell(1).value === label) found = r;
  });
  return found;
}

function sheetText(ws: ExcelJS.Worksheet): string {
  const parts: string[] = [];
  ws.eachRow((row) => row.eachCell((c) => void parts.push(shownText(c))));
  return parts.join('\n');
}

async function readBack(file: string): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  return wb;
}

describe('leeway review', () => {
  const dir = tempDir('review');
  const rows = fixtureRows();
  const resultsFile = path.join(dir, 'results.csv');
  fs.writeFileSync(resultsFile, csv(rows));
  const out = path.join(dir, 'review.xlsx');
  let wb: ExcelJS.Workbook;

  beforeAll(async () => {
    const r = await leeway('review', '--results', resultsFile, '--out', out, '--date', DATE);
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.out[0]).toMatch(/48 control results, 2 analytes, 4 analyte × material sheets/);
    wb = await readBack(out);
  }, 60000);

  test('writes a summary, one sheet per analyte and material, and the results as read, in that order', () => {
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Summary', 'ALPHA L1', 'ALPHA L2', 'BETA L1', 'BETA L2', 'Results']);
    expect(strayFiles(dir, ['results.csv', 'review.xlsx'])).toEqual([]);
  });

  test('every sheet carries the provenance (file, SHA-256, rows, rule, date, version), the caution and the sign-off', () => {
    const sha = createHash('sha256').update(fs.readFileSync(resultsFile)).digest('hex');
    for (const ws of wb.worksheets) {
      const text = sheetText(ws);
      expect(text).toContain(`Results file: results.csv, 48 rows, SHA-256 ${sha}`);
      expect(text).toContain('Rule: 1-3s/2-2s/R-4s for every analyte (the default)');
      expect(text).toContain(`reviewed ${DATE} with Leeway`);
      expect(text.replace(/\s+/g, ' ')).toContain(CAUTION);
      expect(text).toContain(SIGN_OFF_TITLE);
      expect(ws.headerFooter.oddFooter).toContain(DATE);
    }
  });

  test('flags are live QC.FLAGS formulas over the analyte\'s block of every material, cached with the registry\'s flags', () => {
    for (const analyte of ['ALPHA', 'BETA']) {
      const block = rows.filter((r) => r.analyte === analyte);
      const expected = evaluate('QC.FLAGS', [col(block.map((r) => r.value)), col(block.map((r) => r.target)), col(block.map((r) => r.sd)), '1-3s/2-2s/R-4s', col(block.map((r) => r.run)), col(block.map((r) => r.level))]).map((r) => r[0]);
      for (const level of ['L1', 'L2']) {
        const ws = wb.getWorksheet(`${analyte} ${level}`)!;
        const table = tableRows(ws, 'Run');
        const mine = block.map((r, i) => ({ r, i })).filter((x) => x.r.level === level);
        expect(table.length).toBe(mine.length);
        table.forEach((row, k) => {
          const flags = ws.getCell(row, 7);
          expect(formulaOf(flags)).toMatch(/^=IF\(INDEX\(LEEWAY\.QC\.FLAGS\(Results!\$F\$\d+:\$F\$\d+,/);
          // The result is found by its row in the file, written beside it.
          expect(formulaOf(flags)).toContain(`MATCH($H${row},Results!$A$`);
          expect(ws.getCell(row, 8).value).toBe(rows.indexOf(mine[k].r) + 2);
          expect(cachedOf(flags)).toBe(expected[mine[k].i] === '' ? NO_FLAG : expected[mine[k].i]);
          // z is a plain formula with its value cached.
          expect(formulaOf(ws.getCell(row, 6))).toBe(`=(C${row}-D${row})/E${row}`);
          expect(cachedOf(ws.getCell(row, 6))).toBeCloseTo((mine[k].r.value - mine[k].r.target) / mine[k].r.sd, 12);
        });
      }
    }
  });

  test('the planted flags show: 2-2s across materials in one run, 1-3s on single results', () => {
    const flagOf = (sheet: string, run: string): unknown => {
      const ws = wb.getWorksheet(sheet)!;
      const row = tableRows(ws, 'Run').find((r) => ws.getCell(r, 1).value === run)!;
      return cachedOf(ws.getCell(row, 7));
    };
    expect(flagOf('ALPHA L2', 'A4')).toBe('2-2s');
    expect(flagOf('ALPHA L1', 'A4')).toBe(NO_FLAG);
    expect(flagOf('ALPHA L1', 'A9')).toBe('1-3s');
    expect(flagOf('BETA L2', 'B6')).toBe('1-3s');
  });

  test('review figures are INDEX(QC.REVIEW(…),2,k) formulas cached with the registry\'s figures, for the material alone and for all materials', () => {
    for (const analyte of ['ALPHA', 'BETA']) {
      const block = rows.filter((r) => r.analyte === analyte);
      const all = labelledFigures('QC.REVIEW', [col(block.map((r) => r.value)), col(block.map((r) => r.target)), col(block.map((r) => r.sd)), '1-3s/2-2s/R-4s', col(block.map((r) => r.run)), col(block.map((r) => r.level))]);
      for (const level of ['L1', 'L2']) {
        const own = block.filter((r) => r.level === level);
        const alone = labelledFigures('QC.REVIEW', [col(own.map((r) => r.value)), col(own.map((r) => r.target)), col(own.map((r) => r.sd)), '1-3s/2-2s/R-4s', col(own.map((r) => r.run))]);
        const ws = wb.getWorksheet(`${analyte} ${level}`)!;
        QC_REVIEW.labels.forEach((label, k) => {
          const r = rowOfLabel(ws, label);
          expect(r).toBeGreaterThan(0);
          expect(formulaOf(ws.getCell(r, 2))).toMatch(new RegExp(`^=INDEX\\(LEEWAY\\.QC\\.REVIEW\\(\\$C\\$\\d+:\\$C\\$\\d+,.*\\),2,${k + 1}\\)$`));
          expect(formulaOf(ws.getCell(r, 3))).toMatch(new RegExp(`^=INDEX\\(LEEWAY\\.QC\\.REVIEW\\(Results!.*,Results!\\$C\\$\\d+:\\$C\\$\\d+\\),2,${k + 1}\\)$`));
          expect(cachedOf(ws.getCell(r, 2))).toEqual(alone.get(label));
          expect(cachedOf(ws.getCell(r, 3))).toEqual(all.get(label));
        });
        const cvRow = rowOfLabel(ws, 'Observed CV %');
        expect(formulaOf(ws.getCell(cvRow, 2))).toMatch(/^=LEEWAY\.DATA\.CV\(\$C\$\d+:\$C\$\d+\)$/);
        expect(cachedOf(ws.getCell(cvRow, 2))).toEqual(evaluate('DATA.CV', [col(own.map((r) => r.value))])[0][0]);
      }
    }
  });

  test('the Summary gives each material\'s figures and says which rule was used', () => {
    const ws = wb.getWorksheet('Summary')!;
    const header = rowOfLabel(ws, 'Analyte');
    const names: string[] = [];
    ws.getRow(header).eachCell((c) => void names.push(String(c.value)));
    const at = (label: string): number => names.indexOf(label) + 1;
    const beta2 = header + 4;
    expect([ws.getCell(beta2, 1).value, ws.getCell(beta2, 2).value]).toEqual(['BETA', 'L2']);
    expect(ws.getCell(beta2, at('Rule')).value).toBe('1-3s/2-2s/R-4s');
    expect(String(ws.getCell(beta2, at('Rule from')).value)).toBe('default');
    expect(ws.getCell(beta2, at('Runs flagged')).value).toBe(1);
    expect(ws.getCell(beta2, at('Results')).value).toBe(12);
  });

  test('a chart picture on every analyte sheet, a PNG no wider than the printed columns', () => {
    for (const ws of wb.worksheets.filter((w) => !['Summary', 'Results'].includes(w.name))) {
      const images = ws.getImages();
      expect(images).toHaveLength(1);
      const media = wb.getImage(Number(images[0].imageId));
      expect(media.extension).toBe('png');
      const png = media.buffer as unknown as Buffer;
      expect([...png.subarray(1, 4)].map((b) => String.fromCharCode(b)).join('')).toBe('PNG');
      const shownWidth = (images[0].range as unknown as { ext?: { width: number } }).ext?.width;
      expect(shownWidth).toBeDefined();
      // Column widths in points (a unit ≈ 7 px at 96 dpi ≈ 5.25 points; common practice, no source).
      let units = 0;
      for (let c = 1; c <= 8; c++) units += ws.getColumn(c).width ?? 9;
      expect(shownWidth!).toBeLessThanOrEqual(units * 7);
    }
  });
});

describe('leeway review with a variation table, a rule and the laboratory\'s run size', () => {
  test('allowances, sigma and run size are the registry\'s, and a run size over the computed one is said plainly', async () => {
    const dir = tempDir('review-table');
    const rows = fixtureRows();
    const resultsFile = path.join(dir, 'results.csv');
    fs.writeFileSync(resultsFile, csv(rows));
    const tableFile = path.join(dir, 'table.csv');
    fs.writeFileSync(tableFile, 'analyte,cvi,cvg,source\nALPHA,5.0,8.0,invented for a test\nBETA,2.0,3.0,invented for a test\n');
    const out = path.join(dir, 'review.xlsx');
    const r = await leeway('review', '--results', resultsFile, '--out', out, '--date', DATE, '--table', tableFile, '--tier', 'minimum', '--rule', '1-3s/2-2s', '--run-size', '500');
    expect(r.code).toBe(0);
    const wb = await readBack(out);
    const ws = wb.getWorksheet('ALPHA L1')!;
    const own = rows.filter((x) => x.analyte === 'ALPHA' && x.level === 'L1');
    const cv = evaluate('DATA.CV', [col(own.map((x) => x.value))])[0][0] as number;
    const bias = evaluate('DATA.BIAS', [col(own.map((x) => x.value)), col(own.map((x) => x.target))])[0][0] as number;
    const total = evaluate('SPEC.TOTAL', [5, 8, 'minimum'])[0][0] as number;
    const value = (label: string): unknown => ws.getCell(rowOfLabel(ws, label), 2).value;
    expect(value('Allowable CV % (minimum)')).toBeCloseTo(evaluate('SPEC.CV', [5, 'minimum'])[0][0] as number, 12);
    expect(value('Allowable total % (minimum)')).toBeCloseTo(total, 12);
    expect(value('Sigma')).toBeCloseTo(evaluate('PERF.SIGMA', [total, bias, cv])[0][0] as number, 10);
    // Two materials per run: the run size is read with n = 2.
    const runSize = evaluate('QC.RUNSIZE', [total, bias, cv, '1-3s/2-2s', 2])[0][0] as number;
    expect(value('Run size (QC.RUNSIZE)')).toBe(runSize);
    const summary = sheetText(wb.getWorksheet('Summary')!);
    expect(summary).toContain('Rule: 1-3s/2-2s for every analyte');
    // The statement is made exactly when 500 exceeds the computed run size; the column says which.
    const statement = `ALPHA L1: the laboratory's 500 patient results between QC events exceed the computed run size of ${runSize}.`;
    expect(summary.includes(statement)).toBe(500 > runSize);
    expect(summary).toContain(500 > runSize ? 'exceeds' : 'within');
    expect(sheetText(ws).includes(`Note: the laboratory's 500 patient results`)).toBe(500 > runSize);
  }, 60000);

  test('without --rule the rule is the QC plan of the material with the lowest sigma, and each row says so', async () => {
    const dir = tempDir('review-plan');
    const resultsFile = path.join(dir, 'results.csv');
    fs.writeFileSync(resultsFile, csv(fixtureRows()));
    const tableFile = path.join(dir, 'table.csv');
    fs.writeFileSync(tableFile, 'analyte,cvi,cvg,source\nALPHA,5.0,8.0,invented for a test\n');
    const out = path.join(dir, 'review.xlsx');
    const r = await leeway('review', '--results', resultsFile, '--out', out, '--date', DATE, '--table', tableFile);
    expect(r.code).toBe(0);
    const wb = await readBack(out);
    const summary = sheetText(wb.getWorksheet('Summary')!);
    expect(summary).toMatch(/ALPHA: rule \S+, QC plan of L[12], the material with the lowest sigma/);
    expect(summary).toContain('BETA: the table table.csv has no analyte BETA.');
    expect(sheetText(wb.getWorksheet('BETA L1')!)).toContain('Rule 1-3s/2-2s/R-4s (default)');
  }, 60000);
});

describe('leeway review --eqa: the EQA results across rounds as one more sheet', () => {
  test('scores are the registry\'s, the limit comes from the table\'s fixed limit, the source is named by its SHA-256', async () => {
    const dir = tempDir('review-eqa');
    const resultsFile = path.join(dir, 'results.csv');
    fs.writeFileSync(resultsFile, csv(fixtureRows()));
    const tableFile = path.join(dir, 'table.csv');
    fs.writeFileSync(tableFile, 'analyte,cvi,cvg,source,limit_pct\nALPHA,5.0,8.0,invented for a test,6\n');
    const eqaFile = path.join(dir, 'eqa.csv');
    // ALPHA round 2: z = (105 − 100)/2 = 2.5, questionable, deviation 5 % within the 6 % limit;
    // round 3: z′ with u_assigned 1 > 0.3·sd_pt, deviation 8 % beyond it. Hand-computed.
    const eqaText = 'analyte,round,result,assigned,sd_pt,u_assigned,u_result\nALPHA,R1,101,100,2,0,0.5\nALPHA,R2,105,100,2,0,0.5\nALPHA,R3,108,100,2,1,\n';
    fs.writeFileSync(eqaFile, eqaText);
    const out = path.join(dir, 'review.xlsx');
    const r = await leeway('review', '--results', resultsFile, '--out', out, '--date', DATE, '--table', tableFile, '--eqa', eqaFile);
    expect(r.code).toBe(0);
    expect(r.out.join('\n')).toContain('an EQA sheet (3 EQA results)');
    const wb = await readBack(out);
    const ws = wb.getWorksheet('EQA');
    expect(ws).toBeDefined();
    const text = sheetText(ws!);
    expect(text).toContain(`SHA-256 ${createHash('sha256').update(eqaText).digest('hex')}`);
    expect(text.replace(/\s+/g, ' ')).toContain(CAUTION);
    expect(text).toContain('questionable');
    const formulas: { typed: string; result: unknown }[] = [];
    ws!.eachRow((row) => row.eachCell((cell) => {
      const v = cell.value as { formula?: string; result?: unknown } | null;
      if (v && typeof v === 'object' && typeof v.formula === 'string') formulas.push({ typed: typedFormula(v.formula), result: v.result });
    }));
    const scores = formulas.filter((f) => f.typed.startsWith('=LEEWAY.EQA.ZSCORE('));
    expect(scores.map((f) => f.result)).toEqual([
      evaluate('EQA.ZSCORE', [101, 100, 2, 0])[0][0],
      evaluate('EQA.ZSCORE', [105, 100, 2, 0])[0][0],
      evaluate('EQA.ZSCORE', [108, 100, 2, 1])[0][0],
    ]);
    expect(formulas.filter((f) => f.typed.startsWith('=LEEWAY.EQA.ZETA(')).map((f) => f.result)).toEqual([
      evaluate('EQA.ZETA', [101, 100, 0.5, 0])[0][0],
      evaluate('EQA.ZETA', [105, 100, 0.5, 0])[0][0],
    ]);
    // Two of the three rounds within the table's 6 % limit (1 % and 5 %; 8 % is not).
    expect(text).toContain('2 of 3');
  }, 60000);

  test('an EQA file with errors is reported and nothing is written', async () => {
    const dir = tempDir('review-eqa-bad');
    const resultsFile = path.join(dir, 'results.csv');
    fs.writeFileSync(resultsFile, csv(fixtureRows()));
    const eqaFile = path.join(dir, 'eqa.csv');
    fs.writeFileSync(eqaFile, 'analyte,round,result,assigned,sd_pt\nALPHA,R1,101,100,0\n');
    const out = path.join(dir, 'review.xlsx');
    const r = await leeway('review', '--results', resultsFile, '--out', out, '--date', DATE, '--eqa', eqaFile);
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/sd_pt must be greater than 0/);
    expect(r.err.join('\n')).toMatch(/nothing was written/);
    expect(fs.existsSync(out)).toBe(false);
  }, 60000);
});

describe('leeway review refuses bad input and writes nothing', () => {
  const dir = tempDir('review-bad');
  async function attempt(name: string, text: string): Promise<{ code: number; err: string; written: boolean }> {
    const file = path.join(dir, `${name}.csv`);
    fs.writeFileSync(file, text);
    const out = path.join(dir, `${name}.xlsx`);
    const r = await leeway('review', '--results', file, '--out', out, '--date', DATE);
    return { code: r.code, err: r.err.join('\n'), written: fs.existsSync(out) };
  }

  test('a missing required column', async () => {
    const r = await attempt('missing', 'analyte,level,run,value,target\nA,L1,1,10,10\n');
    expect(r).toMatchObject({ code: 1, written: false });
    expect(r.err).toMatch(/sd/);
    expect(r.err).toMatch(/nothing was written/);
  });

  test('a value that is not a number, named by row and column', async () => {
    const r = await attempt('nan', 'analyte,level,run,value,target,sd\nA,L1,1,10,10,1\nA,L1,2,ten,10,1\n');
    expect(r).toMatchObject({ code: 1, written: false });
    expect(r.err).toMatch(/row 3/i);
    expect(r.err).toMatch(/\bD\b|column D|D3/);
  });

  test('an SD of zero or below', async () => {
    const r = await attempt('sd', 'analyte,level,run,value,target,sd\nA,L1,1,10,10,1\nA,L1,2,10,10,0\nA,L1,3,10,10,-1\n');
    expect(r).toMatchObject({ code: 1, written: false });
    expect(r.err).toMatch(/sd must be greater than 0/);
  });

  test('a run label shared by two analytes is reported and the review goes on, each analyte reading its own run', async () => {
    const text = 'analyte,level,run,value,target,sd\nA,L1,R1,10,10,1\nB,L1,R1,5,5,1\nA,L1,R2,10.5,10,1\nB,L1,R2,5.2,5,1\n';
    const r = await attempt('shared', text);
    expect(r).toMatchObject({ code: 0, written: true });
    expect(r.err).toMatch(/run "R1" holds results of B here and of A/);
  });

  test('dates out of order are reported, and the sheet keeps the file order', async () => {
    const text = 'analyte,level,run,date,value,target,sd\nA,L1,R1,2025-01-02,10,10,1\nA,L1,R2,2025-01-01,11,10,1\nA,L1,R3,2025-01-03,9,10,1\n';
    const r = await attempt('unsorted', text);
    expect(r).toMatchObject({ code: 0, written: true });
    expect(r.err).toMatch(/date/i);
    const wb = await readBack(path.join(dir, 'unsorted.xlsx'));
    const ws = wb.getWorksheet('A L1')!;
    expect(tableRows(ws, 'Run').map((row) => ws.getCell(row, 1).value)).toEqual(['R1', 'R2', 'R3']);
  });

  test('usage errors exit 2: no results file, a bad rule, a bad run size, --tier without a table', async () => {
    const out = path.join(dir, 'never.xlsx');
    const file = path.join(dir, 'ok.csv');
    fs.writeFileSync(file, 'analyte,level,run,value,target,sd\nA,L1,1,10,10,1\n');
    expect((await leeway('review', '--out', out)).code).toBe(2);
    const bad = await leeway('review', '--results', file, '--out', out, '--rule', '1-3q');
    expect(bad.code).toBe(2);
    expect(bad.err.join('\n')).toMatch(/--rule 1-3q/);
    expect((await leeway('review', '--results', file, '--out', out, '--run-size', '0')).code).toBe(2);
    expect((await leeway('review', '--results', file, '--out', out, '--tier', 'minimum')).code).toBe(2);
    expect(fs.existsSync(out)).toBe(false);
  });

  test('an existing output is kept unless --force', async () => {
    const file = path.join(dir, 'ok2.csv');
    fs.writeFileSync(file, 'analyte,level,run,value,target,sd\nA,L1,1,10,10,1\nA,L1,2,11,10,1\n');
    const out = path.join(dir, 'kept.xlsx');
    fs.writeFileSync(out, 'mine');
    const r = await leeway('review', '--results', file, '--out', out);
    expect(r.code).toBe(1);
    expect(fs.readFileSync(out, 'utf8')).toBe('mine');
    expect((await leeway('review', '--results', file, '--out', out, '--force')).code).toBe(0);
  });
});

describe('leeway review --demo', () => {
  test('reviews the invented year against the demo table: every sheet marked DEMO, the planted shift and loss of precision stand out', async () => {
    const dir = tempDir('review-demo');
    const out = path.join(dir, 'demo.xlsx');
    const r = await leeway('review', '--demo', '--out', out, '--date', DATE);
    expect(r.code).toBe(0);
    expect(r.err).toEqual([]);
    expect(r.out[0]).toContain(DEMO_MARKER);
    const wb = await readBack(out);
    // Summary, 12 analytes × 2 materials, Results, and the EQA sheet of the demo's invented rounds.
    expect(wb.worksheets).toHaveLength(2 + 12 * 2 + 1);
    expect(wb.worksheets[wb.worksheets.length - 1].name).toBe('EQA');
    expect(r.out[0]).toContain('the EQA sheet of the invented rounds');
    for (const ws of wb.worksheets) {
      expect(sheetText(ws)).toContain(DEMO_MARKER);
      expect(ws.headerFooter.oddHeader).toContain(DEMO_MARKER);
    }
    // SD of z of the material alone: the month of doubled SD lifts Irvastine's; Brontase's share of
    // runs flagged, all materials, is the highest of all (the month of shift).
    const sheet = wb.getWorksheet('Summary')!;
    const header = rowOfLabel(sheet, 'Analyte');
    const names: string[] = [];
    sheet.getRow(header).eachCell((c) => void names.push(String(c.value)));
    const at = (label: string): number => names.indexOf(label) + 1;
    const rowsOf = new Map<string, number[]>();
    for (let r = header + 1; typeof sheet.getCell(r, at('Results')).value === 'number'; r++) {
      const a = String(sheet.getCell(r, 1).value);
      rowsOf.set(a, [...(rowsOf.get(a) ?? []), r]);
    }
    expect(rowsOf.size).toBe(12);
    const allFlagged = (a: string): number => Number(sheet.getCell(rowsOf.get(a)![0], at('Runs flagged, all materials')).value) / Number(sheet.getCell(rowsOf.get(a)![0], at('Runs')).value);
    const sdZ = (a: string): number => Math.max(...rowsOf.get(a)!.map((r) => Number(sheet.getCell(r, at('SD of z')).value)));
    for (const a of rowsOf.keys()) {
      if (a !== CONTROL_EVENTS.shift.analyte) expect(allFlagged(CONTROL_EVENTS.shift.analyte)).toBeGreaterThan(allFlagged(a));
      if (a !== CONTROL_EVENTS.imprecision.analyte && a !== CONTROL_EVENTS.shift.analyte) expect(sdZ(CONTROL_EVENTS.imprecision.analyte)).toBeGreaterThan(sdZ(a));
    }
  }, 120000);
});
