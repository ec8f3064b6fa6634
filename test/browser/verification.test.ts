/**
 * Task pane in Chromium at 320 px, Verification view: a replication study read from the
 * (fake) workbook shows the figures of VERIFY.PRECISION, VERIFY.TRUENESS and PERF.SIGMALIMITS
 * for each material (through the same registry Excel evaluates); a claim given as a cell is read
 * from the sheet and referenced by the written block; writing refuses cells that hold something
 * until the user confirms; a comparison shows DATA.AGREEMENT's figures and the difference plot;
 * bad selections say what to select. Screenshots go to out/screenshots/.
 */
import type { Page } from 'playwright-core';
import { describeInBrowser, usePane } from './harness';
import { view, lastCall, setCells, setActive, statusText, screenshot } from './helpers';
import { evaluate } from '../../src/registry';
import type { BlockWrite } from '../../src/taskpane/host';
import { fmt } from '../../src/taskpane/format';


// The VERIFY.PRECISION catalogue example beside an invented second material.
const L1 = [10.1, 10.3, 9.9, 10.6, 10.4, 10.8, 9.7, 9.9, 10.0, 10.2, 10.1, 10.4, 9.8, 10.0, 10.1];
const L2 = [51.2, 50.6, 51.9, 49.8, 50.4, 50.9, 52.3, 51.7, 51.1, 50.2, 50.8, 50.5, 51.6, 52.0, 51.4];
const RUNS = [1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 5, 5];
const col = (xs: readonly number[]) => xs.map((x) => [x]);

async function readStudy(page: Page): Promise<void> {
  await setCells(page, 'Sheet1', 1, 1, [['Run', 'Level 1', 'Level 2'], ...RUNS.map((r, i) => [r, L1[i], L2[i]])]);
  await setCells(page, 'Sheet1', 1, 8, [[1.2]]);
  await setActive(page, { selection: { row: 1, col: 1, rows: 16, cols: 3 } });
  await view(page, 'verification');
  await page.click('#verify-read');
  await page.waitForSelector('#verify-claims fieldset');
}

async function type(page: Page, id: string, text: string): Promise<void> {
  await page.fill(id, text);
  await page.dispatchEvent(id, 'change');
}

describeInBrowser('task pane: verification', () => {
  const open = usePane();

  test('per material: the CVs, limits and verdicts of VERIFY.PRECISION, trueness and sigma', async () => {
    const { context, page, errors } = await open();
    await readStudy(page);
    await type(page, '#verify-claimR-0', '1.5');
    await type(page, '#verify-claimWl-0', '3');
    await type(page, '#verify-assigned-0', '10');
    await type(page, '#verify-uAssigned-0', '0.05');
    await type(page, '#verify-claimR-1', 'H1');
    await type(page, '#verify-claimWl-1', '2');
    await page.waitForFunction(() => !(document.querySelector('[data-material="Level 2"] [data-key="rLimit"]')?.textContent ?? '').includes('#'));
    const vp1 = evaluate('VERIFY.PRECISION', [col(L1), col(RUNS), 1.5, 3, 2])[1];
    const vp2 = evaluate('VERIFY.PRECISION', [col(L2), col(RUNS), 1.2, 2, 2])[1];
    const m1 = '#verify-results [data-material="Level 1"]';
    const m2 = '#verify-results [data-material="Level 2"]';
    expect(await page.textContent(`${m1} [data-key="rLimit"]`)).toBe(`1.50 % → ${fmt(vp1[2] as number)} %`);
    expect(await page.textContent(`${m1} [data-key="rOk"]`)).toBe(vp1[3]);
    expect(await page.textContent(`${m1} [data-key="wlOk"]`)).toBe(vp1[7]);
    expect(await page.textContent(`${m2} [data-key="rLimit"]`)).toBe(`1.20 % → ${fmt(vp2[2] as number)} %`);
    const tr = evaluate('VERIFY.TRUENESS', [col(L1), col(RUNS), 10, 0.05, 2])[1];
    expect(await page.textContent(`${m1} [data-key="tOk"]`)).toBe(tr[7]);
    expect(await page.textContent(`${m1} [data-key="biasPct"]`)).toContain(`(${fmt(tr[3] as number)} %)`);
    // Sigma against the demo table's first analyte at its tier: says which tier and where from.
    expect(await page.textContent('#verify-spec')).toMatch(/desirable tier \(the sheet tier chosen in Fill\)/);
    expect(await page.isVisible(`${m1} [data-key="sigma"]`)).toBe(true);
    expect(await page.locator(`${m2} [data-key="sigma"]`).count()).toBe(0);
    await screenshot(page, 'pane-verification.png');
    // A material with trueness and a within-lab CV can hand them to What-if, QC and Summary.
    expect(await page.locator('#verify-use-1').count()).toBe(0);
    await page.click('#verify-use-0');
    expect(await statusText(page)).toMatch(new RegExp(`observed bias ${fmt(tr[3] as number)} % and CV ${fmt(evaluate('DATA.PRECISION', [col(L1), col(RUNS)])[1][5] as number)} % from verification of Sheet1!A1:C16 \\(Level 1\\)`));
    await view(page, 'qc');
    expect(await page.inputValue('#qc-bias')).toBe(String(tr[3]));
    expect(errors).toEqual([]);
    await context.close();
  });

  test('writing: refused over cells that hold something, written after confirmation, live formulas', async () => {
    const { context, page, errors } = await open();
    await readStudy(page);
    await type(page, '#verify-claimR-0', '1.5');
    await type(page, '#verify-claimWl-0', '3');
    await type(page, '#verify-claimR-1', 'H1');
    await type(page, '#verify-claimWl-1', '2');
    await setCells(page, 'Sheet1', 20, 6, [['keep me']]);
    await page.click('#verify-write');
    await page.waitForSelector('#verify-replace');
    expect(await statusText(page)).toMatch(/^Nothing written: .*F20/);
    await screenshot(page, 'verification-confirm.png');
    await page.click('#verify-replace');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Wrote'));
    const req = await lastCall<BlockWrite>(page, 'writeBlock');
    expect(req.overwrite).toBe(true);
    expect(req.areas[0]).toMatchObject({ row: 1, col: 5 });
    const formulas = req.areas[0].cells.flat().filter((c) => c && c.content.kind === 'formula').map((c) => (c!.content as { formula: string }).formula);
    expect(formulas).toContain('=$H$1');
    expect(formulas.some((f) => f.startsWith('=INDEX(LEEWAY.VERIFY.PRECISION($B$2:$B$16,$A$2:$A$16,'))).toBe(true);
    const texts = req.areas[0].cells.flat().filter((c) => c && c.content.kind === 'text').map((c) => (c!.content as { text: string }).text);
    expect(texts.some((t) => t.startsWith('Caution: '))).toBe(true);
    expect(texts.some((t) => t.startsWith('Data: Sheet1!A1:C16'))).toBe(true);
    expect(texts.some((t) => /^Written: \d{4}-\d\d-\d\d \d\d:\d\d UTC by Leeway /.test(t))).toBe(true);
    expect(texts).toContain('DEMO — invented data, not for clinical use');
    expect(errors).toEqual([]);
    await context.close();
  });

  test('a comparison: DATA.AGREEMENT’s figures and the difference plot, readable by screen readers', async () => {
    const { context, page, errors } = await open();
    const X = [102, 98, 110, 95, 104, 99, 120, 87];
    const Y = [104, 97, 113, 96, 107, 98, 118, 90];
    await setCells(page, 'Sheet1', 2, 2, [['Comparative', 'Candidate'], ...X.map((x, i) => [x, Y[i]])]);
    await setActive(page, { selection: { row: 2, col: 2, rows: 9, cols: 2 } });
    await view(page, 'verification');
    await page.click('label:has-text("Comparison of two methods")');
    await page.click('#verify-read');
    await page.waitForSelector('#agreement-plot svg');
    const f = evaluate('DATA.AGREEMENT', [col(X), col(Y)])[1];
    expect(await page.textContent('#agreement-facts [data-key="Upper limit"]')).toContain(fmt(f[7] as number, 3));
    expect(await page.locator('#agreement-plot circle.point').count()).toBe(8);
    expect(await page.getAttribute('#agreement-plot svg', 'role')).toBe('img');
    expect(await page.textContent('#agreement-plot svg desc')).toMatch(/^Difference plot of 8 pairs/);
    const box = await page.locator('#agreement-plot svg').boundingBox();
    expect(box!.width).toBeLessThanOrEqual(320);
    await screenshot(page, 'verification-comparison.png');
    await page.click('#verify-write');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Wrote'));
    const req = await lastCall<BlockWrite>(page, 'writeBlock');
    expect(req.areas[0]).toMatchObject({ row: 2, col: 5 });
    expect(errors).toEqual([]);
    await context.close();
  });

  test('bad selections say what to select', async () => {
    const { context, page, errors } = await open();
    await setCells(page, 'Sheet1', 1, 1, [[1], [2], [3]]);
    await setActive(page, { selection: { row: 1, col: 1, rows: 3, cols: 1 } });
    await view(page, 'verification');
    await page.click('#verify-read');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Nothing read'));
    expect(await statusText(page)).toMatch(/run or day labels and, beside them, one column of results per material/);
    await setCells(page, 'Sheet1', 1, 2, [[10.1], ['10,3'], [9.9]]);
    await setActive(page, { selection: { row: 1, col: 1, rows: 3, cols: 2 } });
    await page.click('#verify-read');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').includes('B2 holds the text "10,3"'));
    expect(errors).toEqual([]);
    await context.close();
  });
});
