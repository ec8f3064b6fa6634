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
import { demoData, demoTable, demoVerification } from '../../src/engine/demo';
import { evaluate, findFunction } from '../../src/registry';
import type { Arg } from '../../src/registry';
import { relClose } from '../support/prng';

const SHEETS = ['Summary', 'Specifications', 'Replication', 'Verification', 'Verification data', 'EQA', 'Comparison', 'Performance', 'QC plan', 'Uncertainty'];

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

  test('the sheets, each marked as demo data with the caution', () => {
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

/** The row of a sheet whose first cell is `text` (after row `after`). */
function rowOf(ws: ExcelJS.Worksheet, text: string, after = 0): number {
  let found = 0;
  ws.eachRow((row, r) => {
    if (!found && r > after && row.getCell(1).value === text) found = r;
  });
  if (!found) throw new Error(`no row "${text}" on ${ws.name}`);
  return found;
}

/** A table under a bold heading: its header labels and its rows until the first empty first cell. */
function tableUnder(ws: ExcelJS.Worksheet, heading: string): { header: string[]; rows: ExcelJS.Row[]; top: number } {
  const h = rowOf(ws, heading) + 1;
  const header: string[] = [];
  ws.getRow(h).eachCell((c) => void header.push(String(c.value)));
  const rows: ExcelJS.Row[] = [];
  // Table rows have a second cell of their own; a note under a table is a line in the first cell alone (merged across the row when it wraps).
  for (let r = h + 1; ws.getRow(r).getCell(2).value !== null && !ws.getRow(r).getCell(2).isMerged; r++) rows.push(ws.getRow(r));
  return { header, rows, top: h + 1 };
}

const cellOf = (row: ExcelJS.Row, header: string[], label: string): ExcelJS.CellValue => {
  const k = header.indexOf(label);
  if (k < 0) throw new Error(`no column "${label}" in ${header.join(' | ')}`);
  return row.getCell(k + 1).value;
};

/** A labelled spill as label → value. */
function spill(name: string, args: readonly Arg[]): Map<string, unknown> {
  const out = evaluate(name, args);
  return new Map(out[0].map((l, i) => [String(l), out[1][i]]));
}

/** Splits a formula's argument list at its top-level commas. */
function splitArgs(text: string): string[] {
  const out: string[] = [];
  let depth = 0;
  let quoted = false;
  let cur = '';
  for (const ch of text) {
    if (ch === '"') quoted = !quoted;
    if (!quoted && ch === '(') depth++;
    if (!quoted && ch === ')') depth--;
    if (!quoted && depth === 0 && ch === ',') {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out;
}

/** Resolves a formula argument against the workbook: a range (a column of values), a cell's value, a number or a text. */
function argOf(wb: ExcelJS.Workbook, sheet: ExcelJS.Worksheet, text: string): Arg {
  if (/^".*"$/.test(text)) return text.slice(1, -1);
  if (/^-?\d+(\.\d+)?$/.test(text)) return Number(text);
  const m = /^(?:'?([A-Za-z ]+)'?!)?([A-Z]+)(\d+)(?::(?:'?[A-Za-z ]+'?!)?([A-Z]+)(\d+))?$/.exec(text);
  if (!m) throw new Error(`cannot read the argument ${text}`);
  const ws = m[1] ? wb.getWorksheet(m[1])! : sheet;
  const value = (r: number): Arg => ws.getCell(`${m[2]}${r}`).value as Arg;
  if (!m[4]) return value(Number(m[3]));
  expect(m[4]).toBe(m[2]);
  const rows: Arg[][] = [];
  for (let r = Number(m[3]); r <= Number(m[5]); r++) rows.push([value(r) as never]);
  return rows as Arg;
}

/** The value of one listed formula, computed by the registry from the workbook's own cells. */
function evaluateFormula(wb: ExcelJS.Workbook, ws: ExcelJS.Worksheet, formula: string): unknown {
  const ref = /^=([A-Z]+\d+)$/.exec(formula);
  if (ref) return ws.getCell(ref[1]).value;
  const indexed = /^=INDEX\(LEEWAY\.([A-Z.]+)\((.*)\),2,(\d+)\)$/.exec(formula);
  const plain = /^=LEEWAY\.([A-Z.]+)\((.*)\)$/.exec(formula);
  const m = indexed ?? plain;
  if (!m) throw new Error(`cannot read the formula ${formula}`);
  const out = evaluate(m[1], splitArgs(m[2]).map((a) => argOf(wb, ws, a)));
  return indexed ? out[1][Number(indexed[3]) - 1] : out[0][0];
}

describe('leeway demo: the verification sheet', () => {
  let wb: ExcelJS.Workbook;
  let ws: ExcelJS.Worksheet;
  beforeAll(async () => {
    wb = (await build()).wb;
    ws = wb.getWorksheet('Verification')!;
  });

  test('precision and CV limits of every material equal the registry’s on the invented replication data (DATA.PRECISION, VERIFY.PRECISION, DATA.CVLIMITS)', () => {
    const t = tableUnder(ws, 'Precision against the manufacturer’s claims');
    const study = demoVerification();
    expect(t.rows).toHaveLength(study.length * 2 * 2);
    let i = 0;
    for (const a of study) {
      for (const m of a.materials) {
        const values = m.replication.map((x) => [x.result]);
        const groups = m.replication.map((x) => [x.day]);
        const p = spill('DATA.PRECISION', [values, groups]);
        const v = spill('VERIFY.PRECISION', [values, groups, m.claim.repeatability, m.claim.withinLab, 2]);
        for (const [part, cv, df, claim, limit, verified] of [
          ['repeatability', 'Repeatability CV %', v.get('Repeatability df'), m.claim.repeatability, 'Repeatability limit %', 'Repeatability verified'],
          ['within-lab', 'Within-lab CV %', p.get('Within-lab df'), m.claim.withinLab, 'Within-lab limit %', 'Within-lab verified'],
        ] as const) {
          const row = t.rows[i++];
          expect([row.getCell(1).value, row.getCell(2).value, row.getCell(3).value]).toEqual([a.analyte, m.material, part]);
          expect(cellOf(row, t.header, 'CV %')).toBe(p.get(cv));
          expect(cellOf(row, t.header, 'CV %')).toBe(v.get(cv));
          expect(cellOf(row, t.header, 'df')).toBe(df);
          const limits = spill('DATA.CVLIMITS', [p.get(cv) as number, df as number]);
          expect(cellOf(row, t.header, 'CV low 95%')).toBe(limits.get('Low'));
          expect(cellOf(row, t.header, 'CV high 95%')).toBe(limits.get('High'));
          expect(cellOf(row, t.header, 'Claim % (invented)')).toBe(claim);
          expect(cellOf(row, t.header, 'Verification limit %')).toBe(v.get(limit));
          expect(cellOf(row, t.header, 'Verified')).toBe(v.get(verified));
        }
      }
    }
  });

  test('one material is not verified, for a clear reason: Brontase Level 1, within-lab CV above its limit; every other claim is verified', () => {
    const t = tableUnder(ws, 'Precision against the manufacturer’s claims');
    const no = t.rows.filter((r) => cellOf(r, t.header, 'Verified') === 'no');
    expect(no.map((r) => [r.getCell(1).value, r.getCell(2).value, r.getCell(3).value])).toEqual([['Brontase', 'Level 1', 'within-lab']]);
    const row = no[0];
    const cv = cellOf(row, t.header, 'CV %') as number;
    const limit = cellOf(row, t.header, 'Verification limit %') as number;
    const claim = cellOf(row, t.header, 'Claim % (invented)') as number;
    // Clearly above: the CV exceeds its limit by more than a fifth, and even its lower 95 % limit exceeds the claim.
    expect(cv).toBeGreaterThan(1.2 * limit);
    expect(cellOf(row, t.header, 'CV low 95%') as number).toBeGreaterThan(claim);
    // Its repeatability is verified: the excess is the day-to-day effect.
    const rep = t.rows.find((r) => r.getCell(1).value === 'Brontase' && r.getCell(2).value === 'Level 1' && r.getCell(3).value === 'repeatability')!;
    expect(cellOf(rep, t.header, 'Verified')).toBe('yes');
    expect(t.rows.filter((r) => cellOf(r, t.header, 'Verified') === 'yes')).toHaveLength(t.rows.length - 1);
  });

  test('sigma with its limits against the analyte’s allowable total error at the desirable tier (PERF.SIGMALIMITS)', () => {
    const t = tableUnder(ws, 'Sigma with its confidence limits');
    const table = demoTable();
    const data = demoData();
    const study = demoVerification();
    expect(t.rows).toHaveLength(study.length * 2);
    let i = 0;
    for (const a of study) {
      const spec = table.rows.find((r) => r.analyte === a.analyte)!;
      const d = data.find((x) => x.analyte === a.analyte)!;
      const allowable = evaluate('SPEC.TOTAL', [spec.cvi, spec.cvg as number, 'desirable', 1.65])[0][0] as number;
      const bias = evaluate('DATA.BIAS', [d.eqa.map((x) => [x.result]), d.eqa.map((x) => [x.target])])[0][0] as number;
      const uBias = evaluate('MU.BIAS', [d.eqa.map((x) => [(100 * (x.result - x.target)) / x.target]), 0.6])[0][0] as number;
      for (const m of a.materials) {
        const row = t.rows[i++];
        const p = spill('DATA.PRECISION', [m.replication.map((x) => [x.result]), m.replication.map((x) => [x.day])]);
        const s = spill('PERF.SIGMALIMITS', [allowable, bias, p.get('Within-lab CV %') as number, p.get('Within-lab df') as number, uBias]);
        expect(cellOf(row, t.header, 'Allowable total error % (desirable)')).toBe(allowable);
        expect(cellOf(row, t.header, 'Bias % (EQA)')).toBe(bias);
        expect(cellOf(row, t.header, 'u(bias) %')).toBe(uBias);
        expect(cellOf(row, t.header, 'Sigma')).toBe(s.get('Sigma'));
        expect(cellOf(row, t.header, 'Sigma low 95%')).toBe(s.get('Low'));
        expect(cellOf(row, t.header, 'Sigma high 95%')).toBe(s.get('High'));
        expect(s.get('Low') as number).toBeLessThan(s.get('Sigma') as number);
      }
    }
  });

  test('trueness of each material with an assigned value (VERIFY.TRUENESS) and agreement with the comparison data (DATA.AGREEMENT, percent)', () => {
    const tt = tableUnder(ws, 'Trueness against an assigned value');
    const withValue = demoVerification().flatMap((a) => a.materials.filter((m) => m.assigned).map((m) => ({ a, m })));
    expect(tt.rows).toHaveLength(withValue.length);
    withValue.forEach(({ a, m }, i) => {
      const t = spill('VERIFY.TRUENESS', [m.replication.map((x) => [x.result]), m.replication.map((x) => [x.day]), m.assigned!.value, m.assigned!.u, 1]);
      const row = tt.rows[i];
      expect(row.getCell(1).value).toBe(a.analyte);
      for (const l of ['Mean', 'Bias', 'Bias %', 'Standard error', 'df', 'Verification low', 'Verification high', 'Verified']) expect(cellOf(row, tt.header, l)).toBe(t.get(l));
    });
    const ta = tableUnder(ws, `Agreement of Analyser B (new; fictional) with Analyser A (in service; fictional) (the Comparison sheet’s patient samples)`);
    const data = demoData();
    expect(ta.rows.map((r) => r.getCell(1).value)).toEqual(demoVerification().map((a) => a.analyte));
    for (const row of ta.rows) {
      const d = data.find((x) => x.analyte === row.getCell(1).value)!;
      const ag = spill('DATA.AGREEMENT', [d.comparison.map((p) => [p.x]), d.comparison.map((p) => [p.y]), 'percent']);
      expect(cellOf(row, ta.header, 'Pairs')).toBe(40);
      for (const l of ['Mean difference', 'Mean difference low', 'Mean difference high', 'SD of differences', 'Lower limit', 'Lower limit low', 'Lower limit high', 'Upper limit', 'Upper limit low', 'Upper limit high']) {
        expect(cellOf(row, ta.header, `${l} %`)).toBe(ag.get(l));
      }
    }
  });

  test('every figure’s formula, listed on the sheet and computed by the registry from the workbook’s own cells, gives the figure in its cell', () => {
    const head = rowOf(ws, 'Cell');
    expect(ws.getRow(head).getCell(2).value).toBe('Formula');
    let checked = 0;
    const cells = new Set<string>();
    for (let r = head + 1; typeof ws.getRow(r).getCell(2).value === 'string' && String(ws.getRow(r).getCell(2).value).startsWith('='); r++) {
      const address = String(ws.getRow(r).getCell(1).value);
      const formula = String(ws.getRow(r).getCell(2).value);
      cells.add(address);
      expect([address, evaluateFormula(wb, ws, formula)]).toEqual([address, ws.getCell(address).value]);
      checked++;
    }
    // The replication results are read from the Verification data sheet.
    expect(String(ws.getRow(head + 1).getCell(2).value)).toContain("'Verification data'!D");
    // Every computed figure of the four tables has its formula: 6 per precision row, 6 per sigma row, 8 per trueness row, 11 per agreement row.
    expect(checked).toBe(12 * 6 + 6 * 6 + 3 * 8 + 3 * 11);
    expect(cells.size).toBe(checked);
    const spilled = [...cells].map((c) => ws.getCell(c).value);
    expect(spilled.every((v) => typeof v === 'number' || v === 'yes' || v === 'no')).toBe(true);
  });

  test('the difference plots: one PNG picture per analyte, within the printed columns', () => {
    const images = ws.getImages();
    expect(images).toHaveLength(demoVerification().length);
    const media = (wb as unknown as { model: { media: Array<{ extension: string; buffer: Buffer }> } }).model.media;
    let lastCol = 0;
    ws.eachRow((row) => row.eachCell((c, k) => void (lastCol = Math.max(lastCol, k))));
    for (const image of images) {
      const m = media[Number(image.imageId)];
      expect(m.extension).toBe('png');
      expect(m.buffer.subarray(1, 4).toString('latin1')).toBe('PNG');
      const range = image.range as unknown as { tl: { nativeCol: number; nativeColOff: number }; ext: { width: number } };
      // Right edge in pixels inside the sheet's used columns: column widths to pixels by the rule the document layer uses
      // (columnPoints, Excel's own rule); 914,400 EMU per inch at 96 px per inch is 9525 EMU per pixel (ECMA-376, DrawingML).
      let left = 0;
      for (let c = 1; c <= range.tl.nativeCol; c++) left += Math.trunc(((256 * ws.getColumn(c).width! + Math.trunc(128 / 7)) / 256) * 7);
      left += range.tl.nativeColOff / 9525;
      let total = 0;
      for (let c = 1; c <= lastCol; c++) total += Math.trunc(((256 * (ws.getColumn(c).width ?? 9) + Math.trunc(128 / 7)) / 256) * 7);
      expect(left + range.ext.width).toBeLessThanOrEqual(total + 1);
    }
  });
});

describe('leeway demo: run size', () => {
  let wb: ExcelJS.Workbook;
  beforeAll(async () => {
    wb = (await build()).wb;
  });

  test.each(['Summary', 'QC plan'])('the %s sheet shows QC.PLAN’s Run size for every analyte, with a note of what it means', (name) => {
    const ws = wb.getWorksheet(name)!;
    const header = rowOf(ws, 'Analyte');
    const labels: string[] = [];
    ws.getRow(header).eachCell((c) => void labels.push(String(c.value)));
    const col = labels.indexOf('Run size') + 1;
    expect(col).toBeGreaterThan(0);
    const table = demoTable();
    demoData().forEach((d, i) => {
      const row = ws.getRow(header + 1 + i);
      expect(row.getCell(1).value).toBe(d.analyte);
      const allowable = evaluate('SPEC.TOTAL', [table.rows[i].cvi, table.rows[i].cvg as number, 'desirable', 1.65])[0][0] as number;
      const cv = spill('DATA.PRECISION', [d.replication.map((x) => [x.result]), d.replication.map((x) => [x.day])]).get('Within-lab CV %') as number;
      const bias = evaluate('DATA.BIAS', [d.eqa.map((x) => [x.result]), d.eqa.map((x) => [x.target])])[0][0] as number;
      const plan = spill('QC.PLAN', [allowable, bias, cv]);
      expect(row.getCell(col).value).toBe(plan.get('Run size'));
      // The same figure as QC.RUNSIZE of the chosen rule and controls.
      expect(row.getCell(col).value).toBe(evaluate('QC.RUNSIZE', [allowable, bias, cv, plan.get('Rule') as string, plan.get('Controls per run') as number])[0][0]);
    });
    const notes = texts(ws).filter((t) => t.startsWith('Run size:') || t.includes('Parvin'));
    expect(notes.join(' ')).toMatch(/patient results between QC events.*unreliable final results at most 1.*Parvin/);
  });
});
