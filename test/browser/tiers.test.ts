/**
 * Task pane in Chromium: every view that depends on a tier says which tier and where it came
 * from (the pane's choice in Fill, the tier cell of a filled sheet, an analyte's own tier), and
 * after the tier cell of the filled sheet changes — from the pane, or typed in Excel — QC and
 * Summary say so and use the new tier.
 */
import { describeInBrowser, usePane } from './harness';
import { view, setCells, lastCall, checkAndFill } from './helpers';
import type { FillPlan } from '../../src/engine/fill';
import type { SummaryRequest } from '../../src/taskpane/host';
import { demoTable } from '../../src/engine/demo';
import { rowKey } from '../../src/engine/table';
import { allowableTotalError } from '../../src/engine/spec';
import { formatFixed } from '../../src/engine/round';

describeInBrowser('task pane: which tier, and from where', () => {
  const open = usePane();

  test('before any fill the tier is the pane’s choice, and an analyte’s own tier is named as such', async () => {
    const { context, page, errors } = await open();
    const r = demoTable().rows[0];
    await view(page, 'fill');
    expect(await page.textContent('#fill-tier-origin')).toBe('Now Desirable, from the sheet tier chosen in Fill.');
    await view(page, 'whatif');
    expect(await page.textContent('#whatif-tier-origin')).toBe('In use elsewhere: Desirable, from the sheet tier chosen in Fill.');
    await view(page, 'qc');
    expect(await page.textContent('#qc-tier-origin')).toBe('Tier Desirable, from the sheet tier chosen in Fill.');
    await view(page, 'summary');
    expect(await page.textContent('#summary-tier')).toBe('Tier Desirable, from the sheet tier chosen in Fill.');
    // An analyte's own tier.
    await view(page, 'fill');
    await page.selectOption(`select.row-tier[data-key="${encodeURIComponent(rowKey(r.analyte, r.specimen))}"]`, 'minimum');
    await view(page, 'qc');
    expect(await page.textContent('#qc-tier-origin')).toBe('Tier Minimum, from its own tier, chosen in Fill.');
    await view(page, 'summary');
    expect(await page.textContent('#summary-tier')).toBe('Tier Desirable, from the sheet tier chosen in Fill; 1 analyte has its own tier (Fill).');
    expect(errors).toEqual([]);
    await context.close();
  });

  test('a tier cell typed over in Excel: QC and Summary say so, and the allowance and the summary sheet follow it', async () => {
    const { context, page } = await open();
    const r = demoTable().rows[0];
    await view(page, 'whatif');
    await page.click('#use-demo-observed');
    await view(page, 'fill');
    await checkAndFill(page);
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    const [, col, row] = /^\$?([A-Z]+)\$?(\d+)$/.exec(plan.tierCell.replace(/^.*!/, ''))!;
    // The user types another tier into the tier cell in Excel.
    await setCells(page, 'Specifications', Number(row), col.charCodeAt(0) - 64, [['minimum']]);
    await view(page, 'qc');
    await page.waitForSelector('#qc-tier-change');
    expect(await page.textContent('#qc-tier-change')).toBe(`The tier cell Specifications!${plan.tierCell} changed from Desirable to Minimum: the figures here use Minimum (analytes with their own tier keep it).`);
    await page.selectOption('#qc-analyte', rowKey(r.analyte, r.specimen));
    expect(await page.inputValue('#qc-allowable')).toBe(formatFixed(allowableTotalError(r.cvi, r.cvg as number, 'minimum', 1.65), 2));
    expect(await page.textContent('#qc-tier-origin')).toBe(`Tier Minimum, from the tier cell Specifications!${plan.tierCell}.`);
    await view(page, 'summary');
    expect(await page.textContent('#summary-tier-change')).toContain('changed from Desirable to Minimum');
    await page.click('#write-summary');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Wrote'));
    const req = await lastCall<SummaryRequest>(page, 'writeSummary');
    expect(req.rows.every((x) => x.tier === 'minimum')).toBe(true);
    expect(req.header.some((l) => l.startsWith(`Sheet tier: minimum, from the tier cell Specifications!${plan.tierCell}`))).toBe(true);
    await context.close();
  });

  test('a tier cell set from the pane is named as the source in every view', async () => {
    const { context, page } = await open();
    await view(page, 'fill');
    await checkAndFill(page);
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    await view(page, 'whatif');
    await page.check('#tier-cell input[value="optimum"]');
    await page.click('#apply-tier');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').includes('now uses the optimum tier'));
    expect(await page.textContent('#whatif-tier-origin')).toBe(`In use elsewhere: Optimum, from the tier cell Specifications!${plan.tierCell}.`);
    await view(page, 'fill');
    expect(await page.textContent('#fill-tier-origin')).toBe(`Now Optimum, from the tier cell Specifications!${plan.tierCell}.`);
    await view(page, 'qc');
    expect(await page.textContent('#qc-tier-change')).toContain('changed from Desirable to Optimum');
    // Choosing a tier in Fill again makes the pane's choice the source; an unchanged cell does not undo it.
    await view(page, 'fill');
    await page.check('input[name="sheet-tier"][value="minimum"]');
    await view(page, 'summary');
    expect(await page.textContent('#summary-tier')).toBe('Tier Minimum, from the sheet tier chosen in Fill.');
    expect(await page.$('#summary-tier-change')).toBeNull();
    await context.close();
  });
});
