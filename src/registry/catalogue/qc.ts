/**
 * QC.DETECT, QC.FALSEREJECT, QC.PLAN: control-rule design. QC.SHIFT lives with the PERF family
 * (catalogue/perf.ts).
 */
import { detectionProbability, falseRejectionProbability } from '../../engine/qc/power';
import { DEFAULT_FALSE_REJECTION_LIMIT, DEFAULT_TARGET, planQc } from '../../engine/qc/plan';
import { ControlRule, parseRule } from '../../engine/qc/rules';
import { naError } from '../../engine/errors';
import { labelled, elementwise, num, optNum, word } from '../define';
import { ALLOWABLE, BIAS } from '../params';

/** A blank cell may arrive as "": it is a missing rule (#N/A), not a malformed one. */
function readRule(text: string): ControlRule {
  if (text === '') throw naError('rule is blank: enter a control rule such as 1-3s/2-2s/R-4s');
  return parseRule(text);
}

const WESTGARD_1979 = 'Westgard JO, Groth T. Clin Chem 1979;25:863–9';
const WESTGARD_1981 = 'Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem 1981;27:493–501';

export const RULE = word('rule', readRule, 'Control rule, e.g. "1-3s/2-2s/R-4s"; underscores accepted for "-".');
const N = num('n', 'Controls per run, a whole number 1–100.');
const RUNS = optNum('runs', 1, 'Number of consecutive runs, a whole number ≥ 1; default 1.');

export const QC_DETECT = elementwise({
  name: 'QC.DETECT',
  doc: {
    summary: 'probability that a rule rejects runs carrying a systematic shift',
    description:
      'Probability that a control rule rejects when every run carries a systematic shift of `shift` SD, with n controls per run over `runs` consecutive runs (default 1). Rules: terms joined by "/", e.g. "1-3s", "1-2.5s", "1-3s/2-2s/R-4s", "1-3s/2-2s/R-4s/4-1s/10-x", "2of3-2s"; counting rules read across runs, R-4s within one run. Single rules exactly 1 − [Φ(k−Δ) − Φ(−k−Δ)]^(n·runs); multirules by an exact Markov chain.',
    sources: [`${WESTGARD_1979} (power functions)`, `${WESTGARD_1981} (the multirule)`],
    returns: 'Probability of rejection (0–1).',
    example: { args: ['1-3s/2-2s/R-4s', 2, 2.5] },
  },
  params: [RULE, N, num('shift', 'Systematic shift in SD units, ≥ 0 (e.g. from QC.SHIFT).'), RUNS],
  fn: (rule: ControlRule, n: number, shift: number, runs: number) => detectionProbability(rule, n, shift, runs),
});

export const QC_FALSEREJECT = elementwise({
  name: 'QC.FALSEREJECT',
  doc: {
    summary: 'probability that a rule rejects an in-control run',
    description:
      'Probability that a control rule rejects a run with no error (shift 0), with n controls per run over `runs` consecutive runs (default 1). About 0.045 for 1-2s and 0.003 for 1-3s with one control. Same rule syntax and method as QC.DETECT.',
    sources: [WESTGARD_1979, WESTGARD_1981],
    returns: 'Probability of false rejection (0–1).',
    example: { args: ['1-2s', 1] },
  },
  params: [RULE, N, RUNS],
  fn: (rule: ControlRule, n: number, runs: number) => falseRejectionProbability(rule, n, runs),
});

export const QC_PLAN = labelled({
  name: 'QC.PLAN',
  doc: {
    summary: 'the simplest candidate rule reaching 90 % detection with ≤ 5 % false rejection per run',
    description:
      'The simplest candidate QC procedure that detects the critical shift (allowable − |bias|)/CV − 1.65 with probability ≥ target (default 0.90) and false rejection per run 1 − (1 − P_fr)^(1/runs) ≤ limit (default 0.05). Candidates: 1-3.5s, 1-3s, 1-2.5s with n = 1–4; 1-3s/2-2s/R-4s; /4-1s; /10-x. Lowest n wins, then fewest runs, then lowest false rejection. Percent inputs. QC design is the laboratory\'s decision.',
    sources: [WESTGARD_1979, WESTGARD_1981],
    returns: 'Labels, then the plan\'s values.',
    example: { args: [6.94, 1.2, 1.5], show: ['Rule', 'Controls per run', 'Runs'] },
  },
  params: [
    ALLOWABLE,
    BIAS,
    num('cv', 'Observed analytical CV, %; > 0.'),
    optNum('target', DEFAULT_TARGET, 'Detection wanted at the critical shift, strictly between 0 and 1; default 0.90.'),
    optNum('limit', DEFAULT_FALSE_REJECTION_LIMIT, 'Largest false rejection per run, strictly between 0 and 1; default 0.05.'),
  ],
  labels: ['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met'],
  fn: (allowable: number, bias: number, cv: number, target: number, limit: number) => {
    const plan = planQc(allowable, bias, cv, target, limit);
    return {
      Rule: plan.rule,
      'Controls per run': plan.n,
      Runs: plan.runs,
      Detection: plan.detection,
      'False rejection per run': plan.falseRejectionPerRun,
      'Target met': plan.targetMet,
    };
  },
});

export const QC_FUNCTIONS = [QC_DETECT, QC_FALSEREJECT, QC_PLAN];
