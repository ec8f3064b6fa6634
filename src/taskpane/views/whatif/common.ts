/** What the parts of the What-if view share: the analyte on screen and the rows in scope. */
import type { VariationRow } from '../../../engine/table';
import type { PaneState } from '../../state';
import { zOf } from '../../state';
import type { WhatIfInput } from '../../whatif';

/** The view's own state: the analyte on screen (its key). */
export interface WhatIfLocal {
  readonly key: string;
}

export function inputOf(r: VariationRow, z: number, obs: { bias: number; cv: number } | null): WhatIfInput {
  return { cvi: r.cvi, cvg: r.cvg, z, observed: obs, limits: r };
}

/** The picked analytes, or every analyte when none is picked. */
export function rowsInScope(state: PaneState): VariationRow[] {
  const picked = state.selectedRows();
  return picked.length ? picked : [...state.rows()];
}

export function zOrNull(state: PaneState): number | null {
  const q = zOf(state.coverage);
  return q.ok ? q.z : null;
}
