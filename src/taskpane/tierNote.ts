/**
 * Keeping the pane's sheet tier in step with the tier cell of the sheet it filled: views that
 * depend on the tier read the cell again when shown (the user may have typed another tier in
 * Excel), and say when it changed.
 */
import { h } from './dom';
import type { PaneContext } from './view';
import type { PaneState } from './state';
import { readTier } from '../engine/tiers';
import type { Tier } from '../engine/tiers';
import { tierLabel } from './format';

/** A note saying the tier cell changed and that the figures follow it, or null. */
export function tierChangeNote(state: PaneState, id: string): HTMLElement | null {
  const c = state.tierCellChange;
  if (!c || state.sheetTierOrigin.kind !== 'cell') return null;
  return h(
    'p',
    { class: 'notice tier-change', id, role: 'note' },
    `The tier cell ${c.sheet}!${c.cell} changed from ${tierLabel(c.before)} to ${tierLabel(c.after)}: the figures here use ${tierLabel(c.after)} (analytes with their own tier keep it).`,
  );
}

/**
 * Reads the tier cell of the filled sheet (when there is one and a workbook) and, when it holds
 * another tier than the pane last wrote or read there (someone changed it in Excel), takes it as
 * the sheet tier (which notifies the views). A tier chosen in Fill since then is not undone by an
 * unchanged cell. A cell that cannot be read, or holds no tier, leaves the pane as it is.
 */
export async function followTierCell(ctx: PaneContext): Promise<void> {
  const f = ctx.state.filled;
  if (!f || !ctx.host.available) return;
  let tier: Tier;
  try {
    const [grid] = await ctx.host.readRanges([{ sheet: f.sheet, address: f.tierCell.replace(/\$/g, '') }]);
    const v = grid?.[0]?.[0];
    if (typeof v !== 'string') return;
    tier = readTier(v);
  } catch {
    return;
  }
  if (tier === f.tier) return;
  ctx.state.setFilled({ ...f, tier });
  ctx.state.setSheetTier(tier, { kind: 'cell', sheet: f.sheet, cell: f.tierCell });
}
