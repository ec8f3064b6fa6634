/**
 * QC.DETECT, QC.FALSEREJECT, QC.PLAN: control-rule design. QC.SHIFT lives with the PERF family
 * (catalogue/perf.ts).
 */
import { detectionProbability, falseRejectionProbability } from '../../engine/qc/power';
import { DEFAULT_FALSE_REJECTION_LIMIT, DEFAULT_TARGET, planQc } from '../../engine/qc/plan';
import { ControlRule, parseRule } from '../../engine/qc/rules';
import { controlFlags } from '../../engine/qc/flags';
import { DEFAULT_MAX_RISK, qcRisk, qcRunSize } from '../../engine/qc/risk';
import type { ControlSeries, Entry, Label } from '../../engine/qc/flags';
import { controlReview } from '../../engine/qc/review';
import { naError, valueError } from '../../engine/errors';
import { aggregate, labelled, elementwise, num, optNum, optRange, range, word } from '../define';
import { ALLOWABLE, BIAS } from '../params';
import { cellsOf } from '../coerce';
import type { Grid, Output, Scalar } from '../types';

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
      'The simplest candidate QC procedure that detects the critical shift (allowable − |bias|)/CV − 1.65 with probability ≥ target (default 0.90) and false rejection per run 1 − (1 − P_fr)^(1/runs) ≤ limit (default 0.05). Candidates: 1-3.5s, 1-3s, 1-2.5s with n = 1–4; 1-3s/2-2s/R-4s; /4-1s; /10-x. Lowest n wins, then fewest runs, then lowest false rejection. Run size is QC.RUNSIZE of the chosen rule and controls (at most 1 expected unreliable final result). Percent inputs. QC design is the laboratory\'s decision.',
    sources: [WESTGARD_1979, WESTGARD_1981],
    returns: 'Labels, then the plan\'s values.',
    example: { args: [6.94, 1.2, 1.5], show: ['Rule', 'Controls per run', 'Run size'] },
  },
  params: [
    ALLOWABLE,
    BIAS,
    num('cv', 'Observed analytical CV, %; > 0.'),
    optNum('target', DEFAULT_TARGET, 'Detection wanted at the critical shift, strictly between 0 and 1; default 0.90.'),
    optNum('limit', DEFAULT_FALSE_REJECTION_LIMIT, 'Largest false rejection per run, strictly between 0 and 1; default 0.05.'),
  ],
  labels: ['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met', 'Run size'],
  fn: (allowable: number, bias: number, cv: number, target: number, limit: number) => {
    const plan = planQc(allowable, bias, cv, target, limit);
    return {
      Rule: plan.rule,
      'Controls per run': plan.n,
      Runs: plan.runs,
      Detection: plan.detection,
      'False rejection per run': plan.falseRejectionPerRun,
      'Target met': plan.targetMet,
      'Run size': plan.runSize,
    };
  },
});

/** A cell of the values, target or sd range as the review reads it: a number, text, or blank. */
function entry(v: Scalar): Entry {
  if (typeof v === 'number') return Number.isFinite(v) ? v : String(v);
  if (v === null || v === undefined || v === '') return null;
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  return v;
}

/** A range that goes with values, cell by cell: the same shape, or one cell for every result. */
function alongside(g: Grid | undefined, values: Grid, name: string): Scalar[] | undefined {
  if (g === undefined) return undefined;
  const n = values.length * (values[0]?.length ?? 0);
  if (g.length === 1 && g[0].length === 1) return new Array<Scalar>(n).fill(g[0][0]);
  if (g.length !== values.length || g.some((row, r) => row.length !== values[r].length)) {
    throw valueError(`${name} does not pair up with values: give a range of the same shape (${values.length}×${values[0]?.length ?? 0}) or one cell`);
  }
  return cellsOf(g);
}

/** The control series of QC.FLAGS and QC.REVIEW from their ranges (row by row); the task pane draws its chart from the same. */
export function series(gv: Grid, gt: Grid, gs: Grid, rule: ControlRule, gr: Grid | undefined, gl: Grid | undefined): ControlSeries {
  return {
    values: cellsOf(gv).map(entry),
    target: (alongside(gt, gv, 'target') as Scalar[]).map(entry),
    sd: (alongside(gs, gv, 'sd') as Scalar[]).map(entry),
    rule,
    runs: alongside(gr, gv, 'runs') as Label[] | undefined,
    levels: alongside(gl, gv, 'levels') as Label[] | undefined,
  };
}

const REVIEW_SOURCE = 'Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem 1981;27:493–501';
const VALUES = range('values', 'The control results in time order (a column or a row); text and blanks are skipped.');
const TARGET = range('target', 'The target (mean) in use: one cell, or one per result (levels and lots differ).');
const SD = range('sd', 'The SD in use, > 0: one cell, or one per result.');
const RUN_LABELS = optRange('runs', 'Each result\'s run label (same shape as values): results with one label form one run; default: every result its own run.');
const LEVEL_LABELS = optRange('levels', 'Each result\'s control material (same shape as values); default: one material.');

export const QC_FLAGS = aggregate({
  name: 'QC.FLAGS',
  doc: {
    summary: 'the control rules each control result completes (a same-shaped range of texts)',
    description:
      'For each control result, z = (value − target)/sd and the terms of the rule that fire at it, in the rule\'s order, joined by "/" (e.g. "2-2s/R-4s"), or "" when none. 1-Ls: |z| > L. R-Ls: the run\'s highest minus lowest z > L, reported on the run\'s last result. Count terms (k-Ls, k-x, 2of3-2s) read consecutive results ending at this one, in this material\'s results in run order and in all results in run order, firing if either does. Runs in the order their labels first appear; a label seen again joins its earlier run. Text and blanks are skipped and enter no sequence. Same rule syntax as QC.PLAN.',
    sources: [REVIEW_SOURCE],
    returns: 'The flags of each result, same shape as values.',
    example: { args: [[[101], [104.5], [104.8], [99], [93.5]], 100, 2, '1-3s/2-2s/R-4s'] },
  },
  params: [VALUES, TARGET, SD, RULE, RUN_LABELS, LEVEL_LABELS],
  fn: (gv: Grid, gt: Grid, gs: Grid, rule: ControlRule, gr: Grid | undefined, gl: Grid | undefined): Output => {
    const flags = controlFlags(series(gv, gt, gs, rule, gr, gl));
    const cols = gv[0]?.length ?? 0;
    return gv.map((row, r) => row.map((_v, c) => flags[r * cols + c]));
  },
});

export const QC_REVIEW = labelled({
  name: 'QC.REVIEW',
  doc: {
    summary: 'a period of control results summarised: runs flagged against the expected false rejection, mean and SD of z',
    description:
      'Results and runs counted; runs flagged = runs with at least one flag (as QC.FLAGS gives them); their share; the expected false rejection per run = the mean over runs of QC.FALSEREJECT(rule, that run\'s number of results); mean z and SD of z (n − 1; above 1 means the method varies more than the SD in use); results beyond 2 SD. Runs and materials as QC.FLAGS reads them.',
    sources: [REVIEW_SOURCE, 'Westgard JO, Groth T. Clin Chem 1979;25:863–9'],
    returns: 'Labelled review figures.',
    notes: [
      'Counting rules that read across runs flag a stable method somewhat more often than the per-run expectation, because every result counts and a streak that goes on is flagged again; compare the two as a guide, not as a test.',
    ],
    example: {
      args: [[[101], [104.5], [104.8], [99], [93.5], [100.2], [98.7], [101.1]], 100, 2, '1-3s/2-2s/R-4s'],
      show: ['Runs flagged', 'Mean z', 'SD of z'],
    },
  },
  params: [VALUES, TARGET, SD, RULE, RUN_LABELS, LEVEL_LABELS],
  labels: ['Results', 'Runs', 'Runs flagged', 'Share of runs flagged', 'Expected false rejection per run', 'Mean z', 'SD of z', 'Results beyond 2 SD'],
  fn: (gv: Grid, gt: Grid, gs: Grid, rule: ControlRule, gr: Grid | undefined, gl: Grid | undefined) => {
    const r = controlReview(series(gv, gt, gs, rule, gr, gl));
    return {
      Results: r.results,
      Runs: r.runs,
      'Runs flagged': r.runsFlagged,
      'Share of runs flagged': r.shareFlagged,
      'Expected false rejection per run': r.expectedFalseRejection,
      'Mean z': r.meanZ,
      'SD of z': r.sdZ,
      'Results beyond 2 SD': r.beyond2Sd,
    };
  },
});

const PARVIN = 'Parvin CA. Clin Chem 2008;54:2049–54';
const C24 = 'CLSI C24, 4th ed. (2016)';
const RISK_METHOD =
  'E(Nuf)(Δ) = ΔP_E(Δ)·M·(S₁/2 + Σ_{k≥2} S_k), P_E(Δ) = Φ(−(A + |b|)/s − Δ) + Φ(−(A − |b|)/s + Δ), S_k = 1 − QC.DETECT(rule, n, Δ, k). The sum over QC events comes from the exact rejection chain with its geometric tail once the chain settles (truncated below 1e-15 of the sum otherwise); the maximum over 0 ≤ Δ ≤ 10 is found on a 0.25 SD grid refined by Brent\'s method to 2e-5 SD, a relative error far below 1e-6 in the value. A method whose critical shift (A − |b|)/s − 1.65 is ≤ 0 already fails without a shift:';
const N_RISK = num('n', 'Controls per QC event, a whole number 1–100.');

export const QC_RISK = elementwise({
  name: 'QC.RISK',
  doc: {
    summary: 'the largest expected number of unreliable final patient results a shift leaves (MaxE(Nuf))',
    description: `The largest expected number of unreliable final patient results over all shifts, with QC events bracketing runs of runsize patient results (Parvin's model; a shift begins at a random point between two events, and results since the last accepted event are corrected when QC rejects). ${RISK_METHOD} QC.RISK then gives #NUM!. Percent inputs; cv > 0.`,
    sources: [PARVIN, C24],
    returns: 'MaxE(Nuf): expected unreliable final results at the worst shift.',
    example: { args: [10, 1, 2, '1-3s/2-2s/R-4s', 2, 100] },
  },
  params: [ALLOWABLE, BIAS, num('cv', 'Observed analytical CV, %; > 0.'), RULE, N_RISK, num('runsize', 'Patient results between QC events, a whole number 1–1,000,000.')],
  fn: (allowable: number, bias: number, cv: number, rule: ControlRule, n: number, runsize: number) => qcRisk(allowable, bias, cv, rule, n, runsize),
});

export const QC_RUNSIZE = elementwise({
  name: 'QC.RUNSIZE',
  doc: {
    summary: 'the most patient results between QC events that keep QC.RISK within maxrisk',
    description: `The largest number of patient results between QC events that keeps QC.RISK ≤ maxrisk (default 1, as CLSI C24 suggests): ⌊maxrisk / max over Δ of (E(Nuf)(Δ)/M)⌋ (E is linear in M), at most 1,000,000; 0 when even one result between events is too many. ${RISK_METHOD} QC.RUNSIZE then gives 0. Percent inputs; cv > 0.`,
    sources: [PARVIN, C24],
    returns: 'Run size: patient results between QC events.',
    example: { args: [10, 1, 2, '1-3s/2-2s/R-4s', 2] },
  },
  params: [
    ALLOWABLE,
    BIAS,
    num('cv', 'Observed analytical CV, %; > 0.'),
    RULE,
    N_RISK,
    optNum('maxrisk', DEFAULT_MAX_RISK, 'Largest acceptable expected number of unreliable final results, > 0; default 1.'),
  ],
  fn: (allowable: number, bias: number, cv: number, rule: ControlRule, n: number, maxrisk: number) => qcRunSize(allowable, bias, cv, rule, n, maxrisk),
});

export const QC_FUNCTIONS = [QC_DETECT, QC_FALSEREJECT, QC_PLAN, QC_FLAGS, QC_REVIEW, QC_RISK, QC_RUNSIZE];
