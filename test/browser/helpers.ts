/** Small steps the browser tests share: open a view, import a file, read the fake workbook's log. */
import * as fs from 'fs';
import * as path from 'path';
import type { Page } from 'playwright-core';
import { docsPath } from './harness';

export const TABLES = path.join(__dirname, '..', 'fixtures', 'tables');
export const FIXTURES = path.join(__dirname, 'fixtures');

export interface LogEntry {
  name: string;
  args: unknown;
}

export type ViewName = 'library' | 'fill' | 'whatif' | 'verification' | 'qc' | 'review' | 'summary';

/** Shows a view as a user does: its step in the first row of tabs, then the view in the second. */
export async function view(page: Page, id: ViewName): Promise<void> {
  const step = await page.getAttribute(`#tab-${id}`, 'data-step');
  await page.click(`#step-${step}`);
  await page.click(`#tab-${id}`);
  await page.waitForSelector(`#panel-${id}:not([hidden])`);
}

export async function log(page: Page): Promise<LogEntry[]> {
  return page.evaluate(() => (window as unknown as { fakeWorkbook: { log: LogEntry[] } }).fakeWorkbook.log);
}

/** Fill view: check the fill, run it, and wait until the pane reports it filled. */
export async function checkAndFill(page: Page): Promise<void> {
  await page.click('#check-fill');
  await page.waitForSelector('#run-fill');
  await page.click('#run-fill');
  await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Filled'));
}

export async function lastCall<T>(page: Page, name: string): Promise<T> {
  const entries = (await log(page)).filter((e) => e.name === name);
  if (!entries.length) throw new Error(`no ${name} call in the fake workbook's log`);
  return entries[entries.length - 1].args as T;
}

/** Picks a file in the import step and waits for the report. */
export async function importFile(page: Page, file: string, name?: string): Promise<void> {
  await view(page, 'library');
  if (name !== undefined) await page.fill('#import-name', name);
  await page.setInputFiles('#import-file', file);
  await page.waitForSelector('#review:not([hidden]) #report-summary');
}

/** Imports a file and accepts the report. */
export async function importAndAccept(page: Page, file: string, name?: string): Promise<void> {
  await importFile(page, file, name);
  await page.click('#accept-import');
  await page.waitForSelector('#review[hidden]', { state: 'attached' });
  await page.waitForFunction(() => (document.querySelector('#status')?.textContent ?? '').startsWith('Imported'));
}

/** Writes a CSV into a temporary file and returns its path. */
export function tempCsv(name: string, text: string): string {
  const dir = fs.mkdtempSync(path.join(require('os').tmpdir(), 'leeway-pane-'));
  const p = path.join(dir, name);
  fs.writeFileSync(p, text);
  return p;
}

/** Sets cells of the fake workbook (row-major from the given top-left, 1-based). */
export async function setCells(page: Page, sheet: string, row: number, col: number, rows: unknown[][]): Promise<void> {
  await page.evaluate(([s, r, c, v]) => (window as unknown as { fakeWorkbook: { setCells: (...a: unknown[]) => void } }).fakeWorkbook.setCells(s, r, c, v), [sheet, row, col, rows] as const);
}

export async function setActive(
  page: Page,
  o: { sheet?: string; activeRow?: number; selection?: { row: number; col: number; rows: number; cols: number }; activeCell?: { sheet: string; address: string } },
): Promise<void> {
  await page.evaluate((x) => {
    const wb = (window as unknown as { fakeWorkbook: Record<string, unknown> }).fakeWorkbook;
    if (x.sheet) wb.active = x.sheet;
    if (x.activeRow) wb.activeRow = x.activeRow;
    if (x.selection) wb.selection = x.selection;
    if (x.activeCell) wb.activeCell = x.activeCell;
  }, o);
}

/** A full-height screenshot at the pane's width (the sticky caution footer lands at the bottom). */
export async function screenshot(page: Page, file: string, width = 320): Promise<void> {
  const height = await page.evaluate(() => Math.ceil(document.documentElement.scrollHeight));
  await page.setViewportSize({ width, height: Math.max(480, Math.min(height, 4000)) });
  await page.screenshot({ path: docsPath(file) });
  await page.setViewportSize({ width, height: 720 });
}

export async function statusText(page: Page): Promise<string> {
  return (await page.textContent('#status')) ?? '';
}
