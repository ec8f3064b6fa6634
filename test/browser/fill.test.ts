/**
 * Task pane in Chromium, Fill view: tiers (sheet and per analyte), coverage as probability or z,
 * analyte search/filter, and fills whose plan the recording fake receives: values, live
 * formulas and the tier and z cells they point at, compared cell by cell with the planner run
 * on the same request; a template with non-empty cells needs confirmation; the header match can
 * be corrected; formula-looking text stays text.
 */
import * as path from 'path';
import type { Page } from 'playwright-core';
import { describeInBrowser, usePane } from './harness';
import { importAndAccept, view, FIXTURES, setCells, setActive, lastCall, screenshot, statusText, checkAndFill } from './helpers';
import { planFill } from '../../src/engine/fill';
import type { FillPlan } from '../../src/engine/fill';
import { demoTable } from '../../src/engine/demo';
import { rowKey } from '../../src/engine/table';
import { zFromCoverage } from '../../src/engine/coverage';
import { today } from '../../src/taskpane/format';

async function pickRadio(page: Page, name: string, value: string): Promise<void> {
  await page.check(`input[name="${name}"][value="${value}"]`);
}

describeInBrowser('task pane: choosing and filling', () => {
  const open = usePane();

  test('tiers, coverage and analytes chosen in the pane reach the Excel layer as the planner lays them out', async () => {
    const { context, page, errors } = await open();
    const demo = demoTable();
    await view(page, 'fill');
    await pickRadio(page, 'sheet-tier', 'minimum');
    // Coverage as a probability: converted by ZSCORE's own code.
    await pickRadio(page, 'coverage-mode', 'probability');
    await page.fill('#coverage-value', '0.95');
    const z = zFromCoverage(0.95, 1);
    expect(await page.textContent('#z-used')).toBe(`z used: ${z.toFixed(4)}`);
    // A per-analyte tier for the second analyte.
    const second = demo.rows[1];
    const k2 = rowKey(second.analyte, second.specimen);
    await page.selectOption(`select.row-tier[data-key="${encodeURIComponent(k2)}"]`, 'optimum');
    // Search narrows the list; leave out the third analyte.
    const third = demo.rows[2];
    await page.fill('#analyte-search', third.analyte.slice(0, 5));
    const listed = await page.$$eval('#analyte-list .name', (els) => els.map((e) => e.textContent));
    expect(listed).toContain(`${third.analyte} (${third.specimen})`);
    expect(listed.length).toBeLessThan(demo.rows.length);
    await page.uncheck(`#analyte-list input[data-key="${encodeURIComponent(rowKey(third.analyte, third.specimen))}"]`);
    await page.fill('#analyte-search', '');
    expect(await page.textContent('#analyte-count')).toBe(`${demo.rows.length - 1} of ${demo.rows.length} picked · ${demo.rows.length} shown`);
    await page.click('#check-fill');
    await page.waitForSelector('#run-fill');
    await screenshot(page, 'pane-fill.png');
    await page.click('#run-fill');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Filled'));
    const plan = await lastCall<FillPlan>(page, 'writeFill');

    // The same request run through the planner here gives the same cells.
    const rows = demo.rows.filter((r) => r !== third);
    const expected = planFill({ table: demo, rows, tier: 'minimum', z, rowTiers: { [k2]: 'optimum' }, mode: 'live', target: { kind: 'new-sheet', sheetName: 'Specifications' }, overwrite: false, date: today() });
    if (!expected.ok) throw new Error('plan failed');
    expect(plan.cells).toEqual(expected.plan.cells);
    expect(plan.sheetName).toBe('Specifications');
    expect(plan.rows).toHaveLength(rows.length);

    // Inputs as values, derived columns as formulas on the row's inputs, the tier cell and the z cell.
    const at = (address: string) => plan.cells.find((c) => c.address === address)!;
    const tierCell = at(plan.tierCell.replace(/\$/g, ''));
    expect(tierCell.content).toEqual({ kind: 'text', text: 'minimum' });
    expect(at(plan.zCell.replace(/\$/g, '')).content).toEqual({ kind: 'number', value: z });
    const col = (f: string) => plan.columns.find((c) => c.field === f)!.letter;
    for (const pr of plan.rows) {
      const r = pr.row;
      const src = demo.rows.find((x) => rowKey(x.analyte, x.specimen) === pr.key)!;
      expect(at(`${col('cvi')}${r}`).content).toEqual({ kind: 'number', value: src.cvi });
      expect(at(`${col('analyte')}${r}`).content).toEqual({ kind: 'text', text: src.analyte });
      const tier = `IF(${col('tier')}${r}="",${plan.tierCell},${col('tier')}${r})`;
      expect(at(`${col('spec_total')}${r}`).content).toMatchObject({ kind: 'formula', formula: `=LEEWAY.SPEC.TOTAL(${col('cvi')}${r},${col('cvg')}${r},${tier},${plan.zCell})` });
      expect(at(`${col('spec_cv')}${r}`).content).toMatchObject({ kind: 'formula', formula: `=LEEWAY.SPEC.CV(${col('cvi')}${r},${tier})` });
    }
    const rowTier = plan.rows.find((p) => p.key === k2)!;
    expect(at(`${col('tier')}${rowTier.row}`).content).toEqual({ kind: 'text', text: 'optimum' });
    // The provenance and the caution are on the sheet.
    const texts = plan.cells.map((c) => (c.content.kind === 'text' ? c.content.text : '')).join(' ');
    expect(texts).toContain('DEMO');
    expect(texts).toContain('laboratory director');
    // The pane has no table file to fingerprint: the same provenance fields, the SHA-256 null and said why.
    expect(plan.provenance).toMatchObject({ tableSha256: null, tableRows: demo.rows.length, rowsFilled: rows.length });
    expect(texts).toContain('none: the built-in demo table is not a file');
    expect(texts).toContain(`${demo.rows.length} in the table; ${rows.length} filled here`);
    expect(errors).toEqual([]);

    // A second fill goes to a new sheet with a name not yet taken.
    await checkAndFill(page);
    expect((await lastCall<FillPlan>(page, 'writeFill')).sheetName).toBe('Specifications (2)');
    await context.close();
  });

  // Behaviour changed: a non-empty target cell no longer holds the fill back; it is left as it is
  // and listed, and ticking the confirmation overwrites it.
  test('into a template: the header match is shown and can be corrected; non-empty cells are listed, left as they are, and overwritten only after confirmation', async () => {
    const { context, page } = await open();
    const demo = demoTable();
    const a = demo.rows[0];
    await setCells(page, 'Sheet1', 2, 1, [
      ['Analyte', 'Specimen', 'CVI %', 'CVG %', 'Allowable total error %', 'Goal for imprecision'],
      [a.analyte, a.specimen, a.cvi, a.cvg, 99, ''],
    ]);
    await setActive(page, { sheet: 'Sheet1', selection: { row: 2, col: 1, rows: 1, cols: 1 } });
    await view(page, 'fill');
    await page.click('#clear-shown');
    await page.check(`#analyte-list input[data-key="${encodeURIComponent(rowKey(a.analyte, a.specimen))}"]`);
    await pickRadio(page, 'fill-where', 'template');
    await page.click('#check-fill');
    await page.waitForSelector('#fill-check .mapping');
    // "Goal for imprecision" is not a known header: it is left alone until the user maps it.
    expect(await page.$eval('#fill-check select[data-header="Goal for imprecision"]', (e) => (e as HTMLSelectElement).value)).toBe('');
    await page.selectOption('#fill-check select[data-header="Goal for imprecision"]', 'spec_cv');
    await page.waitForSelector('#conflicts li');
    const conflicts = await page.$$eval('#conflicts li', (els) => els.map((e) => e.getAttribute('data-address')));
    expect(conflicts).toEqual(['E3']);
    expect(await page.textContent('#conflicts li')).toContain('holds 99');
    expect(await page.isDisabled('#run-fill')).toBe(false);
    expect(await statusText(page)).toMatch(/1 non-empty cell will be left as it is/);
    await screenshot(page, 'pane-fill-template.png');
    await page.check('#confirm-overwrite');
    await page.waitForSelector('#run-fill:not([disabled])');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('confirm-overwrite');
    await page.click('#run-fill');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Filled'));
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    expect(plan.target).toBe('template');
    expect(plan.overwrite).toBe(true);
    expect(plan.conflicts.map((c) => c.address)).toEqual(['E3']);
    expect(plan.provenance).toMatchObject({ tableSha256: null, tableRows: demo.rows.length, rowsFilled: 1 });
    expect(plan.cells.find((c) => c.address === 'F3')!.content).toMatchObject({ kind: 'formula', formula: `=LEEWAY.SPEC.CV(C3,${plan.tierCell})` });
    expect(plan.cells.find((c) => c.address === 'E3')!.content).toMatchObject({ kind: 'formula', formula: `=LEEWAY.SPEC.TOTAL(C3,D3,${plan.tierCell},${plan.zCell})` });
    await context.close();
  });

  test('without confirmation a non-empty cell is left as it is: the plan written leaves it out', async () => {
    const { context, page } = await open();
    const a = demoTable().rows[0];
    await setCells(page, 'Sheet1', 1, 1, [
      ['Analyte', 'CVI %', 'Allowable CV %'],
      [a.analyte, a.cvi, 'kept'],
    ]);
    await view(page, 'fill');
    await pickRadio(page, 'fill-where', 'template');
    await page.click('#check-fill');
    await page.waitForSelector('#conflicts li');
    expect(await statusText(page)).toMatch(/1 non-empty cell will be left as it is/);
    await page.click('#run-fill');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Filled'));
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    expect(plan.conflicts.map((c) => c.address)).toEqual(['C2']);
    expect(plan.cells.find((c) => c.address === 'C2')).toBeUndefined();
    await context.close();
  });

  test('the active sheet as a template: the header found below a title, the analytes on one side only listed, appending on request', async () => {
    const { context, page } = await open();
    const [a, b, c] = demoTable().rows;
    await setCells(page, 'Sheet1', 1, 1, [
      ['Method verification (invented)'],
      ['Invented laboratory'],
      [null],
      ['Analyte', 'Specimen', 'CVI %', 'CVG %', 'Allowable total error %'],
      [a.analyte, a.specimen],
      ['Not in the table', 'Serum'],
    ]);
    await view(page, 'fill');
    await page.click('#clear-shown');
    for (const r of [a, b, c]) await page.check(`#analyte-list input[data-key="${encodeURIComponent(rowKey(r.analyte, r.specimen))}"]`);
    await pickRadio(page, 'fill-where', 'template');
    await page.click('#check-fill');
    await page.waitForSelector('#template-report');
    const report = await page.$$eval('#template-report li', (els) => els.map((e) => e.textContent ?? ''));
    expect(report.join('\n')).toContain(`the template does not list 2 analytes of the table (not added; tick “Add the table’s other analytes” to add them): ${b.analyte} (${b.specimen}), ${c.analyte} (${c.specimen})`);
    expect(report.join('\n')).toContain('the table has no row for 1 analyte of the template (left blank): Not in the table (Serum) (row 6)');
    expect(await page.textContent('#fill-check .mapping summary')).toBe('Header match (row 4)');
    await page.check('#fill-append');
    await page.click('#check-fill');
    await page.waitForSelector('#template-report');
    await page.click('#run-fill');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Filled'));
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    expect(plan.headerRow).toBe(4);
    expect(plan.rows.map((r) => [r.analyte, r.row])).toEqual([
      [a.analyte, 5],
      [b.analyte, 7],
      [c.analyte, 8],
    ]);
    expect(plan.template.appended.map((r) => r.row)).toEqual([7, 8]);
    await context.close();
  });

  test('into the selected range: the selection’s first row is the header row', async () => {
    const { context, page } = await open();
    await setCells(page, 'Sheet1', 10, 4, [['Analyte', 'CVI', 'CVG', 'Allowable bias %']]);
    await setActive(page, { selection: { row: 10, col: 4, rows: 5, cols: 4 } });
    await view(page, 'fill');
    await pickRadio(page, 'fill-where', 'range');
    // A header row with nothing below: the analytes go below it only when appending is asked for.
    await page.check('#fill-append');
    await page.click('#check-fill');
    await page.waitForSelector('#run-fill:not([disabled])');
    await page.click('#run-fill');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Filled'));
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    expect(plan.headerRow).toBe(10);
    expect(plan.columns.map((c) => [c.letter, c.field])).toEqual([
      ['D', 'analyte'],
      ['E', 'cvi'],
      ['F', 'cvg'],
      ['G', 'spec_bias'],
    ]);
    expect(plan.cells.find((c) => c.address === 'G11')!.content).toMatchObject({ kind: 'formula', formula: `=LEEWAY.SPEC.BIAS(E11,F11,${plan.tierCell})` });
    await context.close();
  });

  test('text starting with = is planned as text, never as a formula', async () => {
    const { context, page } = await open();
    await importAndAccept(page, path.join(FIXTURES, 'markup.csv'));
    await view(page, 'fill');
    await checkAndFill(page);
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    const cell = plan.cells.find((c) => c.content.kind === 'text' && c.content.text.startsWith('=HYPERLINK'));
    expect(cell).toBeDefined();
    expect(plan.cells.filter((c) => c.content.kind === 'formula').every((c) => c.content.kind === 'formula' && /^=(LEEWAY\.|IF\()/.test(c.content.formula))).toBe(true);
    await context.close();
  });

  test('an invalid coverage is refused with the engine’s message and nothing is planned', async () => {
    const { context, page } = await open();
    await view(page, 'fill');
    await pickRadio(page, 'coverage-mode', 'probability');
    await page.fill('#coverage-value', '1.5');
    expect(await page.textContent('#z-used')).toBe('probability must be a probability strictly between 0 and 1 (got 1.5)');
    expect(await page.getAttribute('#coverage-value', 'aria-invalid')).toBe('true');
    await page.click('#check-fill');
    expect(await statusText(page)).toMatch(/^The coverage is not valid/);
    expect(await page.$('#run-fill')).toBeNull();
    await context.close();
  });
});
