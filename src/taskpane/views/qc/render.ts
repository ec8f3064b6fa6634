/**
 * Pure renders of the QC view: the plan (QC.PLAN with its run size), the power curves of the
 * candidates shown with the run size of each, and the risk chart of one procedure at a run size.
 */
import { h, svgFromString } from '../../dom';
import { fmt } from '../../format';
import { curveChart } from '../../charts';
import type { CurveSeries } from '../../charts';
import type { QcPlan } from '../../../engine/qc/plan';
import { PLAN_Z } from '../../../engine/qc/plan';
import { riskChartSvg, showRisk } from '../../../charts/riskChart';
import { axisMax, candidateId, candidateLabel, candidatesShown, curveOf, runSizeOf } from './model';
import type { RiskOutcome } from './model';

type Figures3 = { allowable: number; bias: number; cv: number };

/** A run size in words: "120 results", or why there is none. */
export function runSizeText(m: number | string): string {
  if (typeof m === 'string') return `not known (${m})`;
  if (m === 0) return '0: no run size keeps the risk at 1 or below';
  return `${m.toLocaleString('en-US')} result${m === 1 ? '' : 's'}`;
}

function planWarning(plan: QcPlan): HTMLElement | null {
  if (plan.targetMet) return null;
  return h(
    'p',
    { class: 'warning' },
    plan.criticalShift <= 0
      ? 'The method already exceeds its allowance with no shift: no control rule can make up for that. Improve the method or revisit the specification.'
      : 'No candidate reaches the detection target within the false-rejection limit; shown is the one that detects best. With sigma below about 3 no rule design can.',
  );
}

export function renderPlan(plan: QcPlan): Node[] {
  const data = { 'data-rule': plan.rule, 'data-n': String(plan.n), 'data-runs': String(plan.runs), 'data-detection': String(plan.detection), 'data-false-rejection': String(plan.falseRejectionPerRun), 'data-target-met': String(plan.targetMet), 'data-critical-shift': String(plan.criticalShift), 'data-run-size': String(plan.runSize) };
  const facts: Array<[string, string, string?]> = [
    ['Critical shift', `${fmt(plan.criticalShift)} SD (sigma ${fmt(plan.criticalShift + PLAN_Z)} − ${PLAN_Z})`],
    ['Rule', plan.rule, 'rule'],
    ['Controls per run', String(plan.n)],
    ['Runs', String(plan.runs)],
    ['Detection', fmt(plan.detection, 3)],
    ['False rejection per run', fmt(plan.falseRejectionPerRun, 3)],
    ['Run size (QC.RUNSIZE)', runSizeText(plan.runSize), 'run-size'],
    ['Target met', plan.targetMet ? 'yes' : 'no', plan.targetMet ? 'yes' : 'no'],
  ];
  const dl = h('dl', { class: 'facts plan-facts', ...data }, ...facts.flatMap(([t, d, cls]) => [h('dt', {}, t), h('dd', cls ? { class: cls } : {}, d)]));
  const out: Node[] = [h('h3', {}, 'Plan (QC.PLAN)'), dl, h('p', { class: 'hint' }, 'Run size: patient results between QC events that keep the expected unreliable final results at 1 or below (QC.RUNSIZE).')];
  const warn = planWarning(plan);
  if (warn) out.push(warn);
  return out;
}

export function renderCurves(plan: QcPlan, shown: readonly string[], target: number, fig: Figures3): Node[] {
  const xMax = axisMax(plan.criticalShift);
  const planId = candidateId(plan);
  let slot = 1;
  const series: CurveSeries[] = candidatesShown(shown, plan).map((c) => {
    const { xs, ys } = curveOf(c, xMax);
    const isPlan = candidateId(c) === planId;
    return { label: candidateLabel(c), xs, ys, style: isPlan ? 0 : slot++, emphasis: isPlan, data: { rule: c.rule, n: String(c.n), runs: String(c.runs) } };
  });
  const runSizes = candidatesShown(shown, plan).map((c) => (candidateId(c) === planId ? plan.runSize : runSizeOf(fig, c)));
  const legend = h('ul', { class: 'legend', id: 'qc-legend' });
  series.forEach((sr, i) => {
    const m = runSizes[i];
    legend.appendChild(
      h('li', { 'data-run-size': String(m) }, h('span', { class: `swatch s${sr.style % 6}${sr.emphasis ? ' emphasis' : ''}`, 'aria-hidden': 'true' }), h('span', { class: 'legend-text' }, sr.label + (sr.emphasis ? ' (plan)' : ''), h('span', { class: 'run-size' }, ` · run size ${typeof m === 'number' ? m.toLocaleString('en-US') : '—'}`))),
    );
  });
  legend.appendChild(h('li', { class: 'marks' }, h('span', { class: 'swatch mark-critical', 'aria-hidden': 'true' }), `critical shift ${fmt(plan.criticalShift)} SD`));
  legend.appendChild(h('li', { class: 'marks' }, h('span', { class: 'swatch mark-target', 'aria-hidden': 'true' }), `detection target ${fmt(target)}`));
  const chart = curveChart(series, {
    title: 'Probability of rejection against the systematic shift',
    xMax,
    xLabel: 'shift, SD',
    yLabel: 'P(reject)',
    xMark: plan.criticalShift > 0 ? { value: plan.criticalShift, label: `critical ${fmt(plan.criticalShift)}` } : undefined,
    yMark: { value: target, label: 'target' },
  });
  return [h('h3', {}, 'Power curves'), chart, legend];
}

/** The risk chart and its verdict, or why there is none. */
export function renderRisk(risk: RiskOutcome, procedure: string, typed: boolean): Node[] {
  if (!risk.ok) return [h('p', { class: 'error', id: 'qc-risk-verdict' }, `No risk curve: ${risk.why}`)];
  const c = risk.curve;
  const input = { title: 'Risk of unreliable results', procedure, runSize: risk.runSize, points: c.points, maxRisk: c.maxRisk, argmax: c.argmax, width: 288, id: 'qc-risk' };
  const who = typed ? 'At your run size' : 'At the plan’s run size';
  const verdict = h(
    'p',
    { class: risk.exceeds ? 'warning' : 'ok', id: 'qc-risk-verdict', 'data-max-risk': String(c.maxRisk), 'data-exceeds': String(risk.exceeds) },
    `${who} (${risk.runSize.toLocaleString('en-US')}), up to ${showRisk(c.maxRisk)} unreliable final result${c.maxRisk === 1 ? '' : 's'} expected after a shift (QC.RISK): ${risk.exceeds ? 'more than 1 — shorten the run or strengthen the rule' : 'not more than 1'}.`,
  );
  return [verdict, h('div', { class: 'risk-chart-box', id: 'qc-risk-chart' }, svgFromString(riskChartSvg(input)))];
}
