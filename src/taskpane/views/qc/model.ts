/**
 * The QC view's numbers, from the figures on screen, all from the QC engine: the plan
 * (QC.PLAN), the power curves of the candidates shown (cached per procedure and axis), the run
 * size of each (QC.RUNSIZE, acceptable risk 1) and the risk curve of one procedure at a run size
 * (QC.RISK and its curve against the shift). Pure: no DOM.
 */
import { planQc, QC_CANDIDATES, DEFAULT_TARGET, DEFAULT_FALSE_REJECTION_LIMIT } from '../../../engine/qc/plan';
import type { QcCandidate, QcPlan } from '../../../engine/qc/plan';
import { powerCurve, shiftAxis } from '../../../engine/qc/power';
import { riskCurve, maximumRisk, qcRunSize, DEFAULT_MAX_RISK, MAX_RUN_SIZE } from '../../../engine/qc/risk';
import type { RiskCurve } from '../../../engine/qc/risk';
import { messageOf } from '../../view';

export const candidateId = (c: Pick<QcCandidate, 'rule' | 'n' | 'runs'>): string => `${c.rule}|${c.n}|${c.runs}`;
export const candidateLabel = (c: Pick<QcCandidate, 'rule' | 'n' | 'runs'>): string => `${c.rule}, n=${c.n}${c.runs > 1 ? `, ${c.runs} runs` : ''}`;

/** Shown before the user picks: one of each kind of rule, at n = 2 where it exists. */
export const DEFAULT_SHOWN = ['1-3s|2|1', '1-2.5s|2|1', '1-3s/2-2s/R-4s|2|1', '1-3s/2-2s/R-4s/4-1s|4|1'];
export const MAX_CURVES = 6;
const STEP = 0.1;

/** The figures of the view, percent; undefined where a field is empty or not a number. */
export interface Figures {
  readonly allowable: number | undefined;
  readonly bias: number | undefined;
  readonly cv: number | undefined;
  readonly target: number | undefined;
  readonly limit: number | undefined;
}

export type PlanOutcome = { kind: 'missing' } | { kind: 'error'; message: string } | { kind: 'plan'; plan: QcPlan; target: number; allowable: number; bias: number; cv: number };

export function planOf(fig: Figures): PlanOutcome {
  const { allowable, bias, cv } = fig;
  if (allowable === undefined || bias === undefined || cv === undefined) return { kind: 'missing' };
  const target = fig.target ?? DEFAULT_TARGET;
  try {
    return { kind: 'plan', plan: planQc(allowable, bias, cv, target, fig.limit ?? DEFAULT_FALSE_REJECTION_LIMIT), target, allowable, bias, cv };
  } catch (e) {
    return { kind: 'error', message: messageOf(e) };
  }
}

const curveCache = new Map<string, { xs: number[]; ys: number[] }>();

/** The power curve of one candidate on [0, xMax], from the QC engine (cached). */
export function curveOf(c: QcCandidate, xMax: number): { xs: number[]; ys: number[] } {
  const key = `${candidateId(c)}|${xMax}`;
  let hit = curveCache.get(key);
  if (!hit) {
    const pts = powerCurve(c.rule, c.n, c.runs, shiftAxis(xMax, STEP));
    hit = { xs: pts.map((p) => p.shift), ys: pts.map((p) => p.p) };
    curveCache.set(key, hit);
  }
  return hit;
}

/** The shift axis: at least 4 SD, past the critical shift by 1 SD, at most 10. */
export function axisMax(criticalShift: number): number {
  return Math.min(10, Math.max(4, Math.ceil(criticalShift + 1)));
}

/** The candidates drawn: those ticked, and the plan's own always. */
export function candidatesShown(shown: readonly string[], plan: QcPlan): QcCandidate[] {
  const planId = candidateId(plan);
  return QC_CANDIDATES.filter((c) => shown.includes(candidateId(c)) || candidateId(c) === planId);
}

/** QC.RUNSIZE of a procedure (acceptable risk 1), or the engine's message. */
export function runSizeOf(o: { allowable: number; bias: number; cv: number }, c: Pick<QcCandidate, 'rule' | 'n'>): number | string {
  try {
    return qcRunSize(o.allowable, o.bias, o.cv, c.rule, c.n, DEFAULT_MAX_RISK);
  } catch (e) {
    return messageOf(e);
  }
}

/** A run size typed by the user: a whole number 1 … 1,000,000, or why not. */
export function readRunSize(text: string): { ok: true; value: number } | { ok: false; why: string } | null {
  const t = text.trim();
  if (t === '') return null;
  if (!/^\d+$/.test(t)) return { ok: false, why: `“${t}” is not a whole number of patient results` };
  const v = Number(t);
  if (v < 1 || v > MAX_RUN_SIZE) return { ok: false, why: `the run size must be 1 to ${MAX_RUN_SIZE.toLocaleString('en-US')} (got ${t})` };
  return { ok: true, value: v };
}

export type RiskOutcome = { ok: true; curve: RiskCurve; runSize: number; exceeds: boolean } | { ok: false; why: string };

/** E(Nuf) against the shift for one procedure at one run size, with its maximum (QC.RISK). */
export function riskOf(o: { allowable: number; bias: number; cv: number }, c: Pick<QcCandidate, 'rule' | 'n'>, runSize: number): RiskOutcome {
  try {
    // The axis runs 3 SD past the shift of the maximum (4 to 10 SD), in steps of 0.1 SD.
    const peak = maximumRisk(o.allowable, o.bias, o.cv, c.rule, c.n, runSize);
    const xMax = Math.min(10, Math.max(4, Math.ceil(peak.argmax + 3)));
    const curve = riskCurve(o.allowable, o.bias, o.cv, c.rule, c.n, runSize, shiftAxis(xMax, STEP));
    return { ok: true, curve, runSize, exceeds: curve.maxRisk > DEFAULT_MAX_RISK };
  } catch (e) {
    return { ok: false, why: messageOf(e) };
  }
}
