/*
 * Worksheet wrappers, QC family: control-rule power and QC design (see spec.ts for the
 * conventions). QC.SHIFT is in perf.ts.
 */
import { bind } from './adapter';

const QC_DETECT = bind('QC.DETECT');
const QC_FALSEREJECT = bind('QC.FALSEREJECT');
const QC_PLAN = bind('QC.PLAN');


/**
 * Probability that a control rule rejects when every run carries a systematic shift of `shift` SD, with n controls per run over `runs` consecutive runs (default 1). Rules: terms joined by "/", e.g. "1-3s", "1-2.5s", "1-3s/2-2s/R-4s", "1-3s/2-2s/R-4s/4-1s/10-x", "2of3-2s"; counting rules read across runs, R-4s within one run. Single rules exactly 1 − [Φ(k−Δ) − Φ(−k−Δ)]^(n·runs); multirules by an exact Markov chain. Sources: Westgard and Groth 1979 (power functions); Westgard et al. 1981 (the multirule).
 * @customfunction QC.DETECT
 * @param {any[][]} rule Control rule, e.g. "1-3s/2-2s/R-4s"; underscores accepted for "-".
 * @param {any[][]} n Controls per run, a whole number 1–100.
 * @param {any[][]} shift Systematic shift in SD units, ≥ 0 (e.g. from QC.SHIFT).
 * @param {any[][]} [runs] Number of consecutive runs, a whole number ≥ 1; default 1.
 * @returns {any[][]} Probability of rejection (0–1).
 */
export function qcDetect(rule: any[][], n: any[][], shift: any[][], runs?: any[][]): any[][] {
  return QC_DETECT(rule, n, shift, runs);
}

/**
 * Probability that a control rule rejects a run with no error (shift 0), with n controls per run over `runs` consecutive runs (default 1). About 0.045 for 1-2s and 0.003 for 1-3s with one control. Same rule syntax and method as QC.DETECT. Sources: Westgard and Groth 1979; Westgard et al. 1981.
 * @customfunction QC.FALSEREJECT
 * @param {any[][]} rule Control rule, e.g. "1-3s/2-2s/R-4s".
 * @param {any[][]} n Controls per run, a whole number 1–100.
 * @param {any[][]} [runs] Number of consecutive runs, a whole number ≥ 1; default 1.
 * @returns {any[][]} Probability of false rejection (0–1).
 */
export function qcFalseReject(rule: any[][], n: any[][], runs?: any[][]): any[][] {
  return QC_FALSEREJECT(rule, n, runs);
}

/**
 * The simplest candidate QC procedure that detects the critical shift (allowable − |bias|)/CV − 1.65 with probability ≥ target (default 0.90) and false rejection per run 1 − (1 − P_fr)^(1/runs) ≤ limit (default 0.05). Candidates: 1-3.5s, 1-3s, 1-2.5s with n = 1–4; 1-3s/2-2s/R-4s; /4-1s; /10-x. Lowest n wins, then fewest runs, then lowest false rejection. Spills two rows: Rule, Controls per run, Runs, Detection, False rejection per run, Target met. Percent inputs. Sources: Westgard and Groth 1979; Westgard et al. 1981. QC design is the laboratory's decision.
 * @customfunction QC.PLAN
 * @param {any[][]} allowable Allowable total error, %; ≥ 0.
 * @param {any[][]} bias Observed bias, % (signed; its absolute value is used).
 * @param {any[][]} cv Observed analytical CV, %; > 0.
 * @param {any[][]} [target] Detection wanted at the critical shift, strictly between 0 and 1; default 0.90.
 * @param {any[][]} [limit] Largest false rejection per run, strictly between 0 and 1; default 0.05.
 * @returns {any[][]} Labels, then the plan's values.
 */
export function qcPlan(allowable: any[][], bias: any[][], cv: any[][], target?: any[][], limit?: any[][]): any[][] {
  return QC_PLAN(allowable, bias, cv, target, [limit]);
}
