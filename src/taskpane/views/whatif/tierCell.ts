/**
 * Moving a whole filled sheet to another tier: the sheet's formulas all read one tier cell,
 * which this part sets (or finds on the active sheet first).
 */
import { h, replace, radioGroup, uid } from '../../dom';
import type { PaneContext } from '../../view';
import { PaneError } from '../../view';
import { findTierCell } from '../../sheetRows';
import { tierLabel } from '../../format';
import { TIERS, readTier } from '../../../engine/tiers';
import type { Tier } from '../../../engine/tiers';
import { TIER_CELL_LABEL } from '../../../engine/fill';

/** Sets the tier cell of the sheet last filled or found; resolves to the status message. */
async function applyTier(ctx: PaneContext, tier: Tier): Promise<string> {
  const target = ctx.state.filled;
  if (!target) throw new PaneError('Fill a sheet first (Fill), or use the active sheet.');
  await ctx.host.setTierCell({ sheet: target.sheet, cell: target.tierCell, tier });
  ctx.state.setFilled({ ...target, tier });
  ctx.state.setSheetTier(tier, { kind: 'cell', sheet: target.sheet, cell: target.tierCell });
  return `${target.sheet} now uses the ${tier} tier; Excel recalculates its formulas.`;
}

/** Finds the tier cell on the active sheet and takes its tier as the sheet tier. */
async function findOnActive(ctx: PaneContext): Promise<string> {
  const sheet = await ctx.host.readActiveSheet();
  const found = findTierCell(sheet);
  if (!found) throw new PaneError(`${sheet.grid.sheet} has no “${TIER_CELL_LABEL}” cell: it was not filled by Leeway, or the block was removed.`);
  let tier: Tier | null = null;
  try {
    tier = readTier(found.tier);
  } catch {
    /* the cell holds something else: keep the pane's tier */
  }
  ctx.state.setFilled({ sheet: sheet.grid.sheet, tierCell: found.tierCell, zCell: found.zCell ?? '', tier: tier ?? ctx.state.sheetTier });
  if (tier) ctx.state.setSheetTier(tier, { kind: 'cell', sheet: sheet.grid.sheet, cell: found.tierCell });
  return `Found the tier cell of ${sheet.grid.sheet} at ${found.tierCell} (now “${found.tier}”).`;
}

export function tierCellPart(ctx: PaneContext): { root: HTMLElement; render(): void } {
  const root = h('div', { class: 'tier-cell', id: 'tier-cell' });
  let newTier: Tier = ctx.state.sheetTier;
  const name = uid('sheet-tier');

  function render(): void {
    const f = ctx.state.filled;
    const apply = h('button', { type: 'button', id: 'apply-tier', class: 'primary', disabled: !f }, 'Set the sheet’s tier cell');
    apply.addEventListener('click', () => {
      const target = ctx.state.filled;
      if (target) void ctx.run(`Setting ${target.sheet}!${target.tierCell} to “${newTier}”…`, () => applyTier(ctx, newTier));
    });
    const find = h('button', { type: 'button', id: 'find-tier-cell' }, 'Use the active sheet');
    find.addEventListener('click', () => void ctx.run('Looking for the tier cell on the active sheet…', () => findOnActive(ctx)));
    if (f) newTier = f.tier;
    const target = f
      ? `Sheet ${f.sheet}, tier cell ${f.tierCell} (now ${f.tier}). Every formula on it reads that cell.`
      : 'Fill a sheet first (Fill), or open a sheet Leeway filled and use it: its formulas read one tier cell, which this sets.';
    replace(
      root,
      h('h2', {}, 'Move the whole sheet'),
      h('p', { class: 'hint', id: 'tier-target' }, target),
      radioGroup('New tier for the sheet', name, TIERS.map((t) => ({ value: t, label: tierLabel(t) })), newTier, (v) => {
        newTier = v;
      }),
      h('div', { class: 'actions' }, apply, find),
    );
  }
  ctx.state.on((t) => {
    if (t === 'filled' && root.isConnected) render();
  });
  return { root, render };
}
