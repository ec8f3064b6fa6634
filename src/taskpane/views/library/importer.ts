/**
 * Importing a table: from a CSV/TSV file (its bytes, in any encoding the importer reads, within
 * the importer's size limit) or the selected worksheet range; the report of every problem is
 * shown, and nothing is imported until the user accepts it.
 */
import { h, replace, field } from '../../dom';
import type { PaneContext } from '../../view';
import { acceptImport, parseTableBytes, parseTableGrid } from '../../../engine/table';
import type { Field, GridCell, HeaderMapping, ImportResult } from '../../../engine/table';
import { IMPORT_LIMITS, describeBytes } from '../../../engine/import';
import { renderReview } from './review';

type Pending =
  | { kind: 'bytes'; bytes: Uint8Array; name: string; origin: string }
  | { kind: 'grid'; grid: GridCell[][]; name: string; origin: string; firstRow: number; firstColumn: number };

interface ImportState {
  pending: Pending | null;
  mapping: Record<string, Field | null>;
  result: ImportResult | null;
  showAll: boolean;
}

function parse(p: Pending, mapping: Record<string, Field | null>): ImportResult {
  const opts = { name: p.name, origin: p.origin, mapping: mapping as HeaderMapping };
  return p.kind === 'bytes' ? parseTableBytes(p.bytes, opts) : parseTableGrid(p.grid, { ...opts, firstRow: p.firstRow, firstColumn: p.firstColumn });
}

/** Reads the chosen file's bytes (refused above the size limit before reading) and starts the check. */
function readFile(ctx: PaneContext, fileInput: HTMLInputElement, nameInput: HTMLInputElement, start: (p: Pending) => void): void {
  const f = fileInput.files && fileInput.files[0];
  if (!f) return;
  if (f.size > IMPORT_LIMITS.maxBytes) {
    ctx.status(`${f.name} is ${describeBytes(f.size)}, over the limit of ${describeBytes(IMPORT_LIMITS.maxBytes)}: nothing was read. Save only the table itself.`, 'error');
    fileInput.value = '';
    return;
  }
  ctx.status(`Reading ${f.name}…`, 'busy');
  // Bytes, not text: the importer finds the encoding (UTF-8, UTF-16 with BOM, Windows-1252).
  f.arrayBuffer().then(
    // Let the status paint before a large file is parsed.
    (buffer) => setTimeout(() => start({ kind: 'bytes', bytes: new Uint8Array(buffer), name: nameInput.value.trim() || f.name.replace(/\.(csv|tsv|txt)$/i, ''), origin: f.name }), 0),
    (err: unknown) => ctx.status(`The file could not be read: ${String(err)}`, 'error'),
  );
}

export function importPart(ctx: PaneContext, imported: () => Promise<void>): { importBox: HTMLElement; reviewBox: HTMLElement } {
  const importBox = h('div', { class: 'import', id: 'import' });
  const reviewBox = h('div', { class: 'review', id: 'review', hidden: true });
  const st: ImportState = { pending: null, mapping: {}, result: null, showAll: false };
  const fileInput = h('input', { type: 'file', id: 'import-file', accept: '.csv,.tsv,.txt,text/csv,text/tab-separated-values' });
  const nameInput = h('input', { type: 'text', id: 'import-name', placeholder: 'file name by default' });

  function render(): void {
    if (!st.pending || !st.result) {
      reviewBox.hidden = true;
      return;
    }
    reviewBox.hidden = false;
    reviewBox.dataset.ok = String(st.result.ok);
    replace(reviewBox, ...renderReview(st.pending.name, st.result, st.showAll, handlers));
  }

  function check(moveFocus = true): void {
    if (!st.pending) return;
    const r = (st.result = parse(st.pending, st.mapping));
    render();
    if (moveFocus) reviewBox.querySelector<HTMLElement>('#review-title')?.focus();
    ctx.status(
      r.ok
        ? `Read ${r.rowCount} rows: ${r.warningCount} warning${r.warningCount === 1 ? '' : 's'}. Review, then accept to import.`
        : `Read ${r.rowCount} rows: ${r.errorCount} error${r.errorCount === 1 ? '' : 's'} to fix. Nothing was imported.`,
      r.ok ? 'info' : 'error',
    );
  }

  function start(p: Pending): void {
    Object.assign(st, { pending: p, mapping: {}, showAll: false });
    check();
  }

  function clear(): void {
    Object.assign(st, { pending: null, result: null });
    fileInput.value = '';
    reviewBox.hidden = true;
  }

  const handlers = {
    remap(header: string, f: Field | null): void {
      st.mapping = { ...st.mapping, [header]: f };
      check(false);
      reviewBox.querySelector<HTMLSelectElement>(`select[data-header="${CSS.escape(header)}"]`)?.focus();
    },
    showAll(): void {
      st.showAll = true;
      render();
    },
    accept(): void {
      const { result, pending } = st;
      if (!result || !pending) return;
      void ctx.run('Importing…', async () => {
        const meta = await ctx.library.add(acceptImport(result, nameInput.value.trim() || pending.name));
        clear();
        nameInput.value = '';
        await ctx.useTable(meta.id);
        await imported();
        return `Imported “${meta.name}” (${meta.rowCount} rows) and put it in use.`;
      });
    },
    cancel(): void {
      clear();
      ctx.status('Import cancelled: nothing was imported.', 'info');
      fileInput.focus();
    },
  };

  fileInput.addEventListener('change', () => readFile(ctx, fileInput, nameInput, start));
  const fromRange = h('button', { type: 'button', id: 'import-range' }, 'Read the selected range');
  fromRange.addEventListener('click', () => {
    void ctx.run('Reading the selected range…', async () => {
      const g = await ctx.host.readSelection();
      start({ kind: 'grid', grid: g.values, name: nameInput.value.trim() || `${g.sheet} table`, origin: g.address, firstRow: g.firstRow, firstColumn: g.firstColumn });
    });
  });
  const help = `Columns: analyte, specimen, unit, cvi, cvg, source, limit_abs, limit_pct, level, note. analyte, cvi and source are required; CVs in percent. UTF-8, UTF-16 with BOM or Windows-1252; up to ${IMPORT_LIMITS.maxBytes / (1024 * 1024)} MiB and ${IMPORT_LIMITS.maxColumns} columns. Nothing is imported until you accept the report.`;
  replace(importBox, h('h2', {}, 'Import a table'), h('p', { class: 'hint' }, help), field('Name in the library', nameInput), field('CSV or TSV file', fileInput), h('div', { class: 'actions' }, fromRange));
  return { importBox, reviewBox };
}
