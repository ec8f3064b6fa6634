/**
 * The library list: the built-in demo and the user's tables, each with what it is and where it
 * came from; use, export to CSV, rename and delete (with an inline confirmation: add-ins may not
 * open alert/confirm dialogs).
 */
import { h, replace, field, uid } from '../../dom';
import type { PaneContext } from '../../view';
import { PaneError } from '../../view';
import { tableToCsv } from '../../../engine/table';
import type { VariationTable } from '../../../engine/table';
import { DEMO_MARKER } from '../../../engine/caution';
import type { TableMeta } from '../../store';
import { metaOf } from '../../store';
import { DEMO_ID, demoTable } from '../../demo';

function storageLabel(ctx: PaneContext): string {
  switch (ctx.library.storageKind) {
    case 'office-runtime':
      return 'add-in storage';
    case 'local-storage':
      return 'browser storage of the add-in';
    case 'memory':
      return 'storage unavailable: tables last until the pane closes';
  }
}

async function exportCsv(ctx: PaneContext, m: TableMeta): Promise<string> {
  const t: VariationTable | null = m.demo ? demoTable() : await ctx.library.get(m.id);
  if (!t) throw new PaneError('That table could not be read from storage.');
  const csv = tableToCsv(t, { bom: true });
  const blob = new Blob([m.demo ? `# ${DEMO_MARKER}\r\n${csv}` : csv], { type: 'text/csv;charset=utf-8' });
  const url = URL.createObjectURL(blob);
  const a = h('a', { href: url, download: `${m.name.replace(/[\\/:*?"<>|]+/g, '_')}.csv`, class: 'download-link' }, `Download ${m.name}.csv`);
  document.body.appendChild(a);
  a.click();
  setTimeout(() => {
    a.remove();
    URL.revokeObjectURL(url);
  }, 1000);
  return `Exported “${m.name}” as CSV (${t.rows.length} rows).`;
}

export interface ListPart {
  readonly root: HTMLElement;
  render(): Promise<void>;
}

export function listPart(ctx: PaneContext): ListPart {
  const root = h('div', { class: 'table-list', id: 'table-list' });

  function startRename(li: HTMLElement, m: TableMeta): void {
    const input = h('input', { type: 'text', value: m.name, class: 'rename-input' });
    const buttons = h('div', { class: 'actions' }, h('button', { type: 'submit', class: 'primary' }, 'Save name'), h('button', { type: 'button', onclick: () => void render() }, 'Cancel'));
    const form = h('form', { class: 'inline-form' }, field('New name', input), buttons);
    form.addEventListener('submit', (e) => {
      e.preventDefault();
      void ctx
        .run('Renaming…', async () => {
          const renamed = await ctx.library.rename(m.id, input.value);
          if (ctx.state.tableId === m.id) await ctx.useTable(m.id);
          return `Renamed to “${renamed.name}”.`;
        })
        .then(() => render());
    });
    li.appendChild(form);
    input.focus();
    input.select();
  }

  function startDelete(li: HTMLElement, m: TableMeta): void {
    const yes = async (): Promise<string> => {
      await ctx.library.remove(m.id);
      if (ctx.state.tableId === m.id) await ctx.useTable(DEMO_ID);
      await render();
      return `Deleted “${m.name}”.`;
    };
    const actions = h('div', { class: 'actions' }, h('button', { type: 'button', class: 'danger', onclick: () => void ctx.run('Deleting…', yes) }, 'Yes, delete'), h('button', { type: 'button', onclick: () => void render() }, 'Keep it'));
    const box = h('div', { class: 'confirm', role: 'group', 'aria-label': `Delete ${m.name}` }, h('p', {}, `Delete “${m.name}” from this computer? Filled sheets keep their values.`), actions);
    li.appendChild(box);
    (box.querySelector('button') as HTMLButtonElement).focus();
  }

  function card(m: TableMeta): HTMLElement {
    const inUse = ctx.state.tableId === m.id;
    const titleId = uid('card');
    const actions = h('div', { class: 'actions' });
    const facts = h('dl', { class: 'facts' }, h('dt', {}, 'Rows'), h('dd', {}, String(m.rowCount)), h('dt', {}, 'Source'), h('dd', {}, m.sources || '—'), h('dt', {}, m.demo ? 'Built in' : 'Imported'), h('dd', {}, m.demo ? 'with the add-in' : `${m.importedAt.slice(0, 10)} from ${m.origin || 'a file'}`));
    const title = h('h3', { id: titleId, class: 'card-title' }, m.name, inUse ? h('span', { class: 'badge' }, 'in use') : null);
    const li = h('li', { class: `card${inUse ? ' in-use' : ''}`, 'aria-labelledby': titleId, 'data-table-id': m.id }, title, m.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null, facts, actions);
    const use = async (): Promise<string> => {
      await ctx.useTable(m.id);
      await render();
      return `Using “${m.name}”. Choose analytes and tiers in Fill.`;
    };
    if (!inUse) actions.appendChild(h('button', { type: 'button', class: 'primary', onclick: () => void ctx.run(`Loading “${m.name}”…`, use) }, 'Use this table'));
    actions.appendChild(h('button', { type: 'button', onclick: () => void ctx.run('Exporting…', () => exportCsv(ctx, m)) }, 'Export CSV'));
    if (!m.demo) {
      actions.appendChild(h('button', { type: 'button', onclick: () => startRename(li, m) }, 'Rename'));
      actions.appendChild(h('button', { type: 'button', class: 'danger', onclick: () => startDelete(li, m) }, 'Delete'));
    }
    return li;
  }

  async function render(): Promise<void> {
    let metas: TableMeta[] = [];
    try {
      metas = await ctx.library.list();
    } catch (e) {
      ctx.status(`The library could not be read: ${e instanceof Error ? e.message : String(e)}`, 'error');
    }
    const items = [metaOf(DEMO_ID, demoTable()), ...metas];
    replace(root, h('h2', {}, 'Your variation tables'), h('p', { class: 'hint' }, `Kept on this computer (${storageLabel(ctx)}), not in the workbook.`), h('ul', { class: 'cards', 'aria-label': 'Variation tables' }, ...items.map(card)));
  }
  return { root, render };
}
