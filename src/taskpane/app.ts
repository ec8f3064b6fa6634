/**
 * The pane's shell: a header naming the table in use, five views behind a tab list (arrow keys
 * move between tabs), one status line that announces progress and errors, and the caution of
 * SPEC.md section 9 in a footer that is always on screen.
 */
import { h, replace } from './dom';
import type { PaneHost } from './host';
import { PaneState } from './state';
import { TableLibrary } from './store';
import { CAUTION, DEMO_MARKER } from '../engine/caution';
import { libraryView } from './views/library';
import { fillView } from './views/fill';
import { compareView } from './views/compare';
import { qcView } from './views/qc';
import { summaryView } from './views/summary';
import { demoTable, DEMO_ID } from './demo';

export type StatusKind = 'info' | 'busy' | 'ok' | 'error';

export interface PaneContext {
  readonly host: PaneHost;
  readonly library: TableLibrary;
  readonly state: PaneState;
  status(message: string, kind?: StatusKind): void;
  /** Switches to a view by id. */
  show(view: ViewId): void;
  /** Selects a table (demo or library id) and loads its rows. */
  useTable(id: string): Promise<void>;
}

export interface View {
  readonly root: HTMLElement;
  /** Called when the view is shown. */
  refresh(): void;
}

export type ViewId = 'library' | 'fill' | 'compare' | 'qc' | 'summary';

const VIEWS: ReadonlyArray<{ id: ViewId; label: string; make: (ctx: PaneContext) => View }> = [
  { id: 'library', label: 'Tables', make: libraryView },
  { id: 'fill', label: 'Fill', make: fillView },
  { id: 'compare', label: 'What-if', make: compareView },
  { id: 'qc', label: 'QC', make: qcView },
  { id: 'summary', label: 'Summary', make: summaryView },
];

export async function mountPane(app: HTMLElement, host: PaneHost, library: TableLibrary): Promise<PaneContext> {
  const state = new PaneState();
  const statusLine = h('p', { class: 'status', id: 'status', role: 'status', 'aria-live': 'polite' });
  const tableName = h('span', { class: 'table-name', id: 'table-name' });
  const demoBadge = h('span', { class: 'badge demo', id: 'demo-badge', hidden: true }, DEMO_MARKER);
  const hostNote = h('p', { class: 'host-note', id: 'host-note', hidden: host.available }, host.label);
  const tabs = h('div', { class: 'tabs', role: 'tablist', 'aria-label': 'Leeway views' });
  const panels = h('div', { class: 'panels' });

  const views = new Map<ViewId, { tab: HTMLButtonElement; panel: HTMLElement; view: View | null; make: (c: PaneContext) => View }>();
  let current: ViewId = 'library';

  const ctx: PaneContext = {
    host,
    library,
    state,
    status(message, kind = 'info') {
      statusLine.className = `status ${kind}`;
      statusLine.textContent = message;
    },
    show(id) {
      select(id, false);
    },
    async useTable(id) {
      if (id === DEMO_ID) {
        state.setTable(DEMO_ID, demoTable());
        return;
      }
      const t = await library.get(id);
      if (!t) {
        ctx.status('That table could not be read from this computer’s storage; the demo table is in use instead.', 'error');
        state.setTable(DEMO_ID, demoTable());
        return;
      }
      state.setTable(id, t);
    },
  };

  function select(id: ViewId, focus: boolean): void {
    current = id;
    for (const [vid, v] of views) {
      const on = vid === id;
      v.tab.setAttribute('aria-selected', on ? 'true' : 'false');
      v.tab.tabIndex = on ? 0 : -1;
      v.panel.hidden = !on;
      if (on) {
        if (!v.view) {
          v.view = v.make(ctx);
          v.panel.appendChild(v.view.root);
        }
        v.view.refresh();
      }
    }
    if (focus) views.get(id)?.tab.focus();
  }

  for (const v of VIEWS) {
    const tab = h('button', {
      type: 'button',
      role: 'tab',
      id: `tab-${v.id}`,
      'aria-controls': `panel-${v.id}`,
      'aria-selected': 'false',
      tabindex: -1,
      class: 'tab',
    }, v.label);
    const panel = h('section', { id: `panel-${v.id}`, role: 'tabpanel', 'aria-labelledby': `tab-${v.id}`, class: 'panel', hidden: true });
    tab.addEventListener('click', () => select(v.id, false));
    tabs.appendChild(tab);
    panels.appendChild(panel);
    views.set(v.id, { tab, panel, view: null, make: v.make });
  }
  tabs.addEventListener('keydown', (e) => {
    const ids = VIEWS.map((v) => v.id);
    const i = ids.indexOf(current);
    let next: number | null = null;
    if (e.key === 'ArrowRight') next = (i + 1) % ids.length;
    else if (e.key === 'ArrowLeft') next = (i - 1 + ids.length) % ids.length;
    else if (e.key === 'Home') next = 0;
    else if (e.key === 'End') next = ids.length - 1;
    if (next !== null) {
      e.preventDefault();
      select(ids[next], true);
    }
  });

  state.on((t) => {
    if (t !== 'table' && t !== 'library') return;
    const tbl = state.table;
    tableName.textContent = tbl ? `${tbl.name} · ${tbl.rows.length} rows` : 'No table';
    demoBadge.hidden = !(tbl && tbl.demo);
    const v = views.get(current);
    if (v && v.view) v.view.refresh();
  });

  const caution = h(
    'details',
    { class: 'caution', id: 'caution' },
    h('summary', {}, h('span', { class: 'caution-mark', 'aria-hidden': 'true' }, '!'), 'Caution: read before using these figures'),
    h('p', {}, CAUTION),
  );

  replace(
    app,
    h(
      'header',
      { class: 'top' },
      h('div', { class: 'brand' }, h('span', { class: 'product' }, 'Leeway'), tableName),
      demoBadge,
      hostNote,
    ),
    tabs,
    statusLine,
    panels,
    h('footer', { class: 'bottom' }, caution),
  );
  await ctx.useTable(DEMO_ID);
  select('library', false);
  return ctx;
}
