/**
 * Review view: a period of control results picked from the selection (results, and where the
 * sheet has them the run, the material, the target and the SD), reviewed against a control rule
 * — by default the QC plan of the analyte in use (the assessment chain). Shows the control chart
 * with each flagged result marked, the flags as a list beside it, and the QC.REVIEW figures;
 * "Write flags" puts a live QC.FLAGS column beside the data and the QC.REVIEW figures below it.
 */
import { h, replace, field } from '../dom';
import type { PaneContext, View } from '../view';
import { PaneError, ViewState } from '../view';
import type { VariationRow } from '../../engine/table';
import { assess } from '../../engine/assess';
import { keyOf, displayName } from '../analytes';
import { zOf } from '../state';
import type { PaneState } from '../state';
import { checkChoice, guessChoice, readControls, reviewBlock, reviewControls } from '../study/review';
import type { ReviewChoice } from '../study/review';
import type { StudyGrid } from '../study/columns';
import { provenance, tierSource } from '../study/inputs';
import { renderChart, renderFigures, renderRoles } from './reviewRender';
import { renderConfirm, serialRender, writeAreas } from '../blockWrite';

/** The rule used when the analyte has no plan (no observed bias and CV): the common multirule. */
export const FALLBACK_RULE = '1-3s/2-2s/R-4s';

interface ReviewState {
  readonly grid: StudyGrid | null;
  readonly choice: ReviewChoice | null;
  readonly analyte: string;
  /** The rule was typed (the analyte's plan no longer sets it). */
  readonly ruleTyped: boolean;
  readonly occupied: readonly string[] | null;
}

/** The analyte's QC plan rule and where it came from, or the common multirule and why. */
export function defaultRule(state: PaneState, r: VariationRow | undefined): { rule: string; from: string } {
  if (!r) return { rule: FALLBACK_RULE, from: 'no analyte in use: the common multirule' };
  const q = zOf(state.coverage);
  const tier = state.tierFor(r);
  const o = state.observed.get(keyOf(r));
  const plan = q.ok ? assess({ spec: r, tier, z: q.z, observed: o ? { bias: o.bias, cv: o.cv } : null, plan: true }).plan : null;
  if (plan && plan.ok) {
    return { rule: plan.value.rule, from: `the QC plan of ${displayName(r)} at the ${tier} tier (${tierSource(state, r)}), n = ${plan.value.n}${plan.value.targetMet ? '' : ', target not met'}` };
  }
  const why = !q.ok ? 'the coverage in Fill is not valid' : plan && !plan.ok ? (plan.absent ? plan.why : plan.message) : 'no plan';
  return { rule: FALLBACK_RULE, from: `the common multirule (no QC plan for ${displayName(r)}: ${why})` };
}

function analyteRow(ctx: PaneContext, key: string): VariationRow | undefined {
  return ctx.state.rows().find((r) => keyOf(r) === key) ?? ctx.state.selectedRows()[0] ?? ctx.state.rows()[0];
}

async function readSelection(ctx: PaneContext, local: ViewState<ReviewState>): Promise<string> {
  const sel = await ctx.host.readSelection();
  let grid: StudyGrid;
  try {
    grid = readControls(sel);
  } catch (e) {
    throw new PaneError(`Nothing read from ${sel.address}: ${e instanceof Error ? e.message : String(e)}`);
  }
  const s = local.get();
  const rule = s.ruleTyped && s.choice ? s.choice.rule : defaultRule(ctx.state, analyteRow(ctx, s.analyte)).rule;
  local.set({ grid, choice: guessChoice(grid, rule), occupied: null });
  return `Read ${sel.address}: ${grid.bottom - grid.top + 1} rows, ${grid.columns.length} column${grid.columns.length === 1 ? '' : 's'}${grid.headerRow === null ? '' : ' under a header'}.`;
}

async function writeFlags(ctx: PaneContext, local: ViewState<ReviewState>, overwrite: boolean): Promise<string> {
  const { grid, choice, analyte } = local.get();
  if (!grid || !choice) throw new PaneError('Read the control results first.');
  checkChoice(grid, choice);
  const from = local.get().ruleTyped ? 'typed' : defaultRule(ctx.state, analyteRow(ctx, analyte)).from;
  const col = (i: number | null): string => (i === null ? 'none' : grid.columns[i].name);
  const setting = (s: ReviewChoice['target']): string => (s.kind === 'number' ? String(s.value) : `column ${col(s.index)}`);
  const p = provenance('Leeway — review of control results', Boolean(ctx.state.table?.demo), `${grid.address}: results ${col(choice.values)}, run ${col(choice.runs)}, material ${col(choice.levels)}`, [
    ['Rule', `${choice.rule} (${from})`],
    ['Target and SD', `${setting(choice.target)}; ${setting(choice.sd)}`],
  ], new Date());
  const out = await writeAreas(ctx.host, grid.sheet, reviewBlock(grid, choice, p), overwrite, (occupied) => local.set({ occupied }));
  return `Wrote the flags (live QC.FLAGS) and the review to ${grid.sheet}!${out.addresses.join(' and ')}${out.overwritten.length ? ` (replaced ${out.overwritten.length} cells)` : ''}.`;
}

/** The chart, the flag list and the figures, or what is missing. */
function results(s: ReviewState, width: number): HTMLElement[] {
  if (!s.grid || !s.choice) return [h('p', { class: 'hint' }, 'Select the control results — a column of results and, beside it, the run, the control material, the target and the SD where you have them — and read them.')];
  try {
    checkChoice(s.grid, s.choice);
  } catch (e) {
    return [h('p', { class: 'warning', id: 'review-missing' }, e instanceof Error ? e.message : String(e))];
  }
  const out = reviewControls(s.grid, s.choice);
  if ('error' in out) return [h('p', { class: 'error', role: 'alert', id: 'review-error' }, out.error)];
  return [...renderChart(out, width), h('h3', {}, 'Review (QC.REVIEW)'), renderFigures(out.figures)];
}

function ruleField(ctx: PaneContext, local: ViewState<ReviewState>): HTMLElement[] {
  const s = local.get();
  const r = analyteRow(ctx, s.analyte);
  const d = defaultRule(ctx.state, r);
  const rule = s.ruleTyped && s.choice ? s.choice.rule : d.rule;
  const input = h('input', { type: 'text', id: 'review-rule', autocomplete: 'off', spellcheck: 'false', value: rule });
  input.addEventListener('change', () => {
    const c = local.get().choice;
    const typed = input.value.trim() !== '';
    const next = typed ? input.value.trim() : d.rule;
    local.set({ ruleTyped: typed, choice: c ? { ...c, rule: next } : c });
  });
  const select = h('select', { id: 'review-analyte' });
  for (const row of ctx.state.rows()) select.appendChild(h('option', { value: keyOf(row), selected: r !== undefined && keyOf(row) === keyOf(r) }, displayName(row)));
  select.addEventListener('change', () => {
    const c = local.get().choice;
    const next = defaultRule(ctx.state, analyteRow(ctx, select.value)).rule;
    local.set({ analyte: select.value, choice: c && !local.get().ruleTyped ? { ...c, rule: next } : c });
  });
  const note = s.ruleTyped ? 'Typed. Clear the field to go back to the analyte’s plan.' : `From ${d.from}.`;
  return [field('Analyte in use', select), field('Control rule', input, note)];
}

export function reviewView(ctx: PaneContext): View {
  const local = new ViewState<ReviewState>({ grid: null, choice: null, analyte: '', ruleTyped: false, occupied: null });
  const roles = h('div', { id: 'review-roles' });
  const rule = h('div', { id: 'review-rule-box' });
  const out = h('div', { id: 'review-results', 'aria-live': 'polite' });
  const confirm = h('div', { id: 'review-confirm' });
  const read = h('button', { type: 'button', id: 'review-read' }, 'Read the selection');
  const write = h('button', { type: 'button', class: 'primary', id: 'review-write' }, 'Write flags');
  read.addEventListener('click', () => void ctx.run('Reading the control results…', () => readSelection(ctx, local)));
  write.addEventListener('click', () => void ctx.run('Writing the flags…', () => writeFlags(ctx, local, false)));

  // The forms are rebuilt only when what they show changes, so a control being typed into stays.
  let rolesShown = '';
  let ruleShown = '';
  function render(): void {
    const s = local.get();
    const onChoice = (patch: Partial<ReviewChoice>): void => {
      const c = local.get().choice;
      if (c) local.set({ choice: { ...c, ...patch }, occupied: null });
    };
    const rolesKey = JSON.stringify([s.grid?.address, s.grid?.top, s.choice && { ...s.choice, rule: '' }]);
    if (rolesKey !== rolesShown) {
      rolesShown = rolesKey;
      replace(roles, s.grid && s.choice ? renderRoles({ grid: s.grid, choice: s.choice, onChoice }) : null);
    }
    const d = defaultRule(ctx.state, analyteRow(ctx, s.analyte));
    const ruleKey = JSON.stringify([s.analyte, s.ruleTyped, s.choice?.rule, d, ctx.state.rows().length, ctx.state.tableId]);
    if (ruleKey !== ruleShown) {
      ruleShown = ruleKey;
      replace(rule, ...ruleField(ctx, local));
    }
    replace(out, ...results(s, Math.max(240, Math.min(560, out.clientWidth || 288))));
    replace(confirm, s.occupied ? renderConfirm('review', s.occupied, () => void ctx.run('Writing the flags…', () => writeFlags(ctx, local, true)), () => local.set({ occupied: null })) : null);
  }
  const show = serialRender(render);
  local.on(show);
  const root = h(
    'div',
    { class: 'view review' },
    h('h2', {}, 'Review control results'),
    h('div', { class: 'actions' }, read),
    roles,
    rule,
    out,
    h('div', { class: 'actions' }, write),
    confirm,
  );
  return { root, refresh: show };
}
