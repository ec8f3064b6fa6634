/**
 * Task pane in Chromium: readable at the narrow default width (no sideways scrolling of the pane
 * at 320 px, on every view), usable by keyboard (tab list with arrow keys, visible focus ring,
 * every control named), the caution of SPEC.md section 9 always on screen, the bundle small and
 * free of remote code, and the pane starting in a plain browser with the real office.js.
 */
import * as fs from 'fs';
import * as path from 'path';
import type { Page } from 'playwright-core';
import { describeInBrowser, DIST, usePane } from './harness';
import { view, screenshot } from './helpers';
import { CAUTION } from '../../src/engine/caution';

const VIEWS = ['library', 'fill', 'compare', 'qc', 'summary'] as const;

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
    await view(page, 'compare');
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

  test('the tab list works with arrow keys, Home and End; Tab moves into the view; focus is visible', async () => {
    const { context, page } = await open();
    await page.focus('#tab-library');
    await page.keyboard.press('ArrowRight');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-fill');
    expect(await page.getAttribute('#tab-fill', 'aria-selected')).toBe('true');
    expect(await page.isVisible('#panel-fill')).toBe(true);
    await page.keyboard.press('End');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-summary');
    await page.keyboard.press('ArrowRight');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-library');
    await page.keyboard.press('ArrowLeft');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-summary');
    await page.keyboard.press('Home');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-library');
    // Only the selected tab is in the Tab order.
    expect(await page.$$eval('[role="tab"]', (t) => t.map((e) => (e as HTMLElement).tabIndex))).toEqual([0, -1, -1, -1, -1]);
    // Tab leaves the tab list into the view; the focused control shows a 2 px ring.
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

  test('a what-if can be done by keyboard alone', async () => {
    const { context, page } = await open();
    await page.focus('#tab-library');
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowRight');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('tab-compare');
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

  test('the caution is on screen in every view and opens by keyboard to the full text of SPEC.md section 9', async () => {
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
