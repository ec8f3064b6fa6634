/**
 * Fill view: choose the sheet's tier (and a tier for single analytes), the coverage (a z, or a
 * probability turned into z by ZSCORE's own code), the analytes (search and filter), and where
 * to write: a new sheet (default), the selected range or the active sheet as a template (the
 * planner finds its header row). The check shows what will be written before anything is.
 */
import { h } from '../../dom';
import type { PaneContext, View } from '../../view';
import { ViewState } from '../../view';
import { INITIAL } from './common';
import type { FillLocal } from './common';
import { tiersPart } from './tiers';
import { pickPart } from './pick';
import { wherePart } from './where';
import { checkPart } from './check';

export function fillView(ctx: PaneContext): View {
  const local = new ViewState<FillLocal>(INITIAL);
  const checked = checkPart(ctx, local);
  const tiers = tiersPart(ctx, checked.invalidate);
  const pick = pickPart(ctx, checked.invalidate);
  const where = wherePart(local, checked.invalidate, checked.check);
  const root = h('div', { class: 'view fill' }, tiers.root, pick.root, where.root, checked.root);
  // The per-analyte tier lists name the sheet tier: list them again when it changes.
  let listedTier = ctx.state.sheetTier;
  ctx.state.on((t) => {
    if (t !== 'tiers' || ctx.state.sheetTier === listedTier || !root.isConnected) return;
    listedTier = ctx.state.sheetTier;
    pick.render();
  });
  return {
    root,
    refresh() {
      listedTier = ctx.state.sheetTier;
      tiers.render();
      pick.render();
      where.render();
    },
  };
}
