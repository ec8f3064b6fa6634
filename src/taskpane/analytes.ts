/**
 * Picking analytes: a search over analyte, specimen, unit and note, and a specimen filter.
 * Pure functions over the table rows, so the pane and the tests agree on what a search finds.
 */
import type { VariationRow } from '../engine/table';
import { rowKey } from '../engine/table';

export const keyOf = (r: Pick<VariationRow, 'analyte' | 'specimen'>): string => rowKey(r.analyte, r.specimen);

/** The distinct specimens of a table, in first-seen order ('' for rows without one). */
export function specimensOf(rows: readonly VariationRow[]): string[] {
  const seen = new Set<string>();
  const out: string[] = [];
  for (const r of rows) {
    const s = r.specimen.trim();
    if (!seen.has(s.toLowerCase())) {
      seen.add(s.toLowerCase());
      out.push(s);
    }
  }
  return out;
}

export interface AnalyteFilter {
  /** Words that must all appear (any case) in analyte, specimen, unit or note. */
  readonly search: string;
  /** A specimen (any case), or '*' for all. */
  readonly specimen: string;
  /** Only rows that give a CVG (so a total allowance exists). */
  readonly withCvgOnly?: boolean;
}

export function filterRows(rows: readonly VariationRow[], f: AnalyteFilter): VariationRow[] {
  const words = f.search.toLowerCase().split(/\s+/).filter(Boolean);
  const spec = f.specimen.trim().toLowerCase();
  return rows.filter((r) => {
    if (f.specimen !== '*' && r.specimen.trim().toLowerCase() !== spec) return false;
    if (f.withCvgOnly && r.cvg === null) return false;
    if (words.length === 0) return true;
    const hay = `${r.analyte} ${r.specimen} ${r.unit} ${r.note}`.toLowerCase();
    return words.every((w) => hay.includes(w));
  });
}

/** "Analyte (specimen)", or the analyte alone. */
export function displayName(r: Pick<VariationRow, 'analyte' | 'specimen'>): string {
  return r.specimen ? `${r.analyte} (${r.specimen})` : r.analyte;
}

/** A row key as an attribute value that a CSS selector can name (the key itself holds a NUL). */
export const attrKey = (key: string): string => encodeURIComponent(key);
