/**
 * Changes the tier cell of a filled sheet (what-if for the whole sheet): one write, one sync.
 * Every derived formula on the sheet reads that cell, so Excel recalculates the sheet.
 */
import type { TierCellWrite } from '../host';
import { TIERS } from '../../engine/tiers';

export async function writeTierCell(context: Excel.RequestContext, w: TierCellWrite): Promise<void> {
  if (!(TIERS as readonly string[]).includes(w.tier)) throw new Error(`tier must be optimum, desirable or minimum (got ${w.tier})`);
  const sheet = context.workbook.worksheets.getItem(w.sheet);
  sheet.getRange(w.cell.replace(/\$/g, '')).values = [[w.tier]];
  await context.sync();
}
