/**
 * What-if across tiers: for one analyte, the three tiers side by side from the engine
 * (SPEC.TIERS), and with observed bias and CV the observed total error (PERF.TOTAL), the sigma
 * metric and share of the allowance against each tier (PERF.SIGMA, PERF.SHARE) and the most
 * stringent tier met (PERF.TIER, mode "total"). Every number comes from src/engine; this file
 * only arranges them. A fixed (regulatory/EQA) limit, when the table gives one, is a fourth row
 * (SPEC.FIXED at the table's level).
 */
import { tierTable, fixedLimitPercent, allowableImprecision } from '../engine/spec';
import { observedTotalError, sigmaMetric, allowanceShare, tierMet } from '../engine/perf';
import { TIERS } from '../engine/tiers';
import type { Tier } from '../engine/tiers';
import { isLeewayError } from '../engine/errors';

/** A number, or why there is none (the engine's message). */
export type Figure = { ok: true; value: number } | { ok: false; why: string };

function figure(f: () => number): Figure {
  try {
    return { ok: true, value: f() };
  } catch (e) {
    return { ok: false, why: isLeewayError(e) ? `${e.code} ${e.message}` : String(e) };
  }
}

export interface WhatIfInput {
  readonly cvi: number;
  /** Absent when the table gives no between-subject CV: then no bias or total allowance. */
  readonly cvg?: number | null;
  readonly z: number;
  readonly observed?: { readonly bias: number; readonly cv: number } | null;
  readonly fixed?: { readonly level: number; readonly absolute: number; readonly percent: number } | null;
}

export interface WhatIfRow {
  readonly tier: Tier | 'fixed';
  readonly cv: Figure;
  readonly bias: Figure;
  readonly total: Figure;
  /** Against this row's total allowance; absent without observed data. */
  readonly sigma?: Figure;
  readonly share?: Figure;
  readonly met?: boolean;
}

export interface WhatIfResult {
  readonly rows: readonly WhatIfRow[];
  readonly observedTotal?: Figure;
  /** PERF.TIER: the most stringent biological-variation tier met. */
  readonly tierMet?: Tier | 'none' | { why: string };
}

const missing = (what: string): Figure => ({ ok: false, why: `no ${what} in the table` });

export function whatIf(input: WhatIfInput): WhatIfResult {
  const { cvi, z } = input;
  const cvg = input.cvg ?? null;
  const obs = input.observed ?? null;
  let base: WhatIfRow[];
  if (cvg === null) {
    base = TIERS.map((tier) => ({
      tier,
      cv: figure(() => allowableImprecision(cvi, tier)),
      bias: missing('CVG'),
      total: missing('CVG'),
    }));
  } else {
    let table: ReturnType<typeof tierTable> | null = null;
    let why = '';
    try {
      table = tierTable(cvi, cvg, z);
    } catch (e) {
      why = isLeewayError(e) ? `${e.code} ${e.message}` : String(e);
    }
    base = TIERS.map((tier, i) =>
      table
        ? {
            tier,
            cv: { ok: true, value: table[i].cv },
            bias: { ok: true, value: table[i].bias },
            total: { ok: true, value: table[i].total },
          }
        : { tier, cv: { ok: false, why }, bias: { ok: false, why }, total: { ok: false, why } },
    );
  }
  if (input.fixed) {
    const f = input.fixed;
    base.push({
      tier: 'fixed',
      cv: { ok: false, why: 'a fixed limit sets only the total' },
      bias: { ok: false, why: 'a fixed limit sets only the total' },
      total: figure(() => fixedLimitPercent(f.level, f.absolute, f.percent)),
    });
  }
  if (!obs) return { rows: base };

  const observedTotal = figure(() => observedTotalError(obs.bias, obs.cv, z));
  const rows = base.map((r): WhatIfRow => {
    if (!r.total.ok) return { ...r, sigma: r.total, share: r.total };
    const allowable = r.total.value;
    const share = observedTotal.ok ? figure(() => allowanceShare(observedTotal.value, allowable)) : observedTotal;
    return {
      ...r,
      sigma: figure(() => sigmaMetric(allowable, obs.bias, obs.cv)),
      share,
      met: observedTotal.ok ? observedTotal.value <= allowable : undefined,
    };
  });
  let met: WhatIfResult['tierMet'];
  if (cvg === null) met = { why: 'no CVG in the table' };
  else {
    try {
      met = tierMet(cvi, cvg, obs.bias, obs.cv, z, 'total');
    } catch (e) {
      met = { why: isLeewayError(e) ? `${e.code} ${e.message}` : String(e) };
    }
  }
  return { rows, observedTotal, tierMet: met };
}
