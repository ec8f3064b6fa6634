/**
 * QC.PLAN: the simplest candidate QC procedure that detects the critical systematic error.
 *
 * Critical shift ΔSE_crit = (allowable − |bias|)/CV − 1.65 (QC.SHIFT; Westgard JO, Groth T.
 * Clin Chem 1979;25:863–9). For each candidate of the plan's list below (rule, n controls per run,
 * runs): detection = QC.DETECT(rule, n, ΔSE_crit, runs) and false rejection per run
 * = 1 − (1 − QC.FALSEREJECT(rule, n, runs))^(1/runs). A candidate meets the design when
 * detection ≥ target (default 0.90) and false rejection per run ≤ limit (default 0.05).
 * Among those that do, the lowest n wins, then the fewest runs, then the lowest false rejection
 * per run, then the earlier in the list. When none does, the candidate with the highest
 * detection is returned (the earlier on a tie) with targetMet false. When ΔSE_crit ≤ 0
 * (sigma ≤ 1.65) the method fails its allowance with no shift at all: detection is shown at
 * shift 0 and no candidate meets the target.
 * Run size: QC.RUNSIZE of the chosen rule and n with maxrisk 1 (risk.ts; Parvin CA. Clin Chem
 * 2008;54:2049–54; CLSI C24-Ed4), the largest number of patient results between QC events that
 * keeps the expected number of unreliable final results from a shift at most 1. It does not take
 * part in the choice; it is 0 when the method fails its allowance without a shift.
 */
import { criticalShiftScaled } from '../perf';
import { toDouble } from '../scaled';
import { openProbability } from '../guards';
import { detectionProbability, falseRejectionProbability } from './power';
import { DEFAULT_MAX_RISK, qcRunSize } from './risk';
import { parseRule } from './rules';

export interface QcCandidate {
  readonly rule: string;
  readonly n: number;
  readonly runs: number;
}

/** The candidate designs, in order of preference (simpler first). */
export const QC_CANDIDATES: readonly QcCandidate[] = [
  ...['1-3.5s', '1-3s', '1-2.5s'].flatMap((rule) => [1, 2, 3, 4].map((n) => ({ rule, n, runs: 1 }))),
  { rule: '1-3s/2-2s/R-4s', n: 2, runs: 1 },
  { rule: '1-3s/2-2s/R-4s', n: 4, runs: 1 },
  { rule: '1-3s/2-2s/R-4s/4-1s', n: 2, runs: 2 },
  { rule: '1-3s/2-2s/R-4s/4-1s', n: 4, runs: 1 },
  { rule: '1-3s/2-2s/R-4s/4-1s/10-x', n: 2, runs: 5 },
  { rule: '1-3s/2-2s/R-4s/4-1s/10-x', n: 4, runs: 3 },
];

export const DEFAULT_TARGET = 0.9;
export const DEFAULT_FALSE_REJECTION_LIMIT = 0.05;
/** z of the critical shift: at most 5 % of results may exceed the allowance (one-sided). */
export const PLAN_Z = 1.65;

export interface QcPlan {
  readonly rule: string;
  readonly n: number;
  readonly runs: number;
  readonly detection: number;
  readonly falseRejectionPerRun: number;
  readonly targetMet: boolean;
  /** The critical shift the detection refers to, SD (may be negative; ±1.8e308 stands for a shift beyond the double range). */
  readonly criticalShift: number;
  /** QC.RUNSIZE of the chosen rule and n (maxrisk 1): patient results between QC events. */
  readonly runSize: number;
}

/** 1 − (1 − p)^(1/runs): the false rejection of one run that gives p over `runs` runs. */
export function perRunRejection(p: number, runs: number): number {
  if (p >= 1) return 1;
  return -Math.expm1(Math.log1p(-p) / runs);
}

/**
 * QC.PLAN. allowable ≥ 0 and bias in percent (|bias| used), cv > 0 percent; target and limit
 * probabilities strictly in (0, 1).
 */
export function planQc(
  allowable: number,
  bias: number,
  cv: number,
  target = DEFAULT_TARGET,
  limit = DEFAULT_FALSE_REJECTION_LIMIT,
): QcPlan {
  // A critical shift beyond ±1.8e308 (a CV tiny beside the allowance) is held at ±1.8e308: every
  // candidate's detection there is 1 (or, below 0, the method fails its allowance) to double precision.
  const shift = Math.min(Number.MAX_VALUE, Math.max(-Number.MAX_VALUE, toDouble(criticalShiftScaled(allowable, bias, cv, PLAN_Z))));
  openProbability(target, 'target');
  openProbability(limit, 'limit');
  const at = Math.max(shift, 0);
  const rows = QC_CANDIDATES.map((c, index) => {
    const rule = parseRule(c.rule);
    const fr = perRunRejection(falseRejectionProbability(rule, c.n, c.runs), c.runs);
    return { ...c, rule: rule.text, index, fr, detection: NaN };
  });
  const detect = (row: (typeof rows)[number]): number => {
    if (Number.isNaN(row.detection)) row.detection = detectionProbability(row.rule, row.n, at, row.runs);
    return row.detection;
  };
  const order = [...rows].sort((a, b) => a.n - b.n || a.runs - b.runs || a.fr - b.fr || a.index - b.index);
  const result = (row: (typeof rows)[number], targetMet: boolean): QcPlan => ({
    rule: row.rule,
    n: row.n,
    runs: row.runs,
    detection: detect(row),
    falseRejectionPerRun: row.fr,
    targetMet,
    criticalShift: shift,
    runSize: qcRunSize(allowable, bias, cv, row.rule, row.n, DEFAULT_MAX_RISK),
  });
  if (shift > 0) {
    // In selection order, the first candidate meeting both criteria is the plan; the false
    // rejection is known first, so detection is computed only where it can decide.
    for (const row of order) {
      if (row.fr <= limit && detect(row) >= target) return result(row, true);
    }
  }
  let best = rows[0];
  for (const row of rows) if (detect(row) > detect(best)) best = row;
  return result(best, false);
}

/**
 * QC.RUNSIZE of each candidate (rule, n; the candidate's `runs` does not enter: a QC event is one
 * run of n controls), in the order given: for the task pane's table of candidates. Inputs as
 * QC.RUNSIZE; maxrisk default 1.
 */
export function candidateRunSizes(
  allowable: number,
  bias: number,
  cv: number,
  candidates: readonly QcCandidate[] = QC_CANDIDATES,
  maxrisk = DEFAULT_MAX_RISK,
): number[] {
  return candidates.map((c) => qcRunSize(allowable, bias, cv, c.rule, c.n, maxrisk));
}
