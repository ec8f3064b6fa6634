/**
 * Verification view: a replication study (run labels and one column of results per material)
 * checked against the manufacturer's claims, with trueness against an assigned value and sigma
 * against the specification of the analyte in use; or a comparison of two methods (limits of
 * agreement and their difference plot). Every figure is the worksheet function's (through the
 * registry); "Write to the sheet" puts the same functions beside the data as live formulas.
 */
import { h, replace, field, radioGroup } from '../dom';
import type { PaneContext, View } from '../view';
import { PaneError, ViewState } from '../view';
import type { GridCell } from '../../engine/table';
import type { VariationRow } from '../../engine/table';
import { keyOf, displayName } from '../analytes';
import { readReplication, verificationBlock, verificationFigures } from '../study/verification';
import type { Given, MaterialFigures, MaterialInput, ReplicationStudy, VerificationInput } from '../study/verification';
import { fmt } from '../format';
import { agreementBlock, agreementFigures, plotInput, readComparison } from '../study/agreement';
import type { ComparisonStudy, Scale } from '../study/agreement';
import { observedBias, provenance, readTyped, specFor } from '../study/inputs';
import type { Typed } from '../study/inputs';
import { EMPTY_TEXTS, renderAgreement, renderClaims, renderMaterial, renderPlot } from './verificationRender';
import { renderConfirm, serialRender, writeAreas } from '../blockWrite';
import type { MaterialTexts } from './verificationRender';
import type { BlockArea } from '../host';

type Mode = 'replication' | 'comparison';

interface VerifyState {
  readonly mode: Mode;
  readonly study: ReplicationStudy | null;
  readonly comparison: ComparisonStudy | null;
  readonly texts: readonly MaterialTexts[];
  /** Values of the cells the figures were given as, by "sheet!A1". */
  readonly cells: ReadonlyMap<string, GridCell>;
  readonly analyte: string;
  readonly scale: Scale;
  /** Cells that hold something where the block would go (after a refused write). */
  readonly occupied: readonly string[] | null;
}

const cellKey = (sheet: string, address: string): string => `${sheet}!${address}`;

/** A typed figure as the study takes it: a number, a cell with the value read from it, or nothing. */
function given(t: Typed, sheet: string, cells: ReadonlyMap<string, GridCell>): Given | null {
  if (t.kind === 'number') return { kind: 'number', value: t.value };
  if (t.kind === 'cell') return { kind: 'cell', ref: t.ref, value: cells.get(cellKey(t.sheet ?? sheet, t.address)) ?? null };
  return null;
}

function materialInputs(s: VerifyState, sheet: string): MaterialInput[] {
  return s.texts.map((t) => ({
    claimRepeatability: given(readTyped(t.claimR), sheet, s.cells),
    claimWithinLab: given(readTyped(t.claimWl), sheet, s.cells),
    assigned: given(readTyped(t.assigned), sheet, s.cells),
    uAssigned: given(readTyped(t.uAssigned), sheet, s.cells),
  }));
}

function analyteRow(ctx: PaneContext, key: string): VariationRow | undefined {
  return ctx.state.rows().find((r) => keyOf(r) === key) ?? ctx.state.selectedRows()[0] ?? ctx.state.rows()[0];
}

/** The study's inputs from the view's state and the pane's (analyte, tier, observed bias). */
function inputOf(ctx: PaneContext, s: VerifyState): { v: VerificationInput; specNote: string } | null {
  if (!s.study) return null;
  const r = analyteRow(ctx, s.analyte);
  const spec = r ? specFor(ctx.state, r) : 'No analyte: choose a table (Tables).';
  const v: VerificationInput = {
    study: s.study,
    inputs: materialInputs(s, s.study.grid.sheet),
    spec: typeof spec === 'string' ? null : spec,
    bias: r ? observedBias(ctx.state, r) : null,
  };
  const bias = v.bias ? ` Without an assigned value, sigma uses the bias ${v.bias.value} % ${v.bias.from}.` : ' Without an assigned value (or a bias in What-if) there is no sigma.';
  const n = s.study.materials.length;
  const shared = n > 1 ? ` ${n} materials in one study: α = 0.05 is shared among them (samples = ${n}).` : '';
  const specNote = (typeof spec === 'string' ? spec : `Sigma against the allowable total error of ${spec.from}.${bias}`) + shared;
  return { v, specNote };
}

/** Reads the cells the figures were given as, in one batch. */
async function readGivenCells(ctx: PaneContext, local: ViewState<VerifyState>): Promise<void> {
  const s = local.get();
  if (!s.study) return;
  const sheet = s.study.grid.sheet;
  const cells = s.texts.flatMap((t) => [t.claimR, t.claimWl, t.assigned, t.uAssigned].map(readTyped)).filter((t): t is Extract<Typed, { kind: 'cell' }> => t.kind === 'cell');
  if (!cells.length) return;
  const values = await ctx.host.readRanges(cells.map((c) => ({ sheet: c.sheet ?? sheet, address: c.address })));
  const next = new Map(s.cells);
  cells.forEach((c, i) => next.set(cellKey(c.sheet ?? sheet, c.address), values[i]?.[0]?.[0] ?? null));
  // Unchanged values leave the view as it is (a re-render under a click would swallow it).
  const changed = next.size !== s.cells.size || [...next].some(([k, v]) => s.cells.get(k) !== v);
  if (changed) local.set({ cells: next });
}

/** Reads the selection as the chosen kind of study. */
async function readSelection(ctx: PaneContext, local: ViewState<VerifyState>): Promise<string> {
  const grid = await ctx.host.readSelection();
  const mode = local.get().mode;
  try {
    if (mode === 'comparison') {
      const comparison = readComparison(grid);
      local.set({ comparison, occupied: null });
      return `Read ${grid.address}: ${comparison.x.name} (x) and ${comparison.y.name} (y).`;
    }
    const study = readReplication(grid);
    const texts = study.materials.map((_m, i) => local.get().texts[i] ?? { ...EMPTY_TEXTS });
    local.set({ study, texts, occupied: null });
    return `Read ${grid.address}: labels in ${study.labels.name}, ${study.materials.length} material${study.materials.length === 1 ? '' : 's'}.`;
  } catch (e) {
    throw new PaneError(`Nothing read from ${grid.address}: ${e instanceof Error ? e.message : String(e)}`);
  }
}

/** The block to write for the current study, with its provenance. */
function blockOf(ctx: PaneContext, s: VerifyState): { sheet: string; area: BlockArea } {
  const demo = Boolean(ctx.state.table?.demo);
  const when = new Date();
  if (s.mode === 'comparison') {
    const c = s.comparison;
    if (!c) throw new PaneError('Read a selection first.');
    const p = provenance('Leeway — limits of agreement', demo, `${c.grid.address}: x ${c.x.name}, y ${c.y.name}, scale ${s.scale}`, [], when);
    return { sheet: c.grid.sheet, area: agreementBlock(c, s.scale, p) };
  }
  const input = inputOf(ctx, s);
  if (!input) throw new PaneError('Read a selection first.');
  const g = input.v.study.grid;
  const r = analyteRow(ctx, s.analyte);
  const more: Array<readonly [string, string]> = input.v.spec ? [['Specification', input.v.spec.from]] : [];
  if (r && input.v.bias) more.push(['Bias for sigma without an assigned value', `${input.v.bias.value} % (${displayName(r)}, ${input.v.bias.from})`]);
  const p = provenance('Leeway — method verification', demo, `${g.address}: run labels ${input.v.study.labels.name}; ${input.v.study.materials.map((m) => m.name).join(', ')}`, more, when);
  return { sheet: g.sheet, area: verificationBlock(input.v, p) };
}

async function writeBlock(ctx: PaneContext, local: ViewState<VerifyState>, overwrite: boolean): Promise<string> {
  const { sheet, area } = blockOf(ctx, local.get());
  const out = await writeAreas(ctx.host, sheet, [area], overwrite, (occupied) => local.set({ occupied }));
  return `Wrote live formulas to ${sheet}!${out.addresses.join(', ')}${out.overwritten.length ? ` (replaced ${out.overwritten.length} cells)` : ''}.`;
}

function analyteField(ctx: PaneContext, local: ViewState<VerifyState>): HTMLElement {
  const select = h('select', { id: 'verify-analyte' });
  const rows = ctx.state.rows();
  const current = analyteRow(ctx, local.get().analyte);
  for (const r of rows) select.appendChild(h('option', { value: keyOf(r), selected: current !== undefined && keyOf(r) === keyOf(current) }, displayName(r)));
  select.addEventListener('change', () => local.set({ analyte: select.value }));
  return field('Analyte (its specification for sigma)', select);
}

/**
 * Offered where a material has both a trueness bias and a within-lab CV: they become the
 * analyte's observed bias and CV, which What-if, QC and Summary read.
 */
function useAsObserved(ctx: PaneContext, s: VerifyState, m: MaterialFigures): { label: string; onUse: () => void } | undefined {
  const r = analyteRow(ctx, s.analyte);
  const bias = m.figures.get('biasPct');
  const cv = m.figures.get('wlCv');
  if (!r || !s.study || typeof bias !== 'number' || typeof cv !== 'number') return undefined;
  const from = `verification of ${s.study.grid.address} (${m.name})`;
  return {
    label: `Use for ${displayName(r)} in What-if, QC, Summary`,
    onUse: () => {
      ctx.state.setObserved([[keyOf(r), { bias, cv, from }]]);
      ctx.status(`${displayName(r)}: observed bias ${fmt(bias)} % and CV ${fmt(cv)} % from ${from}, now used by What-if, QC and Summary.`, 'ok');
    },
  };
}

/** The results area for a replication study. */
function replicationResults(ctx: PaneContext, s: VerifyState): HTMLElement[] {
  const input = inputOf(ctx, s);
  if (!input) return [h('p', { class: 'hint' }, 'Select the study on the sheet — run or day labels in the first column, one column of results per material — and read it.')];
  return [h('p', { class: 'context', id: 'verify-spec' }, input.specNote), ...verificationFigures(input.v).map((m, i) => renderMaterial(m, i, useAsObserved(ctx, s, m)))];
}

function comparisonResults(s: VerifyState, width: number): HTMLElement[] {
  const c = s.comparison;
  if (!c) return [h('p', { class: 'hint' }, 'Select two columns side by side — the comparative method (x), then the candidate (y) — and read them.')];
  const f = agreementFigures(c, s.scale);
  return [renderAgreement(f, s.scale === 'percent' ? ' %' : ''), renderPlot(plotInput(c, s.scale, f, width))];
}

export function verificationView(ctx: PaneContext): View {
  const local = new ViewState<VerifyState>({ mode: 'replication', study: null, comparison: null, texts: [], cells: new Map(), analyte: '', scale: 'absolute', occupied: null });
  const claims = h('div', { id: 'verify-claims' });
  const results = h('div', { id: 'verify-results', 'aria-live': 'polite' });
  const confirm = h('div', { id: 'verify-confirm' });
  const analyte = h('div', {});
  const scale = h('div', {});
  const read = h('button', { type: 'button', id: 'verify-read' }, 'Read the selection');
  const write = h('button', { type: 'button', class: 'primary', id: 'verify-write' }, 'Write to the sheet');
  read.addEventListener('click', () => void ctx.run('Reading the selection…', () => readSelection(ctx, local)));
  write.addEventListener('click', () => void ctx.run('Writing the block…', () => writeBlock(ctx, local, false)));
  const mode = radioGroup<Mode>('Study', 'verify-mode', [{ value: 'replication', label: 'Replication (precision, trueness)' }, { value: 'comparison', label: 'Comparison of two methods' }], 'replication', (m) => local.set({ mode: m, occupied: null }));
  const scaleRadios = radioGroup<Scale>('Differences', 'verify-scale', [{ value: 'absolute', label: 'y − x' }, { value: 'percent', label: '% of the pair’s mean' }], 'absolute', (v) => local.set({ scale: v }));

  function renderClaimsForm(): void {
    const s = local.get();
    if (s.mode !== 'replication' || !s.study) return replace(claims);
    const onInput = (i: number, key: keyof MaterialTexts, value: string): void => {
      const texts = local.get().texts.map((t, j) => (j === i ? { ...t, [key]: value } : t));
      local.set({ texts });
    };
    const onChange = (): void => void readGivenCells(ctx, local).catch((e) => ctx.status(`The cells given could not be read: ${e instanceof Error ? e.message : String(e)}`, 'error'));
    replace(claims, renderClaims({ names: s.study.materials.map((m) => m.name), texts: s.texts, typed: readTyped, onInput, onChange }));
  }

  let analyteShown = '';
  function render(): void {
    const s = local.get();
    const key = JSON.stringify([s.mode, s.analyte, ctx.state.tableId, ctx.state.rows().length]);
    if (key !== analyteShown) {
      analyteShown = key;
      replace(analyte, s.mode === 'replication' ? analyteField(ctx, local) : null);
    }
    replace(scale, s.mode === 'comparison' ? scaleRadios : null);
    const width = Math.max(240, Math.min(560, results.clientWidth || 288));
    replace(results, ...(s.mode === 'replication' ? replicationResults(ctx, s) : comparisonResults(s, width)));
    replace(confirm, s.occupied ? renderConfirm('verify', s.occupied, () => void ctx.run('Writing the block…', () => writeBlock(ctx, local, true)), () => local.set({ occupied: null })) : null);
  }

  let shape = '';
  const show = serialRender(render);
  local.on((s) => {
    // The claims form is rebuilt only when the study changes, so typing keeps its focus.
    const next = `${s.mode}|${s.study?.grid.address ?? ''}|${s.study?.materials.length ?? 0}`;
    if (next !== shape) {
      shape = next;
      renderClaimsForm();
    }
    show();
  });
  const root = h(
    'div',
    { class: 'view verification' },
    h('h2', {}, 'Verify a method'),
    mode,
    h('div', { class: 'actions' }, read),
    scale,
    claims,
    analyte,
    results,
    h('div', { class: 'actions' }, write),
    confirm,
  );
  return { root, refresh: show };
}
