/** The Fill view's target: a new sheet, the selected range or the active sheet as a template; live formulas or values. */
import { h, replace, field, radioGroup } from '../../dom';
import type { ViewState } from '../../view';
import type { FillMode } from '../../../engine/fill';
import type { FillLocal, Where } from './common';

export function wherePart(local: ViewState<FillLocal>, invalidate: () => void, check: () => void): { root: HTMLElement; render(): void } {
  const root = h('div', { class: 'where' });
  const sheetNameInput = h('input', { type: 'text', id: 'new-sheet-name', value: local.get().sheetName });
  sheetNameInput.addEventListener('input', () => local.set({ sheetName: sheetNameInput.value }));
  const checkButton = h('button', { type: 'button', class: 'primary', id: 'check-fill', onclick: check }, 'Check the fill');
  const appendBox = h('input', { type: 'checkbox', id: 'fill-append' });
  appendBox.addEventListener('change', () => {
    invalidate();
    local.set({ append: appendBox.checked });
  });
  const appendField = h('p', { class: 'check-line' }, h('label', { class: 'check', for: appendBox.id }, appendBox, 'Add the table’s other analytes in empty rows below the template’s table'));
  const nameField = field('New sheet name', sheetNameInput, 'A number is added if the name is taken.');

  function showFields(w: Where): void {
    nameField.hidden = w !== 'new-sheet';
    appendField.hidden = w === 'new-sheet';
  }

  function render(): void {
    const { where, mode, append } = local.get();
    showFields(where);
    appendBox.checked = append;
    const targets = [
      { value: 'new-sheet' as Where, label: 'A new sheet' },
      { value: 'range' as Where, label: 'The selected range (its first row holds the headers)' },
      { value: 'template' as Where, label: 'The active sheet as a template (Leeway finds its header row)' },
    ];
    const modes = [
      { value: 'live' as FillMode, label: 'Live LEEWAY formulas (change the tier cell to recompute)' },
      { value: 'values' as FillMode, label: 'Values only' },
    ];
    replace(
      root,
      h('h2', {}, 'Where to write'),
      radioGroup('Target', 'fill-where', targets, where, (w) => {
        invalidate();
        local.set({ where: w, mapping: {}, target: null });
        showFields(w);
      }),
      nameField,
      appendField,
      radioGroup('Derived columns', 'fill-mode', modes, mode, (m) => {
        invalidate();
        local.set({ mode: m });
      }),
      h('p', { class: 'hint' }, 'Only empty cells are written: non-empty ones are listed after the check, and overwritten only if you tick them. Text starting with = + - @ is written as text.'),
      h('div', { class: 'actions' }, checkButton),
    );
  }
  return { root, render };
}
