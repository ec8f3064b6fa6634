/**
 * `leeway fill` end to end: the .xlsx is read back with exceljs and held to the planner's plan and
 * to the registry's evaluate() (the function both front ends run). The worked example CVI 5.7 %,
 * CVG 6.9 %, desirable → total error 6.94 % at z = 1.65 is common practice, no source.
 */
import * as fs from 'fs';
import * as path from 'path';
import { createHash } from 'crypto';
import ExcelJS from 'exceljs';
import { leeway, tempDir, strayFiles, TABLES } from './support';
import { planFill, CAUTION } from '../../src/engine/fill';
import type { FillPlan } from '../../src/engine/fill';
import { parseTableText, acceptImport } from '../../src/engine/table';
import { evaluate } from '../../src/registry';
import { VERSION } from '../../src/engine/version';
import { storedFormula, typedFormula } from '../../src/cli/xlsx';
import { relClose } from '../support/prng';

const GOOD = path.join(TABLES, 'good.csv');
const DATE = '2026-02-03';

async function sheetOf(file: string, name?: string): Promise<ExcelJS.Worksheet> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  const ws = name ? wb.getWorksheet(name) : wb.worksheets[0];
  if (!ws) throw new Error(`no sheet ${name}`);
  return ws;
}

/** SHA-256 of the table file as read (FIPS 180-4, Node's crypto): the CLI records it in the provenance. */
const GOOD_SHA256 = createHash('sha256').update(fs.readFileSync(GOOD)).digest('hex');

function expectedPlan(mode: 'live' | 'values'): FillPlan {
  const imported = parseTableText(fs.readFileSync(GOOD, 'utf8'), { name: 'good.csv', origin: path.resolve(GOOD) });
  const table = acceptImport(imported);
  const r = planFill({ table, tier: 'desirable', z: 1.65, mode, target: { kind: 'new-sheet', sheetName: 'Specifications' }, date: DATE, tableSha256: GOOD_SHA256, writtenDecimals: imported.decimals });
  if (!r.ok) throw new Error('plan failed');
  return r.plan;
}

const textOf = (ws: ExcelJS.Worksheet): string[] => {
  const out: string[] = [];
  ws.eachRow((row) => row.eachCell((c) => typeof c.value === 'string' && out.push(c.value)));
  return out;
};

/** The registry's value for a derived column on a row of the filled sheet, from the sheet's own input cells. */
function registryValue(ws: ExcelJS.Worksheet, plan: FillPlan, field: string, row: number): unknown {
  const cell = (f: string): unknown => {
    const c = plan.columns.find((x) => x.field === f);
    const v = c ? ws.getCell(row, c.col).value : null;
    return [[v === undefined ? null : v]];
  };
  const tier = ws.getCell(plan.tierCell.replace(/\$/g, '')).value;
  const z = ws.getCell(plan.zCell.replace(/\$/g, '')).value;
  switch (field) {
    case 'spec_cv':
      return evaluate('SPEC.CV', [cell('cvi'), [[tier as string]]] as never)[0][0];
    case 'spec_bias':
      return evaluate('SPEC.BIAS', [cell('cvi'), cell('cvg'), [[tier as string]]] as never)[0][0];
    case 'spec_total':
      return evaluate('SPEC.TOTAL', [cell('cvi'), cell('cvg'), [[tier as string]], [[z as number]]] as never)[0][0];
    case 'spec_mu':
      return evaluate('SPEC.MU', [cell('cvi'), [[tier as string]]] as never)[0][0];
    default:
      return undefined;
  }
}

describe('leeway fill: round trip into a new workbook', () => {
  test('values mode: every value equals the registry’s, unrounded; formulas documented in header notes; provenance and caution present', async () => {
    const dir = tempDir('fill');
    const out = path.join(dir, 'specs.xlsx');
    const r = await leeway('fill', '--table', GOOD, '--out', out, '--date', DATE);
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.out[0]).toMatch(/^wrote .*specs\.xlsx: sheet "Specifications", 3 analytes/);
    const ws = await sheetOf(out);
    const plan = expectedPlan('values');
    for (const c of plan.cells) {
      const v = ws.getCell(c.address).value;
      if (c.content.kind === 'number') expect(v).toBe(c.content.value);
      else if (c.content.kind === 'text') expect(v).toBe(c.content.text);
      else if (c.content.kind === 'error') expect(v).toEqual({ error: c.content.error.error });
    }
    let checked = 0;
    for (const pr of plan.rows) {
      for (const field of ['spec_cv', 'spec_bias', 'spec_total', 'spec_mu']) {
        const col = plan.columns.find((x) => x.field === field)!;
        const got = ws.getCell(pr.row, col.col).value;
        const want = registryValue(ws, plan, field, pr.row);
        if (typeof want === 'number') {
          expect(relClose(got as number, want, 1e-15)).toBe(true);
          expect(ws.getCell(pr.row, col.col).numFmt).toBe('0.00');
          checked++;
        } else expect(got).toEqual({ error: (want as { error: string }).error });
      }
    }
    expect(checked).toBe(10); // the third row has no CVG: bias and total are #N/A
    const te = plan.columns.find((x) => x.field === 'spec_total')!;
    expect(Math.abs((ws.getCell(plan.rows[0].row, te.col).value as number) - 6.94)).toBeLessThan(0.005);
    const note = ws.getCell(plan.headerRow, te.col).note as unknown;
    const noteText = typeof note === 'string' ? note : JSON.stringify(note);
    expect(noteText).toContain('=LEEWAY.SPEC.TOTAL(');
    const texts = textOf(ws);
    expect(texts).toEqual(expect.arrayContaining(['good.csv', path.resolve(GOOD), GOOD_SHA256, '3 in the table; 3 filled here', DATE, `Leeway ${VERSION}`, 'desirable']));
    expect(texts.filter((t) => CAUTION.includes(t) && t.length > 20).join(' ')).toBe(CAUTION);
    expect(strayFiles(dir, ['specs.xlsx'])).toEqual([]);
  });

  test('--live: every derived cell holds the plan’s formula (stored as _xldudf_ calls) and the registry’s value as its cached result', async () => {
    const dir = tempDir('live');
    const out = path.join(dir, 'live.xlsx');
    const r = await leeway('fill', '--table', GOOD, '--out', out, '--date', DATE, '--live', '--tier', 'min', '--z', '2');
    expect(r.code).toBe(0);
    const ws = await sheetOf(out);
    const table = acceptImport(parseTableText(fs.readFileSync(GOOD, 'utf8'), { name: 'good.csv', origin: path.resolve(GOOD) }));
    const pr = planFill({ table, tier: 'minimum', z: 2, mode: 'live', target: { kind: 'new-sheet', sheetName: 'Specifications' }, date: DATE, tableSha256: GOOD_SHA256 });
    if (!pr.ok) throw new Error('plan failed');
    const plan = pr.plan;
    let formulas = 0;
    for (const c of plan.cells) {
      if (c.content.kind !== 'formula') continue;
      const v = ws.getCell(c.address).value as ExcelJS.CellFormulaValue;
      expect(v.formula).toBe(storedFormula(c.content.formula));
      expect(typedFormula(v.formula)).toBe(c.content.formula);
      const want = registryValue(ws, plan, plan.columns.find((x) => x.col === c.col)!.field, c.row);
      if (typeof want === 'number') expect(relClose(v.result as number, want, 1e-15)).toBe(true);
      else if (want !== undefined) expect(v.result).toEqual({ error: (want as { error: string }).error });
      formulas++;
    }
    expect(formulas).toBe(15);
    const total = plan.columns.find((x) => x.field === 'spec_total')!;
    expect((ws.getCell(plan.rows[0].row, total.col).value as ExcelJS.CellFormulaValue).formula).toMatch(/^_xldudf_LEEWAY_SPEC_TOTAL\(/);
    expect(ws.getCell(plan.tierCell.replace(/\$/g, '')).value).toBe('minimum');
    expect(ws.getCell(plan.zCell.replace(/\$/g, '')).value).toBe(2);
  });

  test('text that starts with = + - @ is stored as text, never as a formula', async () => {
    const dir = tempDir('inject');
    const csv = path.join(dir, 't.csv');
    fs.writeFileSync(csv, 'analyte,cvi,cvg,source,note\n"=HYPERLINK(""http://x"")",5,6,+src,@cmd\n-dash,4,5,=1+1,\n');
    const out = path.join(dir, 'o.xlsx');
    expect((await leeway('fill', '--table', csv, '--out', out, '--date', DATE)).code).toBe(0);
    const ws = await sheetOf(out);
    const values = textOf(ws);
    expect(values).toEqual(expect.arrayContaining(['=HYPERLINK("http://x")', '+src', '@cmd', '-dash', '=1+1']));
    ws.eachRow((row) =>
      row.eachCell((c) => {
        const v = c.value as { formula?: string } | null;
        if (v && typeof v === 'object' && 'formula' in v) throw new Error(`${c.address} holds a formula`);
      }),
    );
  });

  test('--analytes picks rows; an unknown analyte is refused and nothing is written', async () => {
    const dir = tempDir('pick');
    const out = path.join(dir, 'o.xlsx');
    const r = await leeway('fill', '--table', GOOD, '--out', out, '--analytes', 'brontase,Calpidine', '--date', DATE);
    expect(r.code).toBe(0);
    const ws = await sheetOf(out);
    expect(textOf(ws)).toEqual(expect.arrayContaining(['Brontase', 'Calpidine']));
    expect(textOf(ws)).not.toContain('Arvelin');
    const bad = await leeway('fill', '--table', GOOD, '--out', path.join(dir, 'p.xlsx'), '--analytes', 'Nope');
    expect(bad.code).toBe(1);
    expect(bad.err.join('\n')).toMatch(/no analyte "Nope"/);
    expect(strayFiles(dir, ['o.xlsx'])).toEqual([]);
  });
});

describe('leeway fill into a template', () => {
  async function makeTemplate(file: string): Promise<void> {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Verification');
    ws.getCell('A1').value = 'Method verification (template)';
    ws.getRow(3).values = ['Reviewer', 'Allowable total error %', 'Test', 'CVG %', 'CVI', 'Reference'];
    ws.getRow(4).values = ['someone', null, 'Brontase', 99, 12.4];
    ws.getRow(5).values = ['kept', 'typed by hand'];
    wb.addWorksheet('Other').getCell('A1').value = 'untouched';
    await wb.xlsx.writeFile(file);
  }

  // Behaviour changed: a pre-filled target cell no longer stops the whole fill (it is left as it
  // was and listed), and table analytes the template lacks are written only with --append, into
  // empty rows below the template's table (no longer into C5, a row of the table with an empty
  // analyte cell): so B5 is no longer a target, and the block moved below the table.
  test('headers in another order, extra columns, pre-filled cells: the empty cells are written, the pre-filled ones left as they were and listed', async () => {
    const dir = tempDir('tpl');
    const tpl = path.join(dir, 'template.xlsx');
    await makeTemplate(tpl);
    const out = path.join(dir, 'filled.xlsx');
    const r = await leeway('fill', '--table', GOOD, '--out', out, '--template', tpl, '--sheet', 'Verification', '--at', 'A3', '--date', DATE);
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    const text = r.out.join('\n');
    expect(text).toMatch(/left 1 non-empty target cell as it was \(add --overwrite to replace them\)/);
    expect(text).toMatch(/D4 holds 99; Leeway would write "18.1"/);
    expect(text).toMatch(/the template does not list 2 analytes of the table \(not added; add --append .*\): Arvelin \(serum\), Calpidine \(plasma\)/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    const ws = wb.getWorksheet('Verification')!;
    expect(ws.getCell('D4').value).toBe(99);
    expect(ws.getCell('B5').value).toBe('typed by hand');
    // The derived cell of the row reads the sheet's own CVG (99).
    expect(relClose(ws.getCell('B4').value as number, evaluate('SPEC.TOTAL', [12.4, 99, 'desirable', 1.65])[0][0] as number, 1e-15)).toBe(true);
    expect(strayFiles(dir, ['template.xlsx', 'filled.xlsx'])).toEqual([]);
  });

  test('with --overwrite the listed cells are replaced; extra columns, identical cells and other sheets are left as they were', async () => {
    const dir = tempDir('tpl2');
    const tpl = path.join(dir, 'template.xlsx');
    await makeTemplate(tpl);
    const out = path.join(dir, 'filled.xlsx');
    const r = await leeway('fill', '--table', GOOD, '--out', out, '--template', tpl, '--sheet', 'Verification', '--at', 'A3', '--date', DATE, '--overwrite', '--append');
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.out[1]).toBe('overwrote 1 cell: D4');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    const ws = wb.getWorksheet('Verification')!;
    expect(ws.getCell('A4').value).toBe('someone');
    expect(ws.getCell('A5').value).toBe('kept');
    expect(ws.getCell('C4').value).toBe('Brontase');
    expect(ws.getCell('D4').value).toBe(18.1);
    expect(ws.getCell('C6').value).toBe('Arvelin');
    expect(ws.getCell('C7').value).toBe('Calpidine');
    const te = ws.getCell('B4').value as number;
    expect(relClose(te, evaluate('SPEC.TOTAL', [12.4, 18.1, 'desirable', 1.65])[0][0] as number, 1e-15)).toBe(true);
    expect(ws.getCell('A1').value).toBe('Method verification (template)');
    expect(wb.getWorksheet('Other')!.getCell('A1').value).toBe('untouched');
    // The block: below the table (one blank row), in its first column; the tier value clear of its label.
    expect(ws.getCell('A9').value).toBe('Leeway — analytical performance specifications');
    expect(ws.getCell('D10').value).toBe('desirable');
  });

  test('a sheet that does not exist, and an --at outside the sheet, are refused', async () => {
    const dir = tempDir('tpl3');
    const tpl = path.join(dir, 'template.xlsx');
    await makeTemplate(tpl);
    const noSheet = await leeway('fill', '--table', GOOD, '--out', path.join(dir, 'a.xlsx'), '--template', tpl, '--sheet', 'Nope');
    expect(noSheet.code).toBe(1);
    expect(noSheet.err.join('\n')).toMatch(/has no sheet "Nope" \(it has "Verification", "Other"\)/);
    const outside = await leeway('fill', '--table', GOOD, '--out', path.join(dir, 'b.xlsx'), '--template', tpl, '--at', 'Z900');
    expect(outside.code).toBe(2);
    expect(outside.err.join('\n')).toMatch(/--at Z900 is outside the used part of sheet "Verification" \(A1:F5\)/);
    const notACell = await leeway('fill', '--table', GOOD, '--out', path.join(dir, 'c.xlsx'), '--template', tpl, '--at', 'XFE1');
    expect(notACell.code).toBe(2);
    expect(strayFiles(dir, ['template.xlsx'])).toEqual([]);
  });
});

describe('leeway fill: bad input', () => {
  test('a missing table file: a clear message, exit 1, no output', async () => {
    const dir = tempDir('bad1');
    const r = await leeway('fill', '--table', path.join(dir, 'missing.csv'), '--out', path.join(dir, 'o.xlsx'));
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/cannot read the table .*missing\.csv: no such file/);
    expect(strayFiles(dir, [])).toEqual([]);
  });

  test('a table with errors: refused, the report printed', async () => {
    const dir = tempDir('bad2');
    const r = await leeway('fill', '--table', path.join(TABLES, 'bad-cv.csv'), '--out', path.join(dir, 'o.xlsx'));
    expect(r.code).toBe(1);
    expect(r.err[0]).toBe('row 2, column B (cvi): error: cvi must not be negative (got -5.7)');
    expect(r.err[r.err.length - 1]).toMatch(/has errors: nothing was written/);
    expect(strayFiles(dir, [])).toEqual([]);
  });

  test('an output that exists is refused unless --force; with --force it is replaced whole', async () => {
    const dir = tempDir('bad3');
    const out = path.join(dir, 'o.xlsx');
    fs.writeFileSync(out, 'not a workbook');
    const r = await leeway('fill', '--table', GOOD, '--out', out);
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/exists: nothing was written \(add --force to replace it\)/);
    expect(fs.readFileSync(out, 'utf8')).toBe('not a workbook');
    expect((await leeway('fill', '--table', GOOD, '--out', out, '--force')).code).toBe(0);
    await sheetOf(out);
    expect(strayFiles(dir, ['o.xlsx'])).toEqual([]);
  });

  test('usage errors exit 2: no --out, a bad tier, a bad z, --at without a template, an unknown option', async () => {
    for (const args of [
      ['--table', GOOD],
      ['--table', GOOD, '--out', 'x.xlsx', '--tier', 'best'],
      ['--table', GOOD, '--out', 'x.xlsx', '--z', '-1'],
      ['--table', GOOD, '--out', 'x.xlsx', '--at', 'A1'],
      ['--table', GOOD, '--out', 'x.xlsx', '--colour', 'red'],
    ]) {
      const r = await leeway('fill', ...args);
      expect(r.code).toBe(2);
      expect(r.err[0]).toMatch(/^leeway: /);
    }
  });

  test('an output folder that does not exist: exit 1, nothing written', async () => {
    const dir = tempDir('bad4');
    const r = await leeway('fill', '--table', GOOD, '--out', path.join(dir, 'no', 'such', 'o.xlsx'));
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/folder .* does not exist/);
  });
});

