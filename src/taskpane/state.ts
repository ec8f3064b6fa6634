/**
 * What the pane remembers while it is open: the table in use, the tiers chosen, the coverage,
 * the analytes picked and any observed bias/CV typed or read. Views read it and announce changes
 * through its setters, which notify the listeners; nothing here touches the DOM or Excel.
 */
import type { VariationRow, VariationTable } from '../engine/table';
import type { Tier } from '../engine/tiers';
import { DEFAULT_TIER } from '../engine/tiers';
import { zFromCoverage, Z_TOTAL_ERROR } from '../engine/coverage';
import { isLeewayError } from '../engine/errors';
import { keyOf } from './analytes';

export type CoverageMode = 'z' | 'probability';

export interface Coverage {
  readonly mode: CoverageMode;
  /** Used when mode is 'z'. */
  readonly z: number;
  /** Used when mode is 'probability': converted with ZSCORE's own code. */
  readonly probability: number;
  readonly sides: 1 | 2;
}

export const DEFAULT_COVERAGE: Coverage = { mode: 'z', z: Z_TOTAL_ERROR, probability: 0.95, sides: 1 };

/** The z a coverage choice gives (ZSCORE for a probability), or the engine's message. */
export function zOf(c: Coverage): { ok: true; z: number } | { ok: false; why: string } {
  if (c.mode === 'z') {
    if (!(c.z >= 0) || !Number.isFinite(c.z)) return { ok: false, why: `z must be a finite number ≥ 0 (got ${c.z})` };
    return { ok: true, z: c.z };
  }
  try {
    return { ok: true, z: zFromCoverage(c.probability, c.sides) };
  } catch (e) {
    return { ok: false, why: isLeewayError(e) ? e.message : String(e) };
  }
}

export interface Observed {
  readonly bias: number;
  readonly cv: number;
  /** Where the numbers came from: "typed" or a cell address. */
  readonly from: string;
}

export type Topic = 'table' | 'tiers' | 'coverage' | 'selection' | 'observed' | 'library' | 'filled';

/** The sheet the last fill wrote (what-if changes its tier cell). */
export interface FilledSheet {
  readonly sheet: string;
  /** Absolute address of the tier cell, e.g. "$B$4". */
  readonly tierCell: string;
  readonly zCell: string;
  readonly tier: Tier;
}

export class PaneState {
  tableId = 'demo';
  table: VariationTable | null = null;
  sheetTier: Tier = DEFAULT_TIER;
  /** Per-analyte tier overrides (keyed by keyOf). */
  readonly analyteTier = new Map<string, Tier>();
  coverage: Coverage = DEFAULT_COVERAGE;
  /** Analytes picked for filling, what-if and the summary (keyed by keyOf). */
  readonly selected = new Set<string>();
  readonly observed = new Map<string, Observed>();
  filled: FilledSheet | null = null;
  private readonly listeners: Array<(t: Topic) => void> = [];

  on(listener: (t: Topic) => void): void {
    this.listeners.push(listener);
  }

  changed(t: Topic): void {
    for (const l of this.listeners) l(t);
  }

  setTable(id: string, table: VariationTable | null): void {
    this.tableId = id;
    this.table = table;
    this.analyteTier.clear();
    this.selected.clear();
    this.observed.clear();
    if (table) for (const r of table.rows) this.selected.add(keyOf(r));
    this.changed('table');
  }

  setSheetTier(t: Tier): void {
    this.sheetTier = t;
    this.changed('tiers');
  }

  /** A tier for one analyte, or null to follow the sheet's tier. */
  setAnalyteTier(key: string, t: Tier | null): void {
    if (t === null) this.analyteTier.delete(key);
    else this.analyteTier.set(key, t);
    this.changed('tiers');
  }

  setCoverage(c: Coverage): void {
    this.coverage = c;
    this.changed('coverage');
  }

  /** Picks (or unpicks) analytes by key. */
  pick(keys: Iterable<string>, on: boolean): void {
    for (const k of keys) {
      if (on) this.selected.add(k);
      else this.selected.delete(k);
    }
    this.changed('selection');
  }

  /** Observed bias and CV for analytes by key (null removes them). */
  setObserved(entries: Iterable<readonly [string, Observed | null]>): void {
    for (const [k, o] of entries) {
      if (o === null) this.observed.delete(k);
      else this.observed.set(k, o);
    }
    this.changed('observed');
  }

  setFilled(f: FilledSheet | null): void {
    this.filled = f;
    this.changed('filled');
  }

  rows(): readonly VariationRow[] {
    return this.table ? this.table.rows : [];
  }

  selectedRows(): VariationRow[] {
    return this.rows().filter((r) => this.selected.has(keyOf(r)));
  }

  tierFor(r: VariationRow): Tier {
    return this.analyteTier.get(keyOf(r)) ?? this.sheetTier;
  }
}
