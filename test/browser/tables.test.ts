/**
 * Task pane in Chromium, Tables view: importing a good and a bad CSV and reading the report,
 * the header-mapping step, import only after acceptance, the library kept between sessions,
 * rename/delete/export, the demo table always marked, import from the selected range, and
 * markup in an analyte name shown as text.
 */
import * as fs from 'fs';
import * as path from 'path';
import { describeInBrowser, usePane } from './harness';
import { importFile, importAndAccept, view, TABLES, FIXTURES, setCells, setActive, screenshot, statusText, tempCsv } from './helpers';
import { mulberry32, uniform } from '../support/prng';
import { parseTableText, formatProblem } from '../../src/engine/table';
import { DEMO_MARKER } from '../../src/engine/caution';

describeInBrowser('task pane: variation tables', () => {
  const open = usePane();

  test('a good CSV gives a report without problems; nothing is stored until accepted; then it is listed and in use', async () => {
    const { context, page, errors } = await open();
    await screenshot(page, 'pane-tables.png');
    await importFile(page, path.join(TABLES, 'good.csv'), 'Lab table');
    expect(await page.textContent('#report-summary')).toMatch(/^3 data rows, 0 errors, 0 warnings · separator “,”/);
    expect(await page.isEnabled('#accept-import')).toBe(true);
    // Not stored yet.
    expect(await page.evaluate(() => localStorage.getItem('leeway.tables.v1'))).toBeNull();
    await page.click('#accept-import');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Imported'));
    expect(await page.textContent('#table-name')).toBe('Lab table · 3 rows');
    expect(await page.isHidden('#demo-badge')).toBe(true);
    const cards = await page.$$eval('#table-list .card-title', (els) => els.map((e) => e.textContent));
    expect(cards).toEqual(['Demo chemistry (invented)', 'Lab tablein use']);
    // Kept between sessions: a new pane in the same browser profile lists it.
    await page.reload();
    await page.waitForSelector('body[data-ready="true"]');
    const after = await page.$$eval('#table-list .card-title', (els) => els.map((e) => e.textContent));
    expect(after).toContain('Lab table');
    const facts = await page.$eval('#table-list li:nth-child(2) dl', (e) => e.textContent);
    expect(facts).toContain('Invented for tests (2026-01)');
    expect(facts).toMatch(/Imported\d{4}-\d{2}-\d{2} from good\.csv/);
    expect(errors).toEqual([]);
    await context.close();
  });

  test('a bad CSV lists every problem with its row and column, as the engine reports them, and cannot be imported', async () => {
    const { context, page, errors } = await open();
    const file = path.join(TABLES, 'bad-cv.csv');
    await importFile(page, file);
    const expected = parseTableText(fs.readFileSync(file, 'utf8'));
    expect(expected.errorCount).toBeGreaterThan(3);
    const shown = await page.$$eval('#problems li', (els) =>
      els.map((e) => ({ row: Number(e.getAttribute('data-row')), column: e.getAttribute('data-column'), text: e.textContent })),
    );
    expect(shown.map((s) => [s.row, s.column])).toEqual(expected.problems.map((p) => [p.row, p.column ?? '']));
    shown.forEach((s, i) => {
      const p = expected.problems[i];
      expect(s.text).toContain(p.message);
      expect(s.text).toContain(`Row ${p.row}`);
      if (p.column) expect(s.text).toContain(`column ${p.column}`);
    });
    // e.g. "row 2, column B (cvi): error: …" in the engine's own words.
    expect(formatProblem(expected.problems[0])).toMatch(/^row 2, column B/);
    expect(await page.isDisabled('#accept-import')).toBe(true);
    expect(await page.textContent('#accept-import')).toBe('Fix the errors to import');
    expect(await statusText(page)).toMatch(/errors? to fix\. Nothing was imported\./);
    await screenshot(page, 'pane-import-report.png');
    await page.click('#cancel-import');
    expect(await page.evaluate(() => localStorage.getItem('leeway.tables.v1'))).toBeNull();
    expect(errors).toEqual([]);
    await context.close();
  });

  test('the header-mapping step: other header names are matched, an unknown one can be mapped, and the report follows', async () => {
    const { context, page } = await open();
    const file = path.join(TABLES, 'aliases.csv');
    const text = fs.readFileSync(file, 'utf8');
    await importFile(page, file);
    const before = parseTableText(text);
    const unknown = before.columns.find((c) => c.field === null)!;
    expect(unknown).toBeDefined();
    expect(await page.$eval(`#review select[data-header="${unknown.header}"]`, (e) => (e as HTMLSelectElement).value)).toBe('');
    for (const c of before.columns.filter((x) => x.field)) {
      expect(await page.$eval(`#review select[data-header="${c.header}"]`, (e) => (e as HTMLSelectElement).value)).toBe(c.field);
    }
    // Map the unknown column onto "note": the warning about it goes away, as in the engine.
    await page.selectOption(`#review select[data-header="${unknown.header}"]`, 'note');
    const after = parseTableText(text, { mapping: { [unknown.header]: 'note' } });
    const plural = (n: number, w: string) => `${n} ${w}${n === 1 ? '' : 's'}`;
    expect(await page.textContent('#report-summary')).toContain(`${plural(after.rowCount, 'data row')}, ${plural(after.errorCount, 'error')}, ${plural(after.warningCount, 'warning')}`);
    expect(after.warningCount).toBeLessThan(before.warningCount);
    // Focus stays on the control the user changed.
    expect(await page.evaluate(() => (document.activeElement as HTMLElement).getAttribute('data-header'))).toBe(unknown.header);
    await context.close();
  });

  test('rename, export to CSV and delete; the demo table cannot be deleted and is always marked as demo data', async () => {
    const { context, page } = await open();
    expect(await page.textContent('#demo-badge')).toBe(DEMO_MARKER);
    expect(await page.isVisible('#demo-badge')).toBe(true);
    const demoCard = page.locator('#table-list li[data-table-id="demo"]');
    expect(await demoCard.textContent()).toContain(DEMO_MARKER);
    expect(await demoCard.locator('button', { hasText: 'Delete' }).count()).toBe(0);
    await importAndAccept(page, path.join(TABLES, 'good.csv'), 'Chem');
    const card = page.locator('#table-list li:not([data-table-id="demo"])');
    await card.locator('button', { hasText: 'Rename' }).click();
    await page.fill('.rename-input', 'Chemistry 2026');
    await page.keyboard.press('Enter');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Renamed'));
    expect(await page.textContent('#table-name')).toBe('Chemistry 2026 · 3 rows');
    const [download] = await Promise.all([page.waitForEvent('download'), card.locator('button', { hasText: 'Export CSV' }).click()]);
    const saved = await download.path();
    const csv = fs.readFileSync(saved as string, 'utf8');
    expect(download.suggestedFilename()).toBe('Chemistry 2026.csv');
    const back = parseTableText(csv);
    expect(back.ok).toBe(true);
    expect(back.candidate!.rows.map((r) => [r.analyte, r.cvi, r.cvg])).toEqual(parseTableText(fs.readFileSync(path.join(TABLES, 'good.csv'), 'utf8')).candidate!.rows.map((r) => [r.analyte, r.cvi, r.cvg]));
    // The demo export is marked too.
    const [demoDownload] = await Promise.all([page.waitForEvent('download'), demoCard.locator('button', { hasText: 'Export CSV' }).click()]);
    expect(fs.readFileSync((await demoDownload.path()) as string, 'utf8')).toContain(DEMO_MARKER);
    await card.locator('button', { hasText: 'Delete' }).click();
    await page.click('button:has-text("Yes, delete")');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Deleted'));
    expect(await page.$$eval('#table-list li', (els) => els.length)).toBe(1);
    expect(await page.isVisible('#demo-badge')).toBe(true);
    await context.close();
  });

  test('a table can be read from the selected worksheet range; problems name the sheet’s own cells', async () => {
    const { context, page } = await open();
    await setCells(page, 'Sheet1', 4, 3, [
      ['Analyte', 'CVI', 'CVG', 'Source'],
      ['Arvelin', 5.7, 6.9, 'Invented for tests (2026-01)'],
      ['Brontase', -2, 18.1, 'Invented for tests (2026-01)'],
    ]);
    await setActive(page, { selection: { row: 4, col: 3, rows: 3, cols: 4 } });
    await view(page, 'library');
    await page.click('#import-range');
    await page.waitForSelector('#review:not([hidden]) #report-summary');
    const first = await page.$eval('#problems li', (e) => [e.getAttribute('data-row'), e.getAttribute('data-column')]);
    expect(first).toEqual(['6', 'D']);
    expect(await page.isDisabled('#accept-import')).toBe(true);
    await context.close();
  });

  test('a 5,000-row table is read and checked in under a second, and accepted into the library', async () => {
    const { context, page } = await open();
    const rand = mulberry32(5000);
    const lines = ['analyte;specimen;unit;cvi;cvg;source'];
    for (let i = 0; i < 5000; i++) lines.push(`Invented ${i};serum;U/L;${uniform(rand, 1, 30).toFixed(2).replace('.', ',')};${uniform(rand, 1, 50).toFixed(2).replace('.', ',')};Invented for tests (2026-01)`);
    await importFile(page, tempCsv('five-thousand.csv', '\uFEFF' + lines.join('\r\n')));
    const ms = Number(await page.getAttribute('#review', 'data-check-ms'));
    console.log(`import check, 5,000 rows (semicolons, decimal commas, BOM): ${ms} ms`);
    expect(ms).toBeLessThan(1000);
    expect(await page.textContent('#report-summary')).toMatch(/^5000 data rows, 0 errors, 0 warnings · separator “;”/);
    await page.click('#accept-import');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Imported'));
    expect(await page.textContent('#table-name')).toBe('five-thousand · 5000 rows');
    await context.close();
  });

  test('a 5 MB file with a problem every 100 rows: the report lists the first 200 and offers the rest, nothing is stored, the pane stays usable', async () => {
    const { context, page } = await open();
    const lines = ['analyte,specimen,unit,cvi,cvg,source,note'];
    const pad = 'x'.repeat(40);
    let i = 0;
    while (lines.reduce((n, l) => n + l.length + 1, 0) < 5 * 1024 * 1024) {
      lines.push(`Invented ${i},serum,U/L,${i % 100 === 99 ? 'n/a' : 4.5},6.5,Invented for tests (2026-01),${pad}`);
      i++;
    }
    const file = tempCsv('five-mb.csv', lines.join('\n'));
    expect(fs.statSync(file).size).toBeGreaterThanOrEqual(5 * 1024 * 1024);
    await importFile(page, file);
    const expected = parseTableText(fs.readFileSync(file, 'utf8'));
    expect(expected.errorCount).toBe(Math.floor(i / 100));
    expect(await page.$$eval('#problems li', (e) => e.length)).toBe(200);
    expect(await page.textContent('#review')).toContain(`Show all ${expected.problems.length} problems`);
    expect(await page.isDisabled('#accept-import')).toBe(true);
    console.log(`import check, 5 MB (${i} rows): ${await page.getAttribute('#review', 'data-check-ms')} ms`);
    // Still responsive: the tabs and the cancel button work at once.
    await view(page, 'fill');
    await view(page, 'library');
    await page.click('#cancel-import');
    expect(await statusText(page)).toBe('Import cancelled: nothing was imported.');
    expect(await page.evaluate(() => localStorage.getItem('leeway.tables.v1'))).toBeNull();
    await context.close();
  });

  test('the CSV corpus: each file gives the engine’s report in the pane and an empty file imports nothing', async () => {
    const { context, page } = await open();
    for (const name of fs.readdirSync(TABLES).filter((f) => /\.(csv|tsv)$/.test(f)).sort()) {
      const text = fs.readFileSync(path.join(TABLES, name), 'utf8');
      const r = parseTableText(text);
      await view(page, 'library');
      if (await page.isVisible('#cancel-import')) await page.click('#cancel-import');
      await page.setInputFiles('#import-file', path.join(TABLES, name));
      await page.waitForSelector('#review:not([hidden]) #report-summary');
      const plural = (n: number, w: string) => `${n} ${w}${n === 1 ? '' : 's'}`;
      expect({ name, summary: (await page.textContent('#report-summary'))!.split(' · ')[0] }).toEqual({ name, summary: `${plural(r.rowCount, 'data row')}, ${plural(r.errorCount, 'error')}, ${plural(r.warningCount, 'warning')}` });
      expect({ name, problems: await page.$$eval('#problems li', (e) => e.length) }).toEqual({ name, problems: Math.min(200, r.problems.length) });
      expect({ name, enabled: await page.isEnabled('#accept-import') }).toEqual({ name, enabled: r.ok });
    }
    expect(await page.evaluate(() => localStorage.getItem('leeway.tables.v1'))).toBeNull();
    await context.close();
  });

  test('markup in an analyte name or source renders as text and never runs', async () => {
    const { context, page, errors } = await open();
    await importAndAccept(page, path.join(FIXTURES, 'markup.csv'), '<i>Markup</i> table');
    expect(await page.textContent('#table-name')).toBe('<i>Markup</i> table · 3 rows');
    await view(page, 'fill');
    const names = await page.$$eval('#analyte-list .name', (els) => els.map((e) => e.textContent));
    expect(names).toEqual(['<img src=x onerror="window.__xss=1"> (serum)', '<b>Boldane</b> (plasma)', '=HYPERLINK("http://example.invalid") (serum)']);
    await view(page, 'whatif');
    const options = await page.$$eval('#whatif-analyte option', (els) => els.map((e) => e.textContent));
    expect(options[0]).toBe('<img src=x onerror="window.__xss=1"> (serum)');
    await view(page, 'library');
    expect(await page.textContent('#table-list')).toContain('<script>window.__xss=2</script>');
    // No element was made from the data, and nothing ran.
    expect(await page.$$eval('#app img, #app b, #app i, #app script', (els) => els.length)).toBe(0);
    expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
    expect(errors).toEqual([]);
    await context.close();
  });
});
