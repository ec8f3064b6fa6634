/**
 * QC view: the QC.PLAN choice for one analyte (or typed figures) with its detection and false
 * rejection per run, and the power curves of candidate procedures against the systematic shift
 * (the QC engine's powerCurve), the critical shift marked. Curves are cached per procedure and
 * axis, so switching analytes redraws within a frame once they are known.
 */
import { h, replace, field, uid } from '../dom';
import type { PaneContext, View } from '../view';
import { readDecimal } from '../../engine/table';
import type { VariationRow } from '../../engine/table';
import { planQc, QC_CANDIDATES, DEFAULT_TARGET, DEFAULT_FALSE_REJECTION_LIMIT, PLAN_Z } from '../../engine/qc/plan';
import type { QcCandidate, QcPlan } from '../../engine/qc/plan';
import { powerCurve, shiftAxis } from '../../engine/qc/power';
import { isLeewayError } from '../../engine/errors';
import { allowableTotalError } from '../../engine/spec';
import { curveChart } from '../charts';
import type { CurveSeries } from '../charts';
import { keyOf, displayName } from '../analytes';
import { zOf } from '../state';
import { fmt } from '../format';

export const candidateId = (c: QcCandidate): string => `${c.rule}|${c.n}|${c.runs}`;
export const candidateLabel = (c: QcCandidate): string => `${c.rule}, n=${c.n}${c.runs > 1 ? `, ${c.runs} runs` : ''}`;

/** Shown before the user picks: one of each kind of rule, at n = 2 where it exists. */
const DEFAULT_SHOWN = ['1-3s|2|1', '1-2.5s|2|1', '1-3s/2-2s/R-4s|2|1', '1-3s/2-2s/R-4s/4-1s|4|1'];

const MAX_CURVES = 6;
const STEP = 0.1;

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

type Source = 'analyte' | 'typed';

export function qcView(ctx: PaneContext): View {
  const { state } = ctx;
  const root = h('div', { class: 'view qc' });
  const inputs = h('div', { class: 'qc-inputs' });
  const planBox = h('div', { class: 'plan', id: 'qc-plan', 'aria-live': 'polite' });
  const chartBox = h('div', { class: 'curves', id: 'qc-curves' });
  const pickBox = h('details', { class: 'curve-pick' });

  let source: Source = 'analyte';
  /** The analyte's allowance at full precision (the field shows it rounded). */
  let analyteAllowable: number | null = null;
  let currentKey = '';
  const shown = new Set<string>(DEFAULT_SHOWN);

  const analyteSelect = h('select', { id: 'qc-analyte' });
  const allowInput = h('input', { type: 'text', inputmode: 'decimal', id: 'qc-allowable', autocomplete: 'off' });
  const biasInput = h('input', { type: 'text', inputmode: 'decimal', id: 'qc-bias', autocomplete: 'off' });
  const cvInput = h('input', { type: 'text', inputmode: 'decimal', id: 'qc-cv', autocomplete: 'off' });
  const targetInput = h('input', { type: 'text', inputmode: 'decimal', id: 'qc-target', value: String(DEFAULT_TARGET) });
  const limitInput = h('input', { type: 'text', inputmode: 'decimal', id: 'qc-limit', value: String(DEFAULT_FALSE_REJECTION_LIMIT) });
  const fromNote = h('p', { class: 'hint', id: 'qc-from' });

  function rowsInScope(): VariationRow[] {
    const picked = state.selectedRows();
    return picked.length ? picked : [...state.rows()];
  }

  /** Fills the three figures from the analyte: its tier's total allowance and its observed bias/CV. */
  function fromAnalyte(): void {
    const r = state.rows().find((x) => keyOf(x) === currentKey);
    if (!r) return;
    const q = zOf(state.coverage);
    const tier = state.tierFor(r);
    analyteAllowable = null;
    if (r.cvg !== null && q.ok) {
      try {
        analyteAllowable = allowableTotalError(r.cvi, r.cvg, tier, q.z);
      } catch {
        analyteAllowable = null;
      }
    }
    allowInput.value = analyteAllowable === null ? '' : fmt(analyteAllowable);
    const o = state.observed.get(currentKey);
    biasInput.value = o ? String(o.bias) : '';
    cvInput.value = o ? String(o.cv) : '';
    fromNote.textContent =
      `${displayName(r)}: allowable total error at the ${tier} tier${q.ok ? ` (z ${fmt(q.z, 3)})` : ''}` +
      (r.cvg === null ? ' — not known (no CVG): type an allowance' : '') +
      (o ? `; observed bias and CV ${o.from === 'typed' ? 'typed in What-if' : `from ${o.from}`}.` : '; type the observed bias and CV (or enter them in What-if).');
  }

  function renderInputs(): void {
    replace(analyteSelect);
    for (const r of rowsInScope()) analyteSelect.appendChild(h('option', { value: keyOf(r) }, displayName(r)));
    if (!rowsInScope().some((r) => keyOf(r) === currentKey)) currentKey = rowsInScope()[0] ? keyOf(rowsInScope()[0]) : '';
    analyteSelect.value = currentKey;
    if (source === 'analyte') fromAnalyte();
  }

  analyteSelect.addEventListener('change', () => {
    currentKey = analyteSelect.value;
    source = 'analyte';
    fromAnalyte();
    update();
  });
  for (const inp of [allowInput, biasInput, cvInput]) {
    inp.addEventListener('input', () => {
      source = 'typed';
      analyteAllowable = null;
      fromNote.textContent = 'Typed figures (percent).';
      update();
    });
  }
  for (const inp of [targetInput, limitInput]) inp.addEventListener('input', () => update());

  const targetId = uid('qc-design');
  replace(
    inputs,
    h('h2', {}, 'Which rules and how many controls?'),
    field('Analyte', analyteSelect),
    h('fieldset', { class: 'observed' }, h('legend', {}, 'Figures, %'), h('div', { class: 'triple' }, field('Allowable', allowInput), field('Bias', biasInput), field('CV', cvInput)), fromNote),
    h(
      'details',
      { class: 'design', id: targetId },
      h('summary', {}, 'Design targets'),
      h('div', { class: 'pair' }, field('Detection at least', targetInput), field('False rejection per run at most', limitInput)),
    ),
  );

  function num(inp: HTMLInputElement): number | undefined {
    return readDecimal(inp.value);
  }

  function update(): void {
    const t0 = performance.now();
    const allowable = source === 'analyte' && analyteAllowable !== null ? analyteAllowable : num(allowInput);
    const bias = num(biasInput);
    const cv = num(cvInput);
    const target = num(targetInput);
    const limit = num(limitInput);
    if (allowable === undefined || bias === undefined || cv === undefined) {
      replace(planBox, h('p', { class: 'hint' }, 'Give the allowable total error, the observed bias and the observed CV (percent) to see a plan.'));
      replace(chartBox);
      renderPick(null);
      return;
    }
    let plan: QcPlan;
    try {
      plan = planQc(allowable, bias, cv, target ?? DEFAULT_TARGET, limit ?? DEFAULT_FALSE_REJECTION_LIMIT);
    } catch (e) {
      replace(planBox, h('p', { class: 'error', role: 'alert' }, isLeewayError(e) ? `${e.code} ${e.message}` : String(e)));
      replace(chartBox);
      return;
    }
    const planId = `${plan.rule}|${plan.n}|${plan.runs}`;
    replace(
      planBox,
      h('h3', {}, 'Plan (QC.PLAN)'),
      h(
        'dl',
        { class: 'facts plan-facts', 'data-rule': plan.rule, 'data-n': String(plan.n), 'data-runs': String(plan.runs), 'data-detection': String(plan.detection), 'data-false-rejection': String(plan.falseRejectionPerRun), 'data-target-met': String(plan.targetMet), 'data-critical-shift': String(plan.criticalShift) },
        h('dt', {}, 'Critical shift'),
        h('dd', {}, `${fmt(plan.criticalShift)} SD (sigma ${fmt(plan.criticalShift + PLAN_Z)} − ${PLAN_Z})`),
        h('dt', {}, 'Rule'),
        h('dd', { class: 'rule' }, plan.rule),
        h('dt', {}, 'Controls per run'),
        h('dd', {}, String(plan.n)),
        h('dt', {}, 'Runs'),
        h('dd', {}, String(plan.runs)),
        h('dt', {}, 'Detection'),
        h('dd', {}, fmt(plan.detection, 3)),
        h('dt', {}, 'False rejection per run'),
        h('dd', {}, fmt(plan.falseRejectionPerRun, 3)),
        h('dt', {}, 'Target met'),
        h('dd', { class: plan.targetMet ? 'yes' : 'no' }, plan.targetMet ? 'yes' : 'no'),
      ),
      plan.targetMet
        ? null
        : h('p', { class: 'warning' }, plan.criticalShift <= 0 ? 'The method already exceeds its allowance with no shift: no control rule can make up for that. Improve the method or revisit the specification.' : 'No candidate reaches the detection target within the false-rejection limit; shown is the one that detects best. With sigma below about 3 no rule design can.'),
    );
    const xMax = axisMax(plan.criticalShift);
    const candidates = QC_CANDIDATES.filter((c) => shown.has(candidateId(c)) || candidateId(c) === planId);
    // The plan always gets the first style (solid, the accent colour); the others follow.
    let slot = 1;
    const series: CurveSeries[] = candidates.map((c) => {
      const { xs, ys } = curveOf(c, xMax);
      const isPlan = candidateId(c) === planId;
      return { label: candidateLabel(c), xs, ys, style: isPlan ? 0 : slot++, emphasis: isPlan, data: { rule: c.rule, n: String(c.n), runs: String(c.runs) } };
    });
    const legend = h('ul', { class: 'legend' });
    series.forEach((sr) => legend.appendChild(h('li', {}, h('span', { class: `swatch s${sr.style % 6}${sr.emphasis ? ' emphasis' : ''}`, 'aria-hidden': 'true' }), sr.label + (sr.emphasis ? ' (plan)' : ''))));
    legend.appendChild(h('li', { class: 'marks' }, h('span', { class: 'swatch mark-critical', 'aria-hidden': 'true' }), `critical shift ${fmt(plan.criticalShift)} SD`));
    legend.appendChild(h('li', { class: 'marks' }, h('span', { class: 'swatch mark-target', 'aria-hidden': 'true' }), `detection target ${fmt(target ?? DEFAULT_TARGET)}`));
    replace(
      chartBox,
      h('h3', {}, 'Power curves'),
      curveChart(series, {
        title: 'Probability of rejection against the systematic shift',
        xMax,
        xLabel: 'shift, SD',
        yLabel: 'P(reject)',
        xMark: plan.criticalShift > 0 ? { value: plan.criticalShift, label: `critical ${fmt(plan.criticalShift)}` } : undefined,
        yMark: { value: target ?? DEFAULT_TARGET, label: 'target' },
      }),
      legend,
    );
    renderPick(planId);
    chartBox.dataset.drawMs = (performance.now() - t0).toFixed(1);
  }

  function renderPick(planId: string | null): void {
    const list = h('div', { class: 'checks' });
    for (const c of QC_CANDIDATES) {
      const id = candidateId(c);
      const box = h('input', { type: 'checkbox', id: uid('cand'), value: id });
      box.checked = shown.has(id) || id === planId;
      box.disabled = id === planId;
      box.addEventListener('change', () => {
        if (box.checked) {
          if (shown.size >= MAX_CURVES) {
            box.checked = false;
            ctx.status(`At most ${MAX_CURVES} curves at once: untick one first.`, 'info');
            return;
          }
          shown.add(id);
        } else shown.delete(id);
        update();
        (pickBox.querySelector(`input[value="${CSS.escape(id)}"]`) as HTMLInputElement | null)?.focus();
      });
      list.appendChild(h('label', { class: 'check', for: box.id }, box, candidateLabel(c)));
    }
    const wasOpen = pickBox.open;
    replace(pickBox, h('summary', {}, 'Curves shown'), list);
    pickBox.open = wasOpen;
  }

  root.append(inputs, planBox, chartBox, pickBox);
  return {
    root,
    refresh() {
      renderInputs();
      update();
    },
  };
}

