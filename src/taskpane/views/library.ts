/**
 * Tables view: the user's library of variation tables. Import from a CSV/TSV file (its bytes, in
 * any encoding the importer reads, within the importer's size limit) or the selected worksheet range, map headers, read the report of every problem (row and
 * column as a spreadsheet shows them), and only then accept. Rename, delete (with an inline
 * confirmation: add-ins may not open alert/confirm dialogs), export to CSV. The demo table is
 * built in and always marked as demo data.
 */
import { h, replace, field, uid } from '../dom';
import type { PaneContext, View } from '../view';
import {
  acceptImport,
  FIELDS,
  parseTableBytes,
  parseTableGrid,
  tableToCsv,
} from '../../engine/table';
import { IMPORT_LIMITS, describeBytes, decimalText } from '../../engine/import';
import type { Field, GridCell, HeaderMapping, ImportResult, Problem, VariationTable } from '../../engine/table';
import { DEMO_MARKER } from '../../engine/caution';
import type { TableMeta } from '../store';
import { LibraryError, metaOf } from '../store';
import { DEMO_ID, demoTable } from '../demo';

/** Problems listed before "show all" (a 5 MB file can have thousands). */
const REPORT_PAGE = 200;

type Pending =
  | { kind: 'bytes'; bytes: Uint8Array; name: string; origin: string }
  | { kind: 'grid'; grid: GridCell[][]; name: string; origin: string; firstRow: number; firstColumn: number };

function dateOf(iso: string): string {
  return iso.slice(0, 10);
}

export function libraryView(ctx: PaneContext): View {
  const root = h('div', { class: 'view library' });
  const listBox = h('div', { class: 'table-list', id: 'table-list' });
  const importBox = h('div', { class: 'import', id: 'import' });
  const reviewBox = h('div', { class: 'review', id: 'review', hidden: true });

  let pending: Pending | null = null;
  let mapping: Record<string, Field | null> = {};
  let result: ImportResult | null = null;
  let showAll = false;

  // ---- the library list -------------------------------------------------------------------
  async function renderList(): Promise<void> {
    let metas: TableMeta[] = [];
    try {
      metas = await ctx.library.list();
    } catch (e) {
      ctx.status(`The library could not be read: ${e instanceof Error ? e.message : String(e)}`, 'error');
    }
    const demo = metaOf(DEMO_ID, demoTable());
    const items = [demo, ...metas];
    const ul = h('ul', { class: 'cards', 'aria-label': 'Variation tables' });
    for (const m of items) ul.appendChild(card(m));
    replace(
      listBox,
      h('h2', {}, 'Your variation tables'),
      h('p', { class: 'hint' }, `Kept on this computer (${storageLabel()}), not in the workbook.`),
      ul,
    );
  }

  function storageLabel(): string {
    switch (ctx.library.storageKind) {
      case 'office-runtime':
        return 'add-in storage';
      case 'local-storage':
        return 'browser storage of the add-in';
      case 'memory':
        return 'storage unavailable: tables last until the pane closes';
    }
  }

  function card(m: TableMeta): HTMLElement {
    const inUse = ctx.state.tableId === m.id;
    const titleId = uid('card');
    const actions = h('div', { class: 'actions' });
    const li = h(
      'li',
      { class: `card${inUse ? ' in-use' : ''}`, 'aria-labelledby': titleId, 'data-table-id': m.id },
      h('h3', { id: titleId, class: 'card-title' }, m.name, inUse ? h('span', { class: 'badge' }, 'in use') : null),
      m.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null,
      h(
        'dl',
        { class: 'facts' },
        h('dt', {}, 'Rows'),
        h('dd', {}, String(m.rowCount)),
        h('dt', {}, 'Source'),
        h('dd', {}, m.sources || '—'),
        h('dt', {}, m.demo ? 'Built in' : 'Imported'),
        h('dd', {}, m.demo ? 'with the add-in' : `${dateOf(m.importedAt)} from ${m.origin || 'a file'}`),
      ),
      actions,
    );
    if (!inUse) {
      actions.appendChild(
        h('button', { type: 'button', class: 'primary', onclick: () => void use(m) }, 'Use this table'),
      );
    }
    actions.appendChild(h('button', { type: 'button', onclick: () => void exportCsv(m) }, 'Export CSV'));
    if (!m.demo) {
      actions.appendChild(h('button', { type: 'button', onclick: () => startRename(li, m) }, 'Rename'));
      actions.appendChild(h('button', { type: 'button', class: 'danger', onclick: () => startDelete(li, m) }, 'Delete'));
    }
    return li;
  }

  async function use(m: TableMeta): Promise<void> {
    await ctx.useTable(m.id);
    ctx.status(`Using “${m.name}”. Choose analytes and tiers in Fill.`, 'ok');
    await renderList();
  }

  function startRename(li: HTMLElement, m: TableMeta): void {
    const input = h('input', { type: 'text', value: m.name, class: 'rename-input' });
    const form = h(
      'form',
      { class: 'inline-form' },
      field('New name', input),
      h('div', { class: 'actions' }, h('button', { type: 'submit', class: 'primary' }, 'Save name'), h('button', { type: 'button', onclick: () => void renderList() }, 'Cancel')),
    );
    form.addEventListener('submit', (e) => {
      e.preventDefault();
      void (async () => {
        try {
          const renamed = await ctx.library.rename(m.id, input.value);
          if (ctx.state.tableId === m.id) await ctx.useTable(m.id);
          ctx.status(`Renamed to “${renamed.name}”.`, 'ok');
        } catch (err) {
          ctx.status(err instanceof Error ? err.message : String(err), 'error');
        }
        await renderList();
      })();
    });
    li.appendChild(form);
    input.focus();
    input.select();
  }

  function startDelete(li: HTMLElement, m: TableMeta): void {
    const box = h(
      'div',
      { class: 'confirm', role: 'group', 'aria-label': `Delete ${m.name}` },
      h('p', {}, `Delete “${m.name}” from this computer? Filled sheets keep their values.`),
      h(
        'div',
        { class: 'actions' },
        h('button', {
          type: 'button',
          class: 'danger',
          onclick: () =>
            void (async () => {
              await ctx.library.remove(m.id);
              if (ctx.state.tableId === m.id) await ctx.useTable(DEMO_ID);
              ctx.status(`Deleted “${m.name}”.`, 'ok');
              await renderList();
            })(),
        }, 'Yes, delete'),
        h('button', { type: 'button', onclick: () => void renderList() }, 'Keep it'),
      ),
    );
    li.appendChild(box);
    (box.querySelector('button') as HTMLButtonElement).focus();
  }

  async function exportCsv(m: TableMeta): Promise<void> {
    const t: VariationTable | null = m.demo ? demoTable() : await ctx.library.get(m.id);
    if (!t) {
      ctx.status('That table could not be read from storage.', 'error');
      return;
    }
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
    ctx.status(`Exported “${m.name}” as CSV (${t.rows.length} rows).`, 'ok');
  }

  // ---- import -----------------------------------------------------------------------------
  const fileInput = h('input', { type: 'file', id: 'import-file', accept: '.csv,.tsv,.txt,text/csv,text/tab-separated-values' });
  const nameInput = h('input', { type: 'text', id: 'import-name', placeholder: 'file name by default' });
  fileInput.addEventListener('change', () => {
    const f = fileInput.files && fileInput.files[0];
    if (!f) return;
    // The size limit applies before the file is read.
    if (f.size > IMPORT_LIMITS.maxBytes) {
      ctx.status(`${f.name} is ${describeBytes(f.size)}, over the limit of ${describeBytes(IMPORT_LIMITS.maxBytes)}: nothing was read. Save only the table itself.`, 'error');
      fileInput.value = '';
      return;
    }
    ctx.status(`Reading ${f.name}…`, 'busy');
    // Bytes, not text: the importer finds the encoding (UTF-8, UTF-16 with BOM, Windows-1252).
    f.arrayBuffer().then(
      (buffer) => {
        pending = { kind: 'bytes', bytes: new Uint8Array(buffer), name: nameInput.value.trim() || f.name.replace(/\.(csv|tsv|txt)$/i, ''), origin: f.name };
        mapping = {};
        showAll = false;
        // Let the status paint before a large file is parsed.
        setTimeout(check, 0);
      },
      (err: unknown) => ctx.status(`The file could not be read: ${String(err)}`, 'error'),
    );
  });
  const fromRange = h('button', { type: 'button', id: 'import-range' }, 'Read the selected range');
  fromRange.addEventListener('click', () => {
    void (async () => {
      try {
        ctx.status('Reading the selected range…', 'busy');
        const g = await ctx.host.readSelection();
        pending = {
          kind: 'grid',
          grid: g.values,
          name: nameInput.value.trim() || `${g.sheet} table`,
          origin: g.address,
          firstRow: g.firstRow,
          firstColumn: g.firstColumn,
        };
        mapping = {};
        showAll = false;
        check();
      } catch (e) {
        ctx.status(e instanceof Error ? e.message : String(e), 'error');
      }
    })();
  });
  replace(
    importBox,
    h('h2', {}, 'Import a table'),
    h('p', { class: 'hint' }, `Columns: analyte, specimen, unit, cvi, cvg, source, limit_abs, limit_pct, level, note. analyte, cvi and source are required; CVs in percent. UTF-8, UTF-16 with BOM or Windows-1252; up to ${IMPORT_LIMITS.maxBytes / (1024 * 1024)} MiB and ${IMPORT_LIMITS.maxColumns} columns. Nothing is imported until you accept the report.`),
    field('Name in the library', nameInput),
    field('CSV or TSV file', fileInput),
    h('div', { class: 'actions' }, fromRange),
  );

  function check(moveFocus = true): void {
    if (!pending) return;
    const t0 = performance.now();
    const opts = { name: pending.name, origin: pending.origin, mapping: mapping as HeaderMapping };
    result =
      pending.kind === 'bytes'
        ? parseTableBytes(pending.bytes, opts)
        : parseTableGrid(pending.grid, { ...opts, firstRow: pending.firstRow, firstColumn: pending.firstColumn });
    const ms = performance.now() - t0;
    renderReview();
    if (moveFocus) reviewBox.querySelector<HTMLElement>('#review-title')?.focus();
    reviewBox.dataset.checkMs = String(Math.round(ms));
    const r = result;
    ctx.status(
      r.ok
        ? `Read ${r.rowCount} rows: ${r.warningCount} warning${r.warningCount === 1 ? '' : 's'}. Review, then accept to import.`
        : `Read ${r.rowCount} rows: ${r.errorCount} error${r.errorCount === 1 ? '' : 's'} to fix. Nothing was imported.`,
      r.ok ? 'info' : 'error',
    );
  }

  function renderReview(): void {
    if (!pending || !result) {
      reviewBox.hidden = true;
      return;
    }
    const r = result;
    reviewBox.hidden = false;
    const mapRows = h('tbody', {});
    for (const c of r.columns) {
      const sel = h('select', { 'data-header': c.header, 'aria-label': `Field for column ${c.letter} “${c.header}”` });
      sel.appendChild(h('option', { value: '' }, '(ignore this column)'));
      for (const f of FIELDS) sel.appendChild(h('option', { value: f }, f));
      sel.value = c.field ?? '';
      sel.addEventListener('change', () => {
        mapping = { ...mapping, [c.header]: sel.value === '' ? null : (sel.value as Field) };
        check(false);
        const again = reviewBox.querySelector<HTMLSelectElement>(`select[data-header="${CSS.escape(c.header)}"]`);
        again?.focus();
      });
      mapRows.appendChild(
        h(
          'tr',
          {},
          h('th', { scope: 'row' }, c.letter),
          h('td', { class: 'header-text' }, c.header || '(blank)'),
          h(
            'td',
            {},
            sel,
            c.unit !== undefined && c.field !== null ? h('span', { class: 'unit', 'data-unit': c.unit }, ` unit ${c.unit}`) : null,
            c.by === 'alias' ? h('span', { class: 'hint' }, ' matched by another name') : null,
          ),
        ),
      );
    }
    const problems = showAll ? r.problems : r.problems.slice(0, REPORT_PAGE);
    const list = h('ol', { class: 'problems', id: 'problems', 'aria-label': 'Problems found' });
    for (const p of problems) list.appendChild(problemItem(p));
    const accept = h(
      'button',
      { type: 'button', class: 'primary', id: 'accept-import', disabled: !r.ok },
      r.ok ? `Accept and import ${r.rowCount} rows` : 'Fix the errors to import',
    );
    accept.addEventListener('click', () => void doImport());
    reviewBox.dataset.ok = String(r.ok);
    replace(
      reviewBox,
      h('h2', { tabindex: -1, id: 'review-title' }, `Review “${pending.name}”`),
      h(
        'p',
        { class: `summary-line ${r.ok ? 'ok' : 'error'}`, id: 'report-summary' },
        `${r.rowCount} data row${r.rowCount === 1 ? '' : 's'}, ${r.errorCount} error${r.errorCount === 1 ? '' : 's'}, ${r.warningCount} warning${r.warningCount === 1 ? '' : 's'}` +
          (r.delimiter ? ` · separator ${r.delimiter === '\t' ? 'tab' : `“${r.delimiter}”`}` : '') +
          (r.encoding ? ` · ${r.encoding}` : '') +
          (decimalText(r) ? ` · ${decimalText(r)}` : ''),
      ),
      r.columns.length
        ? h(
            'details',
            { class: 'mapping', open: r.columns.some((c) => c.field === null || c.by === 'alias' || c.unit !== undefined) },
            h('summary', {}, 'Header mapping'),
            h('table', { class: 'grid-table' }, h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Col'), h('th', { scope: 'col' }, 'Header'), h('th', { scope: 'col' }, 'Reads as'))), mapRows),
          )
        : null,
      r.problems.length ? list : h('p', { class: 'ok' }, 'No problems found.'),
      !showAll && r.problems.length > REPORT_PAGE
        ? h('button', { type: 'button', onclick: () => { showAll = true; renderReview(); } }, `Show all ${r.problems.length} problems`)
        : null,
      h('div', { class: 'actions' }, accept, h('button', { type: 'button', id: 'cancel-import', onclick: cancel }, 'Cancel')),
    );
  }

  function problemItem(p: Problem): HTMLElement {
    const where =
      p.row === 0 ? 'File' : p.column === null && p.field === undefined ? `Row ${p.row}` : p.column === null ? `Row ${p.row}, column “${p.field ?? '?'}” (missing)` : `Row ${p.row}, column ${p.column}${p.field ? ` (${p.field})` : ''}`;
    return h(
      'li',
      { class: `problem ${p.severity}`, 'data-row': String(p.row), 'data-column': p.column ?? '', 'data-code': p.code },
      h('span', { class: `sev ${p.severity}` }, p.severity === 'error' ? 'Error' : 'Warning'),
      h('span', { class: 'where' }, where),
      h('span', { class: 'what' }, p.message),
    );
  }

  function cancel(): void {
    pending = null;
    result = null;
    fileInput.value = '';
    reviewBox.hidden = true;
    ctx.status('Import cancelled: nothing was imported.', 'info');
    fileInput.focus();
  }

  async function doImport(): Promise<void> {
    if (!result || !pending) return;
    try {
      const table = acceptImport(result, nameInput.value.trim() || pending.name);
      const meta = await ctx.library.add(table);
      pending = null;
      result = null;
      fileInput.value = '';
      nameInput.value = '';
      reviewBox.hidden = true;
      await ctx.useTable(meta.id);
      ctx.status(`Imported “${meta.name}” (${meta.rowCount} rows) and put it in use.`, 'ok');
      await renderList();
    } catch (e) {
      ctx.status(e instanceof LibraryError || e instanceof Error ? e.message : String(e), 'error');
    }
  }

  root.append(listBox, importBox, reviewBox);
  return {
    root,
    refresh() {
      void renderList();
    },
  };
}
