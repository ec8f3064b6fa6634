/**
 * The pane's shell: a header naming the table in use, the navigation (steps, then the views of
 * a step; views are listed in views/index.ts), one status line for progress and errors, and the
 * laboratory caution in a footer that is always on screen. Views are built the first time they
 * are shown. A message in the status line belongs to the view that raised it: showing another
 * view, or starting another action, clears it.
 */
import { h, replace } from './dom';
import type { PaneHost } from './host';
import { PaneState } from './state';
import { TableLibrary } from './store';
import { CAUTION, DEMO_MARKER } from '../engine/caution';
import { demoTable, DEMO_ID } from './demo';
import { STEPS, VIEWS } from './views';
import type { ViewEntry } from './views';
import { buildNav } from './nav';
import { messageOf } from './view';
import type { PaneContext, StatusKind, View } from './view';

export type { PaneContext, View, StatusKind, ViewId } from './view';

interface Slot {
  readonly entry: ViewEntry;
  readonly panel: HTMLElement;
  view: View | null;
}

/** The status line: one message at a time, remembered with the view that raised it. */
function statusLine(): { el: HTMLElement; show(message: string, kind: StatusKind, owner: string): void; clear(): void; clearUnlessOwner(owner: string): void } {
  const el = h('p', { class: 'status', id: 'status', role: 'status', 'aria-live': 'polite' });
  let owner = '';
  return {
    el,
    show(message, kind, by) {
      owner = by;
      el.className = `status ${kind}`;
      el.textContent = message;
    },
    clear() {
      owner = '';
      el.className = 'status';
      el.textContent = '';
    },
    clearUnlessOwner(viewId) {
      if (owner !== viewId) this.clear();
    },
  };
}

function panelFor(entry: ViewEntry): HTMLElement {
  const panel = h('section', { id: `panel-${entry.id}`, role: 'tabpanel', 'aria-labelledby': `tab-${entry.id}`, class: 'panel', tabindex: -1, hidden: true });
  if (!entry.make) panel.appendChild(h('div', { class: 'view coming' }, h('h2', {}, entry.label), h('p', { class: 'hint' }, entry.meanwhile ?? 'Not in the pane yet.')));
  return panel;
}

function cautionFooter(): HTMLElement {
  const caution = h(
    'details',
    { class: 'caution', id: 'caution' },
    h('summary', {}, h('span', { class: 'caution-mark', 'aria-hidden': 'true' }, '!'), 'Caution: read before using these figures'),
    h('p', {}, CAUTION),
  );
  return h('footer', { class: 'bottom' }, caution);
}

function makeContext(host: PaneHost, library: TableLibrary, state: PaneState, status: ReturnType<typeof statusLine>, current: () => string, show: (id: string) => void): PaneContext {
  const ctx: PaneContext = {
    host,
    library,
    state,
    status: (message, kind = 'info') => status.show(message, kind, current()),
    async run(busy, action) {
      const owner = current();
      status.show(busy, 'busy', owner);
      try {
        const done = await action();
        if (done) status.show(done, 'ok', owner);
        else status.clear();
        return true;
      } catch (e) {
        status.show(messageOf(e), 'error', owner);
        return false;
      }
    },
    show,
    async useTable(id) {
      const t = id === DEMO_ID ? demoTable() : await library.get(id);
      if (!t) ctx.status('That table could not be read from this computer’s storage; the demo table is in use instead.', 'error');
      state.setTable(t ? id : DEMO_ID, t ?? demoTable());
    },
  };
  return ctx;
}

export async function mountPane(app: HTMLElement, host: PaneHost, library: TableLibrary): Promise<PaneContext> {
  const state = new PaneState();
  const status = statusLine();
  const tableName = h('span', { class: 'table-name', id: 'table-name' });
  const demoBadge = h('span', { class: 'badge demo', id: 'demo-badge', hidden: true }, DEMO_MARKER);
  const hostNote = h('p', { class: 'host-note', id: 'host-note', hidden: host.available }, host.label);
  const slots = new Map<string, Slot>(VIEWS.map((entry) => [entry.id, { entry, panel: panelFor(entry), view: null }]));
  if (slots.size !== VIEWS.length) throw new Error('Two views share an id in views/index.ts.');
  let current = VIEWS[0].id;

  const ctx = makeContext(host, library, state, status, () => current, (id) => select(id, false));
  const nav = buildNav(STEPS, VIEWS, { choose: (id, focus) => select(id, focus), enter: (id) => slots.get(id)?.panel.focus() });

  function select(id: string, focus: boolean): void {
    const slot = slots.get(id);
    if (!slot) throw new Error(`No view “${id}” in views/index.ts.`);
    current = id;
    status.clearUnlessOwner(id);
    nav.mark(id);
    for (const s of slots.values()) s.panel.hidden = s !== slot;
    if (slot.entry.make && !slot.view) {
      slot.view = slot.entry.make(ctx);
      slot.panel.appendChild(slot.view.root);
    }
    slot.view?.refresh();
    if (focus) nav.viewTabs.get(id)?.focus();
  }

  state.on((t) => {
    if (t !== 'table' && t !== 'library') return;
    const tbl = state.table;
    tableName.textContent = tbl ? `${tbl.name} · ${tbl.rows.length} rows` : 'No table';
    demoBadge.hidden = !(tbl && tbl.demo);
    slots.get(current)?.view?.refresh();
  });

  const brand = h('div', { class: 'brand' }, h('span', { class: 'product' }, 'Leeway'), tableName);
  const panels = h('div', { class: 'panels' }, ...[...slots.values()].map((s) => s.panel));
  replace(app, h('header', { class: 'top' }, brand, demoBadge, hostNote), nav.root, status.el, panels, cautionFooter());
  await ctx.useTable(DEMO_ID);
  select(VIEWS[0].id, false);
  return ctx;
}
