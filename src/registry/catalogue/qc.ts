/**
 * QC.DETECT, QC.FALSEREJECT, QC.PLAN: control-rule design (SPEC.md sections 3 and 4).
 * QC.SHIFT lives with the PERF family (catalogue/perf.ts).
 */
import { detectionProbability, falseRejectionProbability } from '../../engine/qc/power';
import { DEFAULT_FALSE_REJECTION_LIMIT, DEFAULT_TARGET, planQc } from '../../engine/qc/plan';
import { ControlRule, parseRule } from '../../engine/qc/rules';
import { naError } from '../../engine/errors';
import { isBlank, singleCell, toNumber } from '../coerce';
import { num, optNum, word } from '../params';
import type { FunctionDef, Grid, Output, ParamDef } from '../types';

/** A blank cell may arrive as "" (types.ts): it is a missing rule (#N/A), not a malformed one. */
function readRule(text: string): ControlRule {
  if (text === '') throw naError('rule is blank: enter a control rule such as 1-3s/2-2s/R-4s');
  return parseRule(text);
}

const RULE: ParamDef<ControlRule> = word('rule', readRule);
const RUNS: ParamDef = optNum('runs', 1);

/** QC.PLAN's labels, in order (SPEC.md section 3). */
export const PLAN_LABELS = ['Rule', 'Controls per run', 'Runs', 'Detection', 'False rejection per run', 'Target met'] as const;

const PLAN_PARAMS: ParamDef[] = [
  num('allowable'),
  num('bias'),
  num('cv'),
  optNum('target', DEFAULT_TARGET),
  optNum('limit', DEFAULT_FALSE_REJECTION_LIMIT),
];

function planNumber(g: Grid | undefined, i: number): number {
  const p = PLAN_PARAMS[i];
  const v = singleCell(g, p, 'QC.PLAN');
  if (p.optional && isBlank(v)) return p.default as number;
  return toNumber(v, p.name);
}

export const QC_FUNCTIONS: FunctionDef[] = [
  {
    kind: 'elementwise',
    name: 'QC.DETECT',
    params: [RULE, num('n'), num('shift'), RUNS],
    fn: (rule: ControlRule, n: number, shift: number, runs: number) => detectionProbability(rule, n, shift, runs),
  },
  {
    kind: 'elementwise',
    name: 'QC.FALSEREJECT',
    params: [RULE, num('n'), RUNS],
    fn: (rule: ControlRule, n: number, runs: number) => falseRejectionProbability(rule, n, runs),
  },
  {
    kind: 'aggregate',
    name: 'QC.PLAN',
    params: PLAN_PARAMS,
    fn: (grids): Output => {
      const [allowable, bias, cv, target, limit] = PLAN_PARAMS.map((_p, i) => planNumber(grids[i], i));
      const plan = planQc(allowable, bias, cv, target, limit);
      return [
        [...PLAN_LABELS],
        [plan.rule, plan.n, plan.runs, plan.detection, plan.falseRejectionPerRun, plan.targetMet],
      ];
    },
  },
];
