/**
 * The import report: the header mapping (changeable), every problem with its row and column as a
 * spreadsheet shows them (the first 200, then all on request), and accept or cancel. Pure render
 * from the import result; the handlers come from the importer.
 */
import { h } from '../../dom';
import { FIELDS } from '../../../engine/table';
import type { Field, ImportResult, Problem } from '../../../engine/table';
import { decimalText } from '../../../engine/import';

/** Problems listed before "show all" (a 5 MB file can have thousands). */
export const REPORT_PAGE = 200;

export interface ReviewHandlers {
  remap(header: string, field: Field | null): void;
  showAll(): void;
  accept(): void;
  cancel(): void;
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

function mappingBox(r: ImportResult, on: ReviewHandlers): HTMLElement | null {
  if (!r.columns.length) return null;
  const rows = r.columns.map((c) => {
    const sel = h('select', { 'data-header': c.header, 'aria-label': `Field for column ${c.letter} “${c.header}”` }, h('option', { value: '' }, '(ignore this column)'), ...FIELDS.map((f) => h('option', { value: f }, f)));
    sel.value = c.field ?? '';
    sel.addEventListener('change', () => on.remap(c.header, sel.value === '' ? null : (sel.value as Field)));
    const unit = c.unit !== undefined && c.field !== null ? h('span', { class: 'unit', 'data-unit': c.unit }, ` unit ${c.unit}`) : null;
    const alias = c.by === 'alias' ? h('span', { class: 'hint' }, ' matched by another name') : null;
    return h('tr', {}, h('th', { scope: 'row' }, c.letter), h('td', { class: 'header-text' }, c.header || '(blank)'), h('td', {}, sel, unit, alias));
  });
  const head = h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Col'), h('th', { scope: 'col' }, 'Header'), h('th', { scope: 'col' }, 'Reads as')));
  const open = r.columns.some((c) => c.field === null || c.by === 'alias' || c.unit !== undefined);
  return h('details', { class: 'mapping', open }, h('summary', {}, 'Header mapping'), h('table', { class: 'grid-table' }, head, h('tbody', {}, ...rows)));
}

function summaryLine(r: ImportResult): string {
  const n = (k: number, w: string): string => `${k} ${w}${k === 1 ? '' : 's'}`;
  return (
    `${n(r.rowCount, 'data row')}, ${n(r.errorCount, 'error')}, ${n(r.warningCount, 'warning')}` +
    (r.delimiter ? ` · separator ${r.delimiter === '\t' ? 'tab' : `“${r.delimiter}”`}` : '') +
    (r.encoding ? ` · ${r.encoding}` : '') +
    (decimalText(r) ? ` · ${decimalText(r)}` : '')
  );
}

export function renderReview(name: string, r: ImportResult, showAll: boolean, on: ReviewHandlers): Node[] {
  const problems = showAll ? r.problems : r.problems.slice(0, REPORT_PAGE);
  const list = h('ol', { class: 'problems', id: 'problems', 'aria-label': 'Problems found' }, ...problems.map(problemItem));
  const accept = h('button', { type: 'button', class: 'primary', id: 'accept-import', disabled: !r.ok, onclick: on.accept }, r.ok ? `Accept and import ${r.rowCount} rows` : 'Fix the errors to import');
  const more = !showAll && r.problems.length > REPORT_PAGE ? h('button', { type: 'button', onclick: on.showAll }, `Show all ${r.problems.length} problems`) : null;
  const out: Array<Node | null> = [
    h('h2', { tabindex: -1, id: 'review-title' }, `Review “${name}”`),
    h('p', { class: `summary-line ${r.ok ? 'ok' : 'error'}`, id: 'report-summary' }, summaryLine(r)),
    mappingBox(r, on),
    r.problems.length ? list : h('p', { class: 'ok' }, 'No problems found.'),
    more,
    h('div', { class: 'actions' }, accept, h('button', { type: 'button', id: 'cancel-import', onclick: on.cancel }, 'Cancel')),
  ];
  return out.filter((n): n is Node => n !== null);
}
