/** Picking the rows of a table to fill, by analyte name (case and surrounding spaces ignored). */
import type { VariationRow, VariationTable } from '../table/types';
import { rowKey } from '../table/parse';

export interface Selection {
  readonly rows: readonly VariationRow[];
  /** Names that matched no row. */
  readonly unknown: readonly string[];
}

/**
 * The rows named, in the table's order. A name is an analyte (all its specimens) or
 * "analyte (specimen)" for one specimen. No names: every row.
 */
export function selectRows(table: VariationTable, names?: readonly string[]): Selection {
  if (!names || names.length === 0) return { rows: table.rows, unknown: [] };
  const wanted = new Set<string>();
  const unknown: string[] = [];
  for (const raw of names) {
    const name = raw.trim();
    if (name === '') continue;
    const lower = name.toLowerCase();
    const m = /^(.*)\(([^()]*)\)\s*$/.exec(name);
    const hits = table.rows.filter(
      (r) => r.analyte.toLowerCase() === lower || (m !== null && rowKey(r.analyte, r.specimen) === rowKey(m[1], m[2])),
    );
    if (hits.length === 0) unknown.push(name);
    for (const r of hits) wanted.add(rowKey(r.analyte, r.specimen));
  }
  return { rows: table.rows.filter((r) => wanted.has(rowKey(r.analyte, r.specimen))), unknown };
}
