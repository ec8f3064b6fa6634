/**
 * Fill view: choose the sheet's tier (and a tier for single analytes), the coverage (a z, or a
 * probability turned into z by ZSCORE's own code), the analytes (search and filter), and where
 * to write: a new sheet (default), the selected range or the active sheet as a template (the
 * planner finds its header row). The fill planner (src/engine/fill) lays out the cells, leaves
 * non-empty cells as they are and lists them (ticking the confirmation overwrites them), and
 * lists the table's analytes the template lacks (added below its table only when asked), the
 * template's analytes the table lacks, merged cells it will not write and where the provenance
 * goes. The Excel writer then writes the whole plan in one batch.
 */
import { h, replace, field, radioGroup, uid } from '../dom';
import type { PaneContext, View } from '../view';
import { readDecimal, FIELDS } from '../../engine/table';
import type { VariationRow } from '../../engine/table';
import { TIERS } from '../../engine/tiers';
import type { Tier } from '../../engine/tiers';
import { planFill, matchTemplateHeader, COLUMN_HEADERS, DERIVED_FIELDS, uniqueSheetName, columnLetters, findHeaderRow, headerRowAt, formatTemplateReport } from '../../engine/fill';
import type { FillField, FillMode, FillPlan, FillRequest, PlanResult, TemplateMapping } from '../../engine/fill';
import type { TargetSheet } from '../host';
import { zOf } from '../state';
import type { CoverageMode } from '../state';
import { filterRows, keyOf, displayName, specimensOf, attrKey } from '../analytes';
import { fmt, tierLabel, today } from '../format';
import { DEMO_MARKER } from '../../engine/caution';

/** Rows listed at once in the picker; the search narrows a longer table. */
const LIST_LIMIT = 400;
/** Conflicts listed before "and N more". */
const CONFLICT_LIMIT = 50;

type Where = 'new-sheet' | 'range' | 'template';

const FILL_FIELDS: readonly FillField[] = [...FIELDS, 'tier', ...DERIVED_FIELDS];

export function fillView(ctx: PaneContext): View {
  const { state } = ctx;
  const root = h('div', { class: 'view fill' });
  const tierBox = h('div', { class: 'choose' });
  const pickBox = h('div', { class: 'pick' });
  const whereBox = h('div', { class: 'where' });
  const checkBox = h('div', { class: 'check-result', id: 'fill-check', 'aria-live': 'polite' });

  let search = '';
  let specimen = '*';
  let where: Where = 'new-sheet';
  let mode: FillMode = 'live';
  let target: TargetSheet | null = null;
  let mapping: Record<string, FillField | null> = {};
  let overwrite = false;
  let append = false;

  // ---- tiers and coverage -------------------------------------------------------------------
  const zOut = h('output', { id: 'z-used', class: 'z-used' });
  const coverageInput = h('input', { type: 'text', inputmode: 'decimal', id: 'coverage-value', autocomplete: 'off' });
  const sidesSelect = h('select', { id: 'coverage-sides' }, h('option', { value: '1' }, 'one-sided'), h('option', { value: '2' }, 'two-sided'));
  const sidesField = field('Sides', sidesSelect);
  const coverageField = field('Coverage', coverageInput);
  const coverageLabel = coverageField.querySelector('label') as HTMLLabelElement;

  function showZ(): void {
    const q = zOf(state.coverage);
    zOut.className = `z-used ${q.ok ? '' : 'error'}`;
    zOut.textContent = q.ok ? `z used: ${fmt(q.z, 4)}` : q.why;
    coverageInput.setAttribute('aria-invalid', q.ok ? 'false' : 'true');
  }

  function syncCoverage(): void {
    const c = state.coverage;
    coverageLabel.textContent = c.mode === 'z' ? 'z (coverage factor)' : 'Probability (0–1)';
    coverageInput.value = String(c.mode === 'z' ? c.z : c.probability);
    sidesSelect.value = String(c.sides);
    sidesField.hidden = c.mode === 'z';
    showZ();
  }

  coverageInput.addEventListener('input', () => {
    const x = readDecimal(coverageInput.value);
    const v = x === undefined ? NaN : x;
    state.coverage = state.coverage.mode === 'z' ? { ...state.coverage, z: v } : { ...state.coverage, probability: v };
    showZ();
    invalidate();
    state.changed('coverage');
  });
  sidesSelect.addEventListener('change', () => {
    state.coverage = { ...state.coverage, sides: sidesSelect.value === '2' ? 2 : 1 };
    showZ();
    invalidate();
    state.changed('coverage');
  });

  function renderTiers(): void {
    replace(
      tierBox,
      h('h2', {}, 'Tier and coverage'),
      radioGroup('Tier for the whole sheet', 'sheet-tier', TIERS.map((t) => ({ value: t, label: tierLabel(t) })), state.sheetTier, (t) => {
        state.sheetTier = t;
        invalidate();
        renderPick();
        state.changed('tiers');
      }),
      radioGroup(
        'Coverage given as',
        'coverage-mode',
        [
          { value: 'z' as CoverageMode, label: 'z' },
          { value: 'probability' as CoverageMode, label: 'probability' },
        ],
        state.coverage.mode,
        (m) => {
          state.coverage = { ...state.coverage, mode: m };
          syncCoverage();
          invalidate();
          state.changed('coverage');
        },
      ),
      h('div', { class: 'pair' }, coverageField, sidesField),
      zOut,
      h('p', { class: 'hint' }, 'A probability is turned into z with the same code as LEEWAY.ZSCORE (0.95 one-sided gives 1.645). The total-error model’s usual z is 1.65.'),
    );
    syncCoverage();
  }

  // ---- analytes -----------------------------------------------------------------------------
  const searchInput = h('input', { type: 'search', id: 'analyte-search', placeholder: 'name, specimen, unit…', autocomplete: 'off' });
  const specimenSelect = h('select', { id: 'analyte-specimen' });
  const listBox = h('ul', { class: 'analyte-list', id: 'analyte-list', 'aria-label': 'Analytes' });
  const countLine = h('p', { class: 'hint', id: 'analyte-count', 'aria-live': 'polite' });
  searchInput.addEventListener('input', () => {
    search = searchInput.value;
    renderList();
  });
  specimenSelect.addEventListener('change', () => {
    specimen = specimenSelect.value;
    renderList();
  });
  const pickAll = h('button', { type: 'button', id: 'pick-shown' }, 'Pick all shown');
  const clearAll = h('button', { type: 'button', id: 'clear-shown' }, 'Clear all shown');
  pickAll.addEventListener('click', () => {
    for (const r of shownRows()) state.selected.add(keyOf(r));
    afterSelection();
  });
  clearAll.addEventListener('click', () => {
    for (const r of shownRows()) state.selected.delete(keyOf(r));
    afterSelection();
  });

  function shownRows(): VariationRow[] {
    return filterRows(state.rows(), { search, specimen });
  }

  function afterSelection(): void {
    invalidate();
    renderList();
    state.changed('selection');
  }

  function renderPick(): void {
    replace(specimenSelect, h('option', { value: '*' }, 'all specimens'));
    for (const sp of specimensOf(state.rows())) specimenSelect.appendChild(h('option', { value: sp }, sp || '(none given)'));
    specimenSelect.value = specimen;
    if (specimenSelect.value !== specimen) {
      specimen = '*';
      specimenSelect.value = '*';
    }
    replace(
      pickBox,
      h('h2', {}, 'Analytes'),
      state.table?.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null,
      h('div', { class: 'pair' }, field('Search', searchInput), field('Specimen', specimenSelect)),
      h('div', { class: 'actions' }, pickAll, clearAll),
      countLine,
      listBox,
    );
    renderList();
  }

  function renderList(): void {
    const rows = shownRows();
    const frag = document.createDocumentFragment();
    for (const r of rows.slice(0, LIST_LIMIT)) {
      const k = keyOf(r);
      const box = h('input', { type: 'checkbox', id: uid('pick'), 'data-key': attrKey(k) });
      box.checked = state.selected.has(k);
      box.addEventListener('change', () => {
        if (box.checked) state.selected.add(k);
        else state.selected.delete(k);
        invalidate();
        countLine.textContent = countText(rows.length);
        state.changed('selection');
      });
      const tierSel = h('select', { 'aria-label': `Tier for ${displayName(r)}`, class: 'row-tier', 'data-key': attrKey(k) });
      tierSel.appendChild(h('option', { value: '' }, `sheet (${state.sheetTier.slice(0, 3)})`));
      for (const t of TIERS) tierSel.appendChild(h('option', { value: t }, tierLabel(t)));
      tierSel.value = state.analyteTier.get(k) ?? '';
      tierSel.addEventListener('change', () => {
        if (tierSel.value === '') state.analyteTier.delete(k);
        else state.analyteTier.set(k, tierSel.value as Tier);
        invalidate();
        state.changed('tiers');
      });
      frag.appendChild(
        h(
          'li',
          { class: 'analyte' },
          h('label', { class: 'check', for: box.id }, box, h('span', { class: 'name' }, displayName(r)), h('span', { class: 'sub' }, `CVI ${fmt(r.cvi, 1)}${r.cvg === null ? '' : ` · CVG ${fmt(r.cvg, 1)}`}`)),
          tierSel,
        ),
      );
    }
    replace(listBox, frag);
    countLine.textContent = countText(rows.length);
  }

  function countText(shown: number): string {
    const total = state.rows().length;
    const more = shown > LIST_LIMIT ? ` (first ${LIST_LIMIT} listed: narrow the search to see the rest)` : '';
    return `${state.selected.size} of ${total} picked · ${shown} shown${more}`;
  }

  // ---- where --------------------------------------------------------------------------------
  const sheetNameInput = h('input', { type: 'text', id: 'new-sheet-name', value: 'Specifications' });
  const checkButton = h('button', { type: 'button', class: 'primary', id: 'check-fill' }, 'Check the fill');
  checkButton.addEventListener('click', () => void check());

  const appendBox = h('input', { type: 'checkbox', id: 'fill-append' });
  appendBox.addEventListener('change', () => {
    append = appendBox.checked;
    invalidate();
  });
  const appendField = h('p', { class: 'check-line' }, h('label', { class: 'check', for: appendBox.id }, appendBox, 'Add the table’s other analytes in empty rows below the template’s table'));

  function renderWhere(): void {
    const nameField = field('New sheet name', sheetNameInput, 'A number is added if the name is taken.');
    nameField.hidden = where !== 'new-sheet';
    appendField.hidden = where === 'new-sheet';
    appendBox.checked = append;
    replace(
      whereBox,
      h('h2', {}, 'Where to write'),
      radioGroup(
        'Target',
        'fill-where',
        [
          { value: 'new-sheet' as Where, label: 'A new sheet' },
          { value: 'range' as Where, label: 'The selected range (its first row holds the headers)' },
          { value: 'template' as Where, label: 'The active sheet as a template (Leeway finds its header row)' },
        ],
        where,
        (w) => {
          where = w;
          mapping = {};
          target = null;
          nameField.hidden = w !== 'new-sheet';
          appendField.hidden = w === 'new-sheet';
          invalidate();
        },
      ),
      nameField,
      appendField,
      radioGroup(
        'Derived columns',
        'fill-mode',
        [
          { value: 'live' as FillMode, label: 'Live LEEWAY formulas (change the tier cell to recompute)' },
          { value: 'values' as FillMode, label: 'Values only' },
        ],
        mode,
        (m) => {
          mode = m;
          invalidate();
        },
      ),
      h('p', { class: 'hint' }, 'Only empty cells are written: non-empty ones are listed after the check, and overwritten only if you tick them. Text starting with = + - @ is written as text.'),
      h('div', { class: 'actions' }, checkButton),
    );
  }

  function invalidate(): void {
    overwrite = false;
    replace(checkBox);
  }

  function request(t: TargetSheet | null, sheetName: string): FillRequest | string {
    const q = zOf(state.coverage);
    if (!q.ok) return `The coverage is not valid: ${q.why}.`;
    if (!state.table) return 'Choose a table first (Tables).';
    const rows = state.selectedRows();
    const rowTiers: Record<string, Tier> = {};
    for (const r of rows) {
      const t0 = state.analyteTier.get(keyOf(r));
      if (t0) rowTiers[keyOf(r)] = t0;
    }
    const base = { table: state.table, rows, tier: state.sheetTier, z: q.z, rowTiers, mode, overwrite, date: today() };
    if (where === 'new-sheet') return { ...base, target: { kind: 'new-sheet', sheetName } };
    if (!t) return 'The sheet has not been read yet.';
    const headerAt = where === 'range' ? { row: t.selection.row, col: t.selection.col } : undefined;
    return { ...base, target: { kind: 'template', sheet: t.snapshot, headerAt, mapping: mapping as TemplateMapping, append } };
  }

  async function check(): Promise<void> {
    try {
      let sheetName = '';
      if (where === 'new-sheet') {
        ctx.status('Checking the fill…', 'busy');
        const names = ctx.host.available ? await ctx.host.sheetNames() : [];
        sheetName = uniqueSheetName(sheetNameInput.value.trim() || 'Specifications', names);
      } else {
        ctx.status('Reading the active sheet…', 'busy');
        target = await ctx.host.readTarget();
      }
      plan(sheetName);
      checkBox.querySelector<HTMLElement>('#check-title, h2')?.focus();
    } catch (e) {
      ctx.status(e instanceof Error ? e.message : String(e), 'error');
    }
  }

  function plan(sheetName: string): void {
    const req = request(target, sheetName);
    if (typeof req === 'string') {
      ctx.status(req, 'error');
      return;
    }
    const t0 = performance.now();
    const res: PlanResult = planFill(req);
    checkBox.dataset.planMs = (performance.now() - t0).toFixed(1);
    renderCheck(res, sheetName);
  }

  function headerRowOf(t: TargetSheet): { row: number; cells: ReadonlyArray<{ col: number; text: string }> } | null {
    const h0 = where === 'range' ? headerRowAt(t.snapshot, { row: t.selection.row, col: t.selection.col }, mapping as TemplateMapping) : findHeaderRow(t.snapshot, mapping as TemplateMapping);
    return h0 ? { row: h0.at.row, cells: h0.cells } : null;
  }

  function mappingTable(t: TargetSheet): HTMLElement | null {
    const hr = headerRowOf(t);
    if (!hr) return null;
    const tbody = h('tbody', {});
    for (const c of hr.cells) {
      const matched = matchTemplateHeader(c.text, mapping as TemplateMapping);
      const sel = h('select', { 'aria-label': `Field for ${columnLetters(c.col)}${hr.row} “${c.text}”`, 'data-header': c.text });
      sel.appendChild(h('option', { value: '' }, '(leave alone)'));
      for (const f of FILL_FIELDS) sel.appendChild(h('option', { value: f }, COLUMN_HEADERS[f]));
      sel.value = matched ?? '';
      sel.addEventListener('change', () => {
        mapping = { ...mapping, [c.text]: sel.value === '' ? null : (sel.value as FillField) };
        overwrite = false;
        plan('');
        checkBox.querySelector<HTMLSelectElement>(`select[data-header="${CSS.escape(c.text)}"]`)?.focus();
      });
      tbody.appendChild(h('tr', {}, h('th', { scope: 'row' }, `${columnLetters(c.col)}${hr.row}`), h('td', { class: 'header-text' }, c.text), h('td', {}, sel)));
    }
    return h(
      'details',
      { class: 'mapping', open: true },
      h('summary', {}, `Header match (row ${hr.row})`),
      h('table', { class: 'grid-table' }, h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Cell'), h('th', { scope: 'col' }, 'Header'), h('th', { scope: 'col' }, 'Fills'))), tbody),
    );
  }

  function renderCheck(res: PlanResult, sheetName: string): void {
    const mapBox = where !== 'new-sheet' && target ? mappingTable(target) : null;
    if (!res.ok) {
      const ul = h('ul', { class: 'problems' });
      for (const p of res.problems) ul.appendChild(h('li', { class: 'problem error' }, h('span', { class: 'where' }, p.where || 'Fill'), h('span', { class: 'what' }, p.message)));
      const noHeader = res.problems.some((p) => p.code === 'no-header');
      const hint = noHeader ? h('p', { class: 'hint', id: 'header-hint' }, 'Select the first cell of the template’s header row, choose “The selected range” above, and check again.') : null;
      replace(checkBox, h('h2', { tabindex: -1 }, 'Cannot fill yet'), mapBox, ul, hint);
      ctx.status(`The fill cannot be planned: ${res.problems[0].message}.`, 'error');
      return;
    }
    const p = res.plan;
    const conflictList = h('ul', { class: 'conflicts', id: 'conflicts' });
    for (const c of p.conflicts.slice(0, CONFLICT_LIMIT)) {
      conflictList.appendChild(h('li', { 'data-address': c.address }, h('span', { class: 'where' }, c.address), h('span', { class: 'what' }, `holds ${String(c.existing)}; Leeway would write ${c.planned}`)));
    }
    if (p.conflicts.length > CONFLICT_LIMIT) conflictList.appendChild(h('li', {}, `and ${p.conflicts.length - CONFLICT_LIMIT} more cells`));
    const confirm = h('input', { type: 'checkbox', id: 'confirm-overwrite' });
    confirm.checked = overwrite;
    confirm.addEventListener('change', () => {
      overwrite = confirm.checked;
      plan(sheetName);
      checkBox.querySelector<HTMLInputElement>('#confirm-overwrite')?.focus();
    });
    // Everything else the planner found (merged cells, analytes on one side only, where the provenance goes).
    const hints = { overwrite: 'tick them to overwrite', append: 'tick “Add the table’s other analytes” to add them', pick: 'pick one specimen in the list' };
    const reportLines = p.target === 'template' ? formatTemplateReport({ ...p, conflicts: [] }, hints) : [];
    const report = reportLines.length ? h('ul', { class: 'template-report', id: 'template-report' }, ...reportLines.map((line) => h('li', {}, line))) : null;
    const n = p.rows.length;
    const go = h('button', { type: 'button', class: 'primary', id: 'run-fill', disabled: !p.writable }, `Fill ${n} analyte${n === 1 ? '' : 's'}`);
    go.addEventListener('click', () => void write(p));
    const kept = p.conflicts.length && !p.overwrite;
    replace(
      checkBox,
      h('h2', { tabindex: -1, id: 'check-title' }, 'Ready to fill'),
      mapBox,
      h(
        'dl',
        { class: 'facts' },
        h('dt', {}, 'Sheet'),
        h('dd', {}, p.sheetName + (p.target === 'new-sheet' ? ' (new)' : '')),
        h('dt', {}, 'Analytes'),
        h('dd', {}, String(p.rows.length)),
        h('dt', {}, 'Columns'),
        h('dd', {}, p.columns.map((c) => `${c.letter} ${c.header}`).join(', ')),
        h('dt', {}, 'Tier cell'),
        h('dd', { id: 'plan-tier-cell' }, `${p.tierCell} (${p.provenance.tier})`),
        h('dt', {}, 'z cell'),
        h('dd', { id: 'plan-z-cell' }, `${p.zCell} (${fmt(p.provenance.z, 4)})`),
        h('dt', {}, 'Cells to write'),
        h('dd', {}, `${p.cells.length + (p.blockSheet?.cells.length ?? 0)}${p.unchanged ? ` (${p.unchanged} already hold the same)` : ''}`),
      ),
      p.conflicts.length
        ? h(
            'div',
            { class: 'confirm', role: 'group', 'aria-labelledby': 'conflict-title' },
            h('h3', { id: 'conflict-title' }, `${p.conflicts.length} non-empty cell${p.conflicts.length === 1 ? '' : 's'} ${p.overwrite ? 'will be overwritten' : p.conflicts.length === 1 ? 'left as it is' : 'left as they are'}`),
            conflictList,
            h('label', { class: 'check', for: confirm.id }, confirm, `Overwrite these ${p.conflicts.length} cells`),
          )
        : h('p', { class: 'ok' }, 'Every target cell is empty (or already holds the same).'),
      report,
      h('div', { class: 'actions' }, go),
    );
    const one = p.conflicts.length === 1;
    ctx.status(kept ? `Checked: ${p.conflicts.length} non-empty cell${one ? '' : 's'} will be left as ${one ? 'it is' : 'they are'} (listed); tick ${one ? 'it' : 'them'} to overwrite.` : 'Checked: ready to fill.', 'info');
  }

  async function write(p: FillPlan): Promise<void> {
    if (!p.writable) return;
    try {
      ctx.status(`Filling ${p.sheetName}…`, 'busy');
      const out = await ctx.host.writeFill(p);
      const local = (ref: string): string => ref.replace(/^.*!/, '');
      state.filled = { sheet: p.blockSheet?.name ?? out.sheet, tierCell: local(p.tierCell), zCell: local(p.zCell), tier: p.provenance.tier };
      state.changed('filled');
      invalidate();
      ctx.status(`Filled ${out.sheet}: ${p.rows.length} analytes, ${out.cells} cells. The tier is in ${p.tierCell}, z in ${p.zCell}.`, 'ok');
    } catch (e) {
      ctx.status(`Nothing was filled: ${e instanceof Error ? e.message : String(e)}`, 'error');
    }
  }

  root.append(tierBox, pickBox, whereBox, checkBox);
  return {
    root,
    refresh() {
      renderTiers();
      renderPick();
      renderWhere();
    },
  };
}
