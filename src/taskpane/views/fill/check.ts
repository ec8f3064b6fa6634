/**
 * The Fill view's check and fill: the fill planner (src/engine/fill) lays out the cells, leaves
 * non-empty cells as they are and lists them (ticking the confirmation overwrites them), lists
 * the table's analytes the template lacks (added below its table only when asked), the
 * template's analytes the table lacks, merged cells it will not write and where the provenance
 * goes. The Excel writer then writes the whole plan in one batch.
 */
import { h, replace } from '../../dom';
import type { PaneContext, ViewState } from '../../view';
import { PaneError } from '../../view';
import { FIELDS } from '../../../engine/table';
import type { Tier } from '../../../engine/tiers';
import { planFill, matchTemplateHeader, COLUMN_HEADERS, DERIVED_FIELDS, uniqueSheetName, columnLetters, findHeaderRow, headerRowAt, formatTemplateReport } from '../../../engine/fill';
import type { FillField, FillPlan, FillRequest, PlanResult, TemplateMapping } from '../../../engine/fill';
import type { TargetSheet } from '../../host';
import { zOf } from '../../state';
import { keyOf } from '../../analytes';
import { fmt, today } from '../../format';
import type { FillLocal } from './common';

/** Conflicts listed before "and N more". */
const CONFLICT_LIMIT = 50;
const FILL_FIELDS: readonly FillField[] = [...FIELDS, 'tier', ...DERIVED_FIELDS];

/** The planner's request from the pane's state and the view's, or why there is none. */
export function fillRequest(ctx: PaneContext, local: Readonly<FillLocal>, sheetName: string): FillRequest | string {
  const { state } = ctx;
  const q = zOf(state.coverage);
  if (!q.ok) return `The coverage is not valid: ${q.why}.`;
  if (!state.table) return 'Choose a table first (Tables).';
  const rows = state.selectedRows();
  const rowTiers: Record<string, Tier> = {};
  for (const r of rows) {
    const t0 = state.analyteTier.get(keyOf(r));
    if (t0) rowTiers[keyOf(r)] = t0;
  }
  const base = { table: state.table, rows, tier: state.sheetTier, z: q.z, rowTiers, mode: local.mode, overwrite: local.overwrite, date: today() };
  if (local.where === 'new-sheet') return { ...base, target: { kind: 'new-sheet', sheetName } };
  const t = local.target;
  if (!t) return 'The sheet has not been read yet.';
  const headerAt = local.where === 'range' ? { row: t.selection.row, col: t.selection.col } : undefined;
  return { ...base, target: { kind: 'template', sheet: t.snapshot, headerAt, mapping: local.mapping as TemplateMapping, append: local.append } };
}

function headerRowOf(local: Readonly<FillLocal>, t: TargetSheet): { row: number; cells: ReadonlyArray<{ col: number; text: string }> } | null {
  const mapping = local.mapping as TemplateMapping;
  const h0 = local.where === 'range' ? headerRowAt(t.snapshot, { row: t.selection.row, col: t.selection.col }, mapping) : findHeaderRow(t.snapshot, mapping);
  return h0 ? { row: h0.at.row, cells: h0.cells } : null;
}

/** The template's header row, each header with the field it fills (changeable). */
function mappingTable(local: ViewState<FillLocal>, t: TargetSheet, replan: (focusHeader: string) => void): HTMLElement | null {
  const hr = headerRowOf(local.get(), t);
  if (!hr) return null;
  const tbody = h('tbody', {});
  for (const c of hr.cells) {
    const matched = matchTemplateHeader(c.text, local.get().mapping as TemplateMapping);
    const sel = h('select', { 'aria-label': `Field for ${columnLetters(c.col)}${hr.row} “${c.text}”`, 'data-header': c.text });
    sel.appendChild(h('option', { value: '' }, '(leave alone)'));
    for (const f of FILL_FIELDS) sel.appendChild(h('option', { value: f }, COLUMN_HEADERS[f]));
    sel.value = matched ?? '';
    sel.addEventListener('change', () => {
      local.set({ mapping: { ...local.get().mapping, [c.text]: sel.value === '' ? null : (sel.value as FillField) }, overwrite: false });
      replan(c.text);
    });
    tbody.appendChild(h('tr', {}, h('th', { scope: 'row' }, `${columnLetters(c.col)}${hr.row}`), h('td', { class: 'header-text' }, c.text), h('td', {}, sel)));
  }
  const head = h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Cell'), h('th', { scope: 'col' }, 'Header'), h('th', { scope: 'col' }, 'Fills')));
  return h('details', { class: 'mapping', open: true }, h('summary', {}, `Header match (row ${hr.row})`), h('table', { class: 'grid-table' }, head, tbody));
}

function problemsBox(res: Extract<PlanResult, { ok: false }>, mapBox: HTMLElement | null): Node[] {
  const ul = h('ul', { class: 'problems' });
  for (const p of res.problems) ul.appendChild(h('li', { class: 'problem error' }, h('span', { class: 'where' }, p.where || 'Fill'), h('span', { class: 'what' }, p.message)));
  const noHeader = res.problems.some((p) => p.code === 'no-header');
  const hint = noHeader ? h('p', { class: 'hint', id: 'header-hint' }, 'Select the first cell of the template’s header row, choose “The selected range” above, and check again.') : null;
  return [h('h2', { tabindex: -1 }, 'Cannot fill yet'), mapBox, ul, hint].filter((n): n is HTMLElement => n !== null);
}

function planFacts(p: FillPlan): HTMLElement {
  const facts: Array<[string, string, string?]> = [
    ['Sheet', p.sheetName + (p.target === 'new-sheet' ? ' (new)' : '')],
    ['Analytes', String(p.rows.length)],
    ['Columns', p.columns.map((c) => `${c.letter} ${c.header}`).join(', ')],
    ['Tier cell', `${p.tierCell} (${p.provenance.tier})`, 'plan-tier-cell'],
    ['z cell', `${p.zCell} (${fmt(p.provenance.z, 4)})`, 'plan-z-cell'],
    ['Cells to write', `${p.cells.length + (p.blockSheet?.cells.length ?? 0)}${p.unchanged ? ` (${p.unchanged} already hold the same)` : ''}`],
  ];
  return h('dl', { class: 'facts' }, ...facts.flatMap(([t, d, id]) => [h('dt', {}, t), h('dd', id ? { id } : {}, d)]));
}

function conflictsBox(p: FillPlan, onConfirm: (on: boolean) => void): HTMLElement {
  if (!p.conflicts.length) return h('p', { class: 'ok' }, 'Every target cell is empty (or already holds the same).');
  const list = h('ul', { class: 'conflicts', id: 'conflicts' });
  for (const c of p.conflicts.slice(0, CONFLICT_LIMIT)) {
    list.appendChild(h('li', { 'data-address': c.address }, h('span', { class: 'where' }, c.address), h('span', { class: 'what' }, `holds ${String(c.existing)}; Leeway would write ${c.planned}`)));
  }
  if (p.conflicts.length > CONFLICT_LIMIT) list.appendChild(h('li', {}, `and ${p.conflicts.length - CONFLICT_LIMIT} more cells`));
  const confirm = h('input', { type: 'checkbox', id: 'confirm-overwrite' });
  confirm.checked = p.overwrite;
  confirm.addEventListener('change', () => onConfirm(confirm.checked));
  const n = p.conflicts.length;
  const title = `${n} non-empty cell${n === 1 ? '' : 's'} ${p.overwrite ? 'will be overwritten' : n === 1 ? 'left as it is' : 'left as they are'}`;
  return h('div', { class: 'confirm', role: 'group', 'aria-labelledby': 'conflict-title' }, h('h3', { id: 'conflict-title' }, title), list, h('label', { class: 'check', for: confirm.id }, confirm, `Overwrite these ${n} cells`));
}

/** Everything else the planner found (merged cells, analytes on one side only, where the provenance goes). */
function templateReport(p: FillPlan): HTMLElement | null {
  const hints = { overwrite: 'tick them to overwrite', append: 'tick “Add the table’s other analytes” to add them', pick: 'pick one specimen in the list' };
  const lines = p.target === 'template' ? formatTemplateReport({ ...p, conflicts: [] }, hints) : [];
  return lines.length ? h('ul', { class: 'template-report', id: 'template-report' }, ...lines.map((line) => h('li', {}, line))) : null;
}

export interface CheckPart {
  readonly root: HTMLElement;
  /** Forgets the last check (after any change that alters the plan). */
  invalidate(): void;
  /** Reads what it needs and plans the fill. */
  check(): void;
}

export function checkPart(ctx: PaneContext, local: ViewState<FillLocal>): CheckPart {
  const root = h('div', { class: 'check-result', id: 'fill-check', 'aria-live': 'polite' });
  let sheetName = '';

  function plan(): void {
    const req = fillRequest(ctx, local.get(), sheetName);
    if (typeof req === 'string') {
      ctx.status(req, 'error');
      return;
    }
    renderCheck(planFill(req));
  }

  function renderCheck(res: PlanResult): void {
    const t = local.get().target;
    const mapBox = local.get().where !== 'new-sheet' && t ? mappingTable(local, t, (header) => {
      plan();
      root.querySelector<HTMLSelectElement>(`select[data-header="${CSS.escape(header)}"]`)?.focus();
    }) : null;
    if (!res.ok) {
      replace(root, ...problemsBox(res, mapBox));
      ctx.status(`The fill cannot be planned: ${res.problems[0].message}.`, 'error');
      return;
    }
    const p = res.plan;
    const go = h('button', { type: 'button', class: 'primary', id: 'run-fill', disabled: !p.writable }, `Fill ${p.rows.length} analyte${p.rows.length === 1 ? '' : 's'}`);
    go.addEventListener('click', () => void ctx.run(`Filling ${p.sheetName}…`, () => write(p)));
    const conflicts = conflictsBox(p, (on) => {
      local.set({ overwrite: on });
      plan();
      root.querySelector<HTMLInputElement>('#confirm-overwrite')?.focus();
    });
    replace(root, h('h2', { tabindex: -1, id: 'check-title' }, 'Ready to fill'), mapBox, planFacts(p), conflicts, templateReport(p), h('div', { class: 'actions' }, go));
    const n = p.conflicts.length;
    const one = n === 1;
    ctx.status(n && !p.overwrite ? `Checked: ${n} non-empty cell${one ? '' : 's'} will be left as ${one ? 'it is' : 'they are'} (listed); tick ${one ? 'it' : 'them'} to overwrite.` : 'Checked: ready to fill.', 'info');
  }

  async function write(p: FillPlan): Promise<string> {
    if (!p.writable) throw new PaneError('This plan cannot be written.');
    let out;
    try {
      out = await ctx.host.writeFill(p);
    } catch (e) {
      throw new PaneError(`Nothing was filled: ${e instanceof Error ? e.message : String(e)}`);
    }
    const localRef = (ref: string): string => ref.replace(/^.*!/, '');
    ctx.state.setFilled({ sheet: p.blockSheet?.name ?? out.sheet, tierCell: localRef(p.tierCell), zCell: localRef(p.zCell), tier: p.provenance.tier });
    invalidate();
    return `Filled ${out.sheet}: ${p.rows.length} analytes, ${out.cells} cells. The tier is in ${p.tierCell}, z in ${p.zCell}.`;
  }

  function invalidate(): void {
    local.set({ overwrite: false });
    replace(root);
  }

  async function read(): Promise<void> {
    if (local.get().where === 'new-sheet') {
      const names = ctx.host.available ? await ctx.host.sheetNames() : [];
      sheetName = uniqueSheetName(local.get().sheetName.trim() || 'Specifications', names);
    } else {
      local.set({ target: await ctx.host.readTarget() });
    }
  }

  function check(): void {
    const busy = local.get().where === 'new-sheet' ? 'Checking the fill…' : 'Reading the active sheet…';
    void ctx.run(busy, read).then((ok) => {
      if (!ok) return;
      plan();
      root.querySelector<HTMLElement>('#check-title, h2')?.focus();
    });
  }
  return { root, invalidate, check };
}
