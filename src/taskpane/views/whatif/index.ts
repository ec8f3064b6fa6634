/**
 * What-if view: for one analyte, the three tiers side by side (allowable CV, bias, total error)
 * from the engine; with observed bias and CV (typed, or read from the active row) the observed
 * total error, sigma and share of each tier's allowance, and the most stringent tier met, with a
 * small chart of observed error against each allowance. Below: the same figures for every picked
 * analyte at once, the control that changes the tier cell of a filled sheet, and the
 * explanation of an error in the active cell.
 */
import { h, replace } from '../../dom';
import type { PaneContext, View } from '../../view';
import { ViewState } from '../../view';
import type { WhatIfLocal } from './common';
import { pickPart } from './pick';
import { renderDetail } from './detail';
import { menuPart } from './menu';
import { tierCellPart } from './tierCell';
import { explainPart } from './explain';

export function whatIfView(ctx: PaneContext): View {
  const local = new ViewState<WhatIfLocal>({ key: '' });
  const pick = pickPart(ctx, local);
  const detail = h('div', { class: 'detail', id: 'whatif-detail', 'aria-live': 'polite' });
  const menu = menuPart(ctx);
  const tierCell = tierCellPart(ctx);
  const root = h('div', { class: 'view whatif' }, pick.root, detail, tierCell.root, menu.root, explainPart(ctx));
  const shown = (): boolean => root.isConnected && root.closest('[hidden]') === null;
  const renderDetailNow = (): void => replace(detail, ...renderDetail(ctx.state, local.get().key));

  local.on(renderDetailNow);
  ctx.state.on((t) => {
    if (!shown() || (t !== 'observed' && t !== 'tiers' && t !== 'selection')) return;
    if (t === 'selection') pick.render();
    renderDetailNow();
    menu.render();
  });
  return {
    root,
    refresh() {
      pick.render();
      renderDetailNow();
      tierCell.render();
      menu.render();
    },
  };
}
