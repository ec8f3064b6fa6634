/**
 * What-if across tiers for one analyte: the engine's assessment chain (src/engine/assess.ts),
 * arranged for the What-if view — the three tiers side by side and the fixed limit when the table
 * gives one; with observed bias and CV, the observed total error, sigma and share of each
 * allowance and the most stringent tier met. Nothing is computed here.
 */
import { assess, explain } from '../engine/assess';
import type { AnalyteSpec, Basis, Fig } from '../engine/assess';
import type { Tier } from '../engine/tiers';
import { DEFAULT_TIER } from '../engine/tiers';

/** A number, or why there is none (the engine's message, or what the table lacks). */
export type Figure = { ok: true; value: number } | { ok: false; why: string };

function figure(f: Fig<number>): Figure {
  return f.ok ? { ok: true, value: f.value } : { ok: false, why: explain(f) };
}

export interface WhatIfInput {
  readonly cvi: number;
  /** Absent when the table gives no between-subject CV: then no bias or total allowance. */
  readonly cvg?: number | null;
  readonly z: number;
  readonly observed?: { readonly bias: number; readonly cv: number } | null;
  /** The fixed-limit columns of the table row (the engine's one rule reads them). */
  readonly limits?: { readonly limitAbs: number | null; readonly limitPct: number | null; readonly level: number | null } | null;
}

export interface WhatIfRow {
  readonly tier: Basis;
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

export function whatIf(input: WhatIfInput): WhatIfResult {
  const spec: AnalyteSpec = {
    cvi: input.cvi,
    cvg: input.cvg ?? null,
    limitAbs: input.limits?.limitAbs ?? null,
    limitPct: input.limits?.limitPct ?? null,
    level: input.limits?.level ?? null,
  };
  const obs = input.observed ?? null;
  const a = assess({ spec, tier: DEFAULT_TIER, z: input.z, observed: obs });
  const rows = a.rows.map((r): WhatIfRow => {
    const base = { tier: r.basis, cv: figure(r.cv), bias: figure(r.bias), total: figure(r.total) };
    return obs ? { ...base, sigma: figure(r.sigma), share: figure(r.share), met: r.met } : base;
  });
  if (!obs) return { rows };
  const tierMet = a.tierMet.ok ? a.tierMet.value : { why: explain(a.tierMet) };
  return { rows, observedTotal: figure(a.observedTotal), tierMet };
}
