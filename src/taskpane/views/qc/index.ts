/**
 * QC view: the QC.PLAN choice for one analyte (or typed figures) with its detection, false
 * rejection per run and run size; the power curves of candidate procedures against the
 * systematic shift (the critical shift marked, each candidate's run size in the legend); and the
 * risk of unreliable final results against the shift for one procedure at the run size the lab
 * uses (typed) or the plan's, its maximum (QC.RISK) marked and compared with 1.
 */
import { h, replace, field, uid } from '../../dom';
import type { PaneContext, View } from '../../view';
import { ViewState } from '../../view';
import { QC_CANDIDATES } from '../../../engine/qc/plan';
import { tierChangeNote, followTierCell } from '../../tierNote';
import { candidateId, candidateLabel, DEFAULT_SHOWN, MAX_CURVES, candidatesShown, planOf, readRunSize, riskOf } from './model';
import type { PlanOutcome } from './model';
import { inputsPart } from './inputs';
import type { QcLocal } from './inputs';
import { renderCurves, renderPlan, renderRisk } from './render';

export { axisMax } from './model';

function pickList(local: ViewState<QcLocal>, planId: string | null, onLimit: () => void): HTMLElement {
  const list = h('div', { class: 'checks' });
  for (const c of QC_CANDIDATES) {
    const id = candidateId(c);
    const box = h('input', { type: 'checkbox', id: uid('cand'), value: id });
    box.checked = local.get().shown.includes(id) || id === planId;
    box.disabled = id === planId;
    box.addEventListener('change', () => {
      const shown = local.get().shown;
      if (box.checked && shown.length >= MAX_CURVES) {
        box.checked = false;
        onLimit();
        return;
      }
      local.set({ shown: box.checked ? [...shown, id] : shown.filter((x) => x !== id) });
    });
    list.appendChild(h('label', { class: 'check', for: box.id }, box, candidateLabel(c)));
  }
  return list;
}

function riskControls(local: ViewState<QcLocal>): { root: HTMLElement; sync(p: PlanOutcome): void } {
  const runInput = h('input', { type: 'text', inputmode: 'numeric', id: 'qc-runsize', autocomplete: 'off' });
  const procSelect = h('select', { id: 'qc-risk-rule' });
  runInput.addEventListener('input', () => local.set({ labRunSize: runInput.value }));
  procSelect.addEventListener('change', () => local.set({ riskOf: procSelect.value }));
  const root = h('div', { class: 'pair risk-inputs' }, field('Run size you use today', runInput, 'Patient results between QC events; empty for the plan’s.'), field('Procedure', procSelect));
  function sync(p: PlanOutcome): void {
    if (p.kind !== 'plan') return;
    const options = candidatesShown(local.get().shown, p.plan);
    replace(procSelect, h('option', { value: '' }, `the plan (${candidateLabel(p.plan)})`), ...options.filter((c) => candidateId(c) !== candidateId(p.plan)).map((c) => h('option', { value: candidateId(c) }, candidateLabel(c))));
    procSelect.value = options.some((c) => candidateId(c) === local.get().riskOf) ? local.get().riskOf : '';
  }
  return { root, sync };
}

function riskSection(p: PlanOutcome, local: Readonly<QcLocal>): Node[] {
  if (p.kind !== 'plan') return [];
  const proc = QC_CANDIDATES.find((c) => candidateId(c) === local.riskOf) ?? p.plan;
  const typed = readRunSize(local.labRunSize);
  if (typed && !typed.ok) return [h('p', { class: 'error', id: 'qc-risk-verdict' }, `Run size: ${typed.why}.`)];
  const m = typed ? typed.value : p.plan.runSize;
  if (m === 0) return [h('p', { class: 'warning', id: 'qc-risk-verdict' }, 'The plan has no run size that keeps the risk at 1 or below: type the run size you use to see its risk.')];
  return renderRisk(riskOf(p, proc, m), candidateLabel(proc), typed !== null);
}

export function qcView(ctx: PaneContext): View {
  const local = new ViewState<QcLocal>({ source: 'analyte', key: '', shown: DEFAULT_SHOWN, riskOf: '', labRunSize: '' });
  const notice = h('div', { class: 'notices', id: 'qc-notices' });
  const planBox = h('div', { class: 'plan', id: 'qc-plan', 'aria-live': 'polite' });
  const chartBox = h('div', { class: 'curves', id: 'qc-curves' });
  const pickBox = h('details', { class: 'curve-pick' }, h('summary', {}, 'Curves shown'));
  const riskOut = h('div', { class: 'risk-out', id: 'qc-risk-out', 'aria-live': 'polite' });
  const controls = riskControls(local);
  const inputs = inputsPart(ctx, local, () => update());
  const riskBox = h('section', { class: 'risk', id: 'qc-risk', 'aria-labelledby': 'qc-risk-h' }, h('h3', { id: 'qc-risk-h' }, 'Risk at a run size'), controls.root, riskOut);

  function update(): void {
    const p = planOf(inputs.figures());
    replace(notice, tierChangeNote(ctx.state, 'qc-tier-change'));
    replace(planBox, ...(p.kind === 'plan' ? renderPlan(p.plan) : [h('p', p.kind === 'error' ? { class: 'error', role: 'alert' } : { class: 'hint' }, p.kind === 'error' ? p.message : 'Give the allowable total error, the observed bias and the observed CV (percent) to see a plan.')]));
    replace(chartBox, ...(p.kind === 'plan' ? renderCurves(p.plan, local.get().shown, p.target, p) : []));
    const list = pickList(local, p.kind === 'plan' ? candidateId(p.plan) : null, () => ctx.status(`At most ${MAX_CURVES} curves at once: untick one first.`, 'info'));
    replace(pickBox, pickBox.querySelector('summary') as HTMLElement, list);
    controls.sync(p);
    riskBox.hidden = p.kind !== 'plan';
    replace(riskOut, ...riskSection(p, local.get()));
  }

  let focusAfter: string | null = null;
  local.on(() => {
    const active = document.activeElement;
    focusAfter = active instanceof HTMLInputElement && active.type === 'checkbox' ? active.value : null;
    update();
    if (focusAfter) pickBox.querySelector<HTMLInputElement>(`input[value="${CSS.escape(focusAfter)}"]`)?.focus();
  });
  ctx.state.on((t) => {
    if (t === 'tiers' && root.isConnected && root.closest('[hidden]') === null) {
      inputs.render();
      update();
    }
  });

  const root = h('div', { class: 'view qc' }, notice, inputs.root, planBox, chartBox, pickBox, riskBox);
  return {
    root,
    refresh() {
      inputs.render();
      update();
      void followTierCell(ctx);
    },
  };
}
