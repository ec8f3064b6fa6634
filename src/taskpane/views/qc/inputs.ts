/**
 * The QC view's inputs: an analyte (its tier's allowable total error and its observed bias and
 * CV) or typed figures, and the design targets. Says which tier the allowance is at and where the
 * tier came from.
 */
import { h, replace, field, uid } from '../../dom';
import type { PaneContext, ViewState } from '../../view';
import type { VariationRow } from '../../../engine/table';
import { readDecimal } from '../../../engine/table';
import { allowableTotalError } from '../../../engine/spec';
import { DEFAULT_TARGET, DEFAULT_FALSE_REJECTION_LIMIT } from '../../../engine/qc/plan';
import { keyOf, displayName } from '../../analytes';
import { zOf } from '../../state';
import { fmt, tierLabel } from '../../format';
import type { Figures } from './model';

export interface QcLocal {
  readonly source: 'analyte' | 'typed';
  readonly key: string;
  /** Candidates ticked (ids). */
  readonly shown: readonly string[];
  /** The procedure of the risk chart (a candidate id); '' for the plan's. */
  readonly riskOf: string;
  /** The run size the lab uses today, as typed. */
  readonly labRunSize: string;
}

export interface InputsPart {
  readonly root: HTMLElement;
  render(): void;
  figures(): Figures;
}

function rowsInScope(ctx: PaneContext): VariationRow[] {
  const picked = ctx.state.selectedRows();
  return picked.length ? picked : [...ctx.state.rows()];
}

/** The analyte's allowance at full precision, and the note saying where each figure came from. */
function fromAnalyte(ctx: PaneContext, r: VariationRow): { allowable: number | null; note: string } {
  const { state } = ctx;
  const q = zOf(state.coverage);
  const tier = state.tierFor(r);
  let allowable: number | null = null;
  if (r.cvg !== null && q.ok) {
    try {
      allowable = allowableTotalError(r.cvi, r.cvg, tier, q.z);
    } catch {
      allowable = null;
    }
  }
  const o = state.observed.get(keyOf(r));
  const note =
    `${displayName(r)}: allowable total error at the ${tier} tier${q.ok ? ` (z ${fmt(q.z, 3)})` : ''}` +
    (r.cvg === null ? ' — not known (no CVG): type an allowance' : '') +
    (o ? `; observed bias and CV ${o.from === 'typed' ? 'typed in What-if' : `from ${o.from}`}.` : '; type the observed bias and CV (or enter them in What-if).');
  return { allowable, note };
}

export function inputsPart(ctx: PaneContext, local: ViewState<QcLocal>, changed: () => void): InputsPart {
  const num = (id: string, value = ''): HTMLInputElement => h('input', { type: 'text', inputmode: 'decimal', id, autocomplete: 'off', value });
  const analyteSelect = h('select', { id: 'qc-analyte' });
  const [allowInput, biasInput, cvInput] = [num('qc-allowable'), num('qc-bias'), num('qc-cv')];
  const targetInput = num('qc-target', String(DEFAULT_TARGET));
  const limitInput = num('qc-limit', String(DEFAULT_FALSE_REJECTION_LIMIT));
  const fromNote = h('p', { class: 'hint', id: 'qc-from' });
  const tierNote = h('p', { class: 'hint tier-origin', id: 'qc-tier-origin' });
  let analyteAllowable: number | null = null;

  function fill(): void {
    const r = ctx.state.rows().find((x) => keyOf(x) === local.get().key);
    if (!r) return;
    const got = fromAnalyte(ctx, r);
    analyteAllowable = got.allowable;
    allowInput.value = got.allowable === null ? '' : fmt(got.allowable);
    const o = ctx.state.observed.get(local.get().key);
    biasInput.value = o ? String(o.bias) : '';
    cvInput.value = o ? String(o.cv) : '';
    fromNote.textContent = got.note;
    tierNote.textContent = `Tier ${tierLabel(ctx.state.tierFor(r))}, from ${ctx.state.tierOriginOf(r)}.`;
    tierNote.hidden = false;
  }

  analyteSelect.addEventListener('change', () => {
    local.set({ key: analyteSelect.value, source: 'analyte' });
    fill();
    changed();
  });
  for (const inp of [allowInput, biasInput, cvInput]) {
    inp.addEventListener('input', () => {
      local.set({ source: 'typed' });
      analyteAllowable = null;
      fromNote.textContent = 'Typed figures (percent).';
      tierNote.hidden = true;
      changed();
    });
  }
  for (const inp of [targetInput, limitInput]) inp.addEventListener('input', changed);

  function render(): void {
    const rows = rowsInScope(ctx);
    replace(analyteSelect, ...rows.map((r) => h('option', { value: keyOf(r) }, displayName(r))));
    if (!rows.some((r) => keyOf(r) === local.get().key)) local.set({ key: rows[0] ? keyOf(rows[0]) : '' });
    analyteSelect.value = local.get().key;
    if (local.get().source === 'analyte') fill();
  }

  function figures(): Figures {
    const allowable = local.get().source === 'analyte' && analyteAllowable !== null ? analyteAllowable : readDecimal(allowInput.value);
    return { allowable, bias: readDecimal(biasInput.value), cv: readDecimal(cvInput.value), target: readDecimal(targetInput.value), limit: readDecimal(limitInput.value) };
  }

  const design = h('details', { class: 'design', id: uid('qc-design') }, h('summary', {}, 'Design targets'), h('div', { class: 'pair' }, field('Detection at least', targetInput), field('False rejection per run at most', limitInput)));
  const observed = h('fieldset', { class: 'observed' }, h('legend', {}, 'Figures, %'), h('div', { class: 'triple' }, field('Allowable', allowInput), field('Bias', biasInput), field('CV', cvInput)), fromNote, tierNote);
  const root = h('div', { class: 'qc-inputs' }, h('h2', {}, 'Which rules and how many controls?'), field('Analyte', analyteSelect), observed, design);
  return { root, render, figures };
}
