/**
 * The assessment chain of one analyte, computed once and read by every view and writer (the
 * pane's What-if and summary, the demo workbook, the command line):
 *
 *   allowances at each tier (SPEC.CV, SPEC.BIAS, SPEC.TOTAL, SPEC.MU) and the fixed limit
 *   → observed total error |bias| + z·CV (PERF.TOTAL)
 *   → share of each allowance used (PERF.SHARE) and sigma against it (PERF.SIGMA)
 *   → the most stringent tier met (PERF.TIER, mode "total")
 *   → the QC plan against the allowance in use (QC.PLAN).
 *
 * Every figure is a value, an error (the engine's code and message) or an absence (the table
 * has no CVG, no fixed limit, no observed data), and says which. Nothing here formats or
 * rounds; the views do.
 *
 * The fixed limit (one rule, everywhere): with an absolute part, SPEC.FIXED(level, absolute,
 * percent or 0) — it needs the level it is judged at; with a percent part alone, that percent;
 * with neither, no fixed limit.
 */
import { allowableBias, allowableImprecision, allowableTotalError, allowableUncertainty, fixedLimitPercent } from './spec';
import { allowanceShare, observedTotalError, sigmaMetric, tierMet } from './perf';
import { planQc, QcPlan } from './qc/plan';
import { isLeewayError, naError, ErrorCode } from './errors';
import { TIERS } from './tiers';
import type { Tier } from './tiers';

/** A figure of the chain: its value, the error that stopped it, or why it is absent. */
export type Fig<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly absent: false; readonly code: ErrorCode; readonly message: string }
  | { readonly ok: false; readonly absent: true; readonly why: string };

/** A figure in words: its value's absence reason, or its error as "#CODE! message". */
export function explain(f: Fig<unknown>): string {
  if (f.ok) return '';
  return f.absent ? f.why : `${f.code} ${f.message}`;
}

export function value<T>(v: T): Fig<T> {
  return { ok: true, value: v };
}

export function absent<T>(why: string): Fig<T> {
  return { ok: false, absent: true, why };
}

/** Runs one step; a LeewayError becomes the figure's error (code and message). */
export function step<T>(f: () => T): Fig<T> {
  try {
    return { ok: true, value: f() };
  } catch (e) {
    if (isLeewayError(e)) return { ok: false, absent: false, code: e.code, message: e.message };
    throw e;
  }
}

/** A figure that needs another: carries the other's error or absence along. */
export function then<A, T>(a: Fig<A>, f: (a: A) => T): Fig<T> {
  return a.ok ? step(() => f(a.value)) : a;
}

/** The value, or undefined (for views that show a blank). */
export function valueOf<T>(f: Fig<T> | undefined): T | undefined {
  return f && f.ok ? f.value : undefined;
}

/** What the chain needs of a variation-table row. */
export interface AnalyteSpec {
  readonly cvi: number;
  /** null when the table gives no between-subject CV: then no bias or total allowance from biology. */
  readonly cvg: number | null;
  readonly limitAbs: number | null;
  readonly limitPct: number | null;
  readonly level: number | null;
}

/** The fixed (regulatory or EQA) limit as a percent, by the one rule above; absent when the table has none. */
export function fixedLimit(spec: AnalyteSpec): Fig<number> {
  if (spec.limitAbs !== null) {
    // As SPEC.FIXED reads a blank level cell: the absolute part needs the level it is judged at.
    if (spec.level === null) return step(() => { throw naError('level is blank: enter a number'); });
    return step(() => fixedLimitPercent(spec.level as number, spec.limitAbs as number, spec.limitPct ?? 0));
  }
  if (spec.limitPct !== null) return value(spec.limitPct);
  return absent('no fixed limit in the table');
}

export interface Observed {
  readonly bias: number;
  readonly cv: number;
}

/** One source of allowance: a tier of biological variation, or the fixed limit. */
export type Basis = Tier | 'fixed';

/** The allowances of one basis and, with observed data, how the method fares against its total. */
export interface AllowanceRow {
  readonly basis: Basis;
  readonly cv: Fig<number>;
  readonly bias: Fig<number>;
  readonly total: Fig<number>;
  /** Maximum allowable standard uncertainty (SPEC.MU, k = 1). */
  readonly mu: Fig<number>;
  /** Against `total`; absent without observed data. */
  readonly sigma: Fig<number>;
  readonly share: Fig<number>;
  /** Observed total error within `total`; undefined when either is missing. */
  readonly met: boolean | undefined;
}

export interface AssessInput {
  readonly spec: AnalyteSpec;
  /** The tier in use for this analyte. */
  readonly tier: Tier;
  /** Coverage of the imprecision in the total (1.65 by default). */
  readonly z: number;
  readonly observed?: Observed | null;
  /** Compute the QC plan against the allowance in use (QC.PLAN's defaults). */
  readonly plan?: boolean;
}

export interface Assessment {
  readonly tier: Tier;
  readonly z: number;
  /** optimum, desirable, minimum, then the fixed limit when the table has one. */
  readonly rows: readonly AllowanceRow[];
  /** The row of the tier in use. */
  readonly inUse: AllowanceRow;
  readonly fixed: Fig<number>;
  readonly observedTotal: Fig<number>;
  /** PERF.TIER, mode "total". */
  readonly tierMet: Fig<Tier | 'none'>;
  /** QC.PLAN against the total of the tier in use. */
  readonly plan: Fig<QcPlan>;
}

const NO_CVG = 'no CVG in the table';
const NO_OBSERVED = 'no observed bias and CV';
const FIXED_ONLY = 'a fixed limit sets only the total';

function rowOf(basis: Basis, cv: Fig<number>, bias: Fig<number>, total: Fig<number>, mu: Fig<number>, observedTotal: Fig<number>, obs: Observed | null): AllowanceRow {
  if (!obs) return { basis, cv, bias, total, mu, sigma: absent(NO_OBSERVED), share: absent(NO_OBSERVED), met: undefined };
  const sigma = then(total, (t) => sigmaMetric(t, obs.bias, obs.cv));
  const share = total.ok ? then(observedTotal, (o) => allowanceShare(o, total.value)) : total;
  const met = total.ok && observedTotal.ok ? observedTotal.value <= total.value : undefined;
  return { basis, cv, bias, total, mu, sigma, share, met };
}

/** The whole chain for one analyte. */
export function assess(input: AssessInput): Assessment {
  const { spec, tier, z } = input;
  const obs = input.observed ?? null;
  const observedTotal: Fig<number> = obs ? step(() => observedTotalError(obs.bias, obs.cv, z)) : absent(NO_OBSERVED);
  const rows: AllowanceRow[] = TIERS.map((t) => {
    const cv = step(() => allowableImprecision(spec.cvi, t));
    const mu = step(() => allowableUncertainty(spec.cvi, t, 1));
    const bias: Fig<number> = spec.cvg === null ? absent(NO_CVG) : step(() => allowableBias(spec.cvi, spec.cvg as number, t));
    const total: Fig<number> = spec.cvg === null ? absent(NO_CVG) : step(() => allowableTotalError(spec.cvi, spec.cvg as number, t, z));
    return rowOf(t, cv, bias, total, mu, observedTotal, obs);
  });
  const fixed = fixedLimit(spec);
  if (!(fixed.ok === false && fixed.absent)) {
    rows.push(rowOf('fixed', absent(FIXED_ONLY), absent(FIXED_ONLY), fixed, absent(FIXED_ONLY), observedTotal, obs));
  }
  const inUse = rows[TIERS.indexOf(tier)];
  let met: Fig<Tier | 'none'>;
  if (!obs) met = absent(NO_OBSERVED);
  else if (spec.cvg === null) met = absent(NO_CVG);
  else met = step(() => tierMet(spec.cvi, spec.cvg as number, obs.bias, obs.cv, z, 'total'));
  let plan: Fig<QcPlan>;
  if (!input.plan) plan = absent('no QC plan asked for');
  else if (!obs) plan = absent(NO_OBSERVED);
  else plan = then(inUse.total, (allowable) => planQc(allowable, obs.bias, obs.cv));
  return { tier, z, rows, inUse, fixed, observedTotal, tierMet: met, plan };
}
