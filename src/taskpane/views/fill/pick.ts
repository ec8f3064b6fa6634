/**
 * The Fill view's analyte picker: search and specimen filter, pick or clear what is shown, and a
 * tier for single analytes (an override of the sheet tier).
 */
import { h, replace, field, uid } from '../../dom';
import type { PaneContext } from '../../view';
import type { VariationRow } from '../../../engine/table';
import { TIERS } from '../../../engine/tiers';
import type { Tier } from '../../../engine/tiers';
import { DEMO_MARKER } from '../../../engine/caution';
import { filterRows, keyOf, displayName, specimensOf, attrKey } from '../../analytes';
import { fmt, tierLabel } from '../../format';

/** Rows listed at once in the picker; the search narrows a longer table. */
const LIST_LIMIT = 400;

function countText(ctx: PaneContext, shown: number): string {
  const total = ctx.state.rows().length;
  const more = shown > LIST_LIMIT ? ` (first ${LIST_LIMIT} listed: narrow the search to see the rest)` : '';
  return `${ctx.state.selected.size} of ${total} picked · ${shown} shown${more}`;
}

/** One analyte of the list: its pick box and its own tier. */
function analyteItem(ctx: PaneContext, r: VariationRow, invalidate: () => void, counted: () => void): HTMLElement {
  const { state } = ctx;
  const k = keyOf(r);
  const box = h('input', { type: 'checkbox', id: uid('pick'), 'data-key': attrKey(k) });
  box.checked = state.selected.has(k);
  box.addEventListener('change', () => {
    invalidate();
    state.pick([k], box.checked);
    counted();
  });
  const tierSel = h('select', { 'aria-label': `Tier for ${displayName(r)}`, class: 'row-tier', 'data-key': attrKey(k) });
  tierSel.appendChild(h('option', { value: '' }, `sheet (${state.sheetTier.slice(0, 3)})`));
  for (const t of TIERS) tierSel.appendChild(h('option', { value: t }, tierLabel(t)));
  tierSel.value = state.analyteTier.get(k) ?? '';
  tierSel.addEventListener('change', () => {
    invalidate();
    state.setAnalyteTier(k, tierSel.value === '' ? null : (tierSel.value as Tier));
  });
  const sub = `CVI ${fmt(r.cvi, 1)}${r.cvg === null ? '' : ` · CVG ${fmt(r.cvg, 1)}`}`;
  return h('li', { class: 'analyte' }, h('label', { class: 'check', for: box.id }, box, h('span', { class: 'name' }, displayName(r)), h('span', { class: 'sub' }, sub)), tierSel);
}

export function pickPart(ctx: PaneContext, invalidate: () => void): { root: HTMLElement; render(): void } {
  const { state } = ctx;
  const root = h('div', { class: 'pick' });
  let search = '';
  let specimen = '*';
  const searchInput = h('input', { type: 'search', id: 'analyte-search', placeholder: 'name, specimen, unit…', autocomplete: 'off' });
  const specimenSelect = h('select', { id: 'analyte-specimen' });
  const listBox = h('ul', { class: 'analyte-list', id: 'analyte-list', 'aria-label': 'Analytes' });
  const countLine = h('p', { class: 'hint', id: 'analyte-count', 'aria-live': 'polite' });
  const shownRows = (): VariationRow[] => filterRows(state.rows(), { search, specimen });

  function renderList(): void {
    const rows = shownRows();
    const counted = (): void => {
      countLine.textContent = countText(ctx, rows.length);
    };
    replace(listBox, ...rows.slice(0, LIST_LIMIT).map((r) => analyteItem(ctx, r, invalidate, counted)));
    counted();
  }
  function pickShown(on: boolean): void {
    invalidate();
    state.pick(shownRows().map(keyOf), on);
    renderList();
  }
  searchInput.addEventListener('input', () => {
    search = searchInput.value;
    renderList();
  });
  specimenSelect.addEventListener('change', () => {
    specimen = specimenSelect.value;
    renderList();
  });
  const pickAll = h('button', { type: 'button', id: 'pick-shown', onclick: () => pickShown(true) }, 'Pick all shown');
  const clearAll = h('button', { type: 'button', id: 'clear-shown', onclick: () => pickShown(false) }, 'Clear all shown');

  function render(): void {
    replace(specimenSelect, h('option', { value: '*' }, 'all specimens'), ...specimensOf(state.rows()).map((sp) => h('option', { value: sp }, sp || '(none given)')));
    specimenSelect.value = specimen;
    if (specimenSelect.value !== specimen) {
      specimen = '*';
      specimenSelect.value = '*';
    }
    replace(
      root,
      h('h2', {}, 'Analytes'),
      state.table?.demo ? h('p', { class: 'badge demo' }, DEMO_MARKER) : null,
      h('div', { class: 'pair' }, field('Search', searchInput), field('Specimen', specimenSelect)),
      h('div', { class: 'actions' }, pickAll, clearAll),
      countLine,
      listBox,
    );
    renderList();
  }
  return { root, render };
}
