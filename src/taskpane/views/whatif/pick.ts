/**
 * The What-if picker: the analyte, its observed bias and CV (typed, read from the active row, or
 * the demo's invented study results). Typing changes the pane's observed figures at once; a
 * field the user is typing in is never rewritten under them.
 */
import { h, replace, field } from '../../dom';
import type { PaneContext, ViewState } from '../../view';
import { PaneError } from '../../view';
import { keyOf, displayName } from '../../analytes';
import { readActiveRow } from '../../sheetRows';
import { demoObserved } from '../../demo';
import { readDecimal } from '../../../engine/table';
import { DEMO_MARKER } from '../../../engine/caution';
import type { WhatIfLocal } from './common';
import { rowsInScope } from './common';

export interface PickPart {
  readonly root: HTMLElement;
  /** Lists the analytes in scope and shows the figures of the one on screen. */
  render(): void;
}

function observedNote(ctx: PaneContext, key: string): string {
  const o = ctx.state.observed.get(key);
  if (!o) return 'Type the method’s observed bias and CV (percent), or read them from the active row.';
  return o.from === 'typed' ? 'Typed in the pane.' : `Read from ${o.from}.`;
}

/** Reads the active row of the sheet into the observed figures; resolves to the status message. */
async function readRow(ctx: PaneContext, local: ViewState<WhatIfLocal>): Promise<string> {
  const { state } = ctx;
  const sheet = await ctx.host.readActiveSheet();
  const got = readActiveRow(sheet);
  if (!got.ok) throw new PaneError(`Nothing read: ${got.why}.`);
  const r = got.value;
  const match = state.rows().find((x) => keyOf(x) === keyOf(r)) ?? state.rows().find((x) => x.analyte.trim().toLowerCase() === r.analyte.toLowerCase());
  if (!match) throw new PaneError(`Row ${r.row} names “${r.analyte}”, which is not in the table in use.`);
  if (r.bias === null || r.cv === null) {
    throw new PaneError(`Row ${r.row} (${r.analyte}) has no observed ${r.bias === null ? 'bias' : 'CV'}: add columns headed “Bias %” and “CV %” and fill them.`);
  }
  const key = keyOf(match);
  state.pick([key], true);
  state.setObserved([[key, { bias: r.bias, cv: r.cv, from: `${sheet.grid.sheet} ${r.biasCell}, ${r.cvCell}` }]]);
  local.set({ key });
  return `Read ${r.analyte}: bias ${r.bias} %, CV ${r.cv} % from row ${r.row}.`;
}

function useDemo(ctx: PaneContext): void {
  const obs = demoObserved();
  ctx.state.setObserved(obs.map((o) => [o.key, { bias: o.bias, cv: o.cv, from: 'the demo’s invented replication and EQA data' }] as const));
  ctx.status(`Observed bias (mean % bias against EQA targets) and within-lab CV (one-way ANOVA by day) for ${obs.length} demo analytes — ${DEMO_MARKER}.`, 'ok');
}

export function pickPart(ctx: PaneContext, local: ViewState<WhatIfLocal>): PickPart {
  const { state } = ctx;
  const analyteSelect = h('select', { id: 'whatif-analyte' });
  const biasInput = h('input', { type: 'text', inputmode: 'decimal', id: 'obs-bias', autocomplete: 'off' });
  const cvInput = h('input', { type: 'text', inputmode: 'decimal', id: 'obs-cv', autocomplete: 'off' });
  const obsNote = h('p', { class: 'hint', id: 'obs-note' });
  const demoBox = h('div', { class: 'actions', id: 'demo-observed' });
  const readButton = h('button', { type: 'button', id: 'read-active-row' }, 'Read the active row');
  readButton.addEventListener('click', () => void ctx.run('Reading the active row…', () => readRow(ctx, local)));
  analyteSelect.addEventListener('change', () => local.set({ key: analyteSelect.value }));

  function typed(): void {
    const key = local.get().key;
    const b = readDecimal(biasInput.value);
    const c = readDecimal(cvInput.value);
    if (biasInput.value.trim() === '' && cvInput.value.trim() === '') state.setObserved([[key, null]]);
    else if (b !== undefined && c !== undefined) state.setObserved([[key, { bias: b, cv: c, from: 'typed' }]]);
    else {
      obsNote.textContent = 'Bias and CV must both be numbers (a decimal point or comma; a trailing % is fine).';
      return;
    }
    obsNote.textContent = observedNote(ctx, key);
  }
  biasInput.addEventListener('input', typed);
  cvInput.addEventListener('input', typed);

  /** Shows the figures of the analyte on screen, except in a field being typed in. */
  function sync(): void {
    const key = local.get().key;
    const o = state.observed.get(key);
    for (const [inp, v] of [[biasInput, o?.bias], [cvInput, o?.cv]] as const) if (document.activeElement !== inp) inp.value = v === undefined ? '' : String(v);
    if (document.activeElement !== biasInput && document.activeElement !== cvInput) obsNote.textContent = observedNote(ctx, key);
  }

  function render(): void {
    const rows = rowsInScope(state);
    replace(analyteSelect, ...rows.map((r) => h('option', { value: keyOf(r) }, displayName(r))));
    if (!rows.some((r) => keyOf(r) === local.get().key)) local.set({ key: rows.length ? keyOf(rows[0]) : '' });
    analyteSelect.value = local.get().key;
    demoBox.hidden = !state.table?.demo;
    replace(demoBox, state.table?.demo ? h('button', { type: 'button', id: 'use-demo-observed', onclick: () => useDemo(ctx) }, 'Use the demo’s invented study results') : null);
    sync();
  }

  local.on(() => {
    analyteSelect.value = local.get().key;
    sync();
  });
  state.on((t) => {
    if (t === 'observed') sync();
  });

  const observed = h('fieldset', { class: 'observed' }, h('legend', {}, 'Observed performance'), h('div', { class: 'pair' }, field('Bias %', biasInput), field('CV %', cvInput)), obsNote, h('div', { class: 'actions' }, readButton), demoBox);
  const root = h('div', { class: 'pick' }, h('h2', {}, 'What if another tier?'), field('Analyte', analyteSelect), observed);
  return { root, render };
}
