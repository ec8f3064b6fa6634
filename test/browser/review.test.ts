/**
 * Task pane in Chromium at 320 px, Review view: control results read from the (fake) workbook,
 * columns chosen from their headers, the rule taken from the analyte's QC plan (or typed); the
 * flags listed are QC.FLAGS's and the figures QC.REVIEW's (the same registry Excel evaluates);
 * the chart marks every flagged result, and focusing a flag in the list marks its point; "Write
 * flags" sends one live QC.FLAGS formula beside the data and the QC.REVIEW figures below, and
 * refuses cells that hold something until confirmed. Screenshots go to out/screenshots/.
 */
import type { Page } from 'playwright-core';
import { describeInBrowser, usePane } from './harness';
import { view, lastCall, setCells, setActive, statusText, screenshot } from './helpers';
import { evaluate } from '../../src/registry';
import type { BlockWrite } from '../../src/taskpane/host';
import { FALLBACK_RULE } from '../../src/taskpane/views/review';


// Invented control results: two materials over 12 runs, a shift of about +2.5 SD in runs 8–10.
const L1 = [100.4, 99.1, 101.2, 98.7, 100.9, 99.6, 100.2, 105.1, 104.8, 105.6, 100.3, 99.4];
const L2 = [250.8, 248.2, 251.5, 249.0, 252.1, 247.9, 250.4, 262.0, 261.2, 263.4, 249.6, 251.0];
const rows: Array<Array<string | number>> = [];
L1.forEach((v, i) => {
  rows.push([`R${i + 1}`, 'Low', v, 100, 2]);
  rows.push([`R${i + 1}`, 'High', L2[i], 250, 5]);
});
const colOf = (k: number) => rows.map((r) => [r[k]]);

async function readResults(page: Page): Promise<void> {
  await setCells(page, 'Sheet1', 1, 1, [['Run', 'Level', 'Result', 'Target', 'SD'], ...rows]);
  await setActive(page, { selection: { row: 1, col: 1, rows: rows.length + 1, cols: 5 } });
  await view(page, 'review');
  await page.click('#review-read');
  await page.waitForSelector('#review-figures');
}

describeInBrowser('task pane: review of control results', () => {
  const open = usePane();

  test('flags and figures equal QC.FLAGS and QC.REVIEW; the chart marks every flag', async () => {
    const { context, page, errors } = await open();
    await readResults(page);
    expect(await page.inputValue('#review-values')).toBe('2');
    expect(await page.inputValue('#review-runs')).toBe('0');
    expect(await page.inputValue('#review-levels')).toBe('1');
    // No observed bias and CV in the demo's state: the common multirule, and the view says why.
    const rule = await page.inputValue('#review-rule');
    expect(rule).toBe(FALLBACK_RULE);
    expect(await page.textContent('#review-rule-box')).toMatch(/no QC plan for .*no observed bias and CV/);
    const args = [colOf(2), colOf(3), colOf(4), rule, colOf(0), colOf(1)];
    const flags = evaluate('QC.FLAGS', args).map((r) => r[0] as string);
    const flaggedRows = flags.map((f, i) => (f ? i + 2 : 0)).filter(Boolean);
    expect(flaggedRows.length).toBeGreaterThan(0);
    const items = await page.$$eval('#review-flags li', (lis) => lis.map((li) => Number(li.getAttribute('data-row'))));
    expect(items).toEqual(flaggedRows);
    expect(await page.locator('#review-chart path.point.flagged').count()).toBe(flaggedRows.length);
    const review = evaluate('QC.REVIEW', args);
    expect(await page.textContent('#review-figures [data-key="Runs flagged"]')).toBe(String(review[1][2]));
    expect(await page.textContent('#review-figures [data-key="Results"]')).toBe('24');
    // Keyboard: focusing a flag marks its point on the chart.
    await page.focus('#review-flags li');
    expect(await page.locator('#review-chart path.point.current').count()).toBe(1);
    expect(await page.getAttribute('#review-chart path.point.current', 'data-flags')).toBe(flags[flaggedRows[0] - 2]);
    const box = await page.locator('#review-chart svg').boundingBox();
    expect(box!.width).toBeLessThanOrEqual(320);
    await screenshot(page, 'pane-review.png');
    expect(errors).toEqual([]);
    await context.close();
  });

  test('a typed rule is used; writing puts a live QC.FLAGS column beside the data and QC.REVIEW below', async () => {
    const { context, page, errors } = await open();
    await readResults(page);
    await page.fill('#review-rule', '1-2.5s');
    await page.dispatchEvent('#review-rule', 'change');
    await page.waitForFunction(() => (document.querySelector('#review-rule-box')?.textContent ?? '').includes('Typed'));
    await setCells(page, 'Sheet1', 9, 6, [['a note']]);
    await page.click('#review-write');
    await page.waitForSelector('#review-replace');
    expect(await statusText(page)).toMatch(/^Nothing written: .*F9/);
    await page.click('#review-replace');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Wrote the flags'));
    const req = await lastCall<BlockWrite>(page, 'writeBlock');
    expect(req.overwrite).toBe(true);
    const [flags, review] = req.areas;
    expect(flags).toMatchObject({ row: 1, col: 6 });
    expect(flags.cells[1][0]!.content).toEqual({ kind: 'formula', formula: '=LEEWAY.QC.FLAGS($C$2:$C$25,$D$2:$D$25,$E$2:$E$25,"1-2.5s",$A$2:$A$25,$B$2:$B$25)' });
    expect(review).toMatchObject({ row: 27, col: 1 });
    const texts = review.cells.flat().filter((c) => c && c.content.kind === 'text').map((c) => (c!.content as { text: string }).text);
    expect(texts.some((t) => t.startsWith('Rule: 1-2.5s (typed)'))).toBe(true);
    expect(texts.some((t) => t.startsWith('Caution: '))).toBe(true);
    const f = review.cells.flat().filter((c) => c && c.content.kind === 'formula').map((c) => (c!.content as { formula: string }).formula);
    expect(f).toContain('=INDEX(LEEWAY.QC.REVIEW($C$2:$C$25,$D$2:$D$25,$E$2:$E$25,"1-2.5s",$A$2:$A$25,$B$2:$B$25),2,3)');
    expect(errors).toEqual([]);
    await context.close();
  });

  test('a missing SD and a bad rule say so', async () => {
    const { context, page, errors } = await open();
    await setCells(page, 'Sheet1', 1, 1, [[100.4], [99.1], [104.9]]);
    await setActive(page, { selection: { row: 1, col: 1, rows: 3, cols: 1 } });
    await view(page, 'review');
    await page.click('#review-read');
    await page.waitForSelector('#review-missing');
    expect(await page.textContent('#review-missing')).toMatch(/Give the target/);
    await page.fill('#review-target', '100');
    await page.dispatchEvent('#review-target', 'change');
    await page.waitForFunction(() => (document.querySelector('#review-missing')?.textContent ?? '').includes('Give the SD'));
    await page.fill('#review-sd', '2');
    await page.dispatchEvent('#review-sd', 'change');
    await page.waitForSelector('#review-figures');
    await page.fill('#review-rule', '1-3q');
    await page.dispatchEvent('#review-rule', 'change');
    await page.waitForSelector('#review-error');
    expect(await page.textContent('#review-error')).toMatch(/^#VALUE! /);
    await screenshot(page, 'review-bad-rule.png');
    expect(errors).toEqual([]);
    await context.close();
  });
});
