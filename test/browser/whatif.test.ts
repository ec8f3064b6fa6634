/**
 * Task pane in Chromium, What-if view: the three tiers equal the engine's SPEC.TIERS; observed
 * bias/CV typed or read from the active row give the engine's sigma, share and tier met; the
 * chart plots those numbers; the tier cell of a filled sheet is changed from the pane; and the
 * what-if of a 1,000-analyte sheet takes under 200 ms of script time.
 */
import type { Page } from 'playwright-core';
import { describeInBrowser, usePane } from './harness';
import { evaluate } from '../../src/registry';
import { view, setCells, setActive, lastCall, screenshot, statusText, tempCsv, importAndAccept, checkAndFill } from './helpers';
import { demoTable } from '../../src/engine/demo';
import { tierTable } from '../../src/engine/spec';
import { observedTotalError, sigmaMetric, allowanceShare, tierMet } from '../../src/engine/perf';
import { formatFixed } from '../../src/engine/round';
import { rowKey } from '../../src/engine/table';
import { TIERS } from '../../src/engine/tiers';
import type { FillPlan } from '../../src/engine/fill';
import { mulberry32, uniform } from '../support/prng';

async function tierRows(page: Page): Promise<Array<Record<string, string>>> {
  return page.$$eval('#whatif-tiers tbody tr', (trs) =>
    trs.map((tr) => {
      const o: Record<string, string> = { tier: tr.getAttribute('data-tier') ?? '' };
      tr.querySelectorAll('td').forEach((td) => (o[td.getAttribute('data-col') ?? ''] = td.textContent ?? ''));
      return o;
    }),
  );
}

describeInBrowser('task pane: what-if', () => {
  const open = usePane();

  test('the three tiers shown equal the engine’s SPEC.TIERS, in the table and in the chart', async () => {
    const { context, page, errors } = await open();
    await view(page, 'whatif');
    for (const r of demoTable().rows.slice(0, 4)) {
      await page.selectOption('#whatif-analyte', rowKey(r.analyte, r.specimen));
      const engine = tierTable(r.cvi, r.cvg as number, 1.65);
      const shown = await tierRows(page);
      TIERS.forEach((t, i) => {
        expect(shown[i].tier).toBe(t);
        expect(shown[i].cv).toBe(formatFixed(engine[i].cv, 2));
        expect(shown[i].bias).toBe(formatFixed(engine[i].bias, 2));
        expect(shown[i].total).toBe(formatFixed(engine[i].total, 2));
      });
      const bars = await page.$$eval('#whatif-detail svg rect.bar', (els) => els.map((e) => Number(e.getAttribute('data-allowable'))));
      expect(bars.slice(0, 3)).toEqual(engine.map((e) => e.total));
    }
    expect(errors).toEqual([]);
    await context.close();
  });

  test('observed bias and CV typed give the engine’s observed total error, sigma, share and tier met', async () => {
    const { context, page } = await open();
    await view(page, 'whatif');
    const r = demoTable().rows[0];
    const cvg = r.cvg as number;
    const cases = [
      { bias: 3.5, cv: 4.4 },
      { bias: '0,4', cv: '1,3' },
      { bias: -1.2, cv: 2.1 },
    ];
    for (const c of cases) {
      await page.fill('#obs-bias', String(c.bias));
      await page.fill('#obs-cv', String(c.cv));
      const bias = Number(String(c.bias).replace(',', '.'));
      const cv = Number(String(c.cv).replace(',', '.'));
      const te = observedTotalError(bias, cv, 1.65);
      const shown = await tierRows(page);
      tierTable(r.cvi, cvg, 1.65).forEach((t, i) => {
        expect(shown[i].sigma).toBe(formatFixed(sigmaMetric(t.total, bias, cv), 2));
        expect(shown[i].share).toBe(`${formatFixed(allowanceShare(te, t.total) * 100, 0)} %`);
        expect(shown[i].met).toBe(te <= t.total ? 'yes' : 'no');
      });
      expect(await page.getAttribute('#tier-met', 'data-value')).toBe(tierMet(r.cvi, cvg, bias, cv, 1.65, 'total'));
      expect(Number(await page.getAttribute('#whatif-result dd[data-value]', 'data-value'))).toBe(te);
      expect(Number(await page.getAttribute('#whatif-detail svg line.observed', 'data-observed'))).toBe(te);
    }
    await screenshot(page, 'pane-whatif.png');
    await context.close();
  });

  test('observed bias and CV read from the active row give the same figures; the row’s analyte is selected', async () => {
    const { context, page } = await open();
    const r = demoTable().rows[2];
    await setCells(page, 'Sheet1', 1, 1, [
      ['Analyte', 'Specimen', 'Bias %', 'CV %'],
      [demoTable().rows[0].analyte, demoTable().rows[0].specimen, 1, 1],
      [r.analyte, r.specimen, -0.8, 1.7],
    ]);
    await setActive(page, { sheet: 'Sheet1', activeRow: 3 });
    await view(page, 'whatif');
    await page.click('#read-active-row');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Read'));
    expect(await page.$eval('#whatif-analyte', (e) => (e as HTMLSelectElement).value)).toBe(rowKey(r.analyte, r.specimen));
    expect(await page.inputValue('#obs-bias')).toBe('-0.8');
    expect(await page.inputValue('#obs-cv')).toBe('1.7');
    expect(await page.textContent('#obs-note')).toBe('Read from Sheet1 C3, D3.');
    expect(await page.getAttribute('#tier-met', 'data-value')).toBe(tierMet(r.cvi, r.cvg as number, -0.8, 1.7, 1.65, 'total'));
    const shown = await tierRows(page);
    tierTable(r.cvi, r.cvg as number, 1.65).forEach((t, i) => expect(shown[i].sigma).toBe(formatFixed(sigmaMetric(t.total, -0.8, 1.7), 2)));
    // A row without observed figures says what is missing.
    await setCells(page, 'Sheet1', 4, 1, [[r.analyte, 'plasma-x', '', '']]);
    await setActive(page, { activeRow: 4 });
    await page.click('#read-active-row');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').length > 0 && !(document.querySelector('#status')?.textContent ?? '').startsWith('Reading'));
    expect(await statusText(page)).toMatch(/no observed bias|not in the table/);
    await context.close();
  });

  test('the tier cell of the filled sheet is changed from the pane', async () => {
    const { context, page } = await open();
    await view(page, 'whatif');
    expect(await page.isDisabled('#apply-tier')).toBe(true);
    await view(page, 'fill');
    await checkAndFill(page);
    const plan = await lastCall<FillPlan>(page, 'writeFill');
    await view(page, 'whatif');
    expect(await page.textContent('#tier-cell')).toContain(`tier cell ${plan.tierCell} (now desirable)`);
    await page.check('#tier-cell input[value="optimum"]');
    await page.click('#apply-tier');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').includes('now uses the optimum tier'));
    expect(await lastCall(page, 'setTierCell')).toEqual({ sheet: 'Specifications', cell: plan.tierCell, tier: 'optimum' });
    const cell = await page.evaluate((a) => (window as unknown as { fakeWorkbook: { cell: (s: string, a: string) => { value: string } } }).fakeWorkbook.cell('Specifications', a).value, plan.tierCell.replace(/\$/g, ''));
    expect(cell).toBe('optimum');
    // Every derived formula of the plan reads that cell.
    const formulas = plan.cells.filter((c) => c.content.kind === 'formula' && /SPEC\.(CV|BIAS|TOTAL|MU)/.test(c.content.formula));
    expect(formulas.length).toBeGreaterThan(0);
    expect(formulas.every((c) => c.content.kind === 'formula' && c.content.formula.includes(plan.tierCell))).toBe(true);

    await context.close();

    // In a later session (a new pane) the tier cell is found on the filled sheet by its label.
    const later = await open();
    const page2 = later.page;
    await page2.evaluate((pl) => (window as unknown as { leewayTestHost: { writeFill: (x: unknown) => Promise<unknown> } }).leewayTestHost.writeFill(pl), { ...plan, cells: plan.cells.map((c) => (c.address === plan.tierCell.replace(/\$/g, '') ? { ...c, content: { kind: 'text', text: 'optimum' } } : c)) });
    await view(page2, 'whatif');
    expect(await page2.isDisabled('#apply-tier')).toBe(true);
    await page2.click('#find-tier-cell');
    await page2.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Found'));
    expect(await page2.textContent('#tier-target')).toContain(`tier cell ${plan.tierCell} (now optimum)`);
    await page2.check('#tier-cell input[value="minimum"]');
    await page2.click('#apply-tier');
    await page2.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').includes('now uses the minimum tier'));
    expect(await lastCall(page2, 'setTierCell')).toEqual({ sheet: 'Specifications', cell: plan.tierCell, tier: 'minimum' });
    await later.context.close();
  });

  test('the demo’s invented study results fill every demo analyte; the menu counts the tiers met', async () => {
    const { context, page } = await open();
    await view(page, 'whatif');
    await page.click('#use-demo-observed');
    const n = demoTable().rows.length;
    expect(await page.$$eval('#menu-table tbody tr', (t) => t.length)).toBe(n);
    const counts = await page.textContent('#menu-counts');
    expect(counts).toMatch(new RegExp(`^With observed data: ${n}\\. Meet optimum \\d+, desirable \\d+, minimum \\d+, none \\d+\\.$`));
    const nums = (counts as string).match(/\d+/g)!.slice(1).map(Number);
    expect(nums.reduce((a, b) => a + b, 0)).toBe(n);
    expect(await statusText(page)).toContain('DEMO — invented data, not for clinical use');
    await context.close();
  });

  test('a 1,000-analyte sheet: what-if in under 200 ms of script time', async () => {
    const { context, page } = await open({ height: 900 });
    const rand = mulberry32(1000);
    const lines = ['analyte,specimen,unit,cvi,cvg,source'];
    const rows: unknown[][] = [['Analyte', 'Specimen', 'Bias %', 'CV %']];
    for (let i = 0; i < 1000; i++) {
      const name = `Invented analyte ${String(i).padStart(4, '0')}`;
      lines.push(`${name},serum,U/L,${uniform(rand, 1, 20).toFixed(2)},${uniform(rand, 2, 40).toFixed(2)},Invented for tests (2026-01)`);
      rows.push([name, 'serum', Number(uniform(rand, -5, 5).toFixed(2)), Number(uniform(rand, 0.5, 6).toFixed(2))]);
    }
    await importAndAccept(page, tempCsv('thousand.csv', lines.join('\n')), 'Thousand');
    await setCells(page, 'Sheet1', 1, 1, rows);
    await setActive(page, { sheet: 'Sheet1', activeRow: 2 });
    // Switching to the view renders the detail and the 1,000-row table synchronously.
    const openMs = await page.evaluate(() => {
      const t0 = performance.now();
      (document.querySelector('#tab-whatif') as HTMLButtonElement).click();
      return performance.now() - t0;
    });
    await page.click('#read-sheet-observed');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Read observed'));
    const sheetMs = Number(await page.getAttribute('#whatif-menu', 'data-sheet-ms'));
    const renderMs = Number(await page.getAttribute('#whatif-menu', 'data-render-ms'));
    expect(await page.$$eval('#menu-table tbody tr', (t) => t.length)).toBe(1000);
    expect(await statusText(page)).toBe('Read observed bias and CV for 1000 analytes from Sheet1.');
    console.log(`what-if, 1,000 analytes: open view ${openMs.toFixed(1)} ms; read sheet + compute + render ${sheetMs} ms (table render ${renderMs} ms)`);
    expect(openMs).toBeLessThan(200);
    expect(sheetMs).toBeLessThan(200);
    await context.close();
  });

  test('"Explain the active cell" shows the message Excel keeps no room for (#DIV/0! from a zero CV)', async () => {
    const { context, page } = await open();
    // Columns as a user types them: allowable, bias, CV, then the sigma formula in D2.
    await setCells(page, 'Sheet1', 1, 1, [
      ['TEa %', 'Bias %', 'CV %', 'Sigma'],
      [6.94, 1.2, 0, '=LEEWAY.PERF.SIGMA(A2,B2,C2)'],
    ]);
    await setActive(page, { sheet: 'Sheet1', activeCell: { sheet: 'Sheet1', address: 'D2' } });
    await view(page, 'whatif');
    await page.click('#explain-cell');
    await page.waitForSelector('#explain-message');
    const want = evaluate('PERF.SIGMA', [6.94, 1.2, 0])[0][0] as { error: string; message: string };
    expect(await page.textContent('#explain-message')).toBe(`${want.error} ${want.message}`);
    expect(await page.textContent('#explain-message')).toMatch(/^#DIV\/0! cv must not be zero/);
    const reads = await page.evaluate(() => (window as unknown as { fakeWorkbook: { log: Array<{ name: string; args: unknown }> } }).fakeWorkbook.log.filter((l) => l.name === 'readRanges'));
    expect(reads[reads.length - 1].args).toEqual([
      { sheet: null, address: 'A2' },
      { sheet: null, address: 'B2' },
      { sheet: null, address: 'C2' },
    ]);
    await page.locator('#explain-cell-box').scrollIntoViewIfNeeded();
    await screenshot(page, 'pane-explain.png');
    await context.close();
  });
});
