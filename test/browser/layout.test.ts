/**
 * Task pane in Chromium: readable at the narrow default width (no sideways scrolling of the pane
 * at 320 px, on every view), usable by keyboard (tab list with arrow keys, visible focus ring,
 * every control named), the caution always on screen, the bundle small and
 * free of remote code, and the pane starting in a plain browser with the real office.js.
 */
import * as fs from 'fs';
import * as path from 'path';
import type { Page } from 'playwright-core';
import { describeInBrowser, DIST, usePane } from './harness';
import { view, screenshot } from './helpers';
import { CAUTION } from '../../src/engine/caution';

const VIEWS = ['library', 'fill', 'whatif', 'verification', 'qc', 'review', 'summary'] as const;

/** Controls in the visible panel without an accessible name (label, aria-label or text). */
async function unnamed(page: Page): Promise<string[]> {
  return page.$$eval('#app button, #app input, #app select, #app summary, #app [role="tab"]', (els) =>
    els
      .filter((e) => (e as HTMLElement).offsetParent !== null)
      .filter((e) => {
        const el = e as HTMLInputElement;
        if (el.getAttribute('aria-label') || el.getAttribute('aria-labelledby')) return false;
        if (el.labels && el.labels.length > 0) return false;
        if ((el.tagName === 'BUTTON' || el.tagName === 'SUMMARY') && (el.textContent ?? '').trim() !== '') return false;
        return true;
      })
      .map((e) => e.outerHTML.slice(0, 120)),
  );
}

describeInBrowser('task pane: narrow width, keyboard, caution', () => {
  const open = usePane();

  test('at 320 px no view scrolls sideways, and every visible control has a name', async () => {
    const { context, page, errors } = await open({ width: 320 });
    // Put content in every view: observed figures for the demo, a fill check.
    await view(page, 'whatif');
    await page.click('#use-demo-observed');
    await view(page, 'fill');
    await page.click('#check-fill');
    await page.waitForSelector('#run-fill');
    for (const v of VIEWS) {
      await view(page, v);
      const widths = await page.evaluate(() => ({ doc: document.documentElement.scrollWidth, body: document.body.scrollWidth, view: window.innerWidth }));
      expect({ view: v, width: Math.max(widths.doc, widths.body) }).toEqual({ view: v, width: widths.view });
      expect({ view: v, unnamed: await unnamed(page) }).toEqual({ view: v, unnamed: [] });
    }
    expect(errors).toEqual([]);
    await context.close();
  });

  test('the navigation works by keyboard: arrows, Home and End in each row, Down/Enter into a step, Up back, Enter into a view', async () => {
    const { context, page } = await open();
    const active = (): Promise<string | undefined> => page.evaluate(() => document.activeElement?.id);
    await page.focus('#step-specify');
    // The first row: the steps of the job, arrows move and select.
    await page.keyboard.press('ArrowRight');
    expect(await active()).toBe('step-verify');
    expect(await page.getAttribute('#step-verify', 'aria-selected')).toBe('true');
    expect(await page.isVisible('#panel-verification')).toBe(true);
    await page.keyboard.press('End');
    expect(await active()).toBe('step-report');
    expect(await page.isVisible('#panel-summary')).toBe(true);
    await page.keyboard.press('ArrowRight');
    expect(await active()).toBe('step-specify');
    await page.keyboard.press('ArrowLeft');
    expect(await active()).toBe('step-report');
    await page.keyboard.press('Home');
    expect(await active()).toBe('step-specify');
    // Down goes to the step's views; arrows move and select among them only.
    await page.keyboard.press('ArrowDown');
    expect(await active()).toBe('tab-library');
    await page.keyboard.press('ArrowRight');
    expect(await active()).toBe('tab-fill');
    expect(await page.getAttribute('#tab-fill', 'aria-selected')).toBe('true');
    expect(await page.isVisible('#panel-fill')).toBe(true);
    await page.keyboard.press('End');
    expect(await active()).toBe('tab-whatif');
    await page.keyboard.press('ArrowRight');
    expect(await active()).toBe('tab-library');
    await page.keyboard.press('ArrowLeft');
    expect(await active()).toBe('tab-whatif');
    // Only the views of the chosen step are shown, and one tab per row is in the Tab order.
    const tabs = await page.$$eval('[role="tab"]', (t) => t.filter((e) => (e as HTMLElement).offsetParent !== null).map((e) => `${e.id}:${(e as HTMLElement).tabIndex}`));
    expect(tabs).toEqual(['step-specify:0', 'step-verify:-1', 'step-control:-1', 'step-report:-1', 'tab-library:-1', 'tab-fill:-1', 'tab-whatif:0']);
    // Up returns to the steps; a step remembers the view last shown in it.
    await page.keyboard.press('ArrowUp');
    expect(await active()).toBe('step-specify');
    await page.keyboard.press('End');
    await page.keyboard.press('Home');
    expect(await page.isVisible('#panel-whatif')).toBe(true);
    await page.keyboard.press('Enter');
    expect(await active()).toBe('tab-whatif');
    // Enter on a view moves into its panel; Tab then reaches its first control, with a 2 px ring.
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('ArrowLeft');
    expect(await active()).toBe('tab-library');
    await page.keyboard.press('Enter');
    expect(await active()).toBe('panel-library');
    await page.keyboard.press('Tab');
    const focused = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement;
      const cs = getComputedStyle(el);
      return { inPanel: !!el.closest('#panel-library'), outline: `${cs.outlineStyle} ${cs.outlineWidth}` };
    });
    expect(focused.inPanel).toBe(true);
    expect(focused.outline).toBe('solid 2px');
    await context.close();
  });

  test('the navigation is ARIA-correct: every tab controls an existing panel labelled by it, rows are named', async () => {
    const { context, page } = await open();
    for (const step of ['specify', 'verify', 'control', 'report']) {
      await page.click(`#step-${step}`);
      const report = await page.evaluate(() => {
        const problems: string[] = [];
        for (const list of Array.from(document.querySelectorAll('[role="tablist"]'))) {
          if (!list.getAttribute('aria-label')) problems.push(`unnamed tablist ${list.id}`);
          const selected = Array.from(list.querySelectorAll('[role="tab"]')).filter((t) => t.getAttribute('aria-selected') === 'true');
          if (selected.length !== 1) problems.push(`${selected.length} selected in ${list.getAttribute('aria-label')}`);
        }
        for (const t of Array.from(document.querySelectorAll('[role="tab"]'))) {
          const panel = document.getElementById(t.getAttribute('aria-controls') ?? '');
          if (!panel || panel.getAttribute('role') !== 'tabpanel') problems.push(`${t.id} controls no tabpanel`);
          else if (t.getAttribute('aria-selected') === 'true' && panel.getAttribute('aria-labelledby') !== t.id) problems.push(`${panel.id} not labelled by ${t.id}`);
        }
        return problems;
      });
      expect({ step, report }).toEqual({ step, report: [] });
    }
    await context.close();
  });

  test('an error from one view does not stay on screen in another', async () => {
    const { context, page } = await open();
    await view(page, 'whatif');
    // The fake workbook's active sheet is empty: reading the active row fails with a message.
    await page.click('#read-active-row');
    await page.waitForFunction(() => document.querySelector('#status')?.classList.contains('error'));
    for (const v of ['qc', 'summary'] as const) {
      await view(page, v);
      expect({ v, status: await page.textContent('#status') }).toEqual({ v, status: '' });
    }
    await context.close();
  });

  test('a what-if can be done by keyboard alone', async () => {
    const { context, page } = await open();
    await page.focus('#step-specify');
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('End');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-whatif');
    await page.keyboard.press('Tab'); // analyte
    await page.keyboard.press('ArrowDown'); // next analyte
    await page.keyboard.press('Tab'); // bias
    await page.keyboard.type('1.5');
    await page.keyboard.press('Tab'); // CV
    await page.keyboard.type('2');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('obs-cv');
    expect(await page.getAttribute('#tier-met', 'data-value')).toMatch(/^(optimum|desirable|minimum|none)$/);
    await context.close();
  });

  test('the caution is on screen in every view and opens by keyboard to its full text', async () => {
    const { context, page } = await open({ height: 600 });
    for (const v of VIEWS) {
      await view(page, v);
      await page.evaluate(() => window.scrollTo(0, document.body.scrollHeight / 2));
      const box = await page.locator('#caution summary').boundingBox();
      expect(box).not.toBeNull();
      expect(box!.y).toBeGreaterThanOrEqual(0);
      expect(box!.y + box!.height).toBeLessThanOrEqual(600);
    }
    await page.focus('#caution summary');
    await page.keyboard.press('Enter');
    expect(await page.getAttribute('#caution', 'open')).not.toBeNull();
    expect(await page.textContent('#caution p')).toBe(CAUTION);
    await context.close();
  });

  test('screenshots of the pane at its default width', async () => {
    const { context, page } = await open();
    await page.click('#caution summary');
    await screenshot(page, 'pane-caution.png');
    await context.close();
  });

  test('the task-pane bundle is small, loads nothing remote, and keeps the Content-Security-Policy', () => {
    const js = fs.readFileSync(path.join(DIST, 'taskpane.js'), 'utf8');
    const html = fs.readFileSync(path.join(DIST, 'taskpane.html'), 'utf8');
    const kb = Buffer.byteLength(js) / 1024;
    console.log(`taskpane.js: ${kb.toFixed(1)} KB minified (office.js not included)`);
    expect(kb).toBeLessThan(300);
    expect(html).toContain("script-src 'self'");
    expect(html).toContain("connect-src 'self'");
    expect(html).not.toMatch(/<script>(?!\s*<\/script>)|\sstyle=|https?:\/\//);
    expect(js).not.toMatch(/innerHTML\s*=|insertAdjacentHTML|document\.write/);
  });

  test('in a plain browser with the real office.js the pane starts, says it is not in Excel, and makes no outside request', async () => {
    const { context, page, errors } = await open({ realOffice: true });
    expect(await page.isVisible('#host-note')).toBe(true);
    expect(await page.textContent('#host-note')).toMatch(/^Not inside Excel/);
    const timing = await page.evaluate(() => {
      const fcp = performance.getEntriesByName('first-contentful-paint')[0];
      const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming;
      return { fcp: fcp ? fcp.startTime : NaN, domContentLoaded: nav.domContentLoadedEventEnd };
    });
    console.log(`first contentful paint ${timing.fcp.toFixed(0)} ms, DOMContentLoaded ${timing.domContentLoaded.toFixed(0)} ms (real office.js served with the add-in, localhost)`);
    expect(timing.fcp).toBeLessThan(2000);
    expect(errors.filter((e) => e.startsWith('blocked request') || /Content Security Policy/i.test(e))).toEqual([]);
    // The library works without a workbook; a workbook action says why it cannot run.
    await view(page, 'library');
    await page.click('#import-range');
    await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('No workbook'));
    await context.close();
  });
});
