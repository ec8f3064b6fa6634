/**
 * Task pane entry. Waits for Office, picks the workbook host (Excel, or none in a plain browser),
 * the per-user storage for the table library, and mounts the pane.
 *
 * Test hook: a page may define `window.leewayTestHost` (a PaneHost) before this script runs; the
 * pane then uses it instead of Excel. Only the workbook I/O is replaced: every view, the engine,
 * the planner and the storage run as in Excel. The browser tests use this with a recording fake.
 */
import type { PaneHost } from './host';
import { noWorkbookHost } from './host';
import { excelPaneHost } from './excel/paneHost';
import { chooseStore, TableLibrary } from './store';
import { mountPane } from './app';

declare global {
  interface Window {
    leewayTestHost?: PaneHost;
  }
}

async function boot(hostKind: string | null): Promise<void> {
  const app = document.getElementById('app');
  if (!app) return;
  const host =
    window.leewayTestHost ??
    (hostKind === 'Excel'
      ? excelPaneHost()
      : noWorkbookHost('Not inside Excel: the table library and what-if work; filling and reading sheets need Excel.'));
  const g = window as unknown as Parameters<typeof chooseStore>[0];
  const library = new TableLibrary(await chooseStore(g));
  await mountPane(app, host, library);
  document.body.dataset.ready = 'true';
}

if (typeof Office !== 'undefined' && typeof Office.onReady === 'function') {
  void Office.onReady((info) => boot(info && info.host ? String(info.host) : null));
} else {
  void boot(null);
}
